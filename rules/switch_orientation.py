"""switch-orientation: a transistor in an LED's path fitted with its main terminals swapped.

What it flags
    A MOSFET with drain and source swapped, or a bipolar transistor with collector and
    emitter swapped, in series with an LED string: the part faces against the current the
    LEDs draw from their supply.

Why it matters
    A swapped MOSFET's body diode is forward-biased by the LEDs' own supply, so the LEDs stay
    lit whatever the gate does: the switch does nothing. A swapped bipolar transistor runs in
    its inverse mode, with a current gain of a few, and its base-emitter junction breaks down
    at about 6 V. Both pass a connectivity check, and the usual cause, a symbol whose pin
    numbers do not match the footprint's, repeats on every board built from that library.

Example
    Q1, a P-MOSFET high-side switch, with its drain on +5V and its source to R1 and D1: the
    body diode conducts from +5V into D1, and the gate cannot turn D1 off. Fixed: the source
    on +5V and the drain to R1.

Fix
    Swap the transistor's main terminals, or fix the symbol's pin numbering or the footprint
    assignment so that they agree with the part's package.

Formula
    A check of direction, not of value: conventional current through an N-MOSFET runs drain
    to source, a P-MOSFET source to drain, an NPN collector to emitter, a PNP emitter to
    collector; the LEDs' forward direction fixes which way it must run here.

Source
    Device physics of a textbook on semiconductor devices: a power MOSFET's body diode lies
    from source to drain in an N-channel part, drain to source in a P-channel one; a bipolar
    transistor's inverse current gain is small and its emitter-base breakdown is typically
    5-7 V (common practice, from memory).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.checks.findings import Finding, Severity
from ledlint.parts.kinds import Kind
from ledlint.checks.registry import Rule, RuleContext
from ledlint.rules._support import by_evidence, circuit_assumptions, ids
from ledlint.circuits.circuit import CircuitKind, Wired
from ledlint.circuits.string import REVERSED_SWITCH


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        c = a.circuit
        assert isinstance(c, Wired)
        for q in c.reversed_switches:
            terminals = "drain and source" if q.part in (Kind.NMOS, Kind.PMOS) else "collector and emitter"
            # The pins' roles rest on an assumed pinout when the symbol does not name them: then
            # the finding may be the assumption's, one step less severe.
            severity = by_evidence(Severity.ERROR, bool(q.assumption))
            part = ctx.board.netlist.component(q.ref)
            yield ctx.finding(
                a, severity, "{why}; it sits between {top} and {bottom} in the path of {leds}",
                refs=(q.ref, *(i.ref for i in c.leds)), nets=(q.net_a, q.net_b),
                assumed=tuple(([q.assumption] if q.assumption else []) + circuit_assumptions(a)),
                hint=f"swap {q.ref}'s {terminals}, or fix its symbol's pin numbering against the footprint",
                why=REVERSED_SWITCH[q.part].format(ref=q.ref), top=q.net_a, bottom=q.net_b, leds=ids(c.leds),
                line=part.line if part else None)


RULE = Rule(
    id="switch-orientation",
    summary="transistor in an LED's path fitted with its main terminals swapped",
    severity=Severity.ERROR,
    check=check,
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK, CircuitKind.SINK, CircuitKind.DRIVER),
)
