"""Strings on a current output (a transistor sink or a driver IC): the set-point over tolerance,
how parallel strings share it, sense-resistor dissipation, and the headroom the output needs."""

from __future__ import annotations

from ledlint.analysis.batch import Job
from ledlint.analysis.elements import (Parts, balancing, gaps, guarded, led_results, led_spec, path_elements,
                                       resistance, seed, sharing, unique, vf_max_at)
from ledlint.analysis.results import Analysis, DriverResult, Incomplete, ResistorResult, ResistorRole, SinkResult
from ledlint.analysis.setpoints import SetCurrent, driver_current, sink_current
from ledlint.analysis.supplies import Supply, end_voltage, ic_supply
from ledlint.circuits.circuit import Wired
from ledlint.circuits.driver import DriverOutput
from ledlint.circuits.sink import CurrentSink
from ledlint.circuits.stages import ReferenceKind
from ledlint.circuits.topology import TerminalKind
from ledlint.engine import Branch as EngineBranch
from ledlint.engine import Circuit as EngineCircuit
from ledlint.engine import LedSpec
from ledlint.parts.params import LedParams, Missing, ResistorParams, rail_params
from ledlint.quantities.ranges import Range


def analyse_sink(parts: Parts, c: CurrentSink) -> Analysis | Job[Analysis]:
    rail = None
    ref = c.sink.reference
    if ref.kind is ReferenceKind.PIN and ref.pin is not None:
        got = ic_supply(parts.comp(ref.pin.ref), parts.config)
        rail = got.volts if got else None
    elif ref.rail:
        r = rail_params(ref.rail, parts.config)
        rail = Range(r.nominal, r.minimum, r.maximum) if r else None
    setc, missing, notes = sink_current(c.sink, parts.graph, parts.config, parts.ambient, rail)
    supply_missing: list[Missing] = []
    supply = _output_supply(parts, c, supply_missing)
    return _current_driven(parts, c, setc, missing, notes, supply, supply_missing)


def analyse_driver(parts: Parts, c: DriverOutput) -> Analysis | Job[Analysis]:
    setc, missing, notes = driver_current(c.driver, parts.graph, parts.config)
    supply_missing: list[Missing] = []
    if setc is not None and setc.kind.switching:
        supply = _driver_input(parts, c, setc, supply_missing)
    else:
        supply = _output_supply(parts, c, supply_missing)
    return _current_driven(parts, c, setc, missing, notes, supply, supply_missing)


def _output_supply(parts: Parts, c: Wired, missing: list[Missing]) -> tuple[Supply, Range] | None:
    """What a sink or a linear driver works from: the LEDs' own supply (the output end is the
    regulator, not a pin at 0 V)."""
    top = c.source if c.source is not None and c.source.kind is not TerminalKind.PIN else None
    if top is None:
        return None
    basis: list[str] = []
    end = end_voltage(parts.graph, parts.config, top, True, missing, basis)
    return (Supply(end[0], tuple(basis)), end[1]) if end else None


def _driver_input(parts: Parts, c: DriverOutput, setc: SetCurrent,
                  missing: list[Missing]) -> tuple[Supply, Range] | None:
    """What a buck or boost works from: its own input, as described or from its supply pins."""
    limits = dict(setc.limits)
    if "vin_min" in limits and "vin_max" in limits:
        lo, hi = limits["vin_min"], limits["vin_max"]
        return Supply(Range((lo + hi) / 2, lo, hi), (f"{c.driver.ref} input {lo:g}-{hi:g} V as described",)), \
            Range.fixed(0.0)
    got = ic_supply(parts.comp(c.driver.ref), parts.config)
    if got is None:
        missing.append(Missing("input voltage", f"{c.driver.ref}'s input rail has no known voltage",
                               f"give {c.driver.ref} vin_min and vin_max, or name its input rail's voltage"))
        return None
    return Supply(got.volts, (got.basis,)), Range.fixed(0.0)


def _current_driven(parts: Parts, c: CurrentSink | DriverOutput, setc: SetCurrent | None, missing: list[Missing],
                    notes: list[str], sup: tuple[Supply, Range] | None,
                    sup_missing: list[Missing]) -> Analysis | Job[Analysis]:
    branch_leds = [parts.leds_of(b.elements) for b in c.branches]
    flat = [p for ps in branch_leds for p in ps]
    ambiguity = "; ".join(sorted({f"{p.id}: {p.ambiguity}" for p in flat if p.ambiguity}))
    unknown = [m for p in flat for m in p.blocking] + [m for p in flat for m in (p.vf,) if isinstance(m, Missing)][:1]
    if unknown:
        # The split between strings depends on the Vf spread more than on Vf itself: with the
        # LED type unknown, 2.0 V ±10 % per LED stands in, and the findings say so.
        notes.append("LED type unknown: each LED taken as 2.0 V ±10 % at 20 mA for the current split")
    missing = unique(missing + unknown + sup_missing)
    if setc is None:
        return Incomplete(c, missing=tuple(missing), assumptions=tuple(notes), supply=sup[0] if sup else None,
                          ambiguity=ambiguity, unlimited=any(m.fault for m in missing))
    res = [parts.resistors_of(b.elements) for b in c.branches]
    if any(isinstance(r.resistance, Missing) for rs in res for r in rs):
        missing += [r.resistance for rs in res for r in rs if isinstance(r.resistance, Missing)]
        return Incomplete(c, missing=tuple(missing), assumptions=tuple(notes), set_current=setc)
    return (yield from _solve(parts, c, setc, missing, notes, sup, branch_leds, res, bool(unknown), ambiguity))


def _solve(parts: Parts, c: CurrentSink | DriverOutput, setc: SetCurrent, missing: list[Missing], notes: list[str],
           sup: tuple[Supply, Range] | None, branch_leds: list[list[LedParams]], res: list[list[ResistorParams]],
           unknown: bool, ambiguity: str) -> Job[Analysis]:
    specs = tuple(EngineBranch(tuple(_spec_or_stand_in(p) for p in ps), resistance(rs))
                  for ps, rs in zip(branch_leds, res))
    ec = EngineCircuit(specs, drive_current=setc.current, ambient=parts.ambient)
    [(cor, _)] = yield [(ec, False)]
    flat = [p for ps in branch_leds for p in ps]
    amb = parts.ambient.maximum
    resistors = []
    for sense_ref, ohms in setc.sense:
        # The sense voltage is what the loop holds, so P = V²/R: most at the highest V and least R.
        v = setc.sense_voltage.maximum
        power = v * v / ohms.minimum if v > 0 and ohms.minimum > 0 else setc.current.maximum ** 2 * ohms.maximum
        resistors.append(ResistorResult(sense_ref, parts.resistor(sense_ref), ResistorRole.SENSE,
                                        setc.current.maximum, power, amb))
    resistors += balancing(cor, res, amb)
    k = len(c.branches)
    split = sharing(ec, cor, flat, seed(c), setc.current.nominal / k) if k >= 2 else None
    # Headroom: the least input minus the highest string voltage at the set current (its LEDs
    # and its own series or balancing resistance), the sense voltage and the regulator's dropout.
    headroom = None
    if sup is not None and not unknown:
        share = setc.current.maximum / k
        worst = max(sum(vf_max_at(p, share, parts.ambient.minimum) for p in ps) + share * b.r.maximum
                    for ps, b in zip(branch_leds, specs))
        headroom = sup[0].volts.minimum - worst - setc.sense_voltage.maximum - setc.dropout.maximum
    results = guarded(path_elements(c), tuple(led_results(cor, flat)), notes)
    result = SinkResult if isinstance(c, CurrentSink) else DriverResult
    return result(c, missing=tuple(missing), assumptions=tuple(dict.fromkeys(notes)),
                  supply=sup[0] if sup else None, set_current=setc, leds=results, resistors=tuple(resistors),
                  nominal_current=setc.current.nominal / k, headroom_v=headroom, sharing=split,
                  ambiguity=ambiguity, engine=(ec,), gaps=gaps(results, resistors))


def _spec_or_stand_in(p: LedParams) -> LedSpec:
    if p.complete:
        return led_spec(p)
    return LedSpec(Range.tolerance(2.0, 0.10), 0.020, 2.0, p.r_s, -0.002)
