"""The per-rule tests' tools: check a kicad8 board as a user would, and bound its numbers by hand."""

from __future__ import annotations

import math
from pathlib import Path

from kicad8 import Board

from ledlint.checks.findings import Finding, Value
from ledlint.review.run import FileResult, check

# Every corner at 25 °C, the temperature datasheets state Vf at: a Vf field given at the test
# current then holds exactly, and hand calculations need no temperature coefficient.
DATASHEET_AMBIENT = "[ambient]\nmin = 25\nmax = 25\n"

# Boltzmann constant over the elementary charge, both exact in the 2019 SI
# (k = 1.380649e-23 J/K, q = 1.602176634e-19 C): V/K.
K_OVER_Q = 1.380649e-23 / 1.602176634e-19
ZERO_CELSIUS = 273.15

# An indicator LED's dynamic resistance r_d = n·Vt/I + R_s (Shockley with series resistance,
# field-facts §5c). Ideality n ≤ 2.5 for AlInGaP/GaP fits and R_s ≤ 20 Ω for indicator LEDs
# (field-facts §5c, both from memory): the largest r_d any such LED can have.
N_MAX = 2.5
RS_MAX = 20.0


def thermal_voltage(celsius: float) -> float:
    return K_OVER_Q * (celsius + ZERO_CELSIUS)


def rd_max(current: float, celsius: float = 25.0) -> float:
    """The largest dynamic resistance of an indicator LED at `current` (A)."""
    return N_MAX * thermal_voltage(celsius) / current + RS_MAX


def current_bounds(volts: float, ohms: float, vf: float, i_test: float,
                   celsius: float = 25.0) -> tuple[float, float]:
    """Least and most current from `volts` through `ohms` into an LED with `vf` at `i_test`.

    Ohm's law with Vf at its test current gives I0 = (V − Vf)/R. The true current lies between
    I0 and the Ohm's-law current with Vf moved along a chord of slope r_d,max: log-concavity of
    the Shockley curve, ln x ≤ x − 1, bounds Vf(I) − Vf(I_test) by r_d at the smaller of the
    two currents times their difference.
    """
    i0 = (volts - vf) / ohms
    rd = rd_max(min(i0, i_test), celsius)
    chord = (volts - vf + rd * i_test) / (ohms + rd)
    return min(i0, chord), max(i0, chord)


def shockley_current(volts: float, vf: float, i_test: float, n: float, rs: float, celsius: float = 25.0) -> float:
    """The current an LED (Vf at i_test) takes straight across `volts`.

    V = Vf + n·Vt·ln(I/I_test) + R_s·(I − I_test), solved by bisection: the right side rises
    monotonically with I.
    """
    a = n * thermal_voltage(celsius)
    lo, hi = 1e-12, 100.0
    for _ in range(200):
        mid = math.sqrt(lo * hi)
        if vf + a * math.log(mid / i_test) + rs * (mid - i_test) > volts:
            hi = mid
        else:
            lo = mid
    return math.sqrt(lo * hi)


def run_board(board: Board, folder: Path, config: str = DATASHEET_AMBIENT) -> FileResult:
    """Write the board's netlist and a ledlint.toml beside it, and check it through ledlint.review.run."""
    net = folder / f"{board.name}.net"
    net.write_text(board.text(), encoding="utf-8")
    toml = folder / "ledlint.toml"
    toml.write_text(config, encoding="utf-8")
    return check([net], config_path=str(toml)).files[0]


def of_rule(result: FileResult, rule: str) -> list[Finding]:
    return [f for f in result.findings if f.rule == rule]


def only(result: FileResult, rule: str) -> Finding:
    """The single finding of a rule; fails with every finding shown when there is not exactly one."""
    found = of_rule(result, rule)
    assert len(found) == 1, [(f.rule, f.refs, f.message) for f in result.findings]
    return found[0]


def value(finding: Finding, name: str) -> Value:
    return next(v for v in finding.values if v.name == name)


def line_of(board: Board, ref: str) -> int:
    """The netlist line that opens component `ref` (1-based), as the writer laid it out."""
    opening = f'(comp (ref "{ref}")'
    return next(i for i, text in enumerate(board.text().splitlines(), start=1) if opening in text)
