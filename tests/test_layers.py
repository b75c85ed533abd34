"""Data flows one way: a stage imports only stages to its left (STYLE.md)."""

from __future__ import annotations

import ast
from pathlib import Path

import ledlint
import ledlint.rules

# Left to right; modules in one group may import each other. Names are ledlint's first-level
# modules or packages ("engine" covers ledlint.engine.*).
ORDER = [
    {"__init__", "__version__", "errors", "frozen", "paths", "sanitise"},
    {"quantities"},
    {"engine"},
    {"netlist"},
    {"config"},
    {"parts"},
    {"circuits"},
    {"analysis"},
    {"checks"},
    {"rules"},
    {"review"},
    {"report"},
    {"api", "cli", "__main__"},
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


def _imports(name: str, path: Path) -> list[str]:
    """Every module `name` imports, relative imports resolved against its package."""
    package = name if path.name == "__init__.py" else name.rpartition(".")[0]
    out = []
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.ImportFrom):
            base = node.module or ""
            if node.level:
                parent = package.split(".")[: len(package.split(".")) - node.level + 1]
                base = ".".join(parent + ([base] if base else []))
            out += [base] + [f"{base}.{a.name}" for a in node.names]
        elif isinstance(node, ast.Import):
            out += [a.name for a in node.names]
    return out


def test_every_module_imports_left_only() -> None:
    modules = _modules()
    assert any(n.startswith("ledlint.rules.") for n, _ in modules)
    for name, path in modules:
        own = _stage(name.removesuffix(".__init__"))
        for t in _imports(name, path):
            other = _stage(t) if t.split(".")[0] == "ledlint" and len(t.split(".")) > 1 else None
            if other is not None and own is not None:
                assert other <= own, f"{name} imports {t}, which is to its right"


def test_relative_imports_are_resolved(tmp_path: Path) -> None:
    # `from ..engine import x` inside ledlint.analysis.board is an import of ledlint.engine.
    module = tmp_path / "board.py"
    module.write_text("from ..engine import corners\nfrom . import sizing\nfrom .supplies import x\n")
    found = _imports("ledlint.analysis.board", module)
    assert {"ledlint.engine", "ledlint.analysis", "ledlint.analysis.supplies"} <= set(found)
    assert _stage("ledlint.engine.corners") < _stage("ledlint.analysis")  # type: ignore[operator]
