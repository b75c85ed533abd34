"""Fixtures for the engine tests: demo LEDs and the ngspice guard."""

from __future__ import annotations

import shutil
from collections.abc import Callable

import pytest

from ledlint.engine import LedSpec, Range

# Demo indicator LED (invented, with values in the ranges of field-facts §5a/§5c): Vf 2.0 V
# at 20 mA, n = 2, Rs = 5 ohm, -2 mV/K.
MakeLed = Callable[..., LedSpec]


@pytest.fixture
def make_led() -> MakeLed:
    def make(vf: float = 2.0, spread: float = 0.0, *, i_test: float = 0.02, n: float = 2.0,
             r_s: float = 5.0, tc: float = -0.002, rth: float | None = None) -> LedSpec:
        return LedSpec(vf=Range(vf, vf - spread, vf + spread), i_test=i_test, n=n, r_s=r_s, tc=tc,
                       rth=rth)

    return make


@pytest.fixture
def ngspice() -> None:
    if shutil.which("ngspice") is None:
        pytest.skip("ngspice is not on PATH (Debian: apt-get install -y ngspice)")
