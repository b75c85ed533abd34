"""ledlint: design-rule checks for the LED circuits in KiCad schematic netlists."""

from pathlib import Path as _Path

__version__ = "0.1.0"

# Installed, the built-in rules are the subpackage ledlint.rules; in a source checkout they are
# the top-level rules/ folder beside this one (pyproject.toml maps the one to the other). Let a
# checkout find them too, so `python -m ledlint` run inside a clone works like the installed tool.
_here = _Path(__file__).resolve().parent
if not (_here / "rules").is_dir() and (_here.parent / "rules" / "__init__.py").is_file():
    __path__.append(str(_here.parent))
