"""Current sink: strings on an NPN or N-MOSFET with an emitter or source resistor, its base held
by a zener, diodes, a divider, a controller pin or a second transistor."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from ledlint.circuits.circuit import CircuitKind, LedCircuit, LedString, Wired
from ledlint.circuits.shapes import Context, Junction, Recogniser, Span
from ledlint.circuits.stages import SinkStage, sink_below, sink_in


@dataclass(frozen=True, kw_only=True)
class CurrentSink(Wired):
    """Strings whose current a transistor stage sets."""

    kind = CircuitKind.SINK
    sink: SinkStage

    def extra_refs(self) -> tuple[str, ...]:
        return self.sink.refs


def from_junction(ctx: Context, j: Junction) -> LedCircuit | None:
    found = sink_below(ctx, j)
    fars = j.far_nets
    if found is None or len(fars) != 1:
        return None
    stage, ground = found
    return CurrentSink(*ctx.place(j.leds), branches=tuple(LedString(s.elements) for s in j.strings),
                       source=ctx.topo.terminal(next(iter(fars))), ret=ground, node=j.node, sink=stage)


def from_span(ctx: Context, span: Span) -> Iterator[LedCircuit]:
    for seg in span.segments:
        found = sink_in(ctx, seg.elements, seg.bottom)
        if found is not None:
            stage, ground = found
            yield CurrentSink(*ctx.place(e.led for e in seg.leds),
                              branches=(LedString(seg.elements[:seg.elements.index(stage.transistor)]),),
                              source=span.source, ret=ground, sink=stage)


RECOGNISER = Recogniser(CircuitKind.SINK, from_junction=from_junction, from_span=from_span)
