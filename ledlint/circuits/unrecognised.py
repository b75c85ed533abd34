"""Unrecognised: an LED in a connection no other kind claims, always with what the tool saw, and
whether it can ever light."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from ledlint.circuits.circuit import CircuitKind, LedCircuit, LedString, Wired
from ledlint.circuits.shapes import Context, Junction, Recogniser, Span
from ledlint.circuits.stages import sink_below
from ledlint.circuits.topology import TerminalKind
from ledlint.parts.kinds import LedId, led_dies


@dataclass(frozen=True)
class Unrecognised(Wired):
    """LEDs the tool does not analyse."""

    kind = CircuitKind.UNRECOGNISED
    reason: str = ""  # what the tool saw
    never_lights: bool = False  # an end is left open: the LED can never conduct


def from_parts(ctx: Context) -> Iterator[LedCircuit]:
    """A fitted LED die with its anode or cathode on no net."""
    for comp in ctx.leds:
        if comp.dnp:
            continue
        for d in led_dies(comp):
            open_pins = [n for n in (d.anode, d.cathode) if getattr(comp.pin(n), "net", None) is None]
            if open_pins:
                i = LedId(comp.ref, d.name)
                yield Unrecognised(*ctx.place([i]), reason=f"pin {', '.join(open_pins)} of {i} is on no net",
                                   never_lights=True)


def from_junction(ctx: Context, j: Junction) -> LedCircuit | None:
    """Strings meeting at a net in a way no kind recognises: why, in the order the shape is read."""
    never = False
    if not j.single_path:
        what = f"{len(j.others)} other series parts" if j.others else "nothing that leads to a supply"
        reason = (f"net {j.node} joins {len(j.strings)} LED string(s) and {what}; not a string, bank or driver "
                  "the tool knows")
    elif not j.one_sided:
        reason = f"LED strings meet at {j.node} from both sides"
    elif (found := sink_below(ctx, j)) is not None:
        reason = (f"strings on current sink {found[0].transistor.ref} start from {len(j.far_nets)} "
                  "different nets")
    elif (odd := j.odd_end) is not None:
        reason = (f"strings sharing {j.node} continue to {odd.net} ({odd.detail or odd.kind.value}): not a supply, "
                  "ground or driver pin the tool follows")
        never = odd.kind is TerminalKind.OPEN
    elif not j.limited:
        reason = (f"strings meet at {j.node}, which leads on through {', '.join(e.id for e in j.common)} "
                  "with no resistor")
    else:
        return None
    return Unrecognised(*ctx.place(j.leds), node=j.node, reason=reason, never_lights=never)


def from_span(ctx: Context, span: Span) -> Iterator[LedCircuit]:
    """Strings with an end the tool does not follow: open, off the board, or on something else."""
    odd = [t for t in (span.source, span.ret) if t.kind in (TerminalKind.OTHER, TerminalKind.CONNECTOR,
                                                           TerminalKind.OPEN)]
    if not odd:
        return
    t = odd[0]
    side = "anode" if t is span.source else "cathode"
    if t.kind is TerminalKind.OPEN:
        reason = f"the {side} side ends at net {t.net}, and {t.detail}"
    else:
        where = ("goes off the board through " + t.detail if t.kind is TerminalKind.CONNECTOR else
                 f"holds {t.detail}: not a supply, ground or driver pin the tool follows")
        reason = f"the {side} side ends at net {t.net}, which {where}"
    for seg in span.segments:
        yield Unrecognised(*ctx.place(e.led for e in seg.leds), branches=(LedString(seg.elements),),
                           source=span.source, ret=span.ret, reason=reason,
                           never_lights=t.kind is TerminalKind.OPEN)


def leftovers(ctx: Context) -> Iterator[LedCircuit]:
    """Every LED die no kind claimed."""
    for comp in ctx.leds:
        for d in led_dies(comp):
            i = LedId(comp.ref, d.name)
            if i not in ctx.claimed:
                yield Unrecognised(*ctx.place([i]), reason=f"{i} is in a connection the tool does not follow")
    for comp in ctx.leds:
        if not led_dies(comp) and LedId(comp.ref) not in ctx.claimed:
            if len(comp.pins) < 2:  # the other pin is on no net, and no library part lists it
                what = "only one pin of it is" if comp.pins else "none of its pins is"
                yield Unrecognised(*ctx.place([LedId(comp.ref)]),
                                   reason=f"{what} in the netlist: the others are on no net", never_lights=True)
            else:
                yield Unrecognised(*ctx.place([LedId(comp.ref)]),
                                   reason=f"{comp.ref}'s pins do not read as anode and cathode")


RECOGNISER = Recogniser(CircuitKind.UNRECOGNISED, from_parts=from_parts, from_junction=from_junction,
                        from_span=from_span, leftovers=leftovers)
