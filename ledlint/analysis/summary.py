"""The board and circuit summaries every report format reads: each circuit's operating point as
plain values, why a circuit has none, and what the board holds. Reports compute nothing."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterable
from enum import Enum

from ledlint.analysis.results import Analysis, BoardAnalysis, Computed, Driven, ResistorRole
from ledlint.circuits.circuit import CircuitKind, Wired
from ledlint.circuits.string import SeriesString
from ledlint.circuits.unrecognised import Unrecognised
from ledlint.frozen import FrozenMap
from ledlint.netlist.model import Note
from ledlint.parts.kinds import led_parts

# Kinds the analysis never computes: a circuit of one of them is counted under its kind's name,
# any other that has no figures as "missing a value".
NOT_ANALYSED = (CircuitKind.ADDRESSABLE, CircuitKind.MULTIPLEXED, CircuitKind.NOT_FITTED, CircuitKind.UNRECOGNISED)


class Outcome(Enum):
    """What a circuit's row says in place of figures, when it has none (the words are the reports')."""

    COMPUTED = "computed"
    ADDRESSABLE = "addressable"
    MULTIPLEXED = "multiplexed"
    NOT_FITTED = "not-fitted"
    UNRECOGNISED = "unrecognised"  # detail: what the recogniser saw
    SWAPPED_SWITCH = "swapped-switch"  # detail: the transistors fitted backwards
    NEVER_CONDUCTS = "never-conducts"  # detail: what faces the wrong way
    REVERSED = "reversed"
    MISSING = "missing"  # detail: the names of what is missing


_BY_KIND = {CircuitKind.ADDRESSABLE: Outcome.ADDRESSABLE, CircuitKind.MULTIPLEXED: Outcome.MULTIPLEXED,
            CircuitKind.NOT_FITTED: Outcome.NOT_FITTED, CircuitKind.UNRECOGNISED: Outcome.UNRECOGNISED}


@dataclass(frozen=True)
class CircuitRow:
    file: str
    id: str
    kind: str
    leds: tuple[str, ...]
    ballast: tuple[str, ...]
    supply_net: str | None
    return_net: str | None
    rail: str | None  # the rail the current comes from (a driver pin's: its IC's supply)
    current: tuple[float, float, float] | None  # per LED: nominal, least, most (A)
    resistor_power_w: float | None
    headroom_v: float | None
    analysed: bool
    outcome: Outcome
    detail: str = ""  # the outcome's particulars, for the words a report builds


def row(path: str, a: Analysis) -> CircuitRow:
    c = a.circuit
    resistors = a.resistors if isinstance(a, Computed) else ()
    ballast = tuple(dict.fromkeys([e.ref for e in c.resistors] + [r.ref for r in resistors
                                                                   if r.role is ResistorRole.SENSE]))
    current = None
    if isinstance(a, Driven) and a.leds:
        current = (a.nominal_current, min(r.current.minimum for r in a.leds), max(r.current.maximum for r in a.leds))
    power = max((r.power_max for r in resistors), default=None) if a.solved else None
    outcome, detail = _BY_KIND.get(c.kind, Outcome.COMPUTED), c.reason if isinstance(c, Unrecognised) else ""
    if isinstance(c, SeriesString) and c.blocked:
        swapped = ", ".join(q.ref for q in c.reversed_switches)
        outcome, detail = (Outcome.SWAPPED_SWITCH, swapped) if swapped else (Outcome.NEVER_CONDUCTS, c.conflict_text())
    elif isinstance(a, Computed) and a.reversed:
        current, power, outcome = None, None, Outcome.REVERSED
    elif not a.solved and a.missing:
        outcome, detail = Outcome.MISSING, "; ".join(dict.fromkeys(m.name for m in a.missing))
    headroom = a.headroom_v if isinstance(a, Driven) and current is not None else None
    ends: str | None = None
    if isinstance(c, Wired):
        # Strings each switched by their own pin end on those pins' nets: name them, not "?".
        far = [b.far.net for b in c.branches if b.far is not None]
        ends = (", ".join(far[:3]) + (f" … ({len(far)})" if len(far) > 3 else "")) if far else None
    source, ret = c.ends
    return CircuitRow(path, c.id, c.kind.value, tuple(str(i) for i in c.leds), ballast,
                      source.net if source else ends, ret.net if ret else ends, a.rail or None, current, power,
                      headroom, a.solved, outcome, detail)


@dataclass(frozen=True)
class PartLine:
    """Where a part is written, for a report's links: its file (when not the netlist) and line."""

    line: int
    value: str
    file: str = ""


@dataclass(frozen=True)
class BoardSummary:
    """What one board holds and how much of it was analysed: the reports' view of it."""

    path: str
    version: str
    tool: str
    components: int
    nets: int
    leds: int  # LED packages, plain or addressable
    dies: int  # light-emitting dies in circuits
    circuits: int
    analysed: int
    skipped: tuple[tuple[str, int], ...]  # circuits without figures, by why: a kind's name or "missing a value"
    notes: tuple[Note, ...]
    cautions: tuple[str, ...]
    rows: tuple[CircuitRow, ...]
    parts: FrozenMap

    def part(self, ref: str) -> PartLine | None:
        found = self.parts.get(ref)
        return found if isinstance(found, PartLine) else None


def summarise(path: str, board: BoardAnalysis, refs: Iterable[str] = ()) -> BoardSummary:
    """What the reports show of a board; where the parts named in `refs` (those the findings
    name) are written, for links to them."""
    n = board.netlist
    skipped: dict[str, int] = {}
    for a in board.analyses:
        if not a.solved:
            why = a.circuit.kind.value if a.circuit.kind in NOT_ANALYSED else "missing a value"
            skipped[why] = skipped.get(why, 0) + 1
    return BoardSummary(
        path=path, version=n.version, tool=n.tool, components=len(n.components), nets=len(n.nets),
        leds=led_parts(n.components), dies=sum(len(c.leds) for c in board.circuits), circuits=len(board.circuits),
        analysed=sum(a.solved for a in board.analyses), skipped=tuple(sorted(skipped.items())), notes=n.notes,
        cautions=board.cautions, rows=tuple(row(path, a) for a in board.analyses),
        parts=FrozenMap({c.ref: PartLine(c.line, c.value, c.file) for r in dict.fromkeys(refs)
                         if (c := n.component(r)) is not None}))
