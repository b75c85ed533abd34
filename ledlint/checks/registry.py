"""Rule registry: what a rule is, what it sees, and running a set of rules on one board.

A rule is data: an id (kebab-case), a summary, a default severity, options with defaults and
units, the check function, and its documentation (its module's docstring). Loading the
built-in rules and plugins happens in ledlint.review.run, to the right of the rules themselves.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field, replace
from ledlint.frozen import FrozenMap
from typing import Any, Callable, Iterator, Mapping

from ledlint.analysis.results import Analysis, BoardAnalysis
from ledlint.circuits.circuit import CircuitKind
from ledlint.config import SEVERITIES, Config, suggest
from ledlint.errors import LedlintError
from ledlint.sanitise import clip, long_runs
from ledlint.checks.findings import Finding, Severity, Value, render

_ID = re.compile(r"^[a-z][a-z0-9]*(-[a-z0-9]+)*$")
DOC_SECTIONS = ("What it flags", "Why it matters", "Example", "Fix", "Formula", "Source")


@dataclass(frozen=True)
class Option:
    name: str
    default: float
    unit: str
    doc: str
    minimum: float = 0.0  # the range a value must lie in (inclusive)
    maximum: float = 1.0


@dataclass(frozen=True)
class OptionOf:
    """A rule's option as another rule reads it (a margin, a design factor), so that a fix hint
    agrees with the rule that judges the fix: one definition, one default."""

    rule: str
    option: Option


@dataclass(frozen=True)
class Rule:
    id: str
    summary: str
    severity: Severity
    check: Callable[[RuleContext], Iterator[Finding]]
    options: tuple[Option, ...] = ()
    doc: str = ""
    kinds: tuple[CircuitKind, ...] = ()  # the circuit kinds it reads; () for every kind

    def option_defaults(self) -> dict[str, float]:
        return {o.name: o.default for o in self.options}


@dataclass(frozen=True)
class RuleContext:
    """What a rule sees: one board's analyses and its own options. Read-only."""

    rule: Rule
    board: BoardAnalysis
    path: str  # the netlist as the user named it
    options: Mapping[str, float] = field(default_factory=lambda: FrozenMap({}))
    all_options: Mapping[str, Mapping[str, float]] = field(default_factory=lambda: FrozenMap({}))

    def option_of(self, shared: OptionOf) -> float:
        """Another rule's option, so that hints agree with that rule (a design factor, a margin)."""
        return self.all_options.get(shared.rule, {}).get(shared.option.name, shared.option.default)

    @property
    def analyses(self) -> tuple[Analysis, ...]:
        """The analyses of the circuits of the kinds the rule reads."""
        kinds = self.rule.kinds
        return tuple(a for a in self.board.analyses if not kinds or a.circuit.kind in kinds)

    def finding(self, analysis: Analysis, severity: Severity, template: str, *, refs: tuple[str, ...] | None = None,
                nets: tuple[str, ...] | None = None, values: tuple[Value, ...] = (), assumed: tuple[str, ...] = (),
                hint: str = "", line: int | None = None, topic: str = "", **args: object) -> Finding:
        c = analysis.circuit
        named = {v.name: v for v in values}
        message = render(template, **named, **args)
        texts = (message, hint, *assumed)
        # A value of megabytes is shown cut, and kept whole once in the machine-readable reports.
        long = tuple(dict.fromkeys(run for t in texts for run in long_runs(t)))
        return Finding(rule=self.rule.id, severity=severity, message=clip(message), file=self.path,
                       line=c.line if line is None else line, refs=refs if refs is not None else c.refs,
                       nets=nets if nets is not None else c.nets, sheet=c.sheet, values=values,
                       assumed=tuple(dict.fromkeys(clip(a) for a in assumed)), hint=clip(hint), circuit=c.id,
                       template=template, topic=topic, long_texts=long)


def validate(rule: object, where: str) -> Rule:
    """A rule is well formed: a Rule, a kebab-case id, a summary and its documentation."""
    if not isinstance(rule, Rule):
        raise LedlintError(f"{where}: RULE is not a ledlint Rule")
    if not _ID.match(rule.id):
        raise LedlintError(f"{where}: rule id {rule.id!r} is not kebab-case")
    if not rule.summary or not rule.doc:
        raise LedlintError(f"{where}: rule {rule.id} needs a summary and documentation")
    return rule


@dataclass(frozen=True)
class RuleSettings:
    """Per rule: the options to run with and the severity override ('' for none, 'off' to disable)."""

    options: Mapping[str, Mapping[str, float]]
    severity: Mapping[str, str]


def settings(rules: tuple[Rule, ...], config: Config) -> RuleSettings:
    """Check [rules.<id>] tables against the rules' declared options."""
    by_id = {r.id: r for r in rules}
    options: dict[str, Mapping[str, float]] = {}
    severity: dict[str, str] = {}
    for rid, table in config.rules.items():
        if rid not in by_id:
            raise config.error(f"[rules.{rid}]: no rule {rid!r}{suggest(rid, sorted(by_id))}")
        rule = by_id[rid]
        valid = [o.name for o in rule.options] + ["severity"]
        for key, value in table.items():
            if key not in valid:
                raise config.error(f"[rules.{rid}]: unknown option {key!r}{suggest(key, valid)}")
            if key == "severity":
                if value not in SEVERITIES:
                    raise config.error(f"[rules.{rid}] severity: {value!r}{suggest(str(value), SEVERITIES)}")
                severity[rid] = value
            elif isinstance(value, bool) or not isinstance(value, (int, float)):
                raise config.error(f"[rules.{rid}] {key}: expected a number, not {value!r}")
            else:
                opt = next(o for o in rule.options if o.name == key)
                if not opt.minimum <= value <= opt.maximum:
                    raise config.error(f"[rules.{rid}] {key}: {value!r} is outside {opt.minimum:g} to "
                                       f"{opt.maximum:g} ({opt.unit})")
    for w in config.waivers:
        if w.rule not in by_id:
            raise config.error(f"{w.origin}: no rule {w.rule!r}{suggest(w.rule, sorted(by_id))}")
    for rule in rules:
        merged = rule.option_defaults()
        merged.update({k: float(v) for k, v in config.rules.get(rule.id, {}).items() if k != "severity"})
        options[rule.id] = FrozenMap(merged)
    return RuleSettings(FrozenMap(options), FrozenMap(severity))


def run_rules(rules: tuple[Rule, ...], board: BoardAnalysis, path: str, rule_settings: RuleSettings) -> list[Finding]:
    """Every finding of every enabled rule on one board, severity overrides applied."""
    out: list[Finding] = []
    for rule in rules:
        override = rule_settings.severity.get(rule.id, "")
        if override == "off":
            continue
        ctx = RuleContext(rule, board, path, rule_settings.options.get(rule.id, FrozenMap({})),
                          rule_settings.options)
        for f in rule.check(ctx):
            if override and f.severity is not Severity.INFO:  # advice stays advice
                f = replace(f, severity=Severity(override))
            out.append(f)
    return sorted(out, key=lambda f: f.sort_key)


def rule_doc(rule: Rule) -> dict[str, Any]:
    """The rule's metadata as a plain mapping (for `ledlint rules` and the SARIF rules section)."""
    return {"id": rule.id, "summary": rule.summary, "severity": rule.severity.value,
            "options": [{"name": o.name, "default": o.default, "unit": o.unit, "doc": o.doc} for o in rule.options],
            "doc": rule.doc}
