"""Findings: one frozen record per problem, its message built from a template and typed values."""

from __future__ import annotations

import hashlib
from dataclasses import dataclass, field
from enum import Enum

from ledlint.quantities.units import quantity


# The thresholds a run can fail at: a severity and those above it, or never.
FAIL_LEVELS = ("error", "warning", "info", "never")


class Severity(Enum):
    ERROR = "error"
    WARNING = "warning"
    INFO = "info"

    @property
    def rank(self) -> int:
        return {"error": 3, "warning": 2, "info": 1}[self.value]

    def lowered(self) -> Severity:
        """One step down: what a finding becomes when its limit is only a built-in default."""
        return {Severity.ERROR: Severity.WARNING, Severity.WARNING: Severity.INFO}.get(self, Severity.INFO)


@dataclass(frozen=True)
class Value:
    """A computed quantity or limit: value in SI units and its unit symbol ("A", "W", "V", "Ω", "", "%")."""

    name: str
    value: float
    unit: str
    limit: float | None = None  # the limit this value is compared with, same unit
    relation: str = ""  # how value stands to limit: ">", "<", ">=", "<="

    def text(self) -> str:
        """Three figures; more when three would print the value and its limit alike ("125 mW,
        above 125 mW"), so a message never contradicts itself."""
        digits = 3
        if self.limit is not None and self.value != self.limit:
            while digits < 7 and quantity(self.value, self.unit, digits) == quantity(self.limit, self.unit, digits):
                digits += 1
        return quantity(self.value, self.unit, digits)


def render(template: str, **args: object) -> str:
    """Fill a message template; Value arguments print with their units."""
    return template.format(**{k: v.text() if isinstance(v, Value) else v for k, v in args.items()})


def fingerprint(rule: str, refs: tuple[str, ...], nets: tuple[str, ...], topic: str = "") -> str:
    """Stable across re-exports: rule, sorted references and sorted nets (and, where one rule
    reports several things about the same parts, what it is about), never line numbers."""
    key = "\x1f".join([rule, ",".join(sorted(refs)), ",".join(sorted(nets))] + ([topic] if topic else []))
    return hashlib.sha256(key.encode()).hexdigest()[:16]


@dataclass(frozen=True)
class Finding:
    rule: str
    severity: Severity
    message: str
    file: str
    line: int
    refs: tuple[str, ...]
    nets: tuple[str, ...]
    sheet: str = "/"
    values: tuple[Value, ...] = ()
    assumed: tuple[str, ...] = ()  # what the numbers rest on that the netlist did not say
    hint: str = ""
    circuit: str = ""  # the circuit's id
    template: str = ""
    fingerprint: str = field(default="")
    waived: str = ""  # the reason, when a waiver silences it
    waived_in_source: bool = False  # the waiver is written on a part in the design itself
    topic: str = ""  # what the finding is about, when one rule says several things of the same parts
    long_texts: tuple[str, ...] = ()  # whole runs of text the message, hint or assumptions show cut

    def __post_init__(self) -> None:
        if not self.fingerprint:
            object.__setattr__(self, "fingerprint", fingerprint(self.rule, self.refs, self.nets, self.topic))

    @property
    def sort_key(self) -> tuple:
        return (-self.severity.rank, self.file, self.line, self.rule, self.refs)
