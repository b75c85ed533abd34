"""Net names as KiCad forms them: driver ranks, label text, bus members and generated pin names.

Sources (KiCad source, read for facts): `CONNECTION_SUBGRAPH::PRIORITY` and `ResolveDrivers`
in eeschema/connection_graph.{h,cpp}; `SCH_CONNECTION::ParseBusVector`/`ParseBusGroup` and
`ConfigureFromLabel` in eeschema/sch_connection.cpp; `SCH_PIN::GetDefaultNetName` in
eeschema/sch_pin.cpp; `EscapeString`/`UnescapeString` in common/string_utils.cpp
(kicad-netlist-format.md §2.3 and its net-name table).
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from enum import Enum, IntEnum
from typing import Mapping


class Rank(IntEnum):
    """How strongly an item names its net; the higher rank wins (KiCad's driver priority).

    A pin's generated name is the weakest; a global label the strongest. From HIER_LABEL up a
    driver is "strong": its name is the user's, and nets with the same strong name on one
    sheet are one net.
    """

    NONE = 0
    PIN = 1
    SHEET_PIN = 2
    HIER_LABEL = 3
    LOCAL_LABEL = 4
    LOCAL_POWER = 5
    POWER = 6
    GLOBAL = 7

    @property
    def strong(self) -> bool:
        return self >= Rank.HIER_LABEL

    @property
    def global_scope(self) -> bool:
        """A name that needs no sheet path: the same text anywhere is the same net."""
        return self in (Rank.POWER, Rank.GLOBAL)

    @property
    def sheet_prefixed(self) -> bool:
        """Local names carry the sheet path they sit on (`/sub/NAME`); pins and globals do not."""
        return self in (Rank.SHEET_PIN, Rank.HIER_LABEL, Rank.LOCAL_LABEL, Rank.LOCAL_POWER)


# common/string_utils.cpp: the tokens UnescapeString turns back into characters.
_UNESCAPES = {
    "dblquote": '"', "quote": "'", "lt": "<", "gt": ">", "backslash": "\\", "slash": "/",
    "bar": "|", "comma": ",", "colon": ":", "space": " ", "dollar": "$", "tab": "\t",
    "return": "\n", "brace": "{",
}
_ESCAPE_TOKEN = re.compile(r"\{(" + "|".join(_UNESCAPES) + r")\}")


def escape_net_name(text: str) -> str:
    """KiCad's EscapeString(…, CTX_NETNAME): '/' is the sheet separator in a net name, so a
    slash in label text becomes {slash}; line breaks are dropped."""
    return text.replace("/", "{slash}").replace("\n", "").replace("\r", "")


def unescape(text: str) -> str:
    """KiCad's UnescapeString: {slash}, {space}, … back to their characters; other braces kept."""
    return _ESCAPE_TOKEN.sub(lambda m: _UNESCAPES[m.group(1)], text) if "{" in text else text


class BusKind(Enum):
    VECTOR = "vector"  # PREFIX[M..N]
    GROUP = "group"  # PREFIX{A B C[0..3] ALIAS}


@dataclass(frozen=True, slots=True)
class Member:
    """One net of a bus: its name inside the bus (KiCad's local name), its name on the sheet
    (with the group's `PREFIX.`), and its position in a vector (-1 in a group)."""

    local: str
    full: str
    index: int = -1


@dataclass(frozen=True, slots=True)
class Bus:
    kind: BusKind
    members: tuple[Member, ...]

    def match(self, other: Member) -> Member | None:
        """The member of this bus that `other` (a member of a bus joined to it) lands on:
        by position in a vector, by local name in a group (KiCad's matchBusMember)."""
        for m in self.members:
            if (m.index == other.index) if self.kind is BusKind.VECTOR else (m.local == other.local):
                return m
        return None


_RANGE = re.compile(r"\[(\d+)\.\.(\d+)\]")


def _markup_brace(text: str, i: int) -> bool:
    # `_{…}`, `^{…}` and `~{…}` are sub-, superscript and overbar markup, not bus braces.
    return i > 0 and text[i - 1] in "_^~"


def _vector(text: str) -> tuple[str, list[str]] | None:
    """PREFIX[M..N]SUFFIX (suffix only '}' or '~'): the prefix and member names M..N."""
    nesting = 0
    i = 0
    n = len(text)
    while i < n and text[i] != "[":
        c = text[i]
        if c == "{":
            if not _markup_brace(text, i):
                return None
            nesting += 1
        elif c == "}":
            nesting -= 1
        elif c in " ]":
            return None
        i += 1
    m = _RANGE.match(text, i)
    if m is None:
        return None
    suffix = text[m.end():]
    if any(c not in "}~" for c in suffix):
        return None
    nesting -= suffix.count("}")
    begin, end = int(m.group(1)), int(m.group(2))
    if nesting != 0 or begin == end:
        return None
    lo, hi = min(begin, end), max(begin, end)
    if hi - lo > _MAX_MEMBERS:
        return None
    prefix = text[:i]
    return prefix, [f"{prefix}{k}{suffix}" for k in range(lo, hi + 1)]


# Far beyond any real bus; a label such as D[0..999999999] must not build a billion names.
_MAX_MEMBERS = 4096


def _group(text: str) -> tuple[str, list[str]] | None:
    """PREFIX{A B C}: the prefix and the space-separated member texts."""
    nesting = 0
    i = 0
    n = len(text)
    while i < n:
        c = text[i]
        if c == "{":
            if not _markup_brace(text, i):
                break
            nesting += 1
        elif c == "}":
            nesting -= 1
        elif c in " []":
            return None
        i += 1
    if nesting != 0 or i >= n - 1:
        return None
    prefix = text[:i]
    members: list[str] = []
    current = ""
    for j in range(i + 1, n):
        c = text[j]
        if c == "{":
            if not _markup_brace(text, j):
                return None
            nesting += 1
        elif c == "}":
            if nesting == 0:
                members.append(current)
                return prefix, [m for m in members if m]
            nesting -= 1
        if c == " ":
            members.append(current)
            current = ""
        else:
            current += c
    return None


def parse_bus(label: str, aliases: Mapping[str, tuple[str, ...]]) -> Bus | None:
    """The bus a label names, or None for a plain net label. Group members that name a bus
    alias expand to the alias's members; a named group prefixes its members `NAME.`."""
    text = unescape(label)
    vector = _vector(text)
    if vector is not None:
        _, names = vector
        return Bus(BusKind.VECTOR, tuple(Member(name, name, k) for k, name in enumerate(names)))
    group = _group(text)
    if group is None:
        return None
    prefix, texts = group
    dot = prefix + "." if prefix else ""
    out: list[Member] = []
    for item in texts:
        for name in aliases.get(item, (item,)):
            inner = _vector(name)
            if inner is not None:
                out.extend(Member(m, dot + m, k) for k, m in enumerate(inner[1]))
            else:
                out.append(Member(name, dot + name))
    return Bus(BusKind.GROUP, tuple(out))


def unit_suffix(unit: int, first: str = "A", separator: str = "") -> str:
    """The letter KiCad appends to a multi-unit reference (U1A, U1B, … U1Z, U1AA …):
    LIB_SYMBOL::LetterSubReference with the project's first id and separator."""
    if unit < 1:
        return ""
    letters = ""
    n = unit
    while n > 0:  # bijective base 26: A…Z, then AA…
        n, digit = divmod(n - 1, 26)
        letters = chr(ord(first) + digit) + letters
    return separator + letters


@dataclass(frozen=True, slots=True)
class PinNaming:
    """What a pin's generated net name is made of (SCH_PIN::GetDefaultNetName)."""

    ref: str  # without unit letter
    unit_ref: str  # with unit letter when the symbol has several units
    number: str
    name: str  # the library pin's shown name ('' when unnamed)
    duplicate_name: bool  # another pin of the placed unit has the same name and the same no-connect kind
    annotated: bool
    symbol_uuid: str


def pin_net_name(p: PinNaming, unconnected: bool, named_form: bool) -> str:
    """`Net-(…)` or `unconnected-(…)` for a net named by a pin.

    Before KiCad 7 (named_form False) every such name is `REF-PadN`. From KiCad 7 a named pin
    gives `REF[unit]-NAME`, with `-PadN` added when the net is unconnected or the name is not
    unique on the symbol; an unnamed pin (or one named as its number) keeps `REF-PadN`; an
    unannotated symbol (`R?`) uses its UUID.
    """
    head = "unconnected-(" if unconnected else "Net-("
    number = escape_net_name(p.number)
    if not p.annotated:
        return f"{head}{p.symbol_uuid}-Pad{p.number})"
    if named_form and p.name and p.name != p.number:
        pad = f"-Pad{number}" if unconnected or p.duplicate_name else ""
        return f"{head}{p.unit_ref}-{escape_net_name(p.name)}{pad})"
    return f"{head}{p.ref}-Pad{number if named_form else p.number})"


_PAD = re.compile(r"(.*?)(\d+)")


def stacked_numbers(number: str) -> list[str]:
    """The pad numbers of a KiCad 10 stacked pin: `[1,2,3]`, `[1-4]`, `[A1-A3,B7]` (one pin
    drawn for several pads; string_utils.h, ExpandStackedPinNotation). Any other number, or a
    malformed list, is the one number it reads."""
    if len(number) < 3 or number[0] != "[" or number[-1] != "]":
        return [number]
    out: list[str] = []
    for part in (p.strip() for p in number[1:-1].split(",")):
        lo, dash, hi = part.partition("-")
        if not dash:
            if not part:
                return [number]
            out.append(part)
            continue
        first, last = _PAD.fullmatch(lo.strip()), _PAD.fullmatch(hi.strip())
        if first is None or last is None or first.group(1) != last.group(1):
            return [number]
        a, b = int(first.group(2)), int(last.group(2))
        if not a <= b <= a + _MAX_MEMBERS:
            return [number]
        out.extend(f"{first.group(1)}{k}" for k in range(a, b + 1))
    return out


def low_quality(name: str) -> bool:
    """A generated name that only numbers a pad; KiCad prefers any other name of equal rank."""
    return "-Pad" in name
