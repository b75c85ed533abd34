"""Recogniser: every LED of a netlist into exactly one circuit of a kind.

Each kind is one module of this package that recognises its own shapes: parts on their own,
a string whose parts face against each other, strings meeting at a junction, and strings
spanning two terminal nets. The shapes are read in that order, and within each the kinds are
tried in the order KINDS lists them; the first that recognises a shape claims its LEDs. What
no kind claims is unrecognised, with the reason.
"""

from __future__ import annotations

from collections.abc import Iterator

from ledlint.circuits import addressable, bank, driver, multiplexed, not_fitted, sink, string, unrecognised
from ledlint.circuits.circuit import CircuitKind, LedCircuit
from ledlint.circuits.graph import NetGraph
from ledlint.circuits.shapes import Context, Junction, Recogniser, Span, junction
from ledlint.circuits.topology import Segment, TerminalKind, Topology
from ledlint.config import Config
from ledlint.netlist.model import natural

__all__ = ["CircuitKind", "KINDS", "LedCircuit", "recognise"]

# The kinds, in the order they are tried. A driver claims strings before a sink does (a sink
# transistor on a driver's output is the driver's), and unrecognised takes what is left.
KINDS: tuple[Recogniser, ...] = tuple(k.RECOGNISER for k in (not_fitted, addressable, driver, sink, bank, multiplexed,
                                                            string, unrecognised))


def _spans(ctx: Context) -> Iterator[Span]:
    """Groups of free LED strings between the same two terminal nets, in the topology's order."""
    groups: dict[tuple[str, str], list[Segment]] = {}
    for seg in ctx.topo.segments:
        if seg.leds and ctx.free(seg):
            groups.setdefault((seg.top, seg.bottom), []).append(seg)
    for (top, bottom), segs in groups.items():
        source, ret = ctx.topo.terminal(top), ctx.topo.terminal(bottom)
        if TerminalKind.NODE not in (source.kind, ret.kind):  # an inner node is a junction's
            yield Span(source, ret, tuple(segs))


def _junctions(ctx: Context) -> Iterator[Junction]:
    nodes = sorted({n for s in ctx.topo.segments if s.leds for n in (s.top, s.bottom)
                    if ctx.topo.terminal(n).kind is TerminalKind.NODE}, key=natural)
    for node in nodes:
        j = junction(ctx, node)
        if j is not None:
            yield j


def recognise(graph: NetGraph, config: Config) -> tuple[LedCircuit, ...]:
    """The LED circuits of a netlist, in reference order; every LED die in exactly one."""
    ctx = Context(graph, config, Topology(graph, config))
    out: list[LedCircuit] = []
    for k in KINDS:
        out += k.from_parts(ctx) if k.from_parts else ()
    for seg in ctx.topo.segments:
        if seg.leds and ctx.free(seg):
            out += _first(k.from_segment(ctx, seg) for k in KINDS if k.from_segment)
    for j in _junctions(ctx):
        out += _first(k.from_junction(ctx, j) for k in KINDS if k.from_junction)
    for span in _spans(ctx):
        for k in KINDS:  # each kind claims the strings it recognises; the rest go on to the next
            if k.from_span:
                free = tuple(s for s in span.segments if ctx.free(s))
                out += k.from_span(ctx, Span(span.source, span.ret, free)) if free else ()
    for k in KINDS:
        out += k.leftovers(ctx) if k.leftovers else ()
    return tuple(sorted(out, key=lambda c: natural(c.id)))


def _first(found: Iterator[LedCircuit | None]) -> list[LedCircuit]:
    """The first kind's circuit: later kinds are not asked once one has claimed the shape."""
    return next(([c] for c in found if c is not None), [])
