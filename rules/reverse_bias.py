"""reverse-bias: an LED fitted backwards, or able to see more reverse voltage than it is rated for.

What it flags
    An LED whose anode sits on the lower of its two supply nets (it never lights), a string
    with an LED facing against the others (the string never conducts and that LED takes the
    reverse voltage), or any LED that can see more reverse voltage than its Vr_max (5 V when
    not given): an LED on an AC rail ("12VAC") takes the rail's negative peak every half
    cycle unless a diode in series or antiparallel across it takes that instead.

Why it matters
    LEDs are not designed for reverse operation: the 5 V in a datasheet is only the leakage
    test condition. Above it the junction breaks down and the LED is damaged; below it a
    reversed LED simply stays dark, which a connectivity check does not notice.

Example
    D5 with its anode on GND and its cathode through 330 Ω to +12V: dark, and 12 V in
    reverse. Fixed: swap its pins (or the symbol's pin numbering).

Fix
    Turn the LED round, or fix the footprint/symbol pin mapping; where reverse voltage is
    part of the design (AC drive), put a diode in series or antiparallel.

Formula
    V_reverse = the most negative voltage across the LED over supply tolerance; in a
    reversed string the whole supply is taken to fall on one LED (leakage decides which). On
    AC, V_reverse = √2 × V_rms,max; an antiparallel diode limits it to that diode's forward drop.

Source
    A fact of the trade: an indicator LED's reverse rating (usually 5 V) is only the condition
    its leakage is tested at, and LEDs are not made for reverse operation (common practice).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.checks.findings import Finding, Severity, Value
from ledlint.analysis.results import Computed
from ledlint.checks.registry import Rule, RuleContext
from ledlint.circuits.circuit import CircuitKind
from ledlint.circuits.string import SeriesString
from ledlint.rules._support import assumed_param, circuit_assumptions


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        if not isinstance(a, Computed) or a.supply is None:
            continue
        c = a.circuit
        blocked = isinstance(c, SeriesString) and c.blocked
        reversed_whole = a.supply.volts.maximum < 0
        for led in a.leds:
            vr = led.params.vr_max.value
            ref = led.id.ref
            source, ret_end = c.ends
            src, ret = (source.net if source else "?"), (ret_end.net if ret_end else "?")
            values = (Value("reverse", led.reverse_v, "V", vr, ">"), Value("vr_max", vr, "V"))
            assumed = tuple(assumed_param(f"{led.id} Vr_max", led.params.vr_max, "V") + circuit_assumptions(a))
            if isinstance(c, SeriesString) and blocked and led.reverse_v > 0:
                yield ctx.finding(a, Severity.ERROR, "{led} faces against the rest of its string ({why}): the "
                                  "string never conducts and {led} can see {reverse} in reverse (Vr_max {vr_max})",
                                  refs=(ref,), values=values, assumed=assumed, led=led.id, why=c.conflict_text(),
                                  hint=f"turn {led.id} round (or fix its symbol's pin numbering)")
            elif reversed_whole:
                yield ctx.finding(a, Severity.ERROR, "{led} is reversed: its anode side is on {src}, lower than its "
                                  "cathode side on {ret}; it never lights and sees {reverse} in reverse (Vr_max "
                                  "{vr_max})", refs=(ref,), values=values, assumed=assumed, led=led.id, src=src,
                                  ret=ret, hint=f"turn {led.id} round (or fix its symbol's pin numbering)")
            elif led.reverse_v > vr:
                yield ctx.finding(a, Severity.ERROR, "{led} can see {reverse} in reverse, above its Vr_max of {vr_max}",
                                  refs=(ref,), values=values, assumed=assumed, led=led.id,
                                  hint="add a diode in series or antiparallel to take the reverse voltage")


RULE = Rule(
    id="reverse-bias",
    summary="LED reversed, or able to see more reverse voltage than its Vr_max",
    severity=Severity.ERROR,
    check=check,
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK, CircuitKind.SINK, CircuitKind.DRIVER),
)
