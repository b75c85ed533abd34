"""A parameter over its tolerance: nominal value and the extremes it can take, with interval
arithmetic; and the error a description that cannot be modelled raises."""

from __future__ import annotations

import math
from dataclasses import dataclass

from ledlint.errors import LedlintError


class ModelError(LedlintError, ValueError):
    """A circuit description the engine cannot model (a negative resistance, no LEDs, ...)."""


def finite(name: str, value: float) -> float:
    if not isinstance(value, (int, float)) or not math.isfinite(value):
        raise ModelError(f"{name} must be a finite number, got {value!r}")
    return float(value)


_INF = math.inf


@dataclass(frozen=True)
class Range:
    """A parameter over its tolerance: nominal value and the extremes it can take."""

    nominal: float
    minimum: float
    maximum: float

    def __post_init__(self) -> None:
        lo, mid, hi = self.minimum, self.nominal, self.maximum
        if type(lo) is float and type(mid) is float and type(hi) is float and -_INF < lo <= mid <= hi < _INF:
            return  # the usual case, checked in one comparison: ranges are made by the hundred thousand
        for name in ("nominal", "minimum", "maximum"):
            finite(f"range {name}", getattr(self, name))
        if not self.minimum <= self.nominal <= self.maximum:
            raise ModelError(
                f"range needs minimum <= nominal <= maximum, got "
                f"{self.minimum!r} <= {self.nominal!r} <= {self.maximum!r}"
            )

    @classmethod
    def fixed(cls, x: float) -> Range:
        return cls(x, x, x)

    @classmethod
    def tolerance(cls, nominal: float, rel: float) -> Range:
        """``nominal`` ± ``rel`` (a fraction, 0.05 for ±5 %); works for negative values too."""
        rel = finite("tolerance", rel)
        if rel < 0:
            raise ModelError(f"tolerance must not be negative, got {rel!r}")
        spread = abs(finite("nominal", nominal)) * rel
        return cls(nominal, nominal - spread, nominal + spread)

    def __add__(self, other: Range) -> Range:
        """Interval sum: the extremes add."""
        return Range(self.nominal + other.nominal, self.minimum + other.minimum, self.maximum + other.maximum)

    def __sub__(self, other: Range) -> Range:
        """Interval difference: least minus most, most minus least."""
        return Range(self.nominal - other.nominal, self.minimum - other.maximum, self.maximum - other.minimum)


