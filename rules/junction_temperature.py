"""junction-temperature: an LED's self-heated junction past its rating, within its current rating.

What it flags
    An LED whose junction, heated by its own dissipation through its thermal resistance Rth,
    passes its Tj_max at the hottest corner (hottest ambient, highest supply, least resistance,
    at either end of the LED's Vf range), while its current is within If_max: the heat path, not
    the current, is at fault. Tj_max is 125 °C unless the
    part says (a field `Tj_max`); a default rating or Rth makes it one step less severe.

Why it matters
    LED lifetime and light output fall steeply with junction temperature, and past its rating
    the package and phosphor degrade. A power LED on a small copper area or a plastic housing
    can pass 150 °C at a current its datasheet allows.

Example
    A 1 W white LED (Vf 3.0 V at 350 mA, If_max 1.5 A) with 130 K/W to ambient, from +5V through
    4.7 Ω (a 5 W power resistor): about 0.5 A and 1.3 W nominal, and at the worst corner
    (40 °C ambient) a junction near 240 °C. Fixed: a heat path of 30 K/W (copper, a
    star board) holds it under 90 °C at the same corner.

Fix
    Lower the thermal resistance (more copper, a metal-core board, a heatsink) or the current.

Formula
    Tj = Ta + Rth · P, P = Vf · I (all of the electrical power taken as heat), solved as a fixed
    point with the LED's Vf falling as it warms.

Source
    Tj = Ta + θ·P_d, the junction-temperature relation of LED and power-device textbooks; LED
    junction ratings of 110-150 °C (a fact of the trade, common practice).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.analysis.results import Analysis, Driven, VoltageDriven
from ledlint.circuits.circuit import CircuitKind
from ledlint.checks.findings import Finding, Severity, Value
from ledlint.parts.params import Param
from ledlint.checks.registry import Rule, RuleContext
from ledlint.rules._support import assumed_param, by_evidence, circuit_assumptions


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        yield from _too_hot(ctx, a)


def _too_hot(ctx: RuleContext, a: Analysis) -> Iterator[Finding]:
    """A junction that self-heating takes past its rating at the worst corner."""
    if not isinstance(a, Driven) or (isinstance(a, VoltageDriven) and a.unlimited):
        return  # with nothing limiting the current, unlimited-led already says it all
    # An LED driven past its If_max is current-margin's finding; a junction too hot within the
    # current rating (a poor heat path) is the one to add.
    hot = [r for r in a.leds if r.params.rth is not None and r.tj_max > r.params.tj_max.value
           and not (isinstance(r.params.if_max, Param) and r.current.maximum > r.params.if_max.value)]
    if not hot:
        return
    led = max(hot, key=lambda r: r.tj_max - r.params.tj_max.value)
    assumed = led.params.tj_max.assumed or bool(led.params.rth and led.params.rth.assumed)
    yield ctx.finding(a, by_evidence(Severity.WARNING, assumed),
                      "{led}'s junction reaches {tj} at the worst corner, above its Tj_max of {tj_max}",
                      values=(Value("tj", led.tj_max, "°C", led.params.tj_max.value, ">"),
                              Value("tj_max", led.params.tj_max.value, "°C")),
                      assumed=tuple(assumed_param(f"{led.id} Rth", led.params.rth, "K/W")
                                    + assumed_param(f"{led.id} Tj_max", led.params.tj_max, "°C")
                                    + circuit_assumptions(a)),
                      led=led.id, hint="lower the current, or the thermal resistance (copper, a heatsink)")


RULE = Rule(
    id="junction-temperature",
    summary="self-heated LED junction past its Tj_max while within its current rating",
    severity=Severity.WARNING,
    check=check,
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK, CircuitKind.SINK, CircuitKind.DRIVER),
)
