"""Solving many circuits at once gives what solving each alone gives."""

from __future__ import annotations

import numpy as np

from ledlint.engine import Branch, Circuit, LedSpec, Range, corners, corners_many, loop_gains, loop_gains_many

RED = LedSpec(Range(1.85, 1.67, 2.5), 0.02, 2.0, 10.0, -0.002, rth=400.0)
WHITE = LedSpec(Range(3.0, 2.6, 3.4), 0.02, 3.0, 10.0, -0.003)


def _circuits() -> list[Circuit]:
    out = []
    for v, r in ((5.0, 330.0), (5.0, 150.0), (3.3, 68.0), (12.0, 1000.0), (-5.0, 330.0)):
        out.append(Circuit((Branch((RED,)),), supply=Range.tolerance(v, 0.05), r_series=Range.tolerance(r, 0.05)))
    out.append(Circuit((Branch((WHITE, WHITE)),), supply=Range.tolerance(12.0, 0.1), r_series=Range.tolerance(220, 0.01)))
    out.append(Circuit((Branch((RED,)), Branch((RED,))), supply=Range.tolerance(5.0, 0.05),
                       r_series=Range.tolerance(100.0, 0.05)))
    out.append(out[0])  # a repeat is solved once
    return out


def test_batched_corners_equal_single_solves() -> None:
    circuits = _circuits()
    for c, batched in zip(circuits, corners_many(circuits)):
        single = corners(c)
        assert batched.names == single.names
        np.testing.assert_allclose(batched.solution.led_current, single.solution.led_current, rtol=1e-9, atol=1e-15)
        np.testing.assert_allclose(batched.solution.tj, single.solution.tj, rtol=1e-9)


def test_batched_loop_gains_equal_single() -> None:
    circuits = _circuits()
    for c, batched in zip(circuits, loop_gains_many(circuits)):
        single = loop_gains(c)
        assert (batched is None) == (single is None)
        if single is not None:
            assert abs(batched.gain - single.gain) <= 1e-9 + 1e-6 * abs(single.gain)
