"""Vectorised DC solve of LED banks over many cases at once.

Every case is a bank of K series strings (branches) hanging from one node, fed through a
common path (ballast, source and switch resistance, a fixed switch drop) by a voltage, or
driven by an ideal current source. KCL at the node and KVL around each branch:

    V_supply − v_switch − V_node = (r_series + r_source + r_switch)·Σ I_k
    Σ_j Vf_j(I_k) + r_k·I_k = V_node

The fast path is SPICE's: linearise every junction at its present voltage (a knee voltage
plus its dynamic resistance), solve the linear bank in closed form (the Jacobian is
diagonal plus the rank one of the common path, so the step is O(K)), and limit the update
the way SPICE limits diode voltages, never above the voltage the exponential alone would
need for the new current. Starting at each LED's test-current voltage makes the first step
the linearised Vf0 + r_d·I solution. Any case that has not settled after a bounded number
of steps is solved again by a bracketed method that cannot fail: a safeguarded
Newton-bisection on the node voltage, around an inner solve of each branch for its current
(the branch voltage is concave in the current, so Newton's method there converges
monotonically after its first step).
"""

from __future__ import annotations

from dataclasses import dataclass, fields
from typing import Sequence, Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ledlint.engine.constants import GMIN
from ledlint.engine.diode import Junctions, LedTable
from ledlint.engine.model import Circuit, ModelError

Array = NDArray[np.float64]

_FAST_STEPS = 60
# Chord of I(V) from i_test/10 to i_test against the tangent at i_test: ln 10 / 0.9.
_CHORD = float(np.log(10.0) / 0.9)
_OUTER_STEPS = 400
_INNER_STEPS = 200


def _frozen(x: ArrayLike, shape: tuple[int, ...], name: str) -> Array:
    """``x`` as a read-only float array of ``shape``; a writeable input is copied first."""
    arr = np.asarray(x, dtype=float)
    if arr.flags.writeable:
        arr = arr.copy()
        arr.setflags(write=False)
    try:
        arr = np.broadcast_to(arr, shape)
    except ValueError as exc:
        raise ModelError(f"{name} does not fit the case shape {shape}: {exc}") from None
    if not np.all(np.isfinite(arr)):
        raise ModelError(f"{name} must be finite")
    return arr


@dataclass(frozen=True)
class Cases:
    """The values one solve runs over: S cases of the drive, resistances, Vf and temperature.

    ``drive`` is the supply voltage (V) or the drive current (A), as the circuit says.
    ``vf`` is each LED's Vf at its test current and test temperature; ``tj`` the junction
    temperature (°C) to solve at; ``ambient`` the ambient (°C) that self-heating starts from.
    """

    drive: Array  # (S,)
    r_series: Array  # (S,)
    r_switch: Array  # (S,)
    v_switch: Array  # (S,)
    r_branch: Array  # (S, K)
    vf: Array  # (S, L)
    ambient: Array  # (S,)
    tj: Array  # (S, L)

    def __post_init__(self) -> None:
        size = np.shape(self.drive)[0] if np.ndim(self.drive) == 1 else -1
        if size < 1:
            raise ModelError("cases need a one-dimensional, non-empty drive array")
        k = np.shape(self.r_branch)[-1] if np.ndim(self.r_branch) == 2 else -1
        n_leds = np.shape(self.vf)[-1] if np.ndim(self.vf) == 2 else -1
        if k < 1 or n_leds < 1:
            raise ModelError("cases need r_branch of shape (S, K) and vf of shape (S, L)")
        shapes = {"drive": (size,), "r_series": (size,), "r_switch": (size,), "v_switch": (size,),
                  "r_branch": (size, k), "vf": (size, n_leds), "ambient": (size,),
                  "tj": (size, n_leds)}
        for name, shape in shapes.items():
            object.__setattr__(self, name, _frozen(getattr(self, name), shape, name))
        for name in ("r_series", "r_switch", "r_branch"):
            if np.any(getattr(self, name) < 0):
                raise ModelError(f"{name} must not be negative")

    @property
    def size(self) -> int:
        return int(self.drive.shape[0])

    @classmethod
    def build(cls, circuit: Circuit, size: int = 1, *, drive: ArrayLike | None = None,
              r_series: ArrayLike | None = None, r_switch: ArrayLike | None = None,
              v_switch: ArrayLike | None = None, r_branch: ArrayLike | None = None,
              vf: ArrayLike | None = None, ambient: ArrayLike | None = None,
              tj: ArrayLike | None = None) -> Cases:
        """Cases of ``circuit``: any value not given is its nominal; ``tj`` defaults to the ambient."""
        k, n_leds = len(circuit.branches), len(circuit.leds)
        amb = _frozen(circuit.ambient.nominal if ambient is None else ambient, (size,), "ambient")
        return cls(
            drive=_frozen(circuit.drive.nominal if drive is None else drive, (size,), "drive"),
            r_series=_frozen(circuit.r_series.nominal if r_series is None else r_series, (size,),
                             "r_series"),
            r_switch=_frozen(circuit.r_switch.nominal if r_switch is None else r_switch, (size,),
                             "r_switch"),
            v_switch=_frozen(circuit.v_switch.nominal if v_switch is None else v_switch, (size,),
                             "v_switch"),
            r_branch=_frozen([b.r.nominal for b in circuit.branches] if r_branch is None else r_branch,
                             (size, k), "r_branch"),
            vf=_frozen([d.vf.nominal for d in circuit.leds] if vf is None else vf, (size, n_leds), "vf"),
            ambient=amb,
            tj=_frozen(amb[:, None] if tj is None else tj, (size, n_leds), "tj"),
        )

    def replace(self, **changes: ArrayLike) -> Cases:
        values: dict[str, Any] = {f.name: getattr(self, f.name) for f in fields(self)}
        values.update(changes)
        return Cases(**values)

    def take(self, index: ArrayLike) -> Cases:
        """The cases at ``index`` (an integer array or a boolean mask)."""
        return Cases(**{f.name: getattr(self, f.name)[index] for f in fields(self)})


@dataclass(frozen=True)
class Layout:
    """Which LED sits in which branch; LEDs are numbered branch by branch."""

    counts: NDArray[np.intp]  # LEDs per branch
    starts: NDArray[np.intp]  # index of each branch's first LED
    singles: bool  # every branch is one LED: the branch axis is the LED axis

    @classmethod
    def of(cls, circuit: Circuit) -> Layout:
        counts = np.array([len(b.leds) for b in circuit.branches], dtype=np.intp)
        starts = np.concatenate([[0], np.cumsum(counts)[:-1]]).astype(np.intp)
        return cls(counts=counts, starts=starts, singles=bool(np.all(counts == 1)))

    def per_branch(self, per_led: Array) -> Array:
        """Sum over each branch's LEDs: (S, L) → (S, K)."""
        return per_led if self.singles else np.add.reduceat(per_led, self.starts, axis=1)

    def to_leds(self, per_branch: Array) -> Array:
        """Spread a branch value over its LEDs: (S, K) → (S, L)."""
        return per_branch if self.singles else np.repeat(per_branch, self.counts, axis=1)


@dataclass(frozen=True)
class Setup:
    """What a solve needs to know about a circuit, computed once."""

    circuit: Circuit
    table: LedTable
    layout: Layout

    @classmethod
    def of(cls, circuit: Circuit) -> Setup:
        return cls(circuit=circuit, table=LedTable.of(circuit.leds), layout=Layout.of(circuit))

    def check(self, cases: Cases) -> None:
        k, n_leds = len(self.layout.counts), len(self.table.n)
        if cases.r_branch.shape[1] != k or cases.vf.shape[1] != n_leds:
            raise ModelError(
                f"cases are for {cases.r_branch.shape[1]} branches and {cases.vf.shape[1]} LEDs, "
                f"the circuit has {k} and {n_leds}"
            )


@dataclass(frozen=True)
class State:
    """A solved case set: junction voltages, branch currents and the node voltage."""

    vj: Array  # (S, L)
    branch_current: Array  # (S, K)
    node_voltage: Array  # (S,)


@dataclass(frozen=True)
class _Path:
    """Per-case values of the common path and each branch's total series resistance."""

    r_common: Array  # (S,)
    source: Array  # supply − switch drop (V), or the drive current (A)
    r_branch: Array  # balancing resistor plus the LEDs' series resistances, (S, K)

    @classmethod
    def of(cls, setup: Setup, cases: Cases) -> _Path:
        circuit = setup.circuit
        r_leds = setup.layout.per_branch(np.broadcast_to(setup.table.r_s, cases.vf.shape))
        source = cases.drive if circuit.current_driven else cases.drive - cases.v_switch
        return cls(r_common=cases.r_series + circuit.r_source + cases.r_switch, source=source,
                   r_branch=cases.r_branch + r_leds)


@dataclass(frozen=True)
class _Work:
    """The fast path's per-case constants for the cases still iterating (``rows`` of the whole)."""

    rows: NDArray[np.intp]
    a: Array
    inv_a: Array
    ln_is: Array
    i_s: Array
    inv_is: Array
    gmin_a: Array
    r_branch: Array
    source: Array
    r_common: Array

    @classmethod
    def of(cls, path: _Path, jn: Junctions) -> _Work:
        return cls(rows=np.arange(jn.a.shape[0]), a=jn.a, inv_a=1.0 / jn.a, ln_is=jn.ln_is,
                   i_s=jn.i_s, inv_is=1.0 / jn.i_s, gmin_a=GMIN * jn.a, r_branch=path.r_branch,
                   source=path.source, r_common=path.r_common)

    def take(self, keep: NDArray[np.bool_]) -> _Work:
        return _Work(**{f.name: getattr(self, f.name)[keep] for f in fields(self)})


def _fast(setup: Setup, path: _Path, jn: Junctions, vj: Array,
          chord: bool) -> tuple[State, NDArray[np.bool_]]:
    """Limited Newton steps on the linearised bank; returns the state and which cases settled.

    A case leaves the iteration once its step is below tolerance; the working arrays shrink
    when a quarter of the cases still in them are done, so stragglers cost little. The
    arithmetic runs in place: at 10⁶ junctions, memory traffic is the cost.

    With ``chord`` (a cold start at the test current) the first step linearises each LED by
    its chord over the decade below i_test rather than its tangent: the currents of a bank
    spread over about that decade, and the tangent's small resistance makes the first step
    drive the high-Vf LEDs to near zero, from where they climb back a step at a time.
    """
    topo, current_driven = setup.layout, setup.circuit.current_driven
    out_vj, out_i, out_v = np.empty_like(vj), np.empty_like(path.r_branch), np.empty(vj.shape[0])
    settled = np.zeros(vj.shape[0], dtype=bool)
    w = _Work.of(path, jn)
    vj = vj.copy()
    e, f, other, admittance = (np.empty_like(vj), np.empty_like(vj), np.empty_like(vj),
                               np.empty_like(w.r_branch))
    with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
        for step_number in range(_FAST_STEPS):
            np.multiply(vj, w.inv_a, out=e)
            e += w.ln_is
            np.exp(e, out=e)  # Is·exp(Vj/a)
            np.multiply(vj, GMIN, out=f)
            f += e
            f -= w.i_s  # junction current
            rd = e  # reused: 1/gd = a/(Is·exp(Vj/a) + GMIN·a)
            rd += w.gmin_a
            np.divide(w.a, rd, out=rd)
            if chord and step_number == 0:
                rd *= _CHORD
            knee = np.multiply(f, rd, out=other)
            np.subtract(vj, knee, out=knee)
            knee = topo.per_branch(knee)
            y = np.add(topo.per_branch(rd), w.r_branch, out=admittance)
            np.reciprocal(y, out=y)
            sy, syc = y.sum(axis=1), np.einsum("ij,ij->i", y, knee)
            if current_driven:
                v = (w.source + syc) / sy
            else:
                v = (w.source + w.r_common * syc) / (1.0 + w.r_common * sy)
            i_k = np.subtract(v[:, None], knee, out=knee)
            i_k *= y
            i_j = topo.to_leds(i_k)
            # The exponential alone needs more voltage than the junction (exponential plus
            # GMIN) for a positive current, and 0 V ≥ the root for a negative one; so does the
            # tangent step, by convexity. The smaller of the two bounds is the update.
            f -= i_j
            f *= rd  # f is now the tangent step, negated
            exponential = np.abs(i_j, out=rd)
            exponential *= w.inv_is
            np.log1p(exponential, out=exponential)
            exponential *= w.a
            exponential -= vj
            step = np.fmin(np.negative(f, out=f), exponential, out=f)
            vj += step
            np.abs(step, out=step)
            done = step.max(axis=1) <= 1e-7 + 1e-12 * np.abs(v)
            last = step_number == _FAST_STEPS - 1
            if done.any() or last:
                write = np.ones_like(done) if last else done
                rows = w.rows[write]
                out_vj[rows], out_i[rows], out_v[rows] = vj[write], i_k[write], v[write]
                settled[w.rows[done]] = True
                if done.all():
                    break
                if done.mean() >= 0.25:
                    keep = ~done
                    w, vj = w.take(keep), vj[keep]
                    e, f, other, admittance = (np.empty_like(vj), np.empty_like(vj),
                                               np.empty_like(vj), np.empty_like(w.r_branch))
    finite = np.all(np.isfinite(out_vj), axis=1) & np.isfinite(out_v)
    return State(vj=out_vj, branch_current=out_i, node_voltage=out_v), settled & finite


def _branch_solve(setup: Setup, jn: Junctions, r_branch: Array, v: Array,
                  i: Array) -> tuple[Array, Array, Array]:
    """Each branch's current at node voltage ``v``: (current, junction voltages, dV/dI)."""
    topo = setup.layout
    for _ in range(_INNER_STEPS):
        vj = jn.voltage(topo.to_leds(i))
        slope = topo.per_branch(1.0 / jn.conductance(vj)) + r_branch
        step = (v[:, None] - topo.per_branch(vj) - r_branch * i) / slope
        i = i + step
        if np.all(np.abs(step) <= 1e-13 * np.abs(i) + 1e-30):
            break
    vj = jn.voltage(topo.to_leds(i))
    return i, vj, topo.per_branch(1.0 / jn.conductance(vj)) + r_branch


def _bracketed(setup: Setup, path: _Path, jn: Junctions, guess: Array) -> State:
    """Safeguarded Newton-bisection on the node voltage; converges for every case."""
    topo = setup.layout
    k = len(topo.counts)
    if setup.circuit.current_driven:
        share = np.broadcast_to((path.source / k)[:, None], path.r_branch.shape)
        heads = topo.per_branch(jn.voltage(topo.to_leds(share))) + path.r_branch * share
        lo, hi = heads.min(axis=1), heads.max(axis=1)
    else:
        lo, hi = np.minimum(path.source, 0.0), np.maximum(path.source, 0.0)
    fixed = (path.r_common == 0) & (not setup.circuit.current_driven)
    lo, hi = np.where(fixed, path.source, lo), np.where(fixed, path.source, hi)
    v = np.where(np.isfinite(guess) & (guess >= lo) & (guess <= hi), guess, 0.5 * (lo + hi))
    i = np.zeros_like(path.r_branch)
    last_step = hi - lo
    for _ in range(_OUTER_STEPS):
        i, vj, slope = _branch_solve(setup, jn, path.r_branch, v, i)
        admittance = (1.0 / slope).sum(axis=1)
        if setup.circuit.current_driven:
            residual = i.sum(axis=1) - path.source
        else:
            with np.errstate(divide="ignore", invalid="ignore"):
                residual = np.where(fixed, 0.0,
                                    i.sum(axis=1) - (path.source - v) / path.r_common)
                admittance = admittance + 1.0 / path.r_common
        lo = np.where(residual < 0, v, lo)
        hi = np.where(residual > 0, v, hi)
        newton = v - residual / admittance
        bisect = ~((newton > lo) & (newton < hi)) | (np.abs(newton - v) > 0.5 * last_step)
        new = np.where(residual == 0, v, np.where(bisect, 0.5 * (lo + hi), newton))
        last_step = np.abs(new - v)
        v = new
        tol = 1e-14 * (1.0 + np.abs(v))
        if np.all((last_step <= tol) | (hi - lo <= tol)):
            break
    i, vj, _ = _branch_solve(setup, jn, path.r_branch, v, i)
    return State(vj=vj, branch_current=i, node_voltage=v)


@dataclass(frozen=True)
class Linearised:
    """The bank linearised at a solution: each branch a knee voltage behind a resistance.

    A voltage e_m inserted in branch m moves branch k's current by
    ∂I_k/∂e_m = y_k·(share_m − [k = m]): the branch's own loop, and the node's response.
    """

    y: Array  # (S, K) branch admittance, 1/(R_k + Σ r_d)
    share: Array  # (S, K) ∂V_node/∂e_m
    rd: Array  # (S, L) junction dynamic resistances

    @classmethod
    def at(cls, setup: Setup, cases: Cases, jn: Junctions, state: State) -> Linearised:
        path, topo = _Path.of(setup, cases), setup.layout
        rd = 1.0 / jn.conductance(state.vj)
        y = 1.0 / (topo.per_branch(rd) + path.r_branch)
        if setup.circuit.current_driven:
            share = y / y.sum(axis=1, keepdims=True)
        else:
            rc = path.r_common[:, None]
            share = rc * y / (1.0 + rc * y.sum(axis=1, keepdims=True))
        return cls(y=y, share=share, rd=rd)


def start_voltages(table: LedTable, jn: Junctions) -> Array:
    """Each junction's voltage at its LED's test current: where the fast path starts."""
    return jn.a * np.log1p(table.i_test / jn.i_s)


def solve_state(setup: Setup, cases: Cases, jn: Junctions, start: Array | None = None) -> State:
    """Solve every case at the junction parameters ``jn``, starting from junction voltages ``start``."""
    path = _Path.of(setup, cases)
    if start is None:
        state, settled = _fast(setup, path, jn, start_voltages(setup.table, jn), chord=True)
    else:
        state, settled = _fast(setup, path, jn, start, chord=False)
    if settled.all():
        return state
    redo = ~settled
    sub_path = _Path(r_common=path.r_common[redo], source=path.source[redo],
                     r_branch=path.r_branch[redo])
    fixed = _bracketed(setup, sub_path, jn.take(redo), state.node_voltage[redo])
    vj, i_k, v = state.vj.copy(), state.branch_current.copy(), state.node_voltage.copy()
    vj[redo], i_k[redo], v[redo] = fixed.vj, fixed.branch_current, fixed.node_voltage
    return State(vj=vj, branch_current=i_k, node_voltage=v)


def _read_only(x: NDArray[Any]) -> NDArray[Any]:
    """Mark a result array read-only; results are built from fresh arrays, so none is copied."""
    x.setflags(write=False)
    return x


@dataclass(frozen=True)
class OperatingPoint:
    """One solved case: per LED (L), per branch (K) and circuit-wide values."""

    led_current: Array  # A
    led_voltage: Array  # V across the LED (junction plus series resistance)
    led_power: Array  # W, all of it heat (field-facts §6: P_heat ≤ Vf·I)
    tj: Array  # °C
    branch_current: Array  # A
    branch_resistor_power: Array  # W in each branch's balancing resistor
    node_voltage: float  # V across the bank
    common_current: float  # A in the common path
    ballast_power: float  # W in r_series
    switch_power: float  # W in the switch (on-resistance and fixed drop)
    source_voltage: float  # V the drive presents: the supply, or the compliance a current needs
    settled: bool  # False when self-heating found no steady state (thermal runaway)


@dataclass(frozen=True)
class Solution:
    """S solved cases: arrays (S,), (S, L) or (S, K), all read-only."""

    led_current: Array
    led_voltage: Array
    led_power: Array
    tj: Array
    branch_current: Array
    branch_resistor_power: Array
    node_voltage: Array
    common_current: Array
    ballast_power: Array
    switch_power: Array
    source_voltage: Array
    settled: NDArray[np.bool_]
    vj: Array  # junction voltages, (S, L): the warm start for a related solve

    @classmethod
    def of(cls, setup: Setup, cases: Cases, state: State, tj: Array,
           settled: NDArray[np.bool_] | None = None) -> Solution:
        i_k = state.branch_current
        if not np.all(np.isfinite(i_k)) or not np.all(np.isfinite(state.vj)):
            raise ModelError("the circuit's values are out of the range the model can solve")
        i_led = setup.layout.to_leds(i_k)
        v_led = state.vj + setup.table.r_s * i_led
        common = i_k.sum(axis=1)
        path = _Path.of(setup, cases)
        values: dict[str, NDArray[Any]] = {
            "led_current": i_led,
            "led_voltage": v_led,
            "led_power": v_led * i_led,
            "tj": tj,
            "branch_current": i_k,
            "branch_resistor_power": i_k**2 * cases.r_branch,
            "node_voltage": state.node_voltage,
            "common_current": common,
            "ballast_power": common**2 * cases.r_series,
            "switch_power": common**2 * cases.r_switch + cases.v_switch * common,
            "source_voltage": (state.node_voltage + common * path.r_common + cases.v_switch
                               if setup.circuit.current_driven else cases.drive),
            "settled": np.ones(cases.size, dtype=bool) if settled is None else settled,
            "vj": state.vj,
        }
        return cls(**{name: _read_only(np.asarray(x)) for name, x in values.items()})

    def point(self, s: int) -> OperatingPoint:
        """The operating point of case ``s``."""
        return OperatingPoint(**{
            f.name: (getattr(self, f.name)[s] if getattr(self, f.name).ndim == 2
                     else getattr(self, f.name)[s].item())
            for f in fields(OperatingPoint)
        })

    def take(self, index: ArrayLike) -> Solution:
        values: dict[str, NDArray[Any]] = {f.name: getattr(self, f.name)[index] for f in fields(self)}
        return Solution(**{name: _read_only(x) for name, x in values.items()})


def solve(circuit: Circuit, cases: Cases) -> Solution:
    """Solve ``circuit`` for every case at the junction temperatures the cases give (no self-heating)."""
    setup = Setup.of(circuit)
    setup.check(cases)
    jn = Junctions.at(setup.table, cases.vf, cases.tj)
    return Solution.of(setup, cases, solve_state(setup, cases, jn), cases.tj)


def shape_key(circuit: Circuit) -> tuple[object, ...]:
    """Circuits with equal keys differ only in what the cases carry: they can share one solve."""
    return (tuple(len(b.leds) for b in circuit.branches), circuit.current_driven, circuit.r_source,
            tuple((d.i_test, d.n, d.r_s, d.tc, d.xti, d.t_test, d.rth or 0.0) for d in circuit.leds))


def groups(circuits: Sequence[Circuit]) -> list[list[Circuit]]:
    """The distinct circuits, grouped by shape."""
    by_shape: dict[tuple[object, ...], list[Circuit]] = {}
    for c in dict.fromkeys(circuits):
        by_shape.setdefault(shape_key(c), []).append(c)
    return list(by_shape.values())


def concat(cases: Sequence[Cases]) -> Cases:
    return Cases(**{f.name: np.concatenate([getattr(c, f.name) for c in cases]) for f in fields(Cases)})
