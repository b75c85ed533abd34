"""Invented sample boards: a cabinet light whose strings share constant-current outputs, and its fix.

The light runs from a 12 V adapter. A linear sink IC (the demo CCSINK, described by fields)
feeds three strings of three white LEDs from one output; a zener-referenced NPN sink feeds two
red marker LEDs in parallel. The fixed twin gives every string its own sink (three CCSINKs,
two NPNs off the one zener) and a 15 V adapter, so each sink keeps its headroom.
"""

from __future__ import annotations

from kicad8 import Board

SINK_FOOTPRINT = "Package_TO_SOT_SMD:SOT-23-5"
SOT23 = "Package_TO_SOT_SMD:SOT-23"
WHITE = {"Vf": "3.0V@30mA", "Vf_min": "2.8V", "Vf_max": "3.4V", "If_max": "50mA"}
RED = {"Vf": "2.0V@20mA", "If_max": "20mA"}
# The demo sink: 200 mV ±3 % across the sense resistor, 1 V dropout at its output.
SINK_FIELDS = {"driver": "linear", "sense_pins": "CS", "vref": "200mV", "vref_tolerance": "3%",
               "dropout": "1V", "current_max": "150mA"}


def _sink_ic(b: Board, ref: str, supply: str, out: str, cs: str, sense: str, rsense: str) -> None:
    b.add(ref, "CCSINK", "CCSINK", SINK_FOOTPRINT, {"1": supply, "2": out, "3": cs, "4": "GND"}, **SINK_FIELDS)
    b.resistor(sense, rsense, cs, "GND", footprint="Resistor_SMD:R_0805_2012Metric")


def _white_string(b: Board, first: int, top: str, bottom: str) -> None:
    nets = [top] + [f"Net-(D{first + k}-K)" for k in range(2)] + [bottom]
    for k in range(3):
        b.led(f"D{first + k}", "white", nets[k], nets[k + 1], footprint="LED_SMD:LED_PLCC_2835", **WHITE)


def _common(b: Board, supply: str) -> None:
    b.add("J1", "Conn_01x02", "Conn_01x02", "Connector_PinHeader_2.54mm:PinHeader_1x02_P2.54mm_Vertical",
          {"1": supply, "2": "GND"})
    b.add("C1", "C", "10u", "Capacitor_SMD:C_1206_3216Metric", {"1": supply, "2": "GND"})
    # The marker sinks' base reference: a 2.7 V zener fed from the supply.
    b.resistor("R10", "2k2", supply, "/MARK_REF")
    b.add("D20", "D_Zener", "2V7", "Diode_SMD:D_SOD-323", {"1": "/MARK_REF", "2": "GND"})


def cabinet_light() -> Board:
    """Three white strings on one sink output; two red markers on one NPN sink; 12 V adapter."""
    b = Board("cabinet-light", "Cabinet light, strings on shared current outputs")
    _common(b, "+12V")
    _sink_ic(b, "U1", "+12V", "/STRINGS_K", "/CS", "R1", "2R2 1%")
    for s in range(3):
        _white_string(b, 1 + 3 * s, "+12V", "/STRINGS_K")
    b.add("Q1", "Q_NPN_BEC", "NPN", SOT23, {"1": "/MARK_REF", "2": "/MARK_E", "3": "/MARK_K"})
    b.resistor("R11", "100", "/MARK_E", "GND")
    b.led("D11", "red", "+12V", "/MARK_K", footprint="LED_SMD:LED_0805_2012Metric", **RED)
    b.led("D12", "red", "+12V", "/MARK_K", footprint="LED_SMD:LED_0805_2012Metric", **RED)
    return b


def cabinet_light_fixed() -> Board:
    """The same LEDs, one sink per string, and a 15 V adapter for the sinks' headroom."""
    b = Board("cabinet-light-fixed", "Cabinet light, one current output per string")
    _common(b, "+15V")
    for s in range(3):
        n = s + 1
        _sink_ic(b, f"U{n}", "+15V", f"/STRING{n}_K", f"/CS{n}", f"R{n}", "6R8 1%")
        _white_string(b, 1 + 3 * s, "+15V", f"/STRING{n}_K")
    for n, led in ((1, "D11"), (2, "D12")):
        b.add(f"Q{n}", "Q_NPN_BEC", "NPN", SOT23, {"1": "/MARK_REF", "2": f"/MARK{n}_E", "3": f"/MARK{n}_K"})
        b.resistor(f"R1{n}", "180", f"/MARK{n}_E", "GND")
        b.led(led, "red", "+15V", f"/MARK{n}_K", footprint="LED_SMD:LED_0805_2012Metric", **RED)
    return b


BOARDS = [cabinet_light, cabinet_light_fixed]
