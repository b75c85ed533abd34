"""What each part contributes to a circuit's solve (an LED's model, a resistor's range, a switch's
drop) and the per-part results read off a solve, shared by every kind's analysis."""

from __future__ import annotations

import zlib
from dataclasses import replace
from functools import lru_cache

import numpy as np

from ledlint.analysis.results import LedResult, ResistorResult, ResistorRole, Sharing
from ledlint.circuits.circuit import LedCircuit, Wired
from ledlint.circuits.graph import NetGraph
from ledlint.circuits.topology import Element, ElementKind
from ledlint.config import Config
from ledlint.engine import Circuit as EngineCircuit
from ledlint.engine import Corners, LedSpec, ModelError, fit_points, forward_voltage, monte_carlo
from ledlint.netlist.model import Component
from ledlint.parts.devices import R_DS_ON, V_DIODE, VCE_SAT
from ledlint.parts.kinds import Kind
from ledlint.parts.params import LedParams, Missing, Param, ResistorParams, known, led_params, resistor_params
from ledlint.quantities.ranges import Range

MC_SAMPLES = 2000  # per bank in a check; the benchmark runs 10,000
# Samples times LEDs in one Monte Carlo: the memory of its solve, about 100 bytes a cell. A bank
# of more than 500 LEDs gets fewer samples (100 at the least), and its findings say how many.
MC_CELLS = 1_000_000
MC_LEAST = 100


class Parts:
    """A board's parts and parameters as the analysis asks for them, each worked out once."""

    def __init__(self, graph: NetGraph, config: Config) -> None:
        self.graph, self.config = graph, config
        self.ambient = Range(min(max(25.0, config.ambient_min_c), config.ambient_max_c), config.ambient_min_c,
                             config.ambient_max_c)
        self._leds: dict[tuple[str, str], LedParams] = {}
        self._resistors: dict[str, ResistorParams] = {}

    def comp(self, ref: str) -> Component:
        c = self.graph.component(ref)
        assert c is not None, ref
        return c

    def leds_of(self, elements: tuple[Element, ...]) -> list[LedParams]:
        """The LED dies among elements, with their parameters (fitted to Vf points where given)."""
        out = []
        for e in elements:
            if e.kind is ElementKind.LED:
                key = (e.ref, e.die)
                if key not in self._leds:
                    self._leds[key] = _fitted(led_params(self.comp(e.ref), self.config, e.die))
                out.append(self._leds[key])
        return out

    def resistor(self, ref: str) -> ResistorParams:
        if ref not in self._resistors:
            self._resistors[ref] = resistor_params(self.comp(ref), self.config)
        return self._resistors[ref]

    def resistors_of(self, elements: tuple[Element, ...]) -> list[ResistorParams]:
        return [self.resistor(e.ref) for e in elements if e.kind is ElementKind.RESISTOR]


def path_elements(c: Wired) -> tuple[Element, ...]:
    """Every element, the common path first: the order the notes on them are written in."""
    return c.top + c.bottom + tuple(e for b in c.branches for e in b.elements)


def led_spec(p: LedParams) -> LedSpec:
    """The engine's model of an LED whose parameters are complete."""
    return LedSpec(vf=Range(known(p.vf), known(p.vf_min), known(p.vf_max)), i_test=p.i_test.value, n=p.n,
                   r_s=p.r_s, tc=p.tc.value, rth=p.rth.value if p.rth else None)


def resistance(params: list[ResistorParams]) -> Range:
    """The series sum of resistors whose values are known, each over its tolerance."""
    total = Range.fixed(0.0)
    for p in params:
        total = total + Range.tolerance(known(p.resistance), p.tolerance.value)
    return total


def path_drops(elements: tuple[Element, ...], assumptions: list[str]) -> tuple[Range, Range]:
    """Fixed drops (BJT saturation, diodes) and resistance (MOSFET) of non-resistor elements."""
    v, r = Range.fixed(0.0), Range.fixed(0.0)
    for e in elements:
        if e.kind is ElementKind.SWITCH:
            if e.part in (Kind.NPN, Kind.PNP):
                v = v + VCE_SAT
                assumptions.append(f"{e.ref} saturated: V_CE {VCE_SAT.minimum:g}-{VCE_SAT.maximum:g} V "
                                   "(small-signal BJT, common practice)")
            else:
                r = r + R_DS_ON
                assumptions.append(f"{e.ref} on: R_DS(on) up to {R_DS_ON.maximum:g} Ω (small-signal MOSFET)")
            if e.assumption:
                assumptions.append(f"{e.ref}: {e.assumption}")
        elif e.kind is ElementKind.DIODE:
            v = v + V_DIODE
            assumptions.append(f"{e.ref} in series: {V_DIODE.minimum:g}-{V_DIODE.maximum:g} V forward drop")
    return v, r


def _fitted(p: LedParams) -> LedParams:
    """An LED whose Vf field gives several points: its ideality and series resistance fitted to
    them (two points fit Rs with the technology's n, three or more fit both)."""
    if len(p.curve) < 2:
        return p
    try:
        fit = fit_points(p.curve, n=None if len(p.curve) >= 3 else p.n)
    except ModelError as exc:
        raise ModelError(f"{p.id}'s Vf points: {exc.message}") from None
    return replace(p, n=fit.n, r_s=fit.r_s)


def seed(c: LedCircuit) -> int:
    """The Monte Carlo seed of a circuit: the same circuit draws the same samples in every run."""
    return zlib.crc32(c.id.encode())


def led_results(cor: Corners, flat: list[LedParams]) -> list[LedResult]:
    nominal, tj_max, reverse = cor.nominal, cor.tj_max, cor.led_voltage_min
    high, low = cor.led_current_max, cor.led_current_min
    out = []
    for j, p in enumerate(flat):
        i_nom = float(nominal.led_current[j])
        out.append(LedResult(p.id, p, Range(i_nom, min(float(low[j]), i_nom), max(float(high[j]), i_nom)),
                             float(nominal.led_voltage[j]), float(tj_max[j]), max(0.0, -float(reverse[j])),
                             float(cor.min_current.led_current[j])))
    return out


def guarded(elements: tuple[Element, ...], results: tuple[LedResult, ...], notes: list[str]) -> tuple[LedResult, ...]:
    """LEDs with an antiparallel diode see no more reverse voltage than its forward drop."""
    guards = {e.led: e.guard for e in elements if e.guard}
    if not guards:
        return results
    notes += [f"{g} across {led} takes its reverse voltage: at most {V_DIODE.maximum:g} V" for led, g in guards.items()]
    return tuple(replace(r, reverse_v=min(r.reverse_v, V_DIODE.maximum)) if r.id in guards else r for r in results)


def ac_average(r: ResistorResult, v_rms: float) -> ResistorResult:
    """A resistor's dissipation on an AC supply, averaged over the cycle: it never sees more than
    the supply's instantaneous voltage and conducts only in the forward half-cycle, so
    P ≤ V_rms² / 2R (the mean of v² over one half of a sine is V_rms²)."""
    if not isinstance(r.params.resistance, Param):
        return r
    r_min = r.params.resistance.value * (1 - r.params.tolerance.value)
    return replace(r, power_max=min(r.power_max, v_rms * v_rms / (2 * r_min))) if r_min > 0 else r


def ohms(rp: ResistorParams) -> bool:
    """Real resistance, or not known: a 0 Ω link is a wire, not a ballast."""
    return not isinstance(rp.resistance, Param) or rp.resistance.value > 0


def gaps(results: tuple[LedResult, ...] | list[LedResult],
         resistors: tuple[ResistorResult, ...] | list[ResistorResult] = ()) -> tuple[Missing, ...]:
    """What one check lacks while the rest ran: LED ratings that are not known (current-margin
    could not judge those LEDs), and fields set but unreadable, for which a default stood in."""
    unknown = [r.params.if_max for r in results if isinstance(r.params.if_max, Missing)]
    unread = [m for r in results for m in r.params.unreadable if m not in r.params.blocking]
    return tuple(dict.fromkeys(unknown + unread + [m for r in resistors for m in r.params.unreadable]))


def balancing(cor: Corners, branch_res: list[list[ResistorParams]], ambient: float) -> list[ResistorResult]:
    out = []
    currents, powers = cor.branch_current_max, cor.branch_resistor_power_max
    for k, rs in enumerate(branch_res):
        total = sum(x.resistance.value for x in rs if isinstance(x.resistance, Param))
        for rp in rs:
            if isinstance(rp.resistance, Param) and total > 0:
                out.append(ResistorResult(rp.ref, rp, ResistorRole.BALANCING, float(currents[k]),
                                          float(powers[k]) * rp.resistance.value / total, ambient))
    return out


def sharing(ec: EngineCircuit, cor: Corners, flat: list[LedParams], draw: int, equal_share: float) -> Sharing:
    samples = max(MC_LEAST, min(MC_SAMPLES, MC_CELLS // len(flat)))
    mc = monte_carlo(ec, samples=samples, seed=draw)
    peak = np.maximum(mc.current.maximum, cor.led_current_max)
    worst = int(np.argmax(peak))
    return Sharing(samples, draw, float(mc.spread_summary.p99), flat[worst].id, float(peak[worst]), equal_share)


def vf_max_at(p: LedParams, current: float, tj: float) -> float:
    return _forward(known(p.vf_max), p.i_test.value, p.n, p.r_s, p.tc.value, max(current, 1e-6), tj)


@lru_cache(maxsize=4096)  # boards repeat the same LED at the same current many times over
def _forward(vf: float, i_test: float, n: float, r_s: float, tc: float, current: float, tj: float) -> float:
    return float(forward_voltage(LedSpec(Range.fixed(vf), i_test, n, r_s, tc), current, tj))


def worst_per_ref(rs: list[ResistorResult]) -> list[ResistorResult]:
    best: dict[str, ResistorResult] = {}
    for r in rs:
        if r.ref not in best or r.power_max > best[r.ref].power_max:
            best[r.ref] = r
    return list(best.values())


def unique(items: list[Missing]) -> list[Missing]:
    seen, out = set(), []
    for m in items:
        key = (m.name, m.reason)
        if key not in seen:
            seen.add(key)
            out.append(m)
    return out
