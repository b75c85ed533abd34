"""Each rule's documented example (what `ledlint explain` shows) holds, checked against Ohm's law.

Built-in red LED: 1.85 V typical, 2.5 V maximum, −10 % for the minimum (field-facts §5a);
white: 3.0 V typical, 3.4 V maximum. Rails from names hold ±5 % (common practice); resistors
±5 % (IEC 60062 J, the general-purpose default). Bounds use Vf at 20 mA, with the LED's
dynamic resistance (field-facts §5c) allowing the few percent between bound and model.
"""

from __future__ import annotations

import math

import pytest

from kicad8 import Board
from ledlint.checks.findings import Severity
from ledlint.review.run import check

MCU = {"1": "+3V3", "2": "/P0", "8": "GND"}
VT25 = 1.380649e-23 * 298.15 / 1.602176634e-19  # kT/q at 25 °C (CODATA 2018, exact in the 2019 SI)


def hand_current(v: float, r: float, vf: float, *, n: float = 2.0, rs: float = 10.0, tc: float = -0.002,
                 t: float = 40.0, i_test: float = 0.020) -> float:
    """Ohm's law, I = (V − Vf(I, T)) / R, with Vf(I, T) = Vf + n·Vt·ln(I / I_test) + Rs·(I − I_test) + tc·(T − 25)
    (Shockley with series resistance, field-facts §5c; tc −2 mV/K red, −3 mV/K white, common
    practice). The left side falls and the right rises with I, so bisection finds it."""
    vt = VT25 * (t + 273.15) / 298.15
    lo, hi = 1e-12, 100.0
    for _ in range(300):
        mid = math.sqrt(lo * hi)
        vf_mid = vf + n * vt * math.log(mid / i_test) + rs * (mid - i_test) + tc * (t - 25)
        lo, hi = (mid, hi) if (v - vf_mid) / r > mid else (lo, mid)
    return math.sqrt(lo * hi)


def findings(tmp_path, board: Board) -> dict:
    f = tmp_path / f"{board.name}.net"
    f.write_text(board.text(), encoding="utf-8")
    result = check([f])
    return {"by_rule": {x.rule: x for x in result.findings}, "board": result.files[0].board}


def value(finding, name: str) -> float:
    return next(v.value for v in finding.values if v.name == name)


def lamp(rail: str, r: str, colour: str, **fields: str) -> Board:
    b = Board("example", "documented example")
    b.resistor("R1", r, rail, "/A")
    b.led("D1", colour, "/A", "GND", If_max="20mA", **fields)
    return b


@pytest.mark.parametrize(("r", "severity", "worst"), [("150", Severity.ERROR, 0.025), ("220", Severity.WARNING, 0.0175),
                                                      ("270", None, 0.0144)])
def test_current_margin_example(tmp_path, r: str, severity, worst: float) -> None:
    got = findings(tmp_path, lamp("+5V", r, "red", Rth="0"))
    led = got["board"].analyses[0].leds[0]
    # Worst corner: 5.25 V, R 5 % low, Vf at its minimum (1.665 V at 20 mA), 40 °C.
    assert led.current.maximum == pytest.approx(hand_current(5.25, 0.95 * float(r), 1.665), rel=0.01)
    assert led.current.maximum == pytest.approx(worst, rel=0.05)  # "about" in the example
    f = got["by_rule"].get("current-margin")
    assert (f.severity if f else None) is severity


def test_current_margin_example_nominal(tmp_path) -> None:
    led = findings(tmp_path, lamp("+5V", "150", "red", Rth="0"))["board"].analyses[0].leds[0]
    assert led.current.nominal == pytest.approx((5 - 1.85) / 150, rel=0.01)  # "about 21 mA"


def test_shared_resistor_bank_example(tmp_path) -> None:
    b = Board("example", "bank")
    b.resistor("R1", "100", "+5V", "/N")
    for i in (1, 2, 3):
        b.led(f"D{i}", "red", "/N", "GND", If_max="20mA")
    got = findings(tmp_path, b)
    f = got["by_rule"]["shared-resistor-bank"]
    assert f.severity is Severity.ERROR
    assert value(f, "share") == pytest.approx(0.011, rel=0.05)  # (5 − 1.7) / 100 / 3, Vf at 11 mA
    # One LED can take most of the total: below the whole total (5.25 − 1.665) / 95.
    assert 0.030 < value(f, "worst") < (5.25 - 1.665) / 95
    fixed = Board("example", "bank fixed")
    for i in (1, 2, 3):
        fixed.resistor(f"R{i}", "270", "+5V", f"/A{i}")
        fixed.led(f"D{i}", "red", f"/A{i}", "GND", If_max="20mA")
    assert "shared-resistor-bank" not in findings(tmp_path, fixed)["by_rule"]


def test_resistor_overload_example(tmp_path) -> None:
    hot = findings(tmp_path, lamp("+12V", "100", "red"))["by_rule"]["resistor-overload"]
    # P = I²R with I ≤ (12.6 − 1.665) / 95: at most 1.26 W (Ohm's law).
    assert hot.severity is Severity.ERROR and 1.0 < value(hot, "power") <= (12.6 - 1.665) ** 2 / 95
    warm = findings(tmp_path, lamp("+12V", "680", "red", Rth="0"))["by_rule"]["resistor-overload"]
    # P = I²R at the worst corner; which tolerance end is worse depends on R against the loop:
    # at this ballast the low end (646 Ω), where the current is highest.
    i = hand_current(12.6, 646, 1.665)
    assert value(warm, "power") == pytest.approx(i * i * 646, rel=0.01)
    assert value(warm, "power") == pytest.approx(0.19, rel=0.05)
    assert "1210" in warm.hint


def test_supply_headroom_example(tmp_path) -> None:
    got = findings(tmp_path, lamp("+3V3", "15", "white", Vf="3.0V@20mA", Vf_max="3.4V", Rth="0"))
    f = got["by_rule"]["supply-headroom"]
    assert f.severity is Severity.ERROR
    # Nominal by Ohm's law with Vf(I) (white: n = 3, −3 mV/K), 25 °C; at the low corner 3.135 V
    # over 15.75 Ω with Vf 3.4 V at 20 mA at 0 °C: a fraction of a milliamp.
    nominal = hand_current(3.3, 15, 3.0, n=3.0, tc=-0.003, t=25.0)
    assert value(f, "nominal") == pytest.approx(nominal, rel=0.01) and value(f, "nominal") == pytest.approx(0.020, rel=0.01)
    low = hand_current(3.135, 15.75, 3.4, n=3.0, tc=-0.003, t=0.0)
    assert value(f, "low") == pytest.approx(low, rel=0.05) and value(f, "low") < 0.002
    colour_only = findings(tmp_path, lamp("+3V3", "15", "white"))["by_rule"]["supply-headroom"]
    assert colour_only.severity is Severity.INFO  # resting on the colour table: two steps lower
    fixed = findings(tmp_path, lamp("+5V", "150", "white", Rth="0"))
    assert "supply-headroom" not in fixed["by_rule"]
    led = fixed["board"].analyses[0].leds[0]
    assert led.current.nominal == pytest.approx(hand_current(5.0, 150, 3.0, n=3.0, tc=-0.003, t=25.0), rel=0.01)
    assert led.current.nominal == pytest.approx(0.014, rel=0.05)
    assert led.low == pytest.approx(hand_current(4.75, 157.5, 3.4, n=3.0, tc=-0.003, t=0.0), rel=0.01)


def test_unlimited_led_example(tmp_path) -> None:
    b = Board("example", "unlimited")
    b.led("D1", "red", "+3V3", "GND", If_max="20mA")
    f = findings(tmp_path, b)["by_rule"]["unlimited-led"]
    assert value(f, "model") == pytest.approx(0.25, rel=0.05) and "150 Ω" in f.hint
    fixed = findings(tmp_path, lamp("+3V3", "150", "red", Rth="0"))["board"].analyses[0].leds[0]
    assert fixed.current.maximum == pytest.approx(hand_current(3.465, 0.95 * 150, 1.665), rel=0.01)
    assert fixed.current.maximum == pytest.approx(0.0136, rel=0.05)


@pytest.mark.parametrize(("r", "worst", "fires"), [("47", 0.0217, True), ("120", 0.0126, False)])
def test_pin_overcurrent_example(tmp_path, r: str, worst: float, fires: bool) -> None:
    b = Board("example", "pin")
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm", MCU)
    b.resistor("R1", r, "/P0", "/A")
    b.led("D1", "red", "/A", "GND", If_max="20mA", Rth="0")
    got = findings(tmp_path, b)
    led = got["board"].analyses[0].leds[0]
    # Sourcing from 3.465 V through R (−5 %) and the pin's least 40 Ω (field-facts §9).
    assert led.current.maximum == pytest.approx(hand_current(3.465, 0.95 * float(r) + 40, 1.665), rel=0.01)
    assert led.current.maximum == pytest.approx(worst, rel=0.05)
    f = got["by_rule"].get("pin-overcurrent")
    assert (f is not None) == fires and (f is None or f.severity is Severity.ERROR)


POWER_LED = dict(footprint="LED_SMD:LED_3535_Power", Vf="3.0V@350mA", If_max="1A", Rth="30K/W")


def test_thermal_runaway_example(tmp_path) -> None:
    b = Board("example", "thermal")
    b.resistor("R1", "3R3", "+5V", "/N", footprint="Resistor_SMD:R_2512_6332Metric")
    for ref in ("D1", "D2"):
        b.led(ref, "white", "/N", "GND", **POWER_LED)
    got = findings(tmp_path, b)
    a = got["board"].analyses[0]
    led = a.leds[0]
    assert led.current.nominal == pytest.approx(0.32, rel=0.05) and led.current.maximum < 1.0  # within If_max
    # Two LEDs on one node: the mode where one warms and takes current from the other holds the
    # node, so G = Rth·|k|·Vf / r_d with r_d = n·Vt/I + Rs (field-facts §7, derived there):
    # n = 3, Rs = 0.2 V / If_max, k = −3 mV/K (white, common practice), at the self-heated point.
    tj = 25.0 + 30.0 * led.vf * led.current.nominal  # Tj = Ta + Rth·P at the nominal 25 °C
    rd = 3 * VT25 * (tj + 273.15) / 298.15 / led.current.nominal + 0.2 / 1.0
    closed = 30.0 * 0.003 * led.vf / rd
    assert a.loop_gain == pytest.approx(closed, rel=0.1)
    assert a.loop_gain == pytest.approx(0.57, rel=0.05) and got["by_rule"]["thermal-runaway"].severity is Severity.WARNING
    fixed = Board("example", "thermal fixed")
    for i in (1, 2):
        fixed.resistor(f"R{i}", "5R6", "+5V", f"/A{i}", footprint="Resistor_SMD:R_2512_6332Metric")
        fixed.led(f"D{i}", "white", f"/A{i}", "GND", **POWER_LED)
    fixed_got = findings(tmp_path, fixed)
    assert "thermal-runaway" not in fixed_got["by_rule"]
    for fa in fixed_got["board"].analyses:
        r = fa.leds[0]
        # One LED through R: G = Rth·|k|·(Vf − I·R) / (R + r_d) (field-facts §6, derived there).
        rd = 3 * VT25 / r.current.nominal + 0.2
        assert fa.loop_gain == pytest.approx(30 * 0.003 * (r.vf - r.current.nominal * 5.6) / (5.6 + rd), abs=0.01)
        assert fa.loop_gain < 0.05


def test_reverse_bias_example(tmp_path) -> None:
    b = Board("example", "reverse")
    b.resistor("R1", "330", "+12V", "/K")
    b.led("D5", "red", "GND", "/K", If_max="20mA")
    f = findings(tmp_path, b)["by_rule"]["reverse-bias"]
    assert f.severity is Severity.ERROR and value(f, "reverse") == pytest.approx(12.6, rel=1e-3)  # +5 % of 12 V


def test_junction_temperature_example(tmp_path) -> None:
    def board(rth: str) -> Board:
        b = Board("example", "junction")
        b.resistor("R1", "4R7", "+5V", "/A", footprint="Resistor_SMD:R_2512_6332Metric", Power="5W")
        b.led("D1", "white", "/A", "GND", footprint="LED_SMD:LED_1W_3535", Vf="3.0V@350mA", If_max="1.5A", Rth=rth)
        return b

    def by_hand(rth: float, vf: float = 2.7) -> tuple[float, float]:
        # Tj = Ta + Rth·P (field-facts §6) solved by fixed point at a high corner: +5V + 5 %,
        # R − 5 %, 40 °C, Vf −10 % (2.7 V: the most current) or +10 % (3.3 V: a ballasted LED can
        # dissipate more with a higher Vf); white InGaN n = 3, Rs = 0.2 V / If_max (field-facts
        # §5c, from memory), −3 mV/K (common practice). The loop gain is far below 1: it converges.
        tj = 40.0
        for _ in range(100):
            i = hand_current(5.25, 4.7 * 0.95, vf, n=3, rs=0.2 / 1.5, tc=-0.003, t=tj, i_test=0.350)
            tj = 40.0 + rth * (5.25 - i * 4.7 * 0.95) * i
        return i, tj

    got = findings(tmp_path, board("130K/W"))
    led = got["board"].analyses[0].leds[0]
    i, tj = by_hand(130.0)
    tj = max(tj, by_hand(130.0, 3.3)[1])  # the hotter of the two corners
    assert led.current.maximum == pytest.approx(i, rel=0.02) and led.current.maximum < 1.5
    assert led.current.nominal == pytest.approx(0.5, rel=0.1)
    assert led.tj_max == pytest.approx(tj, abs=3.0) and tj == pytest.approx(240, abs=5)
    assert set(got["by_rule"]) == {"junction-temperature"}
    fixed = findings(tmp_path, board("30K/W"))
    cool = fixed["board"].analyses[0].leds[0].tj_max
    assert cool == pytest.approx(by_hand(30.0)[1], abs=1.0) and cool < 90.0
    assert fixed["by_rule"] == {}
