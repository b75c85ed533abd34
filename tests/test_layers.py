"""Data flows one way: a stage imports only stages to its left (STYLE.md)."""

from __future__ import annotations

import ast
from pathlib import Path

import ledlint

# Left to right. Modules within one group may import each other.
ORDER = [
    {"errors", "units", "rails", "eseries", "ratings"},
    {"model"},
    {"sexpr"},
    {"reader"},
    {"parts"},
    {"graph"},
]


def _stage(module: str) -> int | None:
    name = module.split(".")[1] if module.startswith("ledlint.") else None
    for i, group in enumerate(ORDER):
        if name in group:
            return i
    return None


def test_imports_go_left_only() -> None:
    root = Path(ledlint.__file__).parent
    for path in root.glob("*.py"):
        own = _stage("ledlint." + path.stem)
        if own is None:
            continue
        for node in ast.walk(ast.parse(path.read_text())):
            targets = []
            if isinstance(node, ast.ImportFrom) and node.module:
                targets = [node.module]
            elif isinstance(node, ast.Import):
                targets = [a.name for a in node.names]
            for t in targets:
                other = _stage(t)
                if other is not None:
                    assert other <= own, f"{path.name} imports {t}, which is to its right"
