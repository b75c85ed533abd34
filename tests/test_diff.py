"""Netlist diff: circuits matched by their LEDs, figures that moved, findings that came and went."""

from __future__ import annotations

import json
import subprocess
import sys
from collections import Counter

import pytest

from ledlint.report import json_doc, markdown
from ledlint.report import text as text_report
from ledlint.review import diff
from ledlint.review.diff import Moved, Measure, Status
from ledlint.checks.findings import Finding, Severity
from ledlint.circuits.bank import ResistorBank
from ledlint.circuits.recognise import CircuitKind, LedCircuit
from ledlint.circuits.string import SeriesString
from ledlint.parts.kinds import LedId
from ledlint.review.run import check


@pytest.fixture
def a_to_b(panel_files) -> diff.NetlistDiff:
    return diff.diff_files(panel_files["A"], panel_files["B"])


def _by_id(d: diff.NetlistDiff) -> dict[str, diff.CircuitDiff]:
    return {c.id: c for c in d.circuits}


def test_circuits_are_matched_by_their_leds(a_to_b) -> None:
    c = _by_id(a_to_b)
    assert {k: v.status for k, v in c.items()} == {
        "D1": Status.CHANGED,  # 47 Ω → 510 Ω
        "D2": Status.REMOVED,  # the LED straight across +5V
        "D3": Status.CHANGED,  # was a bank with D4, now alone behind R3
        "D4": Status.ADDED,  # its own ballast R4 now
        "D5": Status.ADDED,  # new on +3V3
        "D6": Status.UNCHANGED,
    }
    assert c["D3"].kind == "shared-resistor-bank → series-string"
    assert c["D3"].leds_removed == ("D4",) and c["D3"].leds_added == ()
    assert c["D4"].elsewhere == ("D3",) and c["D5"].elsewhere == () and c["D2"].elsewhere == ()
    assert c["D6"].moved == () and c["D6"].appeared == () and c["D6"].gone == ()
    counts = a_to_b.counts()
    assert [counts[s.value] for s in Status] == [2, 1, 2, 1]  # added, removed, changed, unchanged


def test_moved_figures_agree_with_ohms_and_joules_laws(a_to_b) -> None:
    d1 = {(m.quantity, m.subject): m for m in _by_id(a_to_b)["D1"].moved}
    current = d1[(Measure.CURRENT, "D1")]
    # Ohm's law (handbook): (12 V − Vf) / 510 Ω with the field's Vf = 2.0 V at 20 mA; the LED
    # runs just under 20 mA, so its Vf is a little lower and the current a little higher.
    ohm = (12.0 - 2.0) / 510
    assert ohm <= current.new.value <= ohm * 1.02
    # Before, 47 Ω: the current is less than (12 − 2.0) / 47 because Vf rises with current
    # (Shockley diode equation with series resistance, field-facts §5c).
    assert 0.1 < current.old.value < (12.0 - 2.0) / 47
    power = d1[(Measure.DISSIPATION, "R1")]
    # Joule's law P = I²R at the worst corner (highest current, lowest resistance: 510 Ω − 5 %,
    # the tolerance the tool states it assumed for R1).
    assert power.new.value == pytest.approx(current.new.high ** 2 * 510 * 0.95, rel=0.005)
    assert power.old.value == pytest.approx(current.old.high ** 2 * 47 * 0.95, rel=0.005)
    assert d1[(Measure.HEADROOM, "")].new.value > d1[(Measure.HEADROOM, "")].old.value


def test_figures_come_from_the_analysis(a_to_b, panel_files) -> None:
    new = check([panel_files["B"]]).files[0].board
    d5 = next(a for a in new.analyses if a.circuit.id == "D5")
    moved = {(m.quantity, m.subject): m for m in _by_id(a_to_b)["D5"].moved}
    assert moved[(Measure.CURRENT, "D5")].old is None
    assert moved[(Measure.CURRENT, "D5")].new == diff.Reading(d5.leds[0].current.nominal,
                                                                d5.leds[0].current.minimum,
                                                                d5.leds[0].current.maximum)
    assert moved[(Measure.HEADROOM, "")].new.value == d5.headroom_v < 0
    assert moved[(Measure.DISSIPATION, "R5")].new.value == d5.resistors[0].power_max


def test_findings_that_appeared_and_went_away(a_to_b, panel_files) -> None:
    old = Counter(f.fingerprint for f in check([panel_files["A"]]).findings)
    new = Counter(f.fingerprint for f in check([panel_files["B"]]).findings)
    appeared = [f for c in a_to_b.circuits for f in c.appeared] + list(a_to_b.appeared)
    gone = [f for c in a_to_b.circuits for f in c.gone] + list(a_to_b.gone)
    assert Counter(f.fingerprint for f in appeared) == new - old
    assert Counter(f.fingerprint for f in gone) == old - new
    c = _by_id(a_to_b)
    assert {f.rule for f in c["D5"].appeared} == {"current-margin", "supply-headroom"}
    assert {f.rule for f in c["D2"].gone} == {"unlimited-led"}
    assert "shared-resistor-bank" in {f.rule for f in c["D3"].gone}
    assert {f.rule for f in c["D1"].gone} == {"current-margin", "resistor-overload"} and not c["D1"].appeared


def test_same_netlist_is_no_change(panel_files) -> None:
    d = diff.diff_files(panel_files["C"], panel_files["C"])
    assert {c.status for c in d.circuits} == {Status.UNCHANGED}
    assert "No electrical change." in markdown.render_diff(d)
    assert text_report.render_diff(d).splitlines()[-1].startswith("0 circuit(s) changed, 0 added, 0 removed, 4 unchanged")


def test_only_a_change_past_three_figures_counts() -> None:
    # Every report prints three significant figures (units.quantity); less is not a change.
    assert diff.Reading(0.0149).same(diff.Reading(0.01491))
    assert not diff.Reading(0.0149).same(diff.Reading(0.0150))
    assert not diff.Reading(0.01, 0.008, 0.012).same(diff.Reading(0.01, 0.008, 0.013))


def _fixed_diff() -> diff.NetlistDiff:
    """A diff written out by hand, so the golden files pin the layout, not the engine's figures."""
    def circuit(cid: str, kind: CircuitKind, *leds: str) -> LedCircuit:
        made = {CircuitKind.STRING: SeriesString, CircuitKind.BANK: ResistorBank}[kind]
        return made(cid, tuple(LedId(x) for x in leds), 0, "/")

    def finding(rule: str, severity: Severity, message: str, *refs: str) -> Finding:
        return Finding(rule, severity, message, "boards/panel.net", 20, refs, ("+5V", "GND"), circuit=refs[0])

    string, bank = CircuitKind.STRING, CircuitKind.BANK
    return diff.NetlistDiff("boards/panel-a.net", "boards/panel-b.net", (
        diff.CircuitDiff(Status.CHANGED, circuit("D1", string, "D1"), circuit("D1", string, "D1"), (
            Moved(Measure.CURRENT, "D1", diff.Reading(0.194, 0.170, 0.219), diff.Reading(0.0197, 0.0172, 0.0224)),
            Moved(Measure.DISSIPATION, "R1", diff.Reading(2.15), diff.Reading(0.243)),
            Moved(Measure.HEADROOM, "", diff.Reading(7.89), diff.Reading(9.15))),
            gone=(finding("current-margin", Severity.ERROR, "D1 can carry 219 mA | more than 30 mA", "D1", "R1"),),
            edits=(diff.Edit("R1", "value", "47", "510"), diff.Edit("R1", "Power", None, "1/4W"),
                   diff.Edit("Q9", "part", None, ""))),
        diff.CircuitDiff(Status.CHANGED, circuit("D3", bank, "D3", "D4"), circuit("D3", string, "D3"), (
            Moved(Measure.CURRENT, "D4", diff.Reading(0.0149, 0.000131, 0.034), None),),
            appeared=(finding("resistor-overload", Severity.WARNING, "R3 at 62.2 mW, 50% of <its> rating", "R3"),)),
        diff.CircuitDiff(Status.ADDED, None, circuit("D4", string, "D4"), (
            Moved(Measure.CURRENT, "D4", None, diff.Reading(0.0149, 0.0119, 0.0181)),), elsewhere=("D3",)),
        diff.CircuitDiff(Status.REMOVED, circuit("D2", string, "D2"), None,
                         gone=(finding("unlimited-led", Severity.ERROR, "D2 sits across +5V and GND", "D2"),)),
        diff.CircuitDiff(Status.UNCHANGED, circuit("D6", string, "D6"), circuit("D6", string, "D6")),
    ), appeared=(finding("missing-parameter", Severity.INFO, "U1 pin current unknown", "U1"),), gone=())


def test_golden_diff(golden) -> None:
    fixed = _fixed_diff()
    golden("diff.txt", text_report.render_diff(fixed))
    golden("diff.json", json_doc.render_diff(fixed))
    golden("diff.md", markdown.render_diff(fixed))


def test_cli_diff(panel_files) -> None:
    def run(*args: str) -> subprocess.CompletedProcess[str]:
        return subprocess.run([sys.executable, "-m", "ledlint", "diff", *args], capture_output=True, text=True)

    text = run(panel_files["A"], panel_files["B"])
    assert text.returncode == 0, text.stderr
    assert text.stdout.startswith("boards/panel-a.net → boards/panel-b.net\n")
    doc = json.loads(run(panel_files["A"], panel_files["B"], "--format", "json").stdout)
    assert doc["schema"] == json_doc.DIFF_SCHEMA and doc["summary"]["added"] == 2
    assert {c["id"]: c["status"] for c in doc["circuits"]}["D2"] == "removed"
    assert run(panel_files["A"], panel_files["B"], "--format", "markdown").stdout.startswith("**ledlint diff**")
    missing = run(panel_files["A"], "boards/nowhere.net")
    assert missing.returncode == 2 and "boards/nowhere.net" in missing.stderr and "Traceback" not in missing.stderr
    assert run(panel_files["A"]).returncode == 2  # NEW is required


def test_the_edits_behind_a_change_are_named(a_to_b) -> None:
    """Revision B of the workshop panel gives R1 510 Ω for A's 47 Ω and a 1210 footprint, and
    splits R3's bank with a new R4 (tests/conftest.py: workshop_panel)."""
    by = _by_id(a_to_b)
    assert [e.text() for e in by["D1"].edits] == [
        "R1 value 47 → 510", "R1 footprint Resistor_SMD:R_0603_1608Metric → Resistor_SMD:R_1210_3225Metric"]
    assert "R3 value 100 → 200" in [e.text() for e in by["D3"].edits]
    text = text_report.render_diff(a_to_b)
    assert "    edit R1 value 47 → 510" in text


def test_a_base_resistor_edit_and_a_severity_change_show(tmp_path) -> None:
    """A base resistor is not in the LEDs' path but decides the switch: its edit is listed, and a
    switch-drive error that became a warning shows as one gone and one appeared."""
    from kicad8 import Board

    def board(r_b: str) -> Board:
        b = Board("npn", "diff fixture")
        b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8_3.9x4.9mm_P1.27mm", {"1": "+3V3", "2": "/ON", "8": "GND"})
        b.resistor("R2", r_b, "/ON", "Net-(Q1-B)")
        b.resistor("R1", "150", "+5V", "Net-(D1-A)", footprint="Resistor_SMD:R_1206_3216Metric")
        b.led("D1", "red", "Net-(D1-A)", "Net-(D1-K)", Vf="2.0V@20mA", If_max="30mA", Rth="0")
        b.add("Q1", "Q_NPN_BEC", "NPN", "Package_TO_SOT_SMD:SOT-23", {"1": "Net-(Q1-B)", "2": "GND", "3": "Net-(D1-K)"})
        return b

    old, new = tmp_path / "old.net", tmp_path / "new.net"
    old.write_text(board("100k").text(), encoding="utf-8")
    new.write_text(board("33k").text(), encoding="utf-8")
    d = diff.diff_files(old, new)
    c = _by_id(d)["D1"]
    assert c.status is Status.CHANGED and [e.text() for e in c.edits] == ["R2 value 100k → 33k"]
    assert [(f.rule, f.severity) for f in c.gone] == [("switch-drive", Severity.ERROR)]
    assert [(f.rule, f.severity) for f in c.appeared] == [("switch-drive", Severity.WARNING)]


def test_a_part_turned_round_shows_as_rewired(tmp_path) -> None:
    from kicad8 import Board

    def board(turned: bool) -> Board:
        b = Board("door", "diff fixture")
        b.resistor("R8", "330", "+5V", "/K" if turned else "/A")
        if turned:
            b.led("D8", "yellow", "GND", "/K", Vf="2.1V@20mA")  # anode on ground: fitted backwards
        else:
            b.led("D8", "yellow", "/A", "GND", Vf="2.1V@20mA")
        return b

    old, new = tmp_path / "old.net", tmp_path / "new.net"
    old.write_text(board(True).text(), encoding="utf-8")
    new.write_text(board(False).text(), encoding="utf-8")
    c = _by_id(diff.diff_files(old, new))["D8"]
    assert "D8 pins 1 /K, 2 GND → 1 GND, 2 /A" in [e.text() for e in c.edits]
    assert [m.side(m.old) for m in c.moved if m.label == "current D8"] == ["0 A"]  # reversed: leakage only
