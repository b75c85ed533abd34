"""Paths the tests share: fixtures, sample boards and the real-netlist corpus."""

from __future__ import annotations

import os
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent
FIXTURES = REPO / "tests" / "fixtures"
SAMPLES = REPO / "sample_boards"
# The real netlists live beside the repository and are read in place, never copied;
# LEDLINT_CORPUS names another folder for a checkout kept elsewhere.
CORPUS = Path(os.environ.get("LEDLINT_CORPUS") or REPO.parent / "shared" / "corpus" / "real")


def corpus_files() -> list[Path]:
    return sorted(CORPUS.glob("*.net"))
