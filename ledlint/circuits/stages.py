"""The stages that set an LED string's current: a transistor sink with what holds its base, and a
driver IC's output with its sense resistors and the user's description of the part."""

from __future__ import annotations

import re
from dataclasses import dataclass
from enum import Enum

from ledlint.circuits.shapes import Context, Junction
from ledlint.circuits.topology import Element, ElementKind, Terminal, TerminalKind
from ledlint.config import DRIVER_KEYS
from ledlint.netlist.model import Component, Pin, natural
from ledlint.parts.kinds import Kind, classify, transistor_pins
from ledlint.parts.params import Origin

_SENSE_PIN = re.compile(r"^(CS|CSN|CSP|ISENSE|SENSE|ISNS|ISET|RSET|IADJ|ADJ|FB|RS|IREF)[+-]?\d*$", re.I)
_DRIVER_WORDS = re.compile(r"led driver|current sink|constant[ -]current|current regulator|led controller", re.I)


class ReferenceKind(Enum):
    VBE = "vbe"  # a second transistor clamps the base at one V_BE across the sense resistor
    ZENER = "zener"
    DIODES = "diodes"  # forward-biased diodes in series
    DIVIDER = "divider"
    PIN = "pin"  # a controller pin drives the base
    UNKNOWN = "unknown"


@dataclass(frozen=True)
class Reference:
    """What holds a current-sink transistor's base or gate at a fixed voltage."""

    kind: ReferenceKind
    refs: tuple[str, ...] = ()
    rail: str = ""  # the supply net feeding a divider or a zener's resistor
    pin: Pin | None = None  # a controller pin driving the base
    detail: str = ""


@dataclass(frozen=True)
class SinkStage:
    """A transistor current sink: I = (V_ref − V_BE) / R_E, or V_BE / R_E with a sense transistor."""

    transistor: Element
    sense: tuple[Element, ...]  # emitter or source resistors
    reference: Reference

    @property
    def refs(self) -> tuple[str, ...]:
        return (self.transistor.ref, *(e.ref for e in self.sense), *self.reference.refs)


@dataclass(frozen=True)
class Setting:
    """One key of a driver's description: its text, where it was written, and how."""

    key: str
    text: str
    where: str
    origin: Origin


@dataclass(frozen=True)
class DriverIC:
    """A constant-current driver IC: its output pin, its sense resistors, and its description."""

    ref: str
    output: Pin
    sense: tuple[str, ...]
    settings: tuple[Setting, ...]  # the driver keys found, in key order

    def setting(self, key: str) -> Setting | None:
        return next((s for s in self.settings if s.key == key), None)


def _settings(ctx: Context, comp: Component) -> dict[str, Setting]:
    """A part's driver keys from the configuration and its fields (a field beats a table)."""
    found = {k: Setting(k, text, where, Origin.CONFIG)
             for k, (text, where) in ctx.config.part_settings(comp.ref, comp.value, comp.lib, comp.part).items()
             if k in DRIVER_KEYS}
    for key in DRIVER_KEYS:
        text = comp.field(key)
        if text:
            found[key] = Setting(key, text, f"field {key} on {comp.ref}", Origin.FIELD)
    return found


def driver_of(ctx: Context, pin: Pin | None, string: tuple[Element, ...] = ()) -> DriverIC | None:
    """The driver IC behind a pin, when the IC is described or looks like one."""
    if pin is None:
        return None
    comp = ctx.comp(pin.ref)
    found = _settings(ctx, comp)
    names = {p.name.upper() for p in comp.pins}
    looks = bool(_DRIVER_WORDS.search(" ".join((comp.value, comp.part, comp.description,
                                                 comp.properties.get("ki_keywords", "")))))
    looks = looks or any(_SENSE_PIN.match(n) for n in names)
    if not found and not looks:
        return None
    sense_pins = found.get("sense_pins")
    sense_names = [s.strip().upper() for s in (sense_pins.text if sense_pins else "").split(",") if s.strip()]
    sense_nets = {p.net for p in comp.pins if p.net is not None and (
        (sense_names and (p.name.upper() in sense_names or p.number in sense_names))
        or (not sense_names and _SENSE_PIN.match(p.name or "")))}
    in_string = {e.ref for e in string}
    sense_refs = []
    for net in sense_nets:
        for c in ctx.graph.parts_on(net):
            if classify(c) is not Kind.RESISTOR or c.ref in in_string:
                continue
            # A sense resistor runs from a sense pin to ground, to another sense pin or to the
            # output the LEDs hang on (high-side sense); a pull-up on the same net is not one.
            ends = {p.net for p in c.pins} - {net}
            if ends & (sense_nets | {pin.net}) or any(ctx.topo.terminal(n).kind is TerminalKind.GROUND
                                                      for n in ends if n):
                sense_refs.append(c.ref)
    return DriverIC(comp.ref, pin, tuple(sorted(dict.fromkeys(sense_refs), key=natural)),
                    tuple(found[k] for k in sorted(found)))


def regulator_driver(ctx: Context, reg: Element) -> DriverIC:
    """A two-terminal regulator as a driver: described in fields or configuration, or by its value."""
    comp = ctx.comp(reg.ref)
    found = _settings(ctx, comp)
    found.setdefault("driver", Setting("driver", "two-terminal", f"{reg.ref} is a two-terminal current regulator",
                                       Origin.VALUE))
    if "current" not in found:
        found["current"] = Setting("current", comp.value, f"value {comp.value!r} of {reg.ref}", Origin.VALUE)
    pin = comp.pin(reg.a)
    assert pin is not None
    return DriverIC(comp.ref, pin, (), tuple(found[k] for k in sorted(found)))


def _across(ctx: Context, part: Component, net: str) -> str | None:
    """The net on a two-pin part's other side from `net`."""
    return ctx.graph.across(part.ref, next(p.number for p in part.pins if p.net == net))


def reference(ctx: Context, transistor: Element) -> Reference:
    """What sets the base (or gate) voltage of a sink transistor."""
    comp = ctx.comp(transistor.ref)
    ctrl = comp.pin(transistor.control) if transistor.control else None
    if ctrl is None or ctrl.net is None:
        return Reference(ReferenceKind.UNKNOWN, detail="its base or gate is not connected")
    net = ctrl.net
    parts = [c for c in ctx.graph.parts_on(net) if c.ref != comp.ref and not c.dnp]
    for c in parts:  # a second transistor whose base-emitter senses the emitter resistor
        if classify(c) in (Kind.NPN, Kind.NMOS):
            roles, _ = transistor_pins(c)
            base = c.pin(roles.get("B") or roles.get("G") or "")
            collector = c.pin(roles.get("C") or roles.get("D") or "")
            if base and collector and collector.net == net and base.net == transistor.net_b:
                return Reference(ReferenceKind.VBE, (c.ref,), detail=f"{c.ref} clamps the base at one V_BE across "
                                                                     "the emitter resistor")
    zeners = [c for c in parts if classify(c) is Kind.ZENER]
    feeds = [c for c in parts if classify(c) is Kind.RESISTOR]
    rail = ""
    for r in feeds:
        other = _across(ctx, r, net)
        if other and ctx.topo.terminal(other).kind in (TerminalKind.RAIL, TerminalKind.SUPPLY):
            rail = other
    if zeners:
        return Reference(ReferenceKind.ZENER, (zeners[0].ref,) + tuple(r.ref for r in feeds), rail,
                         detail=f"zener {zeners[0].ref} holds the base")
    chain = _diode_chain(ctx, net)
    if chain:
        return Reference(ReferenceKind.DIODES, chain, rail, detail=f"{len(chain)} diode(s) in series hold the base")
    term = ctx.topo.terminal(net)
    if term.kind is TerminalKind.PIN:
        return Reference(ReferenceKind.PIN, (term.pin.ref,) if term.pin else (), pin=term.pin, detail=term.detail)
    grounded = [r for r in feeds if ctx.topo.terminal(_across(ctx, r, net) or "").kind is TerminalKind.GROUND]
    if rail and grounded:
        return Reference(ReferenceKind.DIVIDER, tuple(r.ref for r in feeds), rail,
                         detail="a resistor divider sets the base")
    for r in feeds:  # through a base resistor from a controller pin
        other = _across(ctx, r, net)
        t = ctx.topo.terminal(other) if other else None
        if t and t.kind is TerminalKind.PIN:
            return Reference(ReferenceKind.PIN, (r.ref, t.pin.ref if t.pin else ""), pin=t.pin,
                             detail=f"{t.detail} through {r.ref}")
    return Reference(ReferenceKind.UNKNOWN, tuple(c.ref for c in parts),
                     detail=f"net {net} holds {len(parts)} other part(s)")


def _diode_chain(ctx: Context, net: str) -> tuple[str, ...]:
    """Diodes (or LEDs) in series from `net` down to ground, anodes up; () if they do not reach it."""
    refs: list[str] = []
    while ctx.topo.terminal(net).kind is not TerminalKind.GROUND:
        step = [e for e in ctx.topo.forward_from(net) if e.ref not in refs]
        if len(step) != 1 or len(refs) > 8:
            return ()
        refs.append(step[0].ref)
        net = step[0].net_b
    return tuple(refs)


def sink_in(ctx: Context, elements: tuple[Element, ...], end: str) -> tuple[SinkStage, Terminal] | None:
    """A current sink made of `elements` (transistor first) ending at net `end`."""
    switches = [i for i, e in enumerate(elements) if e.kind is ElementKind.SWITCH and e.part in (Kind.NPN, Kind.NMOS)]
    if not switches:
        return None
    i = switches[-1]
    q = elements[i]
    below = elements[i + 1:]
    if below and all(e.kind is ElementKind.RESISTOR for e in below):
        term = ctx.topo.terminal(end)
        if term.kind is TerminalKind.GROUND:
            return SinkStage(q, below, reference(ctx, q)), term
        return None
    if below:
        return None
    # The emitter net is not internal: a sense transistor's base sits on it.
    resistors = [s for s in ctx.topo.segments_at(q.net_b)
                 if not s.leds and s.elements and all(e.kind is ElementKind.RESISTOR for e in s.elements)
                 and q not in s.elements]
    if len(resistors) == 1:
        seg = resistors[0]
        far = seg.bottom if seg.top == q.net_b else seg.top
        term = ctx.topo.terminal(far)
        if term.kind is TerminalKind.GROUND:
            elems = seg.elements if seg.top == q.net_b else tuple(e.flipped() for e in reversed(seg.elements))
            return SinkStage(q, elems, reference(ctx, q)), term
    return None


def sink_below(ctx: Context, j: Junction) -> tuple[SinkStage, Terminal] | None:
    """A current sink in the common path below strings that meet at a junction."""
    if not (j.single_path and j.one_sided) or j.at_top:
        return None
    return sink_in(ctx, j.common, j.far_net)


def resistor_fed(ctx: Context, j: Junction) -> bool:
    """Strings meeting at a junction through a resistor, between ends the recogniser follows, with
    no current sink below them: a string, a bank or multiplexed LEDs."""
    return (j.single_path and j.one_sided and sink_below(ctx, j) is None and j.odd_end is None
            and j.limited)
