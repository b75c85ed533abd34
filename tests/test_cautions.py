"""The safety caution: where a board shows mains or more than 60 V DC, the report says so once."""

from __future__ import annotations

from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import run_board

from ledlint.report import text
from ledlint.review.run import RunResult


def string_on(rail: str, leds: int) -> Board:
    b = Board("hv", "caution fixture")
    nets = ["/A"] + [f"/S{i}" for i in range(1, leds)] + ["GND"]
    b.resistor("R1", "1k", rail, "/A", footprint="Resistor_THT:R_Axial_Power_L20.0mm_W6.4mm_P22.40mm")
    for i in range(leds):
        b.led(f"D{i + 1}", "white", nets[i], nets[i + 1], Vf="3.0V@20mA", If_max="30mA")
    return b


# 60 V DC: the safety-extra-low-voltage ceiling for DC of IEC 62368-1's ES1 (from memory); a rail
# named by its voltage is taken as ±5 % (common practice), so +58V can reach 60.9 V: cautioned.
@pytest.mark.parametrize(("rail", "leds", "expected"), [
    ("+48V", 14, None),
    ("+58V", 16, "above 60 V DC: net +58V up to 60.9 V (58 V nominal); LED circuit D1"),
    ("+72V", 20, "above 60 V DC: net +72V up to 75.6 V (72 V nominal); LED circuit D1"),
])
def test_high_voltage_is_cautioned_once_with_the_figure(tmp_path: Path, rail: str, leds: int,
                                                        expected: str | None) -> None:
    fr = run_board(string_on(rail, leds), tmp_path)
    assert fr.board.cautions == ((expected,) if expected else ())
    report = text.render(RunResult((fr,), (), ()), width=100)
    assert report.count("CAUTION") == (1 if expected else 0)
    if expected:
        assert "review aid, not a safety assessment" in report and "qualified person" in report


def test_mains_nets_and_a_bridge_are_cautioned(tmp_path: Path) -> None:
    b = Board("mains", "caution fixture")
    b.add("J1", "Conn_01x02", "Conn_01x02", "Connector:Conn_01x02", {"1": "/L", "2": "/N"})
    b.add("BR1", "D_Bridge_+-AA", "DB107", "Diode_THT:Diode_Bridge_DIP-4", {"1": "/RECT", "2": "GND", "3": "/L",
                                                                            "4": "/N"})
    b.resistor("R1", "47k", "/RECT", "/A")
    b.led("D1", "red", "/A", "GND")
    cautions = run_board(b, tmp_path).board.cautions
    assert cautions[:2] == ("mains nets on the board: /L, /N", "LEDs fed by rectifier BR1 (an AC input, possibly mains)")
