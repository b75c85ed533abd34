"""Constant-current driver: strings on the output of a driver IC or a two-terminal regulator."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from ledlint.circuits.circuit import CircuitKind, LedCircuit, LedString, Wired
from ledlint.circuits.shapes import Context, Recogniser, Span
from ledlint.circuits.stages import DriverIC, driver_of, regulator_driver
from ledlint.circuits.topology import ElementKind, TerminalKind


@dataclass(frozen=True, kw_only=True)
class DriverOutput(Wired):
    """Strings on one output of a driver."""

    kind = CircuitKind.DRIVER
    driver: DriverIC

    def extra_refs(self) -> tuple[str, ...]:
        return (self.driver.ref, *self.driver.sense)


def from_span(ctx: Context, span: Span) -> Iterator[LedCircuit]:
    """Every string of the span, when an end is a driver's output or a string holds a regulator."""
    string = span.elements
    pins = [t.pin for t in (span.source, span.ret) if t.kind is TerminalKind.PIN]
    driver = next((d for pin in pins if (d := driver_of(ctx, pin, string)) is not None), None)
    regulators = [e for e in string if e.kind is ElementKind.REGULATOR]
    if driver is None and regulators and len(span.segments) == 1:
        driver = regulator_driver(ctx, regulators[0])
    if driver is not None:
        yield DriverOutput(*ctx.place(span.leds), branches=tuple(LedString(s.elements) for s in span.segments),
                           source=span.source, ret=span.ret, node=driver.output.net or "", driver=driver)


RECOGNISER = Recogniser(CircuitKind.DRIVER, from_span=from_span)
