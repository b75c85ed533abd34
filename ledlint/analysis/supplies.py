"""Supplies: the voltage across each end of an LED circuit, and what it rests on.

A circuit end is a rail (its voltage from the net name or the configuration), ground, a
controller pin (its IC's supply, through the pin's output resistance) or a supply whose
voltage nobody stated; the last gets a Missing that says how to state it.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Iterable

from ledlint.config import Config
from ledlint.quantities.ranges import Range
from ledlint.circuits.graph import NetGraph
from ledlint.netlist.model import Component, Pin, PinType
from ledlint.parts.devices import PIN_OUTPUT
from ledlint.parts.params import Missing, rail_params
from ledlint.parts.kinds import Kind, classify
from ledlint.circuits.topology import Terminal, TerminalKind

SQRT2 = 2 ** 0.5  # peak over RMS of a sine


@dataclass(frozen=True)
class Supply:
    volts: Range  # source minus return (for an AC rail, its forward peak)
    basis: tuple[str, ...]
    reverse_peak: float = 0.0  # V: an AC rail's peak against the LEDs in the other half-cycle


@dataclass(frozen=True)
class IcSupply:
    """The rail an IC runs from, as seen on its supply pins."""

    volts: Range
    net: str
    basis: str


def _supply_pins(comp: Component) -> list[Pin]:
    return [p for p in comp.pins if p.net is not None
            and (p.type is PinType.POWER_IN or re.match(r"^(V|AV|DV|IOV)(CC|DD)", p.name, re.I))]


_NOMINAL = "its voltage, e.g. nominal = 3.3"  # an example, not a guess at this rail


def _rail_fix(net: str, keys: str, what: str = "it") -> str:
    """How to give a rail its voltage, in words a user can turn into TOML without guessing."""
    return f"set {what} in ledlint.toml: a table [rails.\"{net}\"] with {keys}"


def _supply_rank(p: Pin) -> int:
    """Which supply pin sets the level of an IC's outputs: its I/O supply, then a VDD or VCC,
    then the rest (a battery, regulator or analogue pin) (common practice)."""
    if re.search(r"IO", p.name, re.I):
        return 0
    return 1 if re.match(r"^(V|DV)(CC|DD)\d*$", p.name, re.I) else 2


def _is_ground(net: str | None, config: Config) -> bool:
    r = rail_params(net, config) if net else None
    return r is not None and r.ground


def ic_supply(comp: Component, config: Config) -> IcSupply | None:
    """The positive rail an IC runs from: its best-ranked supply pin with a known rail, the highest
    of those."""
    found = []
    for p in _supply_pins(comp):
        r = rail_params(p.net, config) if p.net else None
        if r is not None and p.net and not r.ground and r.nominal > 0:
            found.append((-_supply_rank(p), r.nominal, IcSupply(Range(r.nominal, r.minimum, r.maximum), p.net,
                          f"{comp.ref} runs from {p.net} ({r.nominal:g} V, pin {p.name or p.number}; {r.detail})")))
    return max(found, key=lambda f: (f[0], f[1]))[2] if found else None


def end_voltage(graph: NetGraph, config: Config, t: Terminal | None, high: bool, missing: list[Missing],
                basis: list[str]) -> tuple[Range, Range] | None:
    """(voltage, series resistance) of a circuit end; `high` for the source end."""
    if t is None:
        return None
    if t.kind is TerminalKind.GROUND:
        basis.append(f"{t.net} is ground ({t.detail})")
        return Range.fixed(0.0), Range.fixed(0.0)
    if t.kind is TerminalKind.RAIL:
        r = rail_params(t.net, config)
        assert r is not None
        if r.ac:
            # Sine peaks at √2 × RMS: the forward half-cycle taken at its peak (a conservative
            # reading of a continuous If_max), the other half-cycle reverses the LEDs.
            peak = Range(r.nominal * SQRT2, r.minimum * SQRT2, r.maximum * SQRT2)
            basis.append(f"{t.net} AC {r.minimum:g}-{r.maximum:g} V RMS ({r.detail}): peaks of "
                         f"{peak.minimum:.3g}-{peak.maximum:.3g} V, the forward half-cycle taken at its peak")
            return peak, Range.fixed(0.0)
        basis.append(f"{t.net} {r.minimum:g}-{r.maximum:g} V ({r.detail})")
        return Range(r.nominal, r.minimum, r.maximum), Range.fixed(0.0)
    comp = graph.component(t.pin.ref) if t.pin is not None else None
    if t.kind is TerminalKind.PIN and comp is not None:
        pr = PIN_OUTPUT
        if not high:
            basis.append(f"{t.detail} sinks at 0 V, output resistance {pr.minimum:g}-{pr.maximum:g} Ω assumed")
            return Range.fixed(0.0), pr
        sup = ic_supply(comp, config)
        if sup is None:
            pins = sorted((p for p in _supply_pins(comp) if not _is_ground(p.net, config)),
                          key=lambda p: (_supply_rank(p), p.net))
            nets = list(dict.fromkeys(p.net for p in pins if p.net))  # the one setting the output level first
            where = f"its supply pins are on {', '.join(nets)}" if nets else "no supply pin of it is connected"
            missing.append(Missing("supply voltage", f"{comp.ref} drives LEDs, and {where}, with no voltage "
                                   "known", _rail_fix(nets[0] if nets else "NET", _NOMINAL)))
            return None
        basis.append(f"{t.detail} sources its supply: {sup.basis}; output resistance "
                     f"{pr.minimum:g}-{pr.maximum:g} Ω assumed")
        return sup.volts, pr
    if t.kind is TerminalKind.SUPPLY:
        fix = _rail_fix(t.net, _NOMINAL)
        if comp is not None and classify(comp) is Kind.BRIDGE:
            # A bridge's output peaks at √2 × the AC RMS (less two diode drops); unsmoothed it
            # also falls to 0 V each half cycle, which a DC rail cannot describe.
            fix = (_rail_fix(t.net, "nominal = 325 and tolerance = 0.1", "its peak") +
                   " (√2 × 230 V AC ±10 %; 170 for 120 V AC); if it is not smoothed it also falls to 0 V "
                   "every half cycle, so check the dark part of the cycle by hand")
        missing.append(Missing("supply voltage", f"net {t.net} ({t.detail}) has no voltage in its name", fix))
        return None
    missing.append(Missing("supply", f"net {t.net} is not a supply", "describe how this LED is powered"))
    return None


def circuit_supply(graph: NetGraph, config: Config, source: Terminal | None, ret: Terminal | None,
           missing: list[Missing]) -> tuple[Supply, Range] | None:
    """Voltage across a circuit (source minus return) and the resistance its ends add."""
    basis: list[str] = []
    top = end_voltage(graph, config, source, True, missing, basis)
    bottom = end_voltage(graph, config, ret, False, missing, basis)
    if top is None or bottom is None:
        return None
    ac = [rail_params(t.net, config) for t in (source, ret) if t is not None and t.kind is TerminalKind.RAIL]
    reverse = max((r.maximum * SQRT2 for r in ac if r is not None and r.ac), default=0.0)
    return Supply(top[0] - bottom[0], tuple(basis), reverse), top[1] + bottom[1]


def rail_of(graph: NetGraph, config: Config, ends: Iterable[Terminal | None]) -> str:
    """The rail net behind a circuit's first end that has one: a rail or supply net itself, or a
    driving pin's IC supply (its best-ranked supply pin, voltage known or not); "" when none."""
    for t in ends:
        if t is None or t.kind is TerminalKind.GROUND:
            continue
        if t.kind in (TerminalKind.RAIL, TerminalKind.SUPPLY):
            return t.net
        comp = graph.component(t.pin.ref) if t.kind is TerminalKind.PIN and t.pin else None
        if comp is not None:
            sup = ic_supply(comp, config)
            pins = sorted((p for p in _supply_pins(comp) if p.net and not _is_ground(p.net, config)),
                          key=lambda p: (_supply_rank(p), p.net))
            if sup or pins:
                return sup.net if sup else str(pins[0].net)
    return ""
