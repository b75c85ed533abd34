"""The files a review reads: netlists named, found in folders, or matched by a pattern. A folder
is searched without following links out of it, so a netlist in a pull request cannot make the
check read a file elsewhere on the machine."""

from __future__ import annotations

import glob
import os
from pathlib import Path
from typing import Sequence

from ledlint.errors import LedlintError

PATTERNS = ("*.net",)


def _inside(path: Path, root: Path) -> bool:
    """Whether a path, links resolved, lies within the folder searched."""
    try:
        path.resolve().relative_to(root)
    except (ValueError, OSError, RuntimeError):  # RuntimeError: a link loop
        return False
    return True


def _search(folder: Path) -> list[Path]:
    """Netlists below a folder: hidden folders skipped, links neither followed into folders nor
    read when they lead out of the folder."""
    root = folder.resolve()
    found = []
    for here, dirs, files in os.walk(folder, followlinks=False):
        dirs[:] = sorted(d for d in dirs if not d.startswith("."))
        for name in sorted(files):
            path = Path(here) / name
            if any(path.match(p) for p in PATTERNS) and path.is_file() and _inside(path, root):
                found.append(path)
    return found


def find_netlists(paths: Sequence[str]) -> list[Path]:
    """Files as given; folders searched for *.net (hidden folders skipped); globs expanded."""
    found: list[Path] = []
    for raw in paths:
        p = Path(raw)
        if p.is_dir():
            found.extend(_search(p))
        elif not p.exists() and glob.has_magic(raw):
            # A pattern names files: a folder it happens to match ("hw/**") is not a netlist.
            matches = sorted(m for m in map(Path, glob.glob(raw, recursive=True)) if m.is_file())
            if not matches:
                raise LedlintError("no file matches this pattern", raw)
            found.extend(matches)
        else:
            found.append(p)
    if not found:
        raise LedlintError("no *.net files found in " + ", ".join(paths))
    return list(dict.fromkeys(found))
