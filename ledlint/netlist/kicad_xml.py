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

from dataclasses import dataclass, field
from pathlib import Path
from xml.parsers import expat

from ledlint.errors import InputError, failure_reason
from ledlint.netlist.export import Assembler, CompRecord, Header, NetRecord
from ledlint.netlist.kicad_common import empty_marker, read_bytes
from ledlint.netlist.model import Netlist, Sheet

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
    out = Assembler(path, _position)
    for lp in root.within("libparts", "libpart"):
        pins = {p.attrs.get("num", ""): (empty_marker(p.attrs.get("name", "")), p.attrs.get("type", ""))
                for p in lp.within("pins", "pin")}
        names = [lp.attrs.get("part", "")] + [a.text for a in lp.within("aliases", "alias")]
        out.add_libpart(lp.attrs.get("lib", ""), names, pins)
    out.nets = [_net(n) for n in root.within("nets", "net")]
    out.comps = [_comp(c) for c in root.within("components", "comp")]
    design = root.child("design")
    version = root.attrs.get("version", "")
    return out.build(Header(
        where=(root.line, root.column), version=version,
        tool=design.value("tool") if design is not None else "",
        source=design.value("source") if design is not None else "",
        date=design.value("date") if design is not None else "",
        sheets=tuple(Sheet(s.attrs.get("number", ""), s.attrs.get("name", ""), s.attrs.get("tstamps", ""))
                     for s in (design.all("sheet") if design is not None else ())),
        has_components=root.child("components") is not None,
        kicad10_sections=root.child("groups") is not None or root.child("variants") is not None))


def _position(where: tuple[int, int]) -> tuple[int, int]:
    return where  # the XML reader keeps (line, column) already


def _net(net: _Element) -> NetRecord:
    nodes = [(n.attrs.get("ref", ""), n.attrs.get("pin", ""), n.attrs.get("pinfunction", ""),
              n.attrs.get("pintype", ""), (n.line, n.column)) for n in net.all("node")]
    return NetRecord(net.attrs.get("name", ""), net.attrs.get("code", ""), net.attrs.get("class", ""),
                     (net.line, net.column), nodes)


def _comp(comp: _Element) -> CompRecord:
    out = CompRecord(comp.attrs.get("ref", ""), (comp.line, comp.column))
    out.value = empty_marker(comp.value("value"))
    out.footprint, out.datasheet = comp.value("footprint"), empty_marker(comp.value("datasheet"))
    source = comp.child("libsource")
    attrs = source.attrs if source is not None else {}
    out.lib, out.part = attrs.get("lib", ""), attrs.get("part", "")
    out.own_description = comp.child("description") is not None
    out.description = comp.value("description") if out.own_description else attrs.get("description", "")
    for f in comp.within("fields", "field"):
        out.add_field(f.attrs.get("name", ""), f.text)
    for p in comp.all("property"):
        out.add_property(p.attrs.get("name", ""), p.attrs.get("value", ""))
    sheetpath = comp.child("sheetpath")
    out.sheet = (sheetpath.attrs.get("names", "") if sheetpath is not None else "") or "/"
    out.units = comp.child("units") is not None
    return out
