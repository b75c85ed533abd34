"""Blank out the parts of a schematic that carry no connectivity, before the s-expression scanner.

Most of a .kicad_sch is drawing: text effects, strokes, fills, the graphics of library
symbols and pictures. Replacing those lists with spaces (newlines kept, so every line and
column stays where it was) spares the scanner most of its tokens. Only complete, well-formed
lists of those kinds are blanked; anything malformed is left for the scanner to report, and
quoted strings are stepped over whole, so a '(' inside text never starts a match.
"""

from __future__ import annotations

import re

_STRING = r'"(?:[^"\\\r\n]|\\.)*+"'
_PLAIN = r'[^()"]++'
_DEPTH1 = rf"\((?:{_PLAIN}|{_STRING})*+\)"
_DEPTH2 = rf"\((?:{_PLAIN}|{_STRING}|{_DEPTH1})*+\)"
_DEPTH3 = rf"\((?:{_PLAIN}|{_STRING}|{_DEPTH2})*+\)"
# Heads whose whole list the reader never looks at (dev-docs.kicad.org "Schematic File Format":
# text effects, stroke and fill definitions, graphical items, images).
_HEADS = "effects|stroke|fill|polyline|rectangle|circle|arc|bezier|image"
_UNUSED = re.compile(rf"{_STRING}|(\((?:{_HEADS})(?=[\s()])(?:{_PLAIN}|{_STRING}|{_DEPTH3})*+\))")
_NOT_EOL = re.compile(r"[^\r\n]")


def blank_unused(text: str) -> str:
    """`text` with every unused list replaced by spaces of the same length."""
    pieces: list[str] = []
    start = 0
    for m in _UNUSED.finditer(text):
        if m.lastindex is None:
            continue  # a quoted string, kept as it is
        begin, end = m.span(1)
        block = m.group(1)
        pieces.append(text[start:begin])
        pieces.append(" " * len(block) if "\n" not in block and "\r" not in block else _NOT_EOL.sub(" ", block))
        start = end
    if not pieces:
        return text
    pieces.append(text[start:])
    return "".join(pieces)
