"""Worst-case corners: ordering, the hogging corners of banks, the resistor-power corner.

Ordering is common practice: more supply, less resistance, lower Vf and a hotter junction
(tc < 0) each raise an LED's current, so the corners bracket the nominal.
"""

from __future__ import annotations

import numpy as np
import pytest

from ledlint.engine import Branch, Circuit, ModelError, Range, corners, solve
from ledlint.engine.solver import Cases


def _bank(make_led, rth: float | None = None, balance: Range = Range.fixed(0.0)) -> Circuit:
    leds = [make_led(v, 0.1, rth=rth) for v in (1.95, 2.0, 2.05)]
    return Circuit(branches=tuple(Branch((d,), balance) for d in leds),
                   supply=Range.tolerance(5.0, 0.05), r_series=Range.tolerance(33.0, 0.05),
                   ambient=Range(25.0, -20.0, 70.0))


@pytest.mark.parametrize("rth", [None, 400.0])
def test_corners_bracket_the_nominal(make_led, rth: float | None) -> None:
    for circuit in (_bank(make_led, rth), _bank(make_led, rth, Range.tolerance(22.0, 0.05)),
                    Circuit(branches=(Branch((make_led(2.0, 0.2, rth=rth), make_led(2.1, 0.2))),),
                            supply=Range(12.0, 11.0, 13.0), r_series=Range.tolerance(330.0, 0.1),
                            ambient=Range(25.0, -40.0, 85.0))):
        c = corners(circuit)
        nominal, high, low = c.nominal.led_current, c.max_current.led_current, c.min_current.led_current
        assert np.all(low <= nominal) and np.all(nominal <= high)
        assert np.all(c.led_current_max >= high) and np.all(c.led_current_min <= low)
        assert np.all(c.solution.settled)


def test_hogging_corners_of_a_bank(make_led) -> None:
    circuit = _bank(make_led, 400.0)
    c = corners(circuit)
    assert len(c.worst_high) == len(c.worst_low) == 3
    for j, (high, low) in enumerate(zip(c.worst_high, c.worst_low)):
        assert high.led_current[j] >= c.max_current.led_current[j]
        assert low.led_current[j] <= c.min_current.led_current[j]
        assert c.led_current_max[j] == high.led_current[j]
        assert c.led_current_min[j] == low.led_current[j]
    # The hogging LED's Vf is at its minimum and the others at their maximum.
    worst = c.cases.vf[c.index("worst_high[1]")]
    assert worst.tolist() == pytest.approx([2.05, 1.9, 2.15])


def test_a_single_string_has_no_hogging_corners(make_led) -> None:
    circuit = Circuit(branches=(Branch((make_led(2.0, 0.1),)),), supply=Range.fixed(5.0),
                      r_series=Range.tolerance(150.0, 0.05))
    c = corners(circuit)
    assert c.worst_high == () and c.worst_low == ()
    assert c.names == ("nominal", "max_current", "min_current", "max_resistor_power")
    with pytest.raises(ModelError, match="no corner named"):
        c.point("hottest")


def test_resistor_power_corner_picks_the_larger_end(make_led) -> None:
    # P = I²R at the highest drive, checked here by solving both resistor ends directly.
    for ohms in (Range(4.0, 1.0, 8.0), Range(150.0, 100.0, 2000.0)):
        circuit = Circuit(branches=(Branch((make_led(2.0, 0.1),)),), supply=Range(5.0, 4.5, 5.5),
                          r_series=ohms, ambient=Range(25.0, 0.0, 60.0))
        ends = solve(circuit, Cases.build(circuit, 2, drive=5.5, r_series=[ohms.minimum, ohms.maximum],
                                          vf=1.9, ambient=60.0))
        c = corners(circuit)
        assert c.max_resistor_power.ballast_power == pytest.approx(ends.ballast_power.max(), rel=1e-9)
        assert c.ballast_power_max == pytest.approx(ends.ballast_power.max(), rel=1e-9)


def test_current_driven_corners(make_led) -> None:
    leds = [make_led(3.0, 0.15, i_test=0.35, n=2.5, r_s=0.6, tc=-0.0028) for _ in range(2)]
    circuit = Circuit(branches=tuple(Branch((d,), Range.tolerance(1.0, 0.01)) for d in leds),
                      drive_current=Range.tolerance(0.7, 0.03))
    c = corners(circuit)
    # The drive sets the total in every corner; the hogging corners split it worst.
    assert c.solution.common_current.tolist() == pytest.approx(c.cases.drive.tolist(), rel=1e-12)
    assert c.worst_high[0].led_current[0] > 0.7 * 1.03 / 2
