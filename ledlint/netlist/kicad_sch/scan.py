"""A first pass over a schematic's text: blank what carries no connectivity, lift out the plain wires.

Most of a .kicad_sch is drawing (text effects, strokes, fills, the graphics of library symbols,
pictures), and most of the rest is wires and junctions in one fixed layout. The pass replaces
drawing lists with spaces, and takes wires, buses, junctions and no-connect flags written in
KiCad's usual layout straight from the text, blanking them too; newlines are kept, so every
line and column the scanner reports stays where it was. Only complete, well-formed lists
match: anything unusual or malformed is left in place for the s-expression scanner and the
strict parser to read or report. A match that starts inside a quoted string (strings never
span lines, kicad-netlist-format.md §2.2) is left alone.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

_STRING = r'"(?:[^"\\\r\n]|\\.)*+"'
_PLAIN = r'[^()"]++'
_DEPTH1 = rf"\((?:{_PLAIN}|{_STRING})*+\)"
_DEPTH2 = rf"\((?:{_PLAIN}|{_STRING}|{_DEPTH1})*+\)"
_DEPTH3 = rf"\((?:{_PLAIN}|{_STRING}|{_DEPTH2})*+\)"
# Heads whose whole list the reader never looks at (dev-docs.kicad.org "Schematic File Format":
# text effects, stroke and fill, graphical items and text, images, field ids, junction looks).
_HEADS = ("effects|stroke|fill|polyline|rectangle|circle|arc|bezier|image|text|text_box|id|diameter|color|"
          "length|fields_autoplaced|pin_numbers|pin_names|title_block")
_NUM = r"(-?\d{1,7}(?:\.\d{1,6})?)"
_SP = r"[ \t\r\n]*"
_UUID = rf'(?:\(uuid[ \t]+"?[0-9A-Za-z-]*"?\){_SP})?'
_STROKE = rf"(?:\(stroke{_SP}(?:{_PLAIN}|{_DEPTH1})*+\){_SP})?"
_UNUSED = re.compile(
    rf"\((?P<line>wire|bus){_SP}\(pts{_SP}\(xy {_NUM} {_NUM}\){_SP}\(xy {_NUM} {_NUM}\){_SP}\){_SP}{_STROKE}{_UUID}\)"
    rf"|\((?P<point>junction|no_connect){_SP}\(at {_NUM} {_NUM}\){_SP}"
    rf"(?:\(diameter [-\d.]+\){_SP})?(?:\(color(?: [-\d.]+)*\){_SP})?{_UUID}\)"
    rf"|\((?:{_HEADS})(?=[\s()])(?:{_PLAIN}|{_STRING}|{_DEPTH3})*+\)"
)
_NOT_EOL = re.compile(r"[^\r\n]")
_QUOTES = re.compile(r'\\.|"')
_UNITS_PER_MM = 10_000


@dataclass
class Lifted:
    """Items taken from the text: wire and bus segments, junction and no-connect points."""

    wires: list[tuple[int, int, int, int, bool]] = field(default_factory=list)
    junctions: list[tuple[int, int]] = field(default_factory=list)
    no_connects: list[tuple[int, int]] = field(default_factory=list)


def _units(text: str) -> int:
    return round(float(text) * _UNITS_PER_MM)


def _in_string(prefix: str) -> bool:
    """Whether the end of `prefix`, the start of a line, lies inside a quoted string."""
    if "\\" not in prefix:
        return prefix.count('"') % 2 == 1
    return sum(1 for m in _QUOTES.finditer(prefix) if m.group() == '"') % 2 == 1


def _spaces(block: str) -> str:
    """`block` as spaces, its line breaks kept."""
    if "\r" in block:
        return _NOT_EOL.sub(" ", block)
    return "\n".join(" " * len(part) for part in block.split("\n"))


def scan(text: str) -> tuple[str, Lifted]:
    """`text` with unused lists blanked and plain wires lifted out, and what was lifted."""
    lifted = Lifted()
    pieces: list[str] = []
    start = 0
    for m in _UNUSED.finditer(text):
        begin, end = m.span()
        line_start = text.rfind("\n", 0, begin) + 1
        if '"' in text[line_start:begin] and _in_string(text[line_start:begin]):
            continue
        line, point = m.group("line", "point")
        if line is not None:
            x1, y1, x2, y2 = m.group(2, 3, 4, 5)
            lifted.wires.append((_units(x1), _units(y1), _units(x2), _units(y2), line == "bus"))
        elif point is not None:
            at = (_units(m.group(7)), _units(m.group(8)))
            (lifted.junctions if point == "junction" else lifted.no_connects).append(at)
        block = text[begin:end]
        pieces.append(text[start:begin])
        pieces.append(" " * len(block) if "\n" not in block and "\r" not in block else _spaces(block))
        start = end
    if not pieces:
        return text, lifted
    pieces.append(text[start:])
    return "".join(pieces), lifted
