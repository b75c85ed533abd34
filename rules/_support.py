"""Shared wording for the built-in rules: what a finding rests on, and severity by evidence."""

from __future__ import annotations

from typing import Iterable

from ledlint.analysis.results import Analysis, Computed, CurrentDriven, Driven, Incomplete, LedResult, ResistorResult
from ledlint.analysis.switching import SwitchDrive
from ledlint.checks.findings import Severity, quantity
from ledlint.checks.registry import RuleContext
from ledlint.circuits.circuit import Wired
from ledlint.parts.kinds import LedId
from ledlint.parts.params import Missing, Origin, Param
from ledlint.rules._options import DEAD_RATIO, DESIGN_FACTOR, MARGIN, MIN_RATIO


def assumed_param(name: str, p: Param | Missing | None, unit: str = "") -> list[str]:
    """'D3 Vf max 2.5 V: maximum of a red LED, built-in table' when the netlist did not state it."""
    if isinstance(p, Param) and p.origin in (Origin.DEFAULT, Origin.FOOTPRINT):
        return [f"{name}{'' if name.endswith('±') else ' '}{p.describe(unit)}"]
    return []


def led_assumptions(led: LedResult, *, limit: bool = False, vf: bool = True) -> list[str]:
    p = led.params
    out: list[str] = []
    if vf:
        out += assumed_param(f"{led.id} Vf", p.vf, "V") + assumed_param(f"{led.id} Vf min", p.vf_min, "V") \
            + assumed_param(f"{led.id} Vf max", p.vf_max, "V")
    if limit:
        out += assumed_param(f"{led.id} If_max", p.if_max, "A")
    return out


def resistor_assumptions(r: ResistorResult, *, rating: bool = False) -> list[str]:
    out = assumed_param(f"{r.ref} tolerance ±", r.params.tolerance, "%")
    if rating:
        out += assumed_param(f"{r.ref} rating", r.params.power, "W")
    return out


def circuit_assumptions(a: Analysis) -> list[str]:
    """What a circuit's figures rest on: the ambient, the supply, the parts' assumed behaviour."""
    out = [a.ambient_basis] if isinstance(a, Computed) and a.ambient_basis else []
    if isinstance(a, (Computed, Incomplete)):
        out += list(a.supply.basis) if a.supply else []
        out += list(a.assumptions)
    set_current = a.set_current if isinstance(a, (CurrentDriven, Incomplete)) else None
    if set_current is not None:
        out.append(f"set current: {set_current.basis}")
    return out


def by_evidence(severity: Severity, assumed: bool) -> Severity:
    """A finding whose limit is only a built-in default is one step less severe."""
    return severity.lowered() if assumed else severity


def is_default(p: Param | Missing | None) -> bool:
    return isinstance(p, Param) and p.origin is Origin.DEFAULT


def join(items: Iterable[str]) -> str:
    items = list(items)
    if len(items) <= 2:
        return " and ".join(items)
    return ", ".join(items[:-1]) + " and " + items[-1]


def ids(leds: Iterable[LedResult | LedId | str]) -> str:
    names = [x.id if isinstance(x, LedResult) else x for x in leds]
    text = [str(x) for x in names]
    return join(text) if len(text) <= 6 else f"{text[0]} … {text[-1]} ({len(text)} LEDs)"


def current_target(ctx: RuleContext, a: Driven) -> float | None:
    """The current a fix must keep every LED under: the current-margin share of each known If_max,
    and the same share of any controller pin's limit."""
    margin = ctx.option_of(MARGIN)
    limits = [margin * r.params.if_max.value for r in a.leds if isinstance(r.params.if_max, Param)]
    limits += [margin * p.limit.value for p in a.pins]
    return min(limits) if limits else None


def ballast_hint(ctx: RuleContext, a: Driven, fallback: str) -> str:
    """One wording of the ballast fix, sized against every limit at once (see sizing.ballast_fix)."""
    from ledlint.analysis.sizing import NoBallast, ballast_fix  # the engine loads only when a hint is sized

    target = current_target(ctx, a)
    if target is None:
        return fallback
    fix = ballast_fix(a, target, design_factor=ctx.option_of(DESIGN_FACTOR), dead_ratio=ctx.option_of(DEAD_RATIO))
    if isinstance(fix, NoBallast):
        return fix.reason
    if fix is None:
        return fallback
    size = f"{fix.chip} or larger" if fix.chip else "a power resistor"
    c = a.circuit
    branches = c.branches if isinstance(c, Wired) else ()
    unit = "LED" if all(len(b.leds) == 1 for b in branches) else "string"
    ballast = [e.ref for e in c.resistors]
    shared = isinstance(c, Wired) and bool(c.shared_resistors)
    if fix.per_string and not shared:  # each string has its own already: change them all
        what = f"use {quantity(fix.resistance, 'Ω')} (E24) for each of {join(ballast)}"
    elif fix.per_string:
        what = f"give each {unit} its own {quantity(fix.resistance, 'Ω')} resistor (E24) instead of the shared one"
    else:
        what = f"use {quantity(fix.resistance, 'Ω')} (E24)" + (f" in place of {join(ballast)} together"
                                                               if len(ballast) > 1 else "")
    text = (f"{what}: worst case {quantity(fix.current_max, 'A')} (limit {quantity(target, 'A')}), "
            f"{quantity(fix.power_max, 'W')} in {'each' if fix.per_string else 'it'}, so at least "
            f"{quantity(fix.rating, 'W')} rated ({size})")
    if fix.low_ratio < ctx.option_of(MIN_RATIO):
        text += f"; at the low corner the current still falls to {quantity(fix.low_ratio, '%')} of nominal"
    return text


def switch_current(a: Driven) -> float:
    """The most current a switch in the LEDs' path carries: every string at its worst."""
    branches = a.circuit.branches if isinstance(a.circuit, Wired) else ()
    return max(r.current.maximum for r in a.leds) * max(len(branches), 1)


def base_resistor_hint(a: Driven, d: SwitchDrive, limit: float) -> str:
    """The base resistor that saturates a bipolar switch and spares its pin (sizing.base_resistor)."""
    from ledlint.analysis.sizing import FORCED_GAIN, base_resistor

    collector = switch_current(a)
    r_b = base_resistor(d, collector, limit)
    if r_b is None:
        return (f"no base resistor gives a tenth of {quantity(collector, 'A')} within the pin's "
                f"{quantity(limit, 'A')}: switch with a logic-level N-MOSFET, or add a driver stage")
    fit = (f"use {quantity(r_b, 'Ω')} (E24) for {d.resistor}" if d.resistor else
           f"put {quantity(r_b, 'Ω')} (E24) between {d.pin.ref} pin {d.pin.name or d.pin.number} and "
           f"{d.transistor}'s base")
    return (f"{fit}: at least 1/{FORCED_GAIN} of the {quantity(collector, 'A')} LED current into the base at the "
            f"weakest corner, and the pin within its {quantity(limit, 'A')}")
