"""Netlist diff: circuit by circuit, what a change did electrically, and the findings it moved."""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass
from enum import Enum
from pathlib import Path
from collections.abc import Iterable

from ledlint.analysis.results import Analysis, Computed, Driven, VoltageDriven
from ledlint.circuits.string import SeriesString
from ledlint.checks.findings import Finding
from ledlint.netlist.model import Component
from ledlint.circuits.circuit import LedCircuit
from ledlint.review.run import FileResult, check
from ledlint.quantities.units import quantity


class Status(Enum):
    ADDED = "added"
    REMOVED = "removed"
    CHANGED = "changed"
    UNCHANGED = "unchanged"


class Measure(Enum):
    CURRENT = "current"  # per LED, A
    DISSIPATION = "dissipation"  # per resistor at its worst corner, W
    HEADROOM = "headroom"  # per circuit at the low corner, V


_UNITS = {Measure.CURRENT: "A", Measure.DISSIPATION: "W", Measure.HEADROOM: "V"}


@dataclass(frozen=True)
class Reading:
    """One computed figure: its value, and for a current the least and most over the corners."""

    value: float
    low: float | None = None
    high: float | None = None

    def text(self, unit: str) -> str:
        if self.low is None or self.high is None:
            return quantity(self.value, unit)
        return f"{quantity(self.value, unit)} ({quantity(self.low, unit)} – {quantity(self.high, unit)})"

    def same(self, other: Reading) -> bool:
        """Equal to three significant figures, the precision every report prints."""
        return all(_sig(a) == _sig(b) for a, b in ((self.value, other.value), (self.low, other.low),
                                                   (self.high, other.high)))


def _sig(x: float | None) -> str:
    return "" if x is None else f"{x:.3g}"


@dataclass(frozen=True)
class Moved:
    """A figure that differs between the two netlists; None where one side has no such figure."""

    quantity: Measure
    subject: str  # the LED die or the resistor; "" for the circuit's headroom
    old: Reading | None
    new: Reading | None

    @property
    def unit(self) -> str:
        return _UNITS[self.quantity]

    @property
    def label(self) -> str:
        return "headroom" if self.quantity is Measure.HEADROOM else f"{self.quantity.value} {self.subject}"

    def side(self, reading: Reading | None) -> str:
        return "—" if reading is None else reading.text(self.unit)


@dataclass(frozen=True)
class Edit:
    """A change to one of a circuit's parts, as the schematic shows it: what a reviewer looks for
    behind a current that moved ("R8 value 330 → 100")."""

    ref: str
    what: str  # "value", "footprint", "fitted", a field's name; "part" when added or removed
    old: str | None  # None: the part or field is new
    new: str | None  # None: it was removed

    def text(self) -> str:
        if self.what == "part":
            return f"{self.ref} {'added' if self.old is None else 'removed'}"
        return f"{self.ref} {self.what} {edit_text(self.old)} → {edit_text(self.new)}"


def edit_text(text: str | None) -> str:
    """A field's text as a change shows it: — for none, quoted when blank or padded."""
    return "—" if text is None else repr(text) if not text or text != text.strip() else text


def edits(old: Component | None, new: Component | None) -> tuple[Edit, ...]:
    """What differs between two versions of one part."""
    if old is None or new is None:
        ref = (new or old).ref  # type: ignore[union-attr]  # one side is always there
        return (Edit(ref, "part", None if old is None else "", None if new is None else ""),)
    out = [Edit(new.ref, what, a, b) for what, a, b in (("value", old.value, new.value),
                                                         ("footprint", old.footprint, new.footprint),
                                                         ("fitted", _fitted(old), _fitted(new))) if a != b]
    for name in dict.fromkeys([*old.fields, *new.fields]):
        a, b = old.fields.get(name), new.fields.get(name)
        if a != b:
            out.append(Edit(new.ref, name, a, b))
    before, after = _wiring(old), _wiring(new)
    if before != after:  # rewired: a part turned round, moved to another net
        out.append(Edit(new.ref, "pins", before, after))
    return tuple(out)


def _wiring(c: Component) -> str:
    return ", ".join(f"{p.number} {p.net or '(no net)'}" for p in sorted(c.pins, key=lambda p: (len(p.number), p.number)))


def _fitted(c: Component) -> str:
    return "no (DNP)" if c.dnp else "yes"


@dataclass(frozen=True)
class CircuitDiff:
    status: Status
    old: LedCircuit | None
    new: LedCircuit | None
    moved: tuple[Moved, ...] = ()
    appeared: tuple[Finding, ...] = ()
    gone: tuple[Finding, ...] = ()
    elsewhere: tuple[str, ...] = ()  # added or removed: circuits on the other side that hold some of its LEDs
    edits: tuple[Edit, ...] = ()  # changed: what was edited in its parts

    @property
    def id(self) -> str:
        return (self.new or self.old).id  # type: ignore[union-attr]  # one side is always there

    @property
    def kind(self) -> str:
        old, new = (c.kind.value if c else "" for c in (self.old, self.new))
        return f"{old} → {new}" if old and new and old != new else new or old

    @property
    def leds(self) -> tuple[str, ...]:
        """The LED parts of the circuit, on the newer side when there is one."""
        return _leds(self.new or self.old)

    def describe(self) -> str:
        """The status with how the LEDs moved between circuits."""
        parts = [f"LEDs added {', '.join(self.leds_added)}"] if self.leds_added else []
        parts += [f"LEDs removed {', '.join(self.leds_removed)}"] if self.leds_removed else []
        if self.elsewhere:
            parts.append(("its LEDs were in " if self.status is Status.ADDED else "its LEDs are now in ")
                         + ", ".join(self.elsewhere))
        return self.status.value + "".join(f", {p}" for p in parts)

    @property
    def leds_added(self) -> tuple[str, ...]:
        return tuple(x for x in _leds(self.new) if self.old and x not in _leds(self.old))

    @property
    def leds_removed(self) -> tuple[str, ...]:
        return tuple(x for x in _leds(self.old) if self.new and x not in _leds(self.new))


@dataclass(frozen=True)
class NetlistDiff:
    old_path: str
    new_path: str
    circuits: tuple[CircuitDiff, ...]  # new netlist's order, then the removed ones
    appeared: tuple[Finding, ...]  # findings tied to no circuit
    gone: tuple[Finding, ...]

    def counts(self) -> dict[str, int]:
        out = {s.value: sum(c.status is s for c in self.circuits) for s in Status}
        out["findings_appeared"] = len(self.appeared) + sum(len(c.appeared) for c in self.circuits)
        out["findings_gone"] = len(self.gone) + sum(len(c.gone) for c in self.circuits)
        return out

    def summary(self) -> str:
        n = self.counts()
        return (f"{n['changed']} circuit(s) changed, {n['added']} added, {n['removed']} removed, "
                f"{n['unchanged']} unchanged · {n['findings_appeared']} finding(s) appeared, "
                f"{n['findings_gone']} went away")


def _leds(c: LedCircuit | None) -> tuple[str, ...]:
    return c.led_refs if c else ()


def readings(a: Analysis) -> dict[tuple[Measure, str], Reading]:
    """The figures a reviewer follows for one circuit, keyed by what they measure."""
    out: dict[tuple[Measure, str], Reading] = {}
    if not isinstance(a, Computed):
        return out
    c = a.circuit
    blocked = isinstance(c, SeriesString) and c.blocked
    if a.reversed or (isinstance(c, SeriesString) and blocked and not c.reversed_switches):
        # Reversed, or a string that never conducts: leakage only, so its LEDs read 0 A.
        return {(Measure.CURRENT, str(led.id)): Reading(0.0) for led in a.leds}
    if not blocked:
        for led in a.leds:
            out[(Measure.CURRENT, str(led.id))] = Reading(led.current.nominal, led.current.minimum,
                                                           led.current.maximum)
    for r in a.resistors:
        out[(Measure.DISSIPATION, r.ref)] = Reading(r.power_max)
    if isinstance(a, Driven) and a.headroom_v is not None:
        out[(Measure.HEADROOM, "")] = Reading(a.headroom_v)
    return out


def _moved(old: Analysis | None, new: Analysis | None) -> tuple[Moved, ...]:
    before = readings(old) if old else {}
    after = readings(new) if new else {}
    order = list(Measure)
    out = []
    for key in sorted(dict.fromkeys([*after, *before]), key=lambda k: order.index(k[0])):  # stable sort
        b, a = before.get(key), after.get(key)
        if b is None or a is None or not b.same(a):
            out.append(Moved(key[0], key[1], b, a))
    return tuple(out)


def _difference(before: Iterable[Finding],
                after: Iterable[Finding]) -> tuple[tuple[Finding, ...], tuple[Finding, ...]]:
    """(appeared, gone): findings compared by fingerprint and severity, each accounting for one on
    the other side; a warning that became an error shows as one gone and one appeared."""
    before, after = list(before), list(after)

    def missing(xs: list[Finding], ys: list[Finding]) -> tuple[Finding, ...]:
        left = Counter((f.fingerprint, f.severity) for f in ys)
        out = []
        for f in xs:
            if left[(f.fingerprint, f.severity)] > 0:
                left[(f.fingerprint, f.severity)] -= 1
            else:
                out.append(f)
        return tuple(out)

    return missing(after, before), missing(before, after)


def _pairs(old: tuple[LedCircuit, ...], new: tuple[LedCircuit, ...]) -> list[tuple[LedCircuit | None, LedCircuit | None]]:
    """Match circuits by their LEDs: the same set first, then the largest overlap (LEDs regrouped)."""
    def key(c: LedCircuit) -> frozenset[str]:
        return frozenset(_leds(c)) or frozenset({"circuit " + c.id})

    match: dict[int, int] = {}
    by_key = {key(c): i for i, c in enumerate(old)}
    for j, c in enumerate(new):
        i = by_key.get(key(c))
        if i is not None and i not in match.values():
            match[j] = i
    overlaps = sorted(((len(key(n) & key(o)), j, i) for j, n in enumerate(new) if j not in match
                       for i, o in enumerate(old) if i not in match.values() and key(n) & key(o)),
                      key=lambda t: (-t[0], t[1], t[2]))
    for _, j, i in overlaps:
        if j not in match and i not in match.values():
            match[j] = i
    pairs: list[tuple[LedCircuit | None, LedCircuit | None]] = [
        (old[match[j]] if j in match else None, c) for j, c in enumerate(new)]
    pairs += [(c, None) for i, c in enumerate(old) if i not in match.values()]
    return pairs


def compare(old: FileResult, new: FileResult) -> NetlistDiff:
    """What changed from one checked netlist to the other, circuit by circuit."""
    old_analyses = {a.circuit.id: a for a in old.board.analyses}
    new_analyses = {a.circuit.id: a for a in new.board.analyses}

    def findings(fr: FileResult, c: LedCircuit | None) -> list[Finding]:
        return [f for f in fr.findings if c is not None and f.circuit == c.id]

    def holding(c: LedCircuit | None, side: tuple[LedCircuit, ...]) -> tuple[str, ...]:
        return tuple(o.id for o in side if set(_leds(o)) & set(_leds(c)))

    def driving(a: Analysis | None) -> list[str]:
        return [r for d in (a.drives if isinstance(a, VoltageDriven) else ()) for r in (d.resistor, d.pin.ref) if r]

    def parts_edited(before: LedCircuit, after: LedCircuit) -> tuple[Edit, ...]:
        # The circuit's own parts and what drives its switches (a base or gate resistor).
        refs = dict.fromkeys([*after.refs, *before.refs, *driving(new_analyses.get(after.id)),
                              *driving(old_analyses.get(before.id))])
        return tuple(e for ref in refs for e in edits(old.netlist.component(ref), new.netlist.component(ref)))

    out = []
    for before, after in _pairs(old.board.circuits, new.board.circuits):
        moved = _moved(old_analyses.get(before.id) if before else None, new_analyses.get(after.id) if after else None)
        appeared, gone = _difference(findings(old, before), findings(new, after))
        elsewhere: tuple[str, ...] = ()  # for an added or removed circuit
        changes = parts_edited(before, after) if before and after else ()
        if before is None:
            status, elsewhere = Status.ADDED, holding(after, old.board.circuits)
        elif after is None:
            status, elsewhere = Status.REMOVED, holding(before, new.board.circuits)
        elif (moved or appeared or gone or changes or before.kind != after.kind
              or set(_leds(before)) != set(_leds(after))):
            status = Status.CHANGED
        else:
            status = Status.UNCHANGED
        out.append(CircuitDiff(status, before, after, moved, appeared, gone, elsewhere, changes))
    ids_old = {c.id for c in old.board.circuits}
    ids_new = {c.id for c in new.board.circuits}
    appeared, gone = _difference((f for f in old.findings if f.circuit not in ids_old),
                                 (f for f in new.findings if f.circuit not in ids_new))
    return NetlistDiff(old.path, new.path, tuple(out), appeared, gone)


def diff_files(old: str | Path, new: str | Path, *, config_path: str | None = None) -> NetlistDiff:
    """Check both netlists (each with its own configuration, unless one is given) and compare them."""
    before, after = check([old], config_path=config_path), check([new], config_path=config_path)
    return compare(before.files[0], after.files[0])
