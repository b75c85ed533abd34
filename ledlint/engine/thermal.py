"""Self-heating: junction temperature as a fixed point, the operating point, the loop gain.

Tj = Ta + Rth·P with P the LED's whole electrical power (field-facts §6: treating all of it
as heat is the conservative bound). The fixed point is found by iteration; it settles when
the electro-thermal loop gain is below one, the stability criterion of field-facts §6.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np
from numpy.typing import NDArray

from ledlint.engine.diode import Fit, Junctions
from ledlint.engine.model import Circuit
from ledlint.engine.solver import Cases, Linearised, Setup, Solution, State, concat, groups, solve_state

Array = NDArray[np.float64]

_HEAT_STEPS = 300
_HEAT_TOLERANCE = 1e-5  # K between successive junction temperatures
# A junction this hot has run away; the ceiling only keeps the arithmetic finite.
TJ_CEILING = 500.0  # °C
# Step of the finite difference for the loop gain: small against the curvature of P(Tj),
# large against the solver's precision.
_DT = 0.05  # K


def heated(setup: Setup, cases: Cases, start: Array | None = None) -> Solution:
    """Solve with each LED at Tj = Ta + Rth·P (Tj = Ta where the LED has no Rth)."""
    table = setup.table
    ambient = cases.ambient[:, None]
    if not table.self_heating:
        tj = np.broadcast_to(ambient, cases.vf.shape)
        jn = Junctions.at(table, cases.vf, tj)
        return Solution.of(setup, cases, solve_state(setup, cases, jn, start), tj)
    fit = Fit.of(table, cases.vf)
    new = np.minimum(cases.tj, TJ_CEILING)
    vj = start
    for _ in range(_HEAT_STEPS):
        tj = new
        jn = fit.at(tj)
        state = solve_state(setup, cases, jn, vj)
        i_led = setup.layout.to_leds(state.branch_current)
        heat = ambient + table.rth * np.maximum((state.vj + table.r_s * i_led) * i_led, 0.0)
        runaway = np.any(heat >= TJ_CEILING, axis=1)
        settled = (np.max(np.abs(heat - tj), axis=1) <= _HEAT_TOLERANCE) & ~runaway
        if np.all(settled | runaway):
            break
        lin = Linearised.at(setup, cases, jn, state)
        slope = jn.vf_slope(state.vj)  # dVj/dTj at constant current
        # P ≥ 0, so the steady state lies between the ambient and the ceiling.
        new = np.clip(tj + _newton_step(setup, state, lin, slope, heat - tj), ambient, TJ_CEILING)
        vj = state.vj + _predicted_shift(setup, lin, slope * (new - tj))
    return Solution.of(setup, cases, state, tj, settled)


def _newton_step(setup: Setup, state: State, lin: Linearised, slope: Array,
                 residual: Array) -> Array:
    """Newton step on Tj for Tj = Ta + Rth·P(Tj); the plain step ``residual`` where unsafe.

    Linearised, a junction-temperature change δT_m inserts s_m·δT_m (s = dVj/dT at constant
    current) in its branch, so the loop matrix M = Rth·∂P/∂Tj is a diagonal, plus a rank
    one within each branch (its own loop), plus a rank one across the bank (the node). The
    step solves (I − M)·ΔT = residual with Sherman–Morrison twice, O(L) per case. Where a
    pivot of I − M is small or negative a mode gains nearly one or more, and the plain
    fixed-point step is kept: it climbs towards runaway instead of jumping to a steady
    state that self-heating would leave.
    """
    topo, table = setup.layout, setup.table
    i = topo.to_leds(state.branch_current)
    # δP_j = i·s_j·δT_j + beta_j·δI_k  (P = (Vj + Rs·I)·I, δVj = s·δT + r_d·δI)
    beta = i * lin.rd + state.vj + 2.0 * table.r_s * i
    u = table.rth * beta * topo.to_leds(lin.y)
    pivot = 1.0 - table.rth * i * slope
    w = topo.to_leds(lin.share) * slope
    with np.errstate(divide="ignore", invalid="ignore"):
        bu = u / pivot
        branch_pivot = 1.0 + topo.per_branch(slope * bu)

        def solve_within(z: Array) -> Array:
            bz = z / pivot
            return bz - bu * topo.to_leds(topo.per_branch(slope * bz) / branch_pivot)

        cr, cu = solve_within(residual), solve_within(u)
        bank_pivot = 1.0 - np.einsum("ij,ij->i", w, cu)
        step = cr + cu * (np.einsum("ij,ij->i", w, cr) / bank_pivot)[:, None]
    safe = ((pivot.min(axis=1) > 0.1) & (branch_pivot.min(axis=1) > 0.1) & (bank_pivot > 0.1)
            & np.all(np.isfinite(step), axis=1))
    return np.where(safe[:, None], step, residual)


def _predicted_shift(setup: Setup, lin: Linearised, inserted: Array) -> Array:
    """The junction-voltage change that voltages ``inserted`` at the junctions (a temperature
    step times dVj/dTj) make in the linearised bank: the next solve starts there, a few
    Newton steps nearer than the last solution."""
    topo = setup.layout
    e = topo.per_branch(inserted)
    d_current = lin.y * (np.einsum("ij,ij->i", lin.share, e)[:, None] - e)
    return inserted + lin.rd * topo.to_leds(d_current)


def solve_heated(circuit: Circuit, cases: Cases) -> Solution:
    """Solve every case with electro-thermal self-heating; ``cases.tj`` is only the first guess."""
    setup = Setup.of(circuit)
    setup.check(cases)
    return heated(setup, cases)


def operating_point(circuit: Circuit) -> Solution:
    """The nominal operating point (one case), self-heated where the LEDs have an Rth."""
    return solve_heated(circuit, Cases.build(circuit))


@dataclass(frozen=True)
class LoopGain:
    """Electro-thermal loop at the nominal operating point.

    ``matrix[i, j]`` = Rth_i·∂P_i/∂Tj_j over the LEDs that have an Rth (``leds`` gives their
    index on the LED axis). A disturbance that survives one trip round the loop is scaled
    by an eigenvalue of this matrix, so ``gain`` is the largest one: for one LED it is
    Rth·dP/dTj (field-facts §6); in a bank the mode where one LED heats and takes current
    from the others (field-facts §7), in a string the mode where all heat together.
    ``mode`` is that eigenvector, largest entry 1: the LEDs that take part.
    """

    gain: float
    leds: tuple[int, ...]
    matrix: Array
    mode: Array
    self_gain: Array  # the diagonal: each LED's own loop with the others held
    settled: bool  # False when the operating point itself has run away


def loop_gains_many(circuits: Sequence[Circuit]) -> list[LoopGain | None]:
    """``loop_gains`` of many circuits, one solve per group of same-shaped circuits."""
    done: dict[Circuit, LoopGain | None] = {}
    for group in groups(circuits):
        setup = Setup.of(group[0])
        heat = np.flatnonzero(setup.table.rth > 0)
        if heat.size == 0:
            done.update((c, None) for c in group)
            continue
        nominal = concat([Cases.build(c) for c in group])
        point = heated(setup, nominal)
        m, n_c = heat.size, len(group)
        # For each circuit, cases 2j and 2j+1 move LED heat[j] by ±_DT, every other junction held.
        tj = np.repeat(point.tj, 2 * m, axis=0)
        tj[np.arange(2 * m * n_c), np.tile(np.repeat(heat, 2), n_c)] += np.tile([_DT, -_DT], m * n_c)
        cases = nominal.take(np.repeat(np.arange(n_c), 2 * m)).replace(tj=tj)
        jn = Junctions.at(setup.table, cases.vf, cases.tj)
        state = solve_state(setup, cases, jn, np.repeat(point.vj, 2 * m, axis=0))
        power = Solution.of(setup, cases, state, cases.tj).led_power[:, heat].reshape(n_c, 2 * m, m)
        d_power = ((power[:, 0::2] - power[:, 1::2]) / (2 * _DT)).transpose(0, 2, 1)  # [c, i, j] = ∂P_i/∂T_j
        matrices = setup.table.rth[heat][None, :, None] * d_power
        all_values, all_vectors = np.linalg.eig(matrices)
        for c, matrix, values, vectors, settled in zip(group, matrices, all_values, all_vectors, point.settled):
            top = int(np.argmax(values.real))
            mode = vectors[:, top].real
            mode = mode / mode[np.argmax(np.abs(mode))]
            diagonal = np.diag(matrix).copy()
            matrix = matrix.copy()
            for arr in (matrix, mode, diagonal):
                arr.setflags(write=False)
            done[c] = LoopGain(gain=float(values[top].real), leds=tuple(int(j) for j in heat), matrix=matrix,
                               mode=mode, self_gain=diagonal, settled=bool(settled))
    return [done[c] for c in circuits]


def loop_gains(circuit: Circuit) -> LoopGain | None:
    """The electro-thermal loop at the nominal point; None when no LED has an Rth."""
    return loop_gains_many([circuit])[0]


def loop_gain(circuit: Circuit) -> float | None:
    """The electro-thermal loop gain G at the nominal point (G ≥ 1: runaway); None without Rth."""
    loop = loop_gains(circuit)
    return None if loop is None else loop.gain
