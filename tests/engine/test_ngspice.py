"""Cross-check of the engine against ngspice (an independent simulator), circuit by circuit.

Each test writes the engine's case as a SPICE deck (ledlint.engine.spice), runs `ngspice -b`
and compares the branch currents it measures through 0 V sources (not @d[id], which is a
Newton-iteration value: field-facts §11) and the LED voltages. Both sides put GMIN = 1e-12 S
across every junction (the ngspice default, modelled by the engine), so reverse currents
compare too.
"""

from __future__ import annotations

import numpy as np
import pytest

from ledlint.engine import Branch, Circuit, Range, monte_carlo, operating_point, solve
from ledlint.engine.solver import Cases, Solution
from ledlint.engine.spice import deck, run_ngspice

pytestmark = pytest.mark.usefixtures("ngspice")


def _compare(circuit: Circuit, cases: Cases | None = None, rel: float = 0.005,
             solution: Solution | None = None) -> Solution:
    """Solve with the engine and with ngspice; currents and LED voltages agree within ``rel``.

    0.5 %: well inside what a resistor tolerance moves a current, so a disagreement this large
    would change a verdict (common practice). Measured agreement is under 1e-4."""
    cases = cases or Cases.build(circuit)
    solution = solution or solve(circuit, cases)
    for s in range(cases.size):
        spice = run_ngspice(deck(circuit, cases, s))
        np.testing.assert_allclose(solution.branch_current[s], spice.branch_current, rtol=rel)
        np.testing.assert_allclose(solution.led_voltage[s], spice.led_voltage, rtol=rel)
        np.testing.assert_allclose(solution.node_voltage[s], spice.node_voltage, rtol=rel)
        if not circuit.current_driven:
            np.testing.assert_allclose(solution.common_current[s], spice.supply_current, rtol=rel)
    return solution


def test_single_led(make_led) -> None:
    circuit = Circuit(branches=(Branch((make_led(),)),), supply=Range.fixed(5.0),
                      r_series=Range.fixed(150.0))
    sol = _compare(circuit)
    assert sol.led_current[0, 0] == pytest.approx(0.02, rel=0.01)


def test_string_of_three(make_led) -> None:
    leds = (make_led(3.0, r_s=8.0, n=3.0), make_led(3.1, r_s=8.0, n=3.0), make_led(2.9, r_s=8.0, n=3.0))
    circuit = Circuit(branches=(Branch(leds),), supply=Range.fixed(12.0), r_series=Range.fixed(150.0))
    _compare(circuit)


def test_bank_of_four_behind_one_resistor(make_led) -> None:
    leds = [make_led(v) for v in (1.95, 2.0, 2.05, 2.12)]
    circuit = Circuit(branches=tuple(Branch((d,)) for d in leds), supply=Range.fixed(5.0),
                      r_series=Range.fixed(39.0))
    sol = _compare(circuit)
    # The lowest Vf takes the most current (field-facts §7, current hogging).
    assert np.all(np.diff(sol.branch_current[0]) < 0)


def test_bank_of_four_with_balancing_resistors(make_led) -> None:
    leds = [make_led(v) for v in (1.95, 2.0, 2.05, 2.12)]
    circuit = Circuit(branches=tuple(Branch((d,), Range.fixed(r)) for d, r in
                                     zip(leds, (47.0, 56.0, 68.0, 39.0))),
                      supply=Range.fixed(5.0), r_series=Range.fixed(10.0))
    _compare(circuit)


def test_reverse_bias(make_led) -> None:
    # A string of two reversed against the supply: both sides see only GMIN and the
    # saturation current; each LED takes half the reverse voltage.
    circuit = Circuit(branches=(Branch((make_led(), make_led(2.1))),), supply=Range.fixed(-12.0),
                      r_series=Range.fixed(1000.0))
    sol = _compare(circuit)
    assert abs(sol.led_current[0, 0]) < 1e-10
    assert sol.led_voltage[0] == pytest.approx([-6.0, -6.0], rel=1e-6)


def test_switched_path(make_led) -> None:
    # A GPIO-like source resistance, a BJT as a fixed 0.2 V drop and a MOSFET as 7.5 ohm
    # (field-facts §9: 2N3904 Vce(sat) ≤ 0.2 V at 10 mA, 2N7002 Rds(on) ≤ 7.5 ohm).
    circuit = Circuit(branches=(Branch((make_led(),)),), supply=Range.fixed(5.0),
                      r_series=Range.fixed(120.0), r_source=40.0, r_switch=Range.fixed(7.5),
                      v_switch=Range.fixed(0.2))
    sol = _compare(circuit)
    assert sol.source_voltage[0] == 5.0


@pytest.mark.parametrize("celsius", [85.0, -40.0])
def test_hot_and_cold(make_led, celsius: float) -> None:
    leds = (make_led(1.9, tc=-0.0018), make_led(2.1, tc=-0.0022))
    circuit = Circuit(branches=tuple(Branch((d,)) for d in leds), supply=Range.fixed(3.3),
                      r_series=Range.fixed(22.0), ambient=Range.fixed(celsius))
    _compare(circuit)


def test_barely_on(make_led) -> None:
    # The supply just above the knee: microamps flow.
    circuit = Circuit(branches=(Branch((make_led(),)),), supply=Range.fixed(1.55),
                      r_series=Range.fixed(100.0))
    sol = _compare(circuit)
    assert 1e-7 < sol.led_current[0, 0] < 1e-4


@pytest.mark.parametrize(("volts", "ohms"), [(24.0, 10.0), (100.0, 1.0)])
def test_overdriven(make_led, volts: float, ohms: float) -> None:
    circuit = Circuit(branches=(Branch((make_led(),)),), supply=Range.fixed(volts),
                      r_series=Range.fixed(ohms))
    sol = _compare(circuit)
    assert sol.led_current[0, 0] > 1.0


def test_current_driven_two_strings_of_five(make_led) -> None:
    # The field-facts §7 arrangement: 700 mA into two strings of five with 1 ohm balancing
    # resistors (demo LEDs: 3.0 V at 350 mA, Vf spread across the strings).
    vfs = ((3.0, 3.05, 2.95, 3.1, 3.0), (2.9, 2.95, 3.0, 2.9, 2.85))
    strings = tuple(Branch(tuple(make_led(v, i_test=0.35, n=2.5, r_s=0.6, tc=-0.0028) for v in row),
                           Range.fixed(1.0)) for row in vfs)
    circuit = Circuit(branches=strings, drive_current=Range.fixed(0.7))
    sol = _compare(circuit)
    assert sol.branch_current[0].sum() == pytest.approx(0.7, rel=1e-12)


def test_current_driven_three_strings(make_led) -> None:
    vfs = ((2.0, 2.1, 1.95), (2.05, 2.0, 2.0), (1.9, 2.2, 2.1))
    strings = tuple(Branch(tuple(make_led(v) for v in row), Range.fixed(r))
                    for row, r in zip(vfs, (10.0, 0.0, 4.7)))
    circuit = Circuit(branches=strings, drive_current=Range.fixed(0.06))
    _compare(circuit)


def test_self_heated_point_at_its_own_junction_temperatures(make_led) -> None:
    # Each LED at its own Tj (ngspice instance temp=): the temperatures the engine's
    # self-heating found, so the electrical solve at those temperatures is checked.
    leds = [make_led(v, rth=400.0) for v in (1.95, 2.0, 2.1)]
    circuit = Circuit(branches=tuple(Branch((d,)) for d in leds), supply=Range.fixed(5.0),
                      r_series=Range.fixed(33.0))
    point = operating_point(circuit)
    assert np.ptp(point.tj) > 1.0  # the LEDs really are at different temperatures
    _compare(circuit, Cases.build(circuit, tj=point.tj), solution=point)


def test_monte_carlo_samples(make_led) -> None:
    # A few samples of a toleranced bank, whatever values they drew.
    leds = [make_led(2.0, 0.15) for _ in range(5)]
    circuit = Circuit(branches=tuple(Branch((d,), Range.tolerance(22.0, 0.05)) for d in leds),
                      supply=Range.tolerance(5.0, 0.05), r_series=Range.tolerance(4.7, 0.05),
                      ambient=Range(25.0, -20.0, 70.0))
    mc = monte_carlo(circuit, samples=4, seed=7)
    _compare(circuit, mc.cases, solution=mc.solution)


def test_engine_fit_matches_the_datasheet_point_in_ngspice(make_led) -> None:
    # The deck's diode, forced at i_test, shows the spec's Vf at 25 °C, and its slope at
    # 25 °C is the spec's tc: the engine's IS and EG choices as ngspice reads them.
    led = make_led(2.05, tc=-0.0021)
    circuit = Circuit(branches=(Branch((led,)),), drive_current=Range.fixed(0.02))
    volts = [run_ngspice(deck(circuit, Cases.build(circuit, ambient=t))).node_voltage
             for t in (24.5, 25.0, 25.5)]
    assert volts[1] == pytest.approx(2.05, abs=2e-6)
    assert (volts[2] - volts[0]) / 1.0 == pytest.approx(-0.0021, rel=0.005)
