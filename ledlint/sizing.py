"""Fix sizing for hints: the E24 ballast and power rating that bring a circuit inside its limits.

Re-solves the analysis's own engine circuit with candidate values, so a hint's numbers come
from the same model as the finding's.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from functools import lru_cache

from ledlint.analyse import Analysis
from ledlint.engine import Circuit, Range, monte_carlo
from ledlint.engine.corners import ballast_scan
from ledlint.eseries import ESeries, nearest_above, series_values
from ledlint.ratings import chip_for, derated_power

_SEED = 1  # a fixed Monte Carlo seed: the same hint every run


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
    fixes = [_size(ec, current_limit) for ec in analysis.engine]  # several when each string is lit alone
    if not fixes or any(f is None for f in fixes):
        return None
    best = max(fixes, key=lambda f: f.resistance)  # type: ignore[union-attr]
    # P ≈ V²/R falls as R rises, so each string's own worst dissipation bounds it at the larger R.
    power = max(f.power_max for f in fixes)  # type: ignore[union-attr]
    ambient = analysis.engine[0].ambient.maximum
    rating = _required_rating(power, design_factor, ambient, upper_category_c)
    chip = chip_for(rating)
    return replace(best, power_max=power, rating=rating, chip=chip[0] if chip else "")


def _candidates(start: float, decades: int) -> list[float]:
    """E24 values from the first at or above `start` to `decades` decades higher."""
    first = nearest_above(start, ESeries.E24)
    low = math.floor(math.log10(first))
    values = sorted({round(m * 10.0 ** d, 9) for d in range(low, low + decades + 1)
                     for m in series_values(ESeries.E24)})
    return [v for v in values if first * (1 - 1e-9) <= v <= first * 10 ** decades]


@lru_cache(maxsize=4096)
def _size(ec: Circuit, limit: float) -> BallastFix | None:
    """Smallest E24 ballast keeping every LED at or under `limit`; memoised, as boards repeat circuits."""
    tol = _tolerance(ec.r_series)
    # Ohm's law with the LEDs at their lowest Vf gives the scale; every E24 value over two
    # decades from half of it is tried in one solve.
    assert ec.supply is not None
    string = sum(led.vf.minimum for led in ec.branches[0].leds)
    estimate = max((ec.supply.maximum - string) / limit, ec.r_series.nominal, 1.0)
    candidates = _candidates(estimate * 0.5, 2)
    peaks, powers = ballast_scan(ec, candidates, 1.0 - tol, 1.0 + tol)
    for r, peak, power in zip(candidates, peaks, powers):
        if peak <= limit:
            return BallastFix(r, float(peak), float(power), 0.0, "")
    return None


def equal_share_resistor(supply_nominal: float, vf_typical: float, current: float) -> float | None:
    """An E24 resistor that gives one LED about `current` on its own (Ohm's law, Vf fixed)."""
    if current <= 0 or supply_nominal <= vf_typical:
        return None
    return nearest_above((supply_nominal - vf_typical) / current, ESeries.E24)


@dataclass(frozen=True)
class BalancingFix:
    resistance: float  # ohm, an E24 value, in series with each string
    tolerance: float
    spread: float  # the split's 99th-percentile spread with it (the rule's measure)
    drop: float  # V across it at the equal share
    power_max: float  # W in it at the worst sample


def balancing_for(analysis: Analysis, limit: float, tolerance: float = 0.01,
                  samples: int = 2000) -> BalancingFix | None:
    """The smallest E24 balancing resistor per string that brings the Monte Carlo split within `limit`.

    Searched by bisection over E24 values (the split falls as the resistor grows), each step
    re-running the analysis's own Monte Carlo with the candidate in every string.
    """
    if len(analysis.engine) != 1 or analysis.sharing is None:
        return None
    ec = analysis.engine[0]
    share = analysis.sharing.equal_share
    if share <= 0:
        return None
    candidates = _candidates(0.1, 5)

    def with_r(r: float) -> Circuit:
        return replace(ec, branches=tuple(replace(b, r=Range.tolerance(b.r.nominal + r, tolerance))
                                          for b in ec.branches))

    def spread(r: float):
        mc = monte_carlo(with_r(r), samples=samples, seed=_SEED)
        return float(mc.spread_summary.p99), float(mc.solution.branch_resistor_power.max())

    lo, hi = 0, len(candidates) - 1
    if spread(candidates[hi])[0] > limit:
        return None
    while lo < hi:
        mid = (lo + hi) // 2
        if spread(candidates[mid])[0] <= limit:
            hi = mid
        else:
            lo = mid + 1
    r = candidates[lo]
    got, power = spread(r)
    return BalancingFix(r, tolerance, got, r * share, power)
