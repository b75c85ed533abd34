"""Monte Carlo over the tolerances: every range drawn uniformly, every LED's Vf independently."""

from __future__ import annotations

import warnings
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from ledlint.engine.model import Circuit, ModelError
from ledlint.engine.solver import Cases, Setup, Solution
from ledlint.engine.thermal import heated

Array = NDArray[np.float64]


def _frozen(x: Array) -> Array:
    arr = np.asarray(x, dtype=float)
    arr.setflags(write=False)
    return arr


# mean, std, min, max, percentile; the NaN-aware versions are several times slower.
_PLAIN = (np.mean, np.std, np.min, np.max, np.percentile)
_NAN_AWARE = (np.nanmean, np.nanstd, np.nanmin, np.nanmax, np.nanpercentile)


@dataclass(frozen=True)
class Summary:
    """Statistics over the samples: mean, standard deviation, extremes, 1st and 99th percentile."""

    mean: Array
    std: Array
    minimum: Array
    maximum: Array
    p01: Array
    p99: Array

    @classmethod
    def of(cls, values: Array) -> Summary:
        """Statistics along axis 0, ignoring NaN (a sample where the quantity is undefined)."""
        with warnings.catch_warnings():
            # All-NaN columns give NaN statistics, which is the honest answer.
            warnings.simplefilter("ignore", RuntimeWarning)
            mean, std, low, high, percentile = _NAN_AWARE if np.isnan(values).any() else _PLAIN
            p01, p99 = percentile(values, [1, 99], axis=0)
            return cls(mean=_frozen(mean(values, axis=0)), std=_frozen(std(values, axis=0)),
                       minimum=_frozen(low(values, axis=0)), maximum=_frozen(high(values, axis=0)),
                       p01=_frozen(p01), p99=_frozen(p99))


@dataclass(frozen=True)
class MonteCarlo:
    """Sampled cases, their self-heated solutions and the per-LED current statistics."""

    samples: int
    seed: int
    cases: Cases
    solution: Solution
    current: Summary  # per LED, (L,)
    # Per sample, (max − min)/mean of the LED currents: how unevenly the bank shares.
    # NaN where the mean current is not positive (the bank is off or reversed).
    spread: Array  # (S,)
    spread_summary: Summary  # scalars


def _uniform(rng: np.random.Generator, low: float | list[float], high: float | list[float],
             size: int | tuple[int, int]) -> Array:
    # Read-only, so the cases take the draw without a copy.
    return _frozen(rng.uniform(low, high, size))


def monte_carlo(circuit: Circuit, samples: int = 10_000, seed: int = 0) -> MonteCarlo:
    """Draw ``samples`` cases uniformly within every tolerance and solve them (deterministic per seed)."""
    if isinstance(samples, bool) or not isinstance(samples, (int, np.integer)) or samples < 1:
        raise ModelError(f"samples must be a positive integer, got {samples!r}")
    rng = np.random.default_rng(seed)
    leds, branches = circuit.leds, circuit.branches
    # The draw order is fixed so that a seed always gives the same cases.
    cases = Cases.build(
        circuit,
        samples,
        drive=_uniform(rng, circuit.drive.minimum, circuit.drive.maximum, samples),
        r_series=_uniform(rng, circuit.r_series.minimum, circuit.r_series.maximum, samples),
        r_switch=_uniform(rng, circuit.r_switch.minimum, circuit.r_switch.maximum, samples),
        v_switch=_uniform(rng, circuit.v_switch.minimum, circuit.v_switch.maximum, samples),
        ambient=_uniform(rng, circuit.ambient.minimum, circuit.ambient.maximum, samples),
        r_branch=_uniform(rng, [b.r.minimum for b in branches], [b.r.maximum for b in branches],
                          (samples, len(branches))),
        vf=_uniform(rng, [d.vf.minimum for d in leds], [d.vf.maximum for d in leds],
                    (samples, len(leds))),
    )
    solution = heated(Setup.of(circuit), cases)
    current = solution.led_current
    mean = current.mean(axis=1)
    with np.errstate(divide="ignore", invalid="ignore"):
        spread = np.where(mean > 0, (current.max(axis=1) - current.min(axis=1)) / mean, np.nan)
    return MonteCarlo(samples=int(samples), seed=seed, cases=cases, solution=solution,
                      current=Summary.of(current), spread=_frozen(spread),
                      spread_summary=Summary.of(spread))
