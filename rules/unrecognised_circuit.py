"""unrecognised-circuit: an LED in a connection the tool does not know how to analyse.

What it flags
    An LED that is not part of a series string, a shared-resistor bank, a current sink, a
    driver output, an addressable chain or a multiplexed matrix: for example an LED whose
    cathode goes off the board through a connector, or sits on a node with other parts. The
    finding says what the tool saw.

Why it matters
    Every LED is accounted for: none is silently skipped. An unrecognised LED was not
    checked, and the reviewer should look at it by hand.

Example
    D3's anode through R63 from +VIN, its cathode on a heater connector pin: the return is
    off the board, so the current is not known from the netlist.

Fix
    Nothing to fix on the board as such; check the circuit by hand, or waive the finding with
    the reason once it has been.

Formula
    None.

Source
    Common practice: a review lists what it did not check.
"""

from __future__ import annotations

from typing import Iterator

from ledlint.findings import Finding, Severity
from ledlint.recognise import CircuitKind
from ledlint.registry import Rule, RuleContext
from ledlint.rules._support import ids


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        c = a.circuit
        if c.kind is CircuitKind.UNRECOGNISED:
            yield ctx.finding(a, Severity.INFO, "{leds} not analysed: {reason}", leds=ids(c.leds), reason=c.reason,
                              hint="check this circuit by hand")


RULE = Rule(
    id="unrecognised-circuit",
    summary="an LED in a connection the tool does not analyse, with what it saw",
    severity=Severity.INFO,
    check=check,
    doc=__doc__,
)
