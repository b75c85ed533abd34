"""Circuit rows: each circuit's operating point as plain values, for every report format."""

from __future__ import annotations

from dataclasses import dataclass

from ledlint.analysis.board import Analysis, ResistorRole
from ledlint.circuits.recognise import CircuitKind
from ledlint.circuits.topology import ElementKind

_NOT_ANALYSED = {
    CircuitKind.ADDRESSABLE: "not analysed electrically: each LED sets its own current",
    CircuitKind.MULTIPLEXED: "not analysed electrically yet: multiplexed",
    CircuitKind.NOT_FITTED: "not fitted",
}


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
    note: str  # why it was not analysed, or what it rests on

    def as_json(self) -> dict[str, object]:
        return {
            "file": self.file, "id": self.id, "kind": self.kind, "leds": list(self.leds),
            "ballast": list(self.ballast), "supply_net": self.supply_net, "return_net": self.return_net,
            "rail": self.rail,
            "current_a": (None if self.current is None else
                          {"nominal": self.current[0], "min": self.current[1], "max": self.current[2]}),
            "resistor_power_w": self.resistor_power_w, "headroom_v": self.headroom_v,
            "analysed": self.analysed, "note": self.note,
        }


def row(path: str, a: Analysis) -> CircuitRow:
    c = a.circuit
    ballast = tuple(dict.fromkeys([e.ref for e in c.elements if e.kind is ElementKind.RESISTOR]
                                  + [r.ref for r in a.resistors if r.role is ResistorRole.SENSE]))
    current = None
    if a.solved and a.leds and not c.blocked:
        nominal = a.nominal_current if a.nominal_current is not None else a.leds[0].current.nominal
        current = (nominal, min(r.current.minimum for r in a.leds), max(r.current.maximum for r in a.leds))
    power = max((r.power_max for r in a.resistors), default=None) if a.solved else None
    note = _NOT_ANALYSED.get(c.kind, c.reason if c.kind is CircuitKind.UNRECOGNISED else "")
    if c.blocked:
        swapped = ", ".join(q.ref for q in c.reversed_switches)
        note = f"not analysed: {swapped} fitted backwards" if swapped else f"never conducts: {c.blocked}"
    elif a.reversed:
        current, power, note = None, None, "reversed: never conducts"
    elif not a.solved and a.missing:
        note = "not computed: " + "; ".join(dict.fromkeys(m.name for m in a.missing)) + " unknown"
    headroom = a.headroom_v if a.solved and current is not None else None
    rail = a.rail or None
    # Strings each switched by their own pin end on those pins' nets: name them, not "?".
    far = [b.far.net for b in c.branches if b.far is not None]
    ends = (", ".join(far[:3]) + (f" … ({len(far)})" if len(far) > 3 else "")) if far else None
    return CircuitRow(path, c.id, c.kind.value, c.leds, ballast, c.source.net if c.source else ends,
                      c.ret.net if c.ret else ends, rail, current, power, headroom, a.solved,
                      note)

