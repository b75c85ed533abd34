"""unrecognised-circuit: an LED the tool cannot follow is listed with what it saw, never skipped."""

from __future__ import annotations

from pathlib import Path

from kicad8 import Board
from rulecheck import line_of, of_rule, only, run_board

from ledlint.checks.findings import Severity

HEADER2 = "Connector_PinHeader_2.54mm:PinHeader_1x02_P2.54mm_Vertical"


def bezel_led(on_board: bool) -> Board:
    """A white LED whose cathode either leaves the board on J2 or returns to GND here."""
    b = Board("unrecognised", "unrecognised-circuit fixture")
    cathode = "GND" if on_board else "/BEZEL_K"
    b.add("J2", "Conn_01x02", "Conn_01x02", HEADER2, {"1": "+3V3", "2": "/BEZEL_K"})
    b.resistor("R1", "150", "+3V3", "Net-(D1-A)")
    b.led("D1", "white", "Net-(D1-A)", cathode, Vf="2.8V@3mA", If_max="20mA")
    return b


def test_led_returning_off_the_board(tmp_path: Path) -> None:
    board = bezel_led(on_board=False)
    f = only(run_board(board, tmp_path), "unrecognised-circuit")
    assert f.severity is Severity.INFO
    assert f.refs == ("D1", "R1") and f.nets == ("+3V3", "/BEZEL_K") and f.line == line_of(board, "D1")
    assert f.message == ("D1 not analysed: the cathode side ends at net /BEZEL_K, which goes off the "
                         "board through connector J2 pin 2")
    assert f.hint == "check this circuit by hand"


def test_node_with_other_parts(tmp_path: Path) -> None:
    """An LED across the lower leg of a divider: its node holds two other series parts."""
    b = Board("unrecognised", "unrecognised-circuit fixture")
    b.resistor("R1", "330", "+5V", "/MID")
    b.resistor("R2", "1k", "/MID", "GND")
    b.led("D1", "red", "/MID", "GND")
    f = only(run_board(b, tmp_path), "unrecognised-circuit")
    assert f.nets == ("/MID",)
    assert f.message.startswith("D1 not analysed: net /MID joins 1 LED string(s) and 2 other series parts")


def test_fixed_twin_returns_on_the_board(tmp_path: Path) -> None:
    result = run_board(bezel_led(on_board=True), tmp_path)
    assert of_rule(result, "unrecognised-circuit") == []
    assert [a.circuit.kind.value for a in result.board.analyses] == ["series-string"]


def test_open_end_names_the_unfitted_part(tmp_path: Path) -> None:
    """The ballast is marked do-not-populate: the LED can never light, and the reason says why."""
    b = Board("dnp", "unrecognised fixture")
    b.resistor("R1", "DNP", "+5V", "/A")
    b.led("D1", "red", "/A", "GND")
    f = only(run_board(b, tmp_path), "unrecognised-circuit")
    assert f.severity is Severity.WARNING and "only R1, marked do-not-populate" in f.message
