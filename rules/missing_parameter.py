"""missing-parameter: a check could not run because a value is not in the netlist.

What it flags
    An LED circuit the tool recognised but could not compute, because something it needs is
    not known: a rail with no voltage in its name, an LED whose colour (and so Vf) is not
    stated, a resistor value it cannot read, a driver IC nobody described. The finding names
    the field or configuration key to add. One finding per missing thing, listing every
    circuit it holds up.

Why it matters
    A silent skip would read as a pass. The reviewer should see which LEDs went unchecked
    and what one line of configuration would let the tool check them.

Example
    D2 is "LED" with no colour on a net named VCC: "supply voltage: net VCC has no voltage
    in its name; set it in ledlint.toml: a table [rails."VCC"] with nominal = 5.0" and "Vf: the colour
    is not stated; add a field Vf (e.g. Vf = 2.0V@20mA)".

Fix
    Add the field to the part in the schematic (Vf, Vf_max, If_max, Power, Tolerance, ...)
    or the key to ledlint.toml, as the finding says.

Formula
    None: this rule reports what the others could not compute.

Source
    Common practice: a review lists what it did not check.
"""

from __future__ import annotations

from typing import Iterator

from ledlint.checks.findings import Finding, Severity
from ledlint.checks.registry import Rule, RuleContext
from ledlint.circuits.circuit import CircuitKind
from ledlint.rules._support import ids


def check(ctx: RuleContext) -> Iterator[Finding]:
    groups: dict[tuple[str, str], list] = {}
    reasons: dict[tuple[str, str], str] = {}
    for a in ctx.analyses:
        for m in a.missing + a.gaps:
            if m.fault:
                continue  # not a gap but a fault: unlimited-led reports it
            groups.setdefault((m.name, m.fix), []).append(a)
            reasons.setdefault((m.name, m.fix), m.reason)
    for (name, fix), analyses in groups.items():
        reason = reasons[(name, fix)]
        first = analyses[0]
        leds = [i for a in analyses for i in a.circuit.leds]
        refs = tuple(dict.fromkeys(r for a in analyses for r in a.circuit.refs))
        nets = tuple(dict.fromkeys(n for a in analyses for n in a.circuit.nets))
        gap = any(m.name == name and m.fix == fix for a in analyses for m in a.gaps)
        partly = all(a.solved for a in analyses)
        # A gap leaves the other rules running; only current-margin lacked what it needs. A
        # current sink or driver sets its current without the supply, so only the headroom waits.
        if gap:
            template = "{name} unknown, so current-margin could not judge {leds}: {reason}"
        elif partly:
            template = "{name} unknown, so the headroom of {leds} could not be checked: {reason}"
        else:
            template = "{name} unknown, so {leds} could not be checked: {reason}"
        yield ctx.finding(first, Severity.INFO, template, refs=refs, nets=nets, name=name, leds=ids(leds),
                          reason=reason, hint=fix, topic=name)


RULE = Rule(
    id="missing-parameter",
    summary="a check could not run: names the field or key to add",
    severity=Severity.INFO,
    check=check,
    doc=__doc__,
    kinds=tuple(CircuitKind),  # a value any circuit lacks
)
