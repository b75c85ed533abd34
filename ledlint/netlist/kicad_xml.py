"""Reader: KiCad's XML intermediate netlist (`<export version="E">`, KiCad 5's "D") to the Netlist model.

This is the file Eeschema hands a BOM or netlist plugin. Its tree is the s-expression
netlist's (kicad-netlist-format.md §6.14; eeschema/netlist_exporters/netlist_exporter_xml.cpp):
what the .net writes as `(name value)` is an XML attribute, every other list an element,
a trailing atom the element's text. Two differences: recent releases write net names
unescaped, and a part excluded from the board stays in with an `exclude_from_board`
property (the .net drops it).

The parser is the standard library's expat, driven directly so that every element keeps its
line and column; a document type declaration is refused outright, so no entity can be
declared, expanded or fetched.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from pathlib import Path
from xml.parsers import expat

from ledlint.errors import InputError, failure_reason
from ledlint.frozen import FrozenMap
from ledlint.netlist.kicad_common import empty_marker, is_kicad_property, marked_dnp, natural, read_bytes
from ledlint.netlist.model import Component, Net, Netlist, Note, Pin, PinType, Sheet

MAX_DEPTH = 100  # KiCad nests about eight levels deep


@dataclass
class _Element:
    tag: str
    attrs: dict[str, str]
    line: int
    column: int
    children: list[_Element] = field(default_factory=list)
    text: str = ""

    def child(self, tag: str) -> _Element | None:
        return next((c for c in self.children if c.tag == tag), None)

    def all(self, tag: str) -> list[_Element]:
        return [c for c in self.children if c.tag == tag]

    def within(self, container: str, tag: str) -> list[_Element]:
        """The `tag` children of the first `container` child (<pins><pin/>…</pins>)."""
        c = self.child(container)
        return c.all(tag) if c is not None else []

    def value(self, tag: str) -> str:
        """Text of the first child `tag`; '' when there is none (KiCad omits empty text)."""
        c = self.child(tag)
        return c.text if c is not None and not c.children else ""


class _Refused(Exception):
    """Raised inside an expat handler; carries what to tell the user."""


def _tree(data: bytes, path: str) -> _Element:
    if not data.strip():
        raise InputError("empty file: expected a KiCad XML netlist, '<export …>'", path, 1, 1)
    parser = expat.ParserCreate()
    stack: list[_Element] = []
    top: list[_Element] = []
    texts: list[list[str]] = []

    def start(tag: str, attrs: dict[str, str]) -> None:
        if len(stack) >= MAX_DEPTH:
            raise _Refused(f"elements nested deeper than {MAX_DEPTH} levels; not a KiCad netlist")
        el = _Element(tag, attrs, parser.CurrentLineNumber, parser.CurrentColumnNumber + 1)
        (stack[-1].children if stack else top).append(el)
        stack.append(el)
        texts.append([])

    def end(tag: str) -> None:
        el = stack.pop()
        el.text = "".join(texts.pop())

    def chars(data: str) -> None:
        if texts:
            texts[-1].append(data)

    def doctype(*_: object) -> None:
        raise _Refused("a document type declaration (<!DOCTYPE …>): KiCad writes none, and the reader "
                       "expands no entities")

    parser.StartElementHandler = start
    parser.EndElementHandler = end
    parser.CharacterDataHandler = chars
    parser.StartDoctypeDeclHandler = doctype
    parser.EntityDeclHandler = doctype
    parser.SetParamEntityParsing(expat.XML_PARAM_ENTITY_PARSING_NEVER)
    try:
        parser.Parse(data, True)
    except _Refused as exc:
        raise InputError(str(exc), path, parser.CurrentLineNumber, parser.CurrentColumnNumber + 1) from None
    except expat.ExpatError as exc:
        raise InputError(f"malformed XML: {expat.errors.messages.get(exc.code, str(exc))}", path,
                         exc.lineno, exc.offset + 1) from None
    except (UnicodeError, LookupError, ValueError) as exc:  # an encoding expat or Python cannot decode
        raise InputError(f"malformed XML: {failure_reason(exc)}", path, parser.CurrentLineNumber) from None
    return top[0]  # expat insists on one root element


def read_xml_netlist(path: str | Path) -> Netlist:
    """Read an XML netlist; every problem with the input is an InputError."""
    name = str(path)
    data = read_bytes(path, "netlist file")
    return parse_xml_netlist(data, name)


def parse_xml_netlist(data: bytes, path: str = "<string>") -> Netlist:
    root = _tree(data, path)
    if root.tag != "export":
        raise InputError(f"not a KiCad XML netlist: the root element is <{root.tag}>, expected <export>", path,
                         root.line, root.column)
    return _Builder(root, path).build()


def _tool_major(tool: str) -> int:
    m = re.search(r"(\d+)\.\d+", tool)
    return int(m.group(1)) if m else 0


@dataclass
class _Node:
    net: str
    function: str
    pintype: str
    line: int


@dataclass
class _Builder:
    root: _Element
    path: str
    notes: list[Note] = field(default_factory=list)
    version: str = ""
    kicad10: bool = False
    libpins: dict[tuple[str, str], dict[str, tuple[str, str]]] = field(default_factory=dict)

    def note(self, el: _Element, message: str) -> None:
        self.notes.append(Note(el.line, el.column, message))

    def build(self) -> Netlist:
        root = self.root
        version = self.version = root.attrs.get("version", "")
        if version not in ("D", "E"):
            self.note(root, f"unknown netlist version {version!r}; read as version E")
        design = root.child("design")
        tool = design.value("tool") if design is not None else ""
        self.kicad10 = root.child("groups") is not None or root.child("variants") is not None or _tool_major(tool) >= 10
        for lp in root.within("libparts", "libpart"):
            self.index_libpart(lp)
        nodes, nets = self.read_nets(root.child("nets"))
        if not self.kicad10 and not _tool_major(tool):
            self.kicad10 = _numbered_functions(nodes)
        components = self.read_components(root.child("components"), nodes)
        sheets = tuple(Sheet(s.attrs.get("number", ""), s.attrs.get("name", ""), s.attrs.get("tstamps", ""))
                       for s in (design.all("sheet") if design is not None else ()))
        return Netlist(path=self.path, version=version or "E", tool=tool,
                       source=design.value("source") if design is not None else "",
                       date=design.value("date") if design is not None else "", sheets=sheets,
                       components=components, nets=self.assemble(nets, components), notes=tuple(self.notes))

    def index_libpart(self, lp: _Element) -> None:
        pins = {}
        for p in lp.within("pins", "pin"):
            pins[p.attrs.get("num", "")] = (empty_marker(p.attrs.get("name", "")), p.attrs.get("type", ""))
        lib = lp.attrs.get("lib", "")
        for name in [lp.attrs.get("part", "")] + [a.text for a in lp.within("aliases", "alias")]:
            self.libpins.setdefault((lib, name), pins)
            self.libpins.setdefault(("", name), pins)

    def read_nets(self, nets: _Element | None) -> tuple[dict[tuple[str, str], _Node], list[tuple[_Element, str]]]:
        nodes: dict[tuple[str, str], _Node] = {}
        items: list[tuple[_Element, str]] = []
        seen: set[str] = set()
        for net in nets.all("net") if nets is not None else ():
            name = net.attrs.get("name", "")
            if not name:
                name = self.unnamed(net, len(items) + 1, seen)
            if name in seen:
                self.note(net, f"net name {name!r} appears twice; the second net's pins are merged into the first")
            seen.add(name)
            items.append((net, name))
            for node in net.all("node"):
                ref, pin = node.attrs.get("ref", ""), node.attrs.get("pin", "")
                if not ref or ref.startswith("#"):
                    continue  # power symbols and flags are never parts (§4)
                old = nodes.get((ref, pin))
                if old is None:
                    nodes[(ref, pin)] = _Node(name, node.attrs.get("pinfunction", ""), node.attrs.get("pintype", ""),
                                              node.line)
                elif old.net != name:
                    self.note(node, f"pin {ref}.{pin} is on two nets, {old.net!r} and {name!r}; kept on {old.net!r}")
        return nodes, items

    def unnamed(self, net: _Element, position: int, taken: set[str]) -> str:
        """KiCad 4 wrote no name for unlabelled nets; later releases call them Net-(REF-PadN)."""
        first = next(iter(net.all("node")), None)
        ref, pin = (first.attrs.get("ref", ""), first.attrs.get("pin", "")) if first is not None else ("", "")
        if self.version == "D" and ref and pin and f"Net-({ref}-Pad{pin})" not in taken:
            return f"Net-({ref}-Pad{pin})"
        name = f"(unnamed net {net.attrs.get('code') or position})"
        self.note(net, f"a net without a name; reported as {name}")
        return name

    def pin_name(self, function: str, number: str) -> str:
        # KiCad 10 writes pinfunction as name_number (kicad-netlist-format.md §3.2).
        if self.kicad10:
            if function == number:
                return ""
            if function.endswith("_" + number):
                return function[: -len(number) - 1]
        return function

    def read_components(self, comps: _Element | None, nodes: dict[tuple[str, str], _Node]) -> tuple[Component, ...]:
        by_ref: dict[str, dict[str, _Node]] = {}
        for (ref, pin), info in nodes.items():
            by_ref.setdefault(ref, {})[pin] = info
        out: dict[str, Component] = {}
        for comp in comps.all("comp") if comps is not None else ():
            ref = comp.attrs.get("ref", "")
            if not ref:
                raise InputError("component without a reference (ref attribute)", self.path, comp.line, comp.column)
            if ref.startswith("#"):
                continue
            if ref in out:
                self.note(comp, f"reference {ref} appears twice (first at line {out[ref].line}); the second is ignored")
                continue
            if comp.child("units") is not None:
                self.kicad10 = True
            out[ref] = self.component(comp, ref, by_ref.pop(ref, {}))
        for ref, pins in by_ref.items():
            first = min(pins.values(), key=lambda i: i.line)
            self.notes.append(Note(first.line, 1, f"net node names {ref!r}, which is not among the components"))
        return tuple(out.values())

    def component(self, comp: _Element, ref: str, pin_nodes: dict[str, _Node]) -> Component:
        value = empty_marker(comp.value("value"))
        footprint, datasheet = comp.value("footprint"), empty_marker(comp.value("datasheet"))
        source = comp.child("libsource")
        lib = source.attrs.get("lib", "") if source is not None else ""
        part = source.attrs.get("part", "") if source is not None else ""
        own_description = comp.child("description") is not None
        description = comp.value("description") if own_description else \
            (source.attrs.get("description", "") if source is not None else "")
        fields: dict[str, str] = {}
        for f in comp.within("fields", "field"):
            name, text = f.attrs.get("name", ""), f.text
            # KiCad 8+ repeats its own Footprint/Datasheet/Description fields here (§1.4).
            if (name == "Footprint" and text == footprint) or (name == "Datasheet" and empty_marker(text) == datasheet) \
                    or (name == "Description" and own_description):
                continue
            if name:
                fields.setdefault(name, text)
        properties: dict[str, str] = {}
        for p in comp.all("property"):
            name, text = p.attrs.get("name", ""), p.attrs.get("value", "")
            if is_kicad_property(name):
                properties[name] = text
            elif name:
                fields.setdefault(name, text)
        sheetpath = comp.child("sheetpath")
        libpins = self.libpins.get((lib, part)) or self.libpins.get(("", part)) or {}
        pins = []
        for number in sorted(set(libpins) | set(pin_nodes), key=natural):
            lib_name, lib_type = libpins.get(number, ("", ""))
            node = pin_nodes.get(number)
            if node is None:
                pins.append(Pin(ref, number, lib_name, PinType.from_text(lib_type), None))
                continue
            base, _, flag = node.pintype.partition("+")
            name = self.pin_name(node.function, number) if node.function else lib_name
            pins.append(Pin(ref, number, name, PinType.from_text(base or lib_type), node.net, flag == "no_connect"))
        return Component(
            ref=ref, value=value, footprint=footprint, datasheet=datasheet, description=description, lib=lib,
            part=part, fields=FrozenMap(fields), properties=FrozenMap(properties),
            dnp="dnp" in properties or marked_dnp(value, fields), exclude_from_bom="exclude_from_bom" in properties,
            sheet=(sheetpath.attrs.get("names", "") if sheetpath is not None else "") or "/",
            exclude_from_board="exclude_from_board" in properties, exclude_from_sim="exclude_from_sim" in properties,
            line=comp.line, pins=tuple(pins),
        )

    def assemble(self, items: list[tuple[_Element, str]], components: tuple[Component, ...]) -> tuple[Net, ...]:
        pins_by_net: dict[str, list[Pin]] = {}
        for comp in components:
            for pin in comp.pins:
                if pin.net is not None:
                    pins_by_net.setdefault(pin.net, []).append(pin)
        nets: dict[str, Net] = {}
        for el, name in items:
            if name not in nets:
                nets[name] = Net(code=el.attrs.get("code", ""), name=name, netclass=el.attrs.get("class", ""),
                                 pins=tuple(pins_by_net.get(name, ())), line=el.line)
        return tuple(nets.values())


def _numbered_functions(nodes: dict[tuple[str, str], _Node]) -> bool:
    """KiCad 10's pin functions in a file that does not say its release: every named pin
    written as name_number, at least three of them."""
    functions = [(info.function, pin) for (_, pin), info in nodes.items() if info.function]
    suffixed = [f for f, pin in functions if f.endswith("_" + pin) and f != "_" + pin]
    return len(suffixed) >= 3 and all(f == pin or f.endswith("_" + pin) for f, pin in functions)
