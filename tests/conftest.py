"""Shared fixtures for the tests."""

from __future__ import annotations

from pathlib import Path

import pytest

from paths import CORPUS, corpus_files


@pytest.fixture
def corpus() -> list[Path]:
    files = corpus_files()
    if not files:
        pytest.skip(f"real-netlist corpus not found at {CORPUS}")
    return files
