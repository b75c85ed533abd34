"""Self-heating: the fixed point Tj = Ta + Rth·P (field-facts §6), runaway, the loop matrix."""

from __future__ import annotations

import numpy as np
import pytest

from ledlint.engine import (Branch, Circuit, Range, loop_gains, monte_carlo, operating_point,
                            solve, solve_heated)
from ledlint.engine.solver import Cases
from ledlint.engine.thermal import TJ_CEILING


def _heated_residual(circuit: Circuit, cases: Cases) -> np.ndarray:
    sol = solve_heated(circuit, cases)
    rth = np.array([d.rth or 0.0 for d in circuit.leds])
    # Field-facts §6: Tj = Ta + Rth·P, all electrical power counted as heat.
    return sol.tj - (cases.ambient[:, None] + rth * sol.led_power)


def test_fixed_point_holds(make_led) -> None:
    leds = [make_led(v, rth=r) for v, r in ((1.9, 400.0), (2.0, 900.0), (2.1, None))]
    for circuit in (
        Circuit(branches=tuple(Branch((d,)) for d in leds), supply=Range.fixed(3.0),
                r_series=Range.fixed(10.0)),
        Circuit(branches=(Branch(tuple(leds)),), supply=Range.fixed(9.0), r_series=Range.fixed(47.0)),
        Circuit(branches=(Branch(tuple(leds[:2])), Branch((leds[2],))), drive_current=Range.fixed(0.05)),
    ):
        cases = Cases.build(circuit, 3, ambient=[-20.0, 25.0, 70.0])
        assert np.all(np.abs(_heated_residual(circuit, cases)) < 1e-4)


def test_heating_solves_the_electrical_case_at_its_temperatures(make_led) -> None:
    circuit = Circuit(branches=(Branch((make_led(rth=500.0),)), Branch((make_led(2.05, rth=500.0),))),
                      supply=Range.fixed(4.0), r_series=Range.fixed(20.0))
    heated = operating_point(circuit)
    again = solve(circuit, Cases.build(circuit, tj=heated.tj))
    np.testing.assert_allclose(again.led_current, heated.led_current, rtol=1e-9)
    # An LED without Rth sits at the ambient.
    plain = Circuit(branches=(Branch((make_led(),)),), supply=Range.fixed(4.0),
                    r_series=Range.fixed(20.0), ambient=Range.fixed(40.0))
    assert operating_point(plain).tj[0, 0] == 40.0


def test_runaway_is_flagged_not_hidden(make_led) -> None:
    # An LED straight on a rail with a poor heat path: G well above one (field-facts §6), the
    # junction climbs to the ceiling; the case says it did not settle.
    led = make_led(rth=3000.0)
    circuit = Circuit(branches=(Branch((led,)),), supply=Range.fixed(2.3))
    point = operating_point(circuit).point(0)
    assert not point.settled
    assert point.tj[0] > TJ_CEILING - 50.0
    loop = loop_gains(circuit)
    assert loop is not None and not loop.settled
    # The same LED through a ballast is stable and settles.
    safe = Circuit(branches=(Branch((led,)),), supply=Range.fixed(5.0), r_series=Range.fixed(150.0))
    assert operating_point(safe).point(0).settled


def test_loop_matrix_matches_finite_differences(make_led) -> None:
    # Central differences of the heat balance (common practice): perturb one Tj, resolve.
    leds = [make_led(v, rth=600.0) for v in (1.95, 2.05)]
    circuit = Circuit(branches=(Branch((leds[0],)), Branch((leds[1],), Range.fixed(4.7))),
                      supply=Range.fixed(3.3), r_series=Range.fixed(8.2))
    loop = loop_gains(circuit)
    assert loop is not None
    point = operating_point(circuit)
    for j in range(2):
        tj = np.repeat(point.tj, 2, axis=0)
        tj[:, j] += [0.5, -0.5]
        p = solve(circuit, Cases.build(circuit, 2, tj=tj)).led_power
        column = 600.0 * (p[0] - p[1]) / 1.0
        assert loop.matrix[:, j] == pytest.approx(column, rel=1e-4)
    assert loop.gain == pytest.approx(np.linalg.eigvals(loop.matrix).real.max())
    assert loop.self_gain.tolist() == pytest.approx(np.diag(loop.matrix).tolist())


def test_heated_monte_carlo_settles(make_led) -> None:
    circuit = Circuit(branches=tuple(Branch((make_led(2.0, 0.15, rth=800.0),)) for _ in range(10)),
                      supply=Range.tolerance(5.0, 0.05), r_series=Range.tolerance(4.7, 0.05),
                      ambient=Range(25.0, 0.0, 60.0))
    mc = monte_carlo(circuit, 300)
    assert np.all(mc.solution.settled)
    assert np.all(np.abs(_heated_residual(circuit, mc.cases)) < 1e-4)
