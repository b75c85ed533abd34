"""Resistor power ratings read from footprint names, and the IEC 60115-1 derating curve."""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache

# Parsed once per distinct text: a board repeats the same values and footprints many times over.
_cached = lru_cache(maxsize=8192)

# Rated ambient temperature of the P70 rating (IEC 60115-1 convention).
RATED_AMBIENT_C = 70.0
# Upper category temperature of thick-film and metal-film parts; 01005 thick film stops at 125 °C.
THICK_FILM_UCT_C = 155.0
SMALLEST_CHIP_UCT_C = 125.0


@dataclass(frozen=True)
class PowerRating:
    """A default power rating at 70 °C, with the reason it was chosen."""

    watts: float
    basis: str
    upper_category_c: float


@dataclass(frozen=True)
class _ChipRow:
    imperial: str
    metrics: tuple[str, ...]
    watts: float
    upper_category_c: float
    basis: str


_COMMON_DEFAULT = "commonly quoted thick-film chip default at 70 °C"
_STANDARD_COLUMN = "general-purpose thick-film chip rating at 70 °C"

# The commonly quoted one-line defaults; 01005 and 1812 are missing from that line, so they take
# the general-purpose column of the same size table.  2512 is 6432 in the size tables but 6332 in
# the usual footprint library names, so both metric codes are accepted.
_CHIPS = (
    _ChipRow("01005", ("0402",), 1 / 32, SMALLEST_CHIP_UCT_C, _STANDARD_COLUMN),
    _ChipRow("0201", ("0603",), 1 / 20, THICK_FILM_UCT_C, _COMMON_DEFAULT),
    _ChipRow("0402", ("1005",), 1 / 16, THICK_FILM_UCT_C, _COMMON_DEFAULT),
    _ChipRow("0603", ("1608",), 1 / 10, THICK_FILM_UCT_C, _COMMON_DEFAULT),
    _ChipRow("0805", ("2012",), 1 / 8, THICK_FILM_UCT_C, _COMMON_DEFAULT),
    _ChipRow("1206", ("3216",), 1 / 4, THICK_FILM_UCT_C, _COMMON_DEFAULT),
    _ChipRow("1210", ("3225",), 1 / 2, THICK_FILM_UCT_C, _COMMON_DEFAULT),
    _ChipRow("1812", ("4532",), 1 / 2, THICK_FILM_UCT_C, _STANDARD_COLUMN),
    _ChipRow("2010", ("5025",), 3 / 4, THICK_FILM_UCT_C, _COMMON_DEFAULT),
    _ChipRow("2512", ("6432", "6332"), 1.0, THICK_FILM_UCT_C, _COMMON_DEFAULT),
)
_CHIP_BY_IMPERIAL = {row.imperial: row for row in _CHIPS}
_IMPERIAL_BY_METRIC = {metric: row.imperial for row in _CHIPS for metric in row.metrics}

CHIP_SIZES: frozenset[str] = frozenset(_CHIP_BY_IMPERIAL)
"""Imperial chip case codes that have a default rating."""

_IMPERIAL = re.compile(r"(?<![0-9])(" + "|".join(_CHIP_BY_IMPERIAL) + r")(?![0-9]|[Mm]etric)")
_METRIC = re.compile(r"(?<![0-9])([0-9]{4})[Mm]etric")


@dataclass(frozen=True)
class _AxialRow:
    watts: float
    diameter_mm: tuple[float, float]
    length_mm: tuple[float, float]


# Typical film-resistor bodies (diameter and length ranges) per rating.
_AXIAL = (
    _AxialRow(1 / 8, (1.5, 1.8), (3.0, 3.5)),
    _AxialRow(1 / 4, (2.3, 2.5), (6.0, 6.5)),
    _AxialRow(1 / 2, (3.0, 3.2), (8.5, 9.0)),
    _AxialRow(1.0, (4.0, 5.0), (11.0, 11.0)),
    _AxialRow(2.0, (5.0, 5.0), (15.0, 15.0)),
)
# The table's sizes are typical, a footprint's are nominal: allow this much either way.  The
# margins are chosen so that no body falls into two rows; DIN0204, 0207, 0309, 0414 and 0516 each
# match one row, while 0411, 0614, 0617, 0918 and 0922 sit between or beyond rows and get none.
_DIAMETER_SLACK_MM = 0.3
_LENGTH_SLACK_MM = 1.0
_AXIAL_LENGTH = re.compile(r"_L([0-9]+(?:\.[0-9]+)?)mm")
_AXIAL_DIAMETER = re.compile(r"_D([0-9]+(?:\.[0-9]+)?)mm")

# Footprints of other parts, and resistor kinds whose ratings do not follow the body size
# (shunts, arrays, power bodies, variable parts): no default rating is given for them.
_OTHER_PART = re.compile(
    r"^(?:C|CP|L|D|LED|F|FB|Fuse|Crystal|Capacitor|Inductor|Diode|Ferrite)(?:_|$)", re.IGNORECASE
)
# Only the standard library names: a custom library ("led-board") may hold resistors too.
_OTHER_LIBRARY = re.compile(r"^(?:Capacitor|Inductor|LED|Diode|Fuse|Crystal)s?(?:_|$)", re.IGNORECASE)
_NO_DEFAULT = re.compile(
    r"Shunt|Array|Network|Potentiometer|Trimmer|Thermistor|Varistor|NTC|PTC|Bare_Metal", re.IGNORECASE
)
# Cement and wirewound power bodies, by body length: the lowest rating such a body is commonly
# sold at (from memory; the same body carries two or three ratings across series), so the
# default errs towards a finding that asks for the part's Power field, not towards a pass.
_POWER_BODY = re.compile(r"R_(Axial|Radial)_Power_L([0-9]+(?:\.[0-9]+)?)mm", re.IGNORECASE)
_POWER_BY_LENGTH = {  # (longest first) body length from, mm -> watts at 70 °C
    "axial": ((60.0, 10.0), (45.0, 7.0), (35.0, 5.0), (24.0, 3.0), (17.0, 2.0)),
    "radial": ((16.0, 3.0), (11.0, 2.0)),
}


def _split_footprint(footprint: str) -> tuple[str, str]:
    library, _, name = footprint.strip().rpartition(":")
    return library, name


def chip_size(footprint: str) -> str | None:
    """Return the imperial chip case code ("0603") named in a footprint, or None."""
    _, name = _split_footprint(footprint)
    imperial: set[str] = set(_IMPERIAL.findall(name))
    if len(imperial) == 1:
        return imperial.pop()
    if imperial:
        return None
    from_metric: set[str] = {
        _IMPERIAL_BY_METRIC[code] for code in _METRIC.findall(name) if code in _IMPERIAL_BY_METRIC
    }
    return from_metric.pop() if len(from_metric) == 1 else None


def _axial_rating(name: str) -> PowerRating | None:
    length = _AXIAL_LENGTH.search(name)
    diameter = _AXIAL_DIAMETER.search(name)
    if length is None or diameter is None:
        return None
    length_mm, diameter_mm = float(length.group(1)), float(diameter.group(1))
    rows = [
        row
        for row in _AXIAL
        if row.diameter_mm[0] - _DIAMETER_SLACK_MM <= diameter_mm <= row.diameter_mm[1] + _DIAMETER_SLACK_MM
        and row.length_mm[0] - _LENGTH_SLACK_MM <= length_mm <= row.length_mm[1] + _LENGTH_SLACK_MM
    ]
    if len(rows) != 1:
        return None
    basis = f"axial film body {diameter_mm:g} x {length_mm:g} mm: typical body of that rating at 70 °C"
    return PowerRating(rows[0].watts, basis, THICK_FILM_UCT_C)


def _power_rating(style: str, length_mm: float) -> PowerRating | None:
    watts = next((w for start, w in _POWER_BY_LENGTH[style] if length_mm >= start), None)
    if watts is None:
        return None
    # 155 °C as for film parts: power bodies run hotter, so this derates early (on the safe side).
    return PowerRating(watts, f"{style} power body {length_mm:g} mm long: the lowest rating commonly sold in "
                       "that body (from memory); give the part a Power field", THICK_FILM_UCT_C)


@_cached
def rating_from_footprint(footprint: str) -> PowerRating | None:
    """Return the default 70 °C power rating a resistor footprint implies, or None when unknown.

    The rating is a default: the same body is sold in several ratings, so a part's own rating,
    when given, takes precedence.
    """
    library, name = _split_footprint(footprint)
    if _OTHER_PART.match(name) or _OTHER_LIBRARY.match(library) or _NO_DEFAULT.search(name):
        return None
    power = _POWER_BODY.search(name)
    if power:
        return _power_rating(power.group(1).lower(), float(power.group(2)))
    if "axial" in name.lower():
        return _axial_rating(name)
    size = chip_size(footprint)
    if size is None:
        return None
    row = _CHIP_BY_IMPERIAL[size]
    return PowerRating(row.watts, f"{size} chip: {row.basis}", row.upper_category_c)


def derated_power(
    p70: float,
    ambient_c: float,
    *,
    rated_ambient_c: float = RATED_AMBIENT_C,
    upper_category_c: float = THICK_FILM_UCT_C,
) -> float:
    """Return the power allowed at an ambient temperature on the linear IEC 60115-1 curve.

    Full rating up to the rated ambient, falling in a straight line to zero at the upper
    category temperature, zero beyond it.
    """
    for label, number in (
        ("rated power", p70),
        ("ambient temperature", ambient_c),
        ("rated ambient temperature", rated_ambient_c),
        ("upper category temperature", upper_category_c),
    ):
        if not math.isfinite(number):
            raise ValueError(f"{label} must be a finite number, got {number!r}")
    if p70 < 0:
        raise ValueError(f"rated power cannot be negative, got {p70!r} W")
    if upper_category_c <= rated_ambient_c:
        raise ValueError(
            f"upper category temperature {upper_category_c:g} °C must lie above "
            f"the rated ambient temperature {rated_ambient_c:g} °C"
        )
    if ambient_c <= rated_ambient_c:
        return p70
    if ambient_c >= upper_category_c:
        return 0.0
    return p70 * (upper_category_c - ambient_c) / (upper_category_c - rated_ambient_c)


def chip_for(watts: float) -> tuple[str, float] | None:
    """The smallest chip size whose commonly quoted rating covers ``watts``; None above 2512."""
    rows = sorted((r for r in _CHIPS if r.basis == _COMMON_DEFAULT), key=lambda r: r.watts)
    for row in rows:
        if row.watts >= watts:
            return row.imperial, row.watts
    return None
