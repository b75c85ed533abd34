"""Output formats: one module per format, each consuming findings, rule metadata and circuit summaries;
the wording they share."""

from __future__ import annotations

from ledlint.analysis.summary import CircuitRow, Outcome
from ledlint.sanitise import clip, printable, shown

__all__ = ["MAX_NOTES", "SAFETY", "circuit_note", "printable", "refs_text", "shown"]

SAFETY = ("Mains and high-voltage LED circuits can kill. These findings are a review aid, not a safety "
          "assessment: follow the applicable safety standards and local codes, and have the design "
          "reviewed by a qualified person.")
_MAX_REFS = 8
MAX_NOTES = 20  # reader notes a human-facing report lists per file; JSON and SARIF keep them all


def refs_text(refs: tuple[str, ...]) -> str:
    """Part references as a report lists them: the first eight, then how many in all."""
    return ", ".join(map(clip, refs[:_MAX_REFS])) + (f" … ({len(refs)} parts)" if len(refs) > _MAX_REFS else "")


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
