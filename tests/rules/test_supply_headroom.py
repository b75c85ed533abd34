"""supply-headroom: the ballast's voltage at the low corner, and the current left there."""

from __future__ import annotations

from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import line_of, of_rule, only, rd_max, run_board, value

from ledlint.checks.findings import Severity

# A 3.3 V rail that sags to 2.9 V (a regulator near dropout), stated in the configuration.
SAGGING = "[ambient]\nmin = 25\nmax = 25\n\n[rails.\"+3V3\"]\nnominal = 3.3\nmin = 2.9\nmax = 3.6\n"


def lamp(rail: str, ohms: str, colour: str, **fields: str) -> Board:
    b = Board("headroom", "supply-headroom fixture")
    b.resistor("R1", ohms, rail, "Net-(D1-A)", footprint="Resistor_SMD:R_1206_3216Metric")
    b.led("D1", colour, "Net-(D1-A)", "GND", Rth="0", **fields)
    return b


def test_no_headroom_is_an_error(tmp_path: Path) -> None:
    """A white LED on +3V3 through 20 Ω: 20 mA on paper, nearly dark at the low corner."""
    board = lamp("+3V3", "20", "white", Vf="2.9V@20mA", Vf_max="3.4V", If_max="30mA")
    f = only(run_board(board, tmp_path), "supply-headroom")
    assert f.severity is Severity.ERROR
    assert f.refs == ("D1", "R1") and f.nets == ("+3V3", "GND") and f.line == line_of(board, "D1")
    # +3V3 at −5 % (rail named by voltage, ±5 % default); Vf_max 3.4 V at the 20 mA nominal
    # current, (3.3 − 2.9) / 20 Ω = 20 mA (Ohm's law): headroom 3.135 − 3.4 = −0.265 V.
    assert value(f, "supply_min").value == pytest.approx(3.135)
    assert value(f, "nominal").value == pytest.approx(0.020, rel=1e-6)
    assert value(f, "string").value == pytest.approx(3.4, abs=1e-6)
    assert value(f, "headroom").value == pytest.approx(3.135 - 3.4, abs=1e-6)
    assert "no headroom at the low corner" in f.message


def test_half_current_at_the_low_corner_is_a_warning(tmp_path: Path) -> None:
    """A yellow LED on a +3V3 rail that can sag to 2.9 V: lit, but at under half brightness."""
    board = lamp("+3V3", "120", "yellow", Vf="2.1V@10mA", Vf_max="2.5V", If_max="20mA")
    f = only(run_board(board, tmp_path, SAGGING), "supply-headroom")
    assert f.severity is Severity.WARNING
    # Nominal (3.3 − 2.1) / 120 Ω = 10 mA; headroom 2.9 − 2.5 = 0.4 V (Vf_max 2.5 V, the yellow
    # maximum of field-facts §5a, given here as a field).
    assert value(f, "nominal").value == pytest.approx(0.010, rel=1e-6)
    assert value(f, "headroom").value == pytest.approx(0.4, abs=1e-6)
    # Low corner: 2.9 V through 126 Ω (+5 %). Ohm's law with Vf_max gives the least current; a
    # chord of slope r_d,max at that current (rulecheck.current_bounds) the most.
    least = 0.4 / 126
    most = (0.4 + rd_max(least) * 0.010) / (126 + rd_max(least))
    assert 0.1 < least / 0.010 <= value(f, "ratio").value <= most / 0.010 < 0.5
    assert value(f, "low").value == pytest.approx(value(f, "ratio").value * 0.010, rel=1e-6)


def test_fixed_twin_from_5v(tmp_path: Path) -> None:
    """The white LED from +5V through 100 Ω: 20 mA nominal, and 1.35 V for the ballast."""
    result = run_board(lamp("+5V", "100", "white", Vf="3.0V@20mA", Vf_max="3.4V", If_max="40mA"), tmp_path)
    # At 4.75 V and 105 Ω even Ohm's law with Vf_max keeps (4.75 − 3.4) / 105 = 12.9 mA, 64 %.
    assert (4.75 - 3.4) / 105 / 0.020 > 0.5
    assert of_rule(result, "supply-headroom") == []
    assert result.findings == ()


def test_reversed_led_is_not_a_headroom_finding(tmp_path: Path) -> None:
    b = Board("reversed", "supply-headroom fixture")
    b.resistor("R1", "330", "+12V", "Net-(D1-K)")
    b.led("D1", "red", "GND", "Net-(D1-K)")
    result = run_board(b, tmp_path)
    assert [f.rule for f in result.findings] == ["reverse-bias"]


def test_bank_low_current_and_ratio_agree(tmp_path: Path) -> None:
    b = Board("bank", "supply-headroom fixture")
    b.resistor("R1", "39", "+3V3", "/BANK", footprint="Resistor_SMD:R_1206_3216Metric")
    for ref in ("D1", "D2", "D3"):
        b.led(ref, "yellow", "/BANK", "GND", Rth="0", Vf="2.1V@10mA", Vf_max="2.5V", If_max="20mA")
    f = only(run_board(b, tmp_path, SAGGING), "supply-headroom")
    assert value(f, "low").value == pytest.approx(value(f, "ratio").value * value(f, "nominal").value, rel=1e-3)



WHITE = dict(Vf="3.0V@20mA", Vf_max="3.4V", If_max="50mA")


def string_of(n: int, rail: str, ohms: float) -> Board:
    b = Board("string", "supply-headroom fixture")
    b.resistor("R1", f"{ohms:.2f}", rail, "Net-(D1-A)", footprint="Resistor_SMD:R_2512_6332Metric")
    nets = ["Net-(D1-A)"] + [f"Net-(D{i + 2}-A)" for i in range(n - 1)] + ["GND"]
    for i in range(n):
        b.led(f"D{i + 1}", "white", nets[i], nets[i + 1], Rth="0", **WHITE)
    return b


def test_the_hint_s_supply_and_string_length_clear_the_warning(tmp_path: Path) -> None:
    """Three white LEDs on +12V through 150 Ω: under half the current at the low corner. The hint's
    supply, with the ballast re-sized for the same current by Ohm's law, clears it; so does the
    string length it names on the present supply (the hint's promise, checked by the engine)."""
    for sub in ("bad", "higher", "shorter"):
        (tmp_path / sub).mkdir()
    f = only(run_board(string_of(3, "+12V", 150.0), tmp_path / "bad"), "supply-headroom")
    assert f.severity is Severity.WARNING and "at most 2 LEDs per string" in f.hint
    current = value(f, "nominal").value
    string = 12.0 - current * 150.0  # Ohm's law: what the resistor does not drop, the LEDs do
    supply = value(f, "supply_needed").value
    assert 12.0 < supply < 16.0
    rails = f'[rails."+VLED"]\nnominal = {supply:.3f}\ntolerance = 0.05\n'
    higher = run_board(string_of(3, "+VLED", (supply - string) / current), tmp_path / "higher", rails)
    assert of_rule(higher, "supply-headroom") == []
    assert higher.board.analyses[0].nominal_current == pytest.approx(current, rel=0.02)
    shorter = run_board(string_of(2, "+12V", (12.0 - string * 2 / 3) / current), tmp_path / "shorter")
    assert of_rule(shorter, "supply-headroom") == []
