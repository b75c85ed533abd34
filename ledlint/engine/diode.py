"""Shockley diode with series resistance and the SPICE temperature model, per LED.

The junction carries I = Is(T)·(exp(Vj/(n·Vt(T))) − 1) + GMIN·Vj, and the LED's terminal
voltage is Vj + I·Rs. Is(Tnom) comes from the datasheet point (Vf at i_test, Tnom = t_test).
Temperature follows ngspice's diode model (manual §7.3, eqs. 41-45):

    Is(T) = Is(Tnom)·exp(logfactor/n),
    logfactor = EG/Vt(Tnom) − EG/Vt(T) + XTI·ln(T/Tnom).

At constant current this gives dVj/dT = (Vj − EG − XTI·Vt)/T at Tnom. The engine keeps
XTI (3 by default, the SPICE value: the T³ of ni²) and solves that relation for EG, so the
slope at i_test is the LED's ``tc`` exactly for every Vf the LED can take. EG is then the
junction voltage extrapolated to 0 K, as in a band-gap reference. tc is the slope at Tnom:
the XTI·Vt·ln(T/Tnom) term bends Vf(T) below the straight line by about 1.5 mV at 85 °C
and 2 mV at −40 °C (XTI = 3).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import NamedTuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ledlint.engine.constants import GMIN, ZERO_CELSIUS, thermal_voltage
from ledlint.engine.model import DATASHEET_TEMPERATURE, LedSpec, ModelError, Range

Array = NDArray[np.float64]

# The junction-voltage inverse converges from above in a handful of Newton steps; the cap
# only bounds the loop, every step keeps an upper bound on the answer.
_INVERSE_STEPS = 100


def _ln_expm1(u: Array) -> Array:
    """log(exp(u) − 1) for u > 0, without overflow for large u."""
    return u + np.log(-np.expm1(-u))


@dataclass(frozen=True)
class LedTable:
    """The LED specifications as arrays along the engine's LED axis."""

    i_test: Array
    n: Array
    r_s: Array
    tc: Array
    xti: Array
    t_nom: Array  # K
    rth: Array  # K/W, 0 where the LED has no thermal resistance

    @classmethod
    def of(cls, leds: Sequence[LedSpec]) -> LedTable:
        def column(values: Sequence[float]) -> Array:
            arr = np.array(values, dtype=float)
            arr.setflags(write=False)
            return arr

        return cls(
            i_test=column([d.i_test for d in leds]),
            n=column([d.n for d in leds]),
            r_s=column([d.r_s for d in leds]),
            tc=column([d.tc for d in leds]),
            xti=column([d.xti for d in leds]),
            t_nom=column([d.t_test + ZERO_CELSIUS for d in leds]),
            rth=column([d.rth or 0.0 for d in leds]),
        )

    @property
    def self_heating(self) -> bool:
        return bool(np.any(self.rth > 0))


@dataclass(frozen=True)
class Junctions:
    """Diode parameters of every LED in every case, at the cases' junction temperatures."""

    a: Array  # n·Vt(Tj), V
    ln_is: Array  # log of the saturation current at Tj
    i_s: Array  # A
    r_s: Array  # ohm, along the LED axis
    eg: Array  # activation energy that gives the LED its tc, eV
    xti: Array
    t: Array  # junction temperature, K

    @classmethod
    def at(cls, table: LedTable, vf: ArrayLike, tj: ArrayLike) -> Junctions:
        """Fit each LED to its Vf (at i_test, Tnom) and move it to the junction temperature ``tj`` (°C)."""
        return Fit.of(table, vf).at(tj)

    def take(self, cases: NDArray[np.bool_]) -> Junctions:
        """The junctions of the cases selected by the mask ``cases``."""
        return Junctions(a=self.a[cases], ln_is=self.ln_is[cases], i_s=self.i_s[cases],
                         r_s=self.r_s, eg=self.eg[cases], xti=self.xti, t=self.t[cases])

    def current(self, vj: ArrayLike) -> Array:
        """Junction current at junction voltage ``vj``."""
        vj = np.asarray(vj, dtype=float)
        return self.i_s * np.expm1(vj / self.a) + GMIN * vj

    def conductance(self, vj: ArrayLike) -> Array:
        """dI/dVj at ``vj``."""
        return np.exp(np.asarray(vj, dtype=float) / self.a + self.ln_is) / self.a + GMIN

    def voltage(self, current: ArrayLike) -> Array:
        """Junction voltage that carries ``current``: the exact inverse of :meth:`current`.

        Both starting guesses lie at or above the root (the exponential alone needs more
        voltage than exponential plus GMIN, and so does GMIN alone), and Newton's method on
        a convex increasing function started above its root descends to it monotonically.
        """
        i = np.asarray(current, dtype=float)
        with np.errstate(divide="ignore", over="ignore"):
            vj: Array = np.minimum(
                self.a * np.log1p(np.maximum(i, 0.0) / self.i_s), (i + self.i_s) / GMIN
            )
        for _ in range(_INVERSE_STEPS):
            step = (self.current(vj) - i) / self.conductance(vj)
            vj = vj - step
            if np.all(np.abs(step) <= 1e-15 * (1.0 + np.abs(vj))):
                break
        return vj

    def terminal_voltage(self, current: ArrayLike) -> Array:
        """LED voltage (junction plus series resistance) at ``current``."""
        i = np.asarray(current, dtype=float)
        out: Array = self.voltage(i) + self.r_s * i
        return out

    def vf_slope(self, vj: ArrayLike) -> Array:
        """dVf/dT at constant current, V/K, at junction voltage ``vj`` (module docstring)."""
        vt = thermal_voltage(self.t - ZERO_CELSIUS)
        return (np.asarray(vj, dtype=float) - self.eg - self.xti * vt) / self.t


@dataclass(frozen=True)
class Fit:
    """Each LED fitted to its Vf at i_test: saturation current and activation energy at Tnom."""

    table: LedTable
    vt_nom: Array  # (L,)
    ln_is_nom: Array  # (S, L)
    eg: Array  # (S, L)

    @classmethod
    def of(cls, table: LedTable, vf: ArrayLike) -> Fit:
        vf = np.asarray(vf, dtype=float)
        vt_nom = thermal_voltage(table.t_nom - ZERO_CELSIUS)
        vj_nom = vf - table.i_test * table.r_s
        if np.any(vj_nom <= 0):
            raise ModelError("LED Vf must exceed its series-resistance drop i_test*r_s")
        ln_is_nom = np.log(table.i_test - GMIN * vj_nom) - _ln_expm1(vj_nom / (table.n * vt_nom))
        # dVj/dT = (Vj − EG − XTI·Vt)/T at Tnom, solved for EG (module docstring).
        eg = vj_nom - table.xti * vt_nom - table.tc * table.t_nom
        return cls(table=table, vt_nom=vt_nom, ln_is_nom=ln_is_nom, eg=eg)

    def at(self, tj: ArrayLike) -> Junctions:
        """The junctions at temperature ``tj`` (°C), by the SPICE temperature model."""
        table = self.table
        t = np.asarray(tj, dtype=float)
        if t.ndim == 2 and t.strides[1] == 0:
            # One temperature for every LED of a case (a cold start at the ambient): the
            # temperature terms need computing once per case, not once per LED.
            t = t[:, :1]
        t = t + ZERO_CELSIUS
        if np.any(t <= 0):
            raise ModelError("junction temperature must be above absolute zero")
        vt = thermal_voltage(t - ZERO_CELSIUS)
        logfactor = (self.eg * (1.0 / self.vt_nom - 1.0 / vt)
                     + table.xti * (np.log(t) - np.log(table.t_nom)))
        ln_is = self.ln_is_nom + logfactor / table.n
        return Junctions(a=table.n * vt, ln_is=ln_is, i_s=np.exp(ln_is), r_s=table.r_s, eg=self.eg,
                         xti=table.xti, t=t)


def forward_voltage(led: LedSpec, current: ArrayLike, tj: ArrayLike = DATASHEET_TEMPERATURE,
                    vf: float | None = None) -> Array:
    """Terminal voltage of ``led`` carrying ``current`` (A) at junction temperature ``tj`` (°C).

    ``vf`` picks the LED's Vf at i_test within its range (the nominal by default).
    """
    table = LedTable.of([led])
    current = np.asarray(current, dtype=float)
    shape = np.broadcast_shapes(current.shape, np.shape(tj))
    vf_arr = np.full(shape + (1,), led.vf.nominal if vf is None else vf)
    tj_arr = np.broadcast_to(np.asarray(tj, dtype=float), shape)[..., None]
    junctions = Junctions.at(table, vf_arr, tj_arr)
    return junctions.terminal_voltage(np.broadcast_to(current, shape)[..., None])[..., 0]


class DiodeFit(NamedTuple):
    """Saturation current, ideality factor and series resistance fitted to datasheet points."""

    i_s: float
    n: float
    r_s: float


def fit_points(points: Sequence[tuple[float, float]], temperature: float = DATASHEET_TEMPERATURE,
               n: float | None = None) -> DiodeFit:
    """Fit (Is, n, Rs) to datasheet (current A, voltage V) points at ``temperature`` (°C).

    For I ≫ Is, V = a·ln I + b + Rs·I with a = n·Vt and b = −a·ln Is, which is linear in
    (a, b, Rs): three points solve it exactly, more give least squares. With ``n`` known,
    two points are enough. Is is ill-conditioned (10 mV of rounding moves it tenfold);
    judge a fit by the voltages it predicts.
    """
    try:
        pts = np.array(points, dtype=float)
    except (TypeError, ValueError):
        raise ModelError("fit points must be (current, voltage) pairs of numbers") from None
    if pts.ndim != 2 or pts.shape[1] != 2 or not np.all(np.isfinite(pts)):
        raise ModelError("fit points must be (current, voltage) pairs of finite numbers")
    i, v = pts[:, 0], pts[:, 1]
    if np.any(i <= 0):
        raise ModelError("fit points need positive currents")
    needed = 3 if n is None else 2
    if len(np.unique(i)) < needed:
        raise ModelError(f"a fit needs at least {needed} points at different currents")
    vt = float(thermal_voltage(temperature))
    if n is None:
        coeffs = np.linalg.lstsq(np.column_stack([np.log(i), np.ones_like(i), i]), v, rcond=None)[0]
        a, b, r_s = (float(c) for c in coeffs)
    else:
        a = n * vt
        b, r_s = (float(c) for c in np.linalg.lstsq(np.column_stack([np.ones_like(i), i]),
                                                      v - a * np.log(i), rcond=None)[0])
    if a <= 0 or r_s < 0:
        raise ModelError(
            f"the points do not describe a diode (fitted n = {a / vt:.3g}, Rs = {r_s:.3g} ohm)"
        )
    return DiodeFit(i_s=float(np.exp(-b / a)), n=a / vt, r_s=r_s)


def spec_from_diode(i_s: float, n: float, r_s: float, *, tc: float, i_test: float = 0.02,
                    t_test: float = DATASHEET_TEMPERATURE, xti: float = 3.0,
                    rth: float | None = None, vf_tolerance: float = 0.0) -> LedSpec:
    """An LedSpec whose Vf at ``i_test`` is that of the SPICE diode (Is, n, Rs) at ``t_test``."""
    a = n * float(thermal_voltage(t_test))
    vj = a * float(np.log1p(i_test / i_s))
    # One correction for the GMIN·Vj share of i_test (a part in 1e10 at indicator currents).
    vj = a * float(np.log1p((i_test - GMIN * vj) / i_s))
    vf = vj + i_test * r_s
    return LedSpec(vf=Range.tolerance(vf, vf_tolerance), i_test=i_test, n=n, r_s=r_s, tc=tc,
                   rth=rth, t_test=t_test, xti=xti)
