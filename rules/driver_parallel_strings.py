"""driver-parallel-strings: strings in parallel on one constant-current output.

What it flags
    Two or more LED strings sharing one constant-current output: a driver IC's output or a
    transistor current sink. Error when the worst string can exceed its LEDs' If_max;
    warning when the split between strings is uneven by more than 10 %.

Why it matters
    A constant-current output regulates only the total. The strings share it by forward
    voltage: the string with the lowest total Vf takes the most, heats, drops its Vf further
    and takes more. One open string pushes its share into the others. A published
    measurement: 700 mA into two strings of five LEDs from one batch, with 1 Ω balancing
    resistors, split 306 / 394 mA.

Example
    Seven strings of four LEDs on one transistor sink of 93 mA, no balancing resistors:
    13 mA per string on paper, but one string can take several times that. Fixed: one sink
    per string, or a balancing resistor in each string that drops about 1 V.

Fix
    Give each string its own output (or its own sink transistor), or put a balancing resistor
    in each string: its drop I·R must be large against the strings' Vf mismatch (the hint
    gives the value for a 10 % split).

Formula
    Σ I_k = I_set; each string k: Σ Vf_j(I_k) + R_k·I_k = V_node. Monte Carlo with each LED's Vf
    uniform within its range. Balancing: ΔI/I ≈ ΔV / (I·(R + r_d)), so R ≥ ΔV/(0.1·I) − r_d
    for a 10 % split.

Source
    LEDs Magazine, "LED Design Forum: Avoiding thermal runaway when driving multiple LED
    strings" (21 April 2009): the 306 / 394 mA measurement. The ΔI/I relation follows from the
    Shockley equation (common practice).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.quantities.ratings import chip_for
from ledlint.analysis.results import CurrentDriven, ResistorRole
from ledlint.checks.findings import Finding, Severity, Value, quantity
from ledlint.parts.params import Param
from ledlint.circuits.circuit import CircuitKind
from ledlint.circuits.driver import DriverOutput
from ledlint.circuits.sink import CurrentSink
from ledlint.checks.registry import Option, Rule, RuleContext
from ledlint.rules._support import by_evidence, circuit_assumptions, ids, led_assumptions
from ledlint.rules._options import DESIGN_FACTOR

# More than this across a balancing resistor wastes more than it balances (common practice).
_MAX_BALANCING_DROP = 2.0


def check(ctx: RuleContext) -> Iterator[Finding]:
    limit = ctx.options["spread_limit"]
    for a in ctx.analyses:
        c = a.circuit
        assert isinstance(c, (CurrentSink, DriverOutput))
        if len(c.branches) < 2:
            continue
        output = c.sink.transistor.ref if isinstance(c, CurrentSink) else c.driver.ref
        n = len(c.branches)
        refs = tuple(dict.fromkeys((output, *c.refs)))
        if not isinstance(a, CurrentDriven) or a.sharing is None:
            yield ctx.finding(a, Severity.WARNING, "{n} strings ({leds}) share one constant-current output, "
                              "{output}: the current splits by forward voltage, not evenly (not computed: {why})",
                              refs=refs, n=n, leds=ids(c.leds), output=output,
                              why="; ".join(m.reason for m in a.missing) or "not analysed",
                              hint="give each string its own output, or a balancing resistor")
            continue
        s = a.sharing
        stand_in = any(not r.params.complete for r in a.leds)
        if a.set_current.current.maximum <= 0:
            continue  # the output never conducts: driver-headroom says so
        worst = next(r for r in a.leds if r.id == s.worst_led)
        if_max = worst.params.if_max
        over = isinstance(if_max, Param) and s.worst_current > if_max.value
        if over:
            severity = Severity.ERROR
        elif s.spread_p99 > limit:
            severity = Severity.WARNING
        else:
            continue
        assumed = stand_in or (over and isinstance(if_max, Param) and if_max.assumed)
        severity = by_evidence(severity, assumed)
        values = [Value("share", s.equal_share, "A"), Value("spread", s.spread_p99, "%", limit, ">"),
                  Value("worst", s.worst_current, "A", if_max.value if isinstance(if_max, Param) else None, ">"),
                  Value("total", a.set_current.current.nominal, "A")]
        template = ("{n} strings share {output}'s {total}: {share} each on paper, but the split varies by up to "
                    "{spread} of the mean (99th percentile of {samples} Monte Carlo samples) and the string with {led} can "
                    "take {worst}")
        if isinstance(if_max, Param):
            values.append(Value("if_max", if_max.value, "A"))
            template += ", above its If_max of {if_max}" if over else " (If_max {if_max})"
        balancing = any(r.role is ResistorRole.BALANCING for r in a.resistors)
        if not balancing:
            template += "; no balancing resistors"
        if stand_in:
            template += " (LED type unknown: the split assumes 2.0 V ±10 % per LED)"
        notes = [x for r in a.leds for x in led_assumptions(r, limit=r is worst)][:6] + circuit_assumptions(a)
        yield ctx.finding(a, severity, template, refs=refs, values=tuple(values), n=n, output=output,
                          samples=s.samples, led=s.worst_led, hint=_hint(ctx, a, limit), assumed=tuple(notes))


def _hint(ctx: RuleContext, a: CurrentDriven, limit: float) -> str:
    from ledlint.analysis.sizing import balancing_for  # the engine loads only when a hint is sized

    text = "give each string its own output or sink transistor"
    fix = balancing_for(a, limit)
    if fix is None:
        return text
    # The drop must come out of the output's headroom, or the output stops regulating; where the
    # headroom is not known, more than a couple of volts wastes more than it balances.
    present = max(b.r.nominal for b in a.engine[0].branches) * a.sharing.equal_share if a.engine and a.sharing else 0.0
    room = a.headroom_v + present if a.headroom_v is not None else _MAX_BALANCING_DROP  # what is there now counts
    if fix.drop > room:
        why = (f"more than the {quantity(room, 'V')} of headroom the output has" if a.headroom_v is not None
               else "too much to waste")
        return text + (f" (a balancing resistor would have to drop {quantity(fix.drop, 'V')} per string to hold "
                       f"the split within {quantity(limit, '%')}: {why})")
    factor = ctx.option_of(DESIGN_FACTOR)
    chip = chip_for(fix.power_max / factor)
    size = f", rated at least {quantity(fix.power_max / factor, 'W')} ({chip[0] + ' or larger' if chip else 'a power resistor'})"
    part = f"{quantity(fix.resistance, 'Ω')} {fix.tolerance * 100:g} % (E24)"
    how = (f"raise each string's balancing resistance to {part}" if fix.replaces else
           f"put {part} in series with each string")
    left = f", leaving {quantity(room - fix.drop, 'V')} of headroom," if a.headroom_v is not None else ""
    return text + (f", or {how}: it drops {quantity(fix.drop, 'V')}{left} and brings the split to "
                   f"{quantity(fix.spread, '%')} (Monte Carlo, as above){size}")


RULE = Rule(
    id="driver-parallel-strings",
    summary="strings in parallel on one constant-current output: the split follows Vf",
    severity=Severity.ERROR,
    check=check,
    options=(Option("spread_limit", 0.10, "fraction of the mean", "split unevenness from which to warn", 0.01, 1.0),),
    doc=__doc__,
    kinds=(CircuitKind.SINK, CircuitKind.DRIVER),
)
