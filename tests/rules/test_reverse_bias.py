"""reverse-bias: an LED fitted backwards, or facing against the rest of its string."""

from __future__ import annotations

from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import line_of, of_rule, only, run_board, value

from ledlint.findings import Severity

# +12V at its +5 % end (rail named by voltage, ±5 % default). A reversed LED passes only
# leakage, so its resistor drops next to nothing and the LED takes the whole rail.
RAIL_MAX = 12.0 * 1.05


def door_lamp(reversed_: bool) -> Board:
    b = Board("reverse", "reverse-bias fixture")
    anode, cathode = ("GND", "/DOOR") if reversed_ else ("/DOOR", "GND")
    b.resistor("R1", "1k", "+12V", "/DOOR", footprint="Resistor_SMD:R_1206_3216Metric")
    b.led("D1", "red", anode, cathode, Vf="2.0V@10mA", If_max="20mA", Rth="0")
    return b


def test_led_fitted_backwards(tmp_path: Path) -> None:
    board = door_lamp(reversed_=True)
    f = only(run_board(board, tmp_path), "reverse-bias")
    assert f.severity is Severity.ERROR
    assert f.refs == ("D1",) and f.nets == ("GND", "+12V") and f.line == line_of(board, "D1")
    assert value(f, "reverse").value == pytest.approx(RAIL_MAX, abs=1e-3)
    # 5 V: the usual reverse rating, only the leakage test condition (field-facts §5b).
    assert value(f, "vr_max").value == 5.0 and value(f, "reverse").limit == 5.0
    assert "is reversed" in f.message and "turn D1 round" in f.hint


def test_led_against_the_string(tmp_path: Path) -> None:
    """D2 of three red LEDs faces the other way: the string never conducts."""
    b = Board("reverse", "reverse-bias fixture")
    b.resistor("R1", "330", "+12V", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "Net-(D1-K)")
    b.led("D2", "red", "Net-(D2-A)", "Net-(D1-K)")
    b.led("D3", "red", "Net-(D2-A)", "GND")
    f = only(run_board(b, tmp_path), "reverse-bias")
    assert f.severity is Severity.ERROR and f.refs == ("D2",)
    assert value(f, "reverse").value == pytest.approx(RAIL_MAX)  # the whole rail may fall on D2
    assert "faces against the rest of its string" in f.message


def test_own_reverse_rating_is_used(tmp_path: Path) -> None:
    b = door_lamp(reversed_=True)
    b.parts[-1].fields["Vr_max"] = "4V"  # some InGaN parts are rated 4 V (field-facts §5b)
    assert value(only(run_board(b, tmp_path), "reverse-bias"), "vr_max").value == 4.0


def test_fixed_twin_turned_round(tmp_path: Path) -> None:
    result = run_board(door_lamp(reversed_=False), tmp_path)
    assert of_rule(result, "reverse-bias") == []
    assert result.findings == ()
