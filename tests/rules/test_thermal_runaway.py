"""thermal-runaway: the electro-thermal loop gain of a voltage-driven LED, checked in closed form."""

from __future__ import annotations

import math
from pathlib import Path

import pytest
from kicad8 import Board
from rulecheck import K_OVER_Q, ZERO_CELSIUS, line_of, of_rule, run_board, thermal_voltage, value

from ledlint.checks.findings import Severity

POWER_LED = "LED_SMD:LED_1W_3535"  # a 1 W class emitter on a plain board, not an indicator package
RTH = 130.0  # K/W junction to ambient as mounted (the part's Rth field)
AMBIENT = "[ambient]\nmin = 25\nmax = 25\n"
# What the diode model is given for this white LED: Vf 3.2 V at 100 mA and 25 °C, dVf/dT =
# −3 mV/K (Khanna, Fundamentals of Solid-State Lighting, eq. 14.1), ideality n = 3 (InGaN,
# within the 2-7 of Shah et al., field-facts §5c) and R_s = 0.2 V at If_max = 0.29 Ω (1 W
# class 0.3-1.5 Ω, field-facts §5c, from memory). XTI = 3, the SPICE default (field-facts §11).
VF, I_TEST, TC, N, XTI = 3.2, 0.100, -0.003, 3.0, 3.0
RS = 0.2 / 0.700


def spot(rail: str, ohms: str) -> Board:
    b = Board("thermal", "thermal-runaway fixture")
    b.resistor("R1", ohms, rail, "Net-(D1-A)", footprint="Resistor_SMD:R_2512_6332Metric", Power="2W")
    b.led("D1", "white", "Net-(D1-A)", "GND", footprint=POWER_LED, Vf="3.2V@100mA", If_max="700mA",
          Rth=f"{RTH:g}K/W")
    return b


def closed_form_gain(i: float, vf: float, ohms: float) -> float:
    """G = Rth·|k|·(Vf − I·R) / (R + r_d) at the operating point (field-facts §6, derived there).

    The junction sits at Tj = Ta + Rth·Vf·I (all electrical power as heat, field-facts §6);
    r_d = n·Vt(Tj)/I + R_s (field-facts §5c). k is dVj/dT at constant current from ngspice's
    diode temperature law, (Vj − EG − XTI·Vt)/T (ngspice manual §7.3, field-facts §5c), with EG
    set so that the slope is TC at the test point.
    """
    t0 = 25.0 + ZERO_CELSIUS
    eg = (VF - I_TEST * RS) - XTI * K_OVER_Q * t0 - TC * t0
    tj = 25.0 + RTH * vf * i
    t = tj + ZERO_CELSIUS
    k = ((vf - i * RS) - eg - XTI * K_OVER_Q * t) / t
    r_d = N * thermal_voltage(tj) / i + RS
    return RTH * abs(k) * (vf - i * ohms) / (ohms + r_d)


def test_stiff_rail_small_ballast_is_a_warning(tmp_path: Path) -> None:
    """+3V3 through 1 Ω: 0.1 V of ballast drop against a Vf that falls 3 mV for every kelvin."""
    board = spot("+3V3", "1")
    result = run_board(board, tmp_path, AMBIENT)
    f = next(x for x in of_rule(result, "thermal-runaway") if "loop gain" in x.message)
    assert f.severity is Severity.WARNING
    assert f.refs == ("D1", "R1") and f.nets == ("+3V3", "GND") and f.line == line_of(board, "D1")
    led = next(a for a in result.board.analyses if a.circuit.id == "D1").leds[0]
    i, vf = led.current.nominal, led.vf
    # The self-heated nominal point obeys Ohm's law round the loop: 3.3 V = I·1 Ω + Vf.
    assert i * 1.0 + vf == pytest.approx(3.3, abs=1e-6)
    # ... and its Vf is the datasheet point moved along the diode curve and down by TC for the
    # heat: Tj = 25 °C + Rth·Vf·I. Linear TC leaves a few mV of the model's curvature.
    tj = 25.0 + RTH * vf * i
    moved = VF + N * thermal_voltage(tj) * math.log(i / I_TEST) + RS * (i - I_TEST) + TC * (tj - 25.0)
    assert vf == pytest.approx(moved, abs=0.015)
    gain = value(f, "gain")
    assert gain.value == pytest.approx(closed_form_gain(i, vf, 1.0), rel=1e-3)
    assert gain.limit == 0.5 and gain.relation == ">=" and gain.value >= 0.5
    # A disturbance is amplified 1/(1 − G) times (field-facts §6).
    assert f"{1 / (1 - gain.value):.2g}×" in f.message


def test_fixed_twin_with_a_real_ballast(tmp_path: Path) -> None:
    """+5V through 18 Ω: 1.8 V of ballast drop, 100 mA before any heating."""
    result = run_board(spot("+5V", "18"), tmp_path, AMBIENT)
    # Bound from the closed form with r_d ≥ 0, |k| ≤ 4 mV/K (the top of the published range,
    # field-facts §5c) and Vf ≤ 3.3 V: G ≤ 130 × 0.004 × 3.3 / 18 = 0.095.
    assert RTH * 0.004 * 3.3 / 18 < 0.5
    a = next(a for a in result.board.analyses if a.circuit.id == "D1")
    assert a.loop_gain is not None and a.loop_gain < RTH * 0.004 * 3.3 / 18
    assert of_rule(result, "thermal-runaway") == []
    assert result.findings == ()
