"""Data flows one way: a stage imports only stages to its left (STYLE.md)."""

from __future__ import annotations

import ast
from pathlib import Path

import ledlint
import ledlint.rules

# Left to right; modules in one group may import each other. Names are ledlint's first-level
# modules or packages ("engine" covers ledlint.engine.*).
ORDER = [
    {"errors", "frozen", "units", "rails", "eseries", "ratings"},
    {"model"},
    {"sexpr"},
    {"reader"},
    {"config"},
    {"parts", "ledtypes"},
    {"params"},
    {"graph"},
    {"topology"},
    {"recognise"},
    {"engine"},
    {"batch", "supplies"},
    {"drive"},
    {"analyse"},
    {"sizing"},
    {"findings"},
    {"registry"},
    {"rules"},
    {"run"},
    {"report", "baseline", "diff"},
    {"cli", "__main__", "__init__"},
]


def _stage(module: str) -> int | None:
    parts = module.split(".")
    if parts[0] != "ledlint" or len(parts) < 2:
        return None
    for i, group in enumerate(ORDER):
        if parts[1] in group:
            return i
    raise AssertionError(f"module {module} is in no stage of tests/test_layers.py")


def _modules() -> list[tuple[str, Path]]:
    out = []
    for root, prefix in ((Path(ledlint.__file__).parent, "ledlint"), (Path(ledlint.rules.__file__).parent,
                                                                       "ledlint.rules")):
        for path in root.rglob("*.py"):
            rel = path.relative_to(root).with_suffix("")
            name = ".".join((prefix, *rel.parts))
            if prefix == "ledlint" and rel.parts[0] == "rules":
                continue  # an editable install may map rules/ here too
            out.append((name, path))
    return out


def test_every_module_imports_left_only() -> None:
    modules = _modules()
    assert any(n.startswith("ledlint.rules.") for n, _ in modules)
    for name, path in modules:
        own = _stage(name.removesuffix(".__init__"))
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            targets = []
            if isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
                targets = [node.module]
            elif isinstance(node, ast.Import):
                targets = [a.name for a in node.names]
            for t in targets:
                other = _stage(t)
                if other is not None and own is not None:
                    assert other <= own, f"{name} imports {t}, which is to its right"
