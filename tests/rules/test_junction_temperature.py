"""junction-temperature: a self-heated junction past its rating, within the LED's current rating."""

from __future__ import annotations

from pathlib import Path

from kicad8 import Board
from rulecheck import of_rule, run_board, value

from ledlint.checks.findings import Severity

POWER_LED = "LED_SMD:LED_1W_3535"  # a 1 W class emitter, not an indicator package
AMBIENT = "[ambient]\nmin = 25\nmax = 25\n"
RAIL_MAX = 5.0 * 1.05  # +5V at the default ±5 % supply tolerance (common practice)


def power_led(rth: str, if_max: str = "1.5A", **fields: str) -> Board:
    b = Board("hot", "junction-temperature fixture")
    b.resistor("R1", "4R7", "+5V", "Net-(D1-A)", footprint="Resistor_SMD:R_2512_6332Metric")
    b.led("D1", "white", "Net-(D1-A)", "GND", footprint=POWER_LED, Vf="3.0V@350mA", If_max=if_max,
          Rth=rth, **fields)
    return b


def led_of(result):
    return next(a for a in result.board.analyses if a.circuit.id == "D1").leds[0]


def test_poor_heat_path(tmp_path: Path) -> None:
    """A 1 W LED within its current rating on 130 K/W: the heat path, not the current, is at fault."""
    result = run_board(power_led("130K/W"), tmp_path, AMBIENT)
    f = of_rule(result, "junction-temperature")[0]
    led = led_of(result)
    assert led.current.maximum < 1.5
    # Tj = Ta + Rth·P (field-facts §6). The LED takes less than the whole rail, so P < V_rail·I:
    # an upper bound by hand. Past the default 125 °C (LED ratings 110-150 °C, field-facts §5b).
    tj = value(f, "tj").value
    assert 125.0 < tj < 25.0 + 130.0 * RAIL_MAX * led.current.maximum
    # The LED's share is at least the 3.0 V it drops at 350 mA less its fall when warm (−4 mV/K
    # at most, field-facts §5c) — a lower bound on P and so on Tj.
    assert tj > 25.0 + 130.0 * (3.0 - 0.004 * (tj - 25.0)) * 0.350
    # Tj_max is the default, so the finding is a step less severe (common practice).
    assert value(f, "tj_max").value == 125.0 and f.severity is Severity.INFO
    assert f.refs == ("D1", "R1") and "+5V" in f.nets
    assert any("Tj_max" in x for x in f.assumed)


def test_stated_rating_keeps_the_warning(tmp_path: Path) -> None:
    result = run_board(power_led("130K/W", Tj_max="150"), tmp_path, AMBIENT)
    f = of_rule(result, "junction-temperature")[0]
    assert value(f, "tj_max").value == 150.0 and f.severity is Severity.WARNING


def test_fixed_twin_on_a_star_board(tmp_path: Path) -> None:
    """30 K/W: Tj < 25 + 30 · 5.25 V · I_max, well under 125 °C (Tj = Ta + Rth·P, field-facts §6)."""
    result = run_board(power_led("30K/W"), tmp_path, AMBIENT)
    led = led_of(result)
    assert 25.0 + 30.0 * RAIL_MAX * led.current.maximum < 125.0
    assert of_rule(result, "junction-temperature") == []


def test_over_current_is_current_margins_finding(tmp_path: Path) -> None:
    """Past If_max the current is at fault: current-margin reports it, this rule keeps quiet."""
    result = run_board(power_led("130K/W", if_max="350mA"), tmp_path, AMBIENT)
    assert of_rule(result, "junction-temperature") == []
    assert of_rule(result, "current-margin")
