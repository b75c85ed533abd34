"""The rules a review runs: the built-in ones, listed in ledlint.rules, then those of installed
plugins. Loading them needs no board, so listing and explaining rules stays quick."""

from __future__ import annotations

import importlib
from importlib.metadata import entry_points

import ledlint.rules as builtin_rules
from ledlint.checks.registry import Rule, validate
from ledlint.errors import LedlintError

ENTRY_POINT_GROUP = "ledlint.rules"  # third-party rules: an entry point naming a Rule object


def load_rules(include_plugins: bool = True) -> tuple[Rule, ...]:
    """The built-in rules (ledlint.rules), then plugins; duplicate or malformed ids fail loudly."""
    found: dict[str, str] = {}
    rules: list[Rule] = []

    def add(candidate: object, where: str) -> None:
        rule = validate(candidate, where)
        if rule.id in found:
            raise LedlintError(f"{where}: rule id {rule.id!r} is already defined by {found[rule.id]}")
        found[rule.id] = where
        rules.append(rule)

    for name in builtin_rules.BUILTIN:
        module = importlib.import_module(f"{builtin_rules.__name__}.{name}")
        add(getattr(module, "RULE", None), module.__name__)
    if include_plugins:
        for ep in sorted(entry_points(group=ENTRY_POINT_GROUP), key=lambda e: e.name):
            add(ep.load(), f"entry point {ep.name} ({ep.value})")
    return tuple(rules)
