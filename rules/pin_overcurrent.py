"""pin-overcurrent: a controller pin sourcing or sinking more LED current than it is rated for.

What it flags
    An IC output pin (a microcontroller GPIO, a logic gate, an I/O expander) that drives an
    LED directly, where the LED current at the worst corner exceeds the pin's limit: 20 mA
    per pin unless the part says otherwise (`pin_current_max`).

Why it matters
    A GPIO pushed past its rating sags (the LED dims and the pin's logic level is lost for
    anything else on that net), heats the die and, summed over a port, can exceed the
    package's supply-pin limit. Absolute maxima of 25-40 mA per pin are not operating points.

Example
    A red LED from a 3.3 V pin through 47 Ω: up to 21.7 mA at the worst corner, over the
    20 mA per-pin default. Fixed: 120 Ω, 12.6 mA at the worst corner. The finding is an
    error even when the limit is that default (listed under "assumed"): it is the figure a
    pin is held to until the part's own is given (`pin_current_max`).

Fix
    Raise the series resistor to the E24 value in the hint, or switch the LED with a
    transistor or a driver.

Formula
    I = (V_OH − Vf) / (R + R_pin) when sourcing, (V_supply − Vf − V_OL) / (R + R_pin) when
    sinking, at the worst corner, with the pin's output resistance R_pin (40-65 Ω assumed).

Source
    Common practice: controller I/O pins are typically rated 8-25 mA, with absolute maxima of
    20-40 mA, and an output is modelled to first order as its supply behind 40-65 Ω. A given
    part may differ, so give it `pin_current_max`.
"""

from __future__ import annotations

from typing import Iterator

from ledlint.analysis.results import Driven, PinResult
from ledlint.analysis.switching import SwitchDrive
from ledlint.circuits.circuit import CircuitKind
from ledlint.checks.findings import Finding, Severity, Value
from ledlint.checks.registry import Rule, RuleContext
from ledlint.rules._support import assumed_param, ballast_hint, base_resistor_hint, circuit_assumptions, ids


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        if not isinstance(a, Driven):
            continue
        for p in a.pins:
            if p.current_max <= p.limit.value:
                continue
            verb = "sources" if p.sourcing else "sinks"
            comp = ctx.board.netlist.component(p.pin.ref)
            assumed = tuple(assumed_param(f"{p.pin.ref} pin limit", p.limit, "A") + circuit_assumptions(a))
            values = (Value("current", p.current_max, "A", p.limit.value, ">"), Value("limit", p.limit.value, "A"))
            if p.base is not None:
                yield _base_finding(ctx, a, p, p.base, values, assumed + (p.base.basis,), verb)
                continue
            hint = ballast_hint(ctx, a, "")
            hint = f"{hint}; or switch the LED with a transistor" if hint else "switch the LED with a transistor or a driver"
            yield ctx.finding(
                a, Severity.ERROR, "{ic} pin {pin} ({net}) {verb} up to {current} for {leds}, above its limit of {limit}",
                refs=(p.pin.ref, *a.circuit.refs), nets=(p.pin.net or "",), values=values, assumed=assumed, hint=hint,
                ic=p.pin.ref, pin=p.pin.name or p.pin.number, net=p.pin.net, verb=verb, leds=ids(a.circuit.leds),
                line=comp.line if comp else None)


def _base_finding(ctx: RuleContext, a: Driven, p: PinResult, b: SwitchDrive, values: tuple[Value, ...],
                  assumed: tuple[str, ...], verb: str) -> Finding:
    """A pin driving a switch's base: the base is a diode to the emitter, so only resistance
    between them limits the pin's current."""
    hint = base_resistor_hint(a, b, p.limit.value)
    base = f"through {b.resistor}" if b.resistor else "with no base resistor"
    part = ctx.board.netlist.component(p.pin.ref)
    return ctx.finding(
        a, Severity.ERROR, "{ic} pin {pin} ({net}) {verb} up to {current} {way} {q}'s base {base}, above its limit of "
        "{limit}", refs=tuple(dict.fromkeys((p.pin.ref, b.transistor, *((b.resistor,) if b.resistor else ()), *a.circuit.refs))),
        nets=(p.pin.net or "",), values=values, assumed=assumed, hint=hint, ic=p.pin.ref, pin=p.pin.name or p.pin.number,
        net=p.pin.net, verb=verb, q=b.transistor, base=base, line=part.line if part else None, topic=b.transistor,
        way="into" if p.sourcing else "out of")


RULE = Rule(
    id="pin-overcurrent",
    summary="controller pin sourcing or sinking more LED current than its limit",
    severity=Severity.ERROR,
    check=check,
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK),
)
