"""Report formats: golden files for JSON, CI annotations and markdown; escaping; many files."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from conftest import workshop_panel
from ledlint.report import github, json_doc, markdown, text
from ledlint.review.run import check


@pytest.fixture
def panel_run(panel_files):
    return check([panel_files["A"], panel_files["B"]])


def test_golden_json(fixed_run, golden) -> None:
    golden("check.json", json_doc.render(fixed_run))


def test_golden_text(fixed_run, golden) -> None:
    golden("check.txt", text.render(fixed_run, width=100))


def test_golden_circuit_table(golden, monkeypatch: pytest.MonkeyPatch) -> None:
    """The --circuits table of a real sample board (its figures are the engine's: regenerate
    this file when the engine changes on purpose)."""
    from paths import REPO

    monkeypatch.chdir(REPO)
    result = check(["sample_boards/work-light.net"])
    golden("circuits.txt", text.render(result, circuits=True, width=100))


def test_golden_github(fixed_run, golden) -> None:
    golden("check.github.txt", github.render(fixed_run))


def test_golden_markdown(fixed_run, golden) -> None:
    golden("check.md", markdown.render(fixed_run))


def test_workflow_command_escapes() -> None:
    # The CI runner's workflow-command encoding (from memory): in a message '%', CR and LF are
    # written %25, %0D, %0A; in a property value also ':' as %3A and ',' as %2C.
    assert github.escape_data("50% of\r\nrating") == "50%25 of%0D%0Arating"
    assert github.escape_property("D1, R1: 5%") == "D1%2C R1%3A 5%25"
    assert (github.command("warning", "a\nb", file="x.net", line=3, title="t, u")
            == "::warning file=x.net,line=3,title=t%2C u::a%0Ab")
    assert github.command("notice", "m") == "::notice::m"


def test_annotations_one_per_finding_with_file_and_line(panel_run) -> None:
    lines = github.render(panel_run).splitlines()
    findings = panel_run.findings
    assert len(lines) == len(findings) + 1  # and the summary line
    for f, line in zip(findings, lines):
        level = {"error": "error", "warning": "warning", "info": "notice"}[f.severity.value]
        assert line.startswith(f"::{level} file={f.file},line={f.line},title=ledlint {f.rule} (")
        assert "\n" not in line
    assert lines[-1] == "ledlint: " + markdown.summary(panel_run)


def test_summary_counts(panel_run) -> None:
    counts = panel_run.counts()
    circuits = sum(len(fr.board.circuits) for fr in panel_run.files)
    assert markdown.summary(panel_run).startswith(
        f"2 file(s) · {circuits} circuit(s), {circuits} analysed · {counts['error']} error(s) · "
        f"{counts['warning']} warning(s) · {counts['info']} info")


def test_markdown_cells_stay_in_their_column() -> None:
    # GitHub-flavoured markdown tables (spec §4.10): a '|' inside a cell is written '\|'.
    assert markdown.cell("a | b\nc <d>") == "a \\| b c &lt;d>"


def test_markdown_table_rows_and_cap(panel_run, monkeypatch: pytest.MonkeyPatch) -> None:
    rows = [line for line in markdown.render(panel_run).splitlines() if line.startswith("| ")]
    assert len(rows) == 1 + len(panel_run.findings)  # the header, then one row per finding
    monkeypatch.setattr(markdown, "MAX_ROWS", 3)
    capped = markdown.render(panel_run)
    assert sum(line.startswith("| ") for line in capped.splitlines()) == 4
    assert f"… and {len(panel_run.findings) - 3} more finding(s)" in capped


def test_clean_board_says_so(panel_files) -> None:
    result = check([panel_files["C"]])
    assert "No findings." in markdown.render(result)
    assert github.render(result) == "ledlint: " + markdown.summary(result) + "\n"


def test_many_files_folder_and_glob(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    # Enough files that the run goes parallel (run.py checks eight or more in worker processes).
    monkeypatch.chdir(tmp_path)
    for i in range(10):
        folder = tmp_path / "hw" / f"board{i}"
        folder.mkdir(parents=True)
        (folder / "panel.net").write_text(workshop_panel("ABC"[i % 3]).text(), encoding="utf-8")
    (tmp_path / "hw" / "odd.net").mkdir()  # a folder a pattern matches is not a netlist
    by_folder = subprocess.run([sys.executable, "-m", "ledlint", "check", "hw", "--format", "json"],
                               capture_output=True, text=True)
    by_glob = subprocess.run([sys.executable, "-m", "ledlint", "check", "hw/**/*.net", "--format", "json"],
                             capture_output=True, text=True)
    assert by_folder.returncode == by_glob.returncode == 1, by_folder.stderr + by_glob.stderr
    assert json.loads(by_folder.stdout) == json.loads(by_glob.stdout)
    doc = json.loads(by_folder.stdout)
    assert doc["summary"]["files"] == 10
    each = [check([f"hw/board{i}/panel.net"]).counts()["error"] for i in range(3)]  # A, B, C
    assert doc["summary"]["error"] == 4 * each[0] + 3 * each[1] + 3 * each[2]
    summary = subprocess.run([sys.executable, "-m", "ledlint", "check", "hw", "--format", "github"],
                             capture_output=True, text=True).stdout.splitlines()[-1]
    assert summary.startswith("ledlint: 10 file(s) · ")


def test_led_counts_are_parts_with_dies_added(monkeypatch: pytest.MonkeyPatch) -> None:
    """An RGB package is one part holding three dies (fact of the trade); the text header and the
    JSON inventory count parts alike, and the text adds the dies when a package holds several."""
    from paths import REPO

    monkeypatch.chdir(REPO)
    result = check(["sample_boards/rgb-status.net"])
    doc = json.loads(json_doc.render(result))
    assert doc["files"][0]["leds"] == 4  # D1 (RGB), D2, D3, D4 in the board's netlist
    assert "  13 parts, 14 nets, 4 LED(s) (6 dies) in 4 circuit(s)" in text.render(result, width=100)
