"""Part classification: what each component is electrically, and the dies of an LED package.

Goes by pin names first (they are what KiCad's stock symbols and most user libraries share,
kicad-netlist-format.md §3.5), then by the trade's words in part, value and description.
Maker part numbers are never matched.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from enum import Enum
from typing import Callable, Iterable, NamedTuple, TypeVar

from ledlint.netlist.model import Component, Pin, natural


class Kind(Enum):
    """What a component is, as far as LED circuits care."""

    LED = "led"  # one or more light-emitting dies with exposed anode/cathode pins
    LED_ADDRESSABLE = "led-addressable"  # an LED with a built-in controller (data in/out)
    REGULATOR = "current-regulator"  # a two-terminal constant-current part
    RESISTOR = "resistor"
    CAPACITOR = "capacitor"
    INDUCTOR = "inductor"
    DIODE = "diode"
    ZENER = "zener"
    BRIDGE = "bridge-rectifier"
    NPN = "npn"
    PNP = "pnp"
    NMOS = "nmos"
    PMOS = "pmos"
    IC = "ic"
    CONNECTOR = "connector"
    OTHER = "other"


@dataclass(frozen=True, slots=True)
class Die:
    """One light-emitting junction: its anode and cathode pins (numbers) and a name."""

    name: str  # "" for a single-die LED, else e.g. "R", "G", "1"
    anode: str
    cathode: str


class LedId(NamedTuple):
    """One light-emitting die: its part and the die's name in the package ("" for a one-die LED).
    Shown as "D4" or "D4:R"; a reference may hold any character, so the two are never split
    back out of the text. (A named tuple: compared and hashed at C speed, as the recogniser
    does for every string of a large board.)"""

    ref: str
    die: str = ""

    def __str__(self) -> str:
        return f"{self.ref}:{self.die}" if self.die else self.ref

    def __format__(self, spec: str) -> str:
        return format(str(self), spec)

    @property
    def order(self) -> tuple[int | str, ...]:
        """Natural order of the text shown: D2 before D10, D1:B before D1:G."""
        return natural(str(self))


# Two-terminal current regulators, whatever their symbol looks like (common practice names).
REGULATOR_WORDS = re.compile(r"constant[ -]current|current[ -]regulat|current[ -]limiting diode|\bCCR\b|\bCRD\b",
                             re.I)
_WORD_LED = re.compile(r"(?<![a-z])led(?![a-z])|light[ -]emitting", re.I)
_ADDRESSABLE_WORDS = re.compile(r"addressable|pixel|rgb|led|integrated controller", re.I)
_COLOUR_TERMINAL = re.compile(r"^(R|G|B|W|Y|O|IR|UV|WW|CW)(A|K)$")
_NUMBERED_TERMINAL = re.compile(r"^(A|K)(\d)$")
_MARKUP = re.compile(r"[~{}!]")
_DATA_IN = {"DIN", "DI", "SDI", "IN", "DATAIN", "DATA_IN"}
_DATA_OUT = {"DOUT", "DO", "SDO", "OUT", "DATAOUT", "DATA_OUT"}
_SUPPLY = {"VDD", "VCC", "V+", "VLED", "5V"}
_GROUND = {"VSS", "GND", "V-"}
_CLOCK = {"CI", "CO", "CKI", "CKO", "CIN", "COUT", "CLKI", "CLKO", "BIN", "BOUT", "NC", ""}
_EXPOSED_PAD = {"PAD", "EP", "TAB"}


def _pin_name(pin: Pin) -> str:
    return _MARKUP.sub("", pin.name).upper()


def _text(component: Component) -> str:
    extra = " ".join(v for k, v in component.fields.items() if k.casefold() in ("description", "keywords"))
    keywords = component.properties.get("ki_keywords", "")
    return " ".join((component.part, component.value, component.description, extra, keywords))


# Two-pin LED symbols in house libraries name their ends in words or signs (common practice).
_TWO_PIN_ALIASES = {"ANODE": "A", "CATHODE": "K", "+": "A", "-": "K"}


def led_dies(component: Component) -> tuple[Die, ...]:
    """The dies of an LED package from its pin names; () when the pins do not read as an LED."""
    return _remembered(_DIES, component, _led_dies)


def _led_dies(component: Component) -> tuple[Die, ...]:
    names = {_pin_name(p): p.number for p in component.pins}
    named = {n: num for n, num in names.items() if n and n not in _EXPOSED_PAD}
    if len(named) == 2:  # house-library spellings of the two ends
        spelled = {_TWO_PIN_ALIASES.get(n, n): num for n, num in named.items()}
        if set(spelled) in ({"A", "K"}, {"A", "C"}):
            named = {"A": spelled["A"], "K": spelled.get("K", spelled.get("C", ""))}
    if set(named) == {"A", "K"}:
        return (Die("", named["A"], named["K"]),)
    if set(named) <= {"1", "2"} and len(component.pins) == 2 and _WORD_LED.search(_text(component)):
        # Unnamed two-pin LED symbols: KiCad's stock LED numbering, 1 = K, 2 = A (§3.5).
        return (Die("", "2", "1"),)
    if set(named) == {"KA", "AK"}:  # two dies back to back between two pins
        return (Die("1", named["AK"], named["KA"]), Die("2", named["KA"], named["AK"]))
    common_a, common_k = named.get("A"), named.get("K")
    anodes: dict[str, str] = {}
    cathodes: dict[str, str] = {}
    for name, number in named.items():
        if name in ("A", "K"):
            continue
        m = _COLOUR_TERMINAL.match(name) or _NUMBERED_TERMINAL.match(name)
        if not m:
            return ()
        colour, end = (m.group(1), m.group(2)) if _COLOUR_TERMINAL.match(name) else (m.group(2), m.group(1))
        (anodes if end == "A" else cathodes)[colour] = number
    dies = []
    for colour in sorted(set(anodes) | set(cathodes)):
        anode = anodes.get(colour, common_a)
        cathode = cathodes.get(colour, common_k)
        if anode is None or cathode is None:
            return ()
        dies.append(Die(colour, anode, cathode))
    return tuple(dies)


def is_addressable(component: Component) -> bool:
    """Data in, data out and a supply pair on a small package: an LED with its own controller."""
    names = {_pin_name(p) for p in component.pins}
    if not (names & _DATA_IN and names & _DATA_OUT and names & _SUPPLY and names & _GROUND):
        return False
    if not names <= _DATA_IN | _DATA_OUT | _SUPPLY | _GROUND | _CLOCK | _EXPOSED_PAD:
        return False
    return len(component.pins) == 4 or bool(_ADDRESSABLE_WORDS.search(_text(component)))


# The JEDEC TO-236 (SOT-23) pinout most three-pin transistors use: 1 base/gate,
# 2 emitter/source, 3 collector/drain (common practice; KiCad's Q_NPN_BEC and Q_NMOS_GSD agree).
SOT23_ROLES = {"B": "1", "E": "2", "C": "3", "G": "1", "S": "2", "D": "3"}
_TRANSISTOR_WORDS = (
    (re.compile(r"(?<![a-z])npn(?![a-z])", re.I), "npn"),
    (re.compile(r"(?<![a-z])pnp(?![a-z])", re.I), "pnp"),
    (re.compile(r"n[- ]?channel|n[- ]?mos|nfet|n-fet", re.I), "nmos"),
    (re.compile(r"p[- ]?channel|p[- ]?mos|pfet|p-fet", re.I), "pmos"),
)


def transistor_pins(component: Component) -> tuple[dict[str, str], str]:
    """Role (B/C/E or G/D/S) → pin number, and the assumption made, if any."""
    by_name = {_pin_name(p): p.number for p in component.pins}
    if {"B", "C", "E"} <= set(by_name) or {"G", "D", "S"} <= set(by_name):
        return {r: by_name[r] for r in "BCEGDS" if r in by_name}, ""
    numbers = {p.number for p in component.pins}
    if numbers == {"1", "2", "3"}:
        return dict(SOT23_ROLES), "pins unnamed; SOT-23 order assumed (1 base/gate, 2 emitter/source, 3 collector/drain)"
    return {}, ""


def _transistor_kind(component: Component, text: str) -> Kind | None:
    roles, _ = transistor_pins(component)
    if not roles:
        return None
    named = {_pin_name(p) for p in component.pins}
    words = [kind for pattern, kind in _TRANSISTOR_WORDS if pattern.search(text)]
    if {"B", "C", "E"} <= named:
        return Kind.PNP if "pnp" in words else Kind.NPN
    if {"G", "D", "S"} <= named:
        return Kind.PMOS if "pmos" in words else Kind.NMOS
    return {"npn": Kind.NPN, "pnp": Kind.PNP, "nmos": Kind.NMOS, "pmos": Kind.PMOS}.get(words[0]) if len(words) == 1 \
        else None


# Kinds and LED dies already worked out, by component identity (see _remembered).
_KINDS: dict[int, tuple[Component, Kind]] = {}
_DIES: dict[int, tuple[Component, tuple[Die, ...]]] = {}
_DESCRIBED: dict[tuple[object, ...], Kind] = {}
_KINDS_MAX = 250_000


def led_parts(components: Iterable[Component]) -> int:
    """How many LED parts (plain or addressable) there are: a package, however many dies it holds."""
    return sum(classify(c) in (Kind.LED, Kind.LED_ADDRESSABLE) for c in components)


def classify(component: Component) -> Kind:
    """The component's kind (see Kind)."""
    return _remembered(_KINDS, component, _by_description)


def _by_description(component: Component) -> Kind:
    """A kind is a matter of the part's words, reference letters and pins: a board's hundreds of
    identical resistors are classified once."""
    key = (re.sub(r"[^A-Za-z].*", "", component.ref), component.lib, component.part, _text(component),
           tuple((p.name, p.number) for p in component.pins))
    kind = _DESCRIBED.get(key)
    if kind is None:
        if len(_DESCRIBED) >= _KINDS_MAX:
            _DESCRIBED.clear()
        kind = _DESCRIBED[key] = _classify(component)
    return kind


_T = TypeVar("_T")


def _remembered(store: dict[int, tuple[Component, _T]], component: Component,
                work_out: Callable[[Component], _T]) -> _T:
    """What `work_out` says of a component, worked out once: every stage asks, and the answer never
    changes. Keyed by identity, the entry keeping the component so that its id is never reused."""
    hit = store.get(id(component))
    if hit is not None and hit[0] is component:
        return hit[1]
    if len(store) >= _KINDS_MAX:
        store.clear()
    found = work_out(component)
    store[id(component)] = (component, found)
    return found


def _classify(component: Component) -> Kind:
    text = _text(component)
    lower = text.lower()
    prefix = re.sub(r"[^A-Za-z].*", "", component.ref).upper()  # the letters before the number
    if is_addressable(component):
        return Kind.LED_ADDRESSABLE
    if len(component.pins) == 2 and REGULATOR_WORDS.search(text):
        return Kind.REGULATOR
    if _WORD_LED.search(text) and (led_dies(component) or prefix in ("D", "LED") and len(component.pins) <= 2):
        return Kind.LED  # with no dies to find: pins missing from the netlist (the recogniser says so)
    names = {_pin_name(p) for p in component.pins}
    transistor = _transistor_kind(component, text)
    if transistor is not None:
        return transistor
    if "bridge" in lower or {"+", "-"} <= names and len(component.pins) == 4:
        return Kind.BRIDGE
    if names >= {"A", "K"} and len(component.pins) <= 3:
        return Kind.ZENER if "zener" in lower else Kind.DIODE
    two_pin = len(component.pins) == 2
    if prefix == "R" and two_pin or re.fullmatch(r"r(_small|_us)?", component.part.lower()):
        return Kind.RESISTOR
    if prefix == "C" and two_pin:
        return Kind.CAPACITOR
    if prefix in ("L", "FB") and two_pin:
        return Kind.INDUCTOR
    if prefix in ("J", "P", "CN", "CON", "X") or component.lib.lower().startswith("conn"):
        return Kind.CONNECTOR
    if prefix in ("U", "IC"):
        return Kind.IC
    return Kind.OTHER
