"""resistor-overload: a ballast's worst-case I²R against its usable rating (IEC 60115-1 derating)."""

from __future__ import annotations

from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import current_bounds, line_of, of_rule, only, run_board, value

from ledlint.checks.findings import Severity

# Red 5 mm lamp, If_max 50 mA (high-brightness T-1¾ class, field-facts §5b), on +5V through
# 150 Ω: 20 mA nominal. Worst corner: 5.25 V (+5 %), 142.5 Ω (−5 %), Vf_min = 1.8 V (−10 %).
R_MIN = 150 * 0.95
HOT = "[ambient]\nmin = 25\nmax = 100\n"


def lamp(footprint: str) -> Board:
    b = Board("overload", "resistor-overload fixture")
    b.resistor("R1", "150", "+5V", "Net-(D1-A)", footprint=footprint)
    b.led("D1", "red", "Net-(D1-A)", "GND", footprint="LED_THT:LED_D5.0mm", Vf="2.0V@20mA", If_max="50mA", Rth="0")
    return b


def power_bounds(vf_min: float = 1.8, vf_min_low: float | None = None, celsius: float = 25.0) -> tuple[float, float]:
    """P = I²·R at the worst corner (Joule's law), I bounded as in rulecheck.current_bounds."""
    lo = current_bounds(5.25, R_MIN, vf_min, 0.020, celsius)[0]
    hi = current_bounds(5.25, R_MIN, vf_min if vf_min_low is None else vf_min_low, 0.020, celsius)[1]
    return lo * lo * R_MIN, hi * hi * R_MIN


def iec_60115_derated(p70: float, ambient: float, uct: float = 155.0) -> float:
    """Full rating at 70 °C, falling linearly to zero at the upper category temperature (field-facts §4)."""
    return p70 if ambient <= 70 else p70 * (uct - ambient) / (uct - 70)


def test_above_the_full_rating_is_an_error(tmp_path: Path) -> None:
    board = lamp("Resistor_SMD:R_0402_1005Metric")
    f = only(run_board(board, tmp_path), "resistor-overload")
    assert f.severity is Severity.ERROR
    assert f.refs == ("R1",) and f.line == line_of(board, "R1")
    assert f.nets == ("+5V", "GND")  # the circuit's supply and return
    lo, hi = power_bounds()
    power = value(f, "power")
    assert lo <= power.value <= hi
    # Joule's law at the worst corner: the reported current through the −5 % resistor.
    assert power.value == pytest.approx(value(f, "current").value ** 2 * R_MIN, rel=1e-9)
    # 0402 thick film: 1/16 W at 70 °C, the commonly quoted default (field-facts §3).
    assert value(f, "rating").value == pytest.approx(1 / 16)
    assert power.limit == pytest.approx(1 / 16) and lo > 1 / 16
    assert "full rating" in f.message


def test_above_half_the_rating_is_a_warning(tmp_path: Path) -> None:
    f = only(run_board(lamp("Resistor_SMD:R_0603_1608Metric"), tmp_path), "resistor-overload")
    assert f.severity is Severity.WARNING
    lo, hi = power_bounds()
    # 0603: 0.1 W (field-facts §3); usable 50 % of it, the common design rule (field-facts §4).
    assert value(f, "limit").value == pytest.approx(0.5 * 0.1)
    assert 0.05 < lo <= value(f, "power").value <= hi < 0.1
    # The hint: rated P / 50 % = 159-167 mW at 70 °C, more than an 0805's 1/8 W, so a 1206 (1/4 W).
    assert 0.125 < lo / 0.5 and hi / 0.5 < 0.25
    assert "1206 chip" in f.hint


def test_derating_above_70_degrees(tmp_path: Path) -> None:
    """An 0805 is a warning at 25 °C and an error at 100 °C ambient, on the IEC 60115-1 line."""
    cool = only(run_board(lamp("Resistor_SMD:R_0805_2012Metric"), tmp_path), "resistor-overload")
    assert cool.severity is Severity.WARNING
    hot = only(run_board(lamp("Resistor_SMD:R_0805_2012Metric"), tmp_path, HOT), "resistor-overload")
    assert hot.severity is Severity.ERROR
    full = iec_60115_derated(0.125, 100.0)  # 0.125 W × (155 − 100) / (155 − 70) = 80.9 mW
    assert value(hot, "limit").value == pytest.approx(full, rel=1e-9)
    # At 100 °C the LED's Vf falls by 1.5-4 mV/K over 75 K (field-facts §5c), so the current rises.
    lo, hi = power_bounds(1.8 - 0.0015 * 75, 1.8 - 0.004 * 75, 100.0)
    assert full < lo <= value(hot, "power").value <= hi
    assert "derated to 80.9 mW at 100 °C" in hot.message


def test_unknown_rating_is_an_info(tmp_path: Path) -> None:
    f = only(run_board(lamp("ledlint_demo:R_custom"), tmp_path), "resistor-overload")
    assert f.severity is Severity.INFO
    assert f.refs == ("R1",)
    assert "add a field Power" in f.hint


def test_fixed_twin_is_clean(tmp_path: Path) -> None:
    result = run_board(lamp("Resistor_SMD:R_1206_3216Metric"), tmp_path)
    assert power_bounds()[1] < 0.5 * 0.25  # under half of a 1206's 1/4 W even at the upper bound
    assert of_rule(result, "resistor-overload") == []
    assert result.findings == ()
