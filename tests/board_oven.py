"""Invented sample boards: the front-panel indicator board of a countertop oven, and its fix.

The panel takes +5V and +3V3 from the oven's main board over J1. A small controller (the demo
MCU8, on +3V3) lights the HEAT, TIMER and READY indicators straight from its port pins; the
POWER lamp, the knob backlight, the DOOR lamp and the LAMP ON indicator (switched by the
controller) run from +5V. The first revision has the
mistakes a rushed layout review misses; the fixed twin is the same panel after review.
"""

from __future__ import annotations

from kicad8 import Board

SOIC8 = "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm"
SOT23 = "Package_TO_SOT_SMD:SOT-23"
HEADER4 = "Connector_PinHeader_2.54mm:PinHeader_1x04_P2.54mm_Vertical"
R0603 = "Resistor_SMD:R_0603_1608Metric"
R0805 = "Resistor_SMD:R_0805_2012Metric"
LED0603 = "LED_SMD:LED_0603_1608Metric"
# The port pins of the panel's controller are rated 10 mA each (its library symbol says so).
MCU_FIELDS = {"pin_current_max": "10mA"}
# Indicator LEDs as the parts list gives them: Vf at the datasheet's test current, rating.
RED = {"Vf": "2.0V@20mA", "If_max": "20mA"}
BLUE = {"Vf": "3.0V@20mA", "Vf_max": "3.4V", "If_max": "20mA"}
AMBER = {"Vf": "2.1V@20mA", "If_max": "25mA"}


def _common(b: Board) -> None:
    b.add("J1", "Conn_01x04", "Conn_01x04", HEADER4, {"1": "+5V", "2": "+3V3", "3": "GND", "4": "/DOOR_SW"})
    b.add("C1", "C", "100n", "Capacitor_SMD:C_0603_1608Metric", {"1": "+3V3", "2": "GND"})
    b.add("C2", "C", "1u", "Capacitor_SMD:C_0603_1608Metric", {"1": "+5V", "2": "GND"})
    b.add("U1", "MCU8", "MCU8", SOIC8,
          {"1": "+3V3", "2": "/HEAT", "3": "/TIMER", "4": "/READY", "5": "/DOOR_SW", "6": "/KNOB_EN",
           "7": "unconnected-(U1-PA5-Pad7)", "8": "GND"}, **MCU_FIELDS)
    b.resistor("R20", "10k", "+3V3", "/DOOR_SW")


def _lamp(b: Board, k: int, ohms: str, source: str, value: str, **fields: str) -> None:
    """Indicator D<k> from `source` through R<k> (0603 parts) to ground."""
    b.resistor(f"R{k}", ohms, source, f"Net-(D{k}-A)", footprint=R0603)
    b.led(f"D{k}", value, f"Net-(D{k}-A)", "GND", footprint=LED0603, **fields)


def oven_panel() -> Board:
    """First revision: every indicator has something wrong with it."""
    b = Board("oven-panel", "Countertop oven front panel, rev A")
    _common(b)
    # POWER lamp: a red LED on +5V through 100 Ω, sized for 30 mA "to be seen in daylight".
    _lamp(b, 1, "100", "+5V", "red", **RED)
    # HEAT: red, straight from a port pin through 33 Ω.
    _lamp(b, 2, "33", "/HEAT", "red", **RED)
    # TIMER: a blue LED from a 3.3 V port pin: no headroom for its forward voltage.
    _lamp(b, 3, "68", "/TIMER", "blue", **BLUE)
    # READY: the green part was swapped for a generic one with no colour in its value.
    _lamp(b, 4, "220", "/READY", "LED")
    # Knob backlight: three amber LEDs in parallel behind one resistor.
    b.resistor("R5", "39", "+5V", "/KNOB", footprint=R0805)
    for ref in ("D5", "D6", "D7"):
        b.led(ref, "amber", "/KNOB", "GND", footprint=LED0603, **AMBER)
    # DOOR lamp: placed backwards, anode on ground, so it sees the whole +5V in reverse.
    b.resistor("R8", "150", "+5V", "Net-(D8-K)", footprint=R0603)
    b.led("D8", "yellow", "GND", "Net-(D8-K)", footprint=LED0603, Vf="2.1V@20mA")
    # LAMP ON: a white LED from +5V, switched high-side by a P-MOSFET whose gate sits straight on
    # a port pin of the 3.3 V controller: at 3.3 V the gate is still 1.7 V below the source.
    _lamp_on(b)
    b.add("Q2", "Q_PMOS_GSD", "PMOS", SOT23, {"1": "/KNOB_EN", "2": "+5V", "3": "Net-(Q2-D)"})
    return b


def _lamp_on(b: Board) -> None:
    b.resistor("R10", "220", "Net-(Q2-D)", "Net-(D9-A)", footprint=R0603)
    b.led("D9", "white", "Net-(D9-A)", "GND", footprint=LED0603, **BLUE)


def oven_panel_fixed() -> Board:
    """After review: every indicator inside its ratings, with margin."""
    b = Board("oven-panel-fixed", "Countertop oven front panel, rev B")
    _common(b)
    _lamp(b, 1, "330", "+5V", "red", **RED)
    _lamp(b, 2, "220", "/HEAT", "red", **RED)
    # TIMER: the blue LED now runs from +5V, switched low-side by Q1 from the port pin.
    b.resistor("R3", "220", "+5V", "Net-(D3-A)", footprint=R0603)
    b.led("D3", "blue", "Net-(D3-A)", "Net-(D3-K)", footprint=LED0603, **BLUE)
    b.add("Q1", "Q_NPN_BEC", "NPN", SOT23, {"1": "Net-(Q1-B)", "2": "GND", "3": "Net-(D3-K)"})
    b.resistor("R9", "4k7", "/TIMER", "Net-(Q1-B)", footprint=R0603)
    _lamp(b, 4, "220", "/READY", "green GaP 570nm", Vf="2.2V@20mA", If_max="25mA")
    # One resistor per backlight LED.
    for k in (5, 6, 7):
        _lamp(b, k, "270", "+5V", "amber", **AMBER)
    _lamp(b, 8, "330", "+5V", "yellow", Vf="2.1V@20mA")
    # LAMP ON: Q2's gate pulled up to +5V and pulled down by Q3 from the port pin, a level shifter.
    _lamp_on(b)
    b.add("Q2", "Q_PMOS_GSD", "PMOS", SOT23, {"1": "Net-(Q2-G)", "2": "+5V", "3": "Net-(Q2-D)"})
    b.resistor("R11", "10k", "+5V", "Net-(Q2-G)", footprint=R0603)
    b.add("Q3", "Q_NPN_BEC", "NPN", SOT23, {"1": "Net-(Q3-B)", "2": "GND", "3": "Net-(Q2-G)"})
    b.resistor("R12", "4k7", "/KNOB_EN", "Net-(Q3-B)", footprint=R0603)
    return b


BOARDS = [oven_panel, oven_panel_fixed]
