"""The engine's input types refuse bad values with a clear error; the datasheet-point fit."""

from __future__ import annotations

import math

import numpy as np
import pytest

from ledlint.engine import (Branch, Cases, Circuit, LedSpec, ModelError, Range, fit_points,
                            forward_voltage, spec_from_diode)
from ledlint.engine.constants import thermal_voltage
from ledlint.errors import LedlintError


def test_range_constructors() -> None:
    assert Range.fixed(4.7) == Range(4.7, 4.7, 4.7)
    assert Range.tolerance(100.0, 0.05) == Range(100.0, 95.0, 105.0)
    # A negative nominal (a reversed supply) keeps minimum <= maximum.
    r = Range.tolerance(-12.0, 0.1)
    assert (r.minimum, r.maximum) == pytest.approx((-13.2, -10.8))


@pytest.mark.parametrize("args", [(1.0, 2.0, 3.0), (1.0, 0.0, 0.5), (math.nan, 0.0, 1.0),
                                  (math.inf, 0.0, math.inf)])
def test_range_rejects_inconsistent_values(args: tuple[float, float, float]) -> None:
    with pytest.raises(ModelError, match="range"):
        Range(*args)


def test_model_error_is_reported_like_every_tool_error() -> None:
    # The command line turns LedlintError into a one-line message and exit code 2.
    with pytest.raises(LedlintError):
        Range.tolerance(1.0, -0.1)


@pytest.mark.parametrize(
    ("change", "words"),
    [
        ({"r_s": 0.0}, "series resistance"),
        ({"n": -1.0}, "ideality"),
        ({"i_test": 0.0}, "test current"),
        ({"vf": Range.fixed(0.05)}, "series-resistance drop"),
        ({"rth": -5.0}, "thermal resistance"),
        ({"n": 0.05, "vf": Range.fixed(3.0)}, "junction count"),
    ],
)
def test_led_spec_rejects_what_cannot_be_modelled(change: dict[str, object], words: str) -> None:
    values: dict[str, object] = {"vf": Range.fixed(2.0), "i_test": 0.02, "n": 2.0, "r_s": 5.0,
                                 "tc": -0.002}
    values.update(change)
    with pytest.raises(ModelError, match=words):
        LedSpec(**values)  # type: ignore[arg-type]


def test_circuit_needs_exactly_one_drive(make_led) -> None:
    branch = Branch((make_led(),))
    with pytest.raises(ModelError, match="exactly one"):
        Circuit(branches=(branch,))
    with pytest.raises(ModelError, match="exactly one"):
        Circuit(branches=(branch,), supply=Range.fixed(5.0), drive_current=Range.fixed(0.02))
    with pytest.raises(ModelError, match="at least one branch"):
        Circuit(branches=(), supply=Range.fixed(5.0))
    with pytest.raises(ModelError, match="at least one LED"):
        Branch(())
    with pytest.raises(ModelError, match="negative"):
        Circuit(branches=(branch,), supply=Range.fixed(5.0), r_series=Range(1.0, -1.0, 2.0))


def test_cases_check_their_shapes(make_led) -> None:
    circuit = Circuit(branches=(Branch((make_led(), make_led())),), supply=Range.fixed(5.0))
    with pytest.raises(ModelError, match="shape"):
        Cases.build(circuit, 3, vf=np.ones((3, 5)))
    with pytest.raises(ModelError, match="finite"):
        Cases.build(circuit, 2, drive=[1.0, math.nan])
    with pytest.raises(ModelError, match="negative"):
        Cases.build(circuit, 1, r_series=-1.0)
    cases = Cases.build(circuit, 4)
    assert cases.size == 4 and cases.vf.shape == (4, 2) and not cases.vf.flags.writeable


def _shockley_voltage(i: float, i_s: float, n: float, r_s: float, celsius: float) -> float:
    # Field-facts §5c: I = Is·(exp((V − I·Rs)/(n·Vt)) − 1), solved for V.
    return n * float(thermal_voltage(celsius)) * math.log1p(i / i_s) + i * r_s


def test_fit_recovers_three_exact_points() -> None:
    # Field-facts §5c check: points from Is = 1e-18, n = 2, Rs = 5 ohm at 1/10/30 mA recover
    # the parameters; judged by the voltages the fit predicts (Is is ill-conditioned).
    # The sheet's 1.7917 / 1.9558 / 2.1126 V are at 27 °C (ngspice's default temperature).
    currents = (0.001, 0.010, 0.030)
    points = [(i, _shockley_voltage(i, 1e-18, 2.0, 5.0, 27.0)) for i in currents]
    assert [v for _, v in points] == pytest.approx([1.7917, 1.9558, 2.1126], abs=6e-5)
    fit = fit_points(points, temperature=27.0)
    assert fit.n == pytest.approx(2.0, rel=1e-9)
    assert fit.r_s == pytest.approx(5.0, rel=1e-9)
    for i in (0.0005, 0.005, 0.020, 0.050):
        assert _shockley_voltage(i, *fit, 27.0) == pytest.approx(
            _shockley_voltage(i, 1e-18, 2.0, 5.0, 27.0), abs=1e-9)


def test_fit_of_rounded_points_still_predicts_voltages() -> None:
    # Field-facts §5c: with V rounded to 10 mV the fit gives n ≈ 2.19, Is ≈ 2.1e-17, Rs ≈ 4.39:
    # far off in Is, yet close in the voltages it predicts between the points.
    points = [(0.001, 1.79), (0.010, 1.96), (0.030, 2.11)]
    fit = fit_points(points, temperature=27.0)
    assert fit.n == pytest.approx(2.19, abs=0.005)
    assert fit.r_s == pytest.approx(4.39, abs=0.005)
    assert fit.i_s == pytest.approx(2.1e-17, rel=0.05)
    assert _shockley_voltage(0.020, *fit, 27.0) == pytest.approx(
        _shockley_voltage(0.020, 1e-18, 2.0, 5.0, 27.0), abs=0.01)


def test_fit_with_known_n_needs_two_points() -> None:
    points = [(i, _shockley_voltage(i, 1e-18, 2.0, 5.0, 25.0)) for i in (0.005, 0.020)]
    fit = fit_points(points, n=2.0)
    assert fit.r_s == pytest.approx(5.0, rel=1e-9)
    assert fit.i_s == pytest.approx(1e-18, rel=1e-6)
    with pytest.raises(ModelError, match="at least 3"):
        fit_points(points)


@pytest.mark.parametrize("points", [[(0.01, 2.0)] * 3, [(-0.01, 2.0), (0.01, 2.1), (0.02, 2.2)],
                                    [(0.001, 2.2), (0.01, 2.1), (0.03, 2.0)], "nonsense"])
def test_fit_rejects_points_that_are_no_diode(points: object) -> None:
    with pytest.raises(ModelError):
        fit_points(points)  # type: ignore[arg-type]


def test_spec_from_diode_keeps_the_diode_voltage() -> None:
    # The spec's Vf at i_test is the Shockley voltage of the SPICE diode it came from.
    led = spec_from_diode(1e-18, 2.0, 5.0, tc=-0.002, i_test=0.02)
    assert led.vf.nominal == pytest.approx(_shockley_voltage(0.02, 1e-18, 2.0, 5.0, 25.0), abs=1e-9)
    # ... and the model gives it back at other currents (the same Shockley equation).
    for i in (1e-4, 0.005, 0.1):
        assert float(forward_voltage(led, i)) == pytest.approx(
            _shockley_voltage(i, 1e-18, 2.0, 5.0, 25.0), abs=1e-8)


def test_forward_voltage_follows_tc_at_the_test_current(make_led) -> None:
    # The engine's choice of EG makes dVf/dT at i_test equal tc (module docstring of diode).
    led = make_led(tc=-0.0025)
    slope = (forward_voltage(led, 0.02, 25.01) - forward_voltage(led, 0.02, 24.99)) / 0.02
    assert float(slope) == pytest.approx(-0.0025, rel=1e-5)
    assert float(forward_voltage(led, 0.02, 25.0)) == pytest.approx(2.0, abs=1e-12)
    assert float(forward_voltage(led, 0.02, 25.0, vf=2.1)) == pytest.approx(2.1, abs=1e-12)
