"""Resistor power ratings from footprint names, and IEC 60115-1 derating."""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ledlint.quantities.ratings import PowerRating, chip_size, derated_power, rating_from_footprint
from ledlint.netlist.kicad_net import read_netlist


# Commonly quoted chip defaults at 70 °C: 0201 1/20, 0402 1/16, 0603 1/10, 0805 1/8, 1206 1/4,
# 1210 1/2, 2010 3/4, 2512 1 W (field-facts §3 "commonly quoted defaults", two published summary
# tables cited there).  01005 1/32 W and 1812 1/2 W, which that line leaves
# out, from the general-purpose column of the field-facts §3 thick-film table.
@pytest.mark.parametrize(
    ("footprint", "watts"),
    [
        ("Resistor_SMD:R_01005_0402Metric", 1 / 32),
        ("Resistor_SMD:R_0201_0603Metric", 1 / 20),
        ("Resistor_SMD:R_0402_1005Metric", 1 / 16),
        ("Resistor_SMD:R_0603_1608Metric", 1 / 10),
        ("R_0805_2012Metric_Pad1.20x1.40mm_HandSolder", 1 / 8),
        ("Resistor_SMD:R_1206_3216Metric", 1 / 4),
        ("Resistor_SMD:R_1210_3225Metric", 1 / 2),
        ("Resistor_SMD:R_1812_4532Metric", 1 / 2),
        ("Resistor_SMD:R_2010_5025Metric", 3 / 4),
        ("Resistor_SMD:R_2512_6332Metric", 1.0),
        # Custom libraries of the kind found in real netlists (library names invented here).
        ("modules:R_0603", 1 / 10),
        ("boardparts:0603", 1 / 10),
        ("HOUSE:R_0805", 1 / 8),
        ("Resistors_SMD:R_0805", 1 / 8),
        ("Resistors_SMD:R_0402_NoSilk", 1 / 16),
        ("kit:XR-0402", 1 / 16),
        ("R_1206", 1 / 4),
    ],
)
def test_chip_rating(footprint: str, watts: float) -> None:
    rating = rating_from_footprint(footprint)
    assert rating is not None
    assert rating.watts == pytest.approx(watts)
    assert chip_size(footprint) in rating.basis


def test_upper_category_temperature() -> None:
    # Category range −55…+125 °C for 01005 and −55…+155 °C for the larger sizes (field-facts §3 table).
    assert rating_from_footprint("R_01005_0402Metric") == PowerRating(
        1 / 32, "01005 chip: general-purpose thick-film chip rating at 70 °C", 125.0
    )
    rating = rating_from_footprint("R_0603_1608Metric")
    assert rating is not None and rating.upper_category_c == 155.0


# Footprint names as the standard KiCad library writes them (body dimensions in the names: from
# memory), matched to the field-facts §3 axial film table: 1/8 W Ø1.5–1.8 × 3.0–3.5 mm,
# 1/4 W 2.3–2.5 × 6.0–6.5, 1/2 W 3.0–3.2 × 8.5–9, 1 W 4–5 × 11, 2 W 5 × 15 (a resistor maker's lead-form table).
@pytest.mark.parametrize(
    ("footprint", "watts"),
    [
        ("Resistor_THT:R_Axial_DIN0204_L3.6mm_D1.6mm_P7.62mm_Horizontal", 1 / 8),
        ("Resistor_THT:R_Axial_DIN0207_L6.3mm_D2.5mm_P10.16mm_Horizontal", 1 / 4),
        ("Resistor_THT:R_Axial_DIN0309_L9.0mm_D3.2mm_P12.70mm_Horizontal", 1 / 2),
        ("Resistor_THT:R_Axial_DIN0414_L11.9mm_D4.5mm_P15.24mm_Horizontal", 1.0),
        ("Resistor_THT:R_Axial_DIN0516_L15.5mm_D5.0mm_P20.32mm_Horizontal", 2.0),
        ("R_Axial_DIN0207_L6.3mm_D2.5mm_P2.54mm_Vertical", 1 / 4),
    ],
)
def test_axial_rating(footprint: str, watts: float) -> None:
    rating = rating_from_footprint(footprint)
    assert rating is not None
    assert rating.watts == pytest.approx(watts)
    # Metal-film derating runs from 70 °C to zero at 155 °C (field-facts §3, a published metal-film spec).
    assert rating.upper_category_c == 155.0


@pytest.mark.parametrize(
    ("footprint", "watts"),
    [
        # The lowest rating commonly sold in each cement/wirewound body length (from memory):
        # 17-24 mm 2 W, 24-35 mm 3 W, 35-45 mm 5 W, 45-60 mm 7 W, 60 mm and over 10 W.
        ("Resistor_THT:R_Axial_Power_L20.0mm_W6.4mm_P22.40mm", 2.0),
        ("Resistor_THT:R_Axial_Power_L25.0mm_W9.0mm_P30.48mm", 3.0),
        ("Resistor_THT:R_Axial_Power_L38.0mm_W9.0mm_P45.72mm", 5.0),
        ("Resistor_THT:R_Axial_Power_L48.0mm_W12.5mm_P55.88mm", 7.0),
        ("Resistor_THT:R_Axial_Power_L75.0mm_W9.0mm_P81.28mm", 10.0),
        ("Resistor_THT:R_Radial_Power_L13.0mm_W9.0mm_P5.00mm", 2.0),
    ],
)
def test_power_body_rating_is_the_low_end(footprint: str, watts: float) -> None:
    rating = rating_from_footprint(footprint)
    assert rating is not None and rating.watts == watts and "Power field" in rating.basis


@pytest.mark.parametrize(
    "footprint",
    [
        # Bodies between or beyond the table's rows: never guess.
        "Resistor_THT:R_Axial_DIN0411_L9.9mm_D3.6mm_P12.70mm_Horizontal",
        "Resistor_THT:R_Axial_DIN0614_L14.3mm_D5.7mm_P20.32mm_Horizontal",
        "Resistor_THT:R_Axial_DIN0617_L17.0mm_D6.0mm_P20.32mm_Horizontal",
        "Resistor_THT:R_Axial_DIN0918_L18.0mm_D9.0mm_P22.86mm_Horizontal",
        "Resistor_THT:R_Axial_DIN0922_L20.0mm_D9.0mm_P25.40mm_Horizontal",
        "Resistor_THT:R_Axial_Power_L12.0mm_W6.4mm_P15.24mm",  # shorter than any power body listed
        "Resistor_THT:R_Bare_Metal_Element_L12.4mm_W4.8mm_P11.40mm",
        "Resistor_THT:R_Axial_DIN0207",  # no dimensions to match
        # Resistors whose rating does not follow the body (field-facts §3: ratings vary by series).
        "Resistor_SMD:R_Shunt_2512_6332Metric",
        "Resistor_SMD:R_Array_Convex_4x0603",
        "Potentiometer_THT:Potentiometer_Trimmer_3mm",
        # Other parts.
        "Capacitor_SMD:C_0603_1608Metric",
        "boardparts:C_0805",
        "LED_SMD:LED_0805_2012Metric",
        "LEDs:LED_0603",
        "Diode_SMD:D_SOD-123",
        "Inductors_SMD:L_0603",
        # Nothing to go on.
        "",
        "boardparts:SOT-23",
        "R_0603_0805",
    ],
)
def test_unknown_rating_is_none(footprint: str) -> None:
    assert rating_from_footprint(footprint) is None


def test_custom_library_named_after_leds_still_rates_its_resistors() -> None:
    # Only the standard library names mark other parts; a board library may hold anything.
    rating = rating_from_footprint("led-board:R_0805")
    assert rating is not None and rating.watts == pytest.approx(1 / 8)


@pytest.mark.parametrize(
    ("footprint", "size"),
    [
        ("Resistor_SMD:R_0603_1608Metric", "0603"),
        ("R_0201_0603Metric", "0201"),  # the metric 0603 belongs to the imperial 0201
        ("R_01005_0402Metric", "01005"),
        ("R_1608Metric", "0603"),  # metric only: imperial 0603 (field-facts §3 size table)
        ("Capacitor_SMD:C_0805_2012Metric", "0805"),
        ("boardparts:0603D", "0603"),
        ("R_0805_2012Metric_Pad1.20x1.40mm_HandSolder", "0805"),
        ("Resistor_SMD:R_2512_6332Metric", "2512"),
        ("Resistor_THT:R_Axial_DIN0207_L6.3mm_D2.5mm_P10.16mm_Horizontal", None),
        ("R_0603_0805", None),
        ("", None),
    ],
)
def test_chip_size(footprint: str, size: str | None) -> None:
    assert chip_size(footprint) == size


def test_derating_worked_example() -> None:
    # field-facts §4 worked example: a metal-film part rated 1 W at 70 °C keeps 35 % at 125 °C;
    # with UCT 155 °C the linear curve gives (155 − 125)/(155 − 70) = 0.353, "35 %" within rounding.
    kept = derated_power(1.0, 125.0)
    assert kept == pytest.approx(30 / 85)
    assert kept == pytest.approx(0.35, abs=0.005)
    # Same example: for 10 kΩ, √(0.35 W × 10 kΩ) = 59.16 V at 125 °C, and 100 V at 70 °C.
    assert math.sqrt(kept * 10e3) == pytest.approx(59.16, rel=0.005)
    assert math.sqrt(derated_power(1.0, 70.0) * 10e3) == pytest.approx(100.0)


def test_derating_curve_end_points() -> None:
    # IEC 60115-1 convention (field-facts §4): 100 % up to 70 °C, 0 % at the UCT, linear between.
    assert derated_power(0.25, -55.0) == 0.25
    assert derated_power(0.25, 25.0) == 0.25
    assert derated_power(0.25, 70.0) == 0.25
    assert derated_power(0.25, 112.5) == pytest.approx(0.125)
    assert derated_power(0.25, 155.0) == 0.0
    assert derated_power(0.25, 200.0) == 0.0
    # 01005: UCT 125 °C (field-facts §3), so half the rating at 97.5 °C.
    assert derated_power(1 / 32, 97.5, upper_category_c=125.0) == pytest.approx(1 / 64)


def test_other_published_derating_curves_have_the_same_shape() -> None:
    # NASA EEE-INST-002 film chip (field-facts §4): 60 % of rated up to 70 °C, zero at 118 °C.
    assert derated_power(0.6, 94.0, upper_category_c=118.0) == pytest.approx(0.3)
    # RAMS 2006 guide (field-facts §4): 70 % to 70 °C, then linearly to zero by 100 °C.
    assert derated_power(0.7, 85.0, upper_category_c=100.0) == pytest.approx(0.35)


@pytest.mark.parametrize(
    ("arguments", "message"),
    [
        ({"p70": -1.0, "ambient_c": 25.0}, "cannot be negative"),
        ({"p70": math.nan, "ambient_c": 25.0}, "rated power must be a finite number"),
        ({"p70": 1.0, "ambient_c": math.inf}, "ambient temperature must be a finite number"),
        ({"p70": 1.0, "ambient_c": 25.0, "upper_category_c": 70.0}, "must lie above"),
        (
            {"p70": 1.0, "ambient_c": 25.0, "rated_ambient_c": 90.0, "upper_category_c": 80.0},
            "must lie above",
        ),
    ],
)
def test_derating_rejects_bad_arguments(arguments: dict[str, float], message: str) -> None:
    with pytest.raises(ValueError, match=message):
        derated_power(**arguments)


@given(
    st.floats(min_value=0, max_value=100),
    st.floats(min_value=-100, max_value=300),
    st.floats(min_value=-100, max_value=300),
)
def test_derating_is_bounded_and_never_rises_with_temperature(
    p70: float, first: float, second: float
) -> None:
    # Common practice: a derating curve never allows more power at a hotter ambient.
    cooler, hotter = sorted((first, second))
    assert 0.0 <= derated_power(p70, hotter) <= derated_power(p70, cooler) <= p70


@given(st.text(max_size=60))
def test_no_footprint_text_makes_it_raise(footprint: str) -> None:
    rating_from_footprint(footprint)
    chip_size(footprint)


def test_every_resistor_footprint_with_a_chip_size_in_the_real_corpus_is_rated(corpus: list[Path]) -> None:
    # Real netlists (shared corpus): a resistor footprint naming a chip size gets the default
    # rating of that size (field-facts §3); "R" refs are resistors (common practice).
    seen = 0
    for path in corpus:
        for component in read_netlist(path).components:
            size = chip_size(component.footprint)
            if not re.fullmatch(r"R[0-9]+", component.ref) or size is None:
                continue
            seen += 1
            rating = rating_from_footprint(component.footprint)
            assert rating is not None and size in rating.basis, (
                path.name,
                component.ref,
                component.footprint,
            )
    assert seen > 0
