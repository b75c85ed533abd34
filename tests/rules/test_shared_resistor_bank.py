"""shared-resistor-bank: LEDs in parallel behind one resistor; the split follows their Vf."""

from __future__ import annotations

import re

from pathlib import Path

import pytest
from ledlint.quantities.eseries import ESeries, nearest_below
from kicad8 import Board
from rulecheck import N_MAX, RS_MAX, line_of, of_rule, only, run_board, thermal_voltage, value

from ledlint.checks.findings import Severity

R1206 = "Resistor_SMD:R_1206_3216Metric"
I_TEST = 0.010
# Dynamic resistance at the 10 mA test current, r_d = n·Vt/I + R_s, over n 1.5-2.5 and R_s
# 5-20 Ω for indicator LEDs (field-facts §5c, from memory).
RD_LOW = 1.5 * thermal_voltage(25) / I_TEST + 5.0
RD_HIGH = N_MAX * thermal_voltage(25) / I_TEST + RS_MAX


def bank(vf_min: str = "", vf_max: str = "", if_max: str = "20mA") -> Board:
    """Three red LEDs (2.0 V at 10 mA) in parallel on /BANK, behind one 100 Ω from +5V."""
    b = Board("bank", "shared-resistor-bank fixture")
    b.resistor("R1", "100", "+5V", "/BANK", footprint=R1206)
    spread = {k: v for k, v in (("Vf_min", vf_min), ("Vf_max", vf_max)) if v}
    for ref in ("D1", "D2", "D3"):
        b.led(ref, "red", "/BANK", "GND", Vf="2.0V@10mA", If_max=if_max, Rth="0", **spread)
    return b


def hog_current(rd: float, vf_low: float, vf_high: float, volts: float = 5.25, ohms: float = 95.0) -> float:
    """The hogging corner in the linear LED model V = V0 + r_d·I (field-facts §7: I₁ − I₂ = δ/r_d).

    One LED at its lowest Vf, the other two at their highest, all meeting at one node fed from
    `volts` through `ohms`; an LED whose V0 is above the node carries nothing. Bisection on the
    node voltage.
    """
    v0 = [vf_low - rd * I_TEST] + [vf_high - rd * I_TEST] * 2
    lo, hi = 0.0, volts
    for _ in range(100):
        node = (lo + hi) / 2
        into_leds = sum(max(0.0, (node - v) / rd) for v in v0)
        lo, hi = (node, hi) if (volts - node) / ohms > into_leds else (lo, node)
    return (lo - v0[0]) / rd


def test_hogging_past_if_max_is_an_error(tmp_path: Path) -> None:
    board = bank()
    f = only(run_board(board, tmp_path), "shared-resistor-bank")
    assert f.severity is Severity.ERROR
    assert f.refs == ("R1", "D1", "D2", "D3") and f.nets == ("/BANK",)
    assert f.line == line_of(board, "D1")
    # Equal share at nominal: (5 V − 2.0 V) / 100 Ω / 3 = 10 mA each (Ohm's law, identical LEDs).
    assert value(f, "share").value == pytest.approx(0.010, rel=1e-6)
    # Hogging corner: 5.25 V, 95 Ω, one LED at 1.8 V and two at 2.2 V (typical ∓10 %). Over the
    # whole r_d range the hog takes more than its 20 mA rating.
    least, most = sorted(hog_current(rd, 1.8, 2.2) for rd in (RD_LOW, RD_HIGH))
    worst = value(f, "worst")
    assert 0.020 < least <= worst.value <= most
    assert worst.limit == 0.020 and "above its If_max of 20 mA" in f.message
    # The hint's resistor, fitted one per LED, passes; the E24 value below it (IEC 60063) does not:
    # it is the smallest that keeps the worst case inside 75 % of If_max (common practice).
    hinted = re.search(r"give each LED its own ([0-9.]+) Ω resistor", f.hint)
    assert hinted, f.hint
    r = float(hinted.group(1))
    assert not loud(run_board(split_bank(r), tmp_path))
    below = nearest_below(r * 0.999, ESeries.E24)
    assert any(x.rule == "current-margin" for x in run_board(split_bank(below), tmp_path).findings)


def split_bank(r: float) -> Board:
    """The bank fixture with one resistor per LED instead of the shared one."""
    b = Board("bank", "shared-resistor-bank fixture, split")
    for i in (1, 2, 3):
        b.resistor(f"R{i}", f"{r:g}", "+5V", f"/A{i}", footprint=R1206)
        b.led(f"D{i}", "red", f"/A{i}", "GND", Vf="2.0V@10mA", If_max="20mA", Rth="0")
    return b


def loud(result) -> list:
    return [(x.rule, x.message) for x in result.findings if x.severity in (Severity.ERROR, Severity.WARNING)]


def test_tight_bin_inside_if_max_is_a_warning(tmp_path: Path) -> None:
    f = only(run_board(bank("1.95V", "2.05V", "30mA"), tmp_path), "shared-resistor-bank")
    assert f.severity is Severity.WARNING
    least, most = sorted(hog_current(rd, 1.95, 2.05) for rd in (RD_LOW, RD_HIGH))
    assert least <= value(f, "worst").value <= most < 0.030
    # The spread's 99th percentile: the range of three Vf draws uniform over a 0.1 V bin
    # reaches 0.942 of the bin with 1 % left above (order statistics: P(range ≤ r) = 3r² − 2r³),
    # and the split is that δ over r_d (field-facts §7), relative to the 9-12 mA mean.
    spread = value(f, "spread").value
    assert 0.942 * 0.1 / RD_HIGH / 0.012 <= spread <= 0.1 / RD_LOW / 0.009


def test_each_die_on_its_own_pin_is_an_info(tmp_path: Path) -> None:
    """A common-anode RGB LED on one resistor, each cathode on its own controller pin."""
    b = Board("rgb", "shared-resistor-bank fixture")
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm",
          {"1": "+5V", "2": "/R", "3": "/G", "4": "/B", "8": "GND"})
    b.resistor("R1", "150", "+5V", "Net-(D1-A)")
    b.add("D1", "LED_RGBA", "RGB", "LED_SMD:LED_RGB_PLCC-4", {"1": "/R", "2": "/G", "3": "/B", "4": "Net-(D1-A)"})
    f = only(run_board(b, tmp_path), "shared-resistor-bank")
    assert f.severity is Severity.INFO
    assert f.refs == ("R1", "D1") and f.nets == ("Net-(D1-A)",)
    assert "U1 PA0, U1 PA1, U1 PA2" in f.message


def test_fixed_twin_has_one_resistor_each(tmp_path: Path) -> None:
    b = Board("bank", "shared-resistor-bank fixture")
    for k in (1, 2, 3):
        b.resistor(f"R{k}", "300", "+5V", f"Net-(D{k}-A)")
        b.led(f"D{k}", "red", f"Net-(D{k}-A)", "GND", Vf="2.0V@10mA", If_max="20mA", Rth="0")
    result = run_board(b, tmp_path)
    assert of_rule(result, "shared-resistor-bank") == []
    assert result.findings == ()


def test_hint_for_strings_sizes_one_resistor_per_string(tmp_path: Path) -> None:
    """Two strings of two red LEDs (2.0 V at 5 mA each) on /BANK behind one 100 Ω."""
    b = Board("bank", "shared-resistor-bank fixture")
    b.resistor("R1", "100", "+5V", "/BANK", footprint=R1206)
    for top, mid, low in (("D1", "Net-(D1-K)", "D2"), ("D3", "Net-(D3-K)", "D4")):
        b.led(top, "red", "/BANK", mid, Vf="2.0V@5mA", If_max="20mA", Rth="0")
        b.led(low, "red", mid, "GND", Vf="2.0V@5mA", If_max="20mA", Rth="0")
    f = only(run_board(b, tmp_path), "shared-resistor-bank")
    # Nominal: (5 − 2 × 2.0) V / 100 Ω = 10 mA, 5 mA a string (Ohm's law).
    assert value(f, "share").value == pytest.approx(0.005, rel=1e-6)
    # One resistor per string, not per LED: fitted, the strings pass (each sized for its worst
    # corner, inside 75 % of If_max, common practice).
    hinted = re.search(r"give each string its own ([0-9.]+) Ω resistor", f.hint)
    assert hinted, f.hint
    fixed = Board("bank", "shared-resistor-bank fixture, one resistor per string")
    for k, (top, mid, low) in enumerate((("D1", "Net-(D1-K)", "D2"), ("D3", "Net-(D3-K)", "D4")), start=1):
        fixed.resistor(f"R{k}", hinted.group(1), "+5V", f"/S{k}", footprint=R1206)
        fixed.led(top, "red", f"/S{k}", mid, Vf="2.0V@5mA", If_max="20mA", Rth="0")
        fixed.led(low, "red", mid, "GND", Vf="2.0V@5mA", If_max="20mA", Rth="0")
    assert not [x for x in run_board(fixed, tmp_path).findings if x.rule in ("current-margin", "shared-resistor-bank")]
