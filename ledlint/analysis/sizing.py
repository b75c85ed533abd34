"""Fix sizing for hints: the E24 ballast and power rating that bring a circuit inside its limits.

Re-solves the analysis's own engine circuit with candidate values, so a hint's numbers come
from the same model as the finding's.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from functools import lru_cache

import numpy as np

from ledlint.analysis.results import Driven, VoltageDriven
from ledlint.analysis.switching import SwitchDrive
from ledlint.circuits.bank import ResistorBank
from ledlint.circuits.circuit import Wired
from ledlint.engine import Circuit, Range, corners, monte_carlo
from ledlint.engine.corners import ballast_scan
from ledlint.parts.devices import PIN_OUTPUT, VBE
from ledlint.quantities.eseries import ESeries, nearest_above, nearest_below, series_values
from ledlint.quantities.ratings import chip_for, derated_power
from ledlint.quantities.units import quantity



@dataclass(frozen=True)
class BallastFix:
    resistance: float  # ohm, an E24 value
    per_string: bool  # one resistor in each string (a bank split up), or the one common ballast
    current_max: float  # A, the worst LED at the worst corner with it
    power_max: float  # W in one such resistor at its worst corner
    rating: float  # W at 70 °C the part needs (design factor and derating applied)
    chip: str  # smallest common chip size with that rating, "" when larger than 2512
    low_ratio: float  # least current at the low corner over nominal, with it


@dataclass(frozen=True)
class NoBallast:
    """Why no resistor value can bring the circuit inside its limits."""

    reason: str


def _tolerance(r: Range) -> float:
    return (r.maximum - r.nominal) / r.nominal if r.nominal > 0 else 0.05


def _required_rating(power: float, design_factor: float, ambient_max: float, upper_c: float) -> float:
    # Usable = rating × design factor × IEC 60115-1 derating at the hottest ambient.
    derate = derated_power(1.0, ambient_max, upper_category_c=upper_c)
    return power / (design_factor * derate) if derate > 0 else float("inf")


def _strings(analysis: VoltageDriven) -> tuple[list[Circuit], bool]:
    """The circuits a ballast is sized for: each string on its own when the LEDs share one."""
    c = analysis.circuit
    if isinstance(c, ResistorBank) and not c.individually_driven:
        ec = analysis.engine[0]
        return [replace(ec, branches=(replace(b, r=Range.fixed(0.0)),), r_series=Range.tolerance(0.0, 0.05))
                for b in ec.branches], True
    return list(analysis.engine), False


def ballast_fix(analysis: Driven, current_limit: float, *, design_factor: float = 0.5,
                dead_ratio: float = 0.1, upper_category_c: float = 155.0) -> BallastFix | NoBallast | None:
    """The smallest E24 ballast that keeps every LED at or under `current_limit` in every corner; for
    LEDs sharing one resistor, the resistor each string should have instead. NoBallast when even
    then the low corner would leave under `dead_ratio` of the nominal current (the supply is too
    close to the string's Vf for any resistor). None when there is nothing to size."""
    if not isinstance(analysis, VoltageDriven) or not analysis.engine or current_limit <= 0:
        return None
    circuits, per_string = _strings(analysis)
    sized = [_size(ec, current_limit) for ec in circuits]
    fixes = [f for f in sized if f is not None]
    if len(fixes) < len(sized):
        return None
    best = max(fixes, key=lambda f: f.resistance)
    low = min(f.low_ratio for f in fixes)
    if low < dead_ratio:
        return NoBallast(f"no resistor value fixes it: with the supply at its least and every LED at its "
                         f"highest Vf only {quantity(low, '%')} of the nominal current would flow; use fewer LEDs per "
                         "string, a higher supply, or a constant-current driver")
    # P ≈ V²/R falls as R rises, so each string's own worst dissipation bounds it at the larger R.
    power = max(f.power_max for f in fixes)
    rating = _required_rating(power, design_factor, circuits[0].ambient.maximum, upper_category_c)
    chip = chip_for(rating)
    return replace(best, per_string=per_string, power_max=power, rating=rating, chip=chip[0] if chip else "")


def _candidates(start: float, decades: int) -> list[float]:
    """E24 values from the first at or above `start` to `decades` decades higher."""
    first = nearest_above(start, ESeries.E24)
    low = math.floor(math.log10(first))
    values = sorted({round(m * 10.0 ** d, 9) for d in range(low, low + decades + 1)
                     for m in series_values(ESeries.E24)})
    return [v for v in values if first * (1 - 1e-9) <= v <= first * 10 ** decades]


@lru_cache(maxsize=4096)
def _size(ec: Circuit, limit: float) -> BallastFix | None:
    """Smallest E24 ballast keeping every LED at or under `limit`; memoised, as boards repeat circuits.

    One vectorised solve scans every E24 candidate over the current-raising corners; the worst
    current falls as the ballast grows, so the first candidate under the limit is the smallest.
    """
    tol = _tolerance(ec.r_series)
    assert ec.supply is not None
    string = max(sum(led.vf.minimum for led in b.leds) for b in ec.branches)
    estimate = max((ec.supply.maximum - string) / limit, ec.r_series.nominal, 1.0)
    candidates = _candidates(estimate * 0.5, 3)

    peaks = ballast_scan(ec, candidates, 1.0 - tol, 1.0 + tol)[0]
    under = np.flatnonzero(peaks <= limit)
    if not len(under):
        return None
    r = candidates[int(under[0])]
    cor = corners(replace(ec, r_series=Range.tolerance(r, tol)))
    nominal = np.maximum(cor.nominal.led_current, 1e-15)
    ratio = float((cor.min_current.led_current / nominal).min())
    return BallastFix(r, False, float(cor.led_current_max.max()), cor.ballast_power_max, 0.0, "", ratio)


@dataclass(frozen=True)
class HeadroomFix:
    """What restores a resistor-fed string's headroom (see headroom_fix)."""

    supply: float | None  # V nominal, at the present supply's tolerance; None: no resistor can
    leds: int | None  # the most LEDs per string the present supply can take; None: no fewer will do


def headroom_fix(analysis: VoltageDriven, ratio: float) -> HeadroomFix | None:
    """The least nominal supply, at the present supply's tolerance, and the most LEDs per string
    on the present supply, that keep the low-corner current at `ratio` of nominal or more once
    the ballast is re-sized for the same current.

    With the ballast R' = (V − S) / I for the nominal string voltage S, the low corner gives
    (lo·V − H) / (k·R') ≥ ratio·I, so V ≥ (H − ratio·k·S) / (lo − ratio·k): lo = V_min / V,
    k = R_max / R, H the string at maximum Vf and coldest (each with the switch's drop). With
    n LEDs of s and h each, and a switch drop w, the same inequality bounds n. The LEDs' Vf
    falls with the lower current there, which only helps, so both bounds are on the safe side.
    """
    c = analysis.circuit
    if analysis.supply is None or analysis.headroom_v is None or not analysis.engine or not isinstance(c, Wired):
        return None
    volts = analysis.supply.volts
    ec = analysis.engine[0]
    path = ec.r_series + ec.r_switch + Range.fixed(ec.r_source)
    if volts.nominal <= 0 or path.nominal <= 0:
        return None
    lo, mk = volts.minimum / volts.nominal, ratio * path.maximum / path.nominal
    by_id = {r.id: r.vf for r in analysis.leds}
    branch = max(c.branches, key=lambda b: sum(by_id.get(e.led, 0.0) for e in b.leds))
    n, w = len(branch.leds), ec.v_switch.nominal
    s = sum(by_id.get(e.led, 0.0) for e in branch.leds) + w
    h = volts.minimum - analysis.headroom_v
    if lo - mk <= 0:
        return HeadroomFix(None, None)
    supply = max((h - mk * s) / (lo - mk), h)
    per_led = ((h - w) - mk * (s - w)) / n
    most = math.floor((volts.nominal * (lo - mk) - w * (1 - mk)) / per_led) if per_led > 0 else n
    return HeadroomFix(supply, most if 1 <= most < n else None)


FORCED_GAIN = 10  # I_C / I_B for a bipolar switch driven hard into saturation (common practice)


def base_resistor(drive: SwitchDrive, collector_max: float, limit: float) -> float | None:
    """The largest E24 base resistor that still saturates the switch at the forced gain with the
    weakest drive, if it also keeps the pin within `limit` with the strongest; else None."""
    high = drive.level
    if high is None:
        return None
    largest = (high.minimum - VBE.maximum) * FORCED_GAIN / max(collector_max, 1e-9) - PIN_OUTPUT.maximum
    least = (high.maximum - VBE.minimum) / limit - PIN_OUTPUT.minimum
    if largest <= 0:
        return None
    r = nearest_below(largest, ESeries.E24)
    return r if r >= least else None


def equal_share_resistor(supply_nominal: float, vf_typical: float, current: float) -> float | None:
    """An E24 resistor that gives one LED about `current` on its own (Ohm's law, Vf fixed)."""
    if current <= 0 or supply_nominal <= vf_typical:
        return None
    return nearest_above((supply_nominal - vf_typical) / current, ESeries.E24)


@dataclass(frozen=True)
class BalancingFix:
    resistance: float  # ohm, an E24 value: each string's whole balancing resistance
    tolerance: float
    spread: float  # the split's 99th-percentile spread with it (the rule's measure)
    drop: float  # V across it at the equal share
    power_max: float  # W in it at the worst sample
    replaces: bool  # the strings already have balancing resistors: this is the value to raise them to


def balancing_for(analysis: Driven, limit: float, tolerance: float = 0.01) -> BalancingFix | None:
    """The smallest E24 balancing resistance per string that brings the Monte Carlo split within
    `limit`.

    Searched by bisection over E24 values (the split falls as the resistor grows), each step
    re-running the analysis's own Monte Carlo (its samples and seed) with the candidate as every
    string's resistance: the board with the hint fitted is analysed with exactly these draws, so
    following the hint clears the rule.
    """
    if len(analysis.engine) != 1 or analysis.sharing is None:
        return None
    ec = analysis.engine[0]
    share = analysis.sharing.equal_share
    if share <= 0:
        return None
    present = max(b.r.nominal for b in ec.branches)
    candidates = [v for v in _candidates(0.1, 5) if v > present * (1 + 1e-9)]
    target, samples, seed = limit, analysis.sharing.samples, analysis.sharing.seed

    def fitted(r: float) -> Circuit:
        return replace(ec, branches=tuple(replace(b, r=Range.tolerance(r, tolerance)) for b in ec.branches))

    def spread(r: float) -> tuple[float, float]:
        mc = monte_carlo(fitted(r), samples=samples, seed=seed)
        return float(mc.spread_summary.p99), float(mc.solution.branch_resistor_power.max())

    if not candidates or spread(candidates[-1])[0] > target:
        return None
    lo, hi = 0, len(candidates) - 1
    while lo < hi:
        mid = (lo + hi) // 2
        if spread(candidates[mid])[0] <= target:
            hi = mid
        else:
            lo = mid + 1
    r = candidates[lo]
    got, power = spread(r)
    # The rating must cover the corners too, as resistor-overload will check the fitted board.
    power = max(power, float(corners(fitted(r)).solution.branch_resistor_power.max()))
    return BalancingFix(r, tolerance, got, r * share, power, present > 0)
