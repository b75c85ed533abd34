"""Baselines: recording findings, counting only new ones, stale entries, and re-exports."""

from __future__ import annotations

import json
import re
import subprocess
import sys
from pathlib import Path

import pytest

from conftest import workshop_panel
from ledlint.review import baseline
from ledlint.errors import LedlintError
from ledlint.review.run import check


def ledlint(*args: str, cwd: Path | None = None) -> subprocess.CompletedProcess[str]:
    return subprocess.run([sys.executable, "-m", "ledlint", *args], capture_output=True, text=True, cwd=cwd)


def _blocks(lines: list[str], start: str, closers: str) -> list[list[str]]:
    """Split a section of KiCad 8 netlist lines into its `start` blocks; the section's own
    closing parentheses (`closers`) come off the last block."""
    blocks: list[list[str]] = []
    for line in lines:
        if line.startswith(start):
            blocks.append([])
        blocks[-1].append(line)
    assert blocks[-1][-1].endswith(closers)
    blocks[-1][-1] = blocks[-1][-1][: -len(closers)]
    return blocks


def reexport(text: str) -> str:
    """The same design as another export might write it: components and nets in reverse order,
    nets renumbered. Names, values and connections are untouched."""
    lines = text.split("\n")
    c0, l0, n0 = lines.index("  (components"), lines.index("  (libparts"), lines.index("  (nets")
    comps = _blocks(lines[c0 + 1:l0], "    (comp ", ")")[::-1]
    nets = _blocks(lines[n0 + 1:], "    (net ", "))")[::-1]
    for code, block in enumerate(nets, start=1):
        block[0] = re.sub(r'\(code "\d+"\)', f'(code "{code}")', block[0])
    comps[-1][-1] += ")"
    nets[-1][-1] += "))"
    return "\n".join([*lines[:c0 + 1], *(x for b in comps for x in b), *lines[l0:n0 + 1],
                      *(x for b in nets for x in b)])


def test_fingerprints_survive_a_reordering_reexport(panel_files) -> None:
    original = Path(panel_files["A"])
    shuffled = original.with_name("panel-a-reexported.net")
    shuffled.write_text(reexport(original.read_text(encoding="utf-8")), encoding="utf-8")
    before, after = check([original]).files[0], check([shuffled]).files[0]
    # It really is reordered: the parts sit on other lines and the nets have other codes.
    assert [c.ref for c in after.netlist.components] == [c.ref for c in before.netlist.components][::-1]
    assert before.netlist.component("D1").line != after.netlist.component("D1").line
    assert {n.name: n.code for n in before.netlist.nets} != {n.name: n.code for n in after.netlist.nets}
    assert len(before.findings) >= 4
    assert sorted(f.fingerprint for f in before.findings) == sorted(f.fingerprint for f in after.findings)
    assert sorted(f.line for f in before.findings) != sorted(f.line for f in after.findings)
    # The words too: parallel strings are taken in reference order, so the Monte Carlo names the
    # same worst LED whatever order the export chose.
    assert sorted(f.message for f in before.findings) == sorted(f.message for f in after.findings)
    # And a baseline recorded from one export accounts for every finding of the other.
    recorded = baseline.parse(baseline.render(check([original]), "ledlint-baseline.json"), "ledlint-baseline.json")
    moved = [baseline.Entry(e.file.replace("panel-a.net", "panel-a-reexported.net"), e.rule, e.fingerprint)
             for e in recorded.entries]
    compared = baseline.compare(check([shuffled]), baseline.Baseline("ledlint-baseline.json", tuple(moved)))
    assert compared.new == () and compared.stale == () and len(compared.known) == len(before.findings)


def test_golden_baseline(fixed_run, golden) -> None:
    golden("baseline.json", baseline.render(fixed_run, "ledlint-baseline.json"))


def test_only_new_findings_count(panel_files) -> None:
    r = ledlint("baseline", panel_files["A"], "-o", "ledlint-baseline.json")
    assert r.returncode == 0, r.stderr
    recorded = check([panel_files["A"]])
    doc = json.loads(Path("ledlint-baseline.json").read_text(encoding="utf-8"))
    assert doc["ledlint_baseline"] == baseline.VERSION
    assert [e["fingerprint"] for e in doc["entries"]] == [e.fingerprint for e in baseline.entries(
        recorded, "ledlint-baseline.json")]
    assert {e["file"] for e in doc["entries"]} == {"boards/panel-a.net"}
    assert f"recorded {len(recorded.findings)} finding(s)" in r.stderr
    # Unchanged board: everything is known, the check passes.
    same = ledlint("check", panel_files["A"], "--baseline", "ledlint-baseline.json")
    assert same.returncode == 0, same.stdout + same.stderr
    assert f"{len(recorded.findings)} known finding(s) not counted, 0 new, 0 stale entries" in same.stderr
    # The next revision as the same file: the fixed findings are stale, the new ones fail the check.
    Path(panel_files["A"]).write_text(workshop_panel("B").text(), encoding="utf-8")
    changed = ledlint("check", panel_files["A"], "--baseline", "ledlint-baseline.json", "--format", "json")
    assert changed.returncode == 1
    active = json.loads(changed.stdout)["findings"]
    current = check([panel_files["A"]]).findings
    known = {e["fingerprint"] for e in doc["entries"]}
    assert [f["fingerprint"] for f in active] == [f.fingerprint for f in current if f.fingerprint not in known]
    assert {f["refs"][0] for f in active} >= {"D5"}  # the LED added on +3V3
    gone = [e for e in doc["entries"] if e["fingerprint"] not in {f.fingerprint for f in current}]
    assert f"{len(gone)} stale entr" in changed.stderr
    for e in gone:
        assert f"stale entry, no longer found: {e['rule']} on {', '.join(e['refs'])} in boards/panel-a.net" \
            in changed.stderr


def test_entries_count_one_finding_each(panel_files) -> None:
    result = check([panel_files["A"]])
    f = result.findings[0]
    one = baseline.Baseline("b.json", (baseline.Entry(panel_files["A"], f.rule, f.fingerprint),))
    compared = baseline.compare(result, one)
    assert [k.fingerprint for k in compared.known] == [f.fingerprint]
    assert compared.new == result.findings[1:]
    assert compared.result.findings == compared.new
    assert compared.result.failed("error") == any(n.severity.value == "error" for n in compared.new)
    assert [w.waived for w in compared.result.files[0].waived] == ["known: recorded in baseline b.json"]
    twice = baseline.Baseline("b.json", one.entries * 2)
    assert len(baseline.compare(result, twice).stale) == 1


def test_paths_are_relative_to_the_baseline_not_the_working_folder(panel_files, tmp_path: Path) -> None:
    (tmp_path / "ci").mkdir()
    assert ledlint("baseline", panel_files["A"], "-o", "ci/known.json").returncode == 0
    entries = json.loads(Path("ci/known.json").read_text(encoding="utf-8"))["entries"]
    assert {e["file"] for e in entries} == {"../boards/panel-a.net"}
    # From inside another folder, naming the same files by other paths.
    r = ledlint("check", "../boards/panel-a.net", "--baseline", "../ci/known.json", cwd=tmp_path / "ci")
    assert r.returncode == 0 and "0 new, 0 stale" in r.stderr, r.stderr


def test_files_not_checked_leave_their_entries_alone(panel_files) -> None:
    assert ledlint("baseline", panel_files["A"], panel_files["B"]).returncode == 0
    only_a = ledlint("check", panel_files["A"], "--baseline", baseline.DEFAULT_NAME)
    assert only_a.returncode == 0 and "0 stale entries" in only_a.stderr, only_a.stderr


def test_a_finding_that_got_worse_is_new(panel_files) -> None:
    """A baseline accepts what was known, not worse (common practice for lint baselines): an entry
    recorded as a warning does not cover the same finding as an error, and is left stale."""
    from ledlint.checks.findings import Severity

    result = check([panel_files["A"]])
    f = next(x for x in result.findings if x.severity is Severity.ERROR)
    for recorded, covered in ((Severity.WARNING, False), (Severity.ERROR, True)):
        b = baseline.Baseline("b.json", (baseline.Entry(panel_files["A"], f.rule, f.fingerprint, recorded),))
        compared = baseline.compare(result, b)
        assert (f in compared.new) is not covered
        assert len(compared.stale) == (0 if covered else 1)
        assert any("now more severe" in line for line in compared.summary()) is not covered
    # A file written before entries carried a severity covers any severity.
    old = baseline.parse(json.dumps({"ledlint_baseline": 1, "entries": [
        {"file": "a.net", "rule": f.rule, "fingerprint": f.fingerprint}]}), "old.json")
    assert old.entries[0].severity is Severity.ERROR


@pytest.mark.parametrize(("text", "message"), [
    ("{not json", "1:2: error: not a baseline file: Expecting property name"),
    ('{"entries": []}', "not a baseline file: no 'ledlint_baseline' key"),
    ('{"ledlint_baseline": 2, "entries": []}', "baseline version 2: this ledlint reads version 1"),
    ('{"ledlint_baseline": 1, "entries": {}}', "'entries' must be a list"),
    ('{"ledlint_baseline": 1, "entries": [{"file": "a.net", "rule": "x"}]}',
     "entry 1: 'fingerprint' must be a non-empty string"),
    ('{"ledlint_baseline": 1, "entries": [{"file": "a.net", "rule": "x", "fingerprint": "f", "refs": "D1"}]}',
     "entry 1 refs: expected a list of strings"),
    ('{"ledlint_baseline": 1, "entries": [{"file": "a.net", "rule": "x", "fingerprint": "f", "severity": "fatal"}]}',
     "entry 1: 'severity' must be one of error, warning, info"),
])
def test_bad_baseline_files_are_clear_errors(panel_files, text: str, message: str) -> None:
    Path("bad.json").write_text(text, encoding="utf-8")
    with pytest.raises(LedlintError):
        baseline.load("bad.json")
    r = ledlint("check", panel_files["A"], "--baseline", "bad.json")
    assert r.returncode == 2 and r.stdout == ""
    assert r.stderr.startswith("bad.json") and message in r.stderr and "Traceback" not in r.stderr


def test_missing_baseline_file(panel_files) -> None:
    r = ledlint("check", panel_files["A"], "--baseline", "nowhere.json")
    assert r.returncode == 2 and "nowhere.json: error: no such baseline" in r.stderr
