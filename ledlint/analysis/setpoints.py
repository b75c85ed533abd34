"""Set-points: what sets the current of a current sink or a constant-current driver, over tolerance.

Transistor sink: I = (V_ref − V_BE) / R_E, or V_BE / R_E when a second transistor clamps the
base (the two-transistor limiter). Driver IC: I = V_ref / R_sense, or a fixed current for a
two-terminal regulator, as the user describes the part (config or fields).
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum
from typing import Callable

from ledlint.circuits.graph import NetGraph
from ledlint.circuits.stages import DriverIC, Reference, ReferenceKind, SinkStage
from ledlint.config import DRIVER_KINDS, Config
from ledlint.parts.devices import VBE, VBE_TC, VCE_SAT, VDIODE, VGS, ZENER_TOLERANCE
from ledlint.parts.kinds import Kind
from ledlint.parts.params import Missing, Param, resistor_params
from ledlint.quantities.ranges import Range
from ledlint.quantities.units import Quantity, parse_current, parse_tolerance, parse_voltage


class DriverKind(Enum):
    """What sets a current output: a driver IC's topology, a two-terminal regulator, or a transistor sink."""

    LINEAR = "linear"
    BUCK = "buck"
    BOOST = "boost"
    TWO_TERMINAL = "two-terminal"
    SINK = "sink"

    @property
    def switching(self) -> bool:
        """A buck or boost works from its own input, not from the LEDs' supply."""
        return self in (DriverKind.BUCK, DriverKind.BOOST)


@dataclass(frozen=True)
class SetCurrent:
    """A driver's or sink's output current over tolerance, and what it rests on."""

    current: Range  # A
    basis: str
    sense: tuple[tuple[str, Range], ...] = ()  # (resistor ref, its resistance)
    sense_voltage: Range = Range.fixed(0.0)  # V across the sense resistor
    dropout: Range = Range.fixed(0.0)  # V the regulator needs across itself
    kind: DriverKind = DriverKind.LINEAR
    limits: tuple[tuple[str, float], ...] = ()  # vin_min, vin_max, vout_max, current_max as given


def _resistance(graph: NetGraph, config: Config, refs: tuple[str, ...]) -> tuple[Range, list[Missing]]:
    """Series sum of resistors with their tolerances."""
    total = Range.fixed(0.0)
    missing = []
    for ref in refs:
        comp = graph.component(ref)
        if comp is None:
            continue
        p = resistor_params(comp, config)
        if isinstance(p.resistance, Missing):
            missing.append(p.resistance)
            continue
        total = total + Range.tolerance(p.resistance.value, p.tolerance.value)
    return total, missing


def sink_current(sink: SinkStage, graph: NetGraph, config: Config, ambient: Range,
                 rail: Range | None) -> tuple[SetCurrent | None, list[Missing], list[str]]:
    """The current a transistor sink sets, or what is missing to know it."""
    missing: list[Missing] = []
    notes: list[str] = []
    re_range, miss = _resistance(graph, config, tuple(e.ref for e in sink.sense))
    missing += miss
    mos = sink.transistor.part is Kind.NMOS
    # V_BE falls as it warms: the most current at the hottest ambient.
    vbe = Range(VBE.nominal + VBE_TC * (ambient.nominal - 25), VBE.minimum + VBE_TC * (ambient.maximum - 25),
                VBE.maximum + VBE_TC * (ambient.minimum - 25))
    drop = VGS if mos else vbe
    ref = sink.reference
    if sink.transistor.assumption:
        notes.append(f"{sink.transistor.ref}: {sink.transistor.assumption}")
    if ref.kind is ReferenceKind.VBE:
        v_emitter = vbe
        basis = f"V_BE of {ref.refs[0]} ({vbe.nominal:.2f} V, {vbe.minimum:.2f}-{vbe.maximum:.2f} V) across the emitter resistor"
        notes.append(f"V_BE {VBE.minimum:.2f}-{VBE.maximum:.2f} V, −2 mV/K (silicon, common practice)")
    else:
        v_base = _reference_voltage(ref, graph, config, rail, missing, notes)
        if v_base is None:
            return None, missing, notes
        # Below one V_BE (or V_GS) the transistor is off: the emitter sits at 0 V, not below.
        lo, nom, hi = (max(x, 0.0) for x in (v_base.minimum - drop.maximum, v_base.nominal - drop.nominal,
                                            v_base.maximum - drop.minimum))
        v_emitter = Range(min(max(nom, lo), hi), lo, hi)
        what = "V_GS" if mos else "V_BE"
        basis = f"{ref.detail} at {v_base.nominal:.2f} V, less {what} {drop.nominal:.2f} V"
        if ref.kind is ReferenceKind.DIVIDER:
            notes.append("the divider's loading by the base current is neglected")
    if missing:
        return None, missing, notes
    if re_range.minimum <= 0:
        missing.append(Missing("sense resistance", f"{sink.transistor.ref} has no emitter resistance, so it sets no current",
                               "a current sink needs a resistor from emitter to ground: R = (V_ref − V_BE) / I",
                               fault=True))
        return None, missing, notes
    current = Range(v_emitter.nominal / re_range.nominal, v_emitter.minimum / re_range.maximum,
                    v_emitter.maximum / re_range.minimum)
    sense = tuple((e.ref, re_range) for e in sink.sense[:1])
    return (SetCurrent(current, basis + f", over {' + '.join(e.ref for e in sink.sense)} = "
                       f"{re_range.nominal:g} Ω", sense, v_emitter, VCE_SAT, DriverKind.SINK), missing, notes)


def _reference_voltage(ref: Reference, graph: NetGraph, config: Config, rail: Range | None, missing: list[Missing],
                       notes: list[str]) -> Range | None:
    if ref.kind is ReferenceKind.ZENER:
        comp = graph.component(ref.refs[0])
        text = (comp.field("Vz") if comp else None) or (comp.value if comp else "")
        q = parse_voltage(text or "")
        if q is None:
            missing.append(Missing("Vz", f"{ref.refs[0]}: zener voltage not in its value {text!r}",
                                   f"add a field Vz (e.g. Vz = 5.1V) to {ref.refs[0]}"))
            return None
        notes.append(f"{ref.refs[0]} zener {q.value:g} V ±5 %")
        return Range.tolerance(q.value, ZENER_TOLERANCE)
    if ref.kind is ReferenceKind.DIODES:
        n = len(ref.refs)
        notes.append(f"{n} diode drop(s) of {VDIODE.minimum:.2f}-{VDIODE.maximum:.2f} V")
        return Range(n * VDIODE.nominal, n * VDIODE.minimum, n * VDIODE.maximum)
    if ref.kind in (ReferenceKind.DIVIDER, ReferenceKind.PIN) and rail is not None:
        if ref.kind is ReferenceKind.PIN:
            notes.append("the base or gate sits at the driving pin's high level (base current neglected)")
            return rail
        top_bottom = _divider(ref, graph, config)
        if top_bottom is None:
            missing.append(Missing("divider", "the base divider's resistors are not both known", "give both values"))
            return None
        top, bottom = top_bottom
        return Range(rail.nominal * bottom.nominal / (top.nominal + bottom.nominal),
                     rail.minimum * bottom.minimum / (top.maximum + bottom.minimum),
                     rail.maximum * bottom.maximum / (top.minimum + bottom.maximum))
    missing.append(Missing("reference", f"what holds the base: {ref.detail or 'unknown'}",
                           "the tool recognises a zener, diodes, a divider or a controller pin"))
    return None


def _divider(ref: Reference, graph: NetGraph, config: Config) -> tuple[Range, Range] | None:
    values = []
    for r in ref.refs[:2]:
        value, miss = _resistance(graph, config, (r,))
        if miss:
            return None
        values.append(value)
    if len(values) != 2:
        return None
    # The resistor that reaches the rail is the top one.
    first = graph.component(ref.refs[0])
    top_first = first is not None and any(p.net == ref.rail for p in first.pins)
    return (values[0], values[1]) if top_first else (values[1], values[0])


def driver_current(driver: DriverIC, graph: NetGraph,
                   config: Config) -> tuple[SetCurrent | None, list[Missing], list[str]]:
    """A described driver's set-point; what to describe when it is not."""
    notes: list[str] = []
    keys = ("driver, vref (and vref_tolerance) or current, sense_pins, current_max, dropout, vin_min, "
            "vin_max, vout_max")
    kind_text = driver.setting("driver")
    if kind_text is None:
        return None, [Missing("driver description", f"{driver.ref} looks like a constant-current driver but is "
                              "not described", f"describe {driver.ref} in ledlint.toml [refs.{driver.ref!r}] or in "
                              f"fields: {keys}")], notes
    written = kind_text.text.strip().lower()
    if written not in DRIVER_KINDS:
        return None, [Missing("driver", f"{kind_text.where}: {written!r} is not a driver kind",
                              f"use one of {', '.join(DRIVER_KINDS)}")], notes
    kind = DriverKind(written)

    def number(key: str, parse: Callable[[str], Quantity | None]) -> Param | None:
        found = driver.setting(key)
        q = parse(found.text) if found else None
        return Param(q.value, found.origin, found.where) if q and found else None

    limits = tuple((k, p.value) for k in ("vin_min", "vin_max", "vout_max") if (p := number(k, parse_voltage)))
    cmax = number("current_max", parse_current)
    if cmax:
        limits += (("current_max", cmax.value),)
    dropout = number("dropout", parse_voltage)
    drop = Range.fixed(dropout.value) if dropout else Range.fixed(0.0)
    fixed = number("current", parse_current)
    if fixed is not None:
        tol = number("current_tolerance", parse_tolerance)
        rel = tol.value if tol else 0.0
        if tol is None:
            notes.append(f"{driver.ref}: no current_tolerance given; taken as exact")
        return SetCurrent(Range.tolerance(fixed.value, rel), f"{driver.ref} fixed current {fixed.value * 1000:g} mA",
                          dropout=drop, kind=kind, limits=limits), [], notes
    vref = number("vref", parse_voltage)
    if vref is None:
        return None, [Missing("vref", f"{driver.ref}: no vref (or current) given",
                              f"add vref (e.g. vref = \"200mV\") for {driver.ref}")], notes
    tol = number("vref_tolerance", parse_tolerance)
    if tol is None:
        notes.append(f"{driver.ref}: no vref_tolerance given; taken as exact")
    v = Range.tolerance(vref.value, tol.value if tol else 0.0)
    if not driver.sense:
        return None, [Missing("sense resistor", f"{driver.ref}: no resistor found on its sense pin",
                              "name the sense pins: sense_pins = \"CS\"")], notes
    rs, miss = _resistance(graph, config, driver.sense[:1])
    if miss:
        return None, miss, notes
    if rs.minimum <= 0:
        return None, [Missing("sense resistance", f"{driver.sense[0]}, {driver.ref}'s sense resistor, is 0 Ω: it sets no current",
                              f"fit the sense resistor the current needs, R = V_ref / I = {v.nominal:g} V / I",
                              fault=True)], notes
    current = Range(v.nominal / rs.nominal, v.minimum / rs.maximum, v.maximum / rs.minimum)
    return SetCurrent(current, f"{driver.ref} V_ref {v.nominal * 1000:g} mV over {driver.sense[0]} = {rs.nominal:g} Ω",
                      ((driver.sense[0], rs),), v, drop, kind, limits), [], notes


