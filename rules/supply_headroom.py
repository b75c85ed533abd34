"""supply-headroom: the supply barely above the string's forward voltage.

What it flags
    A resistor-fed LED circuit whose supply, at its minimum, leaves too little voltage for the
    ballast once the LEDs are at their maximum forward voltage. Error when the string cannot
    conduct its design current (no headroom left, or under 10 % of nominal current at the low
    corner); warning when the low-corner current is under half the nominal.

Why it matters
    The ballast resistor only regulates the current if it has voltage to work with. A white
    LED (3.0 V typical, 3.4 V maximum) on a 3.3 V rail runs anywhere from nearly off to full
    brightness across parts and rail tolerance: panels look patchy and some boards ship with
    dark indicators.

Example
    A white LED with Vf 3.0 V typical and 3.4 V maximum (its datasheet, as fields) on +3V3
    through 15 Ω: 20 mA nominal, (3.3 − 3.0) V / 15 Ω, but at 3.14 V it drops under 2 mA:
    error. With only the colour named, the same circuit is an info: the table's Vf is not the
    part's. Fixed: run it from +5V through 150 Ω: about 14 mA nominal and 9 mA at the low corner.

Fix
    Use a higher rail (the hint gives the least nominal supply at which, with the ballast
    re-sized for the same current, the low corner keeps half the nominal current), fewer LEDs
    in series, a lower-Vf LED, or a constant-current driver.

Formula
    headroom = V_supply,min − V_switch,max − Σ Vf,max(I_nominal, T_cold); the low-corner
    current is solved with the minimum supply, maximum resistances and switch drop, every LED
    at its maximum Vf and the coldest ambient. Least supply for the hint, with S the nominal
    string voltage, H the string at maximum Vf and coldest, lo = V_min / V and k = R_max / R:
    V ≥ (H − ratio·k·S) / (lo − ratio·k).

Source
    Ohm's law with the Shockley diode equation; that the ballast drop must be large against
    the Vf shift it is to absorb is common practice.
"""

from __future__ import annotations

from typing import Iterator

from ledlint.checks.findings import Finding, Severity, Value, quantity
from ledlint.checks.registry import Rule, RuleContext
from ledlint.rules._options import DEAD_RATIO, MIN_RATIO
from ledlint.analysis.results import VoltageDriven
from ledlint.circuits.bank import ResistorBank
from ledlint.circuits.circuit import CircuitKind, Wired
from ledlint.circuits.topology import TerminalKind
from ledlint.rules._support import by_evidence, circuit_assumptions, ids, is_default, led_assumptions


def check(ctx: RuleContext) -> Iterator[Finding]:
    least = ctx.options[MIN_RATIO.option.name]
    dead = ctx.options[DEAD_RATIO.option.name]
    for a in ctx.analyses:
        if not isinstance(a, VoltageDriven) or a.unlimited or a.headroom_v is None or a.supply is None:
            continue
        if a.reversed:
            continue  # reversed: reverse-bias reports it, headroom means nothing here
        if a.headroom_v <= 0 or a.min_ratio < dead:
            severity = Severity.ERROR
        elif a.min_ratio < least:
            severity = Severity.WARNING
        else:
            continue
        low = min(a.leds, key=lambda r: r.low / max(r.current.nominal, 1e-15))
        # Resting on a colour's table Vf (no Vf given at all) it is two steps less severe; on a
        # spread assumed around a given Vf, one.
        table = any(is_default(r.params.vf) for r in a.leds)
        severity = by_evidence(by_evidence(severity, table), table or any(is_default(r.params.vf_max) for r in a.leds))
        string_v = a.supply.volts.minimum - a.headroom_v
        values: tuple[Value, ...] = (Value("supply_min", a.supply.volts.minimum, "V"), Value("string", string_v, "V"),
                  Value("headroom", a.headroom_v, "V", 0.0, "<"), Value("low", low.low, "A"),
                  Value("nominal", low.current.nominal, "A"),
                  Value("ratio", low.low / max(low.current.nominal, 1e-15), "%", least, "<"))
        circuit = a.circuit
        assert isinstance(circuit, Wired)
        what = "the string needs" if len(circuit.branches[0].leds) > 1 else "the LED needs"
        if a.headroom_v <= 0:
            template = ("{leds}: no headroom at the low corner. The supply can fall to {supply_min} but "
                        + what + " {string} at maximum Vf (headroom {headroom}), so {led} drops to {low} "
                        "against {nominal} nominal")
        else:
            template = ("at the low corner ({supply_min} supply, maximum Vf) {led} drops to {low}, "
                        "{ratio} of its {nominal} nominal: only {headroom} is left above the maximum Vf")
        from ledlint.analysis.sizing import headroom_fix  # the engine loads only when a hint is sized

        fix = headroom_fix(a, least)
        c = a.circuit
        assert isinstance(c, Wired)
        individually = isinstance(c, ResistorBank) and c.individually_driven
        tol = a.supply.volts.maximum / a.supply.volts.nominal - 1 if a.supply.volts.nominal > 0 else 0.0
        rail = (f"{quantity(fix.supply, 'V')} nominal (±{quantity(tol, '%')} as now), with the ballast re-sized "
                "for the same current" if fix is not None and fix.supply is not None else "")
        fewer = (f"at most {fix.leds} LEDs per string (the ballast re-sized for them)" if fix is not None
                 and fix.leds is not None else "fewer LEDs in series")
        if fix is not None and fix.supply is not None:
            values += (Value("supply_needed", fix.supply, "V"),)
        if any(t is not None and t.kind is TerminalKind.PIN for t in (c.source, c.ret)) or individually:
            # A pin's level is its IC's supply: raising one end's rail back-drives the pin.
            hint = ((f"switch the LED with a transistor from a rail of at least {rail}, or " if rail else "")
                    + "use a lower-Vf LED or a constant-current driver")
        elif rail:
            hint = f"use a supply of at least {rail}, {fewer}, a lower-Vf LED, or a constant-current driver"
        else:
            hint = ("the supply's own tolerance leaves no resistor that holds the current: use a "
                    f"constant-current driver, {fewer}, or a lower-Vf LED")
        # LEDs each lit alone by their own pin are separate circuits for headroom: name the one.
        who = low.id if individually else ids(a.circuit.leds)
        yield ctx.finding(a, severity, template, values=values, hint=hint, leds=who, led=low.id,
                          assumed=tuple(x for r in a.leds for x in led_assumptions(r)) + tuple(circuit_assumptions(a)))


RULE = Rule(
    id="supply-headroom",
    summary="supply barely above the string's forward voltage: current collapses at the low corner",
    severity=Severity.ERROR,
    check=check,
    options=(MIN_RATIO.option, DEAD_RATIO.option),
    doc=__doc__,
    kinds=(CircuitKind.STRING, CircuitKind.BANK),
)
