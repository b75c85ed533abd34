"""pin-overcurrent: a controller pin sourcing or sinking more LED current than its rating."""

from __future__ import annotations

from pathlib import Path

from kicad8 import Board
from rulecheck import current_bounds, line_of, of_rule, only, run_board, value

from ledlint.findings import Severity

SOIC8 = "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm"
# A GPIO pin modelled as its supply behind 40-65 Ω, the usual first-order output model (common
# practice, field-facts §9); the least at the worst corner.
PIN_R_MIN = 40.0


def status_led(ohms: str, sinking: bool = False, **mcu_fields: str) -> Board:
    """MCU8 on +5V lights a red 5 mm LED (2.0 V at 20 mA) from PA0, sourcing or sinking."""
    b = Board("pin", "pin-overcurrent fixture")
    b.add("U1", "MCU8", "MCU8", SOIC8, {"1": "+5V", "2": "/LED", "8": "GND"}, **mcu_fields)
    led = {"footprint": "LED_THT:LED_D5.0mm", "Vf": "2.0V@20mA", "If_max": "50mA", "Rth": "0"}
    if sinking:
        b.resistor("R1", ohms, "+5V", "Net-(D1-A)")
        b.led("D1", "red", "Net-(D1-A)", "/LED", **led)
    else:
        b.resistor("R1", ohms, "/LED", "Net-(D1-A)")
        b.led("D1", "red", "Net-(D1-A)", "GND", **led)
    return b


def worst_bounds(ohms: float) -> tuple[float, float]:
    # Sourcing at V_OH = 5.25 V (+5 % rail) or sinking to 0 V from it, through R at −5 % and the
    # pin's least resistance, into Vf_min = 1.8 V (typical −10 %).
    return current_bounds(5.25, ohms * 0.95 + PIN_R_MIN, 1.8, 0.020)


def test_stated_pin_rating_is_an_error(tmp_path: Path) -> None:
    board = status_led("100", pin_current_max="20mA")
    f = only(run_board(board, tmp_path), "pin-overcurrent")
    assert f.severity is Severity.ERROR
    assert f.refs == ("U1", "D1", "R1") and f.nets == ("/LED",)
    assert f.line == line_of(board, "U1")
    lo, hi = worst_bounds(100)
    current = value(f, "current")
    assert 0.020 < lo <= current.value <= hi
    assert current.limit == 0.020 and value(f, "limit").value == 0.020
    assert "U1 pin PA0 (/LED) sources up to" in f.message


def test_sinking_pin(tmp_path: Path) -> None:
    f = only(run_board(status_led("100", sinking=True, pin_current_max="20mA"), tmp_path), "pin-overcurrent")
    lo, hi = worst_bounds(100)
    assert lo <= value(f, "current").value <= hi
    assert "sinks up to" in f.message


def test_default_pin_rating_still_an_error(tmp_path: Path) -> None:
    """No rating on U1: the 20 mA per-pin default (the project's issue 4; common practice) holds,
    at full severity, and the finding says it was assumed."""
    f = only(run_board(status_led("100"), tmp_path), "pin-overcurrent")
    assert f.severity is Severity.ERROR
    assert value(f, "limit").value == 0.020
    assert any("U1 pin limit 20 mA" in a for a in f.assumed)


def test_fixed_twin_with_a_larger_resistor(tmp_path: Path) -> None:
    result = run_board(status_led("220", pin_current_max="20mA"), tmp_path)
    assert worst_bounds(220)[1] < 0.75 * 0.020  # (5.25 − Vf) / (209 + 40) Ω with room to spare
    assert of_rule(result, "pin-overcurrent") == []
    assert result.findings == ()

