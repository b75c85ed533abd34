"""Worst-case corners: every parameter at the end of its range that pushes the current one way."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np
from numpy.typing import NDArray

from ledlint.engine.model import Circuit, ModelError, Range
from ledlint.engine.solver import Cases, OperatingPoint, Setup, Solution, concat, groups
from ledlint.engine.thermal import heated

Array = NDArray[np.float64]

NOMINAL = "nominal"
MAX_CURRENT = "max_current"
MIN_CURRENT = "min_current"
HOTTEST = "hottest_junction"
MAX_RESISTOR_POWER = "max_resistor_power"
_LOW_R, _HIGH_R = "resistor_power_low_r", "resistor_power_high_r"
# Different strings in one bank the hogging corners are solved for: each kind adds two rows as
# wide as the bank, so the work grows with its square. Far beyond a real board's few part types.
MAX_STRING_KINDS = 256


def _end(r: Range, high: bool) -> float:
    return r.maximum if high else r.minimum


@dataclass(frozen=True)
class _Row:
    """One corner's parameter values."""

    name: str
    drive: float
    r_series: float
    r_switch: float
    v_switch: float
    r_branch: Array  # (K,)
    vf: Array  # (L,)
    ambient: float


def _ends(circuit: Circuit, name: str, drive_high: bool, path_high: bool, r_branch: Array,
          vf: Array, hot: bool) -> _Row:
    """A corner with the drive, the common path (resistances and switch drop) and the ambient each at one end."""
    return _Row(name, _end(circuit.drive, drive_high), _end(circuit.r_series, path_high),
                _end(circuit.r_switch, path_high), _end(circuit.v_switch, path_high), r_branch, vf,
                _end(circuit.ambient, hot))


def _rows(circuit: Circuit) -> list[_Row]:
    leds, branches = circuit.leds, circuit.branches
    vf_min = np.array([d.vf.minimum for d in leds])
    vf_max = np.array([d.vf.maximum for d in leds])
    r_min = np.array([b.r.minimum for b in branches])
    r_max = np.array([b.r.maximum for b in branches])
    rows = [
        _Row(NOMINAL, circuit.drive.nominal, circuit.r_series.nominal, circuit.r_switch.nominal,
             circuit.v_switch.nominal, np.array([b.r.nominal for b in branches]),
             np.array([d.vf.nominal for d in leds]), circuit.ambient.nominal),
        _ends(circuit, MAX_CURRENT, True, False, r_min, vf_min, True),
        _ends(circuit, MIN_CURRENT, False, True, r_max, vf_max, False),
        # Ballast power I²R rises or falls with R depending on R against the rest of the
        # loop, so both ends are solved at the highest drive and the larger one kept.
        _ends(circuit, _LOW_R, True, False, r_min, vf_min, True),
        _ends(circuit, _HIGH_R, True, True, r_max, vf_min, True),
    ]
    if any(d.rth for d in leds):
        # The hottest junction: highest drive and least resistance, but every LED at its highest
        # Vf, for a ballasted LED dissipates more with a higher Vf while V > 2·Vf (P = I·Vf).
        rows.append(_ends(circuit, HOTTEST, True, False, r_min, vf_max, True))
    if len(branches) >= 2:
        branch_of = np.array(circuit.branch_of_led)
        kinds = sorted(set(_representatives(circuit)))
        if len(kinds) > MAX_STRING_KINDS:  # each kind costs two corners the width of the whole bank
            raise ModelError(f"{len(kinds)} different strings in parallel: the engine solves banks of up to "
                             f"{MAX_STRING_KINDS} different ones")
        for k in kinds:
            mine, own_r = branch_of == k, np.arange(len(branches)) == k
            # String k at its lowest Vf and least resistance, the other strings at their highest,
            # so that it takes the largest share: it hogs. (A string identical to one already
            # solved hogs the same, by symmetry: one corner serves them all.)
            rows.append(_ends(circuit, f"worst_high[{k}]", True, False,
                              np.where(own_r, r_min, r_max), np.where(mine, vf_min, vf_max), True))
            rows.append(_ends(circuit, f"worst_low[{k}]", False, True,
                              np.where(own_r, r_max, r_min), np.where(mine, vf_max, vf_min), False))
    return rows


def _representatives(circuit: Circuit) -> list[int]:
    """For each string, the first string identical to it (same LEDs, same resistor range)."""
    first: dict[object, int] = {}
    return [first.setdefault(b, k) for k, b in enumerate(circuit.branches)]


@dataclass(frozen=True)
class _Twins:
    """Where each LED's and string's hogging figures are: the hogging corners of the first string
    identical to its own, at the LED in the same place. -1 where there are no hogging corners."""

    led: NDArray[np.intp]  # (L,) the LED standing in for each LED
    high: NDArray[np.intp]  # (L,) the row where that LED's string hogs
    low: NDArray[np.intp]  # (L,) the row where it is starved
    branch: NDArray[np.intp]  # (K,) the string standing in for each string
    branch_high: NDArray[np.intp]  # (K,) the row where that string hogs

    @classmethod
    def of(cls, circuit: Circuit, names: list[str]) -> _Twins:
        reps = _representatives(circuit)
        starts = np.concatenate([[0], np.cumsum([len(b.leds) for b in circuit.branches])[:-1]]).astype(np.intp)
        led, high, low = [], [], []
        for k, b in enumerate(circuit.branches):
            for i in range(len(b.leds)):
                led.append(int(starts[reps[k]]) + i)
                high.append(names.index(f"worst_high[{reps[k]}]") if len(reps) >= 2 else -1)
                low.append(names.index(f"worst_low[{reps[k]}]") if len(reps) >= 2 else -1)
        branch_high = [names.index(f"worst_high[{r}]") if len(reps) >= 2 else -1 for r in reps]
        return cls(*(np.array(x, dtype=np.intp) for x in (led, high, low, reps, branch_high)))


def _cases(circuit: Circuit, rows: list[_Row]) -> Cases:
    return Cases.build(
        circuit,
        len(rows),
        drive=[r.drive for r in rows],
        r_series=[r.r_series for r in rows],
        r_switch=[r.r_switch for r in rows],
        v_switch=[r.v_switch for r in rows],
        r_branch=np.array([r.r_branch for r in rows]),
        vf=np.array([r.vf for r in rows]),
        ambient=[r.ambient for r in rows],
    )


@dataclass(frozen=True)
class Corners:
    """The named corner cases of a circuit and their self-heated solutions, one row each."""

    names: tuple[str, ...]
    cases: Cases
    solution: Solution
    twins: _Twins

    def index(self, name: str) -> int:
        try:
            return self.names.index(name)
        except ValueError:
            raise ModelError(f"no corner named {name!r}; corners are {', '.join(self.names)}") from None

    def point(self, name: str) -> OperatingPoint:
        # Each named corner is read several times per circuit: built once.
        cache: dict[str, OperatingPoint] = self.__dict__.setdefault("_points", {})
        if name not in cache:
            cache[name] = self.solution.point(self.index(name))
        return cache[name]

    @property
    def nominal(self) -> OperatingPoint:
        return self.point(NOMINAL)

    @property
    def max_current(self) -> OperatingPoint:
        return self.point(MAX_CURRENT)

    @property
    def min_current(self) -> OperatingPoint:
        return self.point(MIN_CURRENT)

    @property
    def max_resistor_power(self) -> OperatingPoint:
        return self.point(MAX_RESISTOR_POWER)

    def _per_string(self, prefix: str) -> tuple[OperatingPoint, ...]:
        return tuple(self.solution.point(s) for s, name in enumerate(self.names)
                     if name.startswith(prefix))

    @property
    def worst_high(self) -> tuple[OperatingPoint, ...]:
        """Per kind of string, the corner where it hogs (banks only; empty for one string)."""
        return self._per_string("worst_high[")

    @property
    def worst_low(self) -> tuple[OperatingPoint, ...]:
        """Per kind of string, the corner where it is starved (banks only; empty for one string)."""
        return self._per_string("worst_low[")

    def _over_corners(self, values: Array, largest: bool) -> Array:
        """Per LED, the largest (or least) of `values` (S, L) over every corner, its own string's
        hogging corners counted through the identical string that stands in for it."""
        t = self.twins
        out = values.max(axis=0) if largest else values.min(axis=0)
        if t.high.size and t.high[0] >= 0:
            pick = np.maximum if largest else np.minimum
            out = pick(out, pick(values[t.high, t.led], values[t.low, t.led]))
        return np.asarray(out)

    @property
    def led_current_max(self) -> Array:
        """Each LED's largest current over all corners, (L,)."""
        return self._over_corners(self.solution.led_current, True)

    @property
    def led_current_min(self) -> Array:
        return self._over_corners(self.solution.led_current, False)

    @property
    def tj_max(self) -> Array:
        """Each LED's hottest junction over all corners, °C, (L,)."""
        return self._over_corners(self.solution.tj, True)

    @property
    def led_voltage_min(self) -> Array:
        """Each LED's least voltage over all corners (most reverse), (L,)."""
        return self._over_corners(self.solution.led_voltage, False)

    def _branch_max(self, values: Array) -> Array:
        t = self.twins
        out = values.max(axis=0)
        if t.branch_high.size and t.branch_high[0] >= 0:
            out = np.maximum(out, values[t.branch_high, t.branch])
        return np.asarray(out)

    @property
    def branch_current_max(self) -> Array:
        """Each string's largest current over all corners, (K,)."""
        return self._branch_max(self.solution.branch_current)

    @property
    def branch_resistor_power_max(self) -> Array:
        """The most each string's own resistor dissipates over all corners, W, (K,)."""
        return self._branch_max(self.solution.branch_resistor_power)

    @property
    def ballast_power_max(self) -> float:
        return float(self.solution.ballast_power.max())


def _named(circuit: Circuit, rows: list[_Row], cases: Cases, solution: Solution) -> Corners:
    names = [r.name for r in rows]
    power = solution.ballast_power + solution.branch_resistor_power.sum(axis=1)
    low, high = names.index(_LOW_R), names.index(_HIGH_R)
    keep, drop = (low, high) if power[low] >= power[high] else (high, low)
    names[keep] = MAX_RESISTOR_POWER
    rows_kept = np.array([s for s in range(len(names)) if s != drop])
    kept = [names[s] for s in rows_kept]
    return Corners(names=tuple(kept), cases=cases.take(rows_kept), solution=solution.take(rows_kept),
                   twins=_Twins.of(circuit, kept))


def corners_many(circuits: Sequence[Circuit]) -> list[Corners]:
    """``corners`` of many circuits: one self-heated solve per group of same-shaped circuits."""
    done: dict[Circuit, Corners] = {}
    for group in groups(circuits):
        setup = Setup.of(group[0])
        rows = [_rows(c) for c in group]
        cases = [_cases(c, r) for c, r in zip(group, rows)]
        solution = heated(setup, concat(cases))
        start = 0
        for c, r, cs in zip(group, rows, cases):
            done[c] = _named(c, r, cs, solution.take(np.arange(start, start + len(r))))
            start += len(r)
    return [done[c] for c in circuits]


def corners(circuit: Circuit) -> Corners:
    """Solve the nominal and worst-case corners of ``circuit``, with self-heating where Rth is known."""
    return corners_many([circuit])[0]


def ballast_scan(circuit: Circuit, r_nominal: Sequence[float], rel_min: float,
                 rel_max: float) -> tuple[Array, Array]:
    """For each candidate nominal ballast: the largest LED current over the current-raising corners,
    and the largest ballast dissipation (both ends of the ballast's tolerance at the highest drive).

    A candidate sits at ``r·rel_min`` and ``r·rel_max`` at its tolerance ends. One self-heated
    solve covers every candidate (fix sizing for hints).
    """
    rows = _rows(circuit)
    keep = [i for i, r in enumerate(rows) if r.name in (MAX_CURRENT, _LOW_R, _HIGH_R)
            or r.name.startswith("worst_high[")]
    high_r = np.array([rows[i].name == _HIGH_R for i in keep])
    base = _cases(circuit, [rows[i] for i in keep])
    m, n = len(keep), len(r_nominal)
    ends = np.where(high_r, rel_max, rel_min)
    r_series = (np.asarray(r_nominal, dtype=float)[:, None] * ends[None, :]).ravel()
    cases = base.take(np.tile(np.arange(m), n)).replace(r_series=r_series)
    solution = heated(Setup.of(circuit), cases)
    current = solution.led_current.reshape(n, m, -1)[:, ~high_r].max(axis=(1, 2))
    power = solution.ballast_power.reshape(n, m).max(axis=1)
    return current, power
