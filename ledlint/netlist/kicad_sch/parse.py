"""One schematic file's tree to plain records: library symbols, placed symbols, wires, labels, sheets.

The layout is KiCad's s-expression schematic format from 6.0 on (dev-docs.kicad.org, "Schematic
File Format"): sections are looked up by head and unknown ones skipped, as KiCad's own parser
skips what a newer version adds. Coordinates become integers in KiCad's schematic unit
(0.1 µm; 1 mm = 10,000), so points compare exactly, as KiCad compares them.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from enum import Enum
from typing import Iterator

from ledlint.errors import InputError
from ledlint.netlist.sexpr import Locator, SList

UNITS_PER_MM = 10_000
Point = tuple[int, int]
# A symbol's orientation as KiCad's TRANSFORM (x1, y1, x2, y2): x' = x1·x + y1·y, y' = x2·x + y2·y.
Transform = tuple[int, int, int, int]

# KiCad's parser sets these for `(at x y angle)` of a placed symbol (library y points up,
# the sheet's y down): sch_io_kicad_sexpr_parser.cpp, parseSchematicSymbol.
_ROTATIONS: dict[int, Transform] = {0: (1, 0, 0, -1), 90: (0, -1, -1, 0), 180: (-1, 0, 0, 1), 270: (0, 1, 1, 0)}
# Characters Python's float() takes that a KiCad number never holds (nan, inf, 1_0).
_NOT_NUMERIC = frozenset("_nNiIaAfFtTyY")
# A coordinate beyond ±1 km is no drawing; it would only make huge integers.
_MAX_MM = 1e6


def _decimal(text: object) -> float | None:
    """A decimal number as KiCad writes one ("-2.54", "0", "1e-3"), or None."""
    if type(text) is not str or not _NOT_NUMERIC.isdisjoint(text):
        return None
    try:
        return float(text)
    except ValueError:
        return None


class LabelKind(Enum):
    LOCAL = "label"
    GLOBAL = "global_label"
    HIER = "hierarchical_label"


@dataclass(frozen=True, slots=True)
class LibPin:
    number: str
    name: str  # '' for KiCad's '~' (no name)
    type: str
    at: Point  # library coordinates, y up
    hidden: bool
    unit: int  # 0: in every unit
    body: int  # 0: in every body style (De Morgan)
    alternates: tuple[tuple[str, str], ...] = ()  # (name, type)


@dataclass(frozen=True, slots=True)
class LibSymbol:
    name: str
    power: str  # '' | 'global' | 'local'
    pins: tuple[LibPin, ...]
    unit_count: int
    properties: tuple[tuple[str, str], ...]

    def prop(self, name: str) -> str:
        return next((v for k, v in self.properties if k == name), "")


@dataclass(frozen=True, slots=True)
class InstanceRef:
    """One entry of a symbol's instance data: the reference it carries at one sheet path."""

    project: str
    path: str
    reference: str
    unit: int
    value: str = ""  # KiCad 6 root `symbol_instances` only
    footprint: str = ""


@dataclass(frozen=True, slots=True)
class PlacedSymbol:
    lib_id: str
    lib_name: str
    at: Point
    transform: Transform
    unit: int
    body: int
    uuid: str
    flags: tuple[tuple[str, bool], ...]  # in_bom, on_board, dnp, exclude_from_sim as written
    properties: tuple[tuple[str, str], ...]  # (name, value) in file order, private ones left out
    alternates: tuple[tuple[str, str], ...]  # (pin number, alternate name)
    instances: tuple[InstanceRef, ...]
    line: int
    column: int

    def prop(self, name: str) -> str | None:
        return next((v for k, v in self.properties if k == name), None)

    def flag(self, name: str, default: bool) -> bool:
        return next((v for k, v in self.flags if k == name), default)


@dataclass(frozen=True, slots=True)
class Segment:
    a: Point
    b: Point
    bus: bool


@dataclass(frozen=True, slots=True)
class Label:
    kind: LabelKind
    text: str
    at: Point
    shape: str


@dataclass(frozen=True, slots=True)
class SheetPin:
    name: str
    shape: str
    at: Point


@dataclass(frozen=True, slots=True)
class SheetRecord:
    """A hierarchical sheet symbol: the child file it instantiates and its pins."""

    uuid: str
    name: str
    file: str
    pins: tuple[SheetPin, ...]
    properties: tuple[tuple[str, str], ...]  # the user's own sheet fields
    flags: tuple[tuple[str, bool], ...]
    pages: tuple[tuple[str, str, str], ...]  # (project, parent path, page) from its instances
    line: int
    column: int


@dataclass
class SheetFile:
    """Everything connectivity needs from one .kicad_sch file."""

    path: str
    version: int
    generator: str
    generator_version: str
    uuid: str
    lib_symbols: dict[str, LibSymbol] = field(default_factory=dict)
    symbols: list[PlacedSymbol] = field(default_factory=list)
    segments: list[Segment] = field(default_factory=list)
    junctions: list[Point] = field(default_factory=list)
    no_connects: list[Point] = field(default_factory=list)
    bus_entries: list[tuple[Point, Point]] = field(default_factory=list)
    labels: list[Label] = field(default_factory=list)
    sheets: list[SheetRecord] = field(default_factory=list)
    bus_aliases: dict[str, tuple[str, ...]] = field(default_factory=dict)
    symbol_instances: dict[str, InstanceRef] = field(default_factory=dict)  # KiCad 6 root: path -> data
    sheet_pages: dict[str, str] = field(default_factory=dict)  # KiCad 6 root `sheet_instances`


def _subs(item: SList) -> Iterator[SList]:
    for x in item[1:]:
        if type(x) is SList and x and type(x[0]) is str:
            yield x


def _first(item: SList, head: str) -> SList | None:
    for x in item[1:]:
        if type(x) is SList and x and x[0] == head:
            return x
    return None


class _Parser:
    def __init__(self, path: str, locator: Locator) -> None:
        self.path = path
        self.locator = locator

    def fail(self, item: SList, message: str) -> InputError:
        line, column = self.locator.line_col(item.offset)
        return InputError(message, self.path, line, column)

    def line(self, item: SList) -> tuple[int, int]:
        return self.locator.line_col(item.offset)

    def text(self, item: SList, index: int, what: str) -> str:
        if len(item) <= index or type(item[index]) is not str:
            raise self.fail(item, f"({item.head} …) needs {what}")
        return str(item[index])

    def opt_text(self, item: SList | None, index: int = 1) -> str:
        if item is None or len(item) <= index or type(item[index]) is not str:
            return ""
        return str(item[index])

    def number(self, item: SList, index: int, what: str) -> float:
        text = self.text(item, index, what)
        value = _decimal(text)
        if value is None:
            raise self.fail(item, f"({item.head} …): {what} {text!r} is not a number")
        if abs(value) > _MAX_MM:
            raise self.fail(item, f"({item.head} …): {what} {text} is out of range")
        return value

    def units(self, item: SList, index: int, what: str) -> int:
        return round(self.number(item, index, what) * UNITS_PER_MM)

    def integer(self, item: SList | None, default: int, what: str, digits: int = 6) -> int:
        if item is None:
            return default
        text = self.text(item, 1, what)
        if not text.isascii() or not text.isdigit() or len(text) > digits:
            raise self.fail(item, f"({item.head} …): {what} {text!r} is not a whole number")
        return int(text)

    def point(self, item: SList | None, owner: SList, what: str = "a position") -> Point:
        if item is None:
            raise self.fail(owner, f"({owner.head} …) has no {what}")
        if len(item) > 2:
            x, y = _decimal(item[1]), _decimal(item[2])
            if x is not None and y is not None and abs(x) <= _MAX_MM and abs(y) <= _MAX_MM:
                return round(x * UNITS_PER_MM), round(y * UNITS_PER_MM)
        return self.units(item, 1, "x"), self.units(item, 2, "y")  # says what is wrong

    def at(self, owner: SList) -> Point:
        return self.point(_first(owner, "at"), owner, "position (at x y)")

    def flag(self, item: SList) -> bool:
        """KiCad's yes/no flags; a bare `(dnp)` (newer writers) means yes."""
        value = self.opt_text(item)
        if value in ("", "yes", "true"):
            return True
        if value in ("no", "false"):
            return False
        raise self.fail(item, f"({item.head} {value}): expected yes or no")

    def property(self, p: SList) -> tuple[str, str] | None:
        """(name, value) of a (property "name" "value" …); None for a private one, which KiCad
        8+ keeps out of netlists (NETLIST_EXPORTER_XML)."""
        if len(p) > 3 and p[1] == "private" and type(p[3]) is str:
            return None
        return self.text(p, 1, "a field name"), self.text(p, 2, "a field value")

    def properties(self, item: SList) -> list[tuple[str, str]]:
        return [kv for p in _subs(item) if p[0] == "property" and (kv := self.property(p)) is not None]

    # -- library symbols ---------------------------------------------------------------

    def lib_symbol(self, item: SList, parents: dict[str, LibSymbol]) -> LibSymbol:
        name = self.text(item, 1, "a symbol name")
        power = ""
        pins: list[LibPin] = []
        units = 1
        extends = ""
        for sub in _subs(item):
            head = sub[0]
            if head == "power":
                power = self.opt_text(sub) or "global"
            elif head == "extends":
                extends = self.text(sub, 1, "the parent symbol's name")
            elif head == "pin":
                pins.append(self.lib_pin(sub, 0, 0))
            elif head == "symbol":
                unit, body = self.unit_of(sub, name)
                units = max(units, unit)
                pins.extend(self.lib_pin(p, unit, body) for p in _subs(sub) if p[0] == "pin")
        properties = tuple(self.properties(item))
        if extends:
            parent = parents.get(extends)
            if parent is None:
                raise self.fail(item, f"symbol {name!r} extends {extends!r}, which (lib_symbols) does not define")
            pins = pins or list(parent.pins)
            units = max(units, parent.unit_count)
            power = power or parent.power
            own = {k for k, _ in properties}
            properties += tuple((k, v) for k, v in parent.properties if k not in own)
        return LibSymbol(name, power, tuple(pins), units, properties)

    def unit_of(self, sub: SList, symbol: str) -> tuple[int, int]:
        """A unit drawing is named NAME_UNIT_BODY; unit 0 and body 0 mean "all of them"."""
        parts = self.text(sub, 1, "a unit name").rsplit("_", 2)
        if len(parts) != 3 or not parts[1].isdigit() or not parts[2].isdigit() or len(parts[1]) > 4:
            raise self.fail(sub, f"unit drawing {sub[1]!r} of {symbol!r} is not named NAME_UNIT_BODYSTYLE")
        return int(parts[1]), int(parts[2])

    def lib_pin(self, item: SList, unit: int, body: int) -> LibPin:
        ptype = self.text(item, 1, "an electrical type")
        hidden = "hide" in item[2:]
        name = number = ""
        alternates = []
        for sub in _subs(item):
            head = sub[0]
            if head == "name":
                name = self.opt_text(sub)
            elif head == "number":
                number = self.opt_text(sub)
            elif head == "hide":
                hidden = self.flag(sub)
            elif head == "alternate":
                alternates.append((self.text(sub, 1, "a name"), self.text(sub, 2, "an electrical type")))
        return LibPin(number, "" if name == "~" else name, ptype, self.at(item), hidden, unit, body,
                      tuple(alternates))

    # -- placed items --------------------------------------------------------------------

    def symbol(self, item: SList) -> PlacedSymbol:
        heads: dict[str, SList] = {}
        flags: list[tuple[str, bool]] = []
        properties: list[tuple[str, str]] = []
        alternates: list[tuple[str, str]] = []
        instances: list[InstanceRef] = []
        for sub in _subs(item):  # one pass: a placed symbol is the file's most frequent list
            head = sub[0]
            if head == "property":
                kv = self.property(sub)
                if kv is not None:
                    properties.append(kv)
            elif head == "pin":
                alt = _first(sub, "alternate")
                if alt is not None:
                    alternates.append((self.text(sub, 1, "a pin number"), self.text(alt, 1, "an alternate name")))
            elif head in _FLAGS:
                flags.append((head, self.flag(sub)))
            elif head == "instances":
                instances.extend(self.instances(sub))
            else:
                heads.setdefault(head, sub)
        lib_item = heads.get("lib_id")
        if lib_item is None:
            raise self.fail(item, "(symbol …) needs (lib_id …)")
        at_item = heads.get("at")
        at = self.point(at_item, item, "position (at x y angle)")
        angle = int(self.number(at_item, 3, "angle")) if at_item is not None and len(at_item) > 3 else 0
        transform = _ROTATIONS.get(angle)
        if transform is None:
            raise self.fail(at_item or item, f"symbol angle {angle} is not 0, 90, 180 or 270")
        mirror = heads.get("mirror")
        if mirror is not None:
            transform = _mirrored(transform, self.text(mirror, 1, "x or y"), self, mirror)
        line, column = self.line(item)
        return PlacedSymbol(
            lib_id=self.text(lib_item, 1, "a library symbol name"), lib_name=self.opt_text(heads.get("lib_name")),
            at=at, transform=transform, unit=self.integer(heads.get("unit"), 1, "unit"),
            body=self.integer(heads.get("body_style") or heads.get("convert"), 1, "body style"),
            uuid=self.opt_text(heads.get("uuid")), flags=tuple(flags), properties=tuple(properties),
            alternates=tuple(alternates), instances=tuple(instances), line=line, column=column,
        )

    def instances(self, item: SList) -> Iterator[InstanceRef]:
        for project in _subs(item):
            if project[0] != "project":
                continue
            name = self.opt_text(project)
            for path in _subs(project):
                if path[0] == "path":
                    yield InstanceRef(name, self.text(path, 1, "a sheet path"),
                                      self.opt_text(_first(path, "reference")),
                                      self.integer(_first(path, "unit"), 0, "unit"))

    def sheet(self, item: SList) -> SheetRecord:
        props = self.properties(item)
        own = dict(props)
        name = own.get("Sheetname", own.get("Sheet name"))
        file = own.get("Sheetfile", own.get("Sheet file"))
        if name is None or not file:
            raise self.fail(item, "sheet without a name and file (Sheetname / Sheetfile fields)")
        pins = tuple(SheetPin(self.text(p, 1, "a pin name"), self.opt_text(p, 2), self.at(p))
                     for p in _subs(item) if p[0] == "pin")
        pages = []
        for inst in _subs(item):
            if inst[0] == "instances":
                for project in _subs(inst):
                    for path in _subs(project):
                        if path[0] == "path":
                            pages.append((self.opt_text(project), self.text(path, 1, "a sheet path"),
                                          self.opt_text(_first(path, "page"))))
        file_prop = next(p for p in _subs(item) if p[0] == "property" and p[1] in ("Sheetfile", "Sheet file"))
        line, column = self.line(file_prop)
        user = tuple((k, v) for k, v in props if k not in _SHEET_OWN)
        flags = tuple((sub[0], self.flag(sub)) for sub in _subs(item) if sub[0] in _FLAGS)
        return SheetRecord(self.opt_text(_first(item, "uuid")), name, file, pins, user, flags, tuple(pages),
                           line, column)

    def segment_list(self, item: SList, bus: bool) -> Iterator[Segment]:
        pts = _first(item, "pts")
        points = [self.point(p, item) for p in _subs(pts)] if pts is not None else []
        if len(points) < 2:
            raise self.fail(item, f"({item.head} …) needs two points (pts (xy …) (xy …))")
        for a, b in zip(points, points[1:]):
            yield Segment(a, b, bus)

    def label(self, item: SList, kind: LabelKind) -> Label:
        return Label(kind, self.text(item, 1, "its text"), self.at(item), self.opt_text(_first(item, "shape")))


_SHEET_OWN = frozenset({"Sheetname", "Sheetfile", "Sheet name", "Sheet file"})
_FLAGS = frozenset({"in_bom", "on_board", "dnp", "exclude_from_sim"})


def _mirrored(t: Transform, axis: str, parser: _Parser, item: SList) -> Transform:
    """KiCad's SetOrientation(SYM_MIRROR_X / _Y) applied to a rotation: mirror x negates the
    sheet y, mirror y the sheet x."""
    x1, y1, x2, y2 = t
    if axis == "x":
        return x1, y1, -x2, -y2
    if axis == "y":
        return -x1, -y1, x2, y2
    raise parser.fail(item, f"(mirror {axis}): expected x or y")


def parse_sheet_file(root: SList, path: str, locator: Locator) -> SheetFile:
    """The records of one schematic file whose tree is `root`."""
    p = _Parser(path, locator)
    if root.head != "kicad_sch":
        raise p.fail(root, f"not a KiCad schematic: the file starts with '({root.head}', expected '(kicad_sch'")
    version_item = _first(root, "version")
    version = p.integer(version_item, 0, "file version", 8) if version_item is not None else 0
    if version_item is None or version < 20200000:
        raise p.fail(version_item or root, "not a KiCad 6 or later schematic (no (version 2020… or later)); "
                                           "open and save it in a current KiCad")
    sheet = SheetFile(path, version, p.opt_text(_first(root, "generator")),
                      p.opt_text(_first(root, "generator_version")), p.opt_text(_first(root, "uuid")))
    for item in _subs(root):
        head = item[0]
        if head == "lib_symbols":
            for sym in _subs(item):
                if sym[0] == "symbol":
                    lib = p.lib_symbol(sym, sheet.lib_symbols)
                    sheet.lib_symbols[lib.name] = lib
        elif head == "symbol":
            sheet.symbols.append(p.symbol(item))
        elif head == "wire" or head == "bus":
            sheet.segments.extend(p.segment_list(item, head == "bus"))
        elif head == "junction":
            sheet.junctions.append(p.at(item))
        elif head == "no_connect":
            sheet.no_connects.append(p.at(item))
        elif head == "bus_entry":
            start = p.at(item)
            size = p.point(_first(item, "size"), item, "size")
            sheet.bus_entries.append((start, (start[0] + size[0], start[1] + size[1])))
        elif head in ("label", "global_label", "hierarchical_label"):
            sheet.labels.append(p.label(item, LabelKind(head)))
        elif head == "sheet":
            sheet.sheets.append(p.sheet(item))
        elif head == "bus_alias":
            members = _first(item, "members")
            sheet.bus_aliases[p.text(item, 1, "a name")] = tuple(
                x for x in (members[1:] if members is not None else []) if type(x) is str)
        elif head == "symbol_instances":
            for path_item in _subs(item):
                if path_item[0] == "path":
                    ref = InstanceRef("", p.text(path_item, 1, "a path"),
                                      p.opt_text(_first(path_item, "reference")),
                                      p.integer(_first(path_item, "unit"), 0, "unit"),
                                      p.opt_text(_first(path_item, "value")),
                                      p.opt_text(_first(path_item, "footprint")))
                    sheet.symbol_instances[ref.path] = ref
        elif head == "sheet_instances":
            for path_item in _subs(item):
                if path_item[0] == "path":
                    sheet.sheet_pages[p.text(path_item, 1, "a path")] = p.opt_text(_first(path_item, "page"))
    return sheet
