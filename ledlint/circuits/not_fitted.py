"""Not fitted: an LED marked do-not-populate. Listed, so that every LED is accounted for."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from ledlint.circuits.circuit import CircuitKind, LedCircuit
from ledlint.circuits.shapes import Context, Recogniser
from ledlint.parts.kinds import LedId, led_dies


@dataclass(frozen=True)
class NotFitted(LedCircuit):
    """An LED package marked do-not-populate, all its dies."""

    kind = CircuitKind.NOT_FITTED


def from_parts(ctx: Context) -> Iterator[LedCircuit]:
    for comp in ctx.leds:
        if comp.dnp:
            ids = [LedId(comp.ref, d.name) for d in led_dies(comp)] or [LedId(comp.ref)]
            yield NotFitted(*ctx.place(ids))


RECOGNISER = Recogniser(CircuitKind.NOT_FITTED, from_parts=from_parts)
