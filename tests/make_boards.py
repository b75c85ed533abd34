"""Regenerate the invented sample boards in sample_boards/: python tests/make_boards.py

Each tests/board_*.py module lists its boards in BOARDS (functions returning a kicad8.Board).
"""

from __future__ import annotations

import importlib
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

ROOT = HERE.parent / "sample_boards"


def all_boards() -> list:
    boards = []
    for module in sorted(HERE.glob("board_*.py")):
        boards.extend(make() for make in importlib.import_module(module.stem).BOARDS)
    return boards


def main() -> None:
    for board in all_boards():
        (ROOT / f"{board.name}.net").write_text(board.text(), encoding="utf-8")


if __name__ == "__main__":
    main()
