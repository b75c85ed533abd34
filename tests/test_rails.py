"""Rails, grounds and mains nets from net names."""

from __future__ import annotations

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ledlint.parts.rails import Rail, RailKind, is_mains_name, is_supply_name, rail_from_net_name


def dc_rail(name: str) -> Rail:
    rail = rail_from_net_name(name)
    assert rail is not None and rail.kind is RailKind.DC, rail
    return rail


# Naming conventions for power nets: common practice (KiCad power symbols, house styles);
# the range is the ±5 % default budget (field-facts §8 "Typical system budget ±2–5 %", common practice).
@pytest.mark.parametrize(
    ("name", "volts"),
    [
        ("+5V", 5.0),
        ("+3V3", 3.3),
        ("3V3", 3.3),
        ("+3.3V", 3.3),
        ("3.3V", 3.3),
        ("VCC_12V", 12.0),
        ("12V0", 12.0),
        ("+24V", 24.0),
        ("+1V8", 1.8),
        ("+1V2", 1.2),
        ("P3V3", 3.3),  # the P-for-positive spelling of house styles (common practice)
        ("P5V0", 5.0),
        ("P12V", 12.0),
        ("VCC3V3", 3.3),  # a supply word glued to its voltage (common practice)
        ("VCC5V", 5.0),
        ("VDD1V8", 1.8),
        ("VDD_3V3", 3.3),
        ("+5VA", 5.0),
        ("5VSB", 5.0),
        ("+12V_LED", 12.0),
        ("V_5V", 5.0),  # decision: "V" is a supply prefix, so this is the 5 V rail
        ("12VDC", 12.0),
        ("/power/+5V", 5.0),  # hierarchical path: the last segment is the name
        ("/sheet/sub/+3V3", 3.3),
        ("PWR_5V", 5.0),
    ],
)
def test_named_dc_rails(name: str, volts: float) -> None:
    rail = dc_rail(name)
    assert rail.nominal == pytest.approx(volts)
    assert rail.minimum == pytest.approx(volts * 0.95)
    assert rail.maximum == pytest.approx(volts * 1.05)
    assert name.rpartition("/")[2] in rail.source
    assert "±5 %" in rail.source


def test_negative_rail_bounds_are_numeric() -> None:
    rail = dc_rail("-12V")
    assert (rail.nominal, rail.minimum, rail.maximum) == pytest.approx((-12.0, -12.6, -11.4))


# USB VBUS: 4.75–5.25 V at a USB 2.0 source, 4.40 V the least a low-power device must run from,
# and 5.5 V the Type-C upper limit (field-facts §8, Wikipedia "USB" Power section).  Decision: the
# device-side envelope 4.40–5.50 V, because the name does not tell the connector or the cable.
@pytest.mark.parametrize("name", ["VBUS", "VUSB", "USB_5V", "5V_USB", "+5V_USB", "/mcu/usb/power/VBUS"])
def test_usb_rails(name: str) -> None:
    rail = dc_rail(name)
    assert (rail.nominal, rail.minimum, rail.maximum) == (5.0, 4.40, 5.50)
    assert "USB" in rail.source


@pytest.mark.parametrize(
    "name",
    [
        "GND",
        "GNDA",
        "AGND",
        "PGND",
        "DGND",
        "GNDD",
        "GNDPWR",
        "0V",
        "VSS",
        "GND1",
        "Earth",
        "/sheet/GND",
        "gnd",
    ],
)
def test_grounds(name: str) -> None:
    # Ground net names: common practice (KiCad power symbols GND, GNDA, GNDD, GNDPWR, Earth; from memory).
    assert rail_from_net_name(name) == Rail(
        RailKind.GROUND, 0.0, 0.0, 0.0, f"net name '{name.rpartition('/')[2]}': ground"
    )


@pytest.mark.parametrize(
    ("name", "volts"),
    [("24VAC", 24.0), ("12V_AC", 12.0), ("~230V", 230.0), ("AC_24V", 24.0), ("230V~", 230.0)],
)
def test_ac_rails(name: str, volts: float) -> None:
    # AC names: common practice; the voltage of an AC name is its RMS value (common practice).
    rail = rail_from_net_name(name)
    assert rail is not None and rail.kind is RailKind.AC
    assert rail.nominal == volts
    assert "RMS" in rail.source


@pytest.mark.parametrize(
    "name",
    [
        # Signals about a rail, not the rail (common practice: EN, PG, SENSE, FB, ON name signals).
        "LED_12V_EN",
        "5V_PG",
        "+5V_SENSE",
        "EN_3V3",
        "3V3_FB",
        "PWR_5V_ON",
        "EN1V8",
        "!VAA_ENABLE",
        # KiCad's names for unnamed nets.
        "Net-(D1-Pad2)",
        "unconnected-(U1-Pad3)",
        # Decision: a voltage glued to another word is not a rail (a false rail gives false alarms).
        "/LED5V",
        "/U3V3",
        "PA3",  # a port pin, not a P-prefixed rail
        "LED_P5V_EN",
        # Supplies of unknown voltage.
        "VCC",
        "VDD",
        "VIN",
        "VBAT",
        "V+",
        # A bare "USB" may be the data pair's bus name.
        "USB",
        "USB_P",
        # Two voltages, or none that can be read.
        "5V_3V3",
        "-24VAC",
        "",
        "/",
        "VREF",
        "LED",
    ],
)
def test_not_rails(name: str) -> None:
    assert rail_from_net_name(name) is None


@pytest.mark.parametrize(
    "name",
    [
        "VCC",
        "VDD",
        "VIN",
        "VBAT",
        "V+",
        "VPP",
        "+VIN",
        "VMOT",
        "VLED",
        "VSYS",
        "VDDIO",
        "+V_FAN",
        "VMOT_FUSED",
        "/pwr/VCC",
    ],
)
def test_supplies_of_unknown_voltage(name: str) -> None:
    # Supply names without a voltage: common practice.
    assert is_supply_name(name)


@pytest.mark.parametrize(
    "name", ["+5V", "VBUS", "GND", "VCC_EN", "VREF", "LED_R", "SDA", "", "VCC_12V", "24VAC"]
)
def test_not_supplies_of_unknown_voltage(name: str) -> None:
    # A rail with a known voltage is not "unknown"; signals and grounds are not supplies.
    assert not is_supply_name(name)


@pytest.mark.parametrize(
    "name",
    [
        "L",
        "N",
        "LINE",
        "NEUTRAL",
        "MAINS",
        "AC_L",
        "AC_N",
        "230VAC",
        "120VAC",
        "110V_AC",
        "~230V",
        "/input/L",
        "Live",
        "/230VAC_L",
        "/MAINS_L",
        "/L_IN",
        "/N_IN",
        "/L1",
        "/120VAC_HOT",
        "LIVE_SENSE",
    ],
)
def test_mains_names(name: str) -> None:
    # Line and neutral conductor names and public mains voltages 100–277 V: common practice.
    assert is_mains_name(name)


@pytest.mark.parametrize(
    "name", ["AC1", "AC2", "24VAC", "12V_AC", "+5V", "GND", "LED", "L_EN", "Net-(L1-Pad1)", "", "/LINE_IN",
             "/HOT", "/LED_L", "12VAC_L"]
)
def test_not_mains_names(name: str) -> None:
    # Decision: AC1/AC2 are bridge inputs at any voltage, so they alone do not mean mains; LINE_IN
    # is the audio input; a 12 V AC secondary is not mains (common practice).
    assert not is_mains_name(name)


@given(st.text(max_size=40))
def test_no_name_makes_it_raise(name: str) -> None:
    rail = rail_from_net_name(name)
    assert rail is None or rail.minimum <= rail.nominal <= rail.maximum
    is_supply_name(name)
    is_mains_name(name)


@pytest.mark.parametrize("name", ["+0V", "-0V"])
def test_a_zero_volt_rail_is_ground(name: str) -> None:
    rail = rail_from_net_name(name)  # 0 V is the reference (common practice)
    assert rail is not None and rail.kind is RailKind.GROUND


def test_an_absurd_voltage_is_not_a_rail() -> None:
    assert rail_from_net_name("+99999999999999999999V") is None  # a typing mistake, not a supply
