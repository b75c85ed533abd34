"""Islands on every sheet instance joined into nets, and each net named as KiCad names it.

Joining (eeschema/connection_graph.cpp, `processSubGraphs`, `propagateToNeighbors`; KiCad
Schematic Editor manual, "Labels", "Hierarchical schematics", "Buses", "Power symbols"):

* On one sheet instance, islands that carry the same user-given name join: local, global and
  hierarchical labels and power symbols alike.
* Global labels and power symbols join across all sheets by name.
* A sheet pin joins the island, inside that sheet's instance, holding the hierarchical label
  of the same name.
* A bus label names member nets (`D[0..7]` gives D0…D7, `MEM{A B}` gives MEM.A and MEM.B, a bus
  alias between braces gives its members). A wire labelled with a member's name on the same
  sheet is that member; through sheet pins, members pair by position in a vector and by name
  in a group.

Naming: each island's driver is its best item by KiCad's rank (naming.Rank), ties going to a
power symbol's pin, then to a name that is not a bare pad number, then to the first name in
text order. Across a net the winner is a global label or power symbol if there is one; else,
for a bus member, the bus's name for it; else the strongest driver, the one nearest the root
sheet on equal rank, the first by name after that. A net held only by pins takes a pin's
generated name, `unconnected-(…)` when one pin is all there is or a no-connect flag sits on it.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import NamedTuple

from ledlint.errors import InputError
from ledlint.netlist.kicad_sch import geometry
from ledlint.netlist.kicad_sch.naming import (
    Bus, PinNaming, Rank, escape_net_name, low_quality, parse_bus, pin_net_name, stacked_numbers, unit_suffix,
)
from ledlint.netlist.kicad_common import natural
from ledlint.netlist.kicad_sch.parse import LabelKind, LibSymbol
from ledlint.netlist.kicad_sch.read import VALUE_NAMES_POWER_NETS, Design, Placement

_LABEL_RANKS = {LabelKind.LOCAL: Rank.LOCAL_LABEL, LabelKind.GLOBAL: Rank.GLOBAL, LabelKind.HIER: Rank.HIER_LABEL}
# KiCad 7 (file format 2022 on) writes a named pin's generated net name as REF-NAME; KiCad 6
# (20211123 and before) as REF-PadN (kicad-netlist-format.md, net-name table).
NAMED_PIN_NAMES = 20211124


class PinAt(NamedTuple):
    """A placed pin: sheet instance, symbol index in that sheet's file, pin number."""

    instance: int
    symbol: int
    number: str


@dataclass(frozen=True, slots=True)
class Driver:
    rank: Rank
    name: str  # as KiCad compares it on one sheet, without the sheet path
    power_symbol: bool = False  # the pin of a power symbol (preferred over a hidden power pin)
    output: bool = False  # a sheet pin of output shape (preferred among sheet pins)
    pin: PinNaming | None = None


@dataclass
class _Subgraph:
    instance: int
    island: geometry.Island
    drivers: list[Driver]
    driver_count: int  # KiCad's m_drivers, which counts pins of power flags too
    driver: Driver
    full: str = ""  # the driver's name with its sheet path where it takes one
    bus: Bus | None = None
    depth: int = 0


@dataclass
class Nets:
    """Every placed pin's net, the nets that carry a no-connect flag, the pins left on a bus."""

    placements: list[list[Placement]]
    libs: list[list[LibSymbol]]
    pin_net: dict[PinAt, str] = field(default_factory=dict)
    placed: dict[PinAt, geometry.PlacedPin] = field(default_factory=dict)
    no_connect: set[str] = field(default_factory=set)
    bus_pins: list[PinAt] = field(default_factory=list)


class _Union(geometry.UnionFind):
    """Union-find over subgraphs and over names: a name is a node too, so everything that
    carries it lands in one set."""

    def __init__(self) -> None:
        super().__init__()
        self.keys: dict[tuple[str, ...], int] = {}

    def key(self, key: tuple[str, ...]) -> int:
        got = self.keys.get(key)
        if got is None:
            got = self.keys[key] = self.add()
        return got


def _lib_of(design: Design, inst: int, k: int) -> LibSymbol:
    file = design.instances[inst].file
    sym = file.symbols[k]
    lib = file.lib_symbols.get(sym.lib_name or sym.lib_id)
    if lib is None:
        raise InputError(f"symbol {sym.prop('Reference') or sym.lib_id} uses library symbol "
                         f"{sym.lib_name or sym.lib_id!r}, which the file's (lib_symbols) does not define",
                         file.path, sym.line, sym.column)
    return lib


class _Builder:
    def __init__(self, design: Design) -> None:
        self.design = design
        self.named_pins = design.root.version >= NAMED_PIN_NAMES
        self.value_names_power = design.root.version >= VALUE_NAMES_POWER_NETS
        self.placements = [[design.placement(inst, s) for s in inst.file.symbols] for inst in design.instances]
        self.libs = [[_lib_of(design, i, k) for k in range(len(inst.file.symbols))]
                     for i, inst in enumerate(design.instances)]
        self.subgraphs: list[_Subgraph] = []
        self.pin_names: dict[tuple[int, int, int], dict[str, list[tuple[str, bool]]]] = {}
        self.islands: dict[tuple[str, tuple[int, ...]], list[geometry.Island]] = {}

    def islands_of(self, i: int) -> list[geometry.Island]:
        inst = self.design.instances[i]
        units = tuple(p.unit for p in self.placements[i])
        key = (inst.file.path, units)
        got = self.islands.get(key)
        if got is None:
            pins = [pp for k, sym in enumerate(inst.file.symbols)
                    for pp in geometry.place(k, sym, self.libs[i][k], units[k])]
            got = self.islands[key] = geometry.islands(inst.file, pins)
        return got

    def power_name(self, i: int, k: int, lib: LibSymbol, pin_name: str) -> str:
        """A power symbol names its net by its value (KiCad 8 on; files older than 20230221 get
        the hidden pin's name as value, `FixLegacyPowerSymbolMismatches`); a hidden power input
        on an ordinary symbol by the pin's name."""
        if not lib.power:
            return escape_net_name(pin_name)
        first = lib.pins[0] if lib.pins else None
        if not self.value_names_power and first is not None and first.type == "power_in" and first.hidden:
            return escape_net_name(first.name)
        sym = self.design.instances[i].file.symbols[k]
        value = self.placements[i][k].value or sym.prop("Value") or ""
        return escape_net_name(value)

    def subgraph(self, i: int, island: geometry.Island) -> _Subgraph | None:
        inst = self.design.instances[i]
        drivers: list[Driver] = []
        count = 0
        for label in island.labels:
            drivers.append(Driver(_LABEL_RANKS[label.kind], escape_net_name(label.text)))
        for _, sp in island.sheet_pins:
            drivers.append(Driver(Rank.SHEET_PIN, escape_net_name(sp.name), output=sp.shape == "output"))
        unconnected = island.no_connect or island.nc_pin
        for pp in island.pins:
            lib = self.libs[i][pp.symbol]
            place = self.placements[i][pp.symbol]
            if pp.pin.type == "power_in" and lib.power == "local":
                rank = Rank.LOCAL_POWER
            elif pp.pin.type == "power_in" and (pp.pin.hidden or lib.power == "global"):
                rank = Rank.POWER
            else:
                annotated = bool(place.ref) and not place.ref.endswith("?")
                if annotated:
                    count += 1  # a driver, though a power flag's pin never names the net
                if annotated and not place.ref.startswith("#"):
                    naming = self.pin_naming(i, pp, place, lib, unconnected)
                    drivers.append(Driver(Rank.PIN, pin_net_name(naming, unconnected, self.named_pins),
                                          pin=naming))
                continue
            count += 1
            drivers.append(Driver(rank, self.power_name(i, pp.symbol, lib, pp.pin.name), power_symbol=bool(lib.power)))
        count += len(island.labels) + len(island.sheet_pins)
        if not drivers:
            return None
        best = max(d.rank for d in drivers)
        candidates = [d for d in drivers if d.rank == best]
        if best is Rank.SHEET_PIN:
            driver = next((d for d in candidates if d.output), candidates[0])
        else:
            driver = min(candidates, key=lambda d: (not d.power_symbol, low_quality(d.name), d.name))
        sg = _Subgraph(i, island, drivers, count, driver, depth=inst.depth)
        sg.full = inst.names + driver.name if driver.rank.sheet_prefixed else driver.name
        if driver.rank in (Rank.SHEET_PIN, Rank.HIER_LABEL, Rank.LOCAL_LABEL, Rank.GLOBAL):
            sg.bus = parse_bus(driver.name, self.design.aliases)
        return sg

    def pin_naming(self, i: int, pp: geometry.PlacedPin, place: Placement, lib: LibSymbol,
                   unconnected: bool) -> PinNaming:
        sym = self.design.instances[i].file.symbols[pp.symbol]
        key = (id(lib), place.unit, sym.body)
        names = self.pin_names.get(key)
        if names is None:
            names = self.pin_names[key] = {}
            for q in lib.pins:
                if q.unit in (0, place.unit) and q.body in (0, sym.body):
                    names.setdefault(q.name, []).append((q.number, q.type == "no_connect"))
        # Another pin of the unit with this name makes the name ambiguous, so the pad is added.
        duplicate = any(number != pp.pin.number and nc == unconnected for number, nc in names.get(pp.pin.name, ()))
        unit = unit_suffix(place.unit, self.design.unit_first, self.design.unit_separator) \
            if lib.unit_count > 1 else ""
        # A stacked pin is named after its lowest pad (KiCad 10).
        number = min(stacked_numbers(pp.pin.number), key=natural)
        return PinNaming(place.ref, place.ref + unit, number, pp.pin.name, duplicate,
                         not place.ref.endswith("?"), sym.uuid)

    def build(self) -> Nets:
        design = self.design
        nets = Nets(self.placements, self.libs)
        pin_owner: list[dict[tuple[int, str], int]] = []
        hier: list[dict[str, list[int]]] = []
        for i in range(len(design.instances)):
            owners: dict[tuple[int, str], int] = {}
            ports: dict[str, list[int]] = {}
            for island in self.islands_of(i):
                sg = self.subgraph(i, island)
                if sg is None:
                    continue
                n = len(self.subgraphs)
                self.subgraphs.append(sg)
                for k, sp in island.sheet_pins:
                    owners[(k, escape_net_name(sp.name))] = n
                for label in island.labels:
                    if label.kind is LabelKind.HIER:
                        ports.setdefault(escape_net_name(label.text), []).append(n)
            pin_owner.append(owners)
            hier.append(ports)
        self.suffix_weak_names()
        union = _Union()
        for _ in self.subgraphs:
            union.add()
        member_claims: dict[int, list[tuple[tuple[int, int, int, str], str]]] = {}
        for n, sg in enumerate(self.subgraphs):
            self.join_names(union, n, sg, member_claims)
        for c, inst in enumerate(design.instances):
            if inst.record is None:
                continue
            parent = design.instances[inst.parent]
            k = next(j for j, r in enumerate(parent.file.sheets) if r is inst.record)
            for sp in inst.record.pins:
                name = escape_net_name(sp.name)
                outer = pin_owner[inst.parent].get((k, name))
                if outer is None:
                    continue
                for inner in hier[c].get(name, ()):
                    self.join_across(union, outer, inner)
        return self.name_nets(union, member_claims, nets)

    def join_names(self, union: _Union, n: int, sg: _Subgraph,
                   member_claims: dict[int, list[tuple[tuple[int, int, int, str], str]]]) -> None:
        """Same-sheet names, global names, and the member nets a bus label names."""
        inst = str(sg.instance)
        for d in sg.drivers:
            if not d.rank.strong:
                continue
            union.join(n, union.key(("sheet", inst, d.name)))
            if d.rank.global_scope:
                union.join(n, union.key(("global", d.name)))
        if sg.bus is None or not sg.driver.rank.strong:
            return
        prefix = self.design.instances[sg.instance].names if sg.driver.rank.sheet_prefixed else ""
        for m in sg.bus.members:
            member_claims.setdefault(union.key(("sheet", inst, m.full)), []).append(
                ((1, -sg.driver.rank, sg.depth, prefix + m.full), prefix + m.full))
        for d in sg.drivers:
            # A second bus label on the same bus: its members are the chosen label's, matched
            # by position or name (KiCad renames them to the chosen driver's members).
            other = parse_bus(d.name, self.design.aliases) if d.rank.strong and d is not sg.driver else None
            for m in other.members if other is not None else ():
                match = sg.bus.match(m)
                if match is not None:
                    union.join(union.key(("sheet", inst, match.full)), union.key(("sheet", inst, m.full)))

    def join_across(self, union: _Union, outer: int, inner: int) -> None:
        """A sheet pin's island and the island inside holding its hierarchical label."""
        a, b = self.subgraphs[outer], self.subgraphs[inner]
        if (a.bus is None) != (b.bus is None):
            return  # a bus pin on a net label, or the reverse: KiCad leaves them apart
        if a.bus is None or b.bus is None:
            union.join(outer, inner)
            return
        for m in b.bus.members:
            match = a.bus.match(m)
            if match is not None:
                union.join(union.key(("sheet", str(a.instance), match.full)),
                           union.key(("sheet", str(b.instance), m.full)))

    def suffix_weak_names(self) -> None:
        """Islands named only by a sheet pin or a pin that share a name with another island get
        `_1`, `_2`… (the last one keeps the name), so that unrelated nets stay apart."""
        by_name: dict[str, list[_Subgraph]] = {}
        for sg in self.subgraphs:
            by_name.setdefault(sg.full, []).append(sg)
        taken = set(by_name)
        for name, group in by_name.items():
            if len(group) < 2:
                continue
            weak = [sg for sg in group if not sg.driver.rank.strong]
            if len(weak) == len(group):
                weak = weak[:-1]
            for sg in weak:
                k = 1
                while f"{name}_{k}" in taken:
                    k += 1
                sg.full = f"{name}_{k}"
                taken.add(sg.full)

    def name_nets(self, union: _Union, member_claims: dict[int, list[tuple[tuple[int, int, int, str], str]]],
                  nets: Nets) -> Nets:
        groups: dict[int, list[int]] = {}
        for n, sg in enumerate(self.subgraphs):
            if sg.bus is None:
                groups.setdefault(union.find(n), []).append(n)
        claims: dict[int, list[tuple[tuple[int, int, int, str], str]]] = {}
        for node, found in member_claims.items():
            claims.setdefault(union.find(node), []).extend(found)
        for root, members in groups.items():
            options = list(claims.get(root, ()))
            for n in members:
                sg = self.subgraphs[n]
                d = sg.driver
                if d.rank.global_scope:
                    options.append(((0, -d.rank, not d.power_symbol, d.name), d.name))
                elif d.rank.strong:
                    options.append(((2, -d.rank, sg.depth, sg.full), sg.full))
                else:
                    options.append(((3, -d.rank, sg.depth, sg.full), self.weak_name(sg, len(members))))
            name = min(options)[1]
            for n in members:
                sg = self.subgraphs[n]
                if sg.island.no_connect:
                    nets.no_connect.add(name)
                for pp in sg.island.pins:
                    key = PinAt(sg.instance, pp.symbol, pp.pin.number)
                    nets.pin_net.setdefault(key, name)
                    nets.placed.setdefault(key, pp)
        for sg in self.subgraphs:
            if sg.bus is not None:
                nets.bus_pins.extend(PinAt(sg.instance, pp.symbol, pp.pin.number) for pp in sg.island.pins)
        return nets

    def weak_name(self, sg: _Subgraph, members: int) -> str:
        """A net held by pins alone; one pin with nothing else is `unconnected-(…)`
        (`buildConnectionGraph`: "weakly-driven single-pin nets get the unconnected_ prefix")."""
        d = sg.driver
        if members == 1 and sg.driver_count == 1 and d.pin is not None:
            return pin_net_name(d.pin, True, self.named_pins)
        return sg.full


def build_nets(design: Design) -> Nets:
    """The net of every placed pin in the design."""
    return _Builder(design).build()
