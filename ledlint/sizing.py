"""Fix sizing for hints: the E24 ballast and power rating that bring a circuit inside its limits.

Re-solves the analysis's own engine circuit with candidate values, so a hint's numbers come
from the same model as the finding's.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from ledlint.analyse import Analysis
from ledlint.engine import Circuit, Range, corners
from ledlint.eseries import ESeries, nearest_above
from ledlint.ratings import chip_for, derated_power

_MAX_STEPS = 48  # two decades of E24: far enough for any ballast that can be fixed by value


@dataclass(frozen=True)
class BallastFix:
    resistance: float  # ohm, an E24 value
    current_max: float  # A, the worst LED at the worst corner with it
    power_max: float  # W in the ballast at its worst corner
    rating: float  # W at 70 °C the part needs (design factor and derating applied)
    chip: str  # smallest common chip size with that rating, "" when larger than 2512


def _tolerance(r: Range) -> float:
    return (r.maximum - r.nominal) / r.nominal if r.nominal > 0 else 0.05


def _required_rating(power: float, design_factor: float, ambient_max: float, upper_c: float) -> float:
    # Usable = rating × design factor × IEC 60115-1 derating at the hottest ambient.
    derate = derated_power(1.0, ambient_max, upper_category_c=upper_c)
    return power / (design_factor * derate) if derate > 0 else float("inf")


def ballast_for(analysis: Analysis, current_limit: float, *, design_factor: float = 0.5,
                upper_category_c: float = 155.0) -> BallastFix | None:
    """The smallest E24 common ballast keeping every LED at or under `current_limit` in every corner."""
    if not analysis.engine or analysis.set_current is not None:
        return None
    best: BallastFix | None = None
    for ec in analysis.engine:  # several when each string is lit alone: size for the worst
        fix = _size(ec, current_limit)
        if fix is None:
            return None
        if best is None or fix.resistance > best.resistance:
            best = fix
    if best is None:
        return None
    ambient = analysis.engine[0].ambient.maximum
    rating = _required_rating(max(_power(ec, best.resistance) for ec in analysis.engine), design_factor, ambient,
                              upper_category_c)
    chip = chip_for(rating)
    return replace(best, rating=rating, chip=chip[0] if chip else "")


def _with_ballast(ec: Circuit, r: float) -> Circuit:
    return replace(ec, r_series=Range.tolerance(r, _tolerance(ec.r_series)))


def _power(ec: Circuit, r: float) -> float:
    return corners(_with_ballast(ec, r)).ballast_power_max


def _size(ec: Circuit, limit: float) -> BallastFix | None:
    now = corners(ec)
    i_now = float(now.led_current_max.max())
    if i_now <= 0:
        return None
    # Start near the value that would scale the current down, then walk up the E24 series.
    start = max(ec.r_series.nominal, 1.0) * min(1.0, max(0.5, limit / i_now))
    r = nearest_above(start, ESeries.E24)
    for _ in range(_MAX_STEPS):
        cor = corners(_with_ballast(ec, r))
        i_max = float(cor.led_current_max.max())
        if i_max <= limit:
            return BallastFix(r, i_max, cor.ballast_power_max, 0.0, "")
        r = nearest_above(r * 1.0001, ESeries.E24)
    return None


def equal_share_resistor(supply_nominal: float, vf_typical: float, current: float) -> float | None:
    """An E24 resistor that gives one LED about `current` on its own (Ohm's law, Vf fixed)."""
    if current <= 0 or supply_nominal <= vf_typical:
        return None
    return nearest_above((supply_nominal - vf_typical) / current, ESeries.E24)
