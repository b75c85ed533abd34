"""unrecognised-circuit: an LED in a connection the tool does not know how to analyse.

What it flags
    An LED with an end left open (warning: it can never light), or an LED that is not part of a series string, a shared-resistor bank, a current sink, a
    driver output, an addressable chain or a multiplexed matrix: for example an LED whose
    cathode goes off the board through a connector, or sits on a node with other parts. The
    finding says what the tool saw.

Why it matters
    Every LED is accounted for: none is silently skipped. An unrecognised LED was not
    checked, and the reviewer should look at it by hand.

Example
    An LED's anode through a resistor from +12V, its cathode on a connector pin that goes to
    an off-board switch: the return is off the board, so the current is not known from the
    netlist (info). An LED whose cathode net holds nothing else: it can never light (warning).

Fix
    Connect an open end. Otherwise nothing to fix on the board as such; check the circuit by
    hand, or waive the finding with the reason once it has been.

Formula
    None.

Source
    Common practice: a review lists what it did not check.
"""

from __future__ import annotations

from typing import Iterator

from ledlint.checks.findings import Finding, Severity
from ledlint.circuits.circuit import CircuitKind
from ledlint.circuits.unrecognised import Unrecognised
from ledlint.checks.registry import Rule, RuleContext
from ledlint.rules._support import ids


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        c = a.circuit
        assert isinstance(c, Unrecognised)
        if c.never_lights:
            yield ctx.finding(a, Severity.WARNING, "{leds} can never light: {reason}", leds=ids(c.leds),
                              reason=c.reason, hint="connect the open end, or mark the LED do-not-populate")
        else:
            yield ctx.finding(a, Severity.INFO, "{leds} not analysed: {reason}", leds=ids(c.leds), reason=c.reason,
                              hint="check this circuit by hand")


RULE = Rule(
    id="unrecognised-circuit",
    summary="an LED in a connection the tool does not analyse, with what it saw",
    severity=Severity.INFO,
    check=check,
    doc=__doc__,
    kinds=(CircuitKind.UNRECOGNISED,),
)
