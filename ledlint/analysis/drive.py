"""What sets the current of a current sink or a constant-current driver, over tolerance.

Transistor sink: I = (V_ref − V_BE) / R_E, or V_BE / R_E when a second transistor clamps the
base (the two-transistor limiter). Driver IC: I = V_ref / R_sense, or a fixed current for a
two-terminal regulator, as the user describes the part (config or fields).
"""

from __future__ import annotations

from dataclasses import dataclass

from ledlint.config import DRIVER_KINDS, Config
from ledlint.engine import Range
from ledlint.circuits.graph import NetGraph
from ledlint.netlist.model import Pin
from ledlint.parts.params import Missing, Origin, Param, rail_params, resistor_params
from ledlint.parts.kinds import Kind, classify, transistor_pins
from ledlint.circuits.recognise import DriverIC, LedCircuit, Reference, ReferenceKind, Sink
from ledlint.analysis.supplies import PIN_OUTPUT, ic_supply
from ledlint.circuits.topology import ElementKind, drive_pin
from ledlint.quantities.units import parse_current, parse_tolerance, parse_voltage, quantity

# Silicon base-emitter voltage at 1-100 mA: 0.65 V nominal, 0.55-0.75 V over parts and current,
# falling 2 mV/K (common practice).
VBE = Range(0.65, 0.55, 0.75)
VBE_TC = -0.002
# A small-signal MOSFET's gate-source voltage when sinking tens of mA: above its 1-2.5 V
# threshold (field-facts §9: 2N7002 V_GS(th) 1-2.5 V) by an overdrive that is not known.
VGS = Range(2.0, 1.0, 3.0)
# A silicon diode's forward drop at a few mA, as a base reference (common practice).
VDIODE = Range(0.65, 0.55, 0.75)
ZENER_TOLERANCE = 0.05  # the common ±5 % zener grade (from memory)
# The name of what is missing when a sink or driver has a 0 Ω sense resistor: nothing then sets
# the current, which is a fault (unlimited-led), not a gap.
NO_SENSE = "sense resistance"
VCE_SAT = Range(0.1, 0.05, 0.3)  # field-facts §9: 2N3904 ≤ 0.2 V at 10 mA, ≤ 0.3 V at 50 mA


@dataclass(frozen=True)
class SetCurrent:
    """A driver's or sink's output current over tolerance, and what it rests on."""

    current: Range  # A
    basis: str
    sense: tuple[tuple[str, Range], ...] = ()  # (resistor ref, its resistance)
    sense_voltage: Range = Range.fixed(0.0)  # V across the sense resistor
    dropout: Range = Range.fixed(0.0)  # V the regulator needs across itself
    kind: str = "linear"  # linear, buck, boost, two-terminal, or sink
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


def sink_current(sink: Sink, graph: NetGraph, config: Config, ambient: Range,
                 rail: Range | None) -> tuple[SetCurrent | None, list[Missing], list[str]]:
    """The current a transistor sink sets, or what is missing to know it."""
    missing: list[Missing] = []
    notes: list[str] = []
    re_range, miss = _resistance(graph, config, tuple(e.ref for e in sink.sense))
    missing += miss
    mos = sink.transistor.part.value == "nmos"
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
        missing.append(Missing(NO_SENSE, f"{sink.transistor.ref} has no emitter resistance, so it sets no current",
                               "a current sink needs a resistor from emitter to ground: R = (V_ref − V_BE) / I"))
        return None, missing, notes
    current = Range(v_emitter.nominal / re_range.nominal, v_emitter.minimum / re_range.maximum,
                    v_emitter.maximum / re_range.minimum)
    sense = tuple((e.ref, re_range) for e in sink.sense[:1])
    return (SetCurrent(current, basis + f", over {' + '.join(e.ref for e in sink.sense)} = "
                       f"{re_range.nominal:g} Ω", sense, v_emitter, VCE_SAT, "sink"), missing, notes)


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


def _setting(driver: DriverIC, key: str) -> tuple[str, str] | None:
    for k, text, where in driver.settings:
        if k == key:
            return text, where
    return None


def driver_current(driver: DriverIC, graph: NetGraph,
                   config: Config) -> tuple[SetCurrent | None, list[Missing], list[str]]:
    """A described driver's set-point; what to describe when it is not."""
    notes: list[str] = []
    keys = ("driver, vref (and vref_tolerance) or current, sense_pins, current_max, dropout, vin_min, "
            "vin_max, vout_max")
    kind_text = _setting(driver, "driver")
    if kind_text is None:
        return None, [Missing("driver description", f"{driver.ref} looks like a constant-current driver but is "
                              "not described", f"describe {driver.ref} in ledlint.toml [refs.{driver.ref!r}] or in "
                              f"fields: {keys}")], notes
    kind = kind_text[0].strip().lower()
    if kind not in DRIVER_KINDS:
        return None, [Missing("driver", f"{kind_text[1]}: {kind!r} is not a driver kind",
                              f"use one of {', '.join(DRIVER_KINDS)}")], notes

    def number(key: str, parse) -> Param | None:
        found = _setting(driver, key)
        if found is None:
            return None
        q = parse(found[0])
        return Param(q.value, Origin.FIELD if found[1].startswith("field") else Origin.CONFIG, found[1]) if q else None

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
        return None, [Missing(NO_SENSE, f"{driver.sense[0]}, {driver.ref}'s sense resistor, is 0 Ω: it sets no current",
                              f"fit the sense resistor the current needs, R = V_ref / I = {v.nominal:g} V / I")], notes
    current = Range(v.nominal / rs.nominal, v.minimum / rs.maximum, v.maximum / rs.minimum)
    return SetCurrent(current, f"{driver.ref} V_ref {v.nominal * 1000:g} mV over {driver.sense[0]} = {rs.nominal:g} Ω",
                      ((driver.sense[0], rs),), v, drop, kind, limits), [], notes


@dataclass(frozen=True)
class SwitchDrive:
    """A controller pin driving the base or gate of a switch in an LED's path."""

    pin: Pin
    transistor: str
    part: Kind  # NPN, PNP, NMOS or PMOS
    resistor: str  # the base or gate resistor between them, "" when the pin drives it directly
    io: Range | None  # V: the driving IC's supply, the pin's high level
    rail: Range  # V: the emitter's or source's rail
    current: Range | None  # A into (or out of) the pin for a bipolar base: least to most; None for a gate
    sourcing: bool  # an NPN's base is sourced; a PNP's base is sunk
    basis: str
    tie: str = ""  # a resistor from base or gate to emitter or source: a pull-up (high side), a pull-down
    bleed: Range = Range.fixed(0.0)  # A the tie takes from a bipolar base (V_BE / R): not base current

    @property
    def base_current(self) -> Range | None:
        """What reaches a bipolar base: the pin's current less what the tie bleeds off."""
        if self.current is None:
            return None
        left = self.current - self.bleed
        return Range(max(left.nominal, 0.0), max(left.minimum, 0.0), max(left.maximum, 0.0))

    @property
    def high_side(self) -> bool:
        return self.part in (Kind.PNP, Kind.PMOS)

    @property
    def level(self) -> Range | None:
        """The voltage that drives the base or gate: the pin's high level for a low-side switch,
        the switch's own rail (which the pin pulls down from) for a high-side one."""
        return self.rail if self.high_side else self.io


def switch_drives(circuit: LedCircuit, graph: NetGraph, config: Config) -> list[SwitchDrive]:
    """Pins that drive a switch's base or gate, directly or through one resistor, with the base
    current a bipolar switch draws: (V − V_BE) / (R_pin + R_B), the emitter on ground (NPN) or on
    a known rail (PNP). A base is a diode to the emitter, so without R_B only the pin's own
    output resistance limits it; a gate draws no steady current."""
    out = []
    for e in circuit.elements:
        comp = graph.component(e.ref)
        if e.kind is not ElementKind.SWITCH or comp is None:
            continue
        roles, _ = transistor_pins(comp)
        mos = e.part in (Kind.NMOS, Kind.PMOS)
        control, common = (comp.pin(roles.get(r, "")) for r in (("G", "S") if mos else ("B", "E")))
        if control is None or common is None or not control.net or not common.net:
            continue
        rail = rail_params(common.net, config)
        high_side = e.part in (Kind.PNP, Kind.PMOS)
        if rail is None or rail.ground is high_side or (high_side and rail.nominal <= 0):
            continue  # an emitter or source off a rail: a follower or a current sink, not a plain switch
        found = _base_driver(graph, config, control.net, e.ref)
        if found is None:
            continue
        pin, resistor, r_b = found
        ic = graph.component(pin.ref)
        sup = ic_supply(ic, config) if ic is not None else None
        io = sup.volts if sup else None
        rails = Range(rail.nominal, rail.minimum, rail.maximum)
        high = rails if high_side else io
        current, basis = None, ""
        if not mos and high is not None:
            r = r_b + PIN_OUTPUT
            current = Range(max(high.nominal - VBE.nominal, 0.0) / r.nominal,
                            max(high.minimum - VBE.maximum, 0.0) / r.maximum,
                            max(high.maximum - VBE.minimum, 0.0) / r.minimum)
            through = f"through {resistor}" if resistor else "with no base resistor"
            basis = (f"{pin.ref} pin {pin.name or pin.number} drives {e.ref}'s base {through}: "
                     f"({high.maximum:.3g} V − V_BE {VBE.minimum:g} V) / ({quantity(r.minimum, 'Ω')} with the pin's output "
                     f"resistance {PIN_OUTPUT.minimum:g}-{PIN_OUTPUT.maximum:g} Ω assumed)")
        elif io is not None:
            basis = f"{pin.ref} pin {pin.name or pin.number} drives {e.ref}'s gate; {sup.basis if sup else ''}"
        tie = next((c for p in graph.pins_on(control.net) if p.ref not in (e.ref, resistor)
                    and (c := graph.component(p.ref)) is not None and classify(c) is Kind.RESISTOR
                    and graph.across(p.ref, p.number) == common.net), None)
        bleed = Range.fixed(0.0)
        if tie is not None and not mos:
            rt = resistor_params(tie, config)
            if isinstance(rt.resistance, Param) and rt.resistance.value > 0:
                r_tie = Range.tolerance(rt.resistance.value, rt.tolerance.value)
                bleed = Range(VBE.nominal / r_tie.nominal, VBE.minimum / r_tie.maximum, VBE.maximum / r_tie.minimum)
                basis += f"; {tie.ref} across base and emitter takes V_BE / R, up to {bleed.maximum * 1e6:.0f} µA"
        out.append(SwitchDrive(pin, e.ref, e.part, resistor, io, rails, current, not high_side, basis,
                               tie.ref if tie else "", bleed))
    return out


def _base_driver(graph: NetGraph, config: Config, net: str, transistor: str) -> tuple[Pin, str, Range] | None:
    """The pin driving a base net: on the net itself, or beyond one resistor of known value."""
    others = [p for p in graph.pins_on(net) if p.ref != transistor]
    pin = drive_pin(graph, others)
    if pin is not None:
        return pin, "", Range.fixed(0.0)
    for p in others:
        comp = graph.component(p.ref)
        far = graph.across(p.ref, p.number) if comp is not None and classify(comp) is Kind.RESISTOR else None
        pin = drive_pin(graph, graph.pins_on(far)) if far else None
        if pin is None or comp is None:
            continue
        rp = resistor_params(comp, config)
        if not isinstance(rp.resistance, Param):
            return None
        return pin, comp.ref, Range.tolerance(rp.resistance.value, rp.tolerance.value)
    return None
