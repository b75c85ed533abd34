"""Analysis: each recognised circuit's operating point over tolerance, supply and temperature.

Builds the engine's description of a circuit from the recogniser's topology and the parts'
parameters, solves its corners (and a Monte Carlo for parallel strings), and derives what the
rules compare with limits: per-LED current range, resistor dissipation, pin current, supply
headroom, reverse voltage, electro-thermal loop gain. Knows nothing of rules.
"""

from __future__ import annotations

import zlib
from functools import lru_cache
from dataclasses import KW_ONLY, dataclass, field, replace
from enum import Enum
from ledlint.frozen import FrozenMap
from typing import Mapping

import numpy as np

from ledlint.config import Config
from ledlint.analysis.drive import NO_SENSE, VCE_SAT, SwitchDrive, SetCurrent, switch_drives, driver_current, sink_current
from ledlint.engine import Branch as EBranch
from ledlint.engine import Circuit as ECircuit
from ledlint.analysis.batch import Job, solve_all
from ledlint.engine import Corners, LedSpec, ModelError, Range, Solution, fit_points, forward_voltage, monte_carlo
from ledlint.circuits.graph import NetGraph
from ledlint.netlist.model import Component, Netlist, Pin
from ledlint.parts.params import (LedParams, known, Missing, Param, ResistorParams, led_params, pin_limit,
                            rail_params, resistor_params)
from ledlint.parts.kinds import Kind
from ledlint.circuits.recognise import CircuitKind, LedCircuit, ReferenceKind, recognise
from ledlint.analysis.supplies import SQRT2, Supply, cautions, circuit_supply, end_voltage, ic_supply, rail_of
from ledlint.circuits.topology import Element, ElementKind, Terminal, TerminalKind

# Switch drops: a saturated BJT (VCE_SAT) and a small-signal MOSFET's on-resistance,
# ≤ 7.5 Ω at V_GS = 5 V (field-facts §9, 2N7002); a silicon diode in series at a few mA.
R_DS_ON = Range(2.0, 0.0, 7.5)
V_DIODE = Range(0.7, 0.6, 1.0)
MC_SAMPLES = 2000  # per bank in a check; the benchmark runs 10,000


@dataclass(frozen=True)
class LedResult:
    id: str
    params: LedParams
    current: Range  # A over the corners (nominal, least, most)
    vf: float  # V at the nominal corner
    tj_max: float  # °C
    reverse_v: float = 0.0  # the most reverse voltage it can see, ≥ 0
    low: float = 0.0  # A at the low corner (least supply, most resistance, every LED at Vf max, cold)


class ResistorRole(Enum):
    BALLAST = "ballast"  # sets a voltage-driven string's current
    BALANCING = "balancing"  # evens the split between parallel strings
    SENSE = "sense"  # a current sink's or driver's feedback resistor


@dataclass(frozen=True)
class ResistorResult:
    ref: str
    params: ResistorParams
    role: ResistorRole
    current_max: float
    power_max: float  # W at its worst corner
    ambient_max: float


@dataclass(frozen=True)
class PinResult:
    pin: Pin
    limit: Param
    current_max: float
    sourcing: bool
    base: SwitchDrive | None = None  # the pin drives a switch's base rather than the LEDs themselves


@dataclass(frozen=True)
class Sharing:
    """How strings in parallel share: Monte Carlo and the hogging corners."""

    samples: int
    seed: int  # of its random draws: a re-run with the same seed and circuit gives the same split
    spread_p99: float  # (max − min)/mean of the per-sample split, 99th percentile
    worst_led: str
    worst_current: float  # A, the most any one LED reaches in any sample or corner
    equal_share: float  # A, total / strings at nominal


@dataclass(frozen=True)
class Analysis:
    circuit: LedCircuit
    _: KW_ONLY  # seventeen fields: by name only
    solved: bool = False
    missing: tuple[Missing, ...] = ()
    assumptions: tuple[str, ...] = ()
    supply: Supply | None = None
    set_current: SetCurrent | None = None
    leds: tuple[LedResult, ...] = ()
    resistors: tuple[ResistorResult, ...] = ()
    pins: tuple[PinResult, ...] = ()
    nominal_current: float | None = None  # per LED (a bank: the equal share)
    headroom_v: float | None = None
    min_ratio: float | None = None  # least current at the low corner / nominal, worst LED
    sharing: Sharing | None = None
    loop_gain: float | None = None
    unlimited: bool = False
    ambiguity: str = ""
    engine: tuple[ECircuit, ...] = ()  # the engine's circuits, one per string lit alone or one in all
    gaps: tuple[Missing, ...] = ()  # what one check lacks while the rest ran (an LED's unknown If_max)
    ambient_basis: str = ""  # the ambient range the corners span, and where it comes from
    rail: str = ""  # the rail net the current comes from (a driver pin's: its IC's supply)
    drives: tuple[SwitchDrive, ...] = ()  # the pins that switch its transistors

    @property
    def reversed(self) -> bool:
        """Solved, and the supply is never positive across it: fitted or powered backwards."""
        return self.solved and self.supply is not None and self.supply.volts.maximum <= 0


@dataclass(frozen=True)
class BoardAnalysis:
    netlist: Netlist
    circuits: tuple[LedCircuit, ...]
    analyses: tuple[Analysis, ...]
    cautions: tuple[str, ...]  # safety: mains or high voltage seen on the board
    parts: Mapping[str, Component] = field(default_factory=lambda: FrozenMap({}))


class _Context:
    def __init__(self, netlist: Netlist, graph: NetGraph, config: Config) -> None:
        self.netlist, self.graph, self.config = netlist, graph, config
        amb_nom = min(max(25.0, config.ambient_min_c), config.ambient_max_c)
        self.ambient = Range(amb_nom, config.ambient_min_c, config.ambient_max_c)

    def comp(self, ref: str) -> Component:
        c = self.graph.component(ref)
        assert c is not None
        return c

    def led_spec(self, p: LedParams) -> LedSpec:
        vf = Range(p.vf.value, p.vf_min.value, p.vf_max.value)  # type: ignore[union-attr]
        return LedSpec(vf=vf, i_test=p.i_test.value, n=p.n, r_s=p.r_s, tc=p.tc.value,
                       rth=p.rth.value if p.rth else None)


def _resistance(params: list[ResistorParams]) -> Range:
    total = Range.fixed(0.0)
    for p in params:
        r = p.resistance.value  # type: ignore[union-attr]
        total = total + Range.tolerance(r, p.tolerance.value)
    return total


def _path_drops(elements: tuple[Element, ...], assumptions: list[str]) -> tuple[Range, Range]:
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


def _seed(c: LedCircuit) -> int:
    return zlib.crc32(c.id.encode())


class _Analyser:
    def __init__(self, ctx: _Context) -> None:
        self.ctx = ctx

    def led_params_of(self, elements: tuple[Element, ...]) -> list[LedParams]:
        return [_fitted(led_params(self.ctx.comp(e.ref), self.ctx.config, e.die)) for e in elements
                if e.kind is ElementKind.LED]

    def run(self, c: LedCircuit) -> Analysis | Job[Analysis]:
        """An Analysis, or a generator that yields the engine circuits it needs solved first."""
        if c.kind in (CircuitKind.STRING, CircuitKind.BANK) and not c.blocked:
            return self.voltage_driven(c)
        if c.blocked:
            return self.blocked(c)
        if c.kind in (CircuitKind.SINK, CircuitKind.DRIVER):
            return self.current_driven(c)
        return Analysis(c)

    # -------------------------------------------------------------- voltage drive
    def voltage_driven(self, c: LedCircuit) -> Job[Analysis]:
        missing: list[Missing] = []
        assumptions: list[str] = []
        branch_leds = [self.led_params_of(b.elements) for b in c.branches]
        all_leds = [p for ps in branch_leds for p in ps]
        ambiguity = "; ".join(sorted({f"{p.id}: {p.ambiguity}" for p in all_leds if p.ambiguity}))
        for p in all_leds:
            missing += list(p.blocking) + [m for m in (p.vf, p.vf_max, p.vf_min) if isinstance(m, Missing)][:1]
        common = c.top + c.bottom + (c.branches[0].elements if c.kind is CircuitKind.STRING else ())
        common_res = [self.resistor(e) for e in common if e.kind is ElementKind.RESISTOR]
        branch_res = [[self.resistor(e) for e in b.elements if e.kind is ElementKind.RESISTOR]
                      for b in c.branches] if c.kind is CircuitKind.BANK else [[] for _ in c.branches]
        for rp in common_res + [r for rs in branch_res for r in rs]:
            missing += [rp.resistance] if isinstance(rp.resistance, Missing) else []
        # A 0 Ω link is a wire, not a ballast: only real resistance limits the current.
        limited = any(_ohms(r) for r in common_res) or all(any(_ohms(r) for r in rs) for rs in branch_res)
        # Lit alone when each string has its own driver pin; otherwise all together.
        if c.individually_driven:
            problems = [(c.source or b.far, c.ret or b.far, [k]) for k, b in enumerate(c.branches)]
            assumptions.append("each string is switched by its own pin: analysed as if lit alone")
        else:
            problems = [(c.source, c.ret, list(range(len(c.branches))))]
        supplies = [circuit_supply(self.ctx.graph, self.ctx.config, src, ret, missing) for src, ret, _ in problems]
        pin_end = any(t is not None and t.kind is TerminalKind.PIN for src, ret, _ in problems for t in (src, ret))
        unlimited = not limited and not pin_end
        missing = _unique(missing)
        first_supply = next((s[0] for s in supplies if s), None)
        if missing or any(s is None for s in supplies):
            return Analysis(c, missing=tuple(missing), supply=first_supply, unlimited=unlimited, ambiguity=ambiguity)
        v_sw, r_sw = _path_drops(_all_elements(c), assumptions)
        rc = _resistance(common_res)
        plans = []
        for (src, ret, ks), sup in zip(problems, supplies):
            supply, r_pin = sup  # type: ignore[misc]
            leds, res = [branch_leds[k] for k in ks], [branch_res[k] for k in ks]
            ebranches = tuple(EBranch(tuple(self.ctx.led_spec(p) for p in ps), _resistance(rs))
                              for ps, rs in zip(leds, res))
            ec = ECircuit(ebranches, supply=supply.volts, r_series=rc, r_switch=r_pin + r_sw, v_switch=v_sw,
                          ambient=self.ctx.ambient)
            plans.append((src, ret, ec, leds, res))
        answers = yield [(ec, True) for _, _, ec, _, _ in plans]
        solved = [self.solve_voltage(c, src, ret, ec, cor, gain, common_res, leds, res)
                  for (src, ret, ec, leds, res), (cor, gain) in zip(plans, answers)]
        engines = tuple(s.engine for s in solved)
        results = tuple(r for s in solved for r in s.leds)
        resistors = tuple(_worst_per_ref([r for s in solved for r in s.resistors]))
        reverse = max(s[0].reverse_peak for s in supplies if s)
        if reverse > 0:
            resistors = tuple(_ac_average(r, reverse / SQRT2) for r in resistors)
            assumptions.append("AC supply: resistor dissipation averaged over the cycle, at most V_rms² / 2R")
            series = [e.ref for e in _all_elements(c) if e.kind is ElementKind.DIODE]
            if series:
                assumptions.append(f"AC supply: {', '.join(series)} in series takes the reverse half-cycle, "
                                   f"{reverse:.3g} V (its leakage is far below an LED's, common practice)")
            else:
                # Leakage decides how a string shares the reverse half-cycle: one LED may take it all.
                results = tuple(replace(r, reverse_v=max(r.reverse_v, reverse)) for r in results)
                assumptions.append("AC supply: the whole reverse peak may fall on one LED (leakage decides)")
        results = _guarded(c, results, assumptions)
        drives = tuple(switch_drives(c, self.ctx.graph, self.ctx.config))
        pins = tuple(p for s in solved for p in s.pins) + tuple(
            PinResult(b.pin, pin_limit(self.ctx.comp(b.pin.ref), self.ctx.config), b.current.maximum, b.sourcing, b)
            for b in drives if b.current is not None)
        gains = [s.loop_gain for s in solved if s.loop_gain is not None]
        return Analysis(c, solved=True, assumptions=tuple(dict.fromkeys(assumptions)), supply=first_supply,
                        leds=results, resistors=resistors, pins=pins,
                        nominal_current=max(s.nominal for s in solved), headroom_v=min(s.headroom for s in solved),
                        min_ratio=min(s.min_ratio for s in solved),
                        sharing=solved[0].sharing if len(solved) == 1 else None,
                        loop_gain=max(gains) if gains else None, unlimited=unlimited, ambiguity=ambiguity,
                        engine=engines, gaps=_gaps(results, resistors), drives=drives)

    def resistor(self, e: Element) -> ResistorParams:
        return resistor_params(self.ctx.comp(e.ref), self.ctx.config)

    def solve_voltage(self, c: LedCircuit, src: Terminal | None, ret: Terminal | None, ec: ECircuit, cor: Corners,
                      gain: float | None, common_res: list[ResistorParams], branch_leds: list[list[LedParams]],
                      branch_res: list[list[ResistorParams]]) -> _Solved:
        """Per-LED currents, resistor dissipation, pin currents and headroom of one solved circuit."""
        rc, volts, v_sw = ec.r_series, ec.supply, ec.v_switch
        assert volts is not None
        sol = cor.solution
        flat = [p for ps in branch_leds for p in ps]
        results = _led_results(cor, flat)
        amb = self.ctx.ambient.maximum
        i_common = np.abs(sol.common_current)
        resistors = []
        for rp in common_res:  # in the corners every common resistor sits at the same tolerance end
            share = rp.resistance.value / rc.nominal if rc.nominal > 0 else 0.0  # type: ignore[union-attr]
            power = float((sol.common_current ** 2 * cor.cases.r_series * share).max())
            resistors.append(ResistorResult(rp.ref, rp, ResistorRole.BALLAST, float(i_common.max()), power, amb))
        resistors += _balancing(sol, branch_res, amb)
        pins = []
        for t, sourcing in ((src, True), (ret, False)):
            if t is not None and t.kind is TerminalKind.PIN and t.pin is not None:
                ic = self.ctx.comp(t.pin.ref)
                pins.append(PinResult(t.pin, pin_limit(ic, self.ctx.config), float(i_common.max()), sourcing))
        # Headroom: what is left for the ballast at the low corner if the LEDs ran at nominal current.
        nominal = cor.nominal
        worst_string = max(sum(_vf_max_at(p, float(nominal.branch_current[k]), self.ctx.ambient.minimum) for p in ps)
                           for k, ps in enumerate(branch_leds))
        headroom = volts.minimum - v_sw.maximum - worst_string
        ratio = min(r.low / max(r.current.nominal, 1e-15) for r in results)
        sharing = None
        per_led = float(nominal.led_current.mean())
        if len(ec.branches) >= 2:
            sharing = _sharing(ec, cor, flat, _seed(c), float(nominal.common_current) / len(ec.branches))
            per_led = sharing.equal_share
        return _Solved(tuple(results), tuple(resistors), tuple(pins), headroom, ratio, gain, sharing, per_led, ec)

    # -------------------------------------------------------------- blocked
    def blocked(self, c: LedCircuit) -> Analysis:
        missing: list[Missing] = []
        sup = circuit_supply(self.ctx.graph, self.ctx.config, c.source, c.ret, missing)
        leds = self.led_params_of(c.branches[0].elements)
        opposed = {e.id for e in c.branches[0].elements if e.kind is ElementKind.LED and e.against}
        if sup is None:
            return Analysis(c, missing=tuple(missing))
        worst = max(abs(sup[0].volts.maximum), abs(sup[0].volts.minimum))
        results = tuple(LedResult(p.id, p, Range.fixed(0.0), 0.0, self.ctx.ambient.maximum,
                                  worst if (p.id in opposed) == (sup[0].volts.maximum >= 0) else 0.0) for p in leds)
        leakage = ("the whole supply may fall on one reversed LED (leakage decides)",) if opposed else ()
        return Analysis(c, solved=True, assumptions=leakage, supply=sup[0], leds=results)

    # -------------------------------------------------------------- current drive
    def current_driven(self, c: LedCircuit) -> Job[Analysis]:
        rail = None
        if c.sink is not None:
            ref = c.sink.reference
            if ref.kind is ReferenceKind.PIN and ref.pin is not None:
                got = ic_supply(self.ctx.comp(ref.pin.ref), self.ctx.config)
                rail = got.volts if got else None
            elif ref.rail:
                r = rail_params(ref.rail, self.ctx.config)
                rail = Range(r.nominal, r.minimum, r.maximum) if r else None
            setc, missing, notes = sink_current(c.sink, self.ctx.graph, self.ctx.config, self.ctx.ambient, rail)
        else:
            assert c.driver is not None
            setc, missing, notes = driver_current(c.driver, self.ctx.graph, self.ctx.config)
        branch_leds = [self.led_params_of(b.elements) for b in c.branches]
        flat = [p for ps in branch_leds for p in ps]
        ambiguity = "; ".join(sorted({f"{p.id}: {p.ambiguity}" for p in flat if p.ambiguity}))
        unknown = [m for p in flat for m in p.blocking] + [m for p in flat for m in (p.vf,)
                                                              if isinstance(m, Missing)][:1]
        if unknown:
            # The split between strings depends on the Vf spread more than on Vf itself: with the
            # LED type unknown, 2.0 V ±10 % per LED stands in, and the findings say so.
            notes.append("LED type unknown: each LED taken as 2.0 V ±10 % at 20 mA for the current split")
        sup_missing: list[Missing] = []
        sup = self.driver_supply(c, setc, sup_missing)
        missing = _unique(missing + unknown + sup_missing)
        if setc is None:
            return Analysis(c, missing=tuple(missing), assumptions=tuple(notes), supply=sup[0] if sup else None,
                            ambiguity=ambiguity, unlimited=any(m.name == NO_SENSE for m in missing))
        res = [[self.resistor(e) for e in b.elements if e.kind is ElementKind.RESISTOR] for b in c.branches]
        if any(isinstance(r.resistance, Missing) for rs in res for r in rs):
            missing += [r.resistance for rs in res for r in rs if isinstance(r.resistance, Missing)]
            return Analysis(c, missing=tuple(missing), assumptions=tuple(notes), set_current=setc)
        specs = tuple(EBranch(tuple(self._spec_or_stand_in(p) for p in ps), _resistance(rs))
                      for ps, rs in zip(branch_leds, res))
        ec = ECircuit(specs, drive_current=setc.current, ambient=self.ctx.ambient)
        [(cor, _)] = yield [(ec, False)]
        amb = self.ctx.ambient.maximum
        resistors = []
        for sense_ref, ohms in setc.sense:
            # The sense voltage is what the loop holds, so P = V²/R: most at the highest V and least R.
            v = setc.sense_voltage.maximum
            power = v * v / ohms.minimum if v > 0 and ohms.minimum > 0 else setc.current.maximum ** 2 * ohms.maximum
            resistors.append(ResistorResult(sense_ref, resistor_params(self.ctx.comp(sense_ref), self.ctx.config),
                                            ResistorRole.SENSE, setc.current.maximum, power, amb))
        resistors += _balancing(cor.solution, res, amb)
        k = len(c.branches)
        sharing = _sharing(ec, cor, flat, _seed(c), setc.current.nominal / k) if k >= 2 else None
        # Headroom: the least input minus the highest string voltage at the set current (its LEDs
        # and its own series or balancing resistance), the sense voltage and the regulator's dropout.
        headroom = None
        if sup is not None and not unknown:
            share = setc.current.maximum / k
            worst = max(sum(_vf_max_at(p, share, self.ctx.ambient.minimum) for p in ps) + share * b.r.maximum
                        for ps, b in zip(branch_leds, specs))
            headroom = sup[0].volts.minimum - worst - setc.sense_voltage.maximum - setc.dropout.maximum
        results = _guarded(c, tuple(_led_results(cor, flat)), notes)
        return Analysis(c, solved=True, missing=tuple(missing), assumptions=tuple(dict.fromkeys(notes)),
                        supply=sup[0] if sup else None, set_current=setc, leds=results, resistors=tuple(resistors),
                        nominal_current=setc.current.nominal / k, headroom_v=headroom, sharing=sharing,
                        ambiguity=ambiguity, engine=(ec,), gaps=_gaps(results, resistors))

    def driver_supply(self, c: LedCircuit, setc: SetCurrent | None, missing: list[Missing]) -> tuple[Supply, Range] | None:
        """What a current output works from: the LEDs' own supply for a sink or linear driver (the
        output end is the regulator, not a pin at 0 V), the driver's input for a buck or boost."""
        if setc is not None and setc.kind in ("buck", "boost") and c.driver is not None:
            limits = dict(setc.limits)
            if "vin_min" in limits and "vin_max" in limits:
                lo, hi = limits["vin_min"], limits["vin_max"]
                return Supply(Range((lo + hi) / 2, lo, hi), (f"{c.driver.ref} input {lo:g}-{hi:g} V as described",)), \
                    Range.fixed(0.0)
            got = ic_supply(self.ctx.comp(c.driver.ref), self.ctx.config)
            if got is None:
                missing.append(Missing("input voltage", f"{c.driver.ref}'s input rail has no known voltage",
                                       f"give {c.driver.ref} vin_min and vin_max, or name its input rail's voltage"))
                return None
            return Supply(got.volts, (got.basis,)), Range.fixed(0.0)
        top = c.source if c.source is not None and c.source.kind is not TerminalKind.PIN else None
        if top is None:
            return None
        basis: list[str] = []
        end = end_voltage(self.ctx.graph, self.ctx.config, top, True, missing, basis)
        return (Supply(end[0], tuple(basis)), end[1]) if end else None

    def _spec_or_stand_in(self, p: LedParams) -> LedSpec:
        if p.complete:
            return self.ctx.led_spec(p)
        return LedSpec(Range.tolerance(2.0, 0.10), 0.020, 2.0, p.r_s, -0.002)


@dataclass(frozen=True)
class _Solved:
    leds: tuple[LedResult, ...]
    resistors: tuple[ResistorResult, ...]
    pins: tuple[PinResult, ...]
    headroom: float
    min_ratio: float
    loop_gain: float | None
    sharing: Sharing | None
    nominal: float
    engine: ECircuit


def _led_results(cor: Corners, flat: list[LedParams]) -> list[LedResult]:
    sol, nominal = cor.solution, cor.nominal
    out = []
    for j, p in enumerate(flat):
        i_nom = float(nominal.led_current[j])
        out.append(LedResult(p.id, p, Range(i_nom, min(float(cor.led_current_min[j]), i_nom),
                                            max(float(cor.led_current_max[j]), i_nom)),
                             float(nominal.led_voltage[j]), float(sol.tj[:, j].max()),
                             max(0.0, -float(sol.led_voltage[:, j].min())), float(cor.min_current.led_current[j])))
    return out


def _rail(graph: NetGraph, config: Config, c: LedCircuit) -> str:
    if c.kind is CircuitKind.ADDRESSABLE:  # the LEDs' own supply pins are on the source net
        return c.source.net if c.source else ""
    return rail_of(graph, config, [c.source, c.ret] + [b.far for b in c.branches])


def _all_elements(c: LedCircuit) -> tuple[Element, ...]:
    return c.top + c.bottom + tuple(e for b in c.branches for e in b.elements)


def _guarded(c: LedCircuit, results: tuple[LedResult, ...], notes: list[str]) -> tuple[LedResult, ...]:
    """LEDs with an antiparallel diode see no more reverse voltage than its forward drop."""
    guards = {e.id: e.guard for e in _all_elements(c) if e.guard}
    if not guards:
        return results
    notes += [f"{g} across {led} takes its reverse voltage: at most {V_DIODE.maximum:g} V" for led, g in guards.items()]
    return tuple(replace(r, reverse_v=min(r.reverse_v, V_DIODE.maximum)) if r.id in guards else r for r in results)


def _ac_average(r: ResistorResult, v_rms: float) -> ResistorResult:
    """A resistor's dissipation on an AC supply, averaged over the cycle: it never sees more than
    the supply's instantaneous voltage and conducts only in the forward half-cycle, so
    P ≤ V_rms² / 2R (the mean of v² over one half of a sine is V_rms²)."""
    if not isinstance(r.params.resistance, Param):
        return r
    r_min = r.params.resistance.value * (1 - r.params.tolerance.value)
    return replace(r, power_max=min(r.power_max, v_rms * v_rms / (2 * r_min))) if r_min > 0 else r


def _ohms(rp: ResistorParams) -> bool:
    return not isinstance(rp.resistance, Param) or rp.resistance.value > 0


def _gaps(results: tuple[LedResult, ...] | list[LedResult], resistors: tuple[ResistorResult, ...] | list[ResistorResult] = ()
          ) -> tuple[Missing, ...]:
    """What one check lacks while the rest ran: LED ratings that are not known (current-margin
    could not judge those LEDs), and fields set but unreadable, for which a default stood in."""
    unknown = [r.params.if_max for r in results if isinstance(r.params.if_max, Missing)]
    unread = [m for r in results for m in r.params.unreadable if m not in r.params.blocking]
    return tuple(dict.fromkeys(unknown + unread + [m for r in resistors for m in r.params.unreadable]))


def _balancing(sol: Solution, branch_res: list[list[ResistorParams]], ambient: float) -> list[ResistorResult]:
    out = []
    for k, rs in enumerate(branch_res):
        total = sum(x.resistance.value for x in rs if isinstance(x.resistance, Param))
        for rp in rs:
            if isinstance(rp.resistance, Param) and total > 0:
                out.append(ResistorResult(rp.ref, rp, ResistorRole.BALANCING, float(sol.branch_current[:, k].max()),
                                          float(sol.branch_resistor_power[:, k].max()) * rp.resistance.value / total,
                                          ambient))
    return out


def _sharing(ec: ECircuit, cor: Corners, flat: list[LedParams], seed: int, equal_share: float) -> Sharing:
    mc = monte_carlo(ec, samples=MC_SAMPLES, seed=seed)
    peak = np.maximum(mc.current.maximum, cor.led_current_max)
    worst = int(np.argmax(peak))
    return Sharing(MC_SAMPLES, seed, float(mc.spread_summary.p99), flat[worst].id, float(peak[worst]), equal_share)


def _vf_max_at(p: LedParams, current: float, tj: float) -> float:
    return _forward(known(p.vf_max), p.i_test.value, p.n, p.r_s, p.tc.value, max(current, 1e-6), tj)


@lru_cache(maxsize=4096)  # boards repeat the same LED at the same current many times over
def _forward(vf: float, i_test: float, n: float, r_s: float, tc: float, current: float, tj: float) -> float:
    return float(forward_voltage(LedSpec(Range.fixed(vf), i_test, n, r_s, tc), current, tj))


def _worst_per_ref(rs: list[ResistorResult]) -> list[ResistorResult]:
    best: dict[str, ResistorResult] = {}
    for r in rs:
        if r.ref not in best or r.power_max > best[r.ref].power_max:
            best[r.ref] = r
    return list(best.values())


def _unique(items: list[Missing]) -> list[Missing]:
    seen, out = set(), []
    for m in items:
        key = (m.name, m.reason)
        if key not in seen:
            seen.add(key)
            out.append(m)
    return out


def analyse(netlist: Netlist, config: Config) -> BoardAnalysis:
    """Recognise and analyse every LED circuit of a netlist."""
    graph = NetGraph(netlist)
    circuits = recognise(graph, config)
    analyser = _Analyser(_Context(netlist, graph, config))
    def unmodelled(i: int, exc: ModelError) -> Analysis:
        return Analysis(circuits[i], missing=(Missing("a usable model", f"the part values cannot be modelled: "
                                                      f"{exc.message}", "check the LED and resistor values"),))

    analyses = tuple(solve_all([analyser.run(c) for c in circuits], lambda x: isinstance(x, Analysis), unmodelled))
    given = config.ambient_set
    ambient = (f"ambient {config.ambient_min_c:g} to {config.ambient_max_c:g} °C "
               f"({config.path + ' [ambient]' if given else 'the default for an indoor product; set [ambient]'})")
    analyses = tuple(replace(a, ambient_basis=ambient if a.solved else "", rail=_rail(graph, config, a.circuit))
                     for a in analyses)
    caution = cautions(netlist, [c.source for c in circuits], [(a.circuit.id, a.supply) for a in analyses], config)
    return BoardAnalysis(netlist, circuits, analyses, caution, FrozenMap({c.ref: c for c in netlist.components}))
