"""resistor-overload: a resistor's worst-case dissipation against its usable rating.

What it flags
    A ballast, balancing or sense resistor whose dissipation at its worst corner is above its
    usable power: the rated power at 70 °C times the design factor (50 % by default), derated
    further above 70 °C ambient on the IEC 60115-1 line. Error above the full (derated)
    rating, warning above the usable one, info when the rating is not known.

Why it matters
    A chip resistor at its full rating runs hot enough to drift, darken the board and
    fail early; the trade keeps continuous dissipation to about half the rating. A sense
    resistor in a current sink carries the whole LED current, so a small package often
    overloads there first.

Example
    A 100 Ω 0603 (0.1 W) ballast from +12V to one red LED dissipates up to 1.1 W at the worst
    corner: error, far past even the full rating. A 680 Ω 0603 still dissipates up to 0.19 W:
    above the full rating too; at the 50 % design factor it needs 0.38 W of rating, a 1210
    (0.5 W) or larger.

Fix
    Use the package or power rating in the hint, or raise the value where the current allows.

Formula
    P = I²·R at the worst corner. Usable = P70 · design factor · derating(Ta), with
    derating(Ta) = 1 for Ta ≤ 70 °C and (T_UCT − Ta) / (T_UCT − 70 °C) above, T_UCT the upper
    category temperature (155 °C for thick and metal film).

Source
    IEC 60115-1 (fixed resistors, generic specification): rated dissipation at 70 °C, derated
    linearly to zero at the upper category temperature. The 50 % design factor is common
    in-house practice (resistor makers' application notes and derating guides say the same).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.analysis.results import Computed, CurrentDriven, ResistorRole
from ledlint.circuits.circuit import CircuitKind
from ledlint.checks.findings import Finding, Severity, Value, quantity
from ledlint.parts.params import Param
from ledlint.quantities.ratings import chip_for, derated_power
from ledlint.checks.registry import Rule, RuleContext
from ledlint.rules._options import DESIGN_FACTOR
from ledlint.rules._support import circuit_assumptions, resistor_assumptions

_ROLE = {ResistorRole.BALLAST: "ballast", ResistorRole.BALANCING: "balancing resistor",
         ResistorRole.SENSE: "sense resistor"}


def check(ctx: RuleContext) -> Iterator[Finding]:
    factor = ctx.options[DESIGN_FACTOR.option.name]
    for a in ctx.analyses:
        if not isinstance(a, Computed):
            continue
        for r in a.resistors:
            if r.role is ResistorRole.BALANCING and isinstance(a, CurrentDriven) and (a.headroom_v or 0.0) < 0:
                continue  # the output cannot hold its current (driver-headroom): this power is not real
            role = _ROLE[r.role]
            rating = r.params.power
            comp = ctx.board.netlist.component(r.ref)
            footprint = comp.footprint if comp else ""
            if not isinstance(rating, Param):
                if r.power_max > 0.01:  # below 10 mW any resistor copes (the smallest chips are 1/32 W)
                    yield ctx.finding(a, Severity.INFO, "{ref} ({role}) dissipates up to {power}; its power rating "
                                      "is not known ({why})", refs=(r.ref,), values=(Value("power", r.power_max, "W"),),
                                      ref=r.ref, role=role, why=rating.reason, hint=rating.fix, line=_line(ctx, r.ref))
                continue
            full = derated_power(rating.value, r.ambient_max, upper_category_c=r.params.upper_category_c)
            usable = full * factor
            if r.power_max > full:
                severity, limit, what = Severity.ERROR, full, "its full rating of {rating}"
            elif r.power_max > usable:
                severity, limit, what = Severity.WARNING, usable, "{limit}, " + quantity(factor, "%") + " of its {rating} rating"
            else:
                continue
            need = r.power_max / factor / (full / rating.value) if full > 0 else float("inf")
            chip = chip_for(need)
            hint = (f"use a part rated at least {quantity(need, 'W')} at 70 °C"
                    + (f" (a {chip[0]} chip, {quantity(chip[1], 'W')}, or larger)" if chip else " (a power resistor)"))
            derated = "" if r.ambient_max <= 70 else f", derated to {quantity(full, 'W')} at {r.ambient_max:g} °C"
            yield ctx.finding(
                a, severity, "{ref} ({role}) dissipates up to {power} at its worst corner, above " + what +
                " ({footprint}{derated})",
                refs=(r.ref,), values=(Value("power", r.power_max, "W", limit, ">"), Value("rating", rating.value, "W"),
                                       Value("limit", limit, "W"), Value("current", r.current_max, "A")),
                assumed=tuple(resistor_assumptions(r, rating=True) + circuit_assumptions(a)), hint=hint,
                ref=r.ref, role=role, footprint=footprint or "no footprint", derated=derated, line=_line(ctx, r.ref))


def _line(ctx: RuleContext, ref: str) -> int | None:
    comp = ctx.board.netlist.component(ref)
    return comp.line if comp else None


RULE = Rule(
    id="resistor-overload",
    summary="resistor dissipation above its usable rating (design factor, IEC 60115-1 derating)",
    severity=Severity.ERROR,
    check=check,
    options=(DESIGN_FACTOR.option,),
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK, CircuitKind.SINK, CircuitKind.DRIVER),
)
