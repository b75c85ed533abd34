"""Where things touch on one sheet: the islands of items that KiCad treats as electrically joined.

The rules are KiCad's (docs.kicad.org, kicad-python "Schematic": "items must exactly match in
position to be considered connected"; eeschema/connection_graph.cpp, `updateItemConnectivity`):

* Items join where their connection points coincide exactly: wire and bus ends, pins, labels,
  sheet pins, junctions, no-connect flags, bus-entry ends. Two wires that merely cross do not
  join, nor does a wire end or a pin lying on the middle of another wire.
* A junction, or the end of a bus entry, on the middle of a wire or bus splits it there
  (`BreakSegmentsOnJunctions`), so it joins that wire.
* A label joins every wire or bus it lies on, anywhere along it (`SCH_LABEL_BASE::
  UpdateDanglingState`), not only at an end.
* Collinear wires that overlap are merged (`SCHEMATIC::CleanUp`); horizontal and vertical
  runs are handled, which is how KiCad draws.
* A pin of electrical type no_connect joins nothing (`SCH_PIN::ConnectionPropagatesTo`).
* A bus entry joins the wire side only: at an end that lies on a bus it joins nothing, since
  a bus member is picked by its label, never by the entry.
* Wires and buses never join each other directly.

A library pin's point on the sheet is the symbol's position plus the pin's library position
transformed by the symbol's rotation and mirroring (`SCH_SYMBOL::GetPinPhysicalPosition`).
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass, field

from ledlint.netlist.kicad_sch.parse import Label, LibPin, LibSymbol, PlacedSymbol, Point, Segment, SheetFile, SheetPin


@dataclass(frozen=True, slots=True)
class PlacedPin:
    symbol: int  # index into the file's symbols
    pin: LibPin
    at: Point


@dataclass
class Island:
    """Items on one sheet that touch, directly or along wires."""

    pins: list[PlacedPin] = field(default_factory=list)
    labels: list[Label] = field(default_factory=list)
    sheet_pins: list[tuple[int, SheetPin]] = field(default_factory=list)  # (sheet index, pin)
    no_connect: bool = False  # a no-connect flag (X) sits on it
    nc_pin: bool = False  # a pin of type no_connect is in it
    bus: bool = False  # it holds bus segments


def place(index: int, sym: PlacedSymbol, lib: LibSymbol, unit: int) -> list[PlacedPin]:
    """The pins of `lib` that the placed unit and body style show, at their sheet positions;
    `index` is the symbol's position in its file."""
    x1, y1, x2, y2 = sym.transform
    sx, sy = sym.at
    out = []
    for pin in lib.pins:
        if pin.unit not in (0, unit) or pin.body not in (0, sym.body):
            continue
        px, py = pin.at
        out.append(PlacedPin(index, pin, (sx + x1 * px + y1 * py, sy + x2 * px + y2 * py)))
    return out


class _Segments:
    """Wire and bus segments indexed by row and column, to find those a point lies on."""

    def __init__(self, segments: list[Segment]) -> None:
        self.rows: dict[int, list[tuple[int, int, int]]] = defaultdict(list)
        self.cols: dict[int, list[tuple[int, int, int]]] = defaultdict(list)
        self.slanted: list[int] = []
        self.segments = segments
        for i, s in enumerate(segments):
            (ax, ay), (bx, by) = s.a, s.b
            if ay == by:
                self.rows[ay].append((min(ax, bx), max(ax, bx), i))
            elif ax == bx:
                self.cols[ax].append((min(ay, by), max(ay, by), i))
            else:
                self.slanted.append(i)

    def through(self, p: Point) -> list[int]:
        """Segments that `p` lies on, ends included."""
        x, y = p
        out = [i for lo, hi, i in self.rows.get(y, ()) if lo <= x <= hi]
        out += [i for lo, hi, i in self.cols.get(x, ()) if lo <= y <= hi]
        for i in self.slanted:
            (ax, ay), (bx, by) = self.segments[i].a, self.segments[i].b
            if (bx - ax) * (y - ay) == (by - ay) * (x - ax) and min(ax, bx) <= x <= max(ax, bx) \
                    and min(ay, by) <= y <= max(ay, by):
                out.append(i)
        return out

    def overlaps(self) -> list[tuple[int, int]]:
        """Pairs of collinear, same-kind segments that overlap or touch end to end."""
        out = []
        for runs in (self.rows, self.cols):
            for line in runs.values():
                for bus in (False, True):
                    spans = sorted(r for r in line if self.segments[r[2]].bus is bus)
                    reach, owner = None, -1
                    for lo, hi, i in spans:
                        if reach is not None and lo <= reach:
                            out.append((owner, i))
                        if reach is None or hi > reach:
                            reach, owner = hi, i
        return out


class UnionFind:
    """Disjoint sets of item numbers, joined pairwise."""

    def __init__(self, size: int = 0) -> None:
        self.parent = list(range(size))

    def add(self) -> int:
        self.parent.append(len(self.parent))
        return len(self.parent) - 1

    def find(self, i: int) -> int:
        parent = self.parent
        while parent[i] != i:
            parent[i] = parent[parent[i]]
            i = parent[i]
        return i

    def join(self, a: int, b: int) -> None:
        ra, rb = self.find(a), self.find(b)
        if ra != rb:
            self.parent[rb] = ra


def islands(sheet: SheetFile, pins: list[PlacedPin]) -> list[Island]:
    """Every island of `sheet` that holds a pin, a label or a sheet pin; `pins` are the placed
    pins of its symbols at the units this sheet instance shows."""
    segs = sheet.segments
    index = _Segments(segs)
    # Item ids: segments, then junctions, no-connects, bus entries, labels, sheet pins, pins.
    n_seg = len(segs)
    j0 = n_seg
    nc0 = j0 + len(sheet.junctions)
    e0 = nc0 + len(sheet.no_connects)
    l0 = e0 + len(sheet.bus_entries)
    s0 = l0 + len(sheet.labels)
    sheet_pins = [(k, sp) for k, record in enumerate(sheet.sheets) for sp in record.pins]
    p0 = s0 + len(sheet_pins)
    union = UnionFind(p0 + len(pins))
    at: dict[Point, list[int]] = defaultdict(list)
    for i, s in enumerate(segs):
        at[s.a].append(i)
        at[s.b].append(i)
    splitters = [(j0 + k, p) for k, p in enumerate(sheet.junctions)]
    for k, (a, b) in enumerate(sheet.bus_entries):
        at[a].append(e0 + k)
        at[b].append(e0 + k)
        splitters += [(e0 + k, a), (e0 + k, b)]
    for item, p in splitters:
        for i in index.through(p):
            if p != segs[i].a and p != segs[i].b:
                at[p].append(i)  # the segment is split here: the point becomes one of its ends
        if item < e0:
            at[p].append(item)
    for k, p in enumerate(sheet.no_connects):
        at[p].append(nc0 + k)
    for k, label in enumerate(sheet.labels):
        at[label.at].append(l0 + k)
        for i in index.through(label.at):
            union.join(l0 + k, i)
    for k, (_, sp) in enumerate(sheet_pins):
        at[sp.at].append(s0 + k)
    for k, pp in enumerate(pins):
        if pp.pin.type != "no_connect":
            at[pp.at].append(p0 + k)
    for first, second in index.overlaps():
        union.join(first, second)
    any_bus = any(s.bus for s in segs)
    for p, items in at.items():
        if len(items) < 2:
            continue
        if not any_bus:
            for i in items[1:]:
                union.join(items[0], i)
            continue
        buses = [i for i in items if i < n_seg and segs[i].bus]
        wires = [i for i in items if i < n_seg and not segs[i].bus]
        others = [i for i in items if i >= n_seg]
        if any(segs[i].bus for i in index.through(p)):
            others = [i for i in others if not e0 <= i < l0]
        # A wire end on a bus end is an error KiCad's checker reports; keep them apart, with the
        # other items at the point on the wire side.
        for group in ((wires + others, buses) if wires else (buses + others,)):
            for i in group[1:]:
                union.join(group[0], i)
    found: dict[int, Island] = {}

    def island(item: int) -> Island:
        root = union.find(item)
        got = found.get(root)
        if got is None:
            got = found[root] = Island()
        return got

    for k, label in enumerate(sheet.labels):
        island(l0 + k).labels.append(label)
    for k, owned in enumerate(sheet_pins):
        island(s0 + k).sheet_pins.append(owned)
    for k, pp in enumerate(pins):
        isl = island(p0 + k)
        isl.pins.append(pp)
        isl.nc_pin = isl.nc_pin or pp.pin.type == "no_connect"
    for k in range(len(sheet.no_connects)):
        root = union.find(nc0 + k)
        if root in found:
            found[root].no_connect = True
    for i, s in enumerate(segs):
        root = union.find(i)
        if s.bus and root in found:
            found[root].bus = True
    return list(found.values())
