"""Configuration: `ledlint.toml`, `[tool.ledlint]` in pyproject.toml, or --config; strictly checked.

Every table and key is known here except the options inside `[rules.<id>]`, which the rule
registry checks against each rule's declared options. An unknown key or a malformed value is
a ConfigError that names the key and suggests the nearest valid one.
"""

from __future__ import annotations

import difflib
import re
import tomllib
from dataclasses import dataclass, field
from pathlib import Path
from ledlint.frozen import FrozenMap
from typing import Any, Mapping

from ledlint.errors import ConfigError, read_utf8
from ledlint.quantities.units import (Quantity, parse_current, parse_power, parse_temperature, parse_thermal_resistance,
                           parse_tolerance, parse_vf, parse_voltage)

CONFIG_NAME = "ledlint.toml"

# Part parameters, by the names a schematic field carries too (matched without case).
LED_KEYS = ("Vf", "Vf_min", "Vf_max", "If_max", "Vr_max", "Rth", "Tj_max", "colour")
RESISTOR_KEYS = ("Tolerance", "Power")
PIN_KEYS = ("pin_current_max",)
DRIVER_KEYS = ("driver", "sense_pins", "vref", "vref_tolerance", "current", "current_tolerance",
               "current_max", "dropout", "vin_min", "vin_max", "vout_max")
PART_KEYS = LED_KEYS + RESISTOR_KEYS + PIN_KEYS + DRIVER_KEYS
DRIVER_KINDS = ("linear", "buck", "boost", "two-terminal")
# What each key's text must read as (units.py grammar); checked when the file is loaded.
_VOLTAGE = ("Vf_min", "Vf_max", "Vr_max", "vref", "dropout", "vin_min", "vin_max", "vout_max")
_CURRENT = ("If_max", "current", "current_max", "pin_current_max")
_TOLERANCE = ("Tolerance", "vref_tolerance", "current_tolerance")
_DIE_KEY = re.compile(r"^(Vf|Vf_min|Vf_max|If_max|Vr_max|Rth|Tj_max|colour)_([A-Za-z0-9]{1,2})$")
WAIVER_FIELD = "ledlint_waive"  # a schematic field: "rule-id[, rule-id]: reason"
SEVERITIES = ("error", "warning", "info", "off")

_TOP_KEYS = ("ambient", "rails", "refs", "values", "symbols", "rules", "waivers")
_RAIL_KEYS = ("nominal", "min", "max", "tolerance")
_AMBIENT_KEYS = ("min", "max")
_WAIVER_KEYS = ("rule", "ref", "fingerprint", "reason")


@dataclass(frozen=True)
class RailSetting:
    """A rail's voltage as configured (volts)."""

    nominal: float
    minimum: float
    maximum: float


@dataclass(frozen=True)
class Waiver:
    """Silences one rule on one component (or one exact finding, by fingerprint)."""

    rule: str
    reason: str
    ref: str = ""
    fingerprint: str = ""
    origin: str = ""  # where it was written: a config file, or "field ledlint_waive on R3"
    in_source: bool = False  # written on a part in the design itself


def _empty() -> Mapping[str, Any]:
    return FrozenMap({})


@dataclass(frozen=True)
class Config:
    """Everything a configuration file can say; the defaults when there is none."""

    path: str = ""
    ambient_min_c: float = 0.0  # a heated, indoor product (common practice)
    ambient_max_c: float = 40.0
    ambient_set: bool = False  # whether a file gave [ambient]
    rails: Mapping[str, RailSetting] = field(default_factory=_empty)
    refs: Mapping[str, Mapping[str, str]] = field(default_factory=_empty)
    values: Mapping[str, Mapping[str, str]] = field(default_factory=_empty)
    symbols: Mapping[str, Mapping[str, str]] = field(default_factory=_empty)
    rules: Mapping[str, Mapping[str, Any]] = field(default_factory=_empty)  # checked by the registry
    waivers: tuple[Waiver, ...] = ()
    positions: Mapping[tuple[str, ...], tuple[int, int]] = field(default_factory=lambda: FrozenMap({}))

    def error(self, message: str) -> ConfigError:
        """An error about this configuration, at the line and column of the table or key the
        message names ("[rules.x] margin: …")."""
        return ConfigError(message, self.path, *locate(self.positions, message))

    def part_settings(self, ref: str, value: str, lib: str, part: str) -> dict[str, tuple[str, str]]:
        """Configured parameters for one component: key → (text, where it was set).

        A reference beats a value, a value beats a symbol name.
        """
        out: dict[str, tuple[str, str]] = {}
        if not (self.symbols or self.values or self.refs):
            return out
        for table, key, label in ((self.symbols, f"{lib}:{part}", "symbols"), (self.symbols, part, "symbols"),
                                  (self.values, value, "values"), (self.refs, ref, "refs")):
            for k, v in table.get(key, {}).items():
                out[k] = (v, f"{self.path or CONFIG_NAME} [{label}.{key!r}]")
        return out


def suggest(word: str, choices: tuple[str, ...] | list[str]) -> str:
    near = difflib.get_close_matches(word, list(choices), n=1, cutoff=0.7)
    return f"; did you mean {near[0]!r}?" if near else f"; valid: {', '.join(choices)}"


def _check_keys(table: Mapping[str, Any], valid: tuple[str, ...], where: str, path: str) -> None:
    lookup = {k.casefold(): k for k in valid}
    for key in table:
        if key.casefold() not in lookup:
            raise ConfigError(f"{where}: unknown key {key!r}{suggest(key, valid)}", path)


def _table(value: Any, where: str, path: str) -> Mapping[str, Any]:
    if not isinstance(value, dict):
        raise ConfigError(f"{where} must be a table, not {type(value).__name__}", path)
    return value


# Beyond these no LED board lives; a value outside them is a typing mistake, and numbers near the
# floating-point limits would only make the solver's arithmetic overflow.
MAX_RAIL_V = 10_000.0
AMBIENT_C = (-60.0, 150.0)


def _volts(value: Any, where: str, path: str) -> float:
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        v = float(value)
    else:
        q = parse_voltage(str(value)) if isinstance(value, str) else None
        if q is None:
            raise ConfigError(f"{where}: {value!r} is not a voltage (write 5.0 or \"5V\")", path)
        v = q.value
    if not abs(v) <= MAX_RAIL_V:
        raise ConfigError(f"{where}: {v:g} V is outside ±{MAX_RAIL_V:g} V", path)
    return v


def _rail(name: str, raw: Any, path: str) -> RailSetting:
    where = f"[rails.{name!r}]"
    if not isinstance(raw, dict):
        v = _volts(raw, where, path)
        raw = {"nominal": v}
    _check_keys(raw, _RAIL_KEYS, where, path)
    if "nominal" not in raw:
        raise ConfigError(f"{where}: 'nominal' is required", path)
    nominal = _volts(raw["nominal"], where + " nominal", path)
    tol = 0.05  # ±5 % when only a nominal is given (rails.py default, common practice)
    if "tolerance" in raw:
        t = raw["tolerance"]
        q = parse_tolerance(t) if isinstance(t, str) else None
        tol = q.value if q else (float(t) if isinstance(t, (int, float)) and not isinstance(t, bool) else -1.0)
        if not 0 <= tol < 1:
            raise ConfigError(f"{where} tolerance: {t!r} is not a tolerance (write \"5%\" or 0.05)", path)
    lo = _volts(raw["min"], where + " min", path) if "min" in raw else nominal - abs(nominal) * tol
    hi = _volts(raw["max"], where + " max", path) if "max" in raw else nominal + abs(nominal) * tol
    if not lo <= nominal <= hi:
        raise ConfigError(f"{where}: needs min <= nominal <= max, got {lo} / {nominal} / {hi}", path)
    return RailSetting(nominal, lo, hi)


# What a part's value can plausibly be (SI units, °C); outside it is a typing mistake.
_RANGES = {"If": (1e-6, 1000.0), "Vf": (0.1, 1000.0), "Vr": (0.0, 10_000.0), "Rth": (0.0, 10_000.0),
           "Tj": (-60.0, 300.0), "Tolerance": (0.0, 0.5), "Power": (1e-4, 10_000.0), "pin": (1e-6, 10.0),
           "resistance": (0.0, 1e12)}


def plausible(key: str, value: float) -> bool:
    """Whether a part parameter's value (SI units, °C) is one a real part can have."""
    lo, hi = _RANGES.get(key.split("_")[0], (float("-inf"), float("inf")))
    return lo <= value <= hi


def _part_value(key: str, value: Any, where: str, path: str) -> str:
    """A part parameter's text, checked against what the key means."""
    base = m.group(1) if (m := _DIE_KEY.match(key)) else key
    grammar: dict[str, tuple[Any, str]] = {
        **{k: (parse_voltage, '"2.1V"') for k in _VOLTAGE}, **{k: (parse_current, '"20mA"') for k in _CURRENT},
        **{k: (parse_tolerance, '"5%"') for k in _TOLERANCE}, "Vf": (parse_vf, '"2.0V@20mA"'),
        "Power": (parse_power, '"0.25W"'), "Rth": (parse_thermal_resistance, '"400K/W"'),
        "Tj_max": (parse_temperature, '"125°C"'),
    }
    if base in grammar:
        parse, example = grammar[base]
        q = parse(value) if isinstance(value, str) else None
        if q is None:
            raise ConfigError(f"{where} {key}: {value!r} is not a valid value; write it with its unit, "
                              f"e.g. {key} = {example}", path)
        number = q[0].value if isinstance(q, tuple) else q.value
        if not plausible(base, number):
            raise ConfigError(f"{where} {key}: {value!r} is outside what a part of this kind can be", path)
        return str(value)
    text = _text(value, f"{where} {key}", path)
    if base == "driver" and text not in DRIVER_KINDS:
        raise ConfigError(f"{where} driver: {text!r}{suggest(text, DRIVER_KINDS)}", path)
    return text


def _parts(table: Any, label: str, path: str) -> Mapping[str, Mapping[str, str]]:
    out = {}
    canonical = {k.casefold(): k for k in PART_KEYS}
    for key, raw in _table(table, f"[{label}]", path).items():
        where = f"[{label}.{key!r}]"
        settings = _table(raw, where, path)
        plain = {k: v for k, v in settings.items() if not _DIE_KEY.match(k)}
        _check_keys(plain, PART_KEYS, where, path)
        names = [canonical.get(k.casefold(), k).casefold() for k in settings]
        if len(set(names)) < len(names):  # keys match without regard to case: which would win?
            twice = next(n for n in names if names.count(n) > 1)
            raise ConfigError(f"{where}: {twice!r} is set twice (keys are matched without regard to case)", path)
        out[key] = FrozenMap({(canonical.get(k.casefold(), k)): _part_value(canonical.get(k.casefold(), k), v,
                                                                             where, path)
                              for k, v in settings.items()})
    return FrozenMap(out)


def _text(value: Any, where: str, path: str) -> str:
    if isinstance(value, bool):
        raise ConfigError(f"{where}: expected a value such as \"2.0V@20mA\", not {value}", path)
    if isinstance(value, (int, float, str)):
        return str(value)
    if isinstance(value, list) and all(isinstance(v, str) for v in value):
        return ",".join(value)
    raise ConfigError(f"{where}: expected text or a number, not {type(value).__name__}", path)


def _temperature(value: Any, where: str, path: str) -> float:
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        t = float(value)
    else:
        q: Quantity | None = parse_temperature(value) if isinstance(value, str) else None
        if q is None:
            raise ConfigError(f"{where}: {value!r} is not a temperature in °C", path)
        t = q.value
    if not AMBIENT_C[0] <= t <= AMBIENT_C[1]:
        raise ConfigError(f"{where}: {t:g} °C is outside the {AMBIENT_C[0]:g} to {AMBIENT_C[1]:g} °C an "
                          "electronic product works in", path)
    return t


def _waivers(raw: Any, path: str) -> tuple[Waiver, ...]:
    if not isinstance(raw, list):
        raise ConfigError("waivers must be an array of tables: [[waivers]]", path)
    out = []
    for i, w in enumerate(raw, start=1):
        where = f"[[waivers]] #{i}"
        w = _table(w, where, path)
        _check_keys(w, _WAIVER_KEYS, where, path)
        if not w.get("rule") or not w.get("reason"):
            raise ConfigError(f"{where}: a waiver needs 'rule' and 'reason'", path)
        if not (w.get("ref") or w.get("fingerprint")):
            raise ConfigError(f"{where}: a waiver names a component ('ref') or a finding ('fingerprint')", path)
        out.append(Waiver(str(w["rule"]), str(w["reason"]), str(w.get("ref", "")), str(w.get("fingerprint", "")),
                          f"{path or CONFIG_NAME} {where}"))
    return tuple(out)


def from_mapping(data: Mapping[str, Any], path: str = "",
                 positions: Mapping[tuple[str, ...], tuple[int, int]] | None = None) -> Config:
    """Build a Config from parsed TOML, raising ConfigError on anything unknown or malformed."""
    _check_keys(data, _TOP_KEYS, "top level", path)
    data = {k.casefold(): v for k, v in data.items()}
    kwargs: dict[str, Any] = {"path": path, "positions": FrozenMap(positions or {})}
    if "ambient" in data:
        amb = _table(data["ambient"], "[ambient]", path)
        _check_keys(amb, _AMBIENT_KEYS, "[ambient]", path)
        lo = _temperature(amb.get("min", Config.ambient_min_c), "[ambient] min", path)
        hi = _temperature(amb.get("max", Config.ambient_max_c), "[ambient] max", path)
        if lo > hi:
            raise ConfigError(f"[ambient]: min {lo} °C is above max {hi} °C", path)
        kwargs.update(ambient_min_c=lo, ambient_max_c=hi, ambient_set=True)
    if "rails" in data:
        kwargs["rails"] = FrozenMap({n: _rail(n, r, path) for n, r in _table(data["rails"], "[rails]", path).items()})
    for label in ("refs", "values", "symbols"):
        if label in data:
            kwargs[label] = _parts(data[label], label, path)
    if "rules" in data:
        rules = _table(data["rules"], "[rules]", path)
        kwargs["rules"] = FrozenMap({k: FrozenMap(dict(_table(v, f"[rules.{k}]", path)))
                                            for k, v in rules.items()})
    if "waivers" in data:
        kwargs["waivers"] = _waivers(data["waivers"], path)
    return Config(**kwargs)


def load(path: str | Path) -> Config:
    """Read a ledlint.toml file, or the [tool.ledlint] table of a pyproject.toml. Every error names
    its line and column."""
    p = Path(path)
    name = str(path)
    text = read_utf8(p, "configuration file", ConfigError)
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        m = re.search(r"\(at line (\d+), column (\d+)\)", str(exc))
        line, col = (int(m.group(1)), int(m.group(2))) if m else (0, 0)
        reason = str(exc)[: m.start()].strip() if m else str(exc)
        raise ConfigError(f"not valid TOML: {reason}", name, line, col) from None
    except RecursionError:  # tomllib recurses per nested inline table or array
        raise ConfigError("not valid TOML: nested too deeply", name) from None
    positions = key_positions(text)
    if p.name == "pyproject.toml":
        tool = data.get("tool")
        data = tool.get("ledlint", {}) if isinstance(tool, dict) else {}
        if not isinstance(data, dict):
            raise ConfigError(f"[tool.ledlint] must be a table, not {type(data).__name__}", name,
                              *positions.get(("tool", "ledlint"), (0, 0)))
        positions = {k[2:]: v for k, v in positions.items() if k[:2] == ("tool", "ledlint")}
    try:
        return from_mapping(data, name, positions)
    except ConfigError as exc:
        if exc.line or exc.path != name:
            raise
        raise ConfigError(exc.message, name, *locate(positions, exc.message)) from None


_TABLE = re.compile(r"\s*(\[\[?)\s*(.+?)\s*\]\]?\s*(?:#.*)?$")
_KEY = re.compile(r"\s*((?:\"(?:[^\"\\]|\\.)*\"|'[^']*'|[A-Za-z0-9_-]+)(?:\s*\.\s*(?:\"(?:[^\"\\]|\\.)*\"|'[^']*'|[A-Za-z0-9_-]+))*)\s*=")
_PART = re.compile(r"\"((?:[^\"\\]|\\.)*)\"|'([^']*)'|([A-Za-z0-9_-]+)")


def _dotted(text: str) -> tuple[str, ...]:
    return tuple(m.group(1) if m.group(1) is not None else m.group(2) if m.group(2) is not None else m.group(3)
                 for m in _PART.finditer(text))


def key_positions(text: str) -> dict[tuple[str, ...], tuple[int, int]]:
    """Where each table and key of a TOML text is written, by its dotted path: ("rails", "VCC",
    "nominal"), and an array of tables by its count, ("waivers", "#2"). Read line by line, as
    a configuration writes them; what is not found is simply not placed."""
    out: dict[tuple[str, ...], tuple[int, int]] = {}
    table: tuple[str, ...] = ()
    counts: dict[tuple[str, ...], int] = {}
    for number, line in enumerate(text.splitlines(), start=1):
        if (m := _TABLE.match(line)) is not None:
            table = _dotted(m.group(2))
            if m.group(1) == "[[":
                counts[table] = counts.get(table, 0) + 1
                table = (*table, f"#{counts[table]}")
            out.setdefault(table, (number, m.start(1) + 1))
        elif (m := _KEY.match(line)) is not None:
            out.setdefault((*table, *_dotted(m.group(1))), (number, m.start(1) + 1))
    return out


# How an error message names what it is about: "[rails.'VCC'] nominal: …", "[[waivers]] #2: …",
# "top level: unknown key 'x'".
_WHERE = re.compile(r"\[\[?([^\]]+)\]\]?(?:\s+(#\d+))?(?:\s+([A-Za-z0-9_-]+))?|top level: unknown key '([^']*)'")


def locate(positions: Mapping[tuple[str, ...], tuple[int, int]], message: str) -> tuple[int, int]:
    """The line and column of the table or key an error message names; (0, 0) when not found."""
    m = _WHERE.search(message)
    if m is None:
        return 0, 0
    if m.group(4) is not None:
        return positions.get((m.group(4),), (0, 0))
    path = (*_dotted(m.group(1)), *([m.group(2)] if m.group(2) else []))
    unknown = re.search(r"unknown (?:key|option) '([^']*)'", message)
    for candidate in ([(*path, unknown.group(1))] if unknown else []) + [(*path, m.group(3)), path]:
        if candidate and None not in candidate and tuple(candidate) in positions:
            return positions[tuple(candidate)]
    return 0, 0


_OUR_TABLE = re.compile(r"^\s*\[\s*tool\s*\.\s*ledlint\b", re.M)


def discover(netlist_path: str | Path) -> Path | None:
    """The configuration that applies to a netlist: the nearest ledlint.toml, or pyproject.toml
    with a [tool.ledlint] table, in the netlist's folder or a parent folder. Both in one folder
    is an error: which one was meant cannot be told."""
    folder = Path(netlist_path).resolve().parent
    for d in (folder, *folder.parents):
        candidate, py = d / CONFIG_NAME, d / "pyproject.toml"
        ours = py.is_file() and _configures_us(py)
        if candidate.is_file():
            if ours:
                raise ConfigError(f"both {candidate} and the [tool.ledlint] table of this file configure ledlint; "
                                  "keep one", str(py))
            return candidate
        if ours:
            return py
    return None


def _configures_us(py: Path) -> bool:
    """A pyproject.toml with a [tool.ledlint] table. Another project's file, however odd (its
    `tool` not a table, a syntax error elsewhere), is not ours and is passed over."""
    try:
        text = py.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError):
        return False
    try:
        tool = tomllib.loads(text).get("tool")
    except tomllib.TOMLDecodeError:
        # Broken, but meant for us: load() then reports where, rather than the settings being
        # silently dropped.
        return bool(_OUR_TABLE.search(text))
    except RecursionError:
        return bool(_OUR_TABLE.search(text))
    return isinstance(tool, dict) and "ledlint" in tool
