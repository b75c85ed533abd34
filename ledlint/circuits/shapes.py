"""The shapes LED strings make on a board, which each circuit kind recognises as its own.

A junction is a net where LED strings meet one other series path (a bank's shared resistor, a
sink's transistor); a span is a group of strings between the same two terminal nets. The
recogniser hands each shape to the kinds in order, and the first that recognises it claims
its LEDs.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from typing import Callable, Iterable, Iterator, NamedTuple

from ledlint.circuits.circuit import CircuitKind, LedCircuit, LedString
from ledlint.circuits.graph import NetGraph
from ledlint.circuits.topology import Element, ElementKind, Segment, Terminal, TerminalKind, Topology
from ledlint.config import Config
from ledlint.netlist.model import Component
from ledlint.parts.kinds import Kind, LedId, classify

# Terminals the recogniser does not follow past: an inner node, something it cannot place, a
# connector, an open end.
STRANGE = (TerminalKind.NODE, TerminalKind.OTHER, TerminalKind.CONNECTOR, TerminalKind.OPEN)


class Place(NamedTuple):
    """Where a circuit sits, the first fields of every circuit: its id (the first LED), its LEDs
    in natural order, and the line and sheet of its first LED's part."""

    id: str
    leds: tuple[LedId, ...]
    line: int
    sheet: str


@dataclass
class Context:
    """What every kind's recogniser reads: the board, its topology, and the LEDs already claimed."""

    graph: NetGraph
    config: Config
    topo: Topology
    claimed: set[LedId] = field(default_factory=set)
    leds: tuple[Component, ...] = ()  # the LED packages with pins, in netlist order
    addressable: tuple[Component, ...] = ()  # the LED packages with their own controller

    def __post_init__(self) -> None:
        kinds = [(c, classify(c)) for c in self.graph.netlist.components]
        self.leds = tuple(c for c, k in kinds if k is Kind.LED)
        self.addressable = tuple(c for c, k in kinds if k is Kind.LED_ADDRESSABLE)

    def comp(self, ref: str) -> Component:
        c = self.graph.component(ref)
        assert c is not None, ref
        return c

    def free(self, seg: Segment) -> bool:
        """No LED of the segment is in a circuit yet."""
        return not any(e.led in self.claimed for e in seg.leds)

    def place(self, leds: Iterable[LedId]) -> Place:
        """Claim LEDs for a circuit and say where it sits."""
        ordered = tuple(sorted(dict.fromkeys(leds), key=lambda i: i.order))
        self.claimed.update(ordered)
        first = self.comp(ordered[0].ref)
        return Place(str(ordered[0]), ordered, first.line, first.sheet)


def led_ids(segments: Iterable[Segment]) -> list[LedId]:
    return [e.led for s in segments for e in s.leds]


@dataclass(frozen=True)
class Junction:
    """LED strings meeting at a net with nothing else on it but other series paths. Each kind
    asks about it in turn, so what it works out is kept (a bank can hold thousands of strings)."""

    node: str
    strings: tuple[Segment, ...]  # the LED segments not yet in a circuit
    others: tuple[Segment, ...]  # the series paths without LEDs
    topo: Topology

    @cached_property
    def leds(self) -> list[LedId]:
        return led_ids(self.strings)

    @property
    def single_path(self) -> bool:
        """One other path leads on: the strings' common ballast, switch or sink."""
        return len(self.others) == 1

    @cached_property
    def at_top(self) -> bool:
        """The strings hang below the node: it is on their anode side."""
        return all(s.top == self.node for s in self.strings)

    @cached_property
    def one_sided(self) -> bool:
        return self.at_top or all(s.bottom == self.node for s in self.strings)

    @cached_property
    def common(self) -> tuple[Element, ...]:
        """The one other path, oriented: above the node for the anode side, below it for the cathode side."""
        path = self.others[0]
        if self.at_top:
            return path.elements if path.bottom == self.node else tuple(e.flipped() for e in reversed(path.elements))
        return path.elements if path.top == self.node else tuple(e.flipped() for e in reversed(path.elements))

    @property
    def far_net(self) -> str:
        """Where the common path leads: its supply end, or its return end."""
        return self.common[0].net_a if self.at_top else self.common[-1].net_b

    @cached_property
    def ends(self) -> tuple[Terminal, ...]:
        """Each string's own far end."""
        at_top = self.at_top
        return tuple(self.topo.terminal(s.bottom if at_top else s.top) for s in self.strings)

    @cached_property
    def branches(self) -> tuple[LedString, ...]:
        """The strings, each with its own far end."""
        return tuple(LedString(s.elements, t) for s, t in zip(self.strings, self.ends))

    @cached_property
    def odd_end(self) -> Terminal | None:
        """The first end, common or a string's own, that the recogniser does not follow."""
        common = self.topo.terminal(self.far_net)
        if common.kind in STRANGE:
            return common
        return next((t for t in self.ends if t.kind in STRANGE), None)

    @cached_property
    def limited(self) -> bool:
        """A resistor in every string, or in the common path."""
        own = all(any(e.kind is ElementKind.RESISTOR for e in s.elements) for s in self.strings)
        return own or any(e.kind is ElementKind.RESISTOR for e in self.common)

    @cached_property
    def far_nets(self) -> set[str]:
        return {t.net for t in self.ends}


def junction(ctx: Context, node: str) -> Junction | None:
    """The junction at a node, or None when its LED strings are all in circuits already."""
    segs = ctx.topo.segments_at(node)
    strings = tuple(s for s in segs if s.leds and ctx.free(s))
    if not strings:
        return None
    return Junction(node, strings, tuple(s for s in segs if not s.leds), ctx.topo)


@dataclass(frozen=True)
class Span:
    """LED strings whose both ends are terminal nets: the same two for every segment."""

    source: Terminal
    ret: Terminal
    segments: tuple[Segment, ...]

    @property
    def leds(self) -> list[LedId]:
        return led_ids(self.segments)

    @property
    def elements(self) -> tuple[Element, ...]:
        return tuple(e for s in self.segments for e in s.elements)

    def one(self, seg: Segment) -> Span:
        return Span(self.source, self.ret, (seg,))


@dataclass(frozen=True)
class Recogniser:
    """What one circuit kind recognises, shape by shape; a shape it has no function for is not
    its. A junction function returns the circuit or None; the others yield what they claim."""

    kind: CircuitKind
    from_parts: Callable[[Context], Iterator[LedCircuit]] | None = None
    from_segment: Callable[[Context, Segment], LedCircuit | None] | None = None
    from_junction: Callable[[Context, Junction], LedCircuit | None] | None = None
    from_span: Callable[[Context, Span], Iterator[LedCircuit]] | None = None
    leftovers: Callable[[Context], Iterator[LedCircuit]] | None = None
