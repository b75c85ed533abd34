"""missing-parameter: what the netlist does not say, so a check could not run, and what to add."""

from __future__ import annotations

from pathlib import Path

from kicad8 import Board
from rulecheck import of_rule, only, run_board

from ledlint.findings import Severity


def indicator(value: str, rail: str = "+5V", **fields: str) -> Board:
    b = Board("missing", "missing-parameter fixture")
    b.resistor("R1", "330", rail, "Net-(D1-A)")
    b.led("D1", value, "Net-(D1-A)", "GND", **fields)
    return b


def test_led_of_no_stated_colour(tmp_path: Path) -> None:
    f = only(run_board(indicator("LED"), tmp_path), "missing-parameter")
    assert f.severity is Severity.INFO
    assert f.refs == ("D1", "R1") and f.nets == ("+5V", "GND")
    assert f.message.startswith("Vf unknown, so D1 could not be checked")
    assert "add a field Vf" in f.hint


def test_one_finding_lists_every_circuit_it_holds_up(tmp_path: Path) -> None:
    b = indicator("LED")
    b.resistor("R2", "330", "+5V", "Net-(D2-A)")
    b.led("D2", "LED", "Net-(D2-A)", "GND")
    f = only(run_board(b, tmp_path), "missing-parameter")
    assert set(f.refs) == {"D1", "R1", "D2", "R2"}
    assert "D1 and D2 could not be checked" in f.message


def test_rail_of_unknown_voltage(tmp_path: Path) -> None:
    f = only(run_board(indicator("red", rail="VCC"), tmp_path), "missing-parameter")
    assert f.nets == ("VCC", "GND")
    assert f.message.startswith("supply voltage unknown")
    assert '[rails."VCC"] nominal' in f.hint


def test_unreadable_resistor_value(tmp_path: Path) -> None:
    b = Board("missing", "missing-parameter fixture")
    b.resistor("R1", "tbd", "+5V", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "GND")
    f = only(run_board(b, tmp_path), "missing-parameter")
    assert f.message.startswith("resistance unknown") and "R1" in f.refs
    assert "give R1 a value" in f.hint


def test_fixed_twins_are_checked(tmp_path: Path) -> None:
    """The colour named, the rail's voltage configured: the circuits are analysed."""
    named = run_board(indicator("red", Vf="2.0V@20mA"), tmp_path)
    configured = run_board(indicator("red", rail="VCC", Vf="2.0V@20mA"), tmp_path,
                           "[ambient]\nmin = 25\nmax = 25\n\n[rails.VCC]\nnominal = 5.0\n")
    for result in (named, configured):
        assert of_rule(result, "missing-parameter") == []
        assert all(a.solved for a in result.board.analyses)


def test_rating_unknown_is_reported(tmp_path: Path) -> None:
    """Mid-power LEDs at several times their test current, with no rating: not a pass."""
    b = Board("missing", "missing-parameter fixture")
    b.resistor("R1", "10", "+12V", "Net-(D1-A)", footprint="Resistor_SMD:R_2512_6332Metric")
    b.led("D1", "white", "Net-(D1-A)", "Net-(D2-A)", footprint="LED_SMD:LED_PLCC_2835", Vf="3.0V@60mA")
    b.led("D2", "white", "Net-(D2-A)", "GND", footprint="LED_SMD:LED_PLCC_2835", Vf="3.0V@60mA")
    f = only(run_board(b, tmp_path), "missing-parameter")
    assert f.message.startswith("If_max unknown") and "add a field If_max" in f.hint
