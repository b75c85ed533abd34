"""IEC 60063 preferred-number series (E3 to E192) and the nearest series values to a number."""

from __future__ import annotations

import math
from enum import Enum

# Within the three-figure family a series is every second value of the next finer one, so E192
# holds E96 and E48.  9.20 is the standard's value; the geometric formula would give 9.19 (at an
# odd index, so E96 never sees it).  The two-figure family E3 to E24 nests the same way in E24.
_E192 = (
    1.00, 1.01, 1.02, 1.04, 1.05, 1.06, 1.07, 1.09, 1.10, 1.11, 1.13, 1.14,
    1.15, 1.17, 1.18, 1.20, 1.21, 1.23, 1.24, 1.26, 1.27, 1.29, 1.30, 1.32,
    1.33, 1.35, 1.37, 1.38, 1.40, 1.42, 1.43, 1.45, 1.47, 1.49, 1.50, 1.52,
    1.54, 1.56, 1.58, 1.60, 1.62, 1.64, 1.65, 1.67, 1.69, 1.72, 1.74, 1.76,
    1.78, 1.80, 1.82, 1.84, 1.87, 1.89, 1.91, 1.93, 1.96, 1.98, 2.00, 2.03,
    2.05, 2.08, 2.10, 2.13, 2.15, 2.18, 2.21, 2.23, 2.26, 2.29, 2.32, 2.34,
    2.37, 2.40, 2.43, 2.46, 2.49, 2.52, 2.55, 2.58, 2.61, 2.64, 2.67, 2.71,
    2.74, 2.77, 2.80, 2.84, 2.87, 2.91, 2.94, 2.98, 3.01, 3.05, 3.09, 3.12,
    3.16, 3.20, 3.24, 3.28, 3.32, 3.36, 3.40, 3.44, 3.48, 3.52, 3.57, 3.61,
    3.65, 3.70, 3.74, 3.79, 3.83, 3.88, 3.92, 3.97, 4.02, 4.07, 4.12, 4.17,
    4.22, 4.27, 4.32, 4.37, 4.42, 4.48, 4.53, 4.59, 4.64, 4.70, 4.75, 4.81,
    4.87, 4.93, 4.99, 5.05, 5.11, 5.17, 5.23, 5.30, 5.36, 5.42, 5.49, 5.56,
    5.62, 5.69, 5.76, 5.83, 5.90, 5.97, 6.04, 6.12, 6.19, 6.26, 6.34, 6.42,
    6.49, 6.57, 6.65, 6.73, 6.81, 6.90, 6.98, 7.06, 7.15, 7.23, 7.32, 7.41,
    7.50, 7.59, 7.68, 7.77, 7.87, 7.96, 8.06, 8.16, 8.25, 8.35, 8.45, 8.56,
    8.66, 8.76, 8.87, 8.98, 9.09, 9.20, 9.31, 9.42, 9.53, 9.65, 9.76, 9.88,
)  # fmt: skip

_E24 = (
    1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0,
    3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
)  # fmt: skip


class ESeries(Enum):
    """An IEC 60063 series; each member holds its mantissas, 1.0 <= m < 10, in ascending order."""

    E3 = _E24[::8]
    E6 = _E24[::4]
    E12 = _E24[::2]
    E24 = _E24
    E48 = _E192[::4]
    E96 = _E192[::2]
    E192 = _E192


# Values this close to a series value count as that value, so that the rounding in a computed
# number (4700.000000001) does not push it to the next step.
_SAME = 1e-9


def series_values(series: ESeries) -> tuple[float, ...]:
    """Return the series' mantissas for one decade, 1.0 <= m < 10."""
    mantissas: tuple[float, ...] = series.value
    return mantissas


def _check(value: float) -> None:
    if not (math.isfinite(value) and value > 0):
        raise ValueError(f"E-series values are positive: cannot place {value!r} in a series")


def _around(value: float, series: ESeries) -> list[float]:
    """The series values of the decades around a value, ascending, within the float range."""
    decade = math.floor(math.log10(value))
    # Built from the decimal text, so 4.7 in the 10^3 decade is exactly 4700.0.
    written = (
        float(f"{mantissa!r}e{exponent}")
        for exponent in (decade - 1, decade, decade + 1)
        for mantissa in series_values(series)
    )
    return [number for number in written if 0 < number < math.inf]


def nearest_above(value: float, series: ESeries) -> float:
    """Return the smallest series value at or above a value (in any decade)."""
    _check(value)
    above = [number for number in _around(value, series) if number >= value * (1 - _SAME)]
    if not above:
        raise ValueError(f"no {series.name} value at or above {value!r} within the float range")
    return above[0]


def nearest_below(value: float, series: ESeries) -> float:
    """Return the largest series value at or below a value (in any decade)."""
    _check(value)
    below = [number for number in _around(value, series) if number <= value * (1 + _SAME)]
    if not below:
        raise ValueError(f"no {series.name} value at or below {value!r} within the float range")
    return below[-1]


def nearest(value: float, series: ESeries) -> float:
    """Return the series value nearest on a logarithmic scale; a tie goes to the larger value."""
    _check(value)
    return min(reversed(_around(value, series)), key=lambda number: abs(math.log(number / value)))


def in_series(value: float, series: ESeries, rel_tol: float = 1e-6) -> bool:
    """True when a value is a series value within the relative tolerance; False for 0 and negatives."""
    if not (math.isfinite(value) and value > 0):
        return False
    return math.isclose(nearest(value, series), value, rel_tol=rel_tol)
