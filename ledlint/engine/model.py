"""The engine's input: parameter ranges, LED specifications, branches and circuits."""

from __future__ import annotations

from dataclasses import dataclass

from ledlint.engine.constants import ZERO_CELSIUS, thermal_voltage
from ledlint.quantities.ranges import ModelError, Range, finite as _finite

__all__ = ["Branch", "Circuit", "DATASHEET_TEMPERATURE", "LedSpec", "ModelError", "Range"]

# Datasheets give Vf at 25 °C; this is also the SPICE TNOM the engine's decks use.
DATASHEET_TEMPERATURE = 25.0


def _non_negative(name: str, r: Range) -> None:
    if r.minimum < 0:
        raise ModelError(f"{name} must not be negative, got minimum {r.minimum!r}")


@dataclass(frozen=True)
class LedSpec:
    """One LED: datasheet Vf at ``i_test`` and the diode parameters behind it.

    ``t_test`` is the temperature (°C) at which ``vf`` holds. ``xti`` is the SPICE
    saturation-current temperature exponent; the engine keeps it (3, the SPICE default)
    and sets the activation energy EG so that dVf/dT at ``i_test`` equals ``tc``.
    """

    vf: Range
    i_test: float
    n: float
    r_s: float
    tc: float
    rth: float | None = None
    t_test: float = DATASHEET_TEMPERATURE
    xti: float = 3.0

    def __post_init__(self) -> None:
        for name in ("i_test", "n", "r_s", "tc", "t_test", "xti"):
            _finite(f"LED {name}", getattr(self, name))
        if self.i_test <= 0:
            raise ModelError(f"LED test current must be positive, got {self.i_test!r} A")
        if self.n <= 0:
            raise ModelError(f"LED ideality factor n must be positive, got {self.n!r}")
        # Without series resistance the current above the knee has no finite bound.
        if self.r_s <= 0:
            raise ModelError(f"LED series resistance must be positive, got {self.r_s!r} ohm")
        if self.rth is not None and (_finite("LED rth", self.rth) < 0):
            raise ModelError(f"LED thermal resistance must not be negative, got {self.rth!r} K/W")
        drop = self.i_test * self.r_s
        if self.vf.minimum <= drop:
            raise ModelError(
                f"LED Vf minimum {self.vf.minimum:.4g} V must exceed the series-resistance drop "
                f"i_test*r_s = {drop:.4g} V"
            )
        # Keeps the fitted saturation current far above the floating-point floor.
        limit = 300.0 * self.n * float(thermal_voltage(self.t_test))
        if self.vf.maximum - drop > limit:
            raise ModelError(
                f"LED junction voltage {self.vf.maximum - drop:.4g} V is too high for n = {self.n!r}: "
                f"a multi-junction LED needs n scaled by its junction count (limit {limit:.4g} V)"
            )


@dataclass(frozen=True)
class Branch:
    """One series string in a parallel bank, with its own balancing resistor."""

    leds: tuple[LedSpec, ...]
    r: Range = Range.fixed(0.0)

    def __post_init__(self) -> None:
        if not self.leds:
            raise ModelError("a branch needs at least one LED")
        _non_negative("branch resistance", self.r)


@dataclass(frozen=True)
class Circuit:
    """LED branches in parallel, fed through a common path by a voltage or a current."""

    branches: tuple[Branch, ...]
    supply: Range | None = None
    drive_current: Range | None = None
    r_series: Range = Range.fixed(0.0)
    r_source: float = 0.0
    r_switch: Range = Range.fixed(0.0)
    v_switch: Range = Range.fixed(0.0)
    ambient: Range = Range(25.0, 25.0, 25.0)

    def __post_init__(self) -> None:
        if not self.branches:
            raise ModelError("a circuit needs at least one branch")
        if (self.supply is None) == (self.drive_current is None):
            raise ModelError("a circuit needs exactly one of supply (V) and drive_current (A)")
        _non_negative("series resistance", self.r_series)
        _non_negative("switch resistance", self.r_switch)
        _non_negative("switch drop", self.v_switch)
        if _finite("source resistance", self.r_source) < 0:
            raise ModelError(f"source resistance must not be negative, got {self.r_source!r}")
        if self.ambient.minimum <= -ZERO_CELSIUS:
            raise ModelError(f"ambient must be above absolute zero, got {self.ambient.minimum!r} °C")

    def __hash__(self) -> int:
        # A board's solves are batched by circuit, so each is hashed many times over: once is enough.
        cached: int | None = self.__dict__.get("_hash")
        if cached is None:
            cached = hash((self.branches, self.supply, self.drive_current, self.r_series, self.r_source,
                           self.r_switch, self.v_switch, self.ambient))
            self.__dict__["_hash"] = cached
        return cached

    @property
    def current_driven(self) -> bool:
        return self.drive_current is not None

    @property
    def drive(self) -> Range:
        """The supply voltage or the drive current, whichever the circuit has."""
        drive = self.supply if self.supply is not None else self.drive_current
        assert drive is not None  # guaranteed by __post_init__
        return drive

    @property
    def leds(self) -> tuple[LedSpec, ...]:
        """Every LED, branch by branch: the order of the engine's LED axis."""
        return tuple(led for branch in self.branches for led in branch.leds)

    @property
    def branch_of_led(self) -> tuple[int, ...]:
        return tuple(k for k, branch in enumerate(self.branches) for _ in branch.leds)
