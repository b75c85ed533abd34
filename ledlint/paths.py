"""File paths as reports and baselines write them: relative, with forward slashes."""

from __future__ import annotations

import os
from pathlib import Path


def posix_path(path: str | Path, start: str | Path | None = None) -> str:
    """`path` relative to `start` (default: the working folder) with forward slashes; absolute
    when it cannot be made relative (another drive)."""
    target = Path(path).resolve()
    try:
        return Path(os.path.relpath(target, Path(start or os.getcwd()).resolve())).as_posix()
    except ValueError:
        return target.as_posix()
