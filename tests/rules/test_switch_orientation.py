"""switch-orientation: a transistor in an LED's path with its main terminals swapped."""

from __future__ import annotations

from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import line_of, of_rule, only, run_board

from ledlint.checks.findings import Severity

SOT23 = "Package_TO_SOT_SMD:SOT-23"
MCU = {"1": "+3V3", "2": "/LED_ON", "8": "GND"}


def low_side(symbol: str, swapped: bool, drain: str = "3", source: str = "2") -> Board:
    """+5V → R1 → D1 → Q1 → GND, Q1 driven from a port pin through R2."""
    b = Board("switch", "switch-orientation fixture")
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm", MCU)
    b.resistor("R2", "1k", "/LED_ON", "Net-(Q1-G)")
    b.resistor("R1", "330", "+5V", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "Net-(D1-K)", Vf="2.0V@20mA", If_max="20mA")
    top, bottom = ("Net-(D1-K)", "GND") if not swapped else ("GND", "Net-(D1-K)")
    b.add("Q1", symbol, "Q", SOT23, {"1": "Net-(Q1-G)", drain: top, source: bottom})
    return b


def high_side_pmos(swapped: bool) -> Board:
    """A P-MOSFET from +5V, its gate on a port pin of a controller on the same +5V (so the pin
    can turn it off: switch-drive)."""
    b = Board("switch", "switch-orientation fixture")
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm", {**MCU, "1": "+5V"})
    s, d = ("+5V", "Net-(Q1-D)") if not swapped else ("Net-(Q1-D)", "+5V")
    b.add("Q1", "Q_PMOS_GSD", "PMOS", SOT23, {"1": "/LED_ON", "2": s, "3": d})
    b.resistor("R1", "330", "Net-(Q1-D)", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "GND", Vf="2.0V@20mA", If_max="20mA")
    return b


# Which way current runs through each device when it conducts (a fact of the trade): N-MOSFET
# drain to source, P-MOSFET source to drain, NPN collector to emitter; a swapped MOSFET's body
# diode conducts (the LEDs cannot be turned off).
@pytest.mark.parametrize(("board", "nets", "words"), [
    (lambda sw: low_side("Q_NMOS_GSD", sw), ("Net-(D1-K)", "GND"), "drain and source swapped: its body diode conducts"),
    (lambda sw: low_side("Q_NPN_BEC", sw), ("Net-(D1-K)", "GND"), "collector and emitter swapped"),
    (high_side_pmos, ("+5V", "Net-(Q1-D)"), "drain and source swapped: its body diode conducts"),
])
def test_a_swapped_transistor_and_its_fixed_twin(tmp_path: Path, board, nets, words: str) -> None:
    (tmp_path / "bad").mkdir()
    (tmp_path / "good").mkdir()
    bad = board(True)
    f = only(run_board(bad, tmp_path / "bad"), "switch-orientation")
    assert f.severity is Severity.ERROR and words in f.message
    assert f.refs == ("Q1", "D1") and set(f.nets) == set(nets) and f.line == line_of(bad, "Q1")
    assert "swap Q1's" in f.hint
    fixed = run_board(board(False), tmp_path / "good")
    assert of_rule(fixed, "switch-orientation") == [] and fixed.findings == ()


def test_an_assumed_pinout_makes_it_a_warning(tmp_path: Path) -> None:
    """Pins without names: roles from the SOT-23 order (1 gate, 2 source, 3 drain), so the finding
    may be the assumption's and says so."""
    f = only(run_board(low_side("NMOS_SOT23", True), tmp_path), "switch-orientation")
    assert f.severity is Severity.WARNING
    assert any("pins unnamed" in a for a in f.assumed)


@pytest.mark.parametrize("gate_resistor", [False, True])
def test_reverse_polarity_protection_is_not_a_swapped_switch(tmp_path: Path, gate_resistor: bool) -> None:
    """The textbook P-MOSFET reverse-polarity protection: drain to the input, source to the load,
    gate to ground (directly or through a resistor). It is 'backwards' on purpose: its body diode
    conducts until the channel does (common practice)."""
    b = Board("protect", "switch-orientation fixture")
    gate = "Net-(Q1-G)" if gate_resistor else "GND"
    b.add("Q1", "Q_PMOS_GSD", "PMOS", SOT23, {"1": gate, "2": "/PROTECTED", "3": "+12V"})
    if gate_resistor:
        b.resistor("R2", "10k", "Net-(Q1-G)", "GND")
    b.resistor("R1", "1k", "/PROTECTED", "Net-(D1-A)", footprint="Resistor_SMD:R_1206_3216Metric")
    b.led("D1", "red", "Net-(D1-A)", "GND", Vf="2.0V@20mA", If_max="20mA")
    result = run_board(b, tmp_path)
    assert of_rule(result, "switch-orientation") == []
    assert result.board.analyses[0].solved and result.board.analyses[0].leds[0].current.nominal > 0.008
