"""The engine stands alone: numpy, the standard library, ledlint.errors and the range type, nothing to
its right."""

from __future__ import annotations

import ast
import sys
from pathlib import Path

import ledlint.engine

ENGINE = Path(ledlint.engine.__file__).parent


def _imports(path: Path) -> set[str]:
    names: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            names.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module:
            names.add(node.module)
    return names


def test_engine_imports_only_numpy_the_stdlib_and_errors() -> None:
    modules = sorted(ENGINE.glob("*.py"))
    assert len(modules) > 5
    for path in modules:
        for name in _imports(path):
            top = name.split(".")[0]
            allowed = (top in sys.stdlib_module_names or top == "numpy" or name == "ledlint.errors"
                       or name == "ledlint.quantities.ranges" or name.startswith("ledlint.engine"))
            assert allowed, f"{path.name} imports {name}"


def test_every_module_opens_with_a_docstring() -> None:
    for path in ENGINE.glob("*.py"):
        docstring = ast.get_docstring(ast.parse(path.read_text(encoding="utf-8")))
        assert docstring, path.name
