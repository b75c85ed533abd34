"""Output formats: one module per format, each consuming findings, rule metadata and circuit summaries;
the wording they share."""

from __future__ import annotations

import re

from ledlint.analysis.summary import CircuitRow, Outcome

# C0 and C1 control characters but tab and newline: a netlist could carry terminal escapes in a
# name or value, and a report must not pass them to the reader's terminal or CI log.
_CONTROL = re.compile(r"[\x00-\x08\x0b-\x1f\x7f-\x9f]")


def printable(text: str) -> str:
    """Text with control characters shown as U+FFFD."""
    return _CONTROL.sub("\ufffd", text)


SAFETY = ("Mains and high-voltage LED circuits can kill. These findings are a review aid, not a safety "
          "assessment: follow the applicable safety standards and local codes, and have the design "
          "reviewed by a qualified person.")
_MAX_REFS = 8


def refs_text(refs: tuple[str, ...]) -> str:
    """Part references as a report lists them: the first eight, then how many in all."""
    return ", ".join(refs[:_MAX_REFS]) + (f" … ({len(refs)} parts)" if len(refs) > _MAX_REFS else "")


_OUTCOME = {
    Outcome.COMPUTED: "",
    Outcome.ADDRESSABLE: "not analysed electrically: each LED sets its own current",
    Outcome.MULTIPLEXED: "not analysed electrically yet: multiplexed",
    Outcome.NOT_FITTED: "not fitted",
    Outcome.UNRECOGNISED: "{detail}",
    Outcome.SWAPPED_SWITCH: "not analysed: {detail} fitted backwards",
    Outcome.NEVER_CONDUCTS: "never conducts: {detail}",
    Outcome.REVERSED: "reversed: never conducts",
    Outcome.MISSING: "not computed: {detail} unknown",
}


def circuit_note(r: CircuitRow) -> str:
    """Why a circuit has no figures, in words; "" when it has them."""
    return _OUTCOME[r.outcome].format(detail=r.detail)
