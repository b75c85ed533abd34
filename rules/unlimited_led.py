"""unlimited-led: an LED or string across a voltage source with nothing to limit its current.

What it flags
    An LED, a string of LEDs or LEDs in parallel connected straight across a supply rail
    (or from a rail to ground through only switches) with no resistor, current regulator or
    driver in the path.

Why it matters
    An LED's current rises exponentially with voltage: across a stiff rail it is set only by
    the die's few ohms of series resistance and the rail's source impedance. It burns out,
    or survives on one board and not the next. Strings whose Vf sum "matches" the rail are no
    better: a 0.1 V shift moves the current by tens of milliamps.

Example
    A red LED straight from +3V3 to GND: the model gives up to about 250 mA. Fixed: 150 Ω in
    series, the value the hint gives, for 13.6 mA at the worst corner.

Fix
    Add a series resistor (the hint sizes one for 75 % of If_max at the worst corner), or
    feed the LED from a current-limited driver.

Formula
    Without a ballast, I ≈ (V − Σ V_j) / Σ R_s: only the LEDs' internal series resistance
    limits it (Shockley model with series resistance).

Source
    The Shockley diode equation with series resistance: with no ballast, a 0.1 V spread of Vf
    moves a power LED's current by some 100 mA (common practice).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.analysis.results import Incomplete, VoltageDriven
from ledlint.circuits.circuit import CircuitKind
from ledlint.checks.findings import Finding, Severity, Value
from ledlint.checks.registry import Rule, RuleContext
from ledlint.rules._support import ballast_hint, circuit_assumptions, ids


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        if not isinstance(a, (Incomplete, VoltageDriven)) or not a.unlimited:
            continue
        c = a.circuit
        source, ret_end = c.ends
        src = source.net if source else "?"
        ret = ret_end.net if ret_end else "?"
        values: tuple[Value, ...] = ()
        verb = "sits" if len(c.leds) == 1 else "sit"
        template = ("{leds} " + verb + " across {src} and {ret} with nothing to limit the current: no resistor, "
                    "regulator or driver")
        hint = "add a series resistor sized for the wanted current: R = (V − Vf) / I"
        zero = [m for m in a.missing if m.fault]
        if zero:  # a sink or driver whose sense resistor is 0 Ω: it regulates nothing
            yield ctx.finding(a, Severity.ERROR, "{leds}: {why}, and nothing else limits the current",
                              hint=zero[0].fix, leds=ids(c.leds), why=zero[0].reason,
                              assumed=tuple(circuit_assumptions(a)))
            continue
        if isinstance(a, VoltageDriven) and a.leds:
            worst = max(a.leds, key=lambda r: r.current.maximum)
            values = (Value("model", worst.current.maximum, "A"),)
            template += ("; the model gives up to {model}, set only by the LED's internal resistance" if len(c.leds) == 1
                         else "; the model gives up to {model}, set only by the LEDs' internal resistance")
            hint = ballast_hint(ctx, a, hint)
            hint = "add" + hint[3:] if hint.startswith("use ") else hint
        yield ctx.finding(a, Severity.ERROR, template, values=values, hint=hint, leds=ids(c.leds), src=src, ret=ret,
                          assumed=tuple(circuit_assumptions(a)))


RULE = Rule(
    id="unlimited-led",
    summary="LED or string across a voltage source with nothing to limit its current",
    severity=Severity.ERROR,
    check=check,
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK, CircuitKind.SINK, CircuitKind.DRIVER),
)
