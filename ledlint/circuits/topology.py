"""Series elements, the segments they chain into, and what the nets at segment ends are.

A segment is a maximal chain of two-terminal elements (resistors, LED dies, diodes, the
collector-emitter or drain-source path of a transistor, wire-like parts) joined through nets
that hold exactly those two element ends and nothing else that conducts at DC. Capacitors,
test points, not-fitted parts and no-connect pins are ignored: they carry no DC current.
"""

from __future__ import annotations

import re
from collections import deque
from dataclasses import dataclass, replace
from typing import Iterable
from enum import Enum

from ledlint.config import Config
from ledlint.circuits.graph import NetGraph
from ledlint.netlist.model import Component, Pin, PinType
from ledlint.parts.params import rail_params
from ledlint.parts.kinds import Kind, LedId, classify, led_dies, transistor_pins
from ledlint.parts.rails import is_supply_name


class ElementKind(Enum):
    RESISTOR = "resistor"
    LED = "led"
    DIODE = "diode"
    SWITCH = "switch"  # a transistor's main path; its base or gate is the control
    REGULATOR = "regulator"  # a two-terminal constant-current part
    WIRE = "wire"  # inductors, ferrite beads, fuses: a short at DC


@dataclass(frozen=True)
class Element:
    """A two-terminal path through a part, oriented so that forward current flows a → b."""

    ref: str
    kind: ElementKind
    a: str  # pin numbers
    b: str
    net_a: str
    net_b: str
    die: str = ""
    part: Kind = Kind.OTHER
    control: str = ""  # base or gate pin number of a switch
    against: bool = False  # placed in a chain against its own forward direction
    assumption: str = ""  # e.g. an assumed pinout
    guard: str = ""  # an LED's antiparallel protection diode, which takes its reverse voltage
    held: bool = False  # a MOSFET whose gate is tied on (to ground for P, to a rail for N): reverse protection

    @property
    def id(self) -> str:
        """The part, or for an LED its die, as reports show it."""
        return f"{self.ref}:{self.die}" if self.die else self.ref

    @property
    def led(self) -> LedId:
        """An LED element's die."""
        return LedId(self.ref, self.die)

    def flipped(self) -> Element:
        return replace(self, a=self.b, b=self.a, net_a=self.net_b, net_b=self.net_a, against=not self.against)

    @property
    def polar(self) -> bool:
        return self.kind in (ElementKind.LED, ElementKind.DIODE, ElementKind.SWITCH, ElementKind.REGULATOR)


@dataclass(frozen=True)
class Segment:
    """Elements in series between two junction or terminal nets, listed top to bottom."""

    elements: tuple[Element, ...]
    top: str
    bottom: str
    opposed: tuple[Element, ...] = ()  # polar parts (not switches) facing against the LEDs
    swapped: tuple[Element, ...] = ()  # switches fitted with their main terminals swapped

    @property
    def leds(self) -> tuple[Element, ...]:
        return tuple(e for e in self.elements if e.kind is ElementKind.LED)

    @property
    def blocked(self) -> bool:
        """The polar parts cannot all conduct: the string never lights."""
        return bool(self.opposed or self.swapped)


class TerminalKind(Enum):
    RAIL = "rail"  # a net whose voltage is known (name or configuration)
    GROUND = "ground"
    SUPPLY = "supply"  # looks like a supply, voltage not known
    PIN = "controller-pin"  # an IC output pin drives it
    CONNECTOR = "connector"  # goes off the board
    NODE = "node"  # only element ends: an inner junction of an LED structure
    OPEN = "open"  # nothing else on the net: the LED can never conduct
    OTHER = "other"


@dataclass(frozen=True)
class Terminal:
    net: str
    kind: TerminalKind
    pin: Pin | None = None  # the IC or connector pin that makes it a terminal
    detail: str = ""


# How likely a pin type is to be what drives an LED (kicad-netlist-format.md §3.3). Inputs rank
# last but count: user libraries often type every MCU pin "input", and an LED whose only
# connection is an IC pin can only be lit by that pin.
_DRIVE_RANK = {PinType.OUTPUT: 4, PinType.OPEN_COLLECTOR: 4, PinType.OPEN_EMITTER: 4, PinType.TRI_STATE: 4,
               PinType.BIDIRECTIONAL: 3, PinType.PASSIVE: 2, PinType.UNSPECIFIED: 2, PinType.UNKNOWN: 2,
               PinType.INPUT: 1}
_SUPPLY_PIN = re.compile(r"^(V(CC|DD|SS|EE|IN|IO|BAT|DDIO|CCIO|DDA|CCA)?\d*[A-Z]?|GND[A-Z]*\d*|AGND|DGND|PGND|"
                         r"VREF|EP|PAD|NC)$", re.I)
_IGNORED_ONE_PIN = re.compile(r"^(TP|MH|H|FID|MK|LOGO)\d", re.I)
_SWITCH_PINS = {Kind.NPN: ("C", "E", "B"), Kind.PNP: ("E", "C", "B"),
                Kind.NMOS: ("D", "S", "G"), Kind.PMOS: ("S", "D", "G")}


def _pin_by_name(comp: Component, name: str) -> Pin | None:
    for p in comp.pins:
        if p.name.upper() == name:
            return p
    return None


def _two_pins(comp: Component) -> tuple[Pin, Pin] | None:
    connected = [p for p in comp.pins if p.net is not None]
    return (connected[0], connected[1]) if len(comp.pins) == 2 and len(connected) == 2 else None


def _through(ref: str, kind: ElementKind, a: Pin, b: Pin, part: Kind) -> Element:
    assert a.net is not None and b.net is not None  # _two_pins keeps parts with both pins connected
    return Element(ref, kind, a.number, b.number, a.net, b.net, part=part)


def elements_of(comp: Component, config: Config, kind: Kind | None = None) -> tuple[Element, ...] | None:
    """The series elements a component contributes; None when it is not a series part."""
    kind = kind or classify(comp)
    if kind is Kind.LED:
        out = []
        for die in led_dies(comp):
            a, k = comp.pin(die.anode), comp.pin(die.cathode)
            if a is None or k is None or a.net is None or k.net is None:
                continue
            out.append(Element(comp.ref, ElementKind.LED, a.number, k.number, a.net, k.net, die.name, kind))
        return tuple(out)
    if kind in _SWITCH_PINS:
        roles, assumption = transistor_pins(comp)
        a, b, c = (comp.pin(roles.get(r, "")) for r in _SWITCH_PINS[kind])
        if a and b and a.net and b.net:
            return (Element(comp.ref, ElementKind.SWITCH, a.number, b.number, a.net, b.net, part=kind,
                            control=c.number if c else "", assumption=assumption),)
        return None
    pins = _two_pins(comp)
    if pins is None:
        return None
    p, q = pins
    described = config.part_settings(comp.ref, comp.value, comp.lib, comp.part).get("driver", ("",))[0]
    if kind is Kind.REGULATOR or "two-terminal" in (described, (comp.field("driver") or "").strip()):
        # Current flows into the anode-like pin: A / + / pin 1 by the usual convention (common practice).
        named = {x.name.upper(): x for x in (p, q)}
        first = named.get("A") or named.get("+") or named.get("IN") or p
        second = q if first is p else p
        return (_through(comp.ref, ElementKind.REGULATOR, first, second, Kind.REGULATOR),)
    if kind is Kind.RESISTOR:
        return (_through(comp.ref, ElementKind.RESISTOR, p, q, kind),)
    if kind in (Kind.DIODE,):
        a, k = _pin_by_name(comp, "A"), _pin_by_name(comp, "K")
        if a and k:
            return (_through(comp.ref, ElementKind.DIODE, a, k, kind),)
    if kind is Kind.INDUCTOR or re.match(r"^(F|FB|JP)\d", comp.ref, re.I):
        return (_through(comp.ref, ElementKind.WIRE, p, q, kind),)
    return None


def _ignored(comp: Component, kind: Kind) -> bool:
    """Parts that carry no DC current or are not on the board."""
    if comp.dnp:
        return True
    if kind is Kind.CAPACITOR:
        return True
    return len(comp.pins) <= 1 and bool(_IGNORED_ONE_PIN.match(comp.ref))


def _guards(elements: list[Element]) -> dict[str, str]:
    """LED id → the diode wired antiparallel across it (anode on its cathode, cathode on its
    anode): the usual reverse-voltage protection, which never conducts forward current."""
    leds = {(e.net_a, e.net_b): e.id for e in elements if e.kind is ElementKind.LED}
    out: dict[str, str] = {}
    for d in elements:
        led = leds.get((d.net_b, d.net_a)) if d.kind is ElementKind.DIODE else None
        if led and led not in out and d.ref not in out.values():
            out[led] = d.ref
    return out


@dataclass
class Topology:
    """Elements, segments and net roles of one netlist (built once, then read)."""

    graph: NetGraph
    config: Config

    def __post_init__(self) -> None:
        self.elements: list[Element] = []
        self.other_pins: dict[str, list[Pin]] = {}
        self.ends: dict[str, list[tuple[int, str]]] = {}  # net -> (element index, "a" | "b")
        kinds = ((comp, classify(comp)) for comp in self.graph.netlist.components)
        parts = [(comp, elements_of(comp, self.config, kind)) for comp, kind in kinds if not _ignored(comp, kind)]
        guards = _guards([e for _, elems in parts for e in elems or ()])
        for comp, elems in parts:
            if comp.ref in guards.values():
                continue  # an antiparallel protection diode: part of the LED it guards
            used = {p for e in elems or () for p in (e.a, e.b)}
            for e in elems or ():
                i = len(self.elements)
                guard, held = guards.get(e.id, ""), self._held(comp, e)
                self.elements.append(replace(e, guard=guard, held=held) if guard or held else e)
                self.ends.setdefault(e.net_a, []).append((i, "a"))
                self.ends.setdefault(e.net_b, []).append((i, "b"))
            for pin in comp.pins:
                if pin.net is not None and pin.number not in used and not pin.no_connect:
                    self.other_pins.setdefault(pin.net, []).append(pin)
        self.segments = self._chain()
        # Indexes for the recogniser's queries, which it asks once per circuit on a large board.
        self._at: dict[str, list[Segment]] = {}
        for seg in self.segments:
            for net in dict.fromkeys((seg.top, seg.bottom)):
                self._at.setdefault(net, []).append(seg)
        self._forward: dict[str, list[Element]] = {}
        for e in self.elements:
            if e.kind in (ElementKind.DIODE, ElementKind.LED):
                self._forward.setdefault(e.net_a, []).append(e)
        self._terminals: dict[str, Terminal] = {}

    def _held(self, comp: Component, e: Element) -> bool:
        """A MOSFET with its gate tied to the level that turns it on (a P-channel's to ground, an
        N-channel's to a rail), directly or through one resistor: the textbook reverse-polarity
        protection, fitted 'backwards' on purpose so its body diode conducts until the channel
        does (common practice)."""
        gate = comp.pin(e.control) if e.kind is ElementKind.SWITCH and e.part in (Kind.NMOS, Kind.PMOS) else None
        if gate is None or gate.net is None:
            return False

        def tied(net: str | None) -> bool:
            r = rail_params(net, self.config) if net else None
            return r is not None and (r.ground if e.part is Kind.PMOS else not r.ground and r.nominal > 0)

        if tied(gate.net):
            return True
        # Through a resistor, with nothing else on the gate but a clamp (a zener, a capacitor): a
        # pin, a connector or another transistor there would make it a switch after all.
        others = [p for p in self.graph.pins_on(gate.net) if p.ref != comp.ref]
        kinds = [classify(self.graph.component(p.ref) or comp) for p in others]
        if any(k not in (Kind.RESISTOR, Kind.DIODE, Kind.ZENER, Kind.CAPACITOR) for k in kinds):
            return False
        return any(k is Kind.RESISTOR and tied(self.graph.across(p.ref, p.number)) for p, k in zip(others, kinds))

    def internal(self, net: str) -> bool:
        ends = self.ends.get(net, ())
        return (len(ends) == 2 and not self.other_pins.get(net) and ends[0][0] != ends[1][0]
                and rail_params(net, self.config) is None and not is_supply_name(net))

    def _chain(self) -> list[Segment]:
        seen: set[int] = set()
        out = []
        for start in range(len(self.elements)):
            if start in seen:
                continue
            seen.add(start)
            chain = deque([self.elements[start]])
            for downward in (True, False):
                net = chain[-1].net_b if downward else chain[0].net_a
                while self.internal(net):
                    nxt = [(i, end) for i, end in self.ends[net] if i not in seen]
                    if not nxt:
                        break  # the chain closed on itself
                    i, end = nxt[0]
                    seen.add(i)
                    e = self.elements[i]
                    if downward:
                        e = e if end == "a" else e.flipped()  # enter at the top end
                        chain.append(e)
                        net = e.net_b
                    else:
                        e = e if end == "b" else e.flipped()
                        chain.appendleft(e)
                        net = e.net_a
            out.append(_orient(list(chain)))
        return out

    def terminal(self, net: str) -> Terminal:
        """What a segment-end net is to an LED circuit."""
        found = self._terminals.get(net)
        if found is None:
            found = self._terminals[net] = self._terminal(net)
        return found

    def _terminal(self, net: str) -> Terminal:
        rail = rail_params(net, self.config)
        if rail is not None:
            return Terminal(net, TerminalKind.GROUND if rail.ground else TerminalKind.RAIL, detail=rail.detail)
        others = self.other_pins.get(net, [])
        for pin in others:
            comp = self.graph.component(pin.ref)
            if comp is None:
                continue
            kind = classify(comp)
            if pin.type is PinType.POWER_OUT:
                return Terminal(net, TerminalKind.SUPPLY, pin, f"power output {pin.ref}.{pin.name or pin.number}")
            if kind is Kind.BRIDGE and pin.name in ("+", "-"):
                if pin.name == "+":
                    return Terminal(net, TerminalKind.SUPPLY, pin, f"rectifier {pin.ref} + output")
                return Terminal(net, TerminalKind.GROUND, pin, f"rectifier {pin.ref} - output")
        if is_supply_name(net):
            return Terminal(net, TerminalKind.SUPPLY, detail=f"net name {net!r}")
        driver = drive_pin(self.graph, others)
        if driver is not None:
            return Terminal(net, TerminalKind.PIN, driver, f"pin {driver.name or driver.number} of {driver.ref}")
        for pin in others:
            comp = self.graph.component(pin.ref)
            if comp is not None and classify(comp) is Kind.CONNECTOR:
                rest = self.holding(net, skip=pin)
                return Terminal(net, TerminalKind.CONNECTOR, pin, f"connector {pin.ref} pin {pin.number}"
                                + (f" (the net also holds {rest})" if rest else ""))
        ends = self.ends.get(net, ())
        if not others and len(ends) >= 3:
            return Terminal(net, TerminalKind.NODE)
        if not others and len(ends) <= 1:
            unfitted = sorted({p.ref for p in self.graph.pins_on(net)
                               if (c := self.graph.component(p.ref)) is not None and c.dnp})
            caps = sorted({p.ref for p in self.graph.pins_on(net) if (c := self.graph.component(p.ref)) is not None
                           and not c.dnp and classify(c) is Kind.CAPACITOR})
            detail = (f"only {', '.join(unfitted)}, marked do-not-populate, is connected to it" if unfitted else
                      f"only {', '.join(caps)} (open at DC) {'is' if len(caps) == 1 else 'are'} connected to it"
                      if caps else "nothing else is connected to it")
            return Terminal(net, TerminalKind.OPEN, detail=detail)
        return Terminal(net, TerminalKind.OTHER, others[0] if others else None, self.holding(net))

    def holding(self, net: str, skip: Pin | None = None, most: int = 4) -> str:
        """What a net holds besides the LEDs, for a reason a reviewer can check: "R69 pin 1 and D9 pin 2"."""
        pins = [p for p in self.graph.pins_on(net) if p is not skip and p.ref != (skip.ref if skip else None)
                and classify(self.graph.component(p.ref) or Component("", "")) not in (Kind.LED, Kind.CAPACITOR)]
        names = [f"{p.ref} pin {p.number}" for p in pins[:most]] + ([f"{len(pins) - most} more"] if len(pins) > most else [])
        return ", ".join(names[:-1]) + " and " + names[-1] if len(names) > 1 else "".join(names)

    def segments_at(self, net: str) -> list[Segment]:
        """Segments with an end on a net (a segment with both ends there appears once)."""
        return list(self._at.get(net, ()))

    def forward_from(self, net: str) -> list[Element]:
        """Diodes and LED dies whose anode is on a net."""
        return list(self._forward.get(net, ()))


def drive_pin(graph: NetGraph, pins: Iterable[Pin]) -> Pin | None:
    """The controller pin among `pins` that drives their net, if any: an output or I/O pin of an
    IC (not one of its supply pins), the strongest kind first."""
    drivers = []
    for pin in pins:
        comp = graph.component(pin.ref)
        if comp is not None and classify(comp) in (Kind.IC, Kind.OTHER) and pin.type in _DRIVE_RANK \
                and len(comp.pins) > 3 and not _SUPPLY_PIN.match(pin.name or ""):
            drivers.append(pin)
    return max(drivers, key=lambda p: _DRIVE_RANK[p.type]) if drivers else None


def _orient(chain: list[Element]) -> Segment:
    """Put a chain top to bottom so its LEDs conduct downward; note polar parts that oppose."""
    guide = [e for e in chain if e.kind is ElementKind.LED] or [e for e in chain if e.polar]
    if guide and guide[0].against:
        chain = [e.flipped() for e in reversed(chain)]
    opposed = tuple(e for e in chain if e.polar and e.against and e.kind is not ElementKind.SWITCH)
    swapped = tuple(e for e in chain if e.kind is ElementKind.SWITCH and e.against and not e.held)
    return Segment(tuple(chain), chain[0].net_a, chain[-1].net_b, opposed, swapped)
