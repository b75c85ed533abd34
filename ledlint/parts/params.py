"""Electrical parameters of parts and rails, each with where it came from.

Precedence, most specific first: the configuration's [refs] table, a field on the part, the
configuration's [values] and [symbols] tables, the value text, the footprint, a built-in
default. Missing means missing: a parameter that cannot be found is a `Missing`, never a zero.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum
from typing import Callable

from ledlint.config import Config, plausible
from ledlint.parts.devices import PIN_LIMIT
from ledlint.parts.leds import (AMBIGUOUS_GREEN, INDICATOR_IF_MAX, INDICATOR_RTH, SPREAD, TECHNOLOGIES, TEST_CURRENT,
                              VR_MAX, Technology, colour_from_text, die_colour, is_indicator_footprint,
                              series_resistance)
from ledlint.netlist.model import Component
from ledlint.parts.kinds import LedId
from ledlint.parts.rails import RailKind, rail_from_net_name
from ledlint.quantities.ratings import rating_from_footprint
from ledlint.quantities.units import (Quantity, Unknown, parse_current, parse_power, parse_resistance, parse_temperature, quantity,
                           parse_thermal_resistance, parse_tolerance, parse_vf, parse_voltage)


class Origin(Enum):
    """Where a parameter's value came from."""

    CONFIG = "configuration"
    FIELD = "schematic field"
    VALUE = "value text"
    FOOTPRINT = "footprint"
    NET_NAME = "net name"
    DEFAULT = "built-in default"


@dataclass(frozen=True)
class Param:
    """A value in SI units (temperatures in °C) and its provenance."""

    value: float
    origin: Origin
    detail: str  # e.g. "field Vf = '2.1V@20mA' on D1" or "maximum of a red LED, built-in table"

    @property
    def assumed(self) -> bool:
        return self.origin in (Origin.DEFAULT, Origin.NET_NAME)

    def describe(self, unit: str = "") -> str:
        """'2.5 V: maximum of a red LED, built-in table' (units.quantity formats the value)."""
        shown = quantity(self.value, unit) if unit else f"{self.value:g}"
        return f"{shown}: {self.detail}"


@dataclass(frozen=True)
class Missing:
    """A parameter that could not be found, and what to add."""

    name: str
    reason: str
    fix: str
    fault: bool = False  # not a gap but a fault on the board (a 0 Ω sense resistor sets no current)


def known(p: Param | Missing) -> float:
    """The value of a parameter the caller has checked is there (LedParams.complete, say)."""
    assert isinstance(p, Param), p.reason
    return p.value


@dataclass(frozen=True)
class _Text:
    text: str
    origin: Origin
    detail: str


def _lookup(component: Component, config: Config, key: str) -> _Text | None:
    """A named parameter's text from configuration or fields, in precedence order."""
    if not component.fields and not (config.refs or config.values or config.symbols):
        return None  # the usual part: nothing said of it but its value and footprint
    settings = config.part_settings(component.ref, component.value, component.lib, component.part)
    ref_only = config.part_settings(component.ref, "\0", "\0", "\0")
    if key in ref_only:
        text, where = ref_only[key]
        return _Text(text, Origin.CONFIG, f"{where} {key} = {text!r}")
    field = component.field(key)
    if field is not None and field.strip():
        return _Text(field, Origin.FIELD, f"field {key} = {field!r} on {component.ref}")
    if key in settings:
        text, where = settings[key]
        return _Text(text, Origin.CONFIG, f"{where} {key} = {text!r}")
    return None


def _quantity(component: Component, config: Config, keys: tuple[str, ...],
              parse: Callable[[str], Quantity | None], bad: list[Missing] | None = None) -> Param | None:
    """The first of `keys` that is set, parsed; a value that is set but unreadable goes to `bad`."""
    for key in keys:
        found = _lookup(component, config, key)
        if found is not None:
            q = parse(found.text)
            if q is not None and not plausible(key, q.value):
                if bad is not None:
                    bad.append(Missing(key, f"{found.detail} is outside what a part of this kind can be",
                                       f"check {key}, e.g. {_EXAMPLES.get(key.split('_')[0], key)}"))
                return None
            if q is None:
                if bad is not None:
                    bad.append(Missing(key, f"{found.detail} cannot be read",
                                       f"write {key} with its unit, e.g. {_EXAMPLES.get(key.split('_')[0], key)}"))
                return None
            return Param(q.value, found.origin, found.detail)
    return None


_EXAMPLES = {"Vf": "Vf = 2.0V@20mA", "If": "If_max = 20mA", "Vr": "Vr_max = 5V", "Rth": "Rth = 400K/W",
             "Tolerance": "Tolerance = 1%", "Power": "Power = 0.25W", "pin": "pin_current_max = 20mA"}


# ---------------------------------------------------------------- resistors

@dataclass(frozen=True)
class ResistorParams:
    ref: str
    resistance: Param | Missing
    tolerance: Param
    power: Param | Missing  # rated dissipation at 70 °C
    upper_category_c: float  # where the IEC 60115-1 derating line reaches zero
    unreadable: tuple[Missing, ...] = ()  # fields that are set but cannot be read


# ±5 % (IEC 60062 letter J) is the tolerance of general-purpose resistors (common practice).
DEFAULT_TOLERANCE = 0.05
DEFAULT_UPPER_CATEGORY_C = 155.0  # thick and metal film (field-facts §4)


def resistor_params(component: Component, config: Config) -> ResistorParams:
    parsed = parse_resistance(component.value)
    if isinstance(parsed, Unknown):
        resistance: Param | Missing = Missing("resistance", f"{component.ref}: {parsed.reason}",
                                              f"give {component.ref} a value such as 330R or 4k7")
    elif not plausible("resistance", parsed.value):
        resistance = Missing("resistance", f"{component.ref}: value {component.value!r} is more than a resistor "
                             "can be (1 TΩ)", f"check {component.ref}'s value")
    else:
        resistance = Param(parsed.value, Origin.VALUE, f"value {component.value!r}")
    bad: list[Missing] = []
    tolerance = _quantity(component, config, ("Tolerance",), parse_tolerance, bad)
    if tolerance is None:
        q = parse_tolerance(component.value)
        tolerance = (Param(q.value, Origin.VALUE, f"value {component.value!r}") if q else
                     Param(DEFAULT_TOLERANCE, Origin.DEFAULT, "general-purpose resistor"))
    unread_power = len(bad)
    power: Param | Missing | None = _quantity(component, config, ("Power",), parse_power, bad)
    upper = DEFAULT_UPPER_CATEGORY_C
    if len(bad) > unread_power:
        power = bad.pop()  # set but unreadable: the rating is unknown, whatever the footprint says
    elif power is None:
        q = parse_power(component.value)
        rating = rating_from_footprint(component.footprint)
        if q:
            power = Param(q.value, Origin.VALUE, f"value {component.value!r}")
        elif rating:
            power = Param(rating.watts, Origin.FOOTPRINT, rating.basis)
            upper = rating.upper_category_c
    if rating := rating_from_footprint(component.footprint):
        upper = rating.upper_category_c
    return ResistorParams(component.ref, resistance, tolerance, power or Missing(
        "power rating", f"{component.ref}: no Power field and footprint {component.footprint!r} "
        "does not tell a rating", f"add a field Power (e.g. Power = 0.25W) to {component.ref}"), upper,
        tuple(bad))


# ---------------------------------------------------------------- LEDs

# Maximum junction temperature when the datasheet's is not given: LED ratings run from 110 °C
# (through-hole lamps) to 150 °C (ceramic power emitters) (field-facts §5b); 125 °C between.
TJ_MAX = 125.0

@dataclass(frozen=True)
class LedParams:
    """One die's parameters. `vf` is at `i_test`, 25 °C."""

    ref: str
    die: str
    technology: str  # "" when unknown
    vf: Param | Missing
    vf_min: Param | Missing
    vf_max: Param | Missing
    i_test: Param
    if_max: Param | Missing
    if_max_upper: float | None  # for an assumed rating: the top of the package class's range
    vr_max: Param
    rth: Param | None
    tj_max: Param  # °C, the most the junction may reach
    tc: Param
    n: float
    r_s: float
    ambiguity: str = ""  # why the technology, and so Vf, is uncertain
    unreadable: tuple[Missing, ...] = ()  # fields that are set but cannot be read
    curve: tuple[tuple[float, float], ...] = ()  # (A, V) datasheet points when Vf gives several

    @property
    def id(self) -> LedId:
        return LedId(self.ref, self.die)

    @property
    def blocking(self) -> tuple[Missing, ...]:
        """Unreadable fields without which the LED cannot be solved: its forward voltage."""
        return tuple(m for m in self.unreadable if m.name.lower().startswith("vf"))

    @property
    def complete(self) -> bool:
        return not self.blocking and not any(isinstance(p, Missing) for p in (self.vf, self.vf_min, self.vf_max))


def _die_key(key: str, die: str) -> tuple[str, ...]:
    return (f"{key}_{die}", key) if die else (key,)


def _technology(component: Component, config: Config, die: str) -> tuple[str | None, str, bool]:
    """The LED's technology, where it was read, and whether a colour field or key set it."""
    found = None
    for key in _die_key("colour", die):
        found = _lookup(component, config, key)
        if found:
            break
    if found:
        return colour_from_text(found.text), found.detail, True
    if die:
        colour = die_colour(die)
        if colour:
            return colour, f"die {die} of {component.ref}", False
    text = " ".join([component.value, component.part, component.description,
                     *(v for k, v in component.fields.items() if k.casefold() == "description")])
    return colour_from_text(text), f"colour from {component.ref}'s value or description", False


def led_params(component: Component, config: Config, die: str = "") -> LedParams:
    colour, colour_where, colour_set = _technology(component, config, die)
    tech: Technology | None = TECHNOLOGIES.get(colour or "")
    ambiguity = ""
    if colour == AMBIGUOUS_GREEN:
        ambiguity = ("green may be GaP (about 2.2 V) or InGaN (about 3.2 V); "
                     "add a Vf field or say which in the value")
    elif colour is None and not colour_set:
        ambiguity = "the colour is not stated in the value, part, description or fields"
    elif colour is None:  # a colour someone set must name one: say so rather than "not stated"
        ambiguity = (f"{colour_where} names no colour ledlint knows ({', '.join(sorted(TECHNOLOGIES))}, "
                     "or a wavelength such as 630nm)")

    i_test = Param(TEST_CURRENT, Origin.DEFAULT, "20 mA, the usual datasheet test current")
    vf: Param | Missing
    vf_field = None
    for key in _die_key("Vf", die):
        vf_field = _lookup(component, config, key)
        if vf_field:
            break
    bad: list[Missing] = []
    curve: tuple[tuple[float, float], ...] = ()
    points = [parse_vf(t) for t in vf_field.text.split(";")] if vf_field and ";" in vf_field.text else []
    if points:
        # Several points, "2.9V@5mA; 3.1V@20mA; 3.4V@60mA": the first is the typical Vf at its
        # test current, and all of them shape the diode model (fitted where it is built).
        if all(pt and pt[1] is not None for pt in points) and len({pt[1].value for pt in points if pt and pt[1]}) \
                == len(points):
            curve = tuple((pt[1].value, pt[0].value) for pt in points if pt and pt[1])
        else:
            bad.append(Missing("Vf", f"{vf_field.detail} cannot be read as points",  # type: ignore[union-attr]
                               "write each point with its current, at different currents: "
                               "Vf = 2.9V@5mA; 3.1V@20mA; 3.4V@60mA"))
    parsed_vf = (points[0] if curve else None) if points else (parse_vf(vf_field.text) if vf_field else None)
    if vf_field and parsed_vf and not (plausible("Vf", parsed_vf[0].value) and
                          (parsed_vf[1] is None or plausible("If", parsed_vf[1].value))):
        bad.append(Missing("Vf", f"{vf_field.detail} is outside what an LED can be", "check Vf, e.g. Vf = 2.0V@20mA"))
        parsed_vf = None
    elif vf_field and not parsed_vf and not points:
        bad.append(Missing("Vf", f"{vf_field.detail} cannot be read", "write it like Vf = 2.0V@20mA"))
    if vf_field and (parsed := parsed_vf):
        vq, iq = parsed
        vf = Param(vq.value, vf_field.origin, vf_field.detail)
        if iq is not None:
            i_test = Param(iq.value, vf_field.origin, vf_field.detail)
    elif (vf_lo := _quantity(component, config, _die_key("Vf_min", die), parse_voltage)) and \
            (vf_hi := _quantity(component, config, _die_key("Vf_max", die), parse_voltage)) and \
            vf_lo.value <= vf_hi.value:
        # Only the bounds given: the datasheet's own range beats a colour's table value.
        vf = Param((vf_lo.value + vf_hi.value) / 2, vf_lo.origin, f"midway between {vf_lo.detail} and {vf_hi.detail}")
    elif tech:
        vf = Param(tech.vf_typ, Origin.DEFAULT, f"typical {tech.name} LED, built-in table ({colour_where})")
    else:
        vf = Missing("Vf", ambiguity or "no Vf", "add a field Vf (e.g. Vf = 2.0V@20mA) to each, or name the "
                     "colour in the value (red, yellow, green GaP or InGaN, blue, white, ...)")

    def bound(key: str, table_value: float | None, sign: int) -> Param | Missing:
        p = _quantity(component, config, _die_key(key, die), parse_voltage, bad)
        if p:
            return p
        if isinstance(vf, Param) and (vf.origin is not Origin.DEFAULT or table_value is None):
            return Param(vf.value * (1 + sign * SPREAD), Origin.DEFAULT, f"typical {'+' if sign > 0 else '−'}10 %")
        if isinstance(vf, Param) and table_value is not None and tech is not None:
            return Param(table_value, Origin.DEFAULT, f"maximum of a {tech.name} LED, built-in table")
        return Missing(key, vf.reason if isinstance(vf, Missing) else key, f"add a field {key} to {component.ref}")

    vf_max = bound("Vf_max", tech.vf_max if tech else None, +1)
    vf_min = bound("Vf_min", None, -1)

    unread = len(bad)
    if_max: Param | Missing | None = _quantity(component, config, _die_key("If_max", die), parse_current, bad)
    if_upper = None
    if len(bad) > unread:
        if_max = bad.pop()  # set but unreadable: the rating is unknown, not the package's default
    elif if_max is None:
        if is_indicator_footprint(component.footprint):
            lo, if_upper = INDICATOR_IF_MAX
            if_max = Param(lo, Origin.DEFAULT, "small indicator LEDs are commonly rated 20-30 mA")
        else:
            if_max = Missing("If_max", f"no If_max field, and footprint {component.footprint!r} is not a small "
                             "indicator package",
                             "add a field If_max (e.g. If_max = 350mA) from the LED's datasheet")
    vr_max = _quantity(component, config, _die_key("Vr_max", die), parse_voltage, bad)
    vr_max = vr_max or Param(VR_MAX, Origin.DEFAULT, "the usual LED reverse-voltage rating")
    rth = _quantity(component, config, _die_key("Rth", die), parse_thermal_resistance, bad)
    if rth is None and is_indicator_footprint(component.footprint):
        rth = Param(INDICATOR_RTH, Origin.DEFAULT, "typical of a small indicator package")
    tj_max = _quantity(component, config, _die_key("Tj_max", die), parse_temperature, bad) or \
        Param(TJ_MAX, Origin.DEFAULT, "a common LED junction rating (110-150 °C)")
    tc = Param(tech.tc if tech else -0.002, Origin.DEFAULT, f"{tech.name if tech else 'general'} LED")
    if isinstance(if_max, Param) and i_test.origin is Origin.DEFAULT and if_max.value < i_test.value:
        # A low-current LED (rated 2 mA, say) is specified at or below its rating, not at 20 mA.
        i_test = Param(if_max.value, Origin.DEFAULT, "its If_max: a low-current LED's Vf is stated there")
    rating = max(if_max.value, i_test.value) if isinstance(if_max, Param) else i_test.value * 1.5
    return LedParams(
        ref=component.ref, die=die, technology=tech.name if tech else (colour or ""), vf=vf, vf_min=vf_min,
        vf_max=vf_max, i_test=i_test, if_max=if_max, if_max_upper=if_upper, vr_max=vr_max, rth=rth, tj_max=tj_max,
        tc=tc,
        n=tech.n if tech else 2.0, r_s=series_resistance(rating),
        ambiguity=ambiguity if not isinstance(vf, Param) or vf.origin is Origin.DEFAULT else "",
        unreadable=tuple(bad), curve=curve,
    )


# ---------------------------------------------------------------- rails and pins

@dataclass(frozen=True)
class RailParams:
    net: str
    nominal: float
    minimum: float
    maximum: float
    origin: Origin
    detail: str
    ground: bool = False
    ac: bool = False  # the voltages are RMS of an alternating supply


def rail_params(net: str, config: Config) -> RailParams | None:
    """The voltage of a net from configuration or its name; None when neither tells."""
    short = net.rstrip("/").rsplit("/", 1)[-1] if "/" in net.strip("/") or net.startswith("/") else net
    for key in (net, short):
        if key in config.rails:
            r = config.rails[key]
            return RailParams(net, r.nominal, r.minimum, r.maximum, Origin.CONFIG,
                              f"{config.path or 'ledlint.toml'} [rails.{key!r}]", ground=r.nominal == 0)
    rail = rail_from_net_name(net)
    if rail is None:
        return None
    return RailParams(net, rail.nominal, rail.minimum, rail.maximum, Origin.NET_NAME, rail.source,
                      ground=rail.kind is RailKind.GROUND, ac=rail.kind is RailKind.AC)


def pin_limit(component: Component, config: Config) -> Param:
    p = _quantity(component, config, ("pin_current_max",), parse_current)
    return p or Param(PIN_LIMIT, Origin.DEFAULT, "a typical GPIO pin rating")
