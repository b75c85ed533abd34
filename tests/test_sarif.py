"""SARIF 2.1.0 output, validated against the OASIS schema and checked field by field."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import jsonschema
import pytest

from conftest import workshop_panel
from ledlint.review.rules import load_rules
from ledlint.report import sarif
from ledlint.review.run import check
from paths import REPO

SCHEMA_PATH = REPO.parent / "shared" / "reference" / "sarif-schema-2.1.0.json"
CONFIG = """\
[[waivers]]
rule = "resistor-overload"
ref = "R3"
reason = "R3 is a 1206 part on the assembly drawing; the symbol's footprint is a placeholder"
"""


@pytest.fixture
def validator() -> jsonschema.Draft4Validator:
    if not SCHEMA_PATH.is_file():
        pytest.skip(f"SARIF schema not found at {SCHEMA_PATH}")
    schema = json.loads(SCHEMA_PATH.read_text(encoding="utf-8"))
    # The schema's own "$schema" names Draft 4 (reference/README.md), so Draft 4 it is.
    jsonschema.Draft4Validator.check_schema(schema)
    return jsonschema.Draft4Validator(schema)


@pytest.fixture
def waived_run(tmp_path: Path, monkeypatch: pytest.MonkeyPatch):
    """Revision A with a field waiver on D2 (in the netlist) and a config waiver on R3 (outside it)."""
    monkeypatch.chdir(tmp_path)
    (tmp_path / "boards").mkdir()
    (tmp_path / "boards" / "panel-a.net").write_text(workshop_panel("A", waive=True).text(), encoding="utf-8")
    (tmp_path / "ledlint.toml").write_text(CONFIG, encoding="utf-8")
    return check(["boards/panel-a.net"], config_path="ledlint.toml")


def _errors(validator: jsonschema.Draft4Validator, doc: dict) -> list[str]:
    return [f"{'/'.join(map(str, e.absolute_path))}: {e.message}" for e in validator.iter_errors(doc)]


def _line_of(text: str, needle: str) -> int:
    """1-based line of the first occurrence: read off the file itself, not from the reader."""
    return next(i for i, line in enumerate(text.splitlines(), start=1) if needle in line)


def test_output_validates_against_the_sarif_schema(validator, waived_run) -> None:
    doc = sarif.document(waived_run)
    assert _errors(validator, doc) == []
    assert doc["version"] == "2.1.0"


def test_golden_sarif(validator, fixed_run, golden) -> None:
    assert _errors(validator, sarif.document(fixed_run)) == []
    golden("check.sarif", sarif.render(fixed_run))


def test_the_sample_boards_validate_too(validator) -> None:
    boards = sorted((REPO / "sample_boards").glob("*.net"))
    doc = sarif.document(check(boards))
    assert _errors(validator, doc) == []
    assert len(doc["runs"][0]["results"]) == sum(len(f.findings) + len(f.waived) for f in check(boards).files)


def test_one_result_per_finding_with_locations_and_fingerprint(waived_run) -> None:
    fr = waived_run.files[0]
    text = Path(fr.path).read_text(encoding="utf-8")
    results = sarif.document(waived_run)["runs"][0]["results"]
    findings = [*fr.findings, *fr.waived]
    assert len(results) == len(findings) and len(fr.findings) >= 3 and fr.waived
    for f, r in zip(findings, results):
        assert r["ruleId"] == f.rule
        assert r["message"]["text"].startswith(f.message)
        location = r["locations"][0]
        physical = location["physicalLocation"]
        # Relative to the working folder, forward slashes (SARIF §3.4.3: a relative URI reference).
        assert physical["artifactLocation"]["uri"] == "boards/panel-a.net"
        # The line of one of its parts' `(comp (ref ...))` in the file: the first LED, or the part at fault.
        assert physical["region"]["startLine"] == f.line
        assert f.line in {_line_of(text, f'(comp (ref "{ref}")') for ref in f.refs}
        logical = location["logicalLocations"]
        assert [x["name"] for x in logical if x["kind"] == "component"] == list(dict.fromkeys(f.refs))
        assert [x["name"] for x in logical if x["kind"] == "net"] == list(dict.fromkeys(f.nets))
        assert r["partialFingerprints"] == {sarif.FINGERPRINT_KEY: f.fingerprint}
        related = {x["message"]["text"].split()[0]: x["physicalLocation"]["region"]["startLine"]
                   for x in r["relatedLocations"]}
        assert related == {ref: _line_of(text, f'(comp (ref "{ref}")') for ref in f.refs}


def test_levels_follow_the_severity(waived_run) -> None:
    # SARIF §3.27.10: level is one of none, note, warning, error; ledlint's info is a note.
    results = sarif.document(waived_run)["runs"][0]["results"]
    for f, r in zip(waived_run.files[0].findings, results):
        assert r["level"] == {"error": "error", "warning": "warning", "info": "note"}[f.severity.value]


def test_rules_section_comes_from_the_registry(waived_run) -> None:
    driver = sarif.document(waived_run)["runs"][0]["tool"]["driver"]
    rules = load_rules()
    assert [d["id"] for d in driver["rules"]] == [r.id for r in rules]
    for d, r in zip(driver["rules"], rules):
        assert d["shortDescription"]["text"] == r.summary
        assert d["fullDescription"]["text"]
        assert " ".join(d["fullDescription"]["text"].split()) in " ".join(r.doc.split())
        assert d["help"]["text"] == r.doc.strip()
        assert d["defaultConfiguration"]["level"] == sarif.LEVELS[r.severity]
        assert [o["name"] for o in d.get("properties", {}).get("options", [])] == [o.name for o in r.options]
    for result in sarif.document(waived_run)["runs"][0]["results"]:
        assert driver["rules"][result["ruleIndex"]]["id"] == result["ruleId"]


def test_waived_findings_are_results_with_suppressions(waived_run) -> None:
    results = sarif.document(waived_run)["runs"][0]["results"]
    suppressed = {r["ruleId"] + " " + ",".join(x["name"] for x in r["locations"][0]["logicalLocations"]
                                               if x["kind"] == "component"): r["suppressions"]
                  for r in results if "suppressions" in r}
    # SARIF §3.35.2: inSource when the suppression is written in the analysed artifact itself.
    assert suppressed == {
        "unlimited-led D2": [{"kind": "inSource", "status": "accepted",
                              "justification": "lit from a current-limited bench supply only"}],
        "resistor-overload R3": [{"kind": "external", "status": "accepted",
                                  "justification": "R3 is a 1206 part on the assembly drawing; the symbol's "
                                                   "footprint is a placeholder"}],
    }
    active = [r for r in results if "suppressions" not in r]
    assert len(active) == len(waived_run.files[0].findings)


def test_paths_with_spaces_are_percent_encoded(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    # RFC 3986 §2.1: a space is not allowed in a URI and is written %20.
    monkeypatch.chdir(tmp_path)
    (tmp_path / "lamp boards").mkdir()
    (tmp_path / "lamp boards" / "panel a.net").write_text(workshop_panel("A").text(), encoding="utf-8")
    doc = sarif.document(check(["lamp boards/panel a.net"]))
    uris = {r["locations"][0]["physicalLocation"]["artifactLocation"]["uri"] for r in doc["runs"][0]["results"]}
    assert uris == {"lamp%20boards/panel%20a.net"}


def test_cli_writes_sarif_and_keeps_the_exit_code(panel_files) -> None:
    r = subprocess.run([sys.executable, "-m", "ledlint", "check", panel_files["A"], "--format", "sarif"],
                       capture_output=True, text=True)
    assert r.returncode == 1, r.stderr
    doc = json.loads(r.stdout)
    assert {x["ruleId"] for x in doc["runs"][0]["results"]} >= {"unlimited-led", "shared-resistor-bank"}
    clean = subprocess.run([sys.executable, "-m", "ledlint", "check", panel_files["C"], "--format", "sarif"],
                           capture_output=True, text=True)
    assert clean.returncode == 0 and json.loads(clean.stdout)["runs"][0]["results"] == []
