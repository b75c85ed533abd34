"""Bad schematics give one InputError with file, line and column; nothing else escapes the reader."""

from __future__ import annotations

import random
import shutil
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from paths import SCHEMATIC_FIXTURES
from ledlint.errors import InputError
from ledlint.netlist.kicad_sch import read_schematic

_HEAD = '(kicad_sch (version 20231120) (generator "eeschema")\n  (uuid "5c4e0000-0000-4000-8000-000000000001")\n'


def _write(tmp_path: Path, text: str | bytes, name: str = "bad.kicad_sch") -> Path:
    path = tmp_path / name
    if isinstance(text, bytes):
        path.write_bytes(text)
    else:
        path.write_text(text, encoding="utf-8")
    return path


@pytest.mark.parametrize(
    ("text", "words", "line"),
    [
        ("", "empty file", 1),
        ("EESchema Schematic File Version 4\n", "KiCad 5", 1),
        ('<?xml version="1.0"?>\n<export version="E"/>', "XML", 1),
        ("(export (version E))", "not a KiCad schematic", 1),
        ("(kicad_sch (generator x))", "KiCad 6 or later", 1),
        (_HEAD + "  (wire (pts (xy 1 2)))\n)", "needs two points", 3),
        (_HEAD + "  (junction (at 1 two))\n)", "'two' is not a number", 3),
        (_HEAD + "  (junction (at nan 2))\n)", "'nan' is not a number", 3),
        (_HEAD + '  (symbol (lib_id "Device:R") (at 1 2 45) (unit 1))\n)', "not 0, 90, 180 or 270", 3),
        (_HEAD + '  (symbol (lib_id "Device:R") (at 1 2 0) (unit 1)\n    (property "Reference" "R1"))\n)',
         "does not define", 3),
        (_HEAD + '  (symbol (lib_id "Device:R") (at 1 2 0) (dnp maybe))\n)', "expected yes or no", 3),
        (_HEAD + '  (sheet (at 1 2) (size 3 4) (property "Sheetname" "a"))\n)', "Sheetname / Sheetfile", 3),
        (_HEAD + "  (wire (pts (xy 1 2) (xy 3 4))\n", "end of file", 3),
        (_HEAD + '  (label "x)\n)', "unterminated string", 3),
    ],
)
def test_malformed_schematics_are_reported_with_their_place(tmp_path: Path, text: str, words: str, line: int) -> None:
    path = _write(tmp_path, text)
    with pytest.raises(InputError) as info:
        read_schematic(path)
    assert words in info.value.message and info.value.path == str(path) and info.value.line == line
    assert "netlist" not in info.value.message


def test_binary_missing_and_folder(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="NUL byte"):
        read_schematic(_write(tmp_path, b"(kicad_sch \x00)"))
    with pytest.raises(InputError, match="no such file"):
        read_schematic(tmp_path / "nope.kicad_sch")
    with pytest.raises(InputError, match="folder"):
        read_schematic(tmp_path)


def test_a_missing_sub_sheet_names_the_sheet_that_needs_it(tmp_path: Path) -> None:
    shutil.copy(SCHEMATIC_FIXTURES / "hierarchy" / "led_board.kicad_sch", tmp_path / "led_board.kicad_sch")
    with pytest.raises(InputError) as info:
        read_schematic(tmp_path / "led_board.kicad_sch")
    assert "led_stage.kicad_sch" in info.value.message and info.value.path.endswith("led_board.kicad_sch")
    line = (tmp_path / "led_board.kicad_sch").read_text(encoding="utf-8").splitlines()[info.value.line - 1]
    assert '"Sheetfile" "led_stage.kicad_sch"' in line


def test_a_sheet_that_contains_itself_is_refused(tmp_path: Path) -> None:
    text = (_HEAD + '  (sheet (at 1 2) (size 3 4) (uuid "5c4e0000-0000-4000-8000-000000000002")\n'
            '    (property "Sheetname" "again") (property "Sheetfile" "loop.kicad_sch"))\n)')
    with pytest.raises(InputError, match="cannot include itself"):
        read_schematic(_write(tmp_path, text, "loop.kicad_sch"))


def test_a_project_file_without_its_root_schematic(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="no root schematic"):
        read_schematic(_write(tmp_path, "{}", "lamp.kicad_pro"))


def test_a_broken_project_file_is_reported_at_its_place(tmp_path: Path) -> None:
    shutil.copy(SCHEMATIC_FIXTURES / "labels.kicad_sch", tmp_path / "labels.kicad_sch")
    _write(tmp_path, '{\n  "schematic": {,\n}', "labels.kicad_pro")
    with pytest.raises(InputError) as info:
        read_schematic(tmp_path / "labels.kicad_sch")
    assert info.value.path.endswith("labels.kicad_pro") and info.value.line == 2


def test_a_stray_byte_is_noted_not_fatal(tmp_path: Path) -> None:
    data = (SCHEMATIC_FIXTURES / "labels.kicad_sch").read_bytes().replace(b'"red"', b'"r\xffd"', 1)
    n = read_schematic(_write(tmp_path, data))
    assert any("0xFF" in note.message for note in n.notes)


_SEEDS = sorted(SCHEMATIC_FIXTURES.glob("*.kicad_sch"))


def _mutate(text: str, rng: random.Random) -> str:
    chars = list(text)
    for _ in range(rng.randint(1, 6)):
        op = rng.choice(["delete", "insert", "swap", "cut", "digit"])
        i = rng.randrange(len(chars)) if chars else 0
        if op == "delete" and chars:
            del chars[i]
        elif op == "insert":
            chars.insert(i, rng.choice('()"\\ \n\tx~#;\x00é-9.'))
        elif op == "swap" and len(chars) > 1:
            j = rng.randrange(len(chars))
            chars[i], chars[j] = chars[j], chars[i]
        elif op == "cut":
            chars = chars[:i]
        elif op == "digit" and chars and chars[i].isdigit():
            chars[i] = rng.choice("0123456789")  # moves a point: geometry changes, no syntax error
    return "".join(chars)


@settings(max_examples=300, deadline=None)
@given(st.integers(0, len(_SEEDS) - 1), st.randoms(use_true_random=False))
def test_mutated_schematics_only_raise_the_readers_error(tmp_path_factory: pytest.TempPathFactory, which: int,
                                                         rng: random.Random) -> None:
    text = _mutate(_SEEDS[which].read_text(encoding="utf-8"), rng)
    path = tmp_path_factory.mktemp("m") / "mutated.kicad_sch"
    path.write_text(text, encoding="utf-8", errors="surrogatepass")
    try:
        read_schematic(path)
    except InputError as exc:
        assert exc.path == str(path)


_ATOM = st.sampled_from(['"R1"', "R1", '"1"', "1", "0", "-2.54", "90", "yes", "no", '""', "~", '"Device:R"',
                         '"~"', "x", "y", '"A[0..3]"', '"{B C}"', '"top{ALIAS}"', '"Sheetname"', '"Sheetfile"',
                         '"sub.kicad_sch"', "passive", "power_in", "no_connect", '"GND"', '"D_1_1"', '"R_0_1"'])
_HEAD_WORDS = st.sampled_from(
    ["symbol", "lib_symbols", "lib_id", "lib_name", "at", "mirror", "unit", "pin", "number", "name", "property",
     "wire", "bus", "pts", "xy", "junction", "no_connect", "bus_entry", "size", "label", "global_label",
     "hierarchical_label", "shape", "sheet", "instances", "project", "path", "reference", "bus_alias", "members",
     "symbol_instances", "sheet_instances", "page", "power", "hide", "dnp", "in_bom", "on_board", "extends",
     "alternate", "convert", "body_style", "uuid", "value", "footprint"])
_TREE = st.recursive(_ATOM, lambda kids: st.tuples(_HEAD_WORDS, st.lists(kids, max_size=5)).map(
    lambda t: "(" + t[0] + " " + " ".join(t[1]) + ")"), max_leaves=40)


@settings(max_examples=300, deadline=None)
@given(st.lists(_TREE, max_size=6))
def test_random_schematic_shaped_trees_only_raise_the_readers_error(tmp_path_factory: pytest.TempPathFactory,
                                                                    parts: list[str]) -> None:
    path = tmp_path_factory.mktemp("r") / "random.kicad_sch"
    path.write_text(_HEAD + " ".join(parts) + ")", encoding="utf-8")
    try:
        read_schematic(path)
    except InputError as exc:
        assert exc.path == str(path)
