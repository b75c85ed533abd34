"""KiCad's netlist export however it is written: the records a reader takes from a .net file
(s-expressions) or from the XML that Eeschema hands its plugins, and their assembly into the
model. The two files hold the same tree (kicad-netlist-format.md §6.14), so the export's rules
live here once: library pins filling in what the nets leave out, KiCad 10's pin names, the
names old releases left empty, nodes that name no part, references written twice.

A reader gives each record a `where` of its own kind (a character offset, a line and column)
and one function that turns it into a line and column.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Any, Callable

from ledlint.errors import InputError
from ledlint.frozen import FrozenMap
from ledlint.netlist.kicad_common import empty_marker, is_kicad_property, marked_dnp
from ledlint.netlist.model import Component, Net, Netlist, Note, Pin, PinType, Sheet

Where = Any  # a position as its reader keeps it: an offset, a (line, column)
_DIGITS = re.compile(r"(\d+)")
_MANY = 10  # notes of one kind listed one by one; past this, counted
_NONE: FrozenMap = FrozenMap({})  # shared by the many parts with no fields or properties


@dataclass(slots=True)
class CompRecord:
    """A component as read, before the nets say where its pins go."""

    ref: str
    where: Where
    value: str = ""
    footprint: str = ""
    datasheet: str = ""
    description: str = ""
    lib: str = ""
    part: str = ""
    own_description: bool = False  # written on the part, not only in its library source
    fields: dict[str, str] = field(default_factory=dict)
    properties: dict[str, str] = field(default_factory=dict)
    sheet: str = "/"
    units: bool = False  # KiCad 10 lists each unit's pins

    def add_field(self, name: str, text: str) -> None:
        # KiCad 8+ repeats its own Footprint/Datasheet/Description fields here (§1.4).
        if (name == "Footprint" and text == self.footprint) or \
                (name == "Datasheet" and empty_marker(text) == self.datasheet) or \
                (name == "Description" and self.own_description):
            return
        if name:
            self.fields.setdefault(name, text)

    def add_property(self, name: str, text: str) -> None:
        if is_kicad_property(name):
            self.properties[name] = text
        elif name:
            self.fields.setdefault(name, text)


@dataclass(slots=True)
class NetRecord:
    """A net as read: its name, code, class and nodes (ref, pin, function, pin type, where)."""

    name: str
    code: str
    netclass: str
    where: Where
    nodes: list[tuple[str, str, str, str, Where]]


@dataclass
class Header:
    """What the export says about itself."""

    where: Where  # the root, where an error about the whole file points
    version: str
    version_where: Where = None  # where the version is written, when it is
    tool: str = ""
    source: str = ""
    date: str = ""
    sheets: tuple[Sheet, ...] = ()
    has_components: bool = False  # a (components …) section, even an empty one
    kicad10_sections: bool = False  # groups or variants, which only KiCad 10 writes


@dataclass
class _NodeInfo:
    net: str
    function: str
    pintype: str
    line: int


@dataclass
class Assembler:
    """Collects a reader's records and builds the Netlist from them."""

    path: str
    position: Callable[[Where], tuple[int, int]]  # a record's where as line and column
    notes: list[Note] = field(default_factory=list)
    comps: list[CompRecord] = field(default_factory=list)
    nets: list[NetRecord] = field(default_factory=list)
    libpins: dict[tuple[str, str], dict[str, tuple[str, str]]] = field(default_factory=dict)
    version: str = ""
    kicad10: bool = False

    def note(self, where: Where, message: str) -> None:
        line, col = self.position(where)
        self.notes.append(Note(line, col, message))

    def line(self, where: Where) -> int:
        return self.position(where)[0]

    def fail(self, where: Where, message: str) -> InputError:
        line, col = self.position(where)
        return InputError(message, self.path, line, col)

    def add_libpart(self, lib: str, names: list[str], pins: dict[str, tuple[str, str]]) -> None:
        """A library part's pins (number → name, type), found by its lib and name or by name alone."""
        for name in names:
            self.libpins.setdefault((lib, name), pins)
            self.libpins.setdefault(("", name), pins)

    def build(self, header: Header) -> Netlist:
        # An export cut short, or a stub, must not pass a CI gate as a clean board.
        if not header.has_components:
            raise self.fail(header.where, "no (components …) section: not a whole netlist (a truncated export?)")
        if not self.comps and not self.nets:
            raise self.fail(header.where, "no components and no nets: an empty netlist (a truncated export?)")
        version = self.version = header.version
        if version not in ("D", "E"):
            self.note(header.where if header.version_where is None else header.version_where, f"unknown netlist version {version!r}; read as version E")
        major = _tool_major(header.tool)
        self.kicad10 = header.kicad10_sections or major >= 10
        nodes, named = self._read_nets()
        if not self.kicad10 and not major:  # the guess is for files that do not say
            self.kicad10 = _numbered_functions(nodes)
        components = self._read_components(nodes)
        return Netlist(
            path=self.path, version=version or "E", tool=header.tool, source=header.source, date=header.date,
            sheets=header.sheets, components=components, nets=self._assemble_nets(named, components),
            notes=tuple(self.notes),
        )

    def _read_nets(self) -> tuple[dict[tuple[str, str], _NodeInfo], list[tuple[NetRecord, str]]]:
        nodes: dict[tuple[str, str], _NodeInfo] = {}
        items: list[tuple[NetRecord, str]] = []
        seen_names: set[str] = set()
        for net in self.nets:
            name = net.name or self._unnamed(net, len(items) + 1, seen_names)
            if name in seen_names:
                self.note(net.where, f"net name {name!r} appears twice; the second net's pins are merged into the first")
            seen_names.add(name)
            items.append((net, name))
            for ref, pin, function, pintype, where in net.nodes:
                if not ref or ref.startswith("#"):
                    continue  # power symbols and flags are never parts (§4)
                key = (ref, pin)
                old = nodes.get(key)
                if old is None:
                    nodes[key] = _NodeInfo(name, function, pintype, self.line(where))
                elif old.net != name:
                    self.note(where, f"pin {ref}.{pin} is on two nets, {old.net!r} and {name!r}; kept on {old.net!r}")
        return nodes, items

    def _unnamed(self, net: NetRecord, position: int, taken: set[str]) -> str:
        """A name for a net written without one. KiCad before 4.0 (the 2013 releases, version D)
        wrote "" for every net nobody named, told apart by code; later releases call such a net
        Net-(REF-PadN) after a pin on it (kicad-netlist-format.md, net-name shapes), so that name is given
        here. From a newer release an empty name means a hand-edited file: noted."""
        ref, pin = net.nodes[0][:2] if net.nodes else ("", "")
        if self.version == "D" and ref and pin:
            name = f"Net-({ref}-Pad{pin})"
            if name not in taken:
                return name
        name = f"(unnamed net {net.code or position})"
        self.note(net.where, f"a net without a name; reported as {name}")
        return name

    def _pin_name(self, function: str, number: str) -> str:
        # KiCad 10 writes pinfunction as name_number (§3.2); strip exactly that suffix.
        if self.kicad10:
            if function == number:
                return ""
            if function.endswith("_" + number):
                return function[: -len(number) - 1]
        return function

    def _read_components(self, nodes: dict[tuple[str, str], _NodeInfo]) -> tuple[Component, ...]:
        by_ref_nodes: dict[str, dict[str, _NodeInfo]] = {}
        for (ref, pin), info in nodes.items():
            by_ref_nodes.setdefault(ref, {})[pin] = info
        out: dict[str, Component] = {}
        for comp in self.comps:
            if not comp.ref:
                raise self.fail(comp.where, "component without a reference, (ref …)")
            if comp.ref.startswith("#"):
                continue
            if comp.ref in out:
                self.note(comp.where, f"reference {comp.ref} appears twice (first at line {out[comp.ref].line}); "
                                      "the second is ignored")
                continue
            if comp.units:
                self.kicad10 = True
            out[comp.ref] = self._component(comp, by_ref_nodes.pop(comp.ref, {}))
        strays = [(min(i.line for i in pins.values()), ref) for ref, pins in by_ref_nodes.items()]
        for line, ref in strays[:_MANY]:
            self.notes.append(Note(line, 1, f"net node names {ref!r}, which is not among the components"))
        if len(strays) > _MANY:  # one note for the rest: a stub or a corrupt file can name thousands
            self.notes.append(Note(strays[_MANY][0], 1, f"and {len(strays) - _MANY:,} more net nodes name "
                                                        "references that are not among the components"))
        return tuple(out.values())

    def _component(self, c: CompRecord, pin_nodes: dict[str, _NodeInfo]) -> Component:
        fields, properties = c.fields, c.properties
        dnp = "dnp" in properties or marked_dnp(c.value, fields)
        libpins = self.libpins.get((c.lib, c.part)) or self.libpins.get(("", c.part)) or {}
        pins = []
        numbers = pin_nodes.keys() | libpins.keys()
        for number in sorted(numbers, key=_natural) if len(numbers) > 1 else numbers:
            lib_name, lib_type = libpins.get(number, ("", ""))
            node = pin_nodes.get(number)
            if node is not None:
                base, _, flag = node.pintype.partition("+")
                name = self._pin_name(node.function, number) if node.function else lib_name
                type_text = base or lib_type
                pins.append(Pin(c.ref, number, name, PinType.from_text(type_text), node.net, flag == "no_connect"))
            else:
                pins.append(Pin(c.ref, number, lib_name, PinType.from_text(lib_type), None))
        return Component(
            ref=c.ref, value=c.value, footprint=c.footprint, datasheet=c.datasheet, description=c.description,
            lib=c.lib, part=c.part, fields=FrozenMap(fields) if fields else _NONE,
            properties=FrozenMap(properties) if properties else _NONE,
            dnp=dnp, exclude_from_bom="exclude_from_bom" in properties, sheet=c.sheet or "/",
            exclude_from_board="exclude_from_board" in properties, exclude_from_sim="exclude_from_sim" in properties,
            line=self.line(c.where), pins=tuple(pins),
        )

    def _assemble_nets(self, items: list[tuple[NetRecord, str]], components: tuple[Component, ...]) -> tuple[Net, ...]:
        pins_by_net: dict[str, list[Pin]] = {}
        for comp in components:
            for pin in comp.pins:
                if pin.net is not None:
                    pins_by_net.setdefault(pin.net, []).append(pin)
        nets: dict[str, Net] = {}
        for item, name in items:
            if name not in nets:
                nets[name] = Net(code=item.code, name=name, netclass=item.netclass,
                                 pins=tuple(pins_by_net.get(name, ())), line=self.line(item.where))
        return tuple(nets.values())


@lru_cache(maxsize=4096)  # pin numbers repeat across a board: "1", "2"
def _natural(number: str) -> tuple[int | str, ...]:
    return tuple(int(p) if p.isdigit() else p for p in _DIGITS.split(number))


def _tool_major(tool: str) -> int:
    m = re.search(r"(\d+)\.\d+", tool)
    return int(m.group(1)) if m else 0


def _numbered_functions(nodes: dict[tuple[str, str], _NodeInfo]) -> bool:
    """KiCad 10's pin functions without its tool line (a nightly, an edited file): every named
    pin written as name_number, at least three of them."""
    functions = [(info.function, pin) for (_, pin), info in nodes.items() if info.function]
    suffixed = [f for f, pin in functions if f.endswith("_" + pin) and f != "_" + pin]
    return len(suffixed) >= 3 and all(f == pin or f.endswith("_" + pin) for f, pin in functions)
