"""Invented sample board: the RGB status board of a network storage box (KiCad 8 netlist).

A small controller (the demo MCU8, on +3V3) shows the box's state on a common-anode RGB LED
whose three cathodes it sinks through one shared resistor in the anode, and lights a LINK LED
from a port pin through a small resistor. The DISK LED sits on the front bezel, wired through
J2; the FAN LED hangs off the fan header's VCC, whose voltage the board does not say.
"""

from __future__ import annotations

from kicad8 import Board

R0603 = "Resistor_SMD:R_0603_1608Metric"
LED0603 = "LED_SMD:LED_0603_1608Metric"
RGB_PLCC4 = "LED_SMD:LED_RGB_PLCC-4"


def rgb_status() -> Board:
    b = Board("rgb-status", "Storage box status board")
    b.add("J1", "Conn_01x04", "Conn_01x04", "Connector_PinHeader_2.54mm:PinHeader_1x04_P2.54mm_Vertical",
          {"1": "+3V3", "2": "GND", "3": "/SDA", "4": "/SCL"})
    b.add("C1", "C", "100n", "Capacitor_SMD:C_0603_1608Metric", {"1": "+3V3", "2": "GND"})
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm",
          {"1": "+3V3", "2": "/LED_R", "3": "/LED_G", "4": "/LED_B", "5": "/LINK", "6": "/SDA", "7": "/SCL",
           "8": "GND"})
    # Status: one anode resistor for all three dies; firmware lights one colour at a time.
    b.resistor("R1", "100", "+3V3", "Net-(D1-A)", footprint=R0603)
    b.add("D1", "LED_RGBA", "RGB", RGB_PLCC4, {"1": "/LED_R", "2": "/LED_G", "3": "/LED_B", "4": "Net-(D1-A)"},
          Vf_R="2.0V@20mA", Vf_G="3.0V@20mA", Vf_B="3.1V@20mA", Vf_max_B="3.6V", If_max="20mA")
    # LINK: a green LED from a port pin through 22 Ω "for brightness".
    b.resistor("R2", "22", "/LINK", "Net-(D2-A)", footprint=R0603)
    b.led("D2", "green 570nm", "Net-(D2-A)", "GND", footprint=LED0603, Vf="2.1V@20mA", If_max="20mA")
    # DISK: on the bezel; its cathode leaves the board on J2.
    b.add("J2", "Conn_01x02", "Conn_01x02", "Connector_PinHeader_2.54mm:PinHeader_1x02_P2.54mm_Vertical",
          {"1": "+3V3", "2": "/DISK_K"})
    b.resistor("R3", "150", "+3V3", "Net-(D3-A)", footprint=R0603)
    b.led("D3", "white", "Net-(D3-A)", "/DISK_K", footprint="LED_THT:LED_D3.0mm")
    # FAN: from the fan header's VCC, whatever the fan header carries.
    b.add("J3", "Conn_01x02", "Conn_01x02", "Connector_PinHeader_2.54mm:PinHeader_1x02_P2.54mm_Vertical",
          {"1": "VCC", "2": "GND"})
    b.resistor("R4", "1k", "VCC", "Net-(D4-A)", footprint=R0603)
    b.led("D4", "yellow", "Net-(D4-A)", "GND", footprint=LED0603)
    return b


BOARDS = [rgb_status]
