"""Supply rails, grounds and mains nets recognised from net names."""

from __future__ import annotations

import re
from dataclasses import dataclass
from enum import Enum
from functools import lru_cache

from ledlint.quantities.units import parse_voltage


class RailKind(Enum):
    """What a rail carries."""

    DC = "dc"
    GROUND = "ground"
    AC = "ac"


@dataclass(frozen=True)
class Rail:
    """A rail's voltage (RMS for AC) with its range and where the numbers come from.

    Minimum and maximum are numeric bounds: for a negative rail the minimum is the most negative.
    """

    kind: RailKind
    nominal: float
    minimum: float
    maximum: float
    source: str


# A rail named only by its voltage is taken to hold it within ±5 % (common practice).
DEFAULT_TOLERANCE = 0.05
# USB VBUS as a device sees it: 4.40 V is the least a low-power USB 2.0 device must work from,
# 5.50 V the upper limit USB Type-C allows.  The name does not tell the connector, so the
# widest envelope is taken; a ballast sized for 5.25 V would run hotter at 5.5 V.
USB_MINIMUM = 4.40
USB_NOMINAL = 5.0
USB_MAXIMUM = 5.50

_GROUND = re.compile(r"(?:[ADPSC]?GND(?:[ADPS]|PWR|REF|ISO)?[0-9]*|VSS[AD]?[0-9]*|0V|EARTH)", re.IGNORECASE)
# Net names KiCad makes up for unnamed nets.
_GENERATED = re.compile(r"(?:Net|unconnected)-\(", re.IGNORECASE)
# A voltage written into a name: "5V", "+3V3", "3.3V", "12V0", "-12V", with a kind suffix.
# A leading P is the positive-rail spelling some schematics use ("P3V3", "P5V0", "P12V").
_VOLTAGE_WORD = re.compile(
    r"(?:P(?=[0-9]))?(?P<volts>[+\-]?[0-9]+(?:V[0-9]+|\.[0-9]+V|V))(?P<suffix>A|D|SB|DC|AC|~)?", re.IGNORECASE
)
_AC_PREFIX = re.compile(r"~\s*")
_GLUED_SUPPLY = re.compile(r"(V[A-Z]+)([0-9]+(?:V[0-9]*|\.[0-9]+V))")  # "VCC3V3": a supply word and its voltage
_MAX_RAIL = 100_000.0  # V: beyond any board's supply (config rails are held to ±10 kV)
_VBUS_WORDS = frozenset({"VBUS", "VUSB"})
_USB_WORDS = _VBUS_WORDS | {"USB"}
# Supply names that carry no voltage.  VREF is left out: a reference is not for loads.
_SUPPLY_WORDS = frozenset(
    {
        "VCC", "VDD", "VIN", "VBAT", "VBATT", "V+", "V", "VPP", "VMOT", "VLED", "VSYS", "VAA", "VM",
        "VS", "VDDIO", "VCCIO", "VDDA", "VCCA", "VDDD", "VCORE", "VPWR", "VSUP", "VSUPPLY", "VBB",
        "VEXT", "VMAIN", "VAUX", "VOUT", "VBUS", "VUSB",
    }
)  # fmt: skip
# Words that may stand beside a supply word or a voltage and still name the rail itself.
# Any other word (EN, PG, SENSE, FB, ON, ...) makes the net a signal about the rail.
_QUALIFIERS = frozenset(
    {
        "USB", "LED", "LEDS", "A", "D", "IO", "AUX", "SYS", "MAIN", "BUS", "IN", "OUT", "REG",
        "ANA", "DIG", "ISO", "SB", "STBY", "SW", "CORE", "PWR", "DC", "RAIL", "SUPPLY", "MCU",
        "LOGIC", "FAN", "MOTOR", "FUSED", "EXT", "BAT", "BATT",
    }
)  # fmt: skip
# Words that mean mains wherever they stand ("MAINS_L", "LIVE_SENSE"), and conductor names that
# do when the whole name is made of them ("L", "N_IN", "AC_L", "L1" of three phases; but "LINE_IN"
# is the audio input).
_MAINS_ANYWHERE = frozenset({"MAINS", "LIVE", "NEUTRAL", "PHASE"})
_CONDUCTORS = frozenset({"L", "N", "L1", "L2", "L3", "LINE"})
_CONDUCTOR_QUALIFIERS = frozenset({"AC", "IN", "OUT"})
# Nominal line voltages of public mains (100 V to 277 V); lower AC is a transformer secondary.
_MAINS_RANGE = (100.0, 277.0)


def _last_segment(name: str) -> str:
    """The net's own name without its sheet path ("/power/+5V" gives "+5V")."""
    return name.strip().rstrip("/").rpartition("/")[2]


def _words(name: str) -> list[str]:
    """The name's words; a supply word glued to its voltage ("VCC3V3", "VDD5V") counts as two."""
    out: list[str] = []
    for word in name.upper().split("_"):
        m = _GLUED_SUPPLY.fullmatch(word)
        out += [m.group(1), m.group(2)] if m and m.group(1) in _SUPPLY_WORDS else [word] if word else []
    return out



@lru_cache(maxsize=16384)  # a board asks about the same few nets for every circuit on them
def rail_from_net_name(name: str) -> Rail | None:
    """Return the rail a net name states ("+3V3", "GND", "24VAC", "VBUS"), or None.

    A name that carries a voltage next to a signal word ("LED_12V_EN", "3V3_FB") is a signal,
    not a rail; so is anything unsure, since a false rail gives false alarms.
    """
    own = _last_segment(name)
    if not own or _GENERATED.match(own):
        return None
    if _GROUND.fullmatch(own):
        return Rail(RailKind.GROUND, 0.0, 0.0, 0.0, f"net name '{own}': ground")
    ac_prefixed = _AC_PREFIX.match(own)
    words = _words(own[ac_prefixed.end() :] if ac_prefixed else own)
    voltages = [match for word in words if (match := _VOLTAGE_WORD.fullmatch(word))]
    others = [word for word in words if not _VOLTAGE_WORD.fullmatch(word) and word != "AC"]
    if len(voltages) > 1 or not all(word in _QUALIFIERS or word in _SUPPLY_WORDS for word in others):
        return None
    is_ac = ac_prefixed is not None or "AC" in words
    if not voltages:
        # A bare "USB" may be a data bus; only the VBUS words name the supply without a voltage.
        return _usb_rail(own) if not is_ac and any(word in _VBUS_WORDS for word in others) else None
    suffix = (voltages[0].group("suffix") or "").upper()
    is_ac = is_ac or suffix in ("AC", "~")
    volts = parse_voltage(voltages[0].group("volts"))
    if volts is None or abs(volts.value) > _MAX_RAIL:
        return None  # "+99999999999999999999V" is a typing mistake, not a rail
    if volts.value == 0 and not is_ac:
        return Rail(RailKind.GROUND, 0.0, 0.0, 0.0, f"net name '{own}': 0 V, ground")
    if not is_ac and volts.value == USB_NOMINAL and any(word in _USB_WORDS for word in others):
        return _usb_rail(own)
    if is_ac and volts.value <= 0:
        return None
    kind = RailKind.AC if is_ac else RailKind.DC
    low, high = sorted((volts.value * (1 - DEFAULT_TOLERANCE), volts.value * (1 + DEFAULT_TOLERANCE)))
    what = "RMS, " if is_ac else ""
    return Rail(kind, volts.value, low, high, f"net name '{own}': {what}±5 % default")


def _usb_rail(own: str) -> Rail:
    return Rail(
        RailKind.DC,
        USB_NOMINAL,
        USB_MINIMUM,
        USB_MAXIMUM,
        f"net name '{own}': USB VBUS, 4.40 V (least a USB 2.0 device must run from) "
        "to 5.50 V (USB Type-C upper limit)",
    )


def is_supply_name(name: str) -> bool:
    """True when a name looks like a supply of unknown voltage ("VCC", "VBAT", "+VIN", "V+")."""
    own = _last_segment(name).lstrip("+")
    words = _words(own)
    if not words or rail_from_net_name(name) is not None:
        return False
    return any(word in _SUPPLY_WORDS for word in words) and all(
        word in _SUPPLY_WORDS or word in _QUALIFIERS for word in words
    )


def is_mains_name(name: str) -> bool:
    """True when a net name marks an AC line conductor ("L", "N", "MAINS", "230VAC").

    "AC1"/"AC2" are not counted: bridge inputs carry those names at any voltage.
    """
    own = _last_segment(name)
    if _GENERATED.match(own):
        return False
    words = [w for w in re.split(r"[_\-\s]+", own.upper()) if w]
    if _MAINS_ANYWHERE & set(words):
        return True
    if words and set(words) <= _CONDUCTORS | _CONDUCTOR_QUALIFIERS and _CONDUCTORS & set(words) \
            and set(words) != {"LINE", "IN"}:
        return True
    # A mains voltage written as AC anywhere in the name: "230VAC_L", "120VAC_HOT".
    for i, word in enumerate(words):
        m = _VOLTAGE_WORD.fullmatch(word)
        ac = m is not None and ((m.group("suffix") or "").upper() in ("AC", "~") or "AC" in words[i + 1:i + 2])
        volts = parse_voltage(m.group("volts")) if m and ac else None
        if volts is not None and _MAINS_RANGE[0] <= abs(volts.value) <= _MAINS_RANGE[1]:
            return True
    rail = rail_from_net_name(name)
    return (
        rail is not None and rail.kind is RailKind.AC and _MAINS_RANGE[0] <= rail.nominal <= _MAINS_RANGE[1]
    )
