"""Hand calculations: Ohm's law, the §6 loop gain, the §7 current sharing.

Sources: field-facts §5c (dynamic resistance r_d = n·Vt/I + Rs; dVj/dT = (Vj − EG − XTI·Vt)/T),
§6 (G = Rth·|k|·(Vf − I·R)/(R + r_d) for a string through R) and §7 (I1 − I2 = δ/r_d on a
shared resistor, δ/(R + r_d) with a resistor each): all "common practice, derived".
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from ledlint.engine import (Branch, Circuit, LedSpec, Range, loop_gain, loop_gains,
                            operating_point, solve)
from ledlint.engine.constants import ZERO_CELSIUS, thermal_voltage
from ledlint.engine.solver import Cases


def _dynamic_resistance(led: LedSpec, current: float, celsius: float) -> float:
    return led.n * float(thermal_voltage(celsius)) / current + led.r_s  # field-facts §5c


def _vf_slope(led: LedSpec, vj: float, celsius: float) -> float:
    """dVf/dTj at constant current (field-facts §5c closed form), with EG as the engine
    documents it: the value that makes the slope at i_test and t_test equal tc."""
    t_nom = led.t_test + ZERO_CELSIUS
    vt_nom = float(thermal_voltage(led.t_test))
    eg = led.vf.nominal - led.i_test * led.r_s - led.xti * vt_nom - led.tc * t_nom
    t = celsius + ZERO_CELSIUS
    return (vj - eg - led.xti * float(thermal_voltage(celsius))) / t


@pytest.mark.parametrize(("volts", "ohms"), [(9.0, 150.0), (5.0, 330.0), (12.0, 1000.0), (3.3, 47.0)])
def test_ohms_law_with_a_fixed_vf(make_led, volts: float, ohms: float) -> None:
    # Hand rule I = (V − Vf)/R with Vf at i_test. Vf(I) is concave, so between i_test and the
    # true current its slope is at most r_d at the lower end: the engine's current lies
    # between the hand value and i_test, within r_d·|I_hand − i_test|/R of the hand value.
    led = make_led()
    circuit = Circuit(branches=(Branch((led,)),), supply=Range.fixed(volts),
                      r_series=Range.fixed(ohms))
    current = float(solve(circuit, Cases.build(circuit)).led_current[0, 0])
    hand = (volts - 2.0) / ohms
    r_d = _dynamic_resistance(led, min(hand, 0.02), 25.0)
    bound = r_d * abs(hand - 0.02) / ohms
    error = hand - current
    assert abs(error) <= bound
    assert math.copysign(1.0, error) == math.copysign(1.0, hand - 0.02)


def _check_loop_gain_formula(circuit: Circuit, led: LedSpec, ohms: float) -> float:
    point = operating_point(circuit).point(0)
    i, vf, tj = point.led_current[0], point.led_voltage[0], point.tj[0]
    k = _vf_slope(led, vf - i * led.r_s, tj)
    r_d = _dynamic_resistance(led, i, tj)
    expected = led.rth * abs(k) * (vf - i * ohms) / (ohms + r_d)  # field-facts §6
    gain = loop_gain(circuit)
    assert gain == pytest.approx(expected, rel=2e-3)
    return gain


def test_loop_gain_of_a_power_led_through_a_resistor() -> None:
    # Field-facts §6 "Numbers": 1 W LED, 3.0 V at 350 mA, r_d ≈ 1 ohm, k = −2.8 mV/K,
    # Rth = 30 K/W, from 3.3 V through 0.86 ohm: G ≈ 0.12. Demo LED with n = 2, so
    # Rs = 1 − 2·Vt/0.35.
    r_s = 1.0 - 2.0 * float(thermal_voltage(25.0)) / 0.35
    led = LedSpec(vf=Range.fixed(3.0), i_test=0.35, n=2.0, r_s=r_s, tc=-0.0028, rth=30.0)
    circuit = Circuit(branches=(Branch((led,)),), supply=Range.fixed(3.3),
                      r_series=Range.fixed(0.86))
    gain = _check_loop_gain_formula(circuit, led, 0.86)
    # The sheet's figure is at the unheated point; self-heating moves this one by ~10 %.
    assert gain == pytest.approx(0.12, rel=0.15)


def test_loop_gain_straight_on_a_rail() -> None:
    # Field-facts §6: the same LED on the rail (R = 0): G ≈ 0.25. Needs a rail that keeps it
    # near 350 mA: 3.0 V.
    r_s = 1.0 - 2.0 * float(thermal_voltage(25.0)) / 0.35
    led = LedSpec(vf=Range.fixed(3.0), i_test=0.35, n=2.0, r_s=r_s, tc=-0.0028, rth=30.0)
    circuit = Circuit(branches=(Branch((led,)),), supply=Range.fixed(3.0))
    gain = _check_loop_gain_formula(circuit, led, 0.0)
    assert gain == pytest.approx(0.25, rel=0.2)


def test_indicator_led_is_thermally_stable(make_led) -> None:
    # Field-facts §6: 5 V, 150 ohm, 2 V, 20 mA, Rth = 400 K/W: ΔTj ≈ 16 K, G < 0.
    led = make_led(rth=400.0)
    circuit = Circuit(branches=(Branch((led,)),), supply=Range.fixed(5.0),
                      r_series=Range.fixed(150.0))
    gain = _check_loop_gain_formula(circuit, led, 150.0)
    assert gain < 0
    point = operating_point(circuit).point(0)
    assert point.tj[0] - 25.0 == pytest.approx(16.0, rel=0.05)


def test_no_thermal_resistance_no_loop(make_led) -> None:
    circuit = Circuit(branches=(Branch((make_led(),)),), supply=Range.fixed(5.0),
                      r_series=Range.fixed(150.0))
    assert loop_gain(circuit) is None and loop_gains(circuit) is None


def test_bank_loop_gain_is_the_hogging_mode() -> None:
    # Field-facts §7: two LEDs on one shared resistor, loop gain ≈ Rth·|k|·Vf/r_d (their node
    # held): the mode where one heats and takes the other's current.
    r_s = 1.0 - 2.0 * float(thermal_voltage(25.0)) / 0.35
    led = LedSpec(vf=Range.fixed(3.0), i_test=0.35, n=2.0, r_s=r_s, tc=-0.0028, rth=30.0)
    circuit = Circuit(branches=(Branch((led,)), Branch((led,))), supply=Range.fixed(3.3),
                      r_series=Range.fixed(0.43))
    loop = loop_gains(circuit)
    assert loop is not None
    point = operating_point(circuit).point(0)
    i, vf, tj = point.led_current[0], point.led_voltage[0], point.tj[0]
    k = _vf_slope(led, vf - i * r_s, tj)
    expected = led.rth * abs(k) * vf / _dynamic_resistance(led, i, tj)
    assert loop.gain == pytest.approx(expected, rel=2e-3)
    assert sorted(loop.mode) == pytest.approx([-1.0, 1.0])  # one up, the other down


def _pair_currents(circuit: Circuit) -> tuple[float, float]:
    i = solve(circuit, Cases.build(circuit)).branch_current[0]
    return float(i[0]), float(i[1])


def test_shared_resistor_difference_is_delta_over_rd(make_led) -> None:
    # Field-facts §7: I1 − I2 = δ/r_d, independent of R. Small δ so one r_d holds for both.
    delta = 0.01
    for ohms, volts in ((10.0, 2.2), (100.0, 4.0), (1000.0, 22.0)):
        circuit = Circuit(branches=(Branch((make_led(2.0),)), Branch((make_led(2.0 + delta),))),
                          supply=Range.fixed(volts), r_series=Range.fixed(ohms))
        i1, i2 = _pair_currents(circuit)
        r_d = _dynamic_resistance(make_led(), (i1 + i2) / 2, 25.0)
        assert i1 - i2 == pytest.approx(delta / r_d, rel=0.01)


def test_shared_resistor_example(make_led) -> None:
    # Field-facts §7 example: δ = 0.1 V, r_d = 10 ohm gives ≈ 10 mA difference on a 2 × 10 mA
    # bank. Demo LEDs with r_d = 10 ohm at 10 mA (n = 2, Rs = 10 − 2·Vt/10 mA).
    r_s = 10.0 - 2.0 * float(thermal_voltage(25.0)) / 0.01
    leds = (make_led(2.0, r_s=r_s), make_led(2.1, r_s=r_s))
    # Supply and R chosen for 20 mA in total: the node sits near 2.0 V + 10 mA·r_d.
    circuit = Circuit(branches=tuple(Branch((d,)) for d in leds), supply=Range.fixed(4.05),
                      r_series=Range.fixed(100.0))
    i1, i2 = _pair_currents(circuit)
    assert i1 + i2 == pytest.approx(0.02, rel=0.05)
    assert i1 - i2 == pytest.approx(0.010, rel=0.1)


def test_individual_resistors_divide_the_mismatch(make_led) -> None:
    # Field-facts §7: I1 − I2 ≈ δ/(R + r_d); δ = 0.1 V, R = 150 ohm, r_d = 10 ohm: 0.6 mA.
    r_s = 10.0 - 2.0 * float(thermal_voltage(25.0)) / 0.02
    leds = (make_led(2.0, r_s=r_s), make_led(2.1, r_s=r_s))
    circuit = Circuit(branches=tuple(Branch((d,), Range.fixed(150.0)) for d in leds),
                      supply=Range.fixed(2.05 + 0.02 * 150.0))
    i1, i2 = _pair_currents(circuit)
    assert i1 - i2 == pytest.approx(0.1 / 160.0, rel=0.02)
    assert (i1 - i2) / 0.02 == pytest.approx(0.03, rel=0.05)  # "3 % of 20 mA"


def test_tc_moves_the_operating_point_as_derived(make_led) -> None:
    # Field-facts §6: dI/dTj = |k|/(R + r_d) for a string through R.
    led = make_led()
    circuit = Circuit(branches=(Branch((led,)),), supply=Range.fixed(5.0),
                      r_series=Range.fixed(150.0))
    sol = solve(circuit, Cases.build(circuit, 2, ambient=[24.5, 25.5]))
    i = sol.led_current[:, 0]
    vj = float(sol.led_voltage[:, 0].mean() - i.mean() * led.r_s)
    expected = abs(_vf_slope(led, vj, 25.0)) / (150.0 + _dynamic_resistance(led, i.mean(), 25.0))
    assert float(np.diff(i)[0]) == pytest.approx(expected, rel=1e-3)
