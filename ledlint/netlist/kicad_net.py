"""Reader: a KiCad s-expression netlist file (KiCad 4/5 to 10) to the Netlist model."""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from ledlint.frozen import FrozenMap

from ledlint.errors import InputError, byte_position
from ledlint.netlist.kicad_common import empty_marker, is_kicad_property, marked_dnp, read_bytes
from ledlint.netlist.model import Component, Net, Netlist, Note, Pin, PinType, Sheet
from ledlint.netlist.sexpr import Locator, SList, parse

_OTHER_ROOTS = {
    "kicad_pcb": "a KiCad board file",
    "kicad_sch": "a KiCad schematic file",
    "kicad_symbol_lib": "a KiCad symbol library",
    "footprint": "a KiCad footprint",
    "module": "a KiCad footprint",
    "fp_lib_table": "a KiCad footprint library table",
    "sym_lib_table": "a KiCad symbol library table",
}
_DIGITS = re.compile(r"(\d+)")
_MANY = 10  # notes of one kind listed one by one; past this, counted
_NONE: FrozenMap = FrozenMap({})  # shared by the many parts with no fields or properties


def read_netlist(path: str | Path) -> Netlist:
    """Read a netlist file; every problem with the input is an InputError."""
    name = str(path)
    text, notes = decode(read_bytes(path, "KiCad netlist"), name)
    return parse_netlist(text, name, notes)


def _numbered_functions(nodes: dict[tuple[str, str], _NodeInfo]) -> bool:
    """KiCad 10's pin functions without its tool line (a nightly, an edited file): every named
    pin written as name_number, at least three of them."""
    functions = [(info.function, pin) for (_, pin), info in nodes.items() if info.function]
    suffixed = [f for f, pin in functions if f.endswith("_" + pin) and f != "_" + pin]
    return len(suffixed) >= 3 and all(f == pin or f.endswith("_" + pin) for f, pin in functions)


def decode(data: bytes, path: str = "") -> tuple[str, list[Note]]:
    """Bytes to text. KiCad writes UTF-8 (kicad-netlist-format.md §6.8).

    A file that is not text (a NUL byte, or invalid UTF-8 before the first '(') is an error.
    Invalid bytes later in an otherwise good file are replaced by U+FFFD and noted, so one
    bad byte in a description does not lose the file.
    """
    nul = data.find(b"\0")
    if nul >= 0:
        line, col = byte_position(data, nul)
        raise InputError("binary file (NUL byte), not a KiCad netlist", path, line, col)
    if data.startswith(b"\xef\xbb\xbf"):
        data = data[3:]
    try:
        return data.decode("utf-8"), []
    except UnicodeDecodeError as exc:
        line, col = byte_position(data, exc.start)
        if not data.lstrip().startswith(b"("):
            raise InputError("not a text file (invalid UTF-8), not a KiCad netlist", path, line, col) from None
        note = Note(line, col, f"invalid UTF-8 byte 0x{data[exc.start]:02X}; undecodable bytes read as U+FFFD")
        return data.decode("utf-8", errors="replace"), [note]


def parse_netlist(text: str, path: str = "<string>", notes: list[Note] | None = None) -> Netlist:
    """Parse netlist text into the model, each component, net and library part as it is read."""
    builder = _Builder(path, Locator(text), list(notes or ()))
    return builder.build(parse(text, path, builder.take))


def _atom(item: SList | None) -> str:
    """The first atom after a list's head: (name X) gives X; (name) or absence gives ''."""
    if item is not None:
        for x in item[1:]:
            if type(x) is str:
                return x
    return ""


def _children(item: SList) -> dict[str, SList]:
    """A list's sub-lists by head; the first wins, as KiCad writes each once."""
    out: dict[str, SList] = {}
    for x in item[1:]:
        if type(x) is SList and x and type(x[0]) is str:
            out.setdefault(x[0], x)
    return out


def _sublists(item: SList | None, head: str) -> list[SList]:
    if item is None:
        return []
    return [x for x in item[1:] if type(x) is SList and x and x[0] == head]


@lru_cache(maxsize=4096)  # pin numbers repeat across a board: "1", "2"
def _natural(number: str) -> tuple[int | str, ...]:
    return tuple(int(p) if p.isdigit() else p for p in _DIGITS.split(number))


@dataclass
class _NodeInfo:
    net: str
    function: str
    pintype: str
    line: int


@dataclass(slots=True)
class _Comp:
    """A component as read, before the nets say where its pins go."""

    ref: str
    offset: int
    value: str = ""
    footprint: str = ""
    datasheet: str = ""
    description: str = ""
    lib: str = ""
    part: str = ""
    fields: dict[str, str] = field(default_factory=dict)
    properties: dict[str, str] = field(default_factory=dict)
    sheet: str = "/"
    units: bool = False  # KiCad 10 lists each unit's pins


@dataclass(slots=True)
class _Net:
    """A net as read: its name, code, class and nodes (ref, pin, function, pin type, offset)."""

    name: str
    code: str
    netclass: str
    offset: int
    nodes: list[tuple[str, str, str, str, int]]


def _pairs(item: SList) -> dict[str, str]:
    """A list's (key value) children as a mapping, the first of each key winning: (node (ref R1) (pin 2))."""
    out: dict[str, str] = {}
    for x in item[1:]:
        if type(x) is SList and x and type(x[0]) is str and x[0] not in out:
            out[x[0]] = _atom(x)
    return out


def _net(item: SList) -> _Net:
    sec = _pairs(item)
    nodes = []
    for node in _sublists(item, "node"):
        ns = _pairs(node)
        nodes.append((ns.get("ref", ""), ns.get("pin", ""), ns.get("pinfunction", ""), ns.get("pintype", ""),
                      node.offset))
    return _Net(sec.get("name", ""), sec.get("code", ""), sec.get("class", ""), item.offset, nodes)


def _comp(comp: SList) -> _Comp:
    sec = _children(comp)
    out = _Comp(_atom(sec.get("ref")), comp.offset)
    out.value = empty_marker(_atom(sec.get("value")))
    out.footprint = _atom(sec.get("footprint"))
    out.datasheet = empty_marker(_atom(sec.get("datasheet")))
    lib_sec = _pairs(sec["libsource"]) if "libsource" in sec else {}
    out.lib, out.part = lib_sec.get("lib", ""), lib_sec.get("part", "")
    own_description = "description" in sec
    out.description = _atom(sec.get("description")) if own_description else lib_sec.get("description", "")
    for f in _sublists(sec.get("fields"), "field"):
        name = _pairs(f).get("name", "")
        text = _atom(f)
        # KiCad 8+ repeats its own Footprint/Datasheet/Description fields here (§1.4).
        if (name == "Footprint" and text == out.footprint) or \
                (name == "Datasheet" and empty_marker(text) == out.datasheet) or \
                (name == "Description" and own_description):
            continue
        if name:
            out.fields.setdefault(name, text)
    for p in _sublists(comp, "property"):
        ps = _pairs(p)
        name, text = ps.get("name", ""), ps.get("value", "")
        if is_kicad_property(name):
            out.properties[name] = text
        elif name:
            out.fields.setdefault(name, text)
    out.sheet = _pairs(sec["sheetpath"]).get("names", "") if "sheetpath" in sec else "/"
    out.units = "units" in sec
    return out


# What the reader takes from the tree as each item closes: (section, item) heads.
_TAKEN = {("components", "comp"), ("nets", "net"), ("libparts", "libpart")}


@dataclass
class _Builder:
    path: str
    locator: Locator
    notes: list[Note]
    kicad10: bool = False
    version: str = ""
    libpins: dict[tuple[str, str], dict[str, tuple[str, str]]] = field(default_factory=dict)
    comps: list[_Comp] = field(default_factory=list)
    nets: list[_Net] = field(default_factory=list)
    sections: dict[str, SList] = field(default_factory=dict)  # the first section of each kind

    def take(self, item: SList, section: SList, root: SList) -> bool:
        """Build a component, net or library part as soon as it is read, so the tree never holds
        them all; only those of the first section of each kind count, as KiCad writes one."""
        head, within = item.head, section.head
        if (within, head) not in _TAKEN or root.head != "export":
            return False
        first = self.sections.get(within)
        if first is None:
            first = self.sections[within] = next(x for x in root if type(x) is SList and x and x[0] == within)
        if first is not section:
            return False
        if head == "comp":
            self.comps.append(_comp(item))
        elif head == "net":
            self.nets.append(_net(item))
        else:
            self._index_libpart(item)
        return True

    def note(self, offset: int, message: str) -> None:
        line, col = self.locator.line_col(offset)
        self.notes.append(Note(line, col, message))

    def line(self, offset: int) -> int:
        return self.locator.line_col(offset)[0]

    def fail(self, offset: int, message: str) -> InputError:
        line, col = self.locator.line_col(offset)
        return InputError(message, self.path, line, col)

    def build(self, root: SList) -> Netlist:
        if root.head != "export":
            what = _OTHER_ROOTS.get(root.head)
            if what:
                raise self.fail(root.offset, f"this is {what} ({root.head}), not a netlist; export the netlist "
                                      "from the schematic editor")
            raise self.fail(root.offset, f"not a KiCad netlist: the file starts with '({root.head}', expected '(export'")
        sections = _children(root)
        # An export cut short, or a stub, must not pass a CI gate as a clean board.
        if "components" not in sections:
            raise self.fail(root.offset, "no (components …) section: not a whole netlist (a truncated export?)")
        if not self.comps and not self.nets:
            raise self.fail(root.offset, "no components and no nets: an empty netlist (a truncated export?)")
        version = self.version = _atom(sections.get("version"))
        if version not in ("D", "E"):
            self.note(sections.get("version", root).offset, f"unknown netlist version {version!r}; read as version E")
        design = sections.get("design")
        dsec = _children(design) if design is not None else {}
        tool = _atom(dsec.get("tool"))
        self.kicad10 = "groups" in sections or "variants" in sections or _tool_major(tool) >= 10
        nodes, net_items = self._read_nets()
        if not self.kicad10 and not _tool_major(tool):  # the guess is for files that do not say
            self.kicad10 = _numbered_functions(nodes)
        components = self._read_components(nodes)
        nets = self._assemble_nets(net_items, components)
        sheets = tuple(_sheet(_children(s)) for s in _sublists(design, "sheet"))
        return Netlist(
            path=self.path, version=version or "E", tool=tool, source=_atom(dsec.get("source")),
            date=_atom(dsec.get("date")), sheets=sheets, components=components, nets=nets,
            notes=tuple(self.notes),
        )

    def _index_libpart(self, lp: SList) -> None:
        sec = _children(lp)
        pins = {}
        for p in _sublists(sec.get("pins"), "pin"):
            ps = _pairs(p)
            pins[ps.get("num", "")] = (empty_marker(ps.get("name", "")), ps.get("type", ""))
        lib = _atom(sec.get("lib"))
        names = [_atom(sec.get("part"))] + [_atom(a) for a in _sublists(sec.get("aliases"), "alias")]
        for name in names:
            self.libpins.setdefault((lib, name), pins)
            self.libpins.setdefault(("", name), pins)

    def _read_nets(self) -> tuple[dict[tuple[str, str], _NodeInfo], list[tuple[_Net, str]]]:
        nodes: dict[tuple[str, str], _NodeInfo] = {}
        items: list[tuple[_Net, str]] = []
        seen_names: set[str] = set()
        for net in self.nets:
            name = net.name or self._unnamed(net, len(items) + 1, seen_names)
            if name in seen_names:
                self.note(net.offset, f"net name {name!r} appears twice; the second net's pins are merged into the first")
            seen_names.add(name)
            items.append((net, name))
            for ref, pin, function, pintype, offset in net.nodes:
                if not ref or ref.startswith("#"):
                    continue  # power symbols and flags are never parts (§4)
                key = (ref, pin)
                old = nodes.get(key)
                if old is None:
                    nodes[key] = _NodeInfo(name, function, pintype, self.line(offset))
                elif old.net != name:
                    self.note(offset, f"pin {ref}.{pin} is on two nets, {old.net!r} and {name!r}; kept on {old.net!r}")
        return nodes, items

    def _unnamed(self, net: _Net, position: int, taken: set[str]) -> str:
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
        self.note(net.offset, f"a net without a name; reported as {name}")
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
                raise self.fail(comp.offset, "component without a reference, (ref …)")
            if comp.ref.startswith("#"):
                continue
            if comp.ref in out:
                self.note(comp.offset, f"reference {comp.ref} appears twice (first at line {out[comp.ref].line}); "
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

    def _component(self, c: _Comp, pin_nodes: dict[str, _NodeInfo]) -> Component:
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
            line=self.line(c.offset), pins=tuple(pins),
        )

    def _assemble_nets(self, items: list[tuple[_Net, str]], components: tuple[Component, ...]) -> tuple[Net, ...]:
        pins_by_net: dict[str, list[Pin]] = {}
        for comp in components:
            for pin in comp.pins:
                if pin.net is not None:
                    pins_by_net.setdefault(pin.net, []).append(pin)
        nets: dict[str, Net] = {}
        for item, name in items:
            if name in nets:
                continue
            nets[name] = Net(code=item.code, name=name, netclass=item.netclass,
                             pins=tuple(pins_by_net.get(name, ())), line=self.line(item.offset))
        return tuple(nets.values())


def _sheet(sec: dict[str, SList]) -> Sheet:
    return Sheet(_atom(sec.get("number")), _atom(sec.get("name")), _atom(sec.get("tstamps")))


def _tool_major(tool: str) -> int:
    m = re.search(r"(\d+)\.\d+", tool)
    return int(m.group(1)) if m else 0
