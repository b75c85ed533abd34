"""Multiplexed LEDs: both ends on driver pins, so which are lit together depends on firmware."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from ledlint.circuits.circuit import CircuitKind, LedCircuit, LedString, Wired
from ledlint.circuits.shapes import Context, Junction, Recogniser, Span
from ledlint.circuits.stages import resistor_fed, sink_in
from ledlint.circuits.topology import TerminalKind


@dataclass(frozen=True)
class Multiplexed(Wired):
    """LEDs between driver pins at both ends."""

    kind = CircuitKind.MULTIPLEXED
    reason: str = ""  # what the tool saw: the pins at both ends


def from_junction(ctx: Context, j: Junction) -> LedCircuit | None:
    if not resistor_fed(ctx, j) or len(j.far_nets) == 1:
        return None
    common, ends = ctx.topo.terminal(j.far_net), j.ends
    if not (all(t.kind is TerminalKind.PIN for t in ends) and common.kind is TerminalKind.PIN):
        return None
    source, ret = (common, None) if j.at_top else (None, common)
    drivers = ", ".join(sorted({t.pin.ref for t in ends if t.pin}))
    return Multiplexed(*ctx.place(j.leds), branches=j.branches, source=source, ret=ret, node=j.node,
                       top=j.common if j.at_top else (), bottom=() if j.at_top else j.common,
                       reason=f"both ends on driver pins ({common.detail} and the pins of {drivers}); which LEDs "
                              "are lit together depends on firmware")


def from_span(ctx: Context, span: Span) -> Iterator[LedCircuit]:
    if not (span.source.kind is TerminalKind.PIN and span.ret.kind is TerminalKind.PIN):
        return
    for seg in span.segments:
        if sink_in(ctx, seg.elements, seg.bottom) is None:
            yield Multiplexed(*ctx.place(e.led for e in seg.leds), branches=(LedString(seg.elements),),
                              source=span.source, ret=span.ret,
                              reason=f"both ends on driver pins ({span.source.detail}, {span.ret.detail})")


RECOGNISER = Recogniser(CircuitKind.MULTIPLEXED, from_junction=from_junction, from_span=from_span)
