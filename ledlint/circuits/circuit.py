"""What every recognised LED circuit shares: its kind, its LEDs (each a typed part and die), its
strings, its ends, and the parts and nets a finding names."""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum
from typing import ClassVar

from ledlint.circuits.topology import Element, ElementKind, Terminal
from ledlint.netlist.model import natural
from ledlint.parts.kinds import LedId

class CircuitKind(Enum):
    """The circuit kinds, by the names the reports use."""

    STRING = "series-string"
    BANK = "shared-resistor-bank"
    SINK = "current-sink"
    DRIVER = "constant-current-driver"
    ADDRESSABLE = "addressable"
    MULTIPLEXED = "multiplexed"
    NOT_FITTED = "not-fitted"
    UNRECOGNISED = "unrecognised"


@dataclass(frozen=True)
class LedString:
    """One string of a circuit: its elements top (anode side) to bottom."""

    elements: tuple[Element, ...]
    far: Terminal | None = None  # in an individually driven bank: this string's own end

    @property
    def leds(self) -> tuple[Element, ...]:
        return tuple(e for e in self.elements if e.kind is ElementKind.LED)


@dataclass(frozen=True)
class LedCircuit:
    """A recognised LED circuit: what every kind has. Each kind is a subclass in its own module
    of this package, with only its own fields."""

    kind: ClassVar[CircuitKind]
    id: str  # the first LED die, as shown
    leds: tuple[LedId, ...]
    line: int
    sheet: str

    @property
    def elements(self) -> tuple[Element, ...]:
        """The series elements the LEDs' current passes through."""
        return ()

    @property
    def ends(self) -> tuple[Terminal | None, Terminal | None]:
        """Where the current comes from and returns to, as far as the recogniser saw."""
        return None, None

    @property
    def resistors(self) -> tuple[Element, ...]:
        return tuple(e for e in self.elements if e.kind is ElementKind.RESISTOR)

    @property
    def led_refs(self) -> tuple[str, ...]:
        """The LED parts, each once."""
        return tuple(dict.fromkeys(i.ref for i in self.leds))

    @property
    def refs(self) -> tuple[str, ...]:
        """Every part of the circuit, LEDs first, without repeats."""
        return tuple(dict.fromkeys([*self.led_refs, *(e.ref for e in self.elements), *self.extra_refs()]))

    def extra_refs(self) -> tuple[str, ...]:
        """Parts outside the LEDs' path that make the circuit what it is (a sink's reference)."""
        return ()

    @property
    def nets(self) -> tuple[str, ...]:
        return tuple(dict.fromkeys(t.net for t in self.ends if t is not None))


@dataclass(frozen=True)
class Wired(LedCircuit):
    """A circuit of series strings between two ends, with any common path above or below the net
    the strings meet at."""

    branches: tuple[LedString, ...] = ()
    source: Terminal | None = None
    ret: Terminal | None = None
    node: str = ""  # the net the strings meet at
    top: tuple[Element, ...] = ()  # common elements between the source and the strings
    bottom: tuple[Element, ...] = ()  # common elements between the strings and the return

    def __post_init__(self) -> None:
        # Parallel strings in reference order, not the export's: a re-export that reorders the
        # netlist then gives the same Monte Carlo draws per string, so the same report.
        object.__setattr__(self, "branches", tuple(sorted(self.branches, key=_branch_key)))

    @property
    def ends(self) -> tuple[Terminal | None, Terminal | None]:
        return self.source, self.ret

    @property
    def elements(self) -> tuple[Element, ...]:
        return self.top + tuple(e for b in self.branches for e in b.elements) + self.bottom

    @property
    def nets(self) -> tuple[str, ...]:
        return tuple(dict.fromkeys([*super().nets, *([self.node] if self.node else [])]))

    @property
    def shared_resistors(self) -> tuple[Element, ...]:
        """Resistors every string's current passes through: a bank's shared ballast, if any."""
        return tuple(e for e in self.top + self.bottom if e.kind is ElementKind.RESISTOR)

    @property
    def reversed_switches(self) -> tuple[Element, ...]:
        """Transistors in the LEDs' path fitted with their main terminals swapped."""
        return tuple(e for e in self.elements if e.kind is ElementKind.SWITCH and e.against and not e.held)


def _branch_key(branch: LedString) -> tuple[int | str, ...]:
    first = (branch.leds or branch.elements)[:1]
    return natural(first[0].id) if first else ()
