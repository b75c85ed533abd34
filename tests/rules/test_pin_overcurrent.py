"""pin-overcurrent: a controller pin sourcing or sinking more LED current than its rating."""

from __future__ import annotations

import re
from pathlib import Path

import eseries
import pytest

from kicad8 import Board
from rulecheck import current_bounds, line_of, of_rule, only, run_board, value

from ledlint.checks.findings import Severity

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
    """No rating on U1: the 20 mA per-pin default (rules/pin_overcurrent.py; common practice) holds,
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



def npn_switched(base_resistor: str | None) -> Board:
    """+5V → R1 470 Ω → D1 → Q1 (NPN, emitter on GND); Q1's base from U1 PA0 on +3V3."""
    b = Board("base", "pin-overcurrent fixture")
    b.add("U1", "MCU8", "MCU8", SOIC8, {"1": "+3V3", "2": "/LED_ON", "8": "GND"}, pin_current_max="20mA")
    b.resistor("R1", "470", "+5V", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "Net-(D1-K)", Vf="2.0V@20mA", If_max="20mA", Rth="0")
    base = "/LED_ON" if base_resistor is None else "Net-(Q1-B)"
    if base_resistor is not None:
        b.resistor("R2", base_resistor, "/LED_ON", "Net-(Q1-B)")
    b.add("Q1", "Q_NPN_BEC", "NPN", "Package_TO_SOT_SMD:SOT-23", {"1": base, "2": "GND", "3": "Net-(D1-K)"})
    return b


def test_a_pin_straight_on_a_base_is_caught(tmp_path: Path) -> None:
    """A base is a diode to the emitter: with no base resistor only the pin's own output
    resistance limits the pin, (V_OH − V_BE) / R_pin (Ohm's law; V_BE 0.55-0.75 V, common practice)."""
    board = npn_switched(None)
    f = only(run_board(board, tmp_path), "pin-overcurrent")
    assert f.severity is Severity.ERROR and "into Q1's base with no base resistor" in f.message
    assert f.refs[:2] == ("U1", "Q1") and f.nets == ("/LED_ON",) and f.line == line_of(board, "U1")
    assert value(f, "current").value == (3.3 * 1.05 - 0.55) / PIN_R_MIN  # 72.9 mA from the +5 % rail
    # The hint's resistor: the largest E24 value (IEC 60063, from the independent eseries package)
    # giving a tenth of the collector current at the weakest drive, 3.135 V − 0.75 V through it and
    # 65 Ω. The collector current is the LED's worst case, bounded by hand from 5.25 V less the
    # switch's 0.05-0.3 V saturation (field-facts §9, common practice) through 446.5 Ω into Vf_min
    # 1.8 V at 20 mA, all at 25 °C with no self-heating (rulecheck.current_bounds).
    m = re.search(r"put ([0-9.]+) (k?)Ω \(E24\) between U1 pin PA0 and Q1's base: at least 1/10 of the "
                  r"([0-9.]+) mA LED current", f.hint)
    assert m, f.hint
    r_b, ic_max = float(m.group(1)) * (1000 if m.group(2) else 1), float(m.group(3)) / 1000
    assert current_bounds(5.25 - 0.3, 446.5, 1.8, 0.020)[0] <= ic_max <= current_bounds(5.2, 446.5, 1.8, 0.020)[1]
    largest = (3.3 * 0.95 - 0.75) * 10 / ic_max - 65
    assert r_b == pytest.approx(eseries.find_less_than_or_equal(eseries.E24, largest), rel=1e-3)


def test_the_fixed_twin_with_its_base_resistor(tmp_path: Path) -> None:
    # 2.2 kΩ: (3.465 − 0.55) / (2090 + 40) Ω = 1.4 mA from the pin (Ohm's law): well inside 20 mA.
    assert (3.465 - 0.55) / (2200 * 0.95 + PIN_R_MIN) < 0.002
    result = run_board(npn_switched("2.2k"), tmp_path)
    assert of_rule(result, "pin-overcurrent") == [] and result.findings == ()
