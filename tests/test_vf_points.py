"""An LED given several Vf points: the diode model is fitted to them (Shockley with series R)."""

from __future__ import annotations

import math
from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import K_OVER_Q, ZERO_CELSIUS, of_rule, run_board

from ledlint.config import from_mapping
from ledlint.frozen import FrozenMap
from ledlint.netlist.model import Component
from ledlint.parts.params import Missing, led_params

# An invented diode (demo data): Is, n and Rs, and the ambient the points are read at.
IS, N, RS = 1e-19, 2.0, 8.0
VT = K_OVER_Q * (25.0 + ZERO_CELSIUS)


def shockley_v(i: float) -> float:
    """V = n·Vt·ln(1 + I/Is) + I·Rs, the Shockley diode with series resistance (field-facts §5c)."""
    return N * VT * math.log1p(i / IS) + i * RS


def points(*currents: float) -> str:
    return "; ".join(f"{shockley_v(i):.6f}V@{i * 1000:g}mA" for i in currents)


def test_points_are_read_in_order() -> None:
    c = Component("D1", "LED red", "LED_SMD:LED_0603_1608Metric", fields=FrozenMap({"Vf": points(0.01, 0.002, 0.04)}))
    p = led_params(c, from_mapping({}))
    assert [i for i, _ in p.curve] == pytest.approx([0.01, 0.002, 0.04])
    assert p.vf.value == pytest.approx(shockley_v(0.01), abs=1e-6) and p.i_test.value == pytest.approx(0.01)


@pytest.mark.parametrize("text", ["2.0V@10mA; 2.1V", "2.0V@10mA; 2.1V@10mA", "2.0V@10mA; fast"])
def test_points_without_distinct_currents_are_unreadable(text: str) -> None:
    c = Component("D1", "LED red", "LED_SMD:LED_0603_1608Metric", fields=FrozenMap({"Vf": text}))
    p = led_params(c, from_mapping({}))
    assert p.unreadable and isinstance(p.unreadable[0], Missing) and "points" in p.unreadable[0].reason


def _lamp(vf: str) -> Board:
    b = Board("points", "Vf points fixture")
    b.resistor("R1", "150", "+5V", "/A")
    b.led("D1", "red", "/A", "GND", Vf=vf, If_max="50mA", Rth="0")
    return b


def nominal_by_hand() -> float:
    """5 V across 150 Ω and the diode: 5 = I·150 + V(I), by bisection (Ohm's law with the
    Shockley curve above; the left side rises with I)."""
    lo, hi = 1e-9, 0.05
    for _ in range(200):
        mid = (lo + hi) / 2
        lo, hi = (mid, hi) if mid * 150 + shockley_v(mid) < 5.0 else (lo, mid)
    return lo


@pytest.mark.parametrize("currents", [(0.01, 0.002, 0.04), (0.005, 0.03)])
def test_points_fit_the_diode_they_came_from(tmp_path: Path, currents: tuple[float, ...]) -> None:
    """Three points fit n and Rs; two fit Rs with the colour's ideality, 2 for red (AlInGaP,
    field-facts §5c), the same as the diode's, so both recover it."""
    result = run_board(_lamp(points(*currents)), tmp_path)
    led = result.board.analyses[0].leds[0]
    assert led.current.nominal == pytest.approx(nominal_by_hand(), rel=1e-4)


def test_points_no_diode_could_give_are_reported(tmp_path: Path) -> None:
    result = run_board(_lamp("2.2V@2mA; 2.0V@20mA; 1.9V@40mA"), tmp_path)  # Vf falling as I rises
    [f] = of_rule(result, "missing-parameter")
    assert "D1's Vf points" in f.message and "do not describe a diode" in f.message
