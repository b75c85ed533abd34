"""Series string: LEDs chained anode to cathode with their ballast and switches, between two
ends (one LED is a string of one)."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from ledlint.circuits.circuit import CircuitKind, LedCircuit, LedString, Wired
from ledlint.circuits.shapes import Context, Junction, Recogniser, Span
from ledlint.circuits.stages import resistor_fed, sink_in
from ledlint.circuits.topology import Element, Segment, TerminalKind
from ledlint.parts.kinds import Kind

# A transistor fitted with its main terminals swapped, against the LEDs' current (common practice;
# a MOSFET's body diode runs from source to drain in an N-channel part, drain to source in a
# P-channel one, so swapped, it is forward-biased by the LEDs' own supply).
_SWAPPED_MOSFET = ("{ref} has drain and source swapped: its body diode conducts whatever its gate does, so it "
                   "cannot turn the LEDs off")
_SWAPPED_BIPOLAR = ("{ref} has collector and emitter swapped: run in reverse it barely switches (a current gain "
                    "of a few) and its base-emitter junction breaks down at about 6 V")
REVERSED_SWITCH = {Kind.NMOS: _SWAPPED_MOSFET, Kind.PMOS: _SWAPPED_MOSFET,
                   Kind.NPN: _SWAPPED_BIPOLAR, Kind.PNP: _SWAPPED_BIPOLAR}
# Where a string's ends are pins of two driver ICs or one off-board: multiplexed or unrecognised.
_NOT_A_STRING_END = (TerminalKind.OTHER, TerminalKind.CONNECTOR, TerminalKind.OPEN)


@dataclass(frozen=True)
class SeriesString(Wired):
    """One string; when a part in it faces the wrong way, what blocks it."""

    kind = CircuitKind.STRING
    opposed: tuple[Element, ...] = ()  # polar parts facing against the LEDs
    swapped: tuple[Element, ...] = ()  # switches fitted with their main terminals swapped

    @property
    def blocked(self) -> bool:
        """The string can never conduct."""
        return bool(self.opposed or self.swapped)

    def conflict_text(self) -> str:
        """Why it can never conduct, in words."""
        reasons = [REVERSED_SWITCH[e.part].format(ref=e.ref) for e in self.swapped]
        if self.opposed:
            verb = "faces" if len(self.opposed) == 1 else "face"
            reasons.insert(0, f"{', '.join(e.id for e in self.opposed)} {verb} against the other parts in series "
                              "with it")
        return "; ".join(reasons)


def from_segment(ctx: Context, seg: Segment) -> LedCircuit | None:
    """A string with a part facing against the rest."""
    if not seg.blocked:
        return None
    return SeriesString(*ctx.place(e.led for e in seg.leds), branches=(LedString(seg.elements),),
                        source=ctx.topo.terminal(seg.top), ret=ctx.topo.terminal(seg.bottom),
                        opposed=seg.opposed, swapped=seg.swapped)


def from_junction(ctx: Context, j: Junction) -> LedCircuit | None:
    """One string behind a common path (its ballast or switch) that other parts branch off."""
    if len(j.strings) != 1 or not resistor_fed(ctx, j) or len(j.far_nets) != 1:
        return None
    far, common = j.ends[0], ctx.topo.terminal(j.far_net)
    source, ret = (common, far) if j.at_top else (far, common)
    return SeriesString(*ctx.place(j.leds), branches=(LedString(j.strings[0].elements),), source=source, ret=ret,
                        node=j.node, top=j.common if j.at_top else (), bottom=() if j.at_top else j.common)


def from_span(ctx: Context, span: Span) -> Iterator[LedCircuit]:
    """Each string between a supply and a return that nothing else claims."""
    ends = (span.source, span.ret)
    if any(t.kind in _NOT_A_STRING_END for t in ends) or all(t.kind is TerminalKind.PIN for t in ends):
        return
    for seg in span.segments:
        if sink_in(ctx, seg.elements, seg.bottom) is None:
            yield SeriesString(*ctx.place(e.led for e in seg.leds), branches=(LedString(seg.elements),),
                               source=span.source, ret=span.ret)


RECOGNISER = Recogniser(CircuitKind.STRING, from_segment=from_segment, from_junction=from_junction,
                        from_span=from_span)
