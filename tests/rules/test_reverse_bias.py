"""reverse-bias: an LED fitted backwards, or facing against the rest of its string."""

from __future__ import annotations

from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import current_bounds, line_of, of_rule, only, run_board, value

from ledlint.checks.findings import Severity

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


# A 12 V AC secondary at +5 % (±5 % default): a sine peaks at √2 × RMS (fact of the trade).
AC_PEAK = 12.0 * 1.05 * 2 ** 0.5


def ac_lamp(guard: str = "") -> Board:
    """A red lamp straight off a 12 V AC secondary through 1 kΩ; optionally a protection diode."""
    b = Board("ac", "reverse-bias AC fixture")
    if guard == "series":
        b.resistor("R1", "1k", "/12VAC", "/K", footprint="Resistor_SMD:R_1206_3216Metric")
        b.add("D2", "D", "1N4148", "Diode_SMD:D_SOD-123", {"2": "/K", "1": "/A"})
    else:
        b.resistor("R1", "1k", "/12VAC", "/A", footprint="Resistor_SMD:R_1206_3216Metric")
    b.led("D1", "red", "/A", "GND", Vf="2.0V@10mA", If_max="20mA", Rth="0")
    if guard == "antiparallel":
        b.add("D2", "D", "1N4148", "Diode_SMD:D_SOD-123", {"2": "GND", "1": "/A"})
    return b


def test_ac_supply_reverses_the_led_every_half_cycle(tmp_path: Path) -> None:
    result = run_board(ac_lamp(), tmp_path)
    f = only(result, "reverse-bias")
    assert value(f, "reverse").value == pytest.approx(AC_PEAK, rel=1e-6) and f.severity is Severity.ERROR
    assert "antiparallel" in f.hint
    # The ballast sees at most the supply's instantaneous voltage, and only while the LED
    # conducts: P ≤ V_rms² / 2R, the mean of v²/R over half a sine (handbook: mean of sin² = 1/2).
    r1 = result.board.analyses[0].resistors[0]
    assert r1.power_max <= (12.0 * 1.05) ** 2 / (2 * 1000 * 0.95) * (1 + 1e-9)
    # Forward, the half-cycle is taken at its peak: the worst corner by Ohm's law with the LED's
    # curve bounded (peak, 1 kΩ − 5 %, Vf 2.0 V − 10 % at 10 mA).
    lo, hi = current_bounds(AC_PEAK, 950, 1.8, 0.010)
    assert lo <= result.board.analyses[0].leds[0].current.maximum <= hi


@pytest.mark.parametrize("guard", ["antiparallel", "series"])
def test_ac_lamp_with_a_protection_diode(tmp_path: Path, guard: str) -> None:
    """Fixed twins: an antiparallel diode clamps the LED's reverse voltage to its own forward drop;
    a series diode takes the reverse half-cycle (its leakage is far below an LED's, common practice)."""
    result = run_board(ac_lamp(guard), tmp_path)
    a = result.board.analyses[0]
    assert a.solved and tuple(map(str, a.circuit.leds)) == ("D1",)
    assert of_rule(result, "reverse-bias") == []
    assert a.leds[0].reverse_v <= 1.0
    assert any("D2" in x for x in a.assumptions)
