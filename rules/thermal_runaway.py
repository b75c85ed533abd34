"""thermal-runaway: an electro-thermal loop that amplifies heating in a voltage-driven LED circuit.

What it flags
    A voltage-driven LED string or bank whose electro-thermal loop gain G reaches 0.5: a
    rise in junction temperature lowers Vf, which raises the current, which heats the
    junction further. G ≥ 1 is runaway; 0.5 already doubles every thermal disturbance.

Why it matters
    Power LEDs on a stiff rail with a small ballast, and LEDs sharing a resistor (one LED
    heats, hogs current from the others, heats more), can creep up in current over minutes
    until they fail. A bigger ballast drop or a current driver breaks the loop.

Example
    Two 1 W white LEDs (Vf 3.0 V at 350 mA, If_max 1 A, Rth 30 K/W) in parallel from +5V
    through one 3.3 Ω: about 320 mA each, and G ≈ 0.57, a warning: one LED warms, its Vf falls,
    it takes current from the other and warms further (shared-resistor-bank reports the split
    as well). Fixed: 5.6 Ω for each LED (a power resistor: about 1.3 W at the worst corner),
    and G ≈ 0.01.

Fix
    Raise the ballast so its drop is large against the Vf shift (about 1 V for ±10 % over
    50 K), use a constant-current driver, or improve the LED's heat path (lower Rth).

Formula
    G = Rth · ∂P/∂Tj at the operating point (the largest eigenvalue of the loop matrix over
    the LEDs). For one LED through R: G = Rth · |k| · (Vf − I·R) / (R + r_d), k = dVf/dT.
    The steady-state disturbance is amplified by 1 / (1 − G).

Source
    The thermal-stability criterion dP/dTj < 1/Rth of power-electronics textbooks (worked as
    "Thermal stability" examples there); the closed form for an LED on a voltage source
    through R follows from a linear Vf(I, Tj) model (common practice).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.checks.findings import Finding, Severity, Value
from ledlint.analysis.results import BankResult, VoltageDriven
from ledlint.checks.registry import Option, Rule, RuleContext
from ledlint.circuits.circuit import CircuitKind
from ledlint.rules._support import assumed_param, by_evidence, circuit_assumptions, ids


def check(ctx: RuleContext) -> Iterator[Finding]:
    limit = ctx.options["gain_limit"]
    for a in ctx.analyses:
        if not isinstance(a, VoltageDriven) or a.loop_gain is None or a.loop_gain < limit or a.unlimited:
            continue  # an LED with nothing to limit it: unlimited-led says so, and no ballast drop can help
        rth_assumed = any(r.params.rth is not None and r.params.rth.assumed for r in a.leds)
        severity = by_evidence(Severity.WARNING, rth_assumed)
        amplification = 1 / (1 - a.loop_gain) if a.loop_gain < 1 else float("inf")
        template = ("{leds}: electro-thermal loop gain {gain} (limit {limit}): a warmer junction lowers Vf, raises "
                    "the current and heats it further" + (", amplifying any disturbance {amp}×" if a.loop_gain < 1
                                                           else "; it has no stable operating point"))
        assumed = [x for r in a.leds for x in assumed_param(f"{r.id} Rth", r.params.rth, "K/W")]
        yield ctx.finding(a, severity, template, values=(Value("gain", a.loop_gain, "", limit, ">="),),
                          assumed=tuple(assumed + circuit_assumptions(a)), leds=ids(a.circuit.leds),
                          limit=f"{limit:g}", amp=f"{amplification:.2g}",
                          hint=("give each string its own ballast (the loop is one string taking current from "
                                "the others: a shared resistor cannot stop it), use a constant-current driver per "
                                "string, or lower the LEDs' thermal resistance") if isinstance(a, BankResult) else
                          ("raise the ballast drop (about 1 V across it), use a constant-current driver, or lower "
                           "the LED's thermal resistance"))


RULE = Rule(
    id="thermal-runaway",
    summary="electro-thermal loop gain of a voltage-driven string or bank at or above 0.5",
    severity=Severity.WARNING,
    check=check,
    options=(Option("gain_limit", 0.5, "", "loop gain from which to warn", 0.05, 5.0),),
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK),
)
