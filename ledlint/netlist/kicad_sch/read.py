"""Schematic files to a design: the root and its sub-sheets, every sheet instance, every reference.

A sheet file used twice is one file but two sheet instances, told apart by the path of sheet
UUIDs from the root (dev-docs.kicad.org, "Schematic File Format", "Instance Path"). A placed
symbol's reference and unit belong to an instance: KiCad 7 and later keep them in the
symbol's own `(instances (project … (path "/root-uuid/sheet-uuids" (reference …) (unit …))))`,
KiCad 6 in the root file's `(symbol_instances (path "/sheet-uuids/symbol-uuid" …))`. KiCad's
loader takes the root's list when the root file is older than version 20221002 (schematic.cpp,
`UpdateSymbolInstanceData`); only a path that names the real instance counts, so instance
entries left behind by copied or moved sheets are ignored.
"""

from __future__ import annotations

import json
import os
from dataclasses import dataclass, field
from pathlib import Path

from ledlint.errors import InputError, byte_position
from ledlint.netlist.kicad_common import decode, natural, read_bytes
from ledlint.netlist.model import Note
from ledlint.netlist.sexpr import Locator, parse
from ledlint.netlist.kicad_sch.parse import (
    InstanceRef, PlacedSymbol, Segment, SheetFile, SheetRecord, parse_sheet_file,
)
from ledlint.netlist.kicad_sch.scan import scan

# Far beyond any real design (KiCad's own 20,000-part boards have a few hundred sheets); a
# stop for a hierarchy that multiplies itself.
MAX_INSTANCES = 20_000
# Root file versions at which KiCad changed how it reads older files (schematic.cpp).
PER_SYMBOL_INSTANCES = 20221002
VALUE_NAMES_POWER_NETS = 20230221


@dataclass
class SheetInstance:
    """One place a sheet file sits in the hierarchy."""

    file: SheetFile
    uuids: tuple[str, ...]  # sheet UUIDs below the root
    names: str  # human path, "/" or "/power/led driver/"
    page: str
    parent: int  # index of the parent instance; -1 for the root
    record: SheetRecord | None  # the sheet symbol in the parent's file
    flags: dict[str, bool] = field(default_factory=dict)  # dnp and exclusions inherited from the sheets above

    @property
    def depth(self) -> int:
        return len(self.uuids)

    @property
    def tstamps(self) -> str:
        return "/" + "".join(u + "/" for u in self.uuids)


@dataclass(frozen=True, slots=True)
class Placement:
    """A placed symbol at one sheet instance: its reference and unit there."""

    ref: str
    unit: int
    value: str | None  # KiCad 6 per-instance value, when it gives one
    footprint: str | None


@dataclass
class Design:
    root: SheetFile
    instances: list[SheetInstance]  # in page order, the root first
    aliases: dict[str, tuple[str, ...]]
    project: str
    unit_first: str = "A"
    unit_separator: str = ""
    notes: dict[str, list[Note]] = field(default_factory=dict)  # per file

    def note(self, path: str, line: int, column: int, message: str) -> None:
        self.notes.setdefault(path, []).append(Note(line, column, message))

    def placement(self, inst: SheetInstance, sym: PlacedSymbol) -> Placement:
        """The reference and unit `sym` carries at `inst`."""
        full = "/" + "/".join((self.root.uuid,) + inst.uuids)
        legacy_key = "/" + "/".join(inst.uuids + (sym.uuid,))
        legacy = self.root.symbol_instances.get(legacy_key)
        modern = _matching(sym.instances, full, self.project)
        first, second = (legacy, modern) if self.root.version < PER_SYMBOL_INSTANCES else (modern, legacy)
        found = first or second
        if found is not None and found.reference:
            return Placement(found.reference, found.unit or sym.unit, found.value or None, found.footprint or None)
        if sym.instances:
            self.note(inst.file.path, sym.line, sym.column,
                      f"no instance data for sheet {inst.names} (only for other paths); the Reference field is used")
        return Placement(sym.prop("Reference") or "", sym.unit, None, None)


def _matching(entries: tuple[InstanceRef, ...], path: str, project: str) -> InstanceRef | None:
    hits = [e for e in entries if e.path == path]
    return next((e for e in hits if e.project == project), hits[0] if hits else None)


def _describe_start(text: str) -> str | None:
    """A clear word for a file that is not an s-expression at all."""
    head = text.lstrip()
    if not head:
        return "empty file: expected a KiCad schematic, '(kicad_sch …)'"
    if head.startswith("("):
        return None
    if head.startswith("EESchema Schematic File"):
        return "a KiCad 5 (legacy .sch) schematic: open and save it in KiCad 6 or later to get a .kicad_sch"
    if head.startswith("<"):
        return "this looks like XML, not a KiCad schematic (expected '(kicad_sch …)')"
    if head.startswith(("{", "[")):
        return "this looks like JSON, not a KiCad schematic (expected '(kicad_sch …)')"
    return f"expected '(kicad_sch …)', found {head.split(None, 1)[0][:20]!r}"


def load_file(path: Path) -> tuple[SheetFile, list[Note]]:
    """One schematic file, parsed; every problem is an InputError naming the file."""
    name = str(path)
    notes: list[Note] = []
    text, undecodable = decode(read_bytes(path, "KiCad schematic"), name, "KiCad schematic")
    notes += undecodable
    problem = _describe_start(text)
    if problem is not None:
        offset = len(text) - len(text.lstrip())
        line, col = Locator(text).line_col(offset)
        raise InputError(problem, name, line, col)
    rest, lifted = scan(text)
    try:
        tree = parse(rest, name)
    except InputError as exc:  # the scanner words its messages for netlists
        raise InputError(exc.message.replace("netlist", "schematic"), exc.path, exc.line, exc.column) from None
    sheet = parse_sheet_file(tree, name, Locator(text))
    sheet.segments += [Segment((x1, y1), (x2, y2), bus) for x1, y1, x2, y2, bus in lifted.wires]
    sheet.junctions += lifted.junctions
    sheet.no_connects += lifted.no_connects
    return sheet, notes


def _project_settings(project: Path, design: Design) -> None:
    """The unit-letter settings a .kicad_pro holds ("schematic": subpart_first_id and
    subpart_id_separator, as character codes), which shape generated net names (U1A)."""
    data = read_bytes(project, "KiCad project")
    try:
        settings = json.loads(data.decode("utf-8"))
    except UnicodeDecodeError as exc:
        line, col = byte_position(data, exc.start)
        raise InputError("not a text file (invalid UTF-8), not a KiCad project", str(project), line, col) from None
    except json.JSONDecodeError as exc:
        raise InputError(f"not a KiCad project file (JSON): {exc.msg}", str(project), exc.lineno, exc.colno) from None
    sch = settings.get("schematic") if isinstance(settings, dict) else None
    if not isinstance(sch, dict):
        return
    first, separator = sch.get("subpart_first_id"), sch.get("subpart_id_separator")
    if type(first) is int and 32 < first < 0x110000:
        design.unit_first = chr(first)
    if type(separator) is int and 0 < separator < 0x110000:
        design.unit_separator = chr(separator)


def root_of(path: Path) -> tuple[Path, Path | None]:
    """The root schematic and the project file for a .kicad_sch or .kicad_pro path."""
    if path.suffix == ".kicad_pro":
        root = path.with_suffix(".kicad_sch")
        if not root.is_file():
            raise InputError(f"no root schematic {root.name} beside the project file", str(path))
        return root, path
    project = path.with_suffix(".kicad_pro")
    return path, project if project.is_file() else None


def load_design(path: Path) -> Design:
    """The root file, every sub-sheet file it reaches, and every sheet instance in page order."""
    root_path, project = root_of(path)
    root, root_notes = load_file(root_path)
    design = Design(root, [], {}, root_path.stem)
    if root_notes:
        design.notes[root.path] = root_notes
    if project is not None:
        _project_settings(project, design)
    files = {os.path.realpath(root_path): root}
    order: list[SheetInstance] = []
    stack = [SheetInstance(root, (), "/", root.sheet_pages.get("/", "1"), -1, None)]
    chains: list[tuple[str, ...]] = [(os.path.realpath(root_path),)]
    while stack:
        inst = stack.pop()
        chain = chains.pop()
        index = len(order)
        order.append(inst)
        if len(order) > MAX_INSTANCES:
            raise InputError(f"more than {MAX_INSTANCES} sheet instances: a hierarchy that repeats itself?",
                             root.path)
        children = []
        for record in inst.file.sheets:
            child_path = _sheet_path(Path(inst.file.path), record)
            key = os.path.realpath(child_path)
            if key in chain:
                raise InputError(f"sheet {record.name!r} instantiates {record.file}, which contains it "
                                 "(a hierarchy cannot include itself)", inst.file.path, record.line, record.column)
            child_file = files.get(key)
            if child_file is None:
                child_file, notes = load_file(child_path)
                files[key] = child_file
                if notes:
                    design.notes[child_file.path] = notes
            uuids = inst.uuids + (record.uuid,)
            children.append(SheetInstance(child_file, uuids, inst.names + record.name + "/",
                                          _page(design, root, record, inst), index, record,
                                          _inherited(inst.flags, record.flags)))
        for child in reversed(children):
            stack.append(child)
            chains.append(chain + (os.path.realpath(child.file.path),))
    for f in files.values():
        design.aliases.update(f.bus_aliases)
    # KiCad lists sheets by page number, a sheet without one after the rest, then in hierarchy
    # order (SCH_SHEET_LIST::SortByPageNumbers).
    ranked = sorted(range(len(order)), key=lambda i: (i != 0, not order[i].page, natural(order[i].page), i))
    remap = {old: new for new, old in enumerate(ranked)}
    design.instances = [order[i] for i in ranked]
    for inst in design.instances:
        inst.parent = remap.get(inst.parent, -1)
    return design


def _inherited(above: dict[str, bool], own: tuple[tuple[str, bool], ...]) -> dict[str, bool]:
    """A sheet marked do-not-populate or left off the board or BOM marks everything in it
    (KiCad 9/10's netlist exporter folds `sheet.GetDNP()` and the exclusions into each part)."""
    out = dict(above)
    for flag, value in own:
        if flag in ("in_bom", "on_board"):
            out[flag] = out.get(flag, True) and value
        else:
            out[flag] = out.get(flag, False) or value
    return out


def _page(design: Design, root: SheetFile, record: SheetRecord, parent: SheetInstance) -> str:
    parent_path = "/" + "/".join((root.uuid,) + parent.uuids)
    pages = [(project, page) for project, path, page in record.pages if path == parent_path]
    for project, page in pages:
        if project == design.project:
            return page
    if pages:
        return pages[0][1]
    return root.sheet_pages.get("/" + "/".join(parent.uuids + (record.uuid,)), "")


def _sheet_path(parent: Path, record: SheetRecord) -> Path:
    """KiCad resolves a sheet file against the folder of the sheet that holds it."""
    candidates = [parent.parent / record.file]
    if "\\" in record.file:  # saved on Windows
        candidates.append(parent.parent / record.file.replace("\\", "/"))
    for c in candidates:
        if c.is_file():
            return c
    raise InputError(f"sheet {record.name!r} needs {record.file}, which is not there", str(parent),
                     record.line, record.column)
