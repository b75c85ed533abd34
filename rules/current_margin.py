"""current-margin: an LED's worst-case forward current against its rated maximum.

What it flags
    An LED whose current at the worst corner (highest supply, lowest ballast, lowest Vf,
    hottest ambient, and for LEDs sharing a resistor or a driver, the split that favours it)
    is above 75 % of its rated continuous forward current If_max (warning) or above If_max
    (error). It applies to resistor-fed strings, banks, transistor sinks and drivers alike.

Why it matters
    LED light output and lifetime fall fast with overdrive, and an indicator run at its
    absolute maximum dies early in a warm enclosure. The trade keeps a 25 % margin: run a
    20 mA part at 15 mA or less. The worst corner, not the nominal, is what some boards in a
    production run will see.

Example
    A red LED (If_max 20 mA) from +5V through 150 Ω: about 21 mA nominal and 25 mA at the
    worst corner (5.25 V, the resistor 5 % low, the lowest Vf): error. Through 220 Ω the worst
    case is about 17.5 mA, above 15 mA: a warning. Through 270 Ω it is about 14.4 mA: clean.

Fix
    Raise the ballast to the E24 value in the hint (it re-solves the worst corner with it), or
    lower a driver's set-point. The hint gives the power rating the new resistor needs.

Formula
    I = (V_supply − V_switch − Σ Vf(I, Tj)) / (R_ballast + R_source), solved with the LED's
    Shockley model at each corner; worst = the largest over the corners (and, for parallel
    strings, over the hogging corners). Warning when worst > margin · If_max, error when
    worst > If_max.

Source
    Running indicator LEDs at 75-80 % of their absolute maximum current is common practice (no
    standard sets it). Ohm's law; the Shockley diode equation with series resistance.
"""

from __future__ import annotations

from typing import Iterator

from ledlint.checks.findings import Finding, Severity, Value, quantity
from ledlint.parts.params import Param
from ledlint.analysis.results import CurrentDriven, Driven, VoltageDriven
from ledlint.checks.registry import Rule, RuleContext
from ledlint.circuits.bank import ResistorBank
from ledlint.circuits.circuit import CircuitKind, Wired
from ledlint.rules._options import MARGIN
from ledlint.rules._support import (ballast_hint, by_evidence, circuit_assumptions, ids, led_assumptions,
                                    resistor_assumptions)


def check(ctx: RuleContext) -> Iterator[Finding]:
    margin = ctx.options[MARGIN.option.name]
    for a in ctx.analyses:
        if not isinstance(a, Driven) or (isinstance(a, VoltageDriven) and a.unlimited):
            continue
        c = a.circuit
        assert isinstance(c, Wired)  # every kind this rule reads is strings between two ends
        shared = bool(c.shared_resistors) or isinstance(a, CurrentDriven)
        individually = isinstance(c, ResistorBank) and c.individually_driven
        if len(c.branches) > 1 and not individually and shared:
            continue  # LEDs sharing a resistor or an output: shared-resistor-bank or driver-parallel-strings
        over = []  # (severity, led) for every LED past the margin; one finding per circuit
        for led in a.leds:
            if_max = led.params.if_max
            if not isinstance(if_max, Param) or not led.params.complete:
                continue  # no rating, or a stand-in LED model: missing-parameter says so
            worst = led.current.maximum
            if worst <= margin * if_max.value:
                continue
            severity = Severity.ERROR if worst > if_max.value else Severity.WARNING
            # A built-in rating is a class default (20-30 mA for small indicators): only a
            # current above the whole class's range keeps full severity.
            assumed = if_max.assumed and not (led.params.if_max_upper and worst > led.params.if_max_upper)
            over.append((by_evidence(severity, assumed), worst / if_max.value, led, if_max))
        if not over:
            continue
        severity = max((o[0] for o in over), key=lambda s: s.rank)
        _, _, led, if_max = max(over, key=lambda o: (o[0].rank, o[1]))
        worst = led.current.maximum
        limit = if_max.value if worst > if_max.value else margin * if_max.value
        values: tuple[Value, ...] = (Value("worst", worst, "A", limit, ">"), Value("nominal", led.current.nominal, "A"),
                  Value("if_max", if_max.value, "A"), Value("allowed", margin * if_max.value, "A"))
        where = "the worst corner" if a.sharing is None else "the worst corner of the current split"
        corner = _corner(a)
        template = ("{led} can carry {worst} at " + where + (" ({corner})" if corner else "") + ", above "
                    + ("its If_max of {if_max}" if worst > if_max.value else
                       "{allowed}, the {pct} margin under its If_max of {if_max}") + " (nominal {nominal})")
        upper = led.params.if_max_upper
        if if_max.assumed and upper and worst > upper:  # why a default rating still gives full weight
            template += "; that is past {upper} too, the top of the class's usual ratings"
            values += (Value("upper", upper, "A"),)
        others = [o[2].id for o in over if o[2] is not led]
        if others:
            template += "; also over the margin: {others}"
        assumed_lines = led_assumptions(led, limit=True) + circuit_assumptions(a) + \
            [x for r in a.resistors for x in resistor_assumptions(r)]
        yield ctx.finding(a, severity, template, values=values, assumed=tuple(assumed_lines),
                          hint=_hint(ctx, a), led=led.id, pct=f"{(1 - margin) * 100:.0f} %", others=ids(others),
                          corner=corner)


def _corner(a: Driven) -> str:
    """The high-current corner in figures, for a voltage-driven circuit: what made the worst case."""
    ec = a.engine[0] if a.engine else None
    if isinstance(a, CurrentDriven) or ec is None or ec.supply is None:
        return ""
    tol = ec.r_series.maximum / ec.r_series.nominal - 1 if ec.r_series.nominal > 0 else 0.0
    parts = [f"{quantity(ec.supply.maximum, 'V')} supply"] + ([f"R −{quantity(tol, '%')}"] if tol > 0 else [])
    return ", ".join(parts + ["Vf at its minimum", f"{ec.ambient.maximum:g} °C ambient"])


def _hint(ctx: RuleContext, a: Driven) -> str:
    if isinstance(a, CurrentDriven):
        return "lower the set current so the worst case stays inside the margin"
    return ballast_hint(ctx, a, "raise the ballast resistance until the worst case is inside the margin")


RULE = Rule(
    id="current-margin",
    summary="worst-case LED current above 75 % of If_max (warning) or above If_max (error)",
    severity=Severity.ERROR,
    check=check,
    options=(MARGIN.option,),
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK, CircuitKind.SINK, CircuitKind.DRIVER),
)
