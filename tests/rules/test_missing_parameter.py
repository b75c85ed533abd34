"""missing-parameter: what the netlist does not say, so a check could not run, and what to add."""

from __future__ import annotations

import math
import re

from pathlib import Path

import pytest

from kicad8 import Board
from rulecheck import of_rule, only, run_board

from ledlint.checks.findings import Severity


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
    # Following the hint literally makes a configuration that gets the circuit checked.
    m = re.search(r"a table (\[rails\.[^\]]+\]) with its voltage, e\.g\. (.*)$", f.hint)
    assert m and m.group(1) == '[rails."VCC"]'
    config = m.group(1) + "\n" + m.group(2).replace(" and ", "\n") + "\n"
    followed = run_board(indicator("red", rail="VCC"), tmp_path, config)
    assert of_rule(followed, "missing-parameter") == [] and all(a.solved for a in followed.board.analyses)


@pytest.mark.parametrize(("ohms", "why", "fix"), [
    ("tbd", "'tbd' is not a resistance", "give R1 a value"),
    ("1e300", "more than a resistor can be", "check R1's value"),  # a typing mistake, not a part
])
def test_unreadable_or_absurd_resistor_value(tmp_path: Path, ohms: str, why: str, fix: str) -> None:
    b = Board("missing", "missing-parameter fixture")
    b.resistor("R1", ohms, "+5V", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "GND")
    f = only(run_board(b, tmp_path), "missing-parameter")
    assert f.message.startswith("resistance unknown") and "R1" in f.refs and why in f.message
    assert fix in f.hint


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


def test_rectified_supply_asks_for_its_peak(tmp_path: Path) -> None:
    """A string behind a bridge: the hint explains the rectified peak, √2 × RMS (a fact of the trade)."""
    b = Board("mains", "rectified string fixture")
    b.add("J1", "Conn_01x02", "AC_IN", "Connector:Conn_01x02", {"1": "/AC1", "2": "/AC2"})
    b.add("BR1", "D_Bridge_+-AA", "DB107", "Diode_THT:Diode_Bridge_DIP-4", {"1": "/RECT", "2": "GND", "3": "/AC1",
                                                                            "4": "/AC2"})
    nets = ["/RECT"] + [f"/S{i}" for i in range(1, 100)] + ["GND"]
    b.resistor("R1", "10k", "/RECT", "/S1", footprint="Resistor_THT:R_Axial_DIN0414_L11.9mm_D4.5mm_P15.24mm_Horizontal")
    for i in range(1, 100):
        b.led(f"D{i}", "red", nets[i], nets[i + 1])
    f = only(run_board(b, tmp_path), "missing-parameter")
    assert "rectifier BR1" in f.message and "√2 × 230 V AC" in f.hint
    m = re.search(r"a table (\[rails\.[^\]]+\]) with (.*?) \(", f.hint)
    assert m and m.group(1) == '[rails."/RECT"]'
    # 325 V is √2 × 230 V (324.3 V) rounded, the usual figure for 230 V mains (fact of the trade).
    assert abs(math.sqrt(2) * 230 - 325) < 1
    config = m.group(1) + "\n" + m.group(2).replace(" and ", "\n") + "\n"
    followed = run_board(b, tmp_path, config)
    assert of_rule(followed, "missing-parameter") == [] and all(a.solved for a in followed.board.analyses)
    assert followed.board.cautions  # the mains caution stays (mains or > 60 V DC: the README's limits and cautions)


def _pin_driven(vbat: str, vdd: str) -> Board:
    b = Board("pin", "pin-driven fixture")
    b.add("U1", "MCU8B", "MCU", "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm",
          {"1": vbat, "2": "/LED", "4": vdd, "8": "GND"})
    b.resistor("R1", "330", "/LED", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "GND")
    return b


def test_pin_supply_hint_names_the_io_supply(tmp_path: Path) -> None:
    """The port pins run from VDD, not from the backup-battery pin (common practice)."""
    f = only(run_board(_pin_driven("/VBAT", "VCC"), tmp_path), "missing-parameter")
    assert f.message.startswith("supply voltage unknown") and "VCC, /VBAT" in f.message
    assert '[rails."VCC"]' in f.hint


def test_pin_drive_level_is_vdd_even_with_a_higher_battery(tmp_path: Path) -> None:
    result = run_board(_pin_driven("+3V6", "+3V3"), tmp_path)
    a = result.board.analyses[0]
    assert a.solved and a.supply.volts.nominal == 3.3 and "runs from +3V3" in a.supply.basis[0]


def test_an_unreadable_field_stops_only_the_check_that_needs_it(tmp_path: Path) -> None:
    """Missing means missing, for that parameter alone: a Power field that cannot be read leaves
    the rating unknown (resistor-overload says so) and the current check still runs. 47 Ω from
    +5V into a 2.0 V red LED is (5 − 2) / 47 = 64 mA (Ohm's law), over its 20 mA If_max."""
    b = Board("unread", "missing-parameter fixture")
    b.resistor("R1", "47", "+5V", "Net-(D1-A)", Power="a quarter watt")
    b.led("D1", "red", "Net-(D1-A)", "GND", Vf="2.0V@20mA", If_max="20mA", Rth="0")
    result = run_board(b, tmp_path)
    assert only(result, "current-margin").severity is Severity.ERROR
    f = only(result, "resistor-overload")
    assert f.severity is Severity.INFO and "Power = 'a quarter watt' on R1 cannot be read" in f.message
    # An If_max that cannot be read is not replaced by a package default: it is unknown.
    b2 = Board("unread2", "missing-parameter fixture")
    b2.resistor("R1", "47", "+5V", "Net-(D1-A)", footprint="Resistor_SMD:R_1206_3216Metric")
    b2.led("D1", "red", "Net-(D1-A)", "GND", Vf="2.0V@20mA", If_max="twenty", Rth="0")
    (tmp_path / "b2").mkdir()
    result = run_board(b2, tmp_path / "b2")
    assert of_rule(result, "current-margin") == []
    gap = only(result, "missing-parameter")
    assert gap.message.startswith("If_max unknown") and "If_max = 'twenty' on D1 cannot be read" in gap.message
    assert of_rule(result, "resistor-overload")  # 64 mA² × 44.65 Ω = 183 mW in a 250 mW 1206: still checked

