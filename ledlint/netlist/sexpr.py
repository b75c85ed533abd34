"""S-expression layer: netlist text to a tree of lists and exact-text atoms, with offsets.

KiCad's own lexer rules (kicad-netlist-format.md §1.1, §2.1, §2.2): an atom is either a
quoted string with backslash escapes or a bare run of anything but ASCII whitespace and
parentheses, taken literally (v5 writes backslash paths and `/LED[0]` bare). Every atom stays
text: nothing becomes a number, a boolean or an empty list, and `;` or `#` start nothing.
The scanner is iterative with an explicit stack, so nesting depth cannot exhaust the
interpreter's recursion limit; depth is capped at MAX_DEPTH with a clean error instead.
"""

from __future__ import annotations

import re
from bisect import bisect_right
from typing import Callable

from ledlint.errors import InputError

# KiCad nests about eight levels deep; anything far beyond that is not a netlist.
MAX_DEPTH = 100

# One token per match, leading ASCII whitespace skipped. Groups: 1 "(", 2 ")", 3 the body
# of a quoted string (never spans a line: KiCad writes \n inside strings as an escape),
# 4 a bare atom (a '"' after its first character belongs to it), 5 a quote that opens a
# string never closed on its line.
_TOKEN = re.compile(
    r'[ \t\r\n\f\v]*(?:(\()|(\))|"([^"\\\r\n]*(?:\\.[^"\\\r\n]*)*)"|([^ \t\r\n\f\v()"][^ \t\r\n\f\v()]*)|("))'
)
# The body's scanner: _TOKEN with one more alternative tried first, a whole list of a keyword
# and one plainly written atom, "(ref "R1")" or "(pin 2)", read in one match instead of four
# tokens; most lists inside a part or a net are that. Groups: 1 that list, 2 its keyword,
# 3 its quoted atom or 4 its bare atom; then 5-9 as _TOKEN's 1-5.
_SCAN = re.compile(
    r'[ \t\r\n\f\v]*(?:(\(([a-z_]+)[ \t]+(?:"([^"\\\r\n]*)"|([^ \t\r\n\f\v()"][^ \t\r\n\f\v()]*))\))'
    r'|(\()|(\))|"([^"\\\r\n]*(?:\\.[^"\\\r\n]*)*)"|([^ \t\r\n\f\v()"][^ \t\r\n\f\v()]*)|("))'
)
_ESCAPE = re.compile(r"\\(?:x([0-9A-Fa-f]{1,2})|([0-7]{1,3})|(.))", re.S)
_SIMPLE_ESCAPES = {
    '"': '"', "\\": "\\", "a": "\a", "b": "\b", "f": "\f",
    "n": "\n", "r": "\r", "t": "\t", "v": "\v",
}


class SList(list):
    """A parsed list: its items (atoms as str, sub-lists as SList) and where it opened."""

    __slots__ = ("offset",)
    offset: int  # character offset of its '(' in the text

    @property
    def head(self) -> str:
        """The list's keyword, or '' when the list is empty or starts with a list."""
        return self[0] if self and type(self[0]) is str else ""


def _unescape_one(m: re.Match[str]) -> str:
    hexa, octal, other = m.groups()
    if hexa is not None:
        return chr(int(hexa, 16))
    if octal is not None:
        return chr(int(octal, 8))
    # DSNLEXER keeps the backslash of an escape it does not know.
    return _SIMPLE_ESCAPES.get(other, "\\" + other)


def unescape(body: str) -> str:
    """Resolve KiCad's string escapes (\\" \\\\ \\n \\t \\x41 \\101, unknown kept)."""
    return _ESCAPE.sub(_unescape_one, body) if "\\" in body else body


class Locator:
    """Turns character offsets into 1-based line and column numbers."""

    def __init__(self, text: str) -> None:
        self._text = text
        self._starts: list[int] | None = None

    def line_col(self, offset: int) -> tuple[int, int]:
        if self._starts is None:
            # CRLF, LF, or the old Mac lone CR: each ends a line, as an editor would count it.
            self._starts = [0] + [m.end() for m in re.finditer("\r\n|\n|\r", self._text)]
        line = bisect_right(self._starts, offset)
        return line, offset - self._starts[line - 1] + 1


def parse(text: str, path: str = "", take: Callable[[SList, SList, SList], bool] | None = None) -> SList:
    """Parse text holding exactly one top-level list; raise InputError at the faulty spot.

    `take(item, section, root)` is offered each list two levels down (an export's components and
    nets) as it closes, with the section and the top-level list that hold it; when it returns True
    the caller has the item and the tree does not keep it, so a reader builds its model as it goes.
    """
    locator = Locator(text)

    def fail(message: str, offset: int) -> InputError:
        line, col = locator.line_col(offset)
        return InputError(message, path, line, col)

    top = SList()
    current = top
    stack: list[SList] = []
    pos = len(text)  # where the body starts: nowhere, unless the text opens a list
    for first in _TOKEN.finditer(text):  # the first token, which must open the one top-level list
        what = first.lastindex or 0
        if what != 1:
            offset = first.start(what)
            if what == 2:
                raise fail("unexpected ')': more lists closed than opened", offset)
            raise fail(_describe_non_sexpr(text[offset:]), offset)
        current = SList()
        current.offset = first.start(1)
        top.append(current)
        stack.append(top)
        pos = first.end()
        break
    append = stack.append
    for m in _SCAN.finditer(text, pos):  # the body: the hot loop of every read
        kind = m.lastindex
        if kind == 8:
            current.append(m.group(8))
        elif kind == 1:
            if len(stack) >= MAX_DEPTH:
                raise fail(f"lists nested deeper than {MAX_DEPTH} levels; not a KiCad netlist", m.start(1))
            quoted = m.group(3)
            new = SList((m.group(2), m.group(4) if quoted is None else quoted))
            new.offset = m.start(1)
            # A leaf closes as it opens: offer it to take() as ')' below would.
            if not (len(stack) == 2 and take is not None and take(new, current, stack[1])):
                current.append(new)
        elif kind == 5:
            if len(stack) >= MAX_DEPTH:
                raise fail(f"lists nested deeper than {MAX_DEPTH} levels; not a KiCad netlist", m.start(5))
            new = SList()
            new.offset = m.start(5)
            current.append(new)
            append(current)
            current = new
        elif kind == 6:
            done, current = current, stack.pop()
            if len(stack) == 2 and take is not None and take(done, current, stack[1]):
                current.pop()
            elif not stack:
                pos = m.end()
                break
        elif kind == 7:
            body = m.group(7)
            current.append(unescape(body) if "\\" in body else body)
        else:
            raise fail("unterminated string: a '\"' is never closed on its line", m.start(9))
    else:
        pos = len(text)
    if (rest := _TOKEN.match(text, pos)) is not None:  # anything after the top-level list closed
        what = rest.lastindex or 0
        if what == 2:
            raise fail("unexpected ')': more lists closed than opened", rest.start(2))
        raise fail("unexpected text after the netlist's closing ')'", rest.start(what))
    if stack:
        line, col = locator.line_col(current.offset)
        raise fail(
            f"unexpected end of file: {len(stack)} list(s) still open, the innermost "
            f"'({current.head}' opened at line {line} column {col} (truncated file?)",
            len(text.rstrip()),
        )
    if not top:
        raise fail("empty file: expected a KiCad netlist, '(export …)'", 0)
    return top[0]


def _describe_non_sexpr(text: str) -> str:
    if text.startswith(("{", "[")):
        return "this looks like JSON, not a KiCad netlist (expected '(export …)')"
    if text.startswith("<"):
        return "this looks like XML; export the KiCad netlist in its s-expression format (.net)"
    if re.match(r"#\s*EESchema\s+Netlist", text, re.IGNORECASE):
        return "this is a pre-2013 legacy KiCad netlist; re-export it from a current KiCad as .net"
    token = re.match(r"[^ \t\r\n\f\v()]*", text).group(0) or text[:1]  # type: ignore[union-attr]  # * always matches
    return f"expected '(' to open a KiCad netlist, found {token[:20]!r}"
