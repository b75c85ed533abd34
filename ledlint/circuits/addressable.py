"""Addressable LEDs: packages with their own controller, chained by data in and out."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from ledlint.circuits.circuit import CircuitKind, LedCircuit, Wired
from ledlint.circuits.shapes import Context, Recogniser
from ledlint.netlist.model import natural
from ledlint.parts.kinds import LedId

_DATA_OUT = ("DOUT", "DO", "SDO")
_DATA_IN = ("DIN", "DI", "SDI")
_SUPPLY = ("VDD", "VCC", "V+", "VLED")
_GROUND = ("VSS", "GND", "V-")


@dataclass(frozen=True)
class Addressable(Wired):
    """One chain of addressable LEDs, from the supply of its first LED to that LED's ground."""

    kind = CircuitKind.ADDRESSABLE

    @property
    def reason(self) -> str:
        return (f"{len(self.leds)} LED(s) with their own controllers, chained by data in/out; "
                "their current is set inside each LED, so no electrical check applies")


def from_parts(ctx: Context) -> Iterator[LedCircuit]:
    addressable = ctx.addressable
    parent = {c.ref: c.ref for c in addressable}

    def find(x: str) -> str:
        while parent[x] != x:
            parent[x] = parent[parent[x]]
            x = parent[x]
        return x

    for c in addressable:
        for p in c.pins:
            if p.net and p.name.upper() in _DATA_OUT:
                for q in ctx.graph.pins_on(p.net):
                    if q.ref in parent and q.name.upper() in _DATA_IN:
                        parent[find(q.ref)] = find(c.ref)
    chains: dict[str, list[str]] = {}
    for c in addressable:
        chains.setdefault(find(c.ref), []).append(c.ref)
    for refs in chains.values():
        first = ctx.comp(min(refs, key=natural))
        vdd = next((p.net for p in first.pins if p.name.upper() in _SUPPLY and p.net), None)
        vss = next((p.net for p in first.pins if p.name.upper() in _GROUND and p.net), None)
        yield Addressable(*ctx.place(LedId(r) for r in refs),
                          source=ctx.topo.terminal(vdd) if vdd else None,
                          ret=ctx.topo.terminal(vss) if vss else None)


RECOGNISER = Recogniser(CircuitKind.ADDRESSABLE, from_parts=from_parts)
