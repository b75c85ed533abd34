"""IEC 60063 series tables and nearest-value search, checked against the formula and the eseries package."""

from __future__ import annotations

import math

import eseries as reference
import pytest
from hypothesis import assume, given
from hypothesis import strategies as st

from ledlint.quantities.eseries import ESeries, in_series, nearest, nearest_above, nearest_below, series_values

_REFERENCE_KEY = {
    ESeries.E3: reference.E3,
    ESeries.E6: reference.E6,
    ESeries.E12: reference.E12,
    ESeries.E24: reference.E24,
    ESeries.E48: reference.E48,
    ESeries.E96: reference.E96,
    ESeries.E192: reference.E192,
}
_STEPS = {
    ESeries.E3: 3,
    ESeries.E6: 6,
    ESeries.E12: 12,
    ESeries.E24: 24,
    ESeries.E48: 48,
    ESeries.E96: 96,
    ESeries.E192: 192,
}


def _rounded_geometric(i: int, steps: int, figures: int) -> float:
    """10^(i/N) to the given significant figures: the generating formula of IEC 60063."""
    return round(10 ** (i / steps), figures - 1)


@pytest.mark.parametrize("series", list(ESeries))
def test_tables_match_the_eseries_package(series: ESeries) -> None:
    # PyPI eseries 1.2.1 matches IEC 60063, incl. E192's 920 (field-facts §2 and §11, verified locally).
    figures = 2 if len(series_values(series)) <= 24 else 3
    ours = tuple(round(m * 10 ** (figures - 1)) for m in series_values(series))
    assert ours == tuple(reference.series(_REFERENCE_KEY[series]))


@pytest.mark.parametrize("series", list(ESeries))
def test_mantissas_ascend_in_one_decade(series: ESeries) -> None:
    values = series_values(series)
    assert len(values) == _STEPS[series]
    assert all(1.0 <= m < 10.0 for m in values)
    assert list(values) == sorted(set(values))


def test_e12_and_e24_as_published() -> None:
    # field-facts §2: E12 and E24 lists (qsl.net/g4usp, electronics.stackexchange Q381446).
    assert series_values(ESeries.E12) == (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)
    assert series_values(ESeries.E6) == (1.0, 1.5, 2.2, 3.3, 4.7, 6.8)
    assert series_values(ESeries.E3) == (1.0, 2.2, 4.7)


# field-facts §2 "Irregular values": the values that differ from rounding 10^(i/N) to two figures.
_IRREGULAR = {
    ESeries.E6: {3.3, 4.7},
    ESeries.E12: {2.7, 3.3, 3.9, 4.7, 8.2},
    ESeries.E24: {2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2},
}


@pytest.mark.parametrize("series", list(_IRREGULAR))
def test_two_figure_series_follow_the_formula_except_the_published_values(series: ESeries) -> None:
    for i, mantissa in enumerate(series_values(series)):
        computed = _rounded_geometric(i, _STEPS[series], 2)
        if mantissa in _IRREGULAR[series]:
            assert computed != mantissa
            assert abs(computed - mantissa) == pytest.approx(0.1)
        else:
            assert computed == mantissa


def test_regular_looking_e24_values_are_not_exceptions() -> None:
    # field-facts §2: 5.1, 5.6, 6.2, 6.8 and 9.1 equal the rounded geometric values.
    computed = {_rounded_geometric(i, 24, 2) for i in range(24)}
    assert {5.1, 5.6, 6.2, 6.8, 9.1} <= computed


@pytest.mark.parametrize("series", [ESeries.E48, ESeries.E96, ESeries.E192])
def test_three_figure_series_follow_the_formula(series: ESeries) -> None:
    # field-facts §2: E96 (and so E48) is round(10^(i/96), 3 s.f.) with no exceptions; E192 the
    # same except 9.20, where the formula gives 9.19 (10^(185/192) = 9.1948).
    for i, mantissa in enumerate(series_values(series)):
        computed = _rounded_geometric(i, _STEPS[series], 3)
        if series is ESeries.E192 and i == 185:
            assert (computed, mantissa) == (9.19, 9.20)
        else:
            assert computed == mantissa


def test_known_bad_public_table_value_is_not_copied() -> None:
    # field-facts §2: one public table lists 216 instead of 215 in E96.
    assert 2.15 in series_values(ESeries.E96)
    assert 2.16 not in series_values(ESeries.E96)


def test_e48_is_every_second_e96_value() -> None:
    # field-facts §2 "E48 = every second E96 value".
    assert series_values(ESeries.E48) == series_values(ESeries.E96)[::2]
    assert series_values(ESeries.E48)[:5] == (1.00, 1.05, 1.10, 1.15, 1.21)


def test_exact_series_values_are_their_own_neighbours() -> None:
    # IEC 60063 E12 holds 4.7 in every decade (field-facts §2).
    for value in (0.47, 4.7, 47.0, 470.0, 4700.0, 47e3, 4.7e6):
        assert nearest_above(value, ESeries.E12) == value
        assert nearest_below(value, ESeries.E12) == value
        assert nearest(value, ESeries.E12) == value
        assert in_series(value, ESeries.E12)


def test_decade_boundaries() -> None:
    # E12 ends at 8.2 and E24 at 9.1 in each decade (field-facts §2).
    assert nearest_above(9100.0, ESeries.E12) == 10e3
    assert nearest_above(9100.0, ESeries.E24) == 9100.0
    assert nearest_above(9101.0, ESeries.E24) == 10e3
    assert nearest_below(9999.0, ESeries.E24) == 9100.0
    assert nearest_below(10e3, ESeries.E24) == 10e3
    assert nearest_below(9.99e3, ESeries.E192) == 9880.0
    assert nearest_above(9.881e3, ESeries.E192) == 10e3


def test_computed_values_with_rounding_noise_keep_their_step() -> None:
    # 4.7 kΩ computed as 4700.0000001 is still the E12 value 4.7 kΩ (common practice).
    assert nearest_above(4700.0000001, ESeries.E12) == 4700.0
    assert nearest_below(4699.9999999, ESeries.E12) == 4700.0


def test_tiny_and_huge_values() -> None:
    assert nearest_above(1.23e-12, ESeries.E12) == pytest.approx(1.5e-12)
    assert nearest_below(9.99e15, ESeries.E24) == pytest.approx(9.1e15)
    assert nearest(3.4e-9, ESeries.E6) == pytest.approx(3.3e-9)
    with pytest.raises(ValueError, match="within the float range"):
        nearest_above(1.7e308, ESeries.E3)


@pytest.mark.parametrize("value", [0.0, -4.7, math.nan, math.inf, -math.inf])
def test_non_positive_values_are_rejected(value: float) -> None:
    for function in (nearest_above, nearest_below, nearest):
        with pytest.raises(ValueError, match="E-series values are positive"):
            function(value, ESeries.E24)
    # A membership question has an answer: 0 Ω and negatives are in no series.
    assert not in_series(value, ESeries.E24)


def test_in_series() -> None:
    assert in_series(2.15e3, ESeries.E96)
    assert not in_series(2.16e3, ESeries.E96)
    assert not in_series(4.8e3, ESeries.E12)
    assert in_series(4.7004e3, ESeries.E12, rel_tol=1e-3)
    assert not in_series(4.7004e3, ESeries.E12)


def test_nearest_is_logarithmic() -> None:
    # Decision: nearest on a log scale, as the series are geometric (IEC 60063). Between E12 4.7 and
    # 5.6 the log midpoint is √(4.7 × 5.6) = 5.130, the linear one 5.15; eseries 1.2.1 uses linear
    # distance and so differs in between.
    assert nearest(5.14e3, ESeries.E12) == 5.6e3
    assert reference.find_nearest(reference.E12, 5.14e3) == 4.7e3
    assert nearest(5.12e3, ESeries.E12) == 4.7e3


_VALUES = st.floats(min_value=1e-3, max_value=1e9, allow_nan=False, allow_infinity=False)


@given(_VALUES, st.sampled_from(list(ESeries)))
def test_neighbours_match_the_eseries_package(value: float, series: ESeries) -> None:
    # Away from the 1e-9 slack around exact values, the results equal eseries 1.2.1's.
    assume(not in_series(value, series, rel_tol=1e-8))
    key = _REFERENCE_KEY[series]
    assert nearest_above(value, series) == pytest.approx(
        reference.find_greater_than_or_equal(key, value), rel=1e-12
    )
    assert nearest_below(value, series) == pytest.approx(
        reference.find_less_than_or_equal(key, value), rel=1e-12
    )


@given(_VALUES, st.sampled_from(list(ESeries)))
def test_nearest_matches_the_eseries_package_outside_the_midpoint_gap(value: float, series: ESeries) -> None:
    below, above = nearest_below(value, series), nearest_above(value, series)
    geometric, arithmetic = math.sqrt(below * above), (below + above) / 2
    assume(not geometric * (1 - 1e-9) <= value <= arithmetic * (1 + 1e-9))
    expected = reference.find_nearest(_REFERENCE_KEY[series], value)
    assert nearest(value, series) == pytest.approx(expected, rel=1e-12)


@given(_VALUES, st.sampled_from(list(ESeries)))
def test_neighbours_bracket_the_value(value: float, series: ESeries) -> None:
    below, above = nearest_below(value, series), nearest_above(value, series)
    assert below <= value * (1 + 1e-9) and above >= value * (1 - 1e-9)
    assert nearest(value, series) in (below, above)
    assert in_series(below, series) and in_series(above, series)
