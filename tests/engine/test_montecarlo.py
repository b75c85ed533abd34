"""Monte Carlo: uniform draws within every range, deterministic per seed, honest statistics."""

from __future__ import annotations

import numpy as np
import pytest

from ledlint.engine import Branch, Circuit, ModelError, Range, corners, monte_carlo, solve
from ledlint.engine.montecarlo import Summary


def _bank(make_led, n: int = 4, rth: float | None = None) -> Circuit:
    return Circuit(branches=tuple(Branch((make_led(2.0, 0.1, rth=rth),), Range.tolerance(10.0, 0.05))
                                  for _ in range(n)),
                   supply=Range.tolerance(5.0, 0.05), r_series=Range.tolerance(22.0, 0.05),
                   ambient=Range(25.0, 0.0, 50.0))


def test_same_seed_same_samples(make_led) -> None:
    circuit = _bank(make_led)
    a, b, other = (monte_carlo(circuit, 500, seed) for seed in (3, 3, 4))
    np.testing.assert_array_equal(a.solution.led_current, b.solution.led_current)
    assert not np.array_equal(a.cases.vf, other.cases.vf)


def test_draws_cover_and_stay_in_their_ranges(make_led) -> None:
    circuit = _bank(make_led)
    mc = monte_carlo(circuit, 4000, seed=1)
    for values, r in ((mc.cases.drive, circuit.supply), (mc.cases.r_series, circuit.r_series),
                      (mc.cases.ambient, circuit.ambient), (mc.cases.vf, circuit.leds[0].vf),
                      (mc.cases.r_branch, circuit.branches[0].r)):
        assert r is not None
        assert values.min() >= r.minimum and values.max() <= r.maximum
        # Uniform on [min, max]: mean in the middle, std (max − min)/√12 (within sampling error).
        width = r.maximum - r.minimum
        assert values.mean() == pytest.approx((r.minimum + r.maximum) / 2, abs=0.02 * width)
        assert values.std() == pytest.approx(width / np.sqrt(12), rel=0.03)
    # Each LED's Vf is drawn independently.
    assert abs(np.corrcoef(mc.cases.vf[:, 0], mc.cases.vf[:, 1])[0, 1]) < 0.05


def test_samples_lie_between_the_corners(make_led) -> None:
    circuit = _bank(make_led, rth=300.0)
    mc, c = monte_carlo(circuit, 2000), corners(circuit)
    assert np.all(mc.current.maximum <= c.led_current_max * (1 + 1e-9))
    assert np.all(mc.current.minimum >= c.led_current_min * (1 - 1e-9))
    assert np.all(mc.solution.settled)


def test_a_sample_is_a_solve_of_its_case(make_led) -> None:
    circuit = _bank(make_led)  # no Rth: Tj is the sampled ambient
    mc = monte_carlo(circuit, 50, seed=2)
    np.testing.assert_allclose(solve(circuit, mc.cases).led_current, mc.solution.led_current,
                               rtol=1e-12)


def test_summary_and_spread(make_led) -> None:
    mc = monte_carlo(_bank(make_led), 1000)
    current = mc.solution.led_current
    assert mc.current.mean == pytest.approx(current.mean(axis=0))
    assert mc.current.p99 == pytest.approx(np.percentile(current, 99, axis=0))
    expected = (current.max(axis=1) - current.min(axis=1)) / current.mean(axis=1)
    assert mc.spread == pytest.approx(expected)
    assert mc.spread_summary.maximum == pytest.approx(expected.max())
    # A string (one branch) shares nothing: zero spread in every sample.
    string = Circuit(branches=(Branch((make_led(2.0, 0.1), make_led(2.0, 0.1))),),
                     supply=Range.fixed(9.0), r_series=Range.fixed(150.0))
    assert np.all(monte_carlo(string, 100).spread == 0.0)


def test_spread_is_undefined_when_nothing_flows(make_led) -> None:
    reversed_bank = Circuit(branches=_bank(make_led).branches, supply=Range(-5.0, -6.0, -4.0))
    mc = monte_carlo(reversed_bank, 20)
    assert np.all(np.isnan(mc.spread)) and np.isnan(mc.spread_summary.mean)
    summary = Summary.of(np.array([[1.0, np.nan], [3.0, np.nan]]))
    assert summary.mean[0] == 2.0 and np.isnan(summary.mean[1])


@pytest.mark.parametrize("samples", [0, -1, 2.5, True])
def test_sample_count_must_be_a_positive_integer(make_led, samples: object) -> None:
    with pytest.raises(ModelError, match="samples"):
        monte_carlo(_bank(make_led), samples)  # type: ignore[arg-type]
