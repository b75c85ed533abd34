"""The solver converges for every circuit and case: residuals checked, never trusted.

Residuals, common practice: KVL round each branch, KCL at the node (or the drive current),
and each LED on its own I–V curve. Monotonicity in the supply is a property of any network
of resistors and diodes.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import ledlint.engine.solver as solver_module
from ledlint.engine import Branch, Circuit, LedSpec, Range, solve
from ledlint.engine.diode import Junctions
from ledlint.engine.solver import Cases, Setup, Solution

ohms = st.one_of(st.just(0.0), st.floats(0.0, 100e3))
leds = st.builds(
    lambda vf, n, r_s, tc: LedSpec(vf=Range.fixed(vf), i_test=0.02, n=n, r_s=r_s, tc=tc),
    st.floats(1.6, 3.6), st.floats(1.0, 7.0), st.floats(0.1, 50.0), st.floats(-0.004, -0.001),
)
branches = st.builds(lambda d, r: Branch(tuple(d), Range.fixed(r)),
                     st.lists(leds, min_size=1, max_size=4), ohms)


@st.composite
def circuits(draw: st.DrawFn) -> tuple[Circuit, Cases]:
    bank = tuple(draw(st.lists(branches, min_size=1, max_size=4)))
    if draw(st.booleans()):
        circuit = Circuit(branches=bank, drive_current=Range.fixed(0.02))
        drive = draw(st.lists(st.floats(0.0, 2.0), min_size=1, max_size=5))
    else:
        circuit = Circuit(branches=bank, supply=Range.fixed(5.0))
        drive = draw(st.lists(st.floats(-50.0, 100.0), min_size=1, max_size=5))
    size = len(drive)
    return circuit, Cases.build(
        circuit, size, drive=drive,
        r_series=draw(st.lists(ohms, min_size=size, max_size=size)),
        r_switch=draw(st.lists(st.floats(0.0, 10.0), min_size=size, max_size=size)),
        v_switch=draw(st.lists(st.floats(0.0, 0.3), min_size=size, max_size=size)),
        ambient=draw(st.lists(st.floats(-40.0, 125.0), min_size=size, max_size=size)),
    )


def assert_residuals(circuit: Circuit, cases: Cases, sol: Solution) -> None:
    setup = Setup.of(circuit)
    for name in ("led_current", "led_voltage", "branch_current", "node_voltage"):
        assert np.all(np.isfinite(getattr(sol, name))), name
    scale = 1.0 + np.abs(sol.node_voltage)
    jn = Junctions.at(setup.table, cases.vf, cases.tj)
    vj = sol.led_voltage - setup.table.r_s * sol.led_current
    # KVL: the LEDs and the balancing resistor of each branch add up to the node voltage, to
    # 1e-8 relative or to what the current's last bit moves an LED's voltage, whichever is more:
    # a junction deep in reverse has a dynamic resistance near 1/GMIN, so a current rounded to
    # float64 (eps relative) fixes its voltage no closer than eps·|I|/g (numerical analysis,
    # conditioning of V(I)).
    rounding = setup.layout.per_branch(8 * np.finfo(float).eps * np.abs(sol.led_current) / jn.conductance(vj))
    branch_volts = setup.layout.per_branch(sol.led_voltage) + cases.r_branch * sol.branch_current
    assert np.all(np.abs(branch_volts - sol.node_voltage[:, None]) <= 1e-8 * scale[:, None] + rounding)
    # Each LED on its own curve: junction current at (V − I·Rs) equals the branch current.
    assert np.allclose(jn.current(vj), sol.led_current, rtol=1e-7, atol=1e-15)
    if circuit.current_driven:
        assert np.allclose(sol.common_current, cases.drive, rtol=1e-12, atol=1e-15)
    else:
        r_common = cases.r_series + circuit.r_source + cases.r_switch
        path = cases.drive - cases.v_switch - sol.node_voltage - r_common * sol.common_current
        assert np.all(np.abs(path) <= 1e-8 * (1.0 + np.abs(cases.drive)))


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(circuits())
def test_always_converges(case: tuple[Circuit, Cases]) -> None:
    circuit, cases = case
    assert_residuals(circuit, cases, solve(circuit, cases))


@settings(max_examples=100, deadline=None)
@given(circuits(), st.floats(0.01, 5.0))
def test_currents_rise_with_the_supply(case: tuple[Circuit, Cases], rise: float) -> None:
    circuit, cases = case
    low, high = solve(circuit, cases), solve(circuit, cases.replace(drive=cases.drive + rise))
    tol = 1e-9 * np.abs(low.led_current) + 1e-15
    assert np.all(high.led_current >= low.led_current - tol)


def test_extremes(make_led) -> None:
    # Off, reverse, barely on, overdriven, 100 V into 1 ohm, 0 V: one solve, all converge.
    bank = Circuit(branches=(Branch((make_led(), make_led(2.2))), Branch((make_led(1.8),))),
                   supply=Range.fixed(5.0))
    drive = [0.0, -50.0, 1.9, 3.6, 100.0, 100.0, 1e-6]
    r_series = [10.0, 1000.0, 0.0, 100e3, 1.0, 0.0, 0.0]
    cases = Cases.build(bank, len(drive), drive=drive, r_series=r_series)
    sol = solve(bank, cases)
    assert_residuals(bank, cases, sol)
    assert np.all(np.abs(sol.led_current[0]) < 1e-20)  # 0 V: nothing flows (but rounding)
    assert np.all(sol.led_current[1] < 0) and np.all(np.abs(sol.led_current[1]) < 1e-10)


def test_the_bracketed_fallback_alone(make_led, monkeypatch: pytest.MonkeyPatch) -> None:
    # With one fast step nothing settles, so every case takes the bracketed path; it must
    # give the same answer as the fast path.
    bank = Circuit(branches=(Branch((make_led(), make_led(2.2)), Range.fixed(10.0)),
                             Branch((make_led(1.8),))), supply=Range.fixed(5.0))
    drive = [0.0, -50.0, 1.9, 3.6, 12.0, 100.0]
    cases = Cases.build(bank, len(drive), drive=drive, r_series=[10.0, 1e3, 0.0, 100e3, 1.0, 0.0])
    fast = solve(bank, cases)
    monkeypatch.setattr(solver_module, "_FAST_STEPS", 1)
    slow = solve(bank, cases)
    assert_residuals(bank, cases, slow)
    np.testing.assert_allclose(slow.branch_current, fast.branch_current, rtol=1e-9, atol=1e-18)
    current = Circuit(branches=bank.branches, drive_current=Range.fixed(0.05))
    cases = Cases.build(current, 3, drive=[0.0, 0.05, 1.5])
    monkeypatch.setattr(solver_module, "_FAST_STEPS", 60)
    fast = solve(current, cases)
    monkeypatch.setattr(solver_module, "_FAST_STEPS", 1)
    slow = solve(current, cases)
    assert_residuals(current, cases, slow)
    np.testing.assert_allclose(slow.branch_current, fast.branch_current, rtol=1e-9, atol=1e-18)
