"""read_design picks the reader by extension and, for netlists, by the file's first bytes."""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from paths import FIXTURES, SCHEMATIC_FIXTURES
from ledlint.errors import InputError
from ledlint.netlist.read import read_design


def test_each_kind_of_file_goes_to_its_reader(tmp_path: Path) -> None:
    assert read_design(FIXTURES / "kicad5-minimal.net").version == "D"
    assert read_design(FIXTURES / "xml" / "kicad5-minimal.xml").tool == "Eeschema (5.1.5)-3"
    assert "schematic" in read_design(SCHEMATIC_FIXTURES / "labels.kicad_sch").tool
    assert read_design(SCHEMATIC_FIXTURES / "multi_instance" / "dimmer.kicad_pro").component("R2") is not None
    # Content decides for a netlist saved under another name (a plugin's output, a download).
    shutil.copy(FIXTURES / "xml" / "legacy_power.xml", tmp_path / "board.net")
    assert read_design(tmp_path / "board.net").component("D1001") is not None
    shutil.copy(SCHEMATIC_FIXTURES / "labels.kicad_sch", tmp_path / "labels.txt")
    assert read_design(tmp_path / "labels.txt").net("/MID") is not None


def test_missing_and_unknown_inputs_are_input_errors(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="no such file"):
        read_design(tmp_path / "gone.net")
    with pytest.raises(InputError, match="folder"):
        read_design(tmp_path)
    (tmp_path / "notes.txt").write_text("hello", encoding="utf-8")
    with pytest.raises(InputError):
        read_design(tmp_path / "notes.txt")
