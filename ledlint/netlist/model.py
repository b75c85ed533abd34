"""The netlist model: frozen dataclasses for a netlist, its components, pins, nets and sheets."""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from enum import Enum
from ledlint.frozen import FrozenMap
from typing import Any, Mapping


class PinType(Enum):
    """Electrical pin type, with KiCad 5 spellings mapped to KiCad 6+ names."""

    INPUT = "input"
    OUTPUT = "output"
    BIDIRECTIONAL = "bidirectional"
    TRI_STATE = "tri_state"
    PASSIVE = "passive"
    FREE = "free"
    UNSPECIFIED = "unspecified"
    POWER_IN = "power_in"
    POWER_OUT = "power_out"
    OPEN_COLLECTOR = "open_collector"
    OPEN_EMITTER = "open_emitter"
    NO_CONNECT = "no_connect"
    UNKNOWN = "unknown"

    @classmethod
    def from_text(cls, text: str) -> PinType:
        """Map any KiCad spelling (kicad-netlist-format.md §3.3) to a type; unknown kept as UNKNOWN."""
        return _PIN_TYPE_SPELLINGS.get(text.lower(), cls.UNKNOWN) if text else cls.UNKNOWN


_PIN_TYPE_SPELLINGS = {t.value: t for t in PinType} | {
    "bidi": PinType.BIDIRECTIONAL,
    "3state": PinType.TRI_STATE,
    "unspc": PinType.UNSPECIFIED,
    "opencol": PinType.OPEN_COLLECTOR,
    "openem": PinType.OPEN_EMITTER,
    "notconnected": PinType.NO_CONNECT,
    "unconnected": PinType.NO_CONNECT,
}



_DIGITS = re.compile(r"(\d+)")


def natural(text: str) -> tuple[int | str, ...]:
    """A sort key for references and pin numbers that puts D2 before D10."""
    return tuple(int(p) if p.isdigit() else p for p in _DIGITS.split(text))


def _empty() -> Mapping[str, Any]:
    return FrozenMap({})


@dataclass(frozen=True, slots=True)
class Pin:
    """One pin of a component, with the net it sits on (None when on no net)."""

    ref: str
    number: str
    name: str
    type: PinType
    net: str | None
    no_connect: bool = False  # KiCad's '+no_connect' marker: an X on the pin


@dataclass(frozen=True, slots=True)
class Component:
    """A placed symbol (all units merged, as KiCad writes it)."""

    ref: str
    value: str
    footprint: str = ""
    datasheet: str = ""
    description: str = ""
    lib: str = ""
    part: str = ""
    fields: Mapping[str, str] = field(default_factory=_empty)  # the user's own fields, as written
    properties: Mapping[str, str] = field(default_factory=_empty)  # KiCad's own: Sheetname, ki_*, flags
    dnp: bool = False
    exclude_from_bom: bool = False
    sheet: str = "/"
    line: int = 0
    pins: tuple[Pin, ...] = ()
    file: str = ""  # the file that holds it, when not the netlist's own (a schematic's sub-sheet)
    exclude_from_board: bool = False
    exclude_from_sim: bool = False

    def pin(self, number: str) -> Pin | None:
        for p in self.pins:
            if p.number == number:
                return p
        return None

    def field(self, name: str) -> str | None:
        """A user field by name, matched without regard to case."""
        wanted = name.casefold()
        for key, value in self.fields.items():
            if key.casefold() == wanted:
                return value
        return None


@dataclass(frozen=True, slots=True)
class Net:
    """A net: its name exactly as written (KiCad's {slash} escapes kept) and its pins."""

    code: str
    name: str
    netclass: str = ""
    pins: tuple[Pin, ...] = ()
    line: int = 0


@dataclass(frozen=True, slots=True)
class Sheet:
    """One sheet instance of the design hierarchy."""

    number: str
    name: str
    tstamps: str = ""


@dataclass(frozen=True, slots=True)
class Note:
    """Something the reader noticed and worked around (the file still read)."""

    line: int
    column: int
    message: str


@dataclass(frozen=True)
class Netlist:
    """A whole netlist file."""

    path: str
    version: str
    tool: str = ""
    source: str = ""
    date: str = ""
    sheets: tuple[Sheet, ...] = ()
    components: tuple[Component, ...] = ()
    nets: tuple[Net, ...] = ()
    notes: tuple[Note, ...] = ()
    _by_ref: Mapping[str, Component] = field(default_factory=_empty, init=False, repr=False, compare=False)
    _by_net: Mapping[str, Net] = field(default_factory=_empty, init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "_by_ref", FrozenMap({c.ref: c for c in self.components}))
        object.__setattr__(self, "_by_net", FrozenMap({n.name: n for n in self.nets}))

    def component(self, ref: str) -> Component | None:
        return self._by_ref.get(ref)

    def net(self, name: str) -> Net | None:
        return self._by_net.get(name)
