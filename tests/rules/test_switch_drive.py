"""switch-drive: a switch its controller pin cannot turn off, or cannot saturate."""

from __future__ import annotations

from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import line_of, of_rule, only, run_board, value

from ledlint.checks.findings import Severity

SOT23 = "Package_TO_SOT_SMD:SOT-23"
SOIC8 = "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm"


def high_side(rail: str) -> Board:
    """A P-MOSFET from `rail`, its gate straight on a port pin of a 3.3 V controller."""
    b = Board("pmos", "switch-drive fixture")
    b.add("U1", "MCU8", "MCU8", SOIC8, {"1": "+3V3", "2": "/LED_OFF", "8": "GND"})
    b.add("Q1", "Q_PMOS_GSD", "PMOS", SOT23, {"1": "/LED_OFF", "2": rail, "3": "Net-(Q1-D)"})
    b.resistor("R1", "1k", "Net-(Q1-D)", "Net-(D1-A)", footprint="Resistor_SMD:R_1206_3216Metric")
    b.led("D1", "red", "Net-(D1-A)", "GND", Vf="2.0V@20mA", If_max="20mA", Rth="0")
    return b


# Off needs V_G ≥ V_S − |V_GS(th)|, with |V_GS(th)| at least 1 V (field-facts §9, small-signal
# MOSFETs 1-2.5 V); the pin's high level is its +3V3 supply at +5 %, 3.465 V (common practice).
@pytest.mark.parametrize(("rail", "stuck"), [("+12V", True), ("+5V", True), ("+3V3", False)])
def test_a_high_side_switch_above_the_pin_cannot_turn_off(tmp_path: Path, rail: str, stuck: bool) -> None:
    board = high_side(rail)
    result = run_board(board, tmp_path)
    if not stuck:
        assert of_rule(result, "switch-drive") == []
        return
    f = only(result, "switch-drive")
    assert f.severity is Severity.ERROR and "Q1 cannot be turned off" in f.message
    assert f.refs[:2] == ("Q1", "U1") and f.nets == ("/LED_OFF",) and f.line == line_of(board, "Q1")
    assert value(f, "io").value == pytest.approx(3.3 * 1.05)
    assert value(f, "rail").value == pytest.approx({"+12V": 12.0, "+5V": 5.0}[rail] * 0.95)
    assert value(f, "io").value < value(f, "rail").value - 1.0


def low_side(base_resistor: str) -> Board:
    """+5V → 150 Ω → red LED → NPN to GND, its base through R2 from a 3.3 V port pin."""
    b = Board("npn", "switch-drive fixture")
    b.add("U1", "MCU8", "MCU8", SOIC8, {"1": "+3V3", "2": "/LED_ON", "8": "GND"})
    b.resistor("R2", base_resistor, "/LED_ON", "Net-(Q1-B)")
    b.resistor("R1", "150", "+5V", "Net-(D1-A)", footprint="Resistor_SMD:R_1206_3216Metric")
    b.led("D1", "red", "Net-(D1-A)", "Net-(D1-K)", Vf="2.0V@20mA", If_max="30mA", Rth="0")
    b.add("Q1", "Q_NPN_BEC", "NPN", SOT23, {"1": "Net-(Q1-B)", "2": "GND", "3": "Net-(D1-K)"})
    return b


# I_B at the weakest corner: (3.135 V − V_BE 0.75 V) / (R_B × 1.05 + 65 Ω) (Ohm's law); the LED's
# most current about (5.25 − 1.8) / 142.5 Ω = 24 mA. Small-signal gains: typically about 200 at
# 10 mA, none past about 800 (from memory); the rule warns past 200 and errs past 1,000.
@pytest.mark.parametrize(("r_b", "severity"), [("10k", None), ("33k", Severity.WARNING), ("100k", Severity.ERROR),
                                                ("1M", Severity.ERROR)])
def test_a_starved_base_does_not_saturate(tmp_path: Path, r_b: str, severity: Severity | None) -> None:
    ohms = {"10k": 1e4, "33k": 3.3e4, "100k": 1e5, "1M": 1e6}[r_b]
    i_b = (3.3 * 0.95 - 0.75) / (ohms * 1.05 + 65)
    result = run_board(low_side(r_b), tmp_path)
    if severity is None:
        assert 0.024 / i_b < 200 and of_rule(result, "switch-drive") == []
        return
    f = only(result, "switch-drive")
    assert f.severity is severity and "Q1 is not driven into saturation" in f.message
    assert value(f, "ib").value == pytest.approx(i_b, rel=1e-6)
    assert value(f, "gain").value == pytest.approx(value(f, "ic").value / i_b, rel=1e-6)
    assert 0.022 < value(f, "ic").value < 0.026
    assert "(E24) for R2" in f.hint


def test_a_pull_up_to_the_rail_makes_it_a_warning(tmp_path: Path) -> None:
    """A pull-up from gate to source says the pin may be open drain: then the switch works if the
    pin stands the rail, which a netlist cannot tell (common practice)."""
    b = high_side("+5V")
    b.resistor("R4", "10k", "+5V", "/LED_OFF")
    f = only(run_board(b, tmp_path), "switch-drive")
    assert f.severity is Severity.WARNING and "unless U1 pin PA0 is set to open drain" in f.message


def test_a_base_pull_down_takes_its_share(tmp_path: Path) -> None:
    """4.7 kΩ from base to emitter takes V_BE / R of the base drive (Ohm's law): with 10 kΩ in
    series from a 3.3 V pin, what reaches the base at the weakest corner is
    (3.135 − 0.75) / 10.565 kΩ − 0.75 / 4.465 kΩ, about 58 µA."""
    b = low_side("10k")
    b.resistor("R3", "4k7", "Net-(Q1-B)", "GND")
    f = only(run_board(b, tmp_path), "switch-drive")
    expected = (3.3 * 0.95 - 0.75) / (1e4 * 1.05 + 65) - 0.75 / (4700 * 0.95)
    assert value(f, "ib").value == pytest.approx(expected, rel=1e-6)
    assert f.severity is Severity.WARNING and any("R3 across base and emitter" in x for x in f.assumed)


def test_strings_with_their_own_resistors_share_one_switch(tmp_path: Path) -> None:
    """Four red LEDs, each through its own 47 Ω from +5V, onto one NPN: a bank of ballasted
    strings, checked LED by LED (current-margin), not a shared-resistor bank. Each LED takes
    about (5.25 − 1.8) / 44.65 Ω ≈ 77 mA at most (Ohm's law, less V_CE), over its 30 mA."""
    b = Board("four", "switch-drive fixture")
    b.add("U1", "MCU8", "MCU8", SOIC8, {"1": "+3V3", "2": "/LED_ON", "8": "GND"})
    b.resistor("R9", "1k", "/LED_ON", "Net-(Q1-B)")
    for k in range(1, 5):
        b.resistor(f"R{k}", "47", "+5V", f"Net-(D{k}-A)", footprint="Resistor_SMD:R_1206_3216Metric")
        b.led(f"D{k}", "red", f"Net-(D{k}-A)", "/COL", Vf="2.0V@20mA", If_max="30mA", Rth="0")
    b.add("Q1", "Q_NPN_BEC", "NPN", SOT23, {"1": "Net-(Q1-B)", "2": "GND", "3": "/COL"})
    result = run_board(b, tmp_path)
    assert [a.circuit.kind.value for a in result.board.analyses] == ["shared-resistor-bank"]
    assert of_rule(result, "shared-resistor-bank") == [] and of_rule(result, "unrecognised-circuit") == []
    f = only(result, "current-margin")
    assert f.severity is Severity.ERROR and "for each of R1, R2, R3 and R4" in f.hint
    assert 0.060 < value(f, "worst").value < (5.25 - 1.8) / (47 * 0.95)
