"""Shared-resistor bank: LEDs or strings in parallel behind one resistor, or each switched by its
own pin behind a shared one, or each with its own resistor sharing a switch."""

from __future__ import annotations

from dataclasses import dataclass

from ledlint.circuits.circuit import CircuitKind, LedCircuit, LedString, Wired
from ledlint.circuits.shapes import Context, Junction, Recogniser
from ledlint.circuits.stages import resistor_fed
from ledlint.circuits.topology import Terminal, TerminalKind


@dataclass(frozen=True)
class ResistorBank(Wired):
    """Strings in parallel from one node; individually driven when each ends on its own pin."""

    kind = CircuitKind.BANK
    individually_driven: bool = False


def from_junction(ctx: Context, j: Junction) -> LedCircuit | None:
    if not resistor_fed(ctx, j):
        return None
    topo = ctx.topo
    common = topo.terminal(j.far_net)
    top, bottom = (j.common, ()) if j.at_top else ((), j.common)
    ends = j.ends
    source: Terminal | None
    ret: Terminal | None
    if len(j.far_nets) == 1:
        if len(j.strings) == 1:
            return None  # one string: a series string
        far = ends[0]
        source, ret = (common, far) if j.at_top else (far, common)
        return ResistorBank(*ctx.place(j.leds), branches=tuple(LedString(s.elements) for s in j.strings),
                            source=source, ret=ret, node=j.node, top=top, bottom=bottom)
    if all(t.kind is TerminalKind.PIN for t in ends) and common.kind is TerminalKind.PIN:
        return None  # pins at both ends: multiplexed
    source, ret = (common, None) if j.at_top else (None, common)
    return ResistorBank(*ctx.place(j.leds), branches=j.branches, source=source, ret=ret, node=j.node,
                        top=top, bottom=bottom, individually_driven=True)


RECOGNISER = Recogniser(CircuitKind.BANK, from_junction=from_junction)
