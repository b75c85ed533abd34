"""Switching: the controller pins that drive the base or gate of a switch in an LED's path, and
the base current a bipolar switch gets from them."""

from __future__ import annotations

from dataclasses import dataclass

from ledlint.analysis.supplies import ic_supply
from ledlint.circuits.circuit import LedCircuit
from ledlint.circuits.graph import NetGraph
from ledlint.circuits.topology import ElementKind, drive_pin
from ledlint.config import Config
from ledlint.netlist.model import Pin
from ledlint.parts.devices import PIN_OUTPUT, VBE
from ledlint.parts.kinds import Kind, classify, transistor_pins
from ledlint.parts.params import Param, rail_params, resistor_params
from ledlint.quantities.ranges import Range
from ledlint.quantities.units import quantity


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
