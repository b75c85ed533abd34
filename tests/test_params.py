"""Part parameters come with their provenance, in a fixed order of precedence."""

from __future__ import annotations

import pytest

from ledlint.config import from_mapping
from ledlint.frozen import FrozenMap
from ledlint.netlist.model import Component, Pin, PinType
from ledlint.parts.params import Missing, Origin, Param, led_params, pin_limit, rail_params, resistor_params


def _led(value: str = "LED", footprint: str = "LED_SMD:LED_0603_1608Metric", **fields: str) -> Component:
    pins = (Pin("D1", "1", "K", PinType.PASSIVE, "GND"), Pin("D1", "2", "A", PinType.PASSIVE, "A"))
    return Component("D1", value, footprint, description="Light emitting diode", lib="Device", part="LED",
                     fields=FrozenMap(fields), pins=pins)


def _res(value: str, footprint: str = "Resistor_SMD:R_0603_1608Metric", **fields: str) -> Component:
    return Component("R1", value, footprint, part="R", fields=FrozenMap(fields))


def test_vf_field_with_test_current_and_spread() -> None:
    p = led_params(_led(Vf="3.0V@10mA"), from_mapping({}))
    assert p.vf.value == 3.0 and p.vf.origin is Origin.FIELD and p.i_test.value == pytest.approx(0.010)
    # Only a typical Vf given: min and max are typical −10 % and +10 % (common practice).
    assert (p.vf_min.value, p.vf_max.value) == pytest.approx((2.7, 3.3))


def test_only_the_bounds_given_put_the_typical_midway() -> None:
    # A datasheet giving min and max only: the midpoint stands for typical (common practice), and
    # the bounds are the LED's own, not a colour table's.
    p = led_params(_led("LED", Vf_min="2.8V", Vf_max="3.4V"), from_mapping({}))
    assert p.vf.value == pytest.approx(3.1) and p.vf.origin is Origin.FIELD
    assert (p.vf_min.value, p.vf_max.value) == pytest.approx((2.8, 3.4))


def test_colour_table_when_no_fields() -> None:
    p = led_params(_led("LED_red"), from_mapping({}))
    # Red: 1.85 V typical and 2.5 V maximum at 20 mA (field-facts §5a, robot.lk table).
    assert p.technology == "red" and p.vf.value == 1.85 and p.vf_max.value == 2.5
    assert p.vf.origin is Origin.DEFAULT and p.vf_min.value == pytest.approx(1.85 * 0.9)
    # Small indicator package: 20 mA assumed, 30 mA the top of the class (field-facts §5b).
    assert p.if_max.value == 0.020 and p.if_max_upper == 0.030 and p.if_max.assumed
    assert p.vr_max.value == 5.0  # the usual reverse rating (field-facts §5b)


def test_ambiguous_green_and_unknown_colour_are_missing_not_guessed() -> None:
    green = led_params(_led("LED green"), from_mapping({}))
    assert isinstance(green.vf, Missing) and "GaP" in green.vf.reason
    assert led_params(_led("LED green 525nm"), from_mapping({})).technology == "green (InGaN)"
    assert led_params(_led("LED yellow-green"), from_mapping({})).technology == "green (GaP)"
    plain = led_params(_led("LED"), from_mapping({}))
    assert isinstance(plain.vf, Missing) and not plain.complete


def test_precedence_config_ref_over_field_over_config_value() -> None:
    cfg = from_mapping({"refs": {"D1": {"If_max": "30mA"}}, "values": {"LED": {"If_max": "10mA", "Vf": "2V"}}})
    p = led_params(_led(If_max="25mA"), cfg)
    assert p.if_max.value == pytest.approx(0.030) and p.if_max.origin is Origin.CONFIG  # [refs] wins
    assert p.vf.value == 2.0 and p.vf.origin is Origin.CONFIG  # [values] fills what the fields lack
    p2 = led_params(_led(If_max="25mA"), from_mapping({"values": {"LED": {"If_max": "10mA"}}}))
    assert p2.if_max.value == pytest.approx(0.025) and p2.if_max.origin is Origin.FIELD  # field over [values]


def test_field_names_match_without_case_and_die_fields() -> None:
    p = led_params(_led(VF="2.2V", IF_MAX="15mA"), from_mapping({}))
    assert p.vf.value == 2.2 and p.if_max.value == pytest.approx(0.015)
    rgb = Component("D4", "LED_RGBA", "LED_SMD:LED_RGB_5050", fields=FrozenMap({"Vf_R": "2.0V", "Vf": "3.1V"}))
    assert led_params(rgb, from_mapping({}), "R").vf.value == 2.0
    assert led_params(rgb, from_mapping({}), "G").vf.value == 3.1


def test_non_indicator_package_has_no_assumed_rating() -> None:
    p = led_params(_led("LED white", "LED_SMD:LED_5050_6V_Power"), from_mapping({}))
    assert isinstance(p.if_max, Missing) and "If_max" in p.if_max.fix


def test_resistor_value_tolerance_and_rating() -> None:
    cfg = from_mapping({})
    p = resistor_params(_res("4K7 1%"), cfg)
    assert p.resistance.value == 4700 and p.tolerance.value == pytest.approx(0.01)  # IEC 60062 4K7
    assert p.power.value == pytest.approx(0.1) and p.power.origin is Origin.FOOTPRINT  # 0603: 1/10 W
    q = resistor_params(_res("1K, 1/4W 5%", "Resistor_THT:R_Axial_DIN0207_L6.3mm_D2.5mm"), cfg)
    assert q.power.value == 0.25 and q.power.origin is Origin.VALUE
    d = resistor_params(_res("330", "Resistor_SMD:R_0805_2012Metric", Power="0.5W", Tolerance="2%"), cfg)
    assert d.power.value == 0.5 and d.power.origin is Origin.FIELD and d.tolerance.value == pytest.approx(0.02)
    assert resistor_params(_res("330"), cfg).tolerance.value == 0.05  # ±5 % default (common practice)
    bad = resistor_params(_res("DNP", "x:unknown"), cfg)
    assert isinstance(bad.resistance, Missing) and isinstance(bad.power, Missing)


def test_rails_from_config_beat_names() -> None:
    cfg = from_mapping({"rails": {"VCC": {"nominal": 3.3}, "+5V": {"nominal": 5.1}}})
    assert rail_params("VCC", cfg).nominal == 3.3 and rail_params("/power/VCC", cfg).nominal == 3.3
    assert rail_params("+5V", cfg).origin is Origin.CONFIG and rail_params("+5V", cfg).nominal == 5.1
    assert rail_params("+3V3", cfg).origin is Origin.NET_NAME
    assert rail_params("GND", cfg).ground and rail_params("Net-(D1-A)", cfg) is None


def test_pin_limit_default_and_field() -> None:
    u = Component("U1", "MCU", fields=FrozenMap({"pin_current_max": "8mA"}))
    assert pin_limit(u, from_mapping({})).value == pytest.approx(0.008)
    d = pin_limit(Component("U2", "MCU"), from_mapping({}))
    assert isinstance(d, Param) and d.value == 0.020 and d.assumed  # the common 20 mA default
