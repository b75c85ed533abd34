"""shared-resistor-bank: LEDs or strings in parallel behind one resistor.

What it flags
    Two or more LEDs (or strings) in parallel whose current is set by one shared resistor.
    Error when the worst LED can exceed its If_max; warning otherwise. When each LED is
    switched by its own pin (a common-anode RGB LED on one resistor, say), an info: the
    sharing only bites if two are lit at once.

Why it matters
    Parallel LEDs do not share a resistor's current evenly: the one with the lowest forward
    voltage takes the most ("current hogging"), gets hotter, drops its Vf further and takes
    more still. The resistor sets only the total. Two LEDs from one reel can differ by 0.1 V;
    with about 10 Ω of dynamic resistance each that is a 10 mA imbalance on a 2 × 10 mA bank.

Example
    D1, D2, D3 (red) in parallel from +5V through one 100 Ω resistor: 33 mA in all, 11 mA each
    on paper, but with each LED's Vf anywhere in its range one of them can take about 36 mA:
    error. Fixed: one 270 Ω resistor per LED (about 12 mA each), or all three in series from a
    12 V rail through one 560 Ω resistor (under 15 mA at the worst corner).

Fix
    Give each LED its own resistor (the hint sizes it for today's per-LED current), or put
    the LEDs in series when the supply leaves enough headroom for the string.

Formula
    I₁ − I₂ ≈ δ / r_d for two LEDs on one node, independent of R (R sets only the total);
    the report's spread is from a Monte Carlo with each LED's Vf uniform in its range,
    resistor and supply tolerances, and the hogging corner (one LED at Vf min, the rest at
    Vf max, highest supply, lowest R).

Source
    Current hogging of parallel LEDs: LEDs Magazine, "LED Design Forum: Avoiding thermal
    runaway when driving multiple LED strings" (2009). The
    δ / r_d relation follows from the Shockley equation (common practice).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.checks.findings import Finding, Severity, Value, quantity
from ledlint.parts.params import Param, known
from ledlint.analysis.results import Computed, Driven, Incomplete
from ledlint.checks.registry import Rule, RuleContext
from ledlint.circuits.bank import ResistorBank
from ledlint.circuits.circuit import CircuitKind
from ledlint.rules._support import ballast_hint, by_evidence, circuit_assumptions, ids, join, led_assumptions


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        c = a.circuit
        assert isinstance(c, ResistorBank)
        shared = [e.ref for e in c.shared_resistors]
        if not shared:
            continue  # strings each with their own resistor, sharing only a switch: current-margin's
        leds = list(c.leds)
        refs = tuple(dict.fromkeys(shared + list(c.led_refs)))
        nets = (c.node,)
        strings = [b.leds for b in c.branches]
        if any(len(st) > 1 for st in strings):
            who = (f"{len(strings)} strings ({'; '.join(ids([e.id for e in st]) for st in strings[:4])}"
                   f"{'; …' if len(strings) > 4 else ''}) in parallel behind {join(shared)}")
        else:
            who = f"{ids(leds)} in parallel behind {join(shared)}"
        if c.individually_driven:
            pins = sorted({b.far.pin.ref + " " + (b.far.pin.name or b.far.pin.number)
                           for b in c.branches if b.far and b.far.pin})
            yield ctx.finding(a, Severity.INFO, "{who} on {node}, each switched by its own pin ({pins}); if two "
                              "are lit at once the one with the lowest Vf takes most of the current",
                              refs=refs, nets=nets, who=who, node=c.node, pins=", ".join(pins),
                              hint="fine if only one is ever lit at a time; otherwise give each its own resistor",
                              assumed=tuple(a.assumptions) if isinstance(a, (Computed, Incomplete)) else ())
            continue
        if not isinstance(a, Driven) or a.sharing is None:
            yield ctx.finding(a, Severity.WARNING, "{who} on {node}: the current splits by forward voltage, not "
                              "evenly (the split could not be computed: {why})", refs=refs, nets=nets, who=who,
                              node=c.node, why="; ".join(m.reason for m in a.missing) or "not analysed",
                              hint="give each LED its own resistor")
            continue
        s = a.sharing
        worst = next(r for r in a.leds if r.id == s.worst_led)
        if_max = worst.params.if_max
        over = isinstance(if_max, Param) and s.worst_current > if_max.value
        severity = Severity.ERROR if over else Severity.WARNING
        assumed = over and isinstance(if_max, Param) and if_max.assumed and not (
            worst.params.if_max_upper and s.worst_current > worst.params.if_max_upper)
        severity = by_evidence(severity, assumed)
        values = [Value("share", s.equal_share, "A"), Value("spread", s.spread_p99, "%"),
                  Value("worst", s.worst_current, "A", if_max.value if isinstance(if_max, Param) else None, ">")]
        template = ("{who} on {node}: the current splits by Vf, not evenly. Equal share {share} each, but "
                    "the split varies by up to {spread} of the mean (99th percentile of {samples} Monte Carlo "
                    "samples) and {led} can reach {worst}")
        if isinstance(if_max, Param):
            values.append(Value("if_max", if_max.value, "A"))
            template += ", above its If_max of {if_max}" if over else " (If_max {if_max})"
        yield ctx.finding(a, severity, template, refs=refs, nets=nets, values=tuple(values), who=who, node=c.node,
                          samples=s.samples, led=s.worst_led, hint=_hint(ctx, a),
                          assumed=tuple(led_assumptions(worst, limit=True) + circuit_assumptions(a)))


def _hint(ctx: RuleContext, a: Driven) -> str:
    """One resistor per string, sized against every limit; or all in series when the supply allows."""
    c = a.circuit
    assert isinstance(c, ResistorBank)
    hint = ballast_hint(ctx, a, "give each LED its own resistor")
    by_id = {r.id: r for r in a.leds}
    strings = [[by_id[e.led] for e in b.leds] for b in c.branches]
    if a.supply is None or a.sharing is None:
        return hint
    string_max = max(sum(known(r.params.vf_max) for r in st) for st in strings)
    string_typ = max(sum(known(r.params.vf) for r in st) for st in strings)
    v = a.supply.volts
    series_v = len(strings) * string_max
    if v.minimum - series_v >= 1.0:
        from ledlint.analysis.sizing import equal_share_resistor  # the engine loads only when a hint is sized

        leds = sum(len(st) for st in strings)
        r = equal_share_resistor(v.nominal, len(strings) * string_typ, a.sharing.equal_share)
        if r:
            hint += (f"; or put all {leds} in series with one {quantity(r, 'Ω')} resistor (string "
                     f"{quantity(series_v, 'V')} at most, supply {quantity(v.minimum, 'V')} at least)")
    return hint


RULE = Rule(
    id="shared-resistor-bank",
    summary="LEDs or strings in parallel behind one resistor: the current splits by Vf",
    severity=Severity.ERROR,
    check=check,
    doc=__doc__,
    kinds=(CircuitKind.BANK,),
)
