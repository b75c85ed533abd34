"""Recogniser: every LED of a netlist into exactly one circuit with a kind.

Kinds: a series string (one LED is a string of one) with its ballast; a shared-resistor bank
(strings in parallel behind one resistor, possibly each switched by its own pin); a
transistor current sink or a constant-current driver IC feeding one or more strings;
addressable LEDs (chained by data in/out); multiplexed LEDs (driver pins at both ends);
not fitted; and unrecognised, always with the reason.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from enum import Enum

from ledlint.config import DRIVER_KEYS, Config
from ledlint.circuits.graph import NetGraph
from ledlint.netlist.model import Component, Pin
from ledlint.parts.kinds import Kind, classify, led_dies, transistor_pins
from ledlint.circuits.topology import Element, ElementKind, Segment, Terminal, TerminalKind, Topology


class CircuitKind(Enum):
    STRING = "series-string"
    BANK = "shared-resistor-bank"
    SINK = "current-sink"
    DRIVER = "constant-current-driver"
    ADDRESSABLE = "addressable"
    MULTIPLEXED = "multiplexed"
    NOT_FITTED = "not-fitted"
    UNRECOGNISED = "unrecognised"


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
class Sink:
    """A transistor current sink: I = (V_ref − V_BE) / R_E, or V_BE / R_E with a sense transistor."""

    transistor: Element
    sense: tuple[Element, ...]  # emitter or source resistors
    reference: Reference


@dataclass(frozen=True)
class DriverIC:
    """A constant-current driver IC: its output pin, its sense resistors, and its description."""

    ref: str
    output: Pin
    sense: tuple[str, ...]
    settings: tuple[tuple[str, str, str], ...]  # (key, text, where) for the driver keys found


@dataclass(frozen=True)
class Branch:
    """One string of a circuit: its elements top (anode side) to bottom."""

    elements: tuple[Element, ...]
    far: Terminal | None = None  # in an individually driven bank: this string's own end

    @property
    def leds(self) -> tuple[Element, ...]:
        return tuple(e for e in self.elements if e.kind is ElementKind.LED)


@dataclass(frozen=True)
class LedCircuit:
    """A recognised LED circuit."""

    id: str
    kind: CircuitKind
    leds: tuple[str, ...]  # die ids, "D4" or "D4:R"
    branches: tuple[Branch, ...] = ()
    top: tuple[Element, ...] = ()  # common elements between the source and the strings
    bottom: tuple[Element, ...] = ()  # common elements between the strings and the return
    source: Terminal | None = None
    ret: Terminal | None = None
    node: str = ""  # a bank's shared net
    individually_driven: bool = False
    sink: Sink | None = None
    driver: DriverIC | None = None
    blocked: str = ""  # why the string can never conduct
    never_lights: bool = False  # an end is left open: the LED can never conduct
    reason: str = ""  # unrecognised, multiplexed, addressable, not fitted: what the tool saw
    line: int = 0
    sheet: str = "/"

    @property
    def elements(self) -> tuple[Element, ...]:
        return self.top + tuple(e for b in self.branches for e in b.elements) + self.bottom

    @property
    def resistors(self) -> tuple[Element, ...]:
        return tuple(e for e in self.elements if e.kind is ElementKind.RESISTOR)

    @property
    def shared_resistors(self) -> tuple[Element, ...]:
        """Resistors every string's current passes through: a bank's shared ballast, if any."""
        return tuple(e for e in self.top + self.bottom if e.kind is ElementKind.RESISTOR)

    @property
    def reversed_switches(self) -> tuple[Element, ...]:
        """Transistors in the LEDs' path fitted with their main terminals swapped."""
        return tuple(e for e in self.elements if e.kind is ElementKind.SWITCH and e.against and not e.held)

    @property
    def refs(self) -> tuple[str, ...]:
        """Every part of the circuit, LEDs first, without repeats."""
        refs = [i.split(":")[0] for i in self.leds] + [e.ref for e in self.elements]
        if self.sink:
            refs += [self.sink.transistor.ref, *(e.ref for e in self.sink.sense), *self.sink.reference.refs]
        if self.driver:
            refs += [self.driver.ref, *self.driver.sense]
        return tuple(dict.fromkeys(refs))

    @property
    def nets(self) -> tuple[str, ...]:
        nets = [t.net for t in (self.source, self.ret) if t is not None]
        if self.node:
            nets.append(self.node)
        return tuple(dict.fromkeys(nets))


_DIGITS = re.compile(r"(\d+)")
_SENSE_PIN = re.compile(r"^(CS|CSN|CSP|ISENSE|SENSE|ISNS|ISET|RSET|IADJ|ADJ|FB|RS|IREF)[+-]?\d*$", re.I)
_DRIVER_WORDS = re.compile(r"led driver|current sink|constant[ -]current|current regulator|led controller", re.I)


def _natural(text: str) -> tuple:
    return tuple(int(p) if p.isdigit() else p for p in _DIGITS.split(text))


class _Recogniser:
    def __init__(self, graph: NetGraph, config: Config) -> None:
        self.graph = graph
        self.config = config
        self.topo = Topology(graph, config)
        self.done: set[str] = set()  # LED die ids already in a circuit
        self.out: list[LedCircuit] = []

    # ------------------------------------------------------------ small pieces
    def comp(self, ref: str) -> Component:
        c = self.graph.component(ref)
        assert c is not None
        return c

    def emit(self, kind: CircuitKind, leds: list[str], **kw: object) -> None:
        leds = sorted(dict.fromkeys(leds), key=_natural)
        if isinstance(kw.get("branches"), tuple):
            # Parallel strings in reference order, not the export's: a re-export that reorders the
            # netlist then gives the same Monte Carlo draws per string, so the same report.
            kw["branches"] = tuple(sorted(kw["branches"], key=_branch_key))  # type: ignore[call-overload]
        first = self.comp(leds[0].split(":")[0])
        self.done.update(leds)
        self.out.append(LedCircuit(id=leds[0], kind=kind, leds=tuple(leds), line=first.line, sheet=first.sheet,
                                   **kw))  # type: ignore[arg-type]

    def unrecognised(self, leds: list[str], reason: str, **kw: object) -> None:
        self.emit(CircuitKind.UNRECOGNISED, leds, reason=reason, **kw)

    def settings_of(self, comp: Component) -> dict[str, tuple[str, str]]:
        """A part's driver keys from the configuration and its fields: key → (text, where)."""
        found = {k: v for k, v in self.config.part_settings(comp.ref, comp.value, comp.lib, comp.part).items()
                 if k in DRIVER_KEYS}
        for key in DRIVER_KEYS:
            text = comp.field(key)
            if text:
                found[key] = (text, f"field {key} on {comp.ref}")
        return found

    def driver_of(self, pin: Pin | None, string: tuple[Element, ...] = ()) -> DriverIC | None:
        """The driver IC behind a pin, when the IC is described or looks like one."""
        if pin is None:
            return None
        comp = self.comp(pin.ref)
        found = self.settings_of(comp)
        names = {p.name.upper() for p in comp.pins}
        looks = bool(_DRIVER_WORDS.search(" ".join((comp.value, comp.part, comp.description,
                                                     comp.properties.get("ki_keywords", "")))))
        looks = looks or any(_SENSE_PIN.match(n) for n in names)
        if not found and not looks:
            return None
        sense_names = [s.strip().upper() for s in found.get("sense_pins", ("",))[0].split(",") if s.strip()]
        sense_nets = {p.net for p in comp.pins if p.net is not None and (
            (sense_names and (p.name.upper() in sense_names or p.number in sense_names))
            or (not sense_names and _SENSE_PIN.match(p.name or "")))}
        in_string = {e.ref for e in string}
        sense_refs = []
        for net in sense_nets:
            for c in self.graph.parts_on(net):
                if classify(c) is not Kind.RESISTOR or c.ref in in_string:
                    continue
                # A sense resistor runs from a sense pin to ground, to another sense pin or to the
                # output the LEDs hang on (high-side sense); a pull-up on the same net is not one.
                ends = {p.net for p in c.pins} - {net}
                if ends & (sense_nets | {pin.net}) or any(self.topo.terminal(n).kind is TerminalKind.GROUND
                                                          for n in ends if n):
                    sense_refs.append(c.ref)
        return DriverIC(comp.ref, pin, tuple(sorted(dict.fromkeys(sense_refs), key=_natural)),
                        tuple((k, t, w) for k, (t, w) in sorted(found.items())))

    def regulator_driver(self, reg: Element) -> DriverIC:
        """A two-terminal regulator as a driver: described in fields or configuration, or by its value."""
        comp = self.comp(reg.ref)
        found = self.settings_of(comp)
        found.setdefault("driver", ("two-terminal", f"{reg.ref} is a two-terminal current regulator"))
        if "current" not in found:
            found["current"] = (comp.value, f"value {comp.value!r} of {reg.ref}")
        pin = comp.pin(reg.a)
        assert pin is not None
        return DriverIC(comp.ref, pin, (), tuple((k, t, w) for k, (t, w) in sorted(found.items())))

    # ------------------------------------------------------------ current sinks
    def reference(self, transistor: Element) -> Reference:
        """What sets the base (or gate) voltage of a sink transistor."""
        comp = self.comp(transistor.ref)
        ctrl = comp.pin(transistor.control) if transistor.control else None
        if ctrl is None or ctrl.net is None:
            return Reference(ReferenceKind.UNKNOWN, detail="its base or gate is not connected")
        net = ctrl.net
        parts = [c for c in self.graph.parts_on(net) if c.ref != comp.ref and not c.dnp]
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
            other = self.graph.across(r.ref, next(p.number for p in r.pins if p.net == net))
            if other and self.topo.terminal(other).kind in (TerminalKind.RAIL, TerminalKind.SUPPLY):
                rail = other
        if zeners:
            return Reference(ReferenceKind.ZENER, (zeners[0].ref,) + tuple(r.ref for r in feeds), rail,
                             detail=f"zener {zeners[0].ref} holds the base")
        chain = self.diode_chain(net)
        if chain:
            return Reference(ReferenceKind.DIODES, chain, rail, detail=f"{len(chain)} diode(s) in series hold the base")
        term = self.topo.terminal(net)
        if term.kind is TerminalKind.PIN:
            return Reference(ReferenceKind.PIN, (term.pin.ref,) if term.pin else (), pin=term.pin, detail=term.detail)
        grounded = [r for r in feeds if self.topo.terminal(self.graph.across(r.ref, next(
            p.number for p in r.pins if p.net == net)) or "").kind is TerminalKind.GROUND]
        if rail and grounded:
            return Reference(ReferenceKind.DIVIDER, tuple(r.ref for r in feeds), rail, detail="a resistor divider sets the base")
        for r in feeds:  # through a base resistor from a controller pin
            other = self.graph.across(r.ref, next(p.number for p in r.pins if p.net == net))
            t = self.topo.terminal(other) if other else None
            if t and t.kind is TerminalKind.PIN:
                return Reference(ReferenceKind.PIN, (r.ref, t.pin.ref if t.pin else ""), pin=t.pin,
                                 detail=f"{t.detail} through {r.ref}")
        return Reference(ReferenceKind.UNKNOWN, tuple(c.ref for c in parts), detail=f"net {net} holds {len(parts)} other part(s)")

    def diode_chain(self, net: str) -> tuple[str, ...]:
        """Diodes (or LEDs) in series from `net` down to ground, anodes up; () if they do not reach it."""
        refs: list[str] = []
        while self.topo.terminal(net).kind is not TerminalKind.GROUND:
            step = [e for e in self.topo.elements if e.kind in (ElementKind.DIODE, ElementKind.LED)
                    and e.net_a == net and e.ref not in refs]
            if len(step) != 1 or len(refs) > 8:
                return ()
            refs.append(step[0].ref)
            net = step[0].net_b
        return tuple(refs)

    def sink_in(self, elements: tuple[Element, ...], end: str) -> tuple[Sink, Terminal] | None:
        """A current sink made of `elements` (transistor first) ending at net `end`."""
        switches = [i for i, e in enumerate(elements) if e.kind is ElementKind.SWITCH and e.part in (Kind.NPN, Kind.NMOS)]
        if not switches:
            return None
        i = switches[-1]
        q = elements[i]
        below = elements[i + 1:]
        if below and all(e.kind is ElementKind.RESISTOR for e in below):
            term = self.topo.terminal(end)
            if term.kind is TerminalKind.GROUND:
                return Sink(q, below, self.reference(q)), term
            return None
        if below:
            return None
        # The emitter net is not internal: a sense transistor's base sits on it.
        resistors = [s for s in self.topo.segments_at(q.net_b)
                     if not s.leds and s.elements and all(e.kind is ElementKind.RESISTOR for e in s.elements)
                     and q not in s.elements]
        if len(resistors) == 1:
            seg = resistors[0]
            far = seg.bottom if seg.top == q.net_b else seg.top
            term = self.topo.terminal(far)
            if term.kind is TerminalKind.GROUND:
                elems = seg.elements if seg.top == q.net_b else tuple(e.flipped() for e in reversed(seg.elements))
                return Sink(q, elems, self.reference(q)), term
        return None

    # ------------------------------------------------------------ circuits
    def run(self) -> tuple[LedCircuit, ...]:
        self.addressable_and_unfitted()
        segments = [s for s in self.topo.segments if s.leds]
        for seg in segments:
            if seg.conflict and not any(e.id in self.done for e in seg.leds):
                self.blocked(seg)
        nodes = sorted({n for s in segments for n in (s.top, s.bottom)
                        if self.topo.terminal(n).kind is TerminalKind.NODE}, key=_natural)
        for node in nodes:
            self.node(node, [s for s in self.topo.segments_at(node)])
        groups: dict[tuple[str, str], list[Segment]] = {}
        for seg in segments:
            if not any(e.id in self.done for e in seg.leds):
                groups.setdefault((seg.top, seg.bottom), []).append(seg)
        for (top, bottom), segs in groups.items():
            self.between(top, bottom, segs)
        self.leftovers()
        return tuple(sorted(self.out, key=lambda c: _natural(c.id)))

    def addressable_and_unfitted(self) -> None:
        chains: dict[str, list[str]] = {}
        addressable = [c for c in self.graph.netlist.components if classify(c) is Kind.LED_ADDRESSABLE]
        parent = {c.ref: c.ref for c in addressable}

        def find(x: str) -> str:
            while parent[x] != x:
                parent[x] = parent[parent[x]]
                x = parent[x]
            return x

        for c in addressable:
            for p in c.pins:
                if p.net and p.name.upper() in ("DOUT", "DO", "SDO"):
                    for q in self.graph.pins_on(p.net):
                        if q.ref in parent and q.name.upper() in ("DIN", "DI", "SDI"):
                            parent[find(q.ref)] = find(c.ref)
        for c in addressable:
            chains.setdefault(find(c.ref), []).append(c.ref)
        for refs in chains.values():
            first = self.comp(min(refs, key=_natural))
            vdd = next((p.net for p in first.pins if p.name.upper() in ("VDD", "VCC", "V+", "VLED") and p.net), None)
            vss = next((p.net for p in first.pins if p.name.upper() in ("VSS", "GND", "V-") and p.net), None)
            self.emit(CircuitKind.ADDRESSABLE, refs, source=self.topo.terminal(vdd) if vdd else None,
                      ret=self.topo.terminal(vss) if vss else None,
                      reason=f"{len(refs)} LED(s) with their own controllers, chained by data in/out; "
                             "their current is set inside each LED, so no electrical check applies")
        for comp in self.graph.netlist.components:
            if classify(comp) is not Kind.LED:
                continue
            dies = led_dies(comp)
            ids = [f"{comp.ref}:{d.name}" if d.name else comp.ref for d in dies] or [comp.ref]
            if comp.dnp:
                self.emit(CircuitKind.NOT_FITTED, ids, reason=f"{comp.ref} is marked do-not-populate")
                continue
            for d, i in zip(dies, ids):
                open_pins = [n for n in (d.anode, d.cathode) if getattr(comp.pin(n), "net", None) is None]
                if open_pins:
                    self.unrecognised([i], f"pin {', '.join(open_pins)} of {i} is on no net",
                                      never_lights=True)

    def blocked(self, seg: Segment) -> None:
        top, bottom = self.topo.terminal(seg.top), self.topo.terminal(seg.bottom)
        self.emit(CircuitKind.STRING, [e.id for e in seg.leds], branches=(Branch(seg.elements),), source=top,
                  ret=bottom, blocked=seg.conflict)

    def node(self, node: str, segs: list[Segment]) -> None:
        led_segs = [s for s in segs if s.leds and not any(e.id in self.done for e in s.leds)]
        if not led_segs:
            return
        passive = [s for s in segs if not s.leds]
        ids = [e.id for s in led_segs for e in s.leds]
        if len(passive) != 1:
            what = f"{len(passive)} other series parts" if passive else "nothing that leads to a supply"
            self.unrecognised(ids, f"net {node} joins {len(led_segs)} LED string(s) and {what}; "
                                   "not a string, bank or driver the tool knows", node=node)
            return
        common = passive[0]
        at_top = all(s.top == node for s in led_segs)  # strings hang below the node: it is on the anode side
        if not at_top and not all(s.bottom == node for s in led_segs):
            self.unrecognised(ids, f"LED strings meet at {node} from both sides", node=node)
            return
        # Orient the common path: above the node for anode-side, below it for cathode-side.
        if at_top:
            elems = common.elements if common.bottom == node else tuple(e.flipped() for e in reversed(common.elements))
            far_net = elems[0].net_a
        else:
            elems = common.elements if common.top == node else tuple(e.flipped() for e in reversed(common.elements))
            far_net = elems[-1].net_b
        ends = tuple(self.topo.terminal(s.bottom if at_top else s.top) for s in led_segs)
        branches = tuple(Branch(s.elements, t) for s, t in zip(led_segs, ends))
        fars = {t.net for t in ends}
        common_term = self.topo.terminal(far_net)
        if not at_top:
            found = self.sink_in(elems, far_net)
            if found:
                sink, term = found
                src = self.topo.terminal(next(iter(fars))) if len(fars) == 1 else None
                if src is None:
                    self.unrecognised(ids, f"strings on current sink {sink.transistor.ref} start from "
                                           f"{len(fars)} different nets", node=node)
                    return
                self.emit(CircuitKind.SINK, ids, branches=tuple(Branch(b.elements) for b in branches),
                          source=src, ret=term, node=node, sink=sink)
                return
        strange = (TerminalKind.NODE, TerminalKind.OTHER, TerminalKind.CONNECTOR, TerminalKind.OPEN)
        if common_term.kind in strange or any(t.kind in strange for t in ends):
            odd = common_term if common_term.kind in strange else next(t for t in ends if t.kind in strange)
            self.unrecognised(ids, f"strings sharing {node} continue to {odd.net} ({odd.detail or odd.kind.value}): "
                                   "not a supply, ground or driver pin the tool follows", node=node,
                              never_lights=odd.kind is TerminalKind.OPEN)
            return
        own = all(any(e.kind is ElementKind.RESISTOR for e in b.elements) for b in branches)
        if not own and not any(e.kind is ElementKind.RESISTOR for e in elems):
            # (Strings each with their own resistor may share a switch: a bank of ballasted strings.)
            self.unrecognised(ids, f"strings meet at {node}, which leads on through {', '.join(e.id for e in elems)} "
                                   "with no resistor", node=node)
            return
        source, ret = (common_term, None) if at_top else (None, common_term)
        kw: dict[str, object] = {"node": node, "top": elems if at_top else (), "bottom": () if at_top else elems}
        if len(fars) == 1:
            far = ends[0]
            source, ret = (common_term, far) if at_top else (far, common_term)
            plain = tuple(Branch(b.elements) for b in branches)
            if len(branches) == 1:
                self.emit(CircuitKind.STRING, ids, branches=plain, source=source, ret=ret, **kw)
            else:
                self.emit(CircuitKind.BANK, ids, branches=plain, source=source, ret=ret, **kw)
            return
        pins = all(t.kind is TerminalKind.PIN for t in ends)
        if pins and common_term.kind is TerminalKind.PIN:
            self.emit(CircuitKind.MULTIPLEXED, ids, branches=branches, source=source, ret=ret,
                      reason=f"both ends on driver pins ({common_term.detail} and the pins of "
                             f"{', '.join(sorted({t.pin.ref for t in ends if t.pin}))}); which LEDs "
                             "are lit together depends on firmware", **kw)
        else:
            self.emit(CircuitKind.BANK, ids, branches=branches, source=source, ret=ret,
                      individually_driven=True, **kw)

    def between(self, top: str, bottom: str, segs: list[Segment]) -> None:
        """LED strings whose both ends are terminals (not inner nodes)."""
        src, ret = self.topo.terminal(top), self.topo.terminal(bottom)
        for t in (src, ret):
            if t.kind in (TerminalKind.NODE,):
                return  # handled (or reported) by node()
        string = tuple(e for s in segs for e in s.elements)
        driver = self.driver_of(src.pin if src.kind is TerminalKind.PIN else None, string) or \
            self.driver_of(ret.pin if ret.kind is TerminalKind.PIN else None, string)
        regulators = [e for e in string if e.kind is ElementKind.REGULATOR]
        if driver is None and regulators and len(segs) == 1:
            driver = self.regulator_driver(regulators[0])
        ids = [e.id for s in segs for e in s.leds]
        if driver is not None:
            self.emit(CircuitKind.DRIVER, ids, branches=tuple(Branch(s.elements) for s in segs), source=src,
                      ret=ret, driver=driver, node=driver.output.net or "")
            return
        for seg in segs:
            ids = [e.id for e in seg.leds]
            found = self.sink_in(seg.elements, bottom)
            if found:
                sink, term = found
                self.emit(CircuitKind.SINK, ids, branches=(Branch(seg.elements[:seg.elements.index(sink.transistor)]),),
                          source=src, ret=term, sink=sink)
                continue
            odd = [t for t in (src, ret) if t.kind in (TerminalKind.OTHER, TerminalKind.CONNECTOR, TerminalKind.OPEN)]
            if odd:
                t = odd[0]
                side = "anode" if t is src else "cathode"
                if t.kind is TerminalKind.OPEN:
                    self.unrecognised(ids, f"the {side} side ends at net {t.net}, and {t.detail}",
                                      branches=(Branch(seg.elements),),
                                      source=src, ret=ret, never_lights=True)
                    continue
                where = ("goes off the board through " + t.detail if t.kind is TerminalKind.CONNECTOR else
                         f"holds {t.detail}: not a supply, ground or driver pin the tool follows")
                self.unrecognised(ids, f"the {side} side ends at net {t.net}, which {where}",
                                  branches=(Branch(seg.elements),), source=src, ret=ret)
            elif src.kind is TerminalKind.PIN and ret.kind is TerminalKind.PIN:
                self.emit(CircuitKind.MULTIPLEXED, ids, branches=(Branch(seg.elements),), source=src, ret=ret,
                          reason=f"both ends on driver pins ({src.detail}, {ret.detail})")
            else:
                self.emit(CircuitKind.STRING, ids, branches=(Branch(seg.elements),), source=src, ret=ret)

    def leftovers(self) -> None:
        for comp in self.graph.netlist.components:
            if classify(comp) is not Kind.LED:
                continue
            for d in led_dies(comp):
                i = f"{comp.ref}:{d.name}" if d.name else comp.ref
                if i not in self.done:
                    self.unrecognised([i], f"{i} is in a connection the tool does not follow")
        for comp in self.graph.netlist.components:
            if classify(comp) is Kind.LED and not led_dies(comp) and comp.ref not in self.done:
                if len(comp.pins) < 2:  # the other pin is on no net, and no library part lists it
                    what = "only one pin of it is" if comp.pins else "none of its pins is"
                    self.unrecognised([comp.ref], f"{what} in the netlist: the others are on no net",
                                      never_lights=True)
                else:
                    self.unrecognised([comp.ref], f"{comp.ref}'s pins do not read as anode and cathode")


def _branch_key(branch: Branch) -> tuple:
    leds = branch.leds or branch.elements
    return _natural(leds[0].id) if leds else ()


def recognise(graph: NetGraph, config: Config) -> tuple[LedCircuit, ...]:
    """The LED circuits of a netlist, in reference order; every LED die in exactly one."""
    return _Recogniser(graph, config).run()
