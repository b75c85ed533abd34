"""Reader: a KiCad s-expression netlist file (KiCad 4/5 to 10) to the Netlist model."""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

from ledlint.netlist.export import Assembler, CompRecord, Header, NetRecord
from ledlint.netlist.kicad_common import decode, empty_marker, read_bytes
from ledlint.netlist.model import Netlist, Note, Sheet
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


def read_netlist(path: str | Path) -> Netlist:
    """Read a netlist file; every problem with the input is an InputError."""
    name = str(path)
    text, notes = decode(read_bytes(path, "KiCad netlist"), name)
    return parse_netlist(text, name, notes)


def parse_netlist(text: str, path: str = "<string>", notes: list[Note] | None = None) -> Netlist:
    """Parse netlist text into the model, each component, net and library part as it is read."""
    locator = Locator(text)
    builder = _Builder(Assembler(path, locator.line_col, list(notes or ())))
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


def _pairs(item: SList) -> dict[str, str]:
    """A list's (key value) children as a mapping, the first of each key winning: (node (ref R1) (pin 2))."""
    out: dict[str, str] = {}
    for x in item[1:]:
        if type(x) is SList and x and type(x[0]) is str and x[0] not in out:
            out[x[0]] = _atom(x)
    return out


def _net(item: SList) -> NetRecord:
    sec = _pairs(item)
    nodes = []
    for node in _sublists(item, "node"):
        ns = _pairs(node)
        nodes.append((ns.get("ref", ""), ns.get("pin", ""), ns.get("pinfunction", ""), ns.get("pintype", ""),
                      node.offset))
    return NetRecord(sec.get("name", ""), sec.get("code", ""), sec.get("class", ""), item.offset, nodes)


def _comp(comp: SList) -> CompRecord:
    sec = _children(comp)
    out = CompRecord(_atom(sec.get("ref")), comp.offset)
    out.value = empty_marker(_atom(sec.get("value")))
    out.footprint = _atom(sec.get("footprint"))
    out.datasheet = empty_marker(_atom(sec.get("datasheet")))
    lib_sec = _pairs(sec["libsource"]) if "libsource" in sec else {}
    out.lib, out.part = lib_sec.get("lib", ""), lib_sec.get("part", "")
    out.own_description = "description" in sec
    out.description = _atom(sec.get("description")) if out.own_description else lib_sec.get("description", "")
    for f in _sublists(sec.get("fields"), "field"):
        out.add_field(_pairs(f).get("name", ""), _atom(f))
    for p in _sublists(comp, "property"):
        ps = _pairs(p)
        out.add_property(ps.get("name", ""), ps.get("value", ""))
    out.sheet = _pairs(sec["sheetpath"]).get("names", "") if "sheetpath" in sec else "/"
    out.units = "units" in sec
    return out


# What the reader takes from the tree as each item closes: (section, item) heads.
_TAKEN = {("components", "comp"), ("nets", "net"), ("libparts", "libpart")}


@dataclass
class _Builder:
    out: Assembler
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
            self.out.comps.append(_comp(item))
        elif head == "net":
            self.out.nets.append(_net(item))
        else:
            self._libpart(item)
        return True

    def build(self, root: SList) -> Netlist:
        if root.head != "export":
            what = _OTHER_ROOTS.get(root.head)
            if what:
                raise self.out.fail(root.offset, f"this is {what} ({root.head}), not a netlist; export the netlist "
                                                 "from the schematic editor")
            raise self.out.fail(root.offset, f"not a KiCad netlist: the file starts with '({root.head}', "
                                             "expected '(export'")
        sections = _children(root)
        design = sections.get("design")
        dsec = _children(design) if design is not None else {}
        return self.out.build(Header(
            where=root.offset, version_where=sections.get("version", root).offset,
            version=_atom(sections.get("version")), tool=_atom(dsec.get("tool")), source=_atom(dsec.get("source")),
            date=_atom(dsec.get("date")), sheets=tuple(_sheet(_children(s)) for s in _sublists(design, "sheet")),
            has_components="components" in sections,
            kicad10_sections="groups" in sections or "variants" in sections))

    def _libpart(self, lp: SList) -> None:
        sec = _children(lp)
        pins = {}
        for p in _sublists(sec.get("pins"), "pin"):
            ps = _pairs(p)
            pins[ps.get("num", "")] = (empty_marker(ps.get("name", "")), ps.get("type", ""))
        names = [_atom(sec.get("part"))] + [_atom(a) for a in _sublists(sec.get("aliases"), "alias")]
        self.out.add_libpart(_atom(sec.get("lib")), names, pins)


def _sheet(sec: dict[str, SList]) -> Sheet:
    return Sheet(_atom(sec.get("number")), _atom(sec.get("name")), _atom(sec.get("tstamps")))
