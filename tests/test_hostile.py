"""Hostile and odd input, as CI meets it from a pull request: one test per case. Each ends in a
report (exit 0 or 1) or one sanitised error line (exit 2), never a traceback or exit 3, and no file
but the named output changes.

The expectations are the trade's conventions for command-line tools run on untrusted input
(common practice): an error is one line on standard error naming file, line and column; text for
people carries no terminal controls (ECMA-48 C0/C1 controls) and no bidirectional controls
(Unicode TR#36, CVE-2021-42574); JSON keeps names as written, escaped (RFC 8259 §7).
"""

from __future__ import annotations

import json
import os
import re
import subprocess
import sys
import tempfile
from pathlib import Path

import pytest

from paths import REPO, SAMPLES

FORMATS = ("text", "json", "sarif", "github", "markdown")
_BIDI = "\u061c\u200e\u200f\u202a\u202b\u202c\u202d\u202e\u2066\u2067\u2068\u2069"
_CONTROLS = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u2028\u2029" + _BIDI + "]")  # all but \t and \n


def run(*args: str, cwd: Path | str | None = None) -> subprocess.CompletedProcess[str]:
    return subprocess.run([sys.executable, "-m", "ledlint", *args], capture_output=True, text=True,
                          cwd=cwd or tempfile.gettempdir())


def _q(text: str) -> str:
    """A KiCad quoted string: backslash and quote escaped, line breaks as \\n and \\r (the
    netlist writer's escapes, kicad-netlist-format.md §2.2); every other character raw."""
    body = text.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n").replace("\r", "\\r")
    return f'"{body}"'


def board(led: str = "D1", node: str = "/A", supply: str = "+5V", value: str = "330",
          led_fields: str = "") -> str:
    """An invented one-LED indicator: +5V → R1 → node → D1 → GND, every name chosen by the test."""
    fields = f" (fields (field (name {_q(led_fields[0])}) {_q(led_fields[1])}))" if led_fields else ""
    return (
        '(export (version "E")\n  (components\n'
        f'    (comp (ref {_q(led)}) (value "LED red"){fields} (libsource (lib "Device") (part "LED")))\n'
        f'    (comp (ref "R1") (value {_q(value)}) (footprint "Resistor_SMD:R_0603_1608Metric")))\n'
        '  (libparts (libpart (lib "Device") (part "LED") (pins (pin (num "1") (name "K") (type "passive"))\n'
        '    (pin (num "2") (name "A") (type "passive")))))\n'
        '  (nets\n'
        f'    (net (code "1") (name {_q(supply)}) (node (ref "R1") (pin "1")))\n'
        f'    (net (code "2") (name {_q(node)}) (node (ref "R1") (pin "2")) (node (ref {_q(led)}) (pin "2")))\n'
        f'    (net (code "3") (name "GND") (node (ref {_q(led)}) (pin "1")))))\n')


def _write(folder: Path, text: str, name: str = "board.net") -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


def _one_clean_line(r: subprocess.CompletedProcess[str]) -> str:
    assert r.returncode == 2, (r.returncode, r.stderr)
    assert r.stdout == "" and r.stderr.count("\n") == 1 and "Traceback" not in r.stderr
    assert not _CONTROLS.search(r.stderr), repr(r.stderr)
    return r.stderr


# 1. Crash: a reference holding ':' in its component and its nodes.

def test_a_reference_with_a_colon_is_opaque_text(tmp_path: Path) -> None:
    path = _write(tmp_path, board(led="D2:x"))
    for fmt in FORMATS:
        r = run("check", str(path), "--format", fmt)
        assert r.returncode in (0, 1), r.stderr
    doc = json.loads(run("check", str(path), "--format", "json").stdout)
    assert ["D2:x"] == [row["leds"] for row in doc["circuits"]][0]


# 2. Terminal and log injection.

def test_an_escape_sequence_in_a_files_first_word_is_one_clean_line(tmp_path: Path) -> None:
    path = _write(tmp_path, "(\x1b]0;pwned\x07\x1b[31mfoo\nbar.net:1:1: error: forged\n)")
    err = _one_clean_line(run("check", str(path)))
    assert err.startswith(f"{path}:1:1: error:")


def test_a_field_waiver_with_a_bad_rule_names_its_component_cleanly(tmp_path: Path) -> None:
    led = "D1\x1b]0;title\x07"
    path = _write(tmp_path, board(led=led, led_fields=("ledlint_waive",
                                                       "nosuch\x1b[2J: why\nfake.net:1:1: error: forged")))
    err = _one_clean_line(run("check", str(path)))
    assert "field ledlint_waive on D1" in err and "no rule" in err


# 3 and the suite's every-format test: control, bidi, markdown and workflow-command characters.

_NASTY = {
    "led": "D1\u202eTXT\u2066|`*_<b>",
    "node": "/A\x1b[31m\u2028%0A::error file=x::forged\r\nmore",
    "supply": "+5V\x07\x9b\u200f|[x](http://example.invalid)%0A::error file=x::forged",
}


@pytest.mark.parametrize("fmt", FORMATS)
def test_names_full_of_controls_reach_no_report_unescaped(tmp_path: Path, fmt: str) -> None:
    path = _write(tmp_path, board(**_NASTY))
    r = run("check", str(path), "--format", fmt, "--circuits") if fmt == "text" else \
        run("check", str(path), "--format", fmt)
    assert r.returncode in (0, 1), r.stderr
    out = r.stdout
    assert not _CONTROLS.search(out), repr(_CONTROLS.search(out))
    if fmt in ("json", "sarif"):
        # Machine formats keep each name as written, as \u escapes (RFC 8259 §7).
        assert any(_NASTY["led"] in json.dumps(json.loads(out), ensure_ascii=False) for _ in [0])
    if fmt == "github":
        # One workflow command per line and then the run's summary; the data's '%', CR and LF
        # escaped as %25, %0D, %0A (GitHub Actions, workflow commands documentation).
        lines = out.splitlines()
        assert all(line.startswith("::") for line in lines[:-1]) and lines[-1].startswith("ledlint:")
        assert "%250A::error file=x::forged" in out or "%0A::error" not in out
    if fmt == "markdown":
        # No table cell split by a '|' from a name; no name turned into a link, code or emphasis
        # (CommonMark 0.31 §2.4 backslash escapes).
        assert "\\|\\[x\\](http://example.invalid)" in out and "D1\ufffdTXT\ufffd\\|\\`\\*\\_&lt;b>" in out


# 4. Long values: cut for display, kept once in JSON.

def test_a_megabyte_value_is_cut_for_display_and_kept_once_in_json(tmp_path: Path) -> None:
    value = "330" + "x" * 1_000_000
    path = _write(tmp_path, board(value=value))
    for fmt in ("text", "github", "markdown"):
        r = run("check", str(path), "--format", fmt)
        assert r.returncode in (0, 1) and len(r.stdout) < 20_000, (fmt, len(r.stdout))
    for fmt in ("json", "sarif"):
        out = run("check", str(path), "--format", fmt).stdout
        doc = json.loads(out)
        texts = (doc if fmt == "json" else doc["runs"][0]["properties"])["long_texts"]
        assert any(value in t for t in texts.values()), fmt  # the whole value, once
        assert all(out.count(json.dumps(t)) == 1 for t in texts.values()), fmt  # each a whole string once
        assert len(texts) <= 2 and len(out) < 2 * len(value) + 200_000, fmt  # the value, and its part after "330"


def test_a_long_name_of_many_words_is_cut_too(tmp_path: Path) -> None:
    path = _write(tmp_path, board(supply="+5V " + "ab " * 200_000))
    for fmt in FORMATS:
        r = run("check", str(path), "--format", fmt)
        assert r.returncode in (0, 1) and len(r.stdout) < 200_000, (fmt, len(r.stdout))


# 5. Configuration in a pyproject.toml that is not ours, or ours and broken.

@pytest.mark.parametrize("pyproject", ['tool = 5\n', 'tool = "ledlint"\n', '[tool]\nother = 1\n'])
def test_an_unrelated_pyproject_is_left_alone(tmp_path: Path, pyproject: str) -> None:
    (tmp_path / "pyproject.toml").write_text(pyproject, encoding="utf-8")
    path = _write(tmp_path, board())
    r = run("check", str(path), cwd=tmp_path)
    assert r.returncode in (0, 1) and r.stderr == "", r.stderr


def test_a_ledlint_key_that_is_not_a_table_is_an_error_at_its_line(tmp_path: Path) -> None:
    (tmp_path / "pyproject.toml").write_text("[tool]\nledlint = 5\n", encoding="utf-8")
    path = _write(tmp_path, board())
    err = _one_clean_line(run("check", str(path), cwd=tmp_path))
    assert f"{tmp_path / 'pyproject.toml'}:2:1: error:" in err


# 6. A baseline nested deeper than any parser's recursion.

def test_a_deeply_nested_baseline_is_a_clean_error(tmp_path: Path) -> None:
    path = _write(tmp_path, board())
    deep = tmp_path / "deep.json"
    deep.write_text("[" * 200_000 + "]" * 200_000, encoding="utf-8")
    err = _one_clean_line(run("check", str(path), "--baseline", str(deep)))
    assert str(deep) in err


# 7. Links and outputs.

def test_output_replaces_a_symlink_itself_and_gets_the_usual_permissions(tmp_path: Path) -> None:
    """-o replaces the path named: a symlink there becomes the report and the file it pointed to
    is untouched (a link in a pull request must not aim the report at a file elsewhere). A
    replaced file keeps its permissions; a new one has the umask's, not 0600."""
    target, link = tmp_path / "elsewhere.txt", tmp_path / "latest.json"
    target.write_text("old", encoding="utf-8")
    link.symlink_to(target.name)
    r = run("check", str(SAMPLES / "rgb-status.net"), "--format", "json", "-o", str(link))
    assert r.returncode == 1, r.stderr
    assert not link.is_symlink() and json.loads(link.read_text(encoding="utf-8"))["schema"] == 1
    assert target.read_text(encoding="utf-8") == "old"
    kept = tmp_path / "report.json"
    kept.write_text("old", encoding="utf-8")
    kept.chmod(0o640)
    assert run("check", str(SAMPLES / "rgb-status.net"), "--format", "json", "-o", str(kept)).returncode == 1
    assert kept.stat().st_mode & 0o777 == 0o640  # a replaced file keeps its own
    fresh = tmp_path / "fresh.json"
    mask = os.umask(0o022)
    try:
        assert run("check", str(SAMPLES / "rgb-status.net"), "-o", str(fresh)).returncode == 1
    finally:
        os.umask(mask)
    assert fresh.stat().st_mode & 0o777 == 0o644


def test_a_symlinked_netlist_pointing_out_of_a_scanned_folder_is_not_read(tmp_path: Path) -> None:
    outside = tmp_path / "secret.net"
    outside.write_text("(SECRET-TOKEN-0123456789)", encoding="utf-8")
    folder = tmp_path / "boards"
    folder.mkdir()
    _write(folder, board())
    (folder / "sneaky.net").symlink_to(outside)
    r = run("check", str(folder), "--format", "json")
    assert r.returncode in (0, 1), r.stderr
    assert "SECRET" not in r.stdout + r.stderr
    assert [Path(f["path"]).name for f in json.loads(r.stdout)["files"]] == ["board.net"]


@pytest.mark.parametrize("which", ["netlist", "config"])
def test_an_output_naming_an_input_is_refused_and_the_input_kept(tmp_path: Path, which: str) -> None:
    path = _write(tmp_path, board())
    config = tmp_path / "ledlint.toml"
    config.write_text("[rails.VCC]\nnominal = 5\n", encoding="utf-8")
    named = path if which == "netlist" else config
    before = named.read_bytes()
    err = _one_clean_line(run("check", str(path), "--config", str(config), "-o", str(named)))
    assert "input" in err and named.read_bytes() == before


# 8. Empty skeletons are not clean boards; a board without LEDs is.

@pytest.mark.parametrize("skeleton", [
    "(export)", '(export (version "E"))', '(export (version "E") (design (source "x.kicad_sch")))',
    '(export (version "E") (components) (nets))'])
def test_an_empty_skeleton_is_an_error(tmp_path: Path, skeleton: str) -> None:
    _one_clean_line(run("check", str(_write(tmp_path, skeleton + "\n"))))


def test_a_board_without_leds_is_a_clean_pass(tmp_path: Path) -> None:
    text = ('(export (version "E") (components (comp (ref "R1") (value "10k")))\n'
            '  (nets (net (code "1") (name "GND") (node (ref "R1") (pin "1")))))\n')
    r = run("check", str(_write(tmp_path, text)))
    assert r.returncode == 0 and r.stderr == ""


# 9. Smaller points.

def test_a_configuration_error_gives_its_line_and_column(tmp_path: Path) -> None:
    config = tmp_path / "ledlint.toml"
    config.write_text('# the bench supply\n\n[rails.VCC]\nnominal = "abc"\n', encoding="utf-8")
    err = _one_clean_line(run("check", str(_write(tmp_path, board())), "--config", str(config)))
    assert err.startswith(f"{config}:4:1: error:"), err


def test_both_configuration_files_in_one_folder_is_an_error(tmp_path: Path) -> None:
    (tmp_path / "ledlint.toml").write_text("[rails.VCC]\nnominal = 5\n", encoding="utf-8")
    (tmp_path / "pyproject.toml").write_text("[tool.ledlint.rails.VCC]\nnominal = 3.3\n", encoding="utf-8")
    err = _one_clean_line(run("check", str(_write(tmp_path, board())), cwd=tmp_path))
    assert "keep one" in err


def test_a_baseline_whose_version_is_true_is_refused(tmp_path: Path) -> None:
    baseline = tmp_path / "base.json"
    baseline.write_text('{"ledlint_baseline": true, "entries": []}', encoding="utf-8")
    err = _one_clean_line(run("check", str(_write(tmp_path, board())), "--baseline", str(baseline)))
    assert "error: baseline version True: this ledlint reads version 1" in err  # JSON true is not 1


def test_a_file_over_the_size_limit_is_refused_before_it_is_read(monkeypatch: pytest.MonkeyPatch,
                                                                 tmp_path: Path, capsys) -> None:
    from ledlint import cli
    from ledlint.netlist import kicad_common

    assert kicad_common.MAX_BYTES == 128 << 20 and "128 MiB" in (REPO / "README.md").read_text(encoding="utf-8")
    monkeypatch.setattr(kicad_common, "MAX_BYTES", 1000)
    path = _write(tmp_path, board() + " " * 2000)
    assert cli.main(["check", str(path)]) == 2
    err = capsys.readouterr().err
    assert err.startswith(f"{path}: error:") and err.count("\n") == 1 and "too large" in err


def test_thousands_of_nodes_naming_no_component_give_a_few_notes(tmp_path: Path) -> None:
    ghosts = "".join(f'(node (ref "G{i}") (pin "1"))' for i in range(5000))
    text = board().replace('(name "GND")', f'(name "GND") {ghosts}')
    doc = json.loads(run("check", str(_write(tmp_path, text)), "--format", "json").stdout)
    notes = doc["files"][0]["notes"]
    assert 1 < len(notes) <= 12 and "4,990 more" in notes[-1]["message"]
