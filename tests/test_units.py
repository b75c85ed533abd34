"""Value parsers: resistance notations, tolerances, ratings and LED figures."""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ledlint.netlist.kicad_net import read_netlist
from ledlint.quantities.units import (
    Quantity,
    Unknown,
    parse_current,
    parse_power,
    parse_resistance,
    parse_temperature,
    parse_thermal_resistance,
    parse_tolerance,
    parse_vf,
    parse_voltage,
)


def ohms(text: str) -> float:
    parsed = parse_resistance(text)
    assert isinstance(parsed, Quantity), parsed
    return parsed.value


# IEC 60062 (examples as listed in field-facts §1 / Wikipedia RKM code).
@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("R47", 0.47),
        ("4R7", 4.7),
        ("470R", 470.0),
        ("4K7", 4.7e3),
        ("47K", 47e3),
        ("47K3", 47.3e3),
        ("470K", 470e3),
        ("4M7", 4.7e6),
        ("1R2", 1.2),
        ("18R", 18.0),
        ("8K2", 8.2e3),
        ("2M2", 2.2e6),
        ("R10", 0.1),
        ("R300", 0.3),
        ("15M0", 15e6),
    ],
)
def test_iec_60062_examples(text: str, expected: float) -> None:
    assert ohms(text) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        # IEC 60062 letter rule: L = 10^-3, R = 1, K = 10^3, M = 10^6, G = 10^9, T = 10^12
        # (field-facts §1 "Rule", Wikipedia RKM code "Part value code").
        ("15L", 15e-3),
        ("1L5", 1.5e-3),
        ("1G2", 1.2e9),
        ("1T0", 1e12),
        ("1M0", 1e6),  # by the rule (field-facts §1 "1M0, 0R")
        ("0R", 0.0),  # zero-ohm jumper: common practice (field-facts §1)
        ("0R0", 0.0),
        ("1R5", 1.5),  # field-facts §1 "Notations engineers write"
        ("4k7", 4.7e3),  # lowercase k: common practice (field-facts §1)
    ],
)
def test_rkm_letter_rule(text: str, expected: float) -> None:
    assert ohms(text) == pytest.approx(expected, rel=1e-12, abs=0.0)


# SI forms engineers write: field-facts §1 "Notations engineers write in schematics"
# (common practice); ohm signs U+03A9 and U+2126 per Python unicodedata (field-facts §1).
@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("4.7k", 4.7e3),
        ("4.7K", 4.7e3),
        ("470", 470.0),
        ("470\u03a9", 470.0),
        ("470\u2126", 470.0),
        ("470 \u03a9", 470.0),
        ("470 ohm", 470.0),
        ("470ohms", 470.0),
        ("470 Ohm", 470.0),
        ("10m", 10e-3),
        ("10mR", 10e-3),
        ("10m\u03a9", 10e-3),
        ("R010", 10e-3),
        ("1Meg", 1e6),
        ("1MEG", 1e6),
        ("1M", 1e6),
        ("2.2M", 2.2e6),
        ("0", 0.0),
        ("0.1", 0.1),
        ("100m\u03a9", 0.1),
        ("4.7k\u03a9", 4.7e3),
        ("4.7 k\u03a9", 4.7e3),
        ("4k7\u03a9", 4.7e3),
        ("15k\u03a9", 15e3),
        ("1.00K", 1e3),
        ("6.80K", 6.8e3),
        ("0R22", 0.22),
        ("1k8", 1.8e3),
        ("  4K7  ", 4.7e3),
    ],
)
def test_si_and_informal_forms(text: str, expected: float) -> None:
    assert ohms(text) == pytest.approx(expected, rel=1e-12, abs=0.0)


def test_text_is_the_substring_the_number_came_from() -> None:
    assert parse_resistance("4.7 k\u03a9 1%") == Quantity(4.7e3, "4.7 k\u03a9")
    assert parse_resistance("  4K7") == Quantity(4.7e3, "4K7")


# Decision: a comma between digits is a decimal comma ("1,5k", common practice in Europe)
# unless it could be a thousands separator or nothing says it is a resistance value.
@pytest.mark.parametrize(("text", "expected"), [("1,5k", 1.5e3), ("4,7 k\u03a9", 4.7e3), ("2,2M", 2.2e6)])
def test_decimal_comma(text: str, expected: float) -> None:
    assert ohms(text) == pytest.approx(expected)


@pytest.mark.parametrize("text", ["1,500", "2,2", "1,000k"])
def test_ambiguous_comma_is_unknown(text: str) -> None:
    parsed = parse_resistance(text)
    assert isinstance(parsed, Unknown)
    assert "ambiguous" in parsed.reason


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("10k 1%", 10e3),
        ("1K, 1/4W 5%", 1e3),  # the comma is a separator here, not a decimal comma
        ("1K,1/4W", 1e3),
        ("330R 0603", 330.0),
        ("4K7 1% 0.1W", 4.7e3),
        ("4K7 F", 4.7e3),
        ("220/0805", 220.0),  # decision: "/" separates the value from its case size
        ("10k 50V 100ppm", 10e3),
        ("10k (1%)", 10e3),
        ("10k;0603", 10e3),
        # BOM-style case codes with the part letter, as footprint names write them (common
        # practice; real corpus: "220k/R0402", "49.9k/1%/R0402", "2.2k R0402").
        ("220k/R0402", 220e3),
        ("49.9k/1%/R0402", 49.9e3),
        ("2.2k R0402", 2.2e3),
        ("330R R_0603 1%", 330.0),
    ],
)
def test_value_with_extras(text: str, expected: float) -> None:
    assert ohms(text) == pytest.approx(expected)


@pytest.mark.parametrize(
    ("text", "reason"),
    [
        ("DNP", "'DNP' is not a resistance"),
        ("NC", "'NC' is not a resistance"),
        ("?", "no number in '?'"),
        ("~", "no number in '~'"),
        ("", "empty value"),
        ("   ", "empty value"),
        ("R", "'R' is not a resistance"),
        ("k", "'k' is not a resistance"),
        ("POT", "'POT' is not a resistance"),
        ("10k?", "unexpected '?'"),
        ("1k-10k", "is a range"),
        ("-10k", "cannot be signed"),
        ("K47", "no digit before its multiplier letter"),
        ("4R7R", "two multiplier letters"),
        ("0603", "case size"),
        ("10k NTC", "'NTC' after '10k'"),
        ("10k pullup", "'pullup' after '10k'"),
        ("4m7", "unexpected '7'"),
        ("100nF", "unexpected 'nF'"),
        ("1e999", "out of range"),
        ("1e-999", "out of range"),
    ],
)
def test_unparseable_values_say_why(text: str, reason: str) -> None:
    parsed = parse_resistance(text)
    assert isinstance(parsed, Unknown), parsed
    assert parsed.text == text
    assert reason in parsed.reason


class TestPitfallsOfGeneralParsers:
    """Regressions for the misreadings of general unit parsers (field-facts §1 pitfalls, verified locally)."""

    def test_4k7_is_not_4(self) -> None:
        # ngspice 39.3 reads 4k7 as 4 kΩ; quantiphy 2.23 as 4; engineering-notation 0.13.3 as 4000.
        assert ohms("4k7") == 4700.0

    def test_470r_is_not_ronna(self) -> None:
        # quantiphy 2.23 and engineering-notation 0.13.3 read the R as ronna: 4.7e29.
        assert ohms("470R") == 470.0

    def test_1r5_is_not_1(self) -> None:
        # ngspice 39.3 and quantiphy 2.23 read 1R5 as 1.
        assert ohms("1R5") == 1.5

    def test_m_is_mega_in_a_resistor_value(self) -> None:
        # ngspice-39 manual §2.1.4.2: SPICE reads 1M as 1 mΩ and wants "Meg"; a schematic means 1 MΩ.
        assert ohms("1M") == 1e6
        assert ohms("1Meg") == 1e6
        assert ohms("1m") == 1e-3

    def test_micro_sign_is_not_dropped(self) -> None:
        # engineering-notation 0.13.3 reads "4.7µ" as 4.7; the micro sign (U+00B5) and mu (U+03BC) scale.
        assert parse_current("4.7\u00b5A") == Quantity(4.7e-6, "4.7\u00b5A")
        assert parse_current("4.7\u03bcA") == Quantity(4.7e-6, "4.7\u03bcA")


# Tolerance letters: field-facts §1 "Tolerance letters" (IEC 60062 letters, resistor and
# capacitor specs cited there).
@pytest.mark.parametrize(
    ("letter", "fraction"),
    [
        ("B", 0.001),
        ("C", 0.0025),
        ("D", 0.005),
        ("F", 0.01),
        ("G", 0.02),
        ("J", 0.05),
        ("K", 0.10),
        ("M", 0.20),
    ],
)
def test_tolerance_letters(letter: str, fraction: float) -> None:
    assert parse_tolerance(letter) == Quantity(fraction, letter)
    assert parse_tolerance(f"4K7 {letter}") == Quantity(fraction, letter)
    # Glued to the letter code, as IEC 60062 writes it ("4K7J", from memory).
    assert parse_tolerance(f"4K7{letter}") == Quantity(fraction, letter)
    assert parse_resistance(f"4K7{letter}") == Quantity(4.7e3, "4K7")


@pytest.mark.parametrize(
    ("text", "fraction", "source"),
    [
        ("1%", 0.01, "1%"),
        ("\u00b15 %", 0.05, "\u00b15 %"),
        ("5 %", 0.05, "5 %"),
        ("+/-0.1%", 0.001, "+/-0.1%"),
        ("10k 1%", 0.01, "1%"),
        ("1K, 1/4W 5%", 0.05, "5%"),
        ("4K7 1% 0.1W", 0.01, "1%"),
        ("0,5%", 0.005, "0,5%"),
    ],
)
def test_tolerance_percent(text: str, fraction: float, source: str) -> None:
    # Percent to fraction: arithmetic (common practice).
    assert parse_tolerance(text) == Quantity(fraction, source)


@pytest.mark.parametrize("text", ["", "10k", "10 M", "1% 5%", "FJ", "10kF", "x%", "F 10k"])
def test_tolerance_absent_or_ambiguous(text: str) -> None:
    # "10 M" is 10 MΩ, not 10 Ω ±20 %: the letter is taken by the value.
    assert parse_tolerance(text) is None


@pytest.mark.parametrize(
    ("text", "watts", "source"),
    [
        ("0.25W", 0.25, "0.25W"),
        ("1/4W", 0.25, "1/4W"),
        ("1/4 W", 0.25, "1/4 W"),
        ("250mW", 0.25, "250mW"),
        ("0.1 W", 0.1, "0.1 W"),
        ("2W", 2.0, "2W"),
        ("1K, 1/4W 5%", 0.25, "1/4W"),
        ("4K7 1% 0.1W", 0.1, "0.1W"),
        ("1/8 Watt", 0.125, "1/8 Watt"),
    ],
)
def test_power(text: str, watts: float, source: str) -> None:
    # Fractions and milli: arithmetic (common practice, field-facts §3 ratings are written this way).
    assert parse_power(text) == Quantity(pytest.approx(watts), source)


@pytest.mark.parametrize("text", ["", "W", "1/0W", "1/4", "10k", "1/4WS", "1W 2W", "-1W"])
def test_power_absent_or_ambiguous(text: str) -> None:
    assert parse_power(text) is None


@pytest.mark.parametrize(
    ("text", "volts"),
    [
        ("3.0V", 3.0),
        ("2.1 V", 2.1),
        ("5V", 5.0),
        ("3V3", 3.3),  # letter-in-place-of-point form, as in RKM (common practice)
        ("12 V", 12.0),
        ("-12V", -12.0),
        ("\u221212V", -12.0),
        ("250mV", 0.25),
        ("12VDC", 12.0),
        ("1kV", 1000.0),
        ("+5V", 5.0),
    ],
)
def test_voltage(text: str, volts: float) -> None:
    parsed = parse_voltage(text)
    assert parsed is not None
    assert parsed.value == pytest.approx(volts)
    assert parsed.text == text


@pytest.mark.parametrize("text", ["", "V", "24VAC", "5V 12V", "3.3V3", "5", "LED5V"])
def test_voltage_absent_or_ambiguous(text: str) -> None:
    assert parse_voltage(text) is None


@pytest.mark.parametrize(
    ("text", "amperes"),
    [
        ("20mA", 0.02),
        ("0.35A", 0.35),
        ("350 mA", 0.35),
        ("20 mA", 0.02),
        ("1A", 1.0),
        ("500uA", 500e-6),
        ("500\u00b5A", 500e-6),
        ("500\u03bcA", 500e-6),
    ],
)
def test_current(text: str, amperes: float) -> None:
    assert parse_current(text) == Quantity(pytest.approx(amperes), text)


@pytest.mark.parametrize("text", ["", "A", "-20mA", "20mAh", "1A 2A"])
def test_current_absent_or_ambiguous(text: str) -> None:
    assert parse_current(text) is None


def test_vf_with_and_without_test_current() -> None:
    assert parse_vf("3.0V@20mA") == (Quantity(3.0, "3.0V"), Quantity(0.02, "20mA"))
    assert parse_vf("3.0 V @ 20 mA") == (Quantity(3.0, "3.0 V"), Quantity(0.02, "20 mA"))
    assert parse_vf("Vf=3.2V at 350mA") == (Quantity(3.2, "3.2V"), Quantity(0.35, "350mA"))
    assert parse_vf("2.1V") == (Quantity(2.1, "2.1V"), None)


@pytest.mark.parametrize("text", ["", "3.0V@", "@20mA", "-3V", "0V", "3.0V@20mA 1A", "red", "3.0V 2.1V"])
def test_vf_unreadable(text: str) -> None:
    assert parse_vf(text) is None


@pytest.mark.parametrize("text", ["400K/W", "400 K/W", "400\u00b0C/W", "400 C/W", "400", "400 \u00b0C / W"])
def test_thermal_resistance(text: str) -> None:
    # K/W and °C/W are the same step size (common practice).
    assert parse_thermal_resistance(text) == Quantity(400.0, text.strip())


def test_a_decimal_comma_in_thermal_and_temperature_fields() -> None:
    # The comma is a decimal sign as much as the point (ISO 80000-1 §7.3.2), as in value text.
    assert parse_thermal_resistance("312,5 K/W") == Quantity(312.5, "312,5 K/W")
    assert parse_temperature("-40,5 \u00b0C") == Quantity(-40.5, "-40,5 \u00b0C")
    assert parse_thermal_resistance("0,0") == Quantity(0.0, "0,0")


@pytest.mark.parametrize("text", ["", "K/W", "400 W/K", "-400K/W", "400mK/W"])
def test_thermal_resistance_unreadable(text: str) -> None:
    assert parse_thermal_resistance(text) is None


@pytest.mark.parametrize(
    ("text", "celsius"),
    [("70\u00b0C", 70.0), ("70 C", 70.0), ("-40", -40.0), ("85 \u00b0C", 85.0), ("+125\u2103", 125.0)],
)
def test_temperature_in_celsius(text: str, celsius: float) -> None:
    assert parse_temperature(text) == Quantity(celsius, text)


@pytest.mark.parametrize("text", ["", "hot", "300 K", "70 F", "70°C 85°C"])
def test_temperature_unreadable(text: str) -> None:
    assert parse_temperature(text) is None


_VALUE_CHARACTERS = "0123456789.,kKMmRrLGTegEe \u03a9\u2126\u00b5\u03bcu%/\u00b1+-\u2212VAW@\u00b0C~?()_;"
_PARSERS = (
    parse_resistance,
    parse_tolerance,
    parse_power,
    parse_voltage,
    parse_current,
    parse_vf,
    parse_thermal_resistance,
    parse_temperature,
)


@given(st.text(alphabet=_VALUE_CHARACTERS, max_size=24) | st.text(max_size=24))
def test_no_text_makes_a_parser_raise(text: str) -> None:
    for parse in _PARSERS:
        parse(text)


@given(st.text(alphabet=_VALUE_CHARACTERS, max_size=24))
def test_resistance_is_a_value_or_a_reason(text: str) -> None:
    parsed = parse_resistance(text)
    if isinstance(parsed, Quantity):
        assert math.isfinite(parsed.value) and parsed.value >= 0
        assert parsed.text and parsed.text in text
    else:
        assert parsed.reason and parsed.text == text


@given(st.floats(min_value=0, max_value=1e300, allow_nan=False, allow_infinity=False))
def test_formatted_float_round_trips(value: float) -> None:
    # Python's repr is the shortest text that reads back as the same float (Python docs, "repr").
    assert ohms(repr(value)) == value
    assert ohms(f"{value:g}") == float(f"{value:g}")


@given(
    st.floats(min_value=1e-3, max_value=1e12, allow_nan=False), st.sampled_from(["k", "K", "M", "Meg", "m"])
)
def test_si_prefix_scales(value: float, prefix: str) -> None:
    scale = {"k": 1e3, "K": 1e3, "M": 1e6, "Meg": 1e6, "m": 1e-3}[prefix]
    assert ohms(f"{value / scale!r}{prefix}") == pytest.approx(value, rel=1e-12)


@given(
    st.integers(min_value=0, max_value=999),
    st.text(alphabet="0123456789", min_size=1, max_size=4),
    st.sampled_from(["R", "K", "k", "M", "G", "L"]),
)
def test_rkm_of_random_mantissa_and_multiplier(whole: int, fraction: str, letter: str) -> None:
    # IEC 60062: the letter stands for the decimal point and gives the multiplier (field-facts §1).
    multiplier = {"R": 1.0, "K": 1e3, "k": 1e3, "M": 1e6, "G": 1e9, "L": 1e-3}[letter]
    expected = float(f"{whole}.{fraction}") * multiplier
    assert ohms(f"{whole}{letter}{fraction}") == pytest.approx(expected, rel=1e-12, abs=0.0)


@given(st.text(alphabet="0123456789", min_size=1, max_size=4))
def test_rkm_leading_r(fraction: str) -> None:
    # IEC 60062 example R47 = 0.47 Ω: a leading R is the decimal point.
    assert ohms(f"R{fraction}") == pytest.approx(float(f"0.{fraction}"), rel=1e-12, abs=0.0)


def test_every_numeric_resistor_value_in_the_real_corpus_is_read(corpus: list[Path]) -> None:
    # Real netlists (shared corpus): a resistor's value that holds a digit must be read; the
    # rest ("R", "DNP") must come back with a reason.  "R" refs are resistors by the usual
    # reference-designator letters (common practice).
    seen = 0
    for path in corpus:
        for component in read_netlist(path).components:
            if not re.fullmatch(r"R[0-9]+", component.ref):
                continue
            seen += 1
            parsed = parse_resistance(component.value)
            # The value's first word: a digit only in a trailing case code ("NA/R0402", not
            # assembled) is no resistance.
            if any(ch.isdigit() for ch in re.split(r"[\s/,;(]", component.value.strip())[0]):
                assert isinstance(parsed, Quantity), (path.name, component.ref, parsed)
            else:
                assert isinstance(parsed, Unknown) and parsed.reason, (path.name, component.ref)
    assert seen > 0


# Hand-written field forms: the unit letter in lower case, a decimal comma (ISO 80000-1 allows
# either decimal sign), and an exponent (common practice in spreadsheets and CSV exports).
@pytest.mark.parametrize(("parse", "text", "value"), [
    (parse_power, "1/4w", 0.25),
    (parse_power, "0,25W", 0.25),
    (parse_voltage, "2.0v", 2.0),
    (parse_voltage, "3v3", 3.3),
    (parse_voltage, "3,3V", 3.3),
    (parse_current, "20ma", 0.020),
    (parse_current, "0,02A", 0.020),
    (parse_current, "2e-2A", 0.020),
])
def test_hand_written_unit_forms(parse, text: str, value: float) -> None:
    q = parse(text)
    assert q is not None and q.value == pytest.approx(value, rel=1e-12)


def test_a_comma_that_may_be_thousands_is_still_refused() -> None:
    assert parse_voltage("1,000V") is None  # 1000 V or 1.000 V: not a guess to make


@pytest.mark.parametrize("text", ["1/4W", "1/2 W"])
def test_a_power_rating_in_the_value_is_not_a_resistance(text: str) -> None:
    # "1/4W" would otherwise read as 1 Ω with an extra: a false alarm waiting to happen.
    parsed = parse_resistance(text)
    assert isinstance(parsed, Unknown) and "power rating" in parsed.reason


@given(st.text(alphabet=" \t0123456789.,%VAWm/kR", max_size=60))
def test_runs_of_blanks_do_not_change_what_is_read(text: str) -> None:
    # Blanks are squeezed before the patterns run (hostile input would make them quadratic):
    # the value read must be what the text with single blanks reads.
    single = re.sub(r"\s+", " ", text)
    for parse in (parse_tolerance, parse_power, parse_voltage, parse_current):
        assert getattr(parse(text), "value", None) == getattr(parse(single), "value", None)
