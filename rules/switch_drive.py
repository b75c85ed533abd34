"""switch-drive: a transistor switch its controller pin cannot turn off, or cannot turn fully on.

What it flags
    A P-MOSFET or PNP high-side switch whose source or emitter sits on a rail higher than the
    controller pin can reach: at the pin's high level the gate or base is still well below
    the source, so the switch stays on and the LEDs stay lit (error). And an NPN low-side
    switch whose base current is too small for the LED current it carries: it runs in its
    linear region, dropping volts instead of saturating (warning past a current gain of 200,
    error past 1,000).

Why it matters
    Both pass a connectivity check and both ship: the first as an indicator that never goes
    out, the second as LEDs dimmer than designed and a transistor that heats, differing from
    board to board with the transistor's gain.

Example
    Q1, a P-MOSFET on +12V, its gate on a 3.3 V controller pin: V_GS is at most 3.47 − 11.4 =
    −7.9 V, always on. Fixed: an NPN or N-MOSFET level shifter pulling the gate down, with a
    pull-up from gate to +12V. Q2, an NPN with 1 MΩ from a 3.3 V pin: about 2.6 µA of base
    current for 9 mA of LED current, a gain of 3,500. Fixed: 2 kΩ.

Fix
    Shift the level (a small N-channel or NPN stage driving the high-side switch, with a
    pull-up to the switch's own rail), or run the LEDs from a rail the pin can reach; for a
    starved base, the E24 base resistor in the hint.

Formula
    Off needs V_G ≥ V_S − |V_GS(th)| (P-MOSFET, |V_GS(th)| ≥ 1 V) or V_B ≥ V_E − V_BE (PNP,
    V_BE ≥ 0.55 V); the pin's high level is its IC's supply at its maximum. Saturation needs
    I_B ≥ I_C / β: I_B = (V_OH − V_BE) / (R_B + R_pin) at the weakest corner.

Source
    Device physics (common practice): a MOSFET conducts once |V_GS| passes its threshold, of
    1-2.5 V for small-signal parts (common practice); small-signal bipolar transistors have a
    current gain of about 100 to 300 at 10 mA, the highest gain groups up to about 800 (from
    memory).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.analysis.results import VoltageDriven
from ledlint.circuits.circuit import CircuitKind
from ledlint.parts.devices import PIN_LIMIT, VBE, VGS
from ledlint.checks.findings import Finding, Severity, Value
from ledlint.netlist.model import PinType
from ledlint.parts.kinds import Kind
from ledlint.checks.registry import Rule, RuleContext
from ledlint.rules._support import base_resistor_hint, circuit_assumptions, ids, switch_current

# I_C / I_B past which a small-signal switch is not assured to saturate (typical gains reach about
# 200 at 10 mA), and past which none will (the highest gain groups stop near 800) (from memory).
GAIN_WARNING, GAIN_ERROR = 200, 1000


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        if not isinstance(a, VoltageDriven):
            continue
        c = a.circuit
        for d in a.drives:
            pin = f"{d.pin.ref} pin {d.pin.name or d.pin.number}"
            refs = tuple(dict.fromkeys((d.transistor, d.pin.ref, *((d.resistor,) if d.resistor else ()), *c.refs)))
            part = ctx.board.netlist.component(d.transistor)
            line = part.line if part else None
            if d.high_side and d.io is not None and d.pin.type is not PinType.OPEN_COLLECTOR:
                threshold = VGS.minimum if d.part is Kind.PMOS else VBE.minimum
                if d.io.maximum < d.rail.minimum - threshold:
                    what, terminal = ("gate", "source") if d.part is Kind.PMOS else ("base", "emitter")
                    # A pull-up to the switch's own rail says the pin may be meant as open drain: then
                    # it works if the pin stands that voltage, which the netlist cannot tell.
                    unless = (f", unless {pin} is set to open drain and stands the rail ({d.tie} pulls the "
                              f"{what} up)" if d.tie else "")
                    yield ctx.finding(
                        a, Severity.WARNING if d.tie else Severity.ERROR,
                        "{q} cannot be turned off: its {terminal} is on a rail of at least {rail} "
                        "but {pin} drives its {what} no higher than {io}, so {leds} {stay} lit" + unless,
                        refs=refs, nets=tuple(n for n in (d.pin.net,) if n), line=line,
                        values=(Value("rail", d.rail.minimum, "V"), Value("io", d.io.maximum, "V",
                                                                         d.rail.minimum - threshold, "<")),
                        q=d.transistor, terminal=terminal, pin=pin, what=what, leds=ids(c.leds),
                        stay="stays" if len(c.leds) == 1 else "stay",
                        assumed=(f"{'|V_GS(th)|' if d.part is Kind.PMOS else 'V_BE'} at least {threshold:g} V",
                                 d.basis, *circuit_assumptions(a)),
                        hint=f"drive {d.transistor}'s {what} through a small N-MOSFET or NPN stage with a pull-up "
                             f"to its {terminal}'s rail, or run the LEDs from a rail {pin} can reach")
            base = d.base_current
            if d.part is Kind.NPN and base is not None and d.current is not None and d.current.minimum > 0:
                collector = switch_current(a)
                gain = collector / max(base.minimum, 1e-12)
                if gain <= GAIN_WARNING:
                    continue
                severity = Severity.ERROR if gain > GAIN_ERROR else Severity.WARNING
                limit = next((p.limit.value for p in a.pins if p.pin == d.pin), PIN_LIMIT)
                yield ctx.finding(
                    a, severity, "{q} is not driven into saturation: {pin} gives its base as little as {ib} "
                    "{through}, for up to {ic} of LED current, a current gain of {times} (saturated switching "
                    "wants 10 to 20)", refs=refs, nets=tuple(n for n in (d.pin.net,) if n), line=line,
                    values=(Value("ib", base.minimum, "A"), Value("ic", collector, "A"),
                            Value("gain", gain, "", GAIN_WARNING, ">")),
                    q=d.transistor, pin=pin, through=f"through {d.resistor}" if d.resistor else "",
                    times=f"{gain:,.0f}" if base.minimum > 0 else "without bound",
                    assumed=(d.basis, *circuit_assumptions(a)),
                    hint=base_resistor_hint(a, d, limit))


RULE = Rule(
    id="switch-drive",
    summary="transistor switch its controller pin cannot turn off, or cannot saturate",
    severity=Severity.ERROR,
    check=check,
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK),
)
