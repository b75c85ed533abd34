"""Invented sample board: a bench-supply status panel (KiCad 8 netlist)."""

from __future__ import annotations

from kicad8 import Board


def bench_supply_status() -> Board:
    """Power LED on +5V; two MCU-driven status LEDs on +3V3."""
    b = Board("bench-supply-status", "Bench supply status panel")
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm",
          {"1": "+3V3", "2": "/LED_OK", "3": "/LED_FAULT", "4": "/BTN", "5": "/SDA", "6": "/SCL",
           "7": "unconnected-(U1-PA5-Pad7)", "8": "GND"})
    b.add("C1", "C", "100n", "Capacitor_SMD:C_0603_1608Metric", {"1": "+3V3", "2": "GND"})
    b.resistor("R1", "1k", "+5V", "Net-(D1-A)")
    b.led("D1", "green", "Net-(D1-A)", "GND", Vf="2.1V@20mA", If_max="25mA")
    b.resistor("R2", "330", "/LED_OK", "Net-(D2-A)")
    b.led("D2", "LED_green", "Net-(D2-A)", "GND")
    b.resistor("R3", "330", "/LED_FAULT", "Net-(D3-A)")
    b.led("D3", "red", "Net-(D3-A)", "GND")
    b.add("J1", "Conn_01x02", "Conn_01x02", "Connector_PinHeader_2.54mm:PinHeader_1x02_P2.54mm_Vertical",
          {"1": "+5V", "2": "GND"})
    return b


BOARDS = [bench_supply_status]
