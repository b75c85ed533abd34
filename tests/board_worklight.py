"""Invented sample board: a 12 V work light on an aluminium strip (KiCad 8 netlist).

The light clamps onto a 12 V battery (J1). The flood is three strings of three mid-power white
LEDs, each with its own ballast; the spot is two strings of three 1 W white LEDs sharing one
power resistor; a courtesy light of four mid-power LEDs was wired straight across the input
("four times 3 V is 12 V"). The mid-power ballasts were drawn in 0805. An inspection light
switched by a MOSFET came from a house symbol with drain and source swapped, and a 1 W map
light sits on the FR-4 tab, away from the strip's aluminium.
"""

from __future__ import annotations

from kicad8 import Board

R0805 = "Resistor_SMD:R_0805_2012Metric"
R_POWER = "Resistor_THT:R_Axial_Power_L20.0mm_W6.4mm_P22.40mm"
MID = "LED_SMD:LED_PLCC_2835"
STAR = "LED_SMD:LED_1W_3535"
# Mid-power white: Vf at the datasheet test current, spread and rating from the parts list.
MID_WHITE = {"Vf": "3.0V@60mA", "Vf_min": "2.8V", "Vf_max": "3.2V", "If_max": "150mA"}
# 1 W white on the strip's aluminium: junction-to-ambient thermal resistance as mounted.
POWER_WHITE = {"Vf": "2.9V@350mA", "Vf_max": "3.2V", "If_max": "500mA", "Rth": "45K/W"}


def _string(b: Board, first: int, top: str, bottom: str, footprint: str, **fields: str) -> None:
    """Three LEDs D<first>..D<first+2> in series from `top` to `bottom`."""
    nets = [top] + [f"Net-(D{first + k}-K)" for k in range(2)] + [bottom]
    for k in range(3):
        b.led(f"D{first + k}", "white", nets[k], nets[k + 1], footprint=footprint, **fields)


def work_light() -> Board:
    b = Board("work-light", "12 V work light, flood and spot")
    b.add("J1", "Conn_01x02", "Conn_01x02", "Connector_PinHeader_2.54mm:PinHeader_1x02_P2.54mm_Vertical",
          {"1": "+12V", "2": "GND"})
    b.add("C1", "C", "10u", "Capacitor_SMD:C_1206_3216Metric", {"1": "+12V", "2": "GND"})
    # Flood: 12 V − 3 × 3.0 V = 3 V across 51 Ω, about 60 mA and 0.18 W in each 0805.
    for s, ref in enumerate(("R1", "R2", "R3")):
        first = 1 + 3 * s
        b.resistor(ref, "51", "+12V", f"Net-({ref}-Pad2)", footprint=R0805)
        _string(b, first, f"Net-({ref}-Pad2)", "GND", MID, **MID_WHITE)
    # Spot: two strings of three 1 W LEDs in parallel behind R4, 0.35 A each.
    b.resistor("R4", "4.7", "+12V", "/SPOT", footprint=R_POWER, Power="5W")
    _string(b, 10, "/SPOT", "GND", STAR, **POWER_WHITE)
    _string(b, 13, "/SPOT", "GND", STAR, **POWER_WHITE)
    # Courtesy light: four mid-power LEDs with nothing but their own resistance.
    nets = ["+12V", "Net-(D16-K)", "Net-(D17-K)", "Net-(D18-K)", "GND"]
    for k in range(4):
        b.led(f"D{16 + k}", "white", nets[k], nets[k + 1], footprint=MID, **MID_WHITE)
    # Map light: one more 1 W LED, on the FR-4 tab instead of the strip, so nothing sinks its heat.
    b.resistor("R7", "33", "+12V", "Net-(D21-A)", footprint=R_POWER, Power="10W")
    b.led("D21", "white", "Net-(D21-A)", "GND", footprint=STAR, **{**POWER_WHITE, "Rth": "150K/W", "Tj_max": "125C"})
    # Inspection light: one mid-power LED switched low-side by Q1, a gate held up by R6 and
    # pulled down by the handle's switch at J2; the house MOSFET symbol swaps drain and source.
    b.resistor("R5", "1k", "+12V", "Net-(D20-A)", footprint="Resistor_SMD:R_1206_3216Metric")
    b.led("D20", "white", "Net-(D20-A)", "Net-(D20-K)", footprint=MID, **MID_WHITE)
    b.add("Q1", "Q_NMOS_GSD", "NMOS", "Package_TO_SOT_SMD:SOT-23", {"1": "/INSPECT", "2": "Net-(D20-K)", "3": "GND"})
    b.resistor("R6", "100k", "+12V", "/INSPECT", footprint=R0805)
    b.add("J2", "Conn_01x02", "Conn_01x02", "Connector_PinHeader_2.54mm:PinHeader_1x02_P2.54mm_Vertical",
          {"1": "/INSPECT", "2": "GND"})
    return b


BOARDS = [work_light]
