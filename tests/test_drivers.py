"""Current sinks and constant-current drivers: recognised, set-points and headroom by hand, splits by ngspice."""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest

import board_driver
from kicad8 import SYMBOLS, Board
from rulecheck import of_rule, only, run_board, value
from ledlint.analysis.results import Analysis
from ledlint.analysis.setpoints import DriverKind
from ledlint.checks.findings import Severity
from ledlint.circuits.recognise import CircuitKind, LedCircuit
from ledlint.review.run import FileResult, check
from paths import SAMPLES

# Test-only demo symbols: a plain diode, an inductor, and invented boost, buck and
# two-terminal regulator parts.
SYMBOLS.setdefault("D", ("Device", "D", "Diode", "diode", (("1", "K", "passive"), ("2", "A", "passive"))))
SYMBOLS.setdefault("L", ("Device", "L", "Inductor", "inductor choke coil",
                         (("1", "1", "passive"), ("2", "2", "passive"))))
SYMBOLS.setdefault("CCBOOST", ("ledlint_demo", "CCBOOST", "Boost LED driver (demo part)", "LED driver",
                               (("1", "VIN", "power_in"), ("2", "SW", "passive"), ("3", "FB", "input"),
                                ("4", "GND", "power_in"))))
SYMBOLS.setdefault("CCBUCK", ("ledlint_demo", "CCBUCK", "Buck LED driver, high-side sense (demo part)", "LED driver",
                              (("1", "VIN", "power_in"), ("2", "CSN", "input"), ("3", "SW", "passive"),
                               ("4", "GND", "power_in"))))
SYMBOLS.setdefault("CCR2", ("ledlint_demo", "CCR2", "Two-terminal constant-current regulator (demo part)",
                            "current regulator", (("1", "1", "passive"), ("2", "2", "passive"))))

SOT23 = "Package_TO_SOT_SMD:SOT-23"
MCU = {"1": "+3V3", "2": "/EN", "8": "GND"}
# Every corner at 25 °C, where a datasheet states Vf: a Vf given at the set current then holds
# exactly, and V_BE has no temperature term. Rails at ±5 % (common practice for a regulated rail).
BASE_CONFIG = """[ambient]
min = 25
max = 25
[rails."+12V"]
nominal = 12
min = 11.4
max = 12.6
[rails."+3V3"]
nominal = 3.3
min = 3.135
max = 3.465
"""
# What the tests hold a silicon V_BE to at 25 °C: 0.65 V, 0.55-0.75 V over parts and
# current (common practice). A zener of the common ±5 % grade (from memory). A resistor with
# no tolerance stated is ±5 %, IEC 60062 letter J, the general-purpose grade (common practice).
VBE, VBE_LO, VBE_HI = 0.65, 0.55, 0.75
ZENER_TOL = 0.05
R_TOL = 0.05


def run(board: Board, folder: Path, config: str = BASE_CONFIG) -> FileResult:
    return run_board(board, folder, config)


def analysis(result: FileResult, led: str) -> Analysis:
    return next(a for a in result.board.analyses if led in map(str, a.circuit.leds))


def circuit(result: FileResult, led: str) -> LedCircuit:
    return analysis(result, led).circuit


def loud(result: FileResult) -> list[tuple[str, str]]:
    return [(f.rule, f.message) for f in result.findings if f.severity in (Severity.ERROR, Severity.WARNING)]


# ------------------------------------------------------------------ boards

def sink_board(reference: str, strings: int = 1, emitter: str = "150", footprint: str = "") -> Board:
    """An NPN sink: LEDs from +12V into the collector, an emitter resistor, a base reference."""
    b = Board(f"sink-{reference}", "Demo current sink")
    for s in range(strings):
        b.led(f"D{s + 1}", "red", "+12V", "/COL", Vf="2.0V@20mA", If_max="30mA")
    b.add("Q1", "Q_NPN_BEC", "NPN", SOT23, {"1": "/BASE", "2": "/EMIT", "3": "/COL"})
    b.resistor("R1", emitter, "/EMIT", "GND", **({"footprint": footprint} if footprint else {}))
    if reference == "zener":
        b.resistor("R2", "4k7", "+12V", "/BASE")
        b.add("D9", "D_Zener", "2V7", "Diode_SMD:D_SOD-323", {"1": "/BASE", "2": "GND"})
    elif reference == "divider":
        b.resistor("R2", "10k", "+12V", "/BASE")
        b.resistor("R3", "1k5", "/BASE", "GND")
    elif reference in ("diodes", "diode"):
        b.resistor("R2", "4k7", "+12V", "/BASE")
        if reference == "diodes":  # two in series: about 1.3 V at the base
            b.add("D10", "D", "1N4148", "Diode_SMD:D_SOD-323", {"2": "/BASE", "1": "/MID"})
            b.add("D11", "D", "1N4148", "Diode_SMD:D_SOD-323", {"2": "/MID", "1": "GND"})
        else:
            b.add("D10", "D", "1N4148", "Diode_SMD:D_SOD-323", {"2": "/BASE", "1": "GND"})
    elif reference == "pin":
        b.add("U2", "MCU8", "MCU8", "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm", MCU)
        b.resistor("R2", "1k", "/EN", "/BASE")
    elif reference == "vbe":  # the two-transistor limiter: Q2 clamps the base at one V_BE over R1
        b.resistor("R2", "10k", "+12V", "/BASE")
        b.add("Q2", "Q_NPN_BEC", "NPN", SOT23, {"1": "/EMIT", "2": "GND", "3": "/BASE"})
    return b


LINEAR = {"driver": "linear", "vref": "200mV", "vref_tolerance": "3%"}


def ic_board(leds: int = 2, rsense: str = "10 1%", fields: dict[str, str] | None = None,
             led_fields: dict[str, str] | None = None, name: str = "ic") -> Board:
    """The demo linear sink: one string of white LEDs from +12V into OUT, Rsense from CS to ground."""
    b = Board(name, "Demo linear sink")
    b.add("U1", "CCSINK", "CCSINK", "Package_TO_SOT_SMD:SOT-23-5", {"1": "+12V", "2": "/OUT", "3": "/CS", "4": "GND"},
          **(LINEAR if fields is None else fields))
    b.resistor("R1", rsense, "/CS", "GND")
    nets = ["+12V"] + [f"/S{k}" for k in range(1, leds)] + ["/OUT"]
    for k in range(leds):
        b.led(f"D{k + 1}", "white", nets[k], nets[k + 1], footprint="LED_SMD:LED_PLCC_2835",
              **(led_fields or {"If_max": "100mA"}))
    return b


# ------------------------------------------------------------------ recogniser

@pytest.mark.parametrize(("reference", "refs"), [
    ("zener", ("D9", "R2")),
    ("divider", ("R2", "R3")),
    ("pin", ("R2", "U2")),
    ("vbe", ("Q2",)),
    pytest.param("diodes", ("D10", "D11")),
])
def test_sink_reference_kinds(tmp_path: Path, reference: str, refs: tuple[str, ...]) -> None:
    c = circuit(run(sink_board(reference), tmp_path), "D1")
    assert c.kind is CircuitKind.SINK and c.sink is not None
    assert c.sink.transistor.ref == "Q1" and [e.ref for e in c.sink.sense] == ["R1"]
    assert c.sink.reference.kind.value == ("diodes" if reference == "diodes" else reference)
    assert c.sink.reference.refs == refs
    assert set(refs) <= set(c.refs)


def test_parallel_strings_on_one_sink_are_one_circuit(tmp_path: Path) -> None:
    c = circuit(run(sink_board("zener", strings=3), tmp_path), "D1")
    assert c.kind is CircuitKind.SINK and tuple(map(str, c.leds)) == ("D1", "D2", "D3") and len(c.branches) == 3
    assert c.node == "/COL" and c.source.net == "+12V" and c.ret.net == "GND"


@pytest.mark.parametrize("table", ['[values."CCSINK"]', '[symbols."ledlint_demo:CCSINK"]', '[refs."U1"]'])
def test_driver_described_in_the_configuration(tmp_path: Path, table: str) -> None:
    config = BASE_CONFIG + f'{table}\ndriver = "linear"\nvref = "200mV"\nvref_tolerance = "3%"\n'
    result = run(ic_board(fields={}), tmp_path, config)
    c = circuit(result, "D1")
    assert c.kind is CircuitKind.DRIVER and c.driver is not None
    assert c.driver.ref == "U1" and c.driver.output.name == "OUT" and c.driver.sense == ("R1",)
    settings = {s.key: (s.text, s.where) for s in c.driver.settings}
    assert settings["driver"][0] == "linear" and table.split(".")[0].strip("[") in settings["vref"][1]
    assert analysis(result, "D1").set_current.current.nominal == pytest.approx(0.2 / 10)  # Vref / Rsense


def test_driver_described_by_fields(tmp_path: Path) -> None:
    result = run(ic_board(), tmp_path)
    c = circuit(result, "D1")
    assert c.kind is CircuitKind.DRIVER and c.driver.ref == "U1" and c.driver.sense == ("R1",)
    assert {s.key: s.where for s in c.driver.settings}["vref"] == "field vref on U1"
    assert tuple(map(str, c.leds)) == ("D1", "D2") and set(c.refs) == {"D1", "D2", "U1", "R1"}


def test_undescribed_driver_names_the_keys(tmp_path: Path) -> None:
    result = run(ic_board(fields={}), tmp_path)
    c = circuit(result, "D1")
    assert c.kind is CircuitKind.DRIVER and not analysis(result, "D1").solved
    f = only(result, "missing-parameter")
    assert f.severity is Severity.INFO and "U1" in f.refs and "D1" in f.message
    for key in ("driver", "vref", "vref_tolerance", "current", "current_max", "dropout", "vin_min", "vin_max",
                "vout_max"):
        assert re.search(rf"\b{key}\b", f.hint), key
    assert "ledlint.toml" in f.hint and "U1" in f.hint
    assert not loud(result)  # nothing is claimed about a driver nobody described


# ------------------------------------------------------------------ set-points by hand

def rng(result: FileResult, led: str = "D1") -> tuple[float, float, float]:
    i = analysis(result, led).set_current.current
    return i.nominal, i.minimum, i.maximum


def test_ic_set_point_is_vref_over_rsense_with_both_tolerances(tmp_path: Path) -> None:
    # R_sense = V_ref / I_LED (field-facts §10); worst cases by interval arithmetic: the most
    # current at the highest V_ref over the lowest resistance.
    result = run(ic_board(rsense="2R2 1%"), tmp_path)
    assert rng(result) == pytest.approx((0.2 / 2.2, 0.2 * 0.97 / (2.2 * 1.01), 0.2 * 1.03 / (2.2 * 0.99)))
    setc = analysis(result, "D1").set_current
    assert setc.sense_voltage.maximum == pytest.approx(0.206) and setc.sense[0][0] == "R1"


def test_fixed_current_given_instead_of_vref(tmp_path: Path) -> None:
    fields = {"driver": "linear", "current": "25mA", "current_tolerance": "8%"}
    result = run(ic_board(fields=fields), tmp_path)
    assert rng(result) == pytest.approx((0.025, 0.025 * 0.92, 0.025 * 1.08))  # the given I ± tolerance


def test_zener_sink(tmp_path: Path) -> None:
    # I = (V_z − V_BE) / R_E (the transistor current source, common practice).
    expect = ((2.7 - VBE) / 150, (2.7 * (1 - ZENER_TOL) - VBE_HI) / (150 * (1 + R_TOL)),
              (2.7 * (1 + ZENER_TOL) - VBE_LO) / (150 * (1 - R_TOL)))
    assert rng(run(sink_board("zener"), tmp_path)) == pytest.approx(expect)


def test_divider_sink(tmp_path: Path) -> None:
    # V_B = V·R_b/(R_t + R_b) (unloaded divider), then (V_B − V_BE)/R_E; extremes at the rail
    # ends with the divider ratio at its ends.
    def vb(v: float, top: float, bottom: float) -> float:
        return v * bottom / (top + bottom)

    lo, hi = 1 - R_TOL, 1 + R_TOL
    expect = ((vb(12, 10e3, 1.5e3) - VBE) / 150, (vb(11.4, 10e3 * hi, 1.5e3 * lo) - VBE_HI) / (150 * hi),
              (vb(12.6, 10e3 * lo, 1.5e3 * hi) - VBE_LO) / (150 * lo))
    assert rng(run(sink_board("divider"), tmp_path)) == pytest.approx(expect)


def test_controller_pin_sink(tmp_path: Path) -> None:
    # The base at the pin's high level, the MCU's +3V3 (base current neglected), less V_BE.
    expect = ((3.3 - VBE) / 150, (3.135 - VBE_HI) / (150 * (1 + R_TOL)), (3.465 - VBE_LO) / (150 * (1 - R_TOL)))
    assert rng(run(sink_board("pin"), tmp_path)) == pytest.approx(expect)


def test_vbe_limiter_sink(tmp_path: Path) -> None:
    # The two-transistor limiter: I = V_BE(Q2) / R_E (common practice).
    expect = (VBE / 150, VBE_LO / (150 * (1 + R_TOL)), VBE_HI / (150 * (1 - R_TOL)))
    assert rng(run(sink_board("vbe"), tmp_path)) == pytest.approx(expect)


def test_two_diode_sink(tmp_path: Path) -> None:
    # Two silicon diode drops at the base, one V_BE lost at the emitter: I ≈ V_diode / R_E.
    expect = ((2 * VBE - VBE) / 150, (2 * VBE_LO - VBE_HI) / (150 * (1 + R_TOL)),
              (2 * VBE_HI - VBE_LO) / (150 * (1 - R_TOL)))
    assert rng(run(sink_board("diodes"), tmp_path)) == pytest.approx(expect)


def test_vbe_falls_when_warm(tmp_path: Path) -> None:
    # V_BE falls about 2 mV/K (common practice): at 0-40 °C the most current is at 40 °C.
    config = BASE_CONFIG.replace("min = 25\nmax = 25", "min = 0\nmax = 40", 1)
    _, least, most = rng(run(sink_board("vbe"), tmp_path, config))
    assert most == pytest.approx((VBE_HI + 0.002 * 25) / (150 * (1 - R_TOL)))
    assert least == pytest.approx((VBE_LO - 0.002 * 15) / (150 * (1 + R_TOL)))


# ------------------------------------------------------------------ headroom by hand

HEADROOM_LEDS = {"Vf": "3.0V@20mA", "Vf_max": "3.3V", "If_max": "100mA"}
EXACT = {"vref": "200mV", "vref_tolerance": "0%", "dropout": "0.5V"}


def rails(minimum: float, name: str = "+12V") -> str:
    return BASE_CONFIG.replace(f'[rails."{name}"]\nnominal = 12\nmin = 11.4', f'[rails."{name}"]\nnominal = 12\n'
                               f"min = {minimum}", 1)


@pytest.mark.parametrize("kind", ["linear", "buck"])
@pytest.mark.parametrize(("v_min", "expect"), [(10.5, -0.1), (11.0, 0.4)])
def test_linear_and_buck_headroom(tmp_path: Path, kind: str, v_min: float, expect: float) -> None:
    # V_in,min − (ΣVf,max + V_sense + V_dropout) (field-facts §10): the set current is exactly
    # 200 mV / 10 Ω = 20 mA, where the Vf_max field holds: 3 × 3.3 V + 0.2 V + 0.5 V = 10.6 V.
    board = ic_board(3, "10 0%", {"driver": kind, **EXACT}, HEADROOM_LEDS)
    result = run(board, tmp_path, rails(v_min))
    assert analysis(result, "D1").headroom_v == pytest.approx(expect, abs=1e-6)
    found = of_rule(result, "driver-headroom")
    if expect < 0:
        f = only(result, "driver-headroom")
        assert f.severity is Severity.ERROR and "U1" in f.message
        assert value(f, "need").value == pytest.approx(10.6, abs=1e-6)
        assert value(f, "short").value == pytest.approx(0.1, abs=1e-6)
        assert value(f, "vin").value == v_min
    else:
        assert not found


def test_buck_with_high_side_sense(tmp_path: Path) -> None:
    # A buck whose sense resistor sits between VIN and CSN, the string below it, an inductor to
    # SW: 200 mV / 0.5 Ω = 400 mA; 5 × 3.4 V + 0.2 V + 0.5 V = 17.7 V against 17.5 V.
    b = buck_board(pullup=False)
    result = run(b, tmp_path, BASE_CONFIG + '[rails."+24V"]\nnominal = 24\nmin = 17.5\nmax = 26\n')
    a = analysis(result, "D1")
    assert a.circuit.kind is CircuitKind.DRIVER and a.set_current.kind is DriverKind.BUCK
    assert a.set_current.current.nominal == pytest.approx(0.4)
    assert a.headroom_v == pytest.approx(-0.2, abs=1e-6)
    assert value(only(result, "driver-headroom"), "short").value == pytest.approx(0.2, abs=1e-6)


def buck_board(pullup: bool) -> Board:
    b = Board("buck", "Demo buck driver")
    fields = {"driver": "buck", "sense_pins": "VIN", **EXACT}
    b.add("U1", "CCBUCK", "CCBUCK", "Package_TO_SOT_SMD:SOT-23-5", {"1": "+24V", "2": "/CSN", "3": "/SW", "4": "GND"},
          **fields)
    sense = "R2" if pullup else "R1"
    if pullup:  # an enable pull-up on the same rail, numbered first
        b.resistor("R1", "100k", "+24V", "/EN")
    b.resistor(sense, "0R5 0%", "+24V", "/CSN", footprint="Resistor_SMD:R_2512_6332Metric")
    nets = ["/CSN"] + [f"/L{k}" for k in range(1, 6)]
    for k in range(5):
        b.led(f"D{k + 1}", "white", nets[k], nets[k + 1], footprint="LED_SMD:LED_PLCC_2835",
              Vf="3.0V@400mA", Vf_max="3.4V", If_max="700mA")
    b.add("L1", "L", "47u", "Inductor_SMD:L_1210", {"1": nets[-1], "2": "/SW"})
    return b


def test_buck_sense_resistor_is_the_one_in_the_current_path(tmp_path: Path) -> None:
    result = run(buck_board(pullup=True), tmp_path, BASE_CONFIG + '[rails."+24V"]\nnominal = 24\n')
    a = analysis(result, "D1")
    assert a.set_current.sense[0][0] == "R2"
    assert a.set_current.current.nominal == pytest.approx(0.2 / 0.5)


def boost_board(leds: int, output_net: str = "/LED_A") -> Board:
    """Demo boost: +5V → L1 → SW, Schottky to the string's top, the string into FB, Rsense to ground."""
    b = Board("boost", "Demo boost driver")
    b.add("U1", "CCBOOST", "CCBOOST", "Package_TO_SOT_SMD:SOT-23-5", {"1": "+5V", "2": "/SW", "3": "/FB", "4": "GND"},
          driver="boost", sense_pins="FB", vref="200mV", vref_tolerance="2%", vin_max="6V", vout_max="13V")
    b.add("L1", "L", "22u", "Inductor_SMD:L_1210", {"1": "+5V", "2": "/SW"})
    b.add("D9", "D", "Schottky", "Diode_SMD:D_SOD-123", {"2": "/SW", "1": output_net})
    b.add("C1", "C", "1u", "Capacitor_SMD:C_0805_2012Metric", {"1": output_net, "2": "GND"})
    nets = [output_net] + [f"Net-(D{k}-K)" for k in range(1, leds)] + ["/FB"]
    for k in range(leds):
        b.led(f"D{k + 1}", "white", nets[k], nets[k + 1], If_max="30mA")  # white: 2.7-3.4 V (built-in table)
    b.resistor("R1", "10", "/FB", "GND")
    return b


# White LED: 3.0 V typical, 3.4 V maximum (field-facts §5a, the trade's typical white LED); the
# least taken as 10 % under typical, 2.7 V (a design choice of the table).
WHITE_MAX, WHITE_MIN = 3.4, 2.7


def test_boost_that_cannot_reach_the_string(tmp_path: Path) -> None:
    # Boost: Σ Vf,max ≤ V_out,max (field-facts §10): 4 × 3.4 V = 13.6 V against 13 V.
    result = run(boost_board(4), tmp_path)
    f = only(result, "driver-headroom")
    assert f.severity is Severity.ERROR and "cannot reach" in f.message
    assert value(f, "string").value == pytest.approx(4 * WHITE_MAX) and value(f, "vout").value == 13.0


def test_boost_that_cannot_step_down(tmp_path: Path) -> None:
    # A boost needs Σ Vf,min > V_in,max (field-facts §10): one LED, 2.7 V, under 6 V.
    f = only(run(boost_board(1), tmp_path), "driver-headroom")
    assert "cannot regulate" in f.message
    assert value(f, "string").value == pytest.approx(WHITE_MIN) and value(f, "vin").value == 6.0


def test_boost_within_its_limits(tmp_path: Path) -> None:
    # 3 × 2.7 V = 8.1 V > 6 V and 3 × 3.4 V = 10.2 V ≤ 13 V: a boost can regulate it.
    result = run(boost_board(3), tmp_path)
    assert not of_rule(result, "driver-headroom")
    assert analysis(result, "D1").set_current.current.nominal == pytest.approx(0.2 / 10)


def test_boost_output_named_vout(tmp_path: Path) -> None:
    result = run(boost_board(4, "/VOUT"), tmp_path)
    a = analysis(result, "D1")
    assert a.solved and a.set_current.current.nominal == pytest.approx(0.02)
    assert "cannot reach" in only(result, "driver-headroom").message


def test_two_terminal_regulator(tmp_path: Path) -> None:
    b = Board("ccr", "Demo two-terminal regulator")
    b.led("D1", "white", "+12V", "/M", If_max="30mA")
    b.led("D2", "white", "/M", "/R")
    b.add("U1", "CCR2", "CCR", "Diode_SMD:D_SOD-123", {"1": "/R", "2": "GND"}, driver="two-terminal",
          current="20mA", current_tolerance="10%", dropout="1.8V")
    result = run(b, tmp_path)
    assert not of_rule(result, "unlimited-led")
    assert rng(result) == pytest.approx((0.02, 0.018, 0.022))
    # 11.4 V − (2 × 3.4 V + 1.8 V) at least; Vf_max at 22 mA is a little above 3.4 V.
    assert analysis(result, "D1").headroom_v == pytest.approx(11.4 - 2 * WHITE_MAX - 1.8, abs=0.05)


# ------------------------------------------------------------------ core rules on drivers

@pytest.mark.parametrize(("if_max", "severity"), [("40mA", Severity.ERROR), ("50mA", Severity.WARNING),
                                                  ("60mA", None)])
def test_current_margin_on_the_set_point(tmp_path: Path, if_max: str, severity: Severity | None) -> None:
    # One string on a current output carries the whole set current; worst = 206 mV / (4.7 Ω − 1 %).
    # Warning above 75 % of If_max, error above If_max (field-facts §5b, common practice).
    worst = 0.2 * 1.03 / (4.7 * 0.99)
    result = run(ic_board(2, "4R7 1%", led_fields={"If_max": if_max}), tmp_path)
    found = of_rule(result, "current-margin")
    if severity is None:
        assert not found
        return
    f = only(result, "current-margin")
    assert f.severity is severity and value(f, "worst").value == pytest.approx(worst, rel=1e-6)
    assert "set current" in f.hint


def test_sense_resistor_overload_is_reported(tmp_path: Path) -> None:
    # A 100 Ω emitter resistor in 0603 (0.1 W at 70 °C, field-facts §3) above 50 % of its
    # rating (the design factor, common practice): worst V_E²/R_E = (2.835 − 0.55)² / 95 = 55 mW.
    result = run(sink_board("zener", emitter="100", footprint="Resistor_SMD:R_0603_1608Metric"), tmp_path)
    f = only(result, "resistor-overload")
    assert f.refs == ("R1",) and "sense resistor" in f.message and f.severity is Severity.WARNING
    assert value(f, "rating").value == pytest.approx(0.1)


def test_sense_resistor_dissipation_is_a_reachable_corner(tmp_path: Path) -> None:
    # P = I²R = V_E²/R_E with V_E fixed by the reference: most at the lowest R_E (Ohm's law).
    result = run(sink_board("zener", emitter="100", footprint="Resistor_SMD:R_0603_1608Metric"), tmp_path)
    v_e = 2.7 * (1 + ZENER_TOL) - VBE_LO
    assert value(only(result, "resistor-overload"), "power").value == pytest.approx(v_e ** 2 / 95, rel=1e-3)


def test_sink_set_to_nothing_does_not_crash(tmp_path: Path) -> None:
    result = run(sink_board("diode", strings=2), tmp_path)
    assert analysis(result, "D1").set_current.current.nominal == pytest.approx(0.0)


def test_sink_biased_below_vbe_is_a_finding(tmp_path: Path) -> None:
    b = sink_board("divider")
    b.parts = [p for p in b.parts if p.ref != "R2"]
    b.resistor("R2", "100k", "+12V", "/BASE")  # 12 V × 1k5/101k5 = 0.18 V at the base: the sink is off
    result = run(b, tmp_path)
    assert analysis(result, "D1").set_current.current.maximum == pytest.approx(0.0)


def test_malformed_driver_value_is_refused(tmp_path: Path) -> None:
    config = BASE_CONFIG + '[refs."U1"]\ndriver = "linear"\nvref = "200mV"\ndropout = 0.5\n'
    with pytest.raises(Exception, match="dropout"):
        run(ic_board(fields={}), tmp_path, config)


def test_set_point_above_the_drivers_current_max(tmp_path: Path) -> None:
    # 200 mV / 1 Ω = 200 mA from a part described as good for 150 mA.
    result = run(ic_board(1, "1 1%", {**LINEAR, "current_max": "150mA"}, {"If_max": "350mA"}), tmp_path)
    assert any("150" in f.message for f in result.findings)


# ------------------------------------------------------------------ the sample boards

def test_sample_boards_are_regenerated() -> None:
    for make in board_driver.BOARDS:
        board = make()
        assert (SAMPLES / f"{board.name}.net").read_text(encoding="utf-8") == board.text(), board.name


def sample(name: str) -> FileResult:
    return check([SAMPLES / f"{name}.net"]).files[0]


def test_cabinet_light_strings_share_outputs() -> None:
    result = sample("cabinet-light")
    strings = [f for f in of_rule(result, "driver-parallel-strings") if "U1" in f.refs]
    assert len(strings) == 1 and strings[0].severity is Severity.ERROR
    f = strings[0]
    assert {"U1", "R1", *(f"D{k}" for k in range(1, 10))} <= set(f.refs)
    # 200 mV / 2.2 Ω = 90.9 mA (field-facts §10), a third per string on paper.
    assert value(f, "total").value == pytest.approx(0.2 / 2.2) and value(f, "share").value == pytest.approx(0.2 / 6.6)
    assert value(f, "worst").value > 0.050  # above If_max 50 mA: one string can take most of it
    markers = [f for f in of_rule(result, "driver-parallel-strings") if "Q1" in f.refs]
    assert len(markers) == 1 and {"D11", "D12", "R11", "D20"} <= set(markers[0].refs)
    # (2.7 V − 0.65 V) / 100 Ω, common practice.
    assert value(markers[0], "total").value == pytest.approx((2.7 - VBE) / 100)
    headroom = only(result, "driver-headroom")
    assert "U1" in headroom.message and headroom.severity is Severity.ERROR
    # 12 V − 5 % = 11.4 V (net name, common practice) against 3 white LEDs at Vf_max 3.4 V (at
    # 30 mA, 25 °C) moved to 31.5 mA and 0 °C: Shockley with series resistance (field-facts
    # §5c) with n = 3 and R_s = 0.2 V / If_max, and the white LED's −3 mV/K (common practice);
    # plus 206 mV sense and 1 V dropout.
    i = 0.2 * 1.03 / (2.2 * 0.99) / 3
    vf = 3.4 + 3 * 0.025693 * math.log(i / 0.030) + 0.2 / 0.050 * (i - 0.030) + 0.003 * 25
    assert value(headroom, "short").value == pytest.approx(3 * vf + 0.206 + 1.0 - 11.4, abs=0.01)


def test_cabinet_light_fixed_twin_is_clean() -> None:
    result = sample("cabinet-light-fixed")
    assert not loud(result)
    kinds = sorted(a.circuit.kind.value for a in result.board.analyses)
    assert kinds == ["constant-current-driver"] * 3 + ["current-sink"] * 2
    assert all(len(a.circuit.branches) == 1 for a in result.board.analyses)


def test_parallel_strings_finding_lists_each_part_once() -> None:
    for f in of_rule(sample("cabinet-light"), "driver-parallel-strings"):
        assert len(f.refs) == len(set(f.refs)), f.refs


def balanced_board(balancing: str) -> Board:
    """Two red LEDs (1.9-2.1 V) on one 35.7 mA output, each through its own balancing resistor."""
    b = Board("balanced", "Demo balanced strings")
    b.add("U1", "CCSINK", "CCSINK", "Package_TO_SOT_SMD:SOT-23-5", {"1": "+12V", "2": "/OUT", "3": "/CS", "4": "GND"},
          **{**LINEAR, "vref_tolerance": "2%"})
    b.resistor("R1", "5R6 1%", "/CS", "GND")
    for s in range(2):
        b.led(f"D{s + 1}", "red", "+12V", f"/B{s}", Vf="2.0V@20mA", Vf_min="1.9V", Vf_max="2.1V", If_max="30mA")
        b.resistor(f"R{s + 2}", balancing, f"/B{s}", "/OUT", footprint="Resistor_SMD:R_1206_3216Metric")
    return b


def test_hinted_balancing_resistor_balances(tmp_path: Path) -> None:
    f = only(run(balanced_board("0R"), tmp_path), "driver-parallel-strings")
    hinted = re.search(r"put ([0-9.]+) Ω 1 % \(E24\)", f.hint)
    assert hinted, f.hint
    # Fitted as the hint says, a 1 % part of that value.
    assert not of_rule(run(balanced_board(hinted.group(1) + " 1%"), tmp_path), "driver-parallel-strings")


def test_too_small_balancing_resistor_gets_the_value_to_raise_it_to(tmp_path: Path) -> None:
    """With 1 Ω balancing resistors already fitted the hint names the whole value, not an extra."""
    f = only(run(balanced_board("1R 1%"), tmp_path), "driver-parallel-strings")
    hinted = re.search(r"raise each string's balancing resistance to ([0-9.]+) Ω 1 % \(E24\)", f.hint)
    assert hinted, f.hint
    assert not of_rule(run(balanced_board(hinted.group(1) + " 1%"), tmp_path), "driver-parallel-strings")


@pytest.mark.parametrize(("board", "words"), [
    (lambda: ic_board(rsense="0R"), "R1, U1's sense resistor, is 0 Ω: it sets no current"),
    (lambda: sink_board("zener", emitter="0R"), "Q1 has no emitter resistance, so it sets no current"),
])
def test_a_zero_ohm_sense_resistor_leaves_the_leds_unlimited(tmp_path: Path, board, words: str) -> None:
    """I = V / R_sense (Ohm's law): with 0 Ω nothing sets the current, a fault and not a gap."""
    result = run(board(), tmp_path)
    f = only(result, "unlimited-led")
    assert f.severity is Severity.ERROR and words in f.message and "nothing else limits the current" in f.message
    assert of_rule(result, "missing-parameter") == []


def wide_board(balancing: str, per_string: int = 1) -> Board:
    """Two strings of white LEDs with a wide Vf spread (2.8-3.4 V) on one 35.7 mA output."""
    b = Board("wide", "Demo strings with a wide Vf spread")
    b.add("U1", "CCSINK", "CCSINK", "Package_TO_SOT_SMD:SOT-23-5", {"1": "+12V", "2": "/OUT", "3": "/CS", "4": "GND"},
          **{**LINEAR, "vref_tolerance": "2%"})
    b.resistor("R1", "5R6 1%", "/CS", "GND")
    for s in range(2):
        nets = ["+12V"] + [f"/S{s}_{k}" for k in range(1, per_string)] + [f"/B{s}"]
        for k in range(per_string):
            b.led(f"D{s * per_string + k + 1}", "white", nets[k], nets[k + 1], Vf="3.1V@20mA", Vf_min="2.8V",
                  Vf_max="3.4V", If_max="30mA")
        b.resistor(f"R{s + 2}", balancing, f"/B{s}", "/OUT", footprint="Resistor_SMD:R_2512_6332Metric")
    return b


def test_a_balancing_drop_past_two_volts_is_offered_when_the_headroom_takes_it(tmp_path: Path) -> None:
    """One white LED per string on +12V: the output has volts to spare, so the hint names the
    resistor and what headroom it leaves (headroom − I·R, Ohm's law); fitted, it balances."""
    f = only(run(wide_board("0R"), tmp_path), "driver-parallel-strings")
    m = re.search(r"put ([0-9.]+) Ω 1 % \(E24\) in series with each string: it drops ([0-9.]+) V, leaving "
                  r"([0-9.]+) (m?)V of headroom,", f.hint)
    assert m, f.hint
    ohms, drop = float(m.group(1)), float(m.group(2))
    assert drop > 2.0 and drop == pytest.approx(ohms * 0.2 / 5.6 / 2, rel=0.02)  # I·R at the equal share
    assert not of_rule(run(wide_board(m.group(1) + " 1%"), tmp_path), "driver-parallel-strings")


def test_a_balancing_drop_past_the_headroom_is_called_impossible(tmp_path: Path) -> None:
    f = only(run(wide_board("0R", per_string=3), tmp_path), "driver-parallel-strings")
    assert "of headroom the output has" in f.hint and "in series with each string" not in f.hint


def test_balancing_resistors_count_in_the_output_headroom(tmp_path: Path) -> None:
    """1 kΩ per string at 17.9 mA drops 17.9 V (Ohm's law) on a 12 V input: the output cannot hold
    its current. driver-headroom says so; the forced current's power in the resistors is not real,
    so no resistor-overload."""
    result = run(wide_board("1k 1%"), tmp_path)
    f = only(result, "driver-headroom")
    assert value(f, "need").value > 0.2 / 5.6 / 2 * 1000 * 0.99 + 3.4  # the string and its resistor
    assert of_rule(result, "resistor-overload") == []
