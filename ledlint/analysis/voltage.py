"""Strings and banks fed from a voltage through resistors: per-LED currents over the corners,
resistor dissipation, pin currents, headroom, the split of parallel strings, the thermal loop;
and a string with a part facing the wrong way, which never conducts."""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from ledlint.analysis.batch import Job
from ledlint.analysis.elements import (Parts, ac_average, balancing, gaps, guarded, led_results, led_spec, ohms,
                                       path_drops, path_elements, resistance, seed, sharing, unique, vf_max_at, worst_per_ref)
from ledlint.analysis.results import (Analysis, BankResult, Blocked, Incomplete, LedResult, PinResult,
                                      ResistorResult, ResistorRole, Sharing, StringResult)
from ledlint.analysis.supplies import SQRT2, Supply, circuit_supply
from ledlint.analysis.switching import switch_drives
from ledlint.circuits.bank import ResistorBank
from ledlint.circuits.circuit import Wired
from ledlint.circuits.string import SeriesString
from ledlint.circuits.topology import ElementKind, Terminal, TerminalKind
from ledlint.engine import Branch as EngineBranch
from ledlint.engine import Circuit as EngineCircuit
from ledlint.engine import Corners
from ledlint.parts.params import LedParams, Missing, ResistorParams, pin_limit
from ledlint.quantities.ranges import Range


MAX_LOOP_LEDS = 200


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
    engine: EngineCircuit


def analyse_string(parts: Parts, c: SeriesString) -> Analysis | Job[Analysis]:
    return _blocked(parts, c) if c.blocked else _voltage_driven(parts, c, StringResult)


def analyse_bank(parts: Parts, c: ResistorBank) -> Analysis | Job[Analysis]:
    return _voltage_driven(parts, c, BankResult)


def _voltage_driven(parts: Parts, c: Wired, result: type[StringResult] | type[BankResult]) -> Job[Analysis]:
    missing: list[Missing] = []
    assumptions: list[str] = []
    branch_leds = [parts.leds_of(b.elements) for b in c.branches]
    all_leds = [p for ps in branch_leds for p in ps]
    ambiguity = "; ".join(sorted({f"{p.id}: {p.ambiguity}" for p in all_leds if p.ambiguity}))
    for p in all_leds:
        missing += list(p.blocking) + [m for m in (p.vf, p.vf_max, p.vf_min) if isinstance(m, Missing)][:1]
    is_bank = isinstance(c, ResistorBank)
    common_res = parts.resistors_of(c.top + c.bottom + (() if is_bank else c.branches[0].elements))
    branch_res = [parts.resistors_of(b.elements) if is_bank else [] for b in c.branches]
    for rp in common_res + [r for rs in branch_res for r in rs]:
        missing += [rp.resistance] if isinstance(rp.resistance, Missing) else []
    # A 0 Ω link is a wire, not a ballast: only real resistance limits the current.
    limited = any(ohms(r) for r in common_res) or all(any(ohms(r) for r in rs) for rs in branch_res)
    # Lit alone when each string has its own driver pin; otherwise all together.
    problems: list[tuple[Terminal | None, Terminal | None, list[int]]]
    if isinstance(c, ResistorBank) and c.individually_driven:
        problems = [(c.source or b.far, c.ret or b.far, [k]) for k, b in enumerate(c.branches)]
        assumptions.append("each string is switched by its own pin: analysed as if lit alone")
    else:
        problems = [(c.source, c.ret, list(range(len(c.branches))))]
    supplies = [circuit_supply(parts.graph, parts.config, src, ret, missing) for src, ret, _ in problems]
    pin_end = any(t is not None and t.kind is TerminalKind.PIN for src, ret, _ in problems for t in (src, ret))
    unlimited = not limited and not pin_end
    missing = unique(missing)
    first_supply = next((s[0] for s in supplies if s), None)
    known_supplies = [s for s in supplies if s is not None]
    if missing or len(known_supplies) < len(supplies):
        return Incomplete(c, missing=tuple(missing), supply=first_supply, unlimited=unlimited, ambiguity=ambiguity)
    v_sw, r_sw = path_drops(path_elements(c), assumptions)
    rc = resistance(common_res)
    plans = []
    for (src, ret, ks), (supply, r_pin) in zip(problems, known_supplies):
        leds, res = [branch_leds[k] for k in ks], [branch_res[k] for k in ks]
        branches = tuple(EngineBranch(tuple(led_spec(p) for p in ps), resistance(rs)) for ps, rs in zip(leds, res))
        ec = EngineCircuit(branches, supply=supply.volts, r_series=rc, r_switch=r_pin + r_sw, v_switch=v_sw,
                           ambient=parts.ambient)
        plans.append((src, ret, ec, leds, res))
    # The loop gain's matrix is as wide as the circuit's heated LEDs, and its eigenvalues cost the
    # cube of that: past a few hundred (no real string or bank), it is left out, and said so.
    heated = sum(1 for p in all_leds if p.rth is not None)
    if heated > MAX_LOOP_LEDS:
        assumptions.append(f"electro-thermal loop gain not worked out: {heated} self-heating LEDs in one circuit, "
                           f"more than the {MAX_LOOP_LEDS} the tool takes")
    answers = yield [(ec, heated <= MAX_LOOP_LEDS) for _, _, ec, _, _ in plans]
    solved = [_solve(parts, c, src, ret, ec, cor, gain, common_res, leds, res)
              for (src, ret, ec, leds, res), (cor, gain) in zip(plans, answers)]
    results = tuple(r for s in solved for r in s.leds)
    resistors = tuple(worst_per_ref([r for s in solved for r in s.resistors]))
    reverse = max(s.reverse_peak for s, _ in known_supplies)
    if reverse > 0:
        resistors = tuple(ac_average(r, reverse / SQRT2) for r in resistors)
        assumptions.append("AC supply: resistor dissipation averaged over the cycle, at most V_rms² / 2R")
        series = [e.ref for e in path_elements(c) if e.kind is ElementKind.DIODE]
        if series:
            assumptions.append(f"AC supply: {', '.join(series)} in series takes the reverse half-cycle, "
                               f"{reverse:.3g} V (its leakage is far below an LED's, common practice)")
        else:
            # Leakage decides how a string shares the reverse half-cycle: one LED may take it all.
            results = tuple(replace(r, reverse_v=max(r.reverse_v, reverse)) for r in results)
            assumptions.append("AC supply: the whole reverse peak may fall on one LED (leakage decides)")
    results = guarded(path_elements(c), results, assumptions)
    drives = tuple(switch_drives(c, parts.graph, parts.config))
    pins = tuple(p for s in solved for p in s.pins) + tuple(
        PinResult(b.pin, pin_limit(parts.comp(b.pin.ref), parts.config), b.current.maximum, b.sourcing, b)
        for b in drives if b.current is not None)
    gains = [s.loop_gain for s in solved if s.loop_gain is not None]
    return result(c, assumptions=tuple(dict.fromkeys(assumptions)), supply=first_supply, leds=results,
                  resistors=resistors, pins=pins, nominal_current=max(s.nominal for s in solved),
                  headroom_v=min(s.headroom for s in solved), min_ratio=min(s.min_ratio for s in solved),
                  sharing=solved[0].sharing if len(solved) == 1 else None,
                  loop_gain=max(gains) if gains else None, unlimited=unlimited, ambiguity=ambiguity,
                  engine=tuple(s.engine for s in solved), gaps=gaps(results, resistors), drives=drives)


def _solve(parts: Parts, c: Wired, src: Terminal | None, ret: Terminal | None, ec: EngineCircuit, cor: Corners,
           gain: float | None, common_res: list[ResistorParams], branch_leds: list[list[LedParams]],
           branch_res: list[list[ResistorParams]]) -> _Solved:
    """Per-LED currents, resistor dissipation, pin currents and headroom of one solved circuit."""
    rc, volts, v_sw = ec.r_series, ec.supply, ec.v_switch
    assert volts is not None
    sol = cor.solution
    flat = [p for ps in branch_leds for p in ps]
    results = led_results(cor, flat)
    amb = parts.ambient.maximum
    i_common = np.abs(sol.common_current)
    resistors = []
    for rp in common_res:  # in the corners every common resistor sits at the same tolerance end
        share = rp.resistance.value / rc.nominal if rc.nominal > 0 and not isinstance(rp.resistance, Missing) else 0.0
        power = float((sol.common_current ** 2 * cor.cases.r_series * share).max())
        resistors.append(ResistorResult(rp.ref, rp, ResistorRole.BALLAST, float(i_common.max()), power, amb))
    resistors += balancing(cor, branch_res, amb)
    pins = []
    for t, sourcing in ((src, True), (ret, False)):
        if t is not None and t.kind is TerminalKind.PIN and t.pin is not None:
            ic = parts.comp(t.pin.ref)
            pins.append(PinResult(t.pin, pin_limit(ic, parts.config), float(i_common.max()), sourcing))
    # Headroom: what is left for the ballast at the low corner if the LEDs ran at nominal current.
    nominal = cor.nominal
    worst_string = max(sum(vf_max_at(p, float(nominal.branch_current[k]), parts.ambient.minimum) for p in ps)
                       for k, ps in enumerate(branch_leds))
    headroom = volts.minimum - v_sw.maximum - worst_string
    ratio = min(r.low / max(r.current.nominal, 1e-15) for r in results)
    split = None
    per_led = float(nominal.led_current.mean())
    if len(ec.branches) >= 2:
        split = sharing(ec, cor, flat, seed(c), float(nominal.common_current) / len(ec.branches))
        per_led = split.equal_share
    return _Solved(tuple(results), tuple(resistors), tuple(pins), headroom, ratio, gain, split, per_led, ec)


def _blocked(parts: Parts, c: SeriesString) -> Analysis:
    """A string that never conducts: the reverse voltage its LEDs can see."""
    missing: list[Missing] = []
    sup = circuit_supply(parts.graph, parts.config, c.source, c.ret, missing)
    leds = parts.leds_of(c.branches[0].elements)
    opposed = {e.led for e in c.branches[0].elements if e.kind is ElementKind.LED and e.against}
    if sup is None:
        return Incomplete(c, missing=tuple(missing))
    supply: Supply = sup[0]
    worst = max(abs(supply.volts.maximum), abs(supply.volts.minimum))
    results = tuple(LedResult(p.id, p, Range.fixed(0.0), 0.0, parts.ambient.maximum,
                              worst if (p.id in opposed) == (supply.volts.maximum >= 0) else 0.0) for p in leds)
    leakage = ("the whole supply may fall on one reversed LED (leakage decides)",) if opposed else ()
    return Blocked(c, assumptions=leakage, supply=supply, leds=results)
