"""The trade's values for the parts around an LED when their datasheets are not given: switch and
diode drops, base-emitter and gate voltages, a controller pin's output. Each names its source."""

from __future__ import annotations

from ledlint.quantities.ranges import Range

# Silicon base-emitter voltage at 1-100 mA: 0.65 V nominal, 0.55-0.75 V over parts and current,
# falling 2 mV/K (common practice).
VBE = Range(0.65, 0.55, 0.75)
VBE_TC = -0.002
# A small-signal MOSFET's gate-source voltage when sinking tens of mA: above its 1-2.5 V
# threshold (field-facts §9: 2N7002 V_GS(th) 1-2.5 V) by an overdrive that is not known.
VGS = Range(2.0, 1.0, 3.0)
# A silicon diode's forward drop at a few mA, as a base reference (common practice).
VDIODE = Range(0.65, 0.55, 0.75)
ZENER_TOLERANCE = 0.05  # the common ±5 % zener grade (from memory)
VCE_SAT = Range(0.1, 0.05, 0.3)  # field-facts §9: 2N3904 ≤ 0.2 V at 10 mA, ≤ 0.3 V at 50 mA
# A small-signal MOSFET's on-resistance, ≤ 7.5 Ω at V_GS = 5 V (field-facts §9, 2N7002); a
# silicon diode in series with an LED at a few mA.
R_DS_ON = Range(2.0, 0.0, 7.5)
V_DIODE = Range(0.7, 0.6, 1.0)
# A controller pin's continuous current, when its datasheet is not given (common practice;
# typical GPIO ratings are 8-25 mA, field-facts §9).
PIN_LIMIT = 0.020
# Output resistance of a GPIO pin driving an LED, first order: its supply behind ≈ 40-45 Ω for a
# 5 V 8-bit controller at 20 mA and ≈ 65 Ω worst case for a 3.3 V 32-bit one at 20 mA
# (field-facts §9, derived there; common practice).
PIN_OUTPUT = Range(50.0, 40.0, 65.0)
