"""current-margin: an LED's worst-case current against 75 % of its If_max and If_max itself."""

from __future__ import annotations

from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import current_bounds, line_of, of_rule, only, run_board, value

from ledlint.checks.findings import Severity

R1206 = "Resistor_SMD:R_1206_3216Metric"  # 0.25 W: the ballast's dissipation stays out of the way


def power_lamp(ohms: str, vf: str) -> Board:
    """A red power lamp on +5V: Vf at its test current, If_max 25 mA, no self-heating."""
    b = Board("margin", "current-margin fixture")
    b.resistor("R1", ohms, "+5V", "Net-(D1-A)", footprint=R1206)
    b.led("D1", "red", "Net-(D1-A)", "GND", Vf=vf, If_max="25mA", Rth="0")
    return b


def test_above_if_max_is_an_error(tmp_path: Path) -> None:
    board = power_lamp("120", "2.0V@25mA")
    f = only(run_board(board, tmp_path), "current-margin")
    assert f.severity is Severity.ERROR
    assert f.refs == ("D1", "R1") and f.nets == ("+5V", "GND")
    assert f.line == line_of(board, "D1")
    # Nominal: (5 V − 2.0 V) / 120 Ω = 25 mA, the Vf field's own test current (Ohm's law).
    assert value(f, "nominal").value == pytest.approx(0.025, rel=1e-6)
    # Worst corner: +5V at +5 % (a rail named by its voltage: ±5 %, common practice), 120 Ω at
    # −5 % (J, IEC 60062, the general-purpose default), Vf at 2.0 V − 10 % (the checker's stated
    # spread when only a typical Vf is given).
    lo, hi = current_bounds(5.25, 120 * 0.95, 1.8, 0.025)
    worst = value(f, "worst")
    assert lo <= worst.value <= hi
    assert worst.limit == 0.025 and worst.relation == ">"  # above If_max itself: the error line
    assert value(f, "allowed").value == pytest.approx(0.75 * 0.025)  # 25 % margin, field-facts §5b
    assert "If_max of 25 mA" in f.message
    # The message names that corner in the same figures (rulecheck's 25 °C datasheet ambient).
    assert "at the worst corner (5.25 V supply, R −5 %, Vf at its minimum, 25 °C ambient)" in f.message


def test_inside_if_max_but_past_the_margin_is_a_warning(tmp_path: Path) -> None:
    board = power_lamp("150", "2.0V@20mA")
    f = only(run_board(board, tmp_path), "current-margin")
    assert f.severity is Severity.WARNING
    assert value(f, "nominal").value == pytest.approx(0.020, rel=1e-6)  # (5 − 2.0) / 150, Ohm's law
    lo, hi = current_bounds(5.25, 150 * 0.95, 1.8, 0.020)
    worst = value(f, "worst")
    assert 0.75 * 0.025 < lo <= worst.value <= hi < 0.025  # the bounds alone put it between the lines
    assert worst.limit == pytest.approx(0.75 * 0.025)
    # The hint's E24 ballast (IEC 60063): 180 Ω still lets the worst case past 18.75 mA even at
    # the least current the bounds allow; 200 Ω keeps it under at the most they allow.
    assert current_bounds(5.25, 180 * 0.95, 1.8, 0.020)[0] > 0.75 * 0.025
    assert current_bounds(5.25, 200 * 0.95, 1.8, 0.020)[1] < 0.75 * 0.025
    assert f.hint.startswith("use 200 Ω (E24)")


def test_fixed_twin_is_clean(tmp_path: Path) -> None:
    result = run_board(power_lamp("200", "2.0V@20mA"), tmp_path)
    assert of_rule(result, "current-margin") == []
    assert result.findings == ()


def test_assumed_rating_lowers_the_severity(tmp_path: Path) -> None:
    """Without If_max, a small indicator is taken at 20 mA: a class default, so a warning."""
    b = Board("margin", "current-margin fixture")
    b.resistor("R1", "150", "+5V", "Net-(D1-A)", footprint=R1206)
    b.led("D1", "red", "Net-(D1-A)", "GND", Vf="2.0V@20mA", Rth="0")
    f = only(run_board(b, tmp_path), "current-margin")
    # The worst case is above the assumed 20 mA but inside the class's 20-30 mA range
    # (field-facts §5b): the built-in rating keeps it one step down, from error to warning.
    lo, hi = current_bounds(5.25, 150 * 0.95, 1.8, 0.020)
    assert 0.020 < lo <= value(f, "worst").value <= hi < 0.030
    assert f.severity is Severity.WARNING
    assert any("If_max 20 mA" in a for a in f.assumed)


def low_current_lamp(ohms: str) -> Board:
    """A 2 mA low-current red LED whose Vf is given without its test current."""
    b = Board("low", "current-margin fixture")
    b.resistor("R1", ohms, "+5V", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "GND", Vf="1.8V", If_max="2mA", Rth="0")
    return b


def test_low_current_led_is_modelled_at_its_rating(tmp_path: Path) -> None:
    """Vf is taken at If_max, not at 20 mA, so a 2 mA LED gets a model and a verdict."""
    f = only(run_board(low_current_lamp("1k5"), tmp_path), "current-margin")
    # Nominal by Ohm's law with Vf at 2 mA: (5 V − 1.8 V) / 1.5 kΩ = 2.13 mA, past If_max.
    lo, hi = current_bounds(5.0, 1500, 1.8, 0.002)
    assert lo <= value(f, "nominal").value <= hi and f.severity is Severity.ERROR


def test_low_current_led_fixed_twin(tmp_path: Path) -> None:
    # Worst corner: 5.25 V (+5 %), 2.7 kΩ − 5 % (IEC 60062 J), Vf 1.8 V − 10 %:
    # under 75 % of 2 mA (field-facts §5b) by Ohm's law's upper bound.
    assert current_bounds(5.25, 2700 * 0.95, 1.62, 0.002)[1] < 0.75 * 0.002
    result = run_board(low_current_lamp("2k7"), tmp_path)
    assert result.findings == ()
