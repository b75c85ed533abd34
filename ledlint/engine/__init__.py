"""Numeric LED-circuit engine: diode model, operating points, corners, Monte Carlo, thermal."""

from ledlint.engine.corners import Corners, corners, corners_many
from ledlint.engine.diode import DiodeFit, fit_points, forward_voltage, spec_from_diode
from ledlint.engine.model import Branch, Circuit, LedSpec, ModelError, Range
from ledlint.engine.montecarlo import MonteCarlo, Summary, monte_carlo
from ledlint.engine.solver import Cases, OperatingPoint, Solution, solve
from ledlint.engine.thermal import LoopGain, loop_gain, loop_gains, loop_gains_many, operating_point, solve_heated

__all__ = [
    "Branch",
    "Cases",
    "Circuit",
    "Corners",
    "DiodeFit",
    "LedSpec",
    "LoopGain",
    "ModelError",
    "MonteCarlo",
    "OperatingPoint",
    "Range",
    "Solution",
    "Summary",
    "corners",
    "corners_many",
    "fit_points",
    "forward_voltage",
    "loop_gain",
    "loop_gains",
    "loop_gains_many",
    "monte_carlo",
    "operating_point",
    "solve",
    "solve_heated",
    "spec_from_diode",
]
