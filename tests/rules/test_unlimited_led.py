"""unlimited-led: an LED or string straight across a supply, with nothing to set its current."""

from __future__ import annotations

from pathlib import Path

from kicad8 import Board
from rulecheck import N_MAX, RS_MAX, current_bounds, line_of, of_rule, only, run_board, shockley_current, value

from ledlint.checks.findings import Severity

# Red indicator, 2.0 V at 20 mA, If_max 25 mA, no self-heating, +3V3 at most 3.465 V (+5 %).
RED = {"Vf": "2.0V@20mA", "If_max": "25mA", "Rth": "0"}


def test_led_across_the_rail_is_an_error(tmp_path: Path) -> None:
    b = Board("unlimited", "unlimited-led fixture")
    b.led("D1", "red", "+3V3", "GND", **RED)
    f = only(run_board(b, tmp_path), "unlimited-led")
    assert f.severity is Severity.ERROR
    assert f.refs == ("D1",) and f.nets == ("+3V3", "GND") and f.line == line_of(b, "D1")
    # Only the die's own resistance limits it: V = Vf + n·Vt·ln(I/I_test) + R_s·(I − I_test)
    # (Shockley with series resistance, field-facts §5c) at 3.465 V and Vf_min 1.8 V, over n
    # 1.5-2.5 and R_s 5-20 Ω (from memory): at least 98 mA, four times If_max.
    least = shockley_current(3.465, 1.8, 0.020, N_MAX, RS_MAX)
    most = shockley_current(3.465, 1.8, 0.020, 1.5, 5.0)
    assert 0.095 < least <= value(f, "model").value <= most


def test_hint_sizes_the_ballast(tmp_path: Path) -> None:
    b = Board("unlimited", "unlimited-led fixture")
    b.led("D1", "red", "+3V3", "GND", **RED)
    f = only(run_board(b, tmp_path), "unlimited-led")
    # The hint sizes an E24 ballast (IEC 60063) for 75 % of If_max, 18.75 mA, at the worst
    # corner (3.465 V, −5 %, Vf_min): 91 Ω lets even the least current the bounds allow past it,
    # 100 Ω keeps the most under it.
    assert current_bounds(3.465, 91 * 0.95, 1.8, 0.020)[0] > 0.75 * 0.025
    assert current_bounds(3.465, 100 * 0.95, 1.8, 0.020)[1] < 0.75 * 0.025
    assert f.hint.startswith("add 100 Ω (E24)")


def test_string_that_matches_the_rail_is_an_error(tmp_path: Path) -> None:
    """Four 3.0 V LEDs on +12V: 'four times 3 V is 12 V', and nothing in between."""
    b = Board("unlimited", "unlimited-led fixture")
    nets = ["+12V", "Net-(D1-K)", "Net-(D2-K)", "Net-(D3-K)", "GND"]
    for k in range(4):
        b.led(f"D{k + 1}", "white", nets[k], nets[k + 1], footprint="LED_SMD:LED_PLCC_2835",
              Vf="3.0V@60mA", If_max="150mA", Rth="0")
    f = only(run_board(b, tmp_path), "unlimited-led")
    assert f.refs == ("D1", "D2", "D3", "D4") and f.nets == ("+12V", "GND")
    # At +5 % the rail is 0.6 V above the string's 12 V at 60 mA, with Vf at −10 % 1.8 V more:
    # only the four dies' series resistance is left to take 2.4 V.
    assert value(f, "model").value > 0.150


def test_fixed_twin_has_its_ballast(tmp_path: Path) -> None:
    b = Board("unlimited", "unlimited-led fixture")
    b.resistor("R1", "100", "+3V3", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "GND", **RED)
    result = run_board(b, tmp_path)
    assert of_rule(result, "unlimited-led") == []
    assert result.findings == ()


def test_message_for_one_led(tmp_path: Path) -> None:
    b = Board("unlimited", "unlimited-led fixture")
    b.led("D1", "red", "+3V3", "GND", **RED)
    assert only(run_board(b, tmp_path), "unlimited-led").message.startswith("D1 sits across +3V3 and GND")

