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
# Schematics paired with the netlist KiCad exported from them (its MANIFEST.md says where each
# pair comes from); read in place like CORPUS, LEDLINT_SCHEMATICS names another folder.
SCHEMATICS = Path(os.environ.get("LEDLINT_SCHEMATICS") or REPO.parent / "shared" / "corpus" / "schematic")
SCHEMATIC_FIXTURES = FIXTURES / "schematic"


def corpus_files() -> list[Path]:
    return sorted(CORPUS.glob("*.net"))
