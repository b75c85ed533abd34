"""A whole check run: exit codes, severity overrides, waivers, JSON keys, fingerprints."""

from __future__ import annotations

import json
import math
import subprocess
import sys
import tempfile

import pytest

from kicad8 import Board
from ledlint.errors import LedlintError
from ledlint.checks.findings import fingerprint
from ledlint.review.run import check


def _board(tmp_path, waive: str | None = None, name: str = "panel"):
    b = Board(name, "test panel")
    b.led("D1", "red", "+3V3", "GND", **({"ledlint_waive": waive} if waive else {}))  # nothing limits it
    b.resistor("R1", "1k", "+5V", "/A")
    b.led("D2", "red", "/A", "GND")
    f = tmp_path / f"{name}.net"
    f.write_text(b.text(), encoding="utf-8")
    return f


def _cli(*args: str, cwd=None) -> subprocess.CompletedProcess[str]:
    return subprocess.run([sys.executable, "-m", "ledlint", *args], capture_output=True, text=True,
                          cwd=cwd or tempfile.gettempdir())


def test_unlimited_led_fails_the_run(tmp_path) -> None:
    f = _board(tmp_path)
    result = check([f])
    rules = [x.rule for x in result.findings]
    assert "unlimited-led" in rules and result.failed("error")
    r = _cli("check", str(f))
    assert r.returncode == 1 and "unlimited-led" in r.stdout
    assert _cli("check", str(f), "--fail-on", "never").returncode == 0


def test_fail_on_levels(tmp_path) -> None:
    b = Board("ok", "ok")
    b.resistor("R1", "330", "/P", "/A")  # a net with no known voltage: only an info finding
    b.led("D1", "red", "/A", "GND")
    b.add("J1", "Conn_01x02", "Conn", "Connector:Conn_01x02", {"1": "/P", "2": "GND"})
    f = tmp_path / "ok.net"
    f.write_text(b.text(), encoding="utf-8")
    result = check([f])
    assert result.findings and all(x.severity.value == "info" for x in result.findings)
    assert not result.failed("error") and not result.failed("warning") and result.failed("info")


def test_severity_override_and_off(tmp_path) -> None:
    f = _board(tmp_path)
    (tmp_path / "ledlint.toml").write_text('[rules.unlimited-led]\nseverity = "warning"\n')
    assert {x.severity.value for x in check([f]).findings if x.rule == "unlimited-led"} == {"warning"}
    (tmp_path / "ledlint.toml").write_text('[rules.unlimited-led]\nseverity = "off"\n')
    assert "unlimited-led" not in {x.rule for x in check([f]).findings}


def test_config_waiver_silences_and_unused_waiver_is_reported(tmp_path) -> None:
    f = _board(tmp_path)
    (tmp_path / "ledlint.toml").write_text(
        '[[waivers]]\nrule = "unlimited-led"\nref = "D1"\nreason = "test jig only"\n'
        '[[waivers]]\nrule = "reverse-bias"\nref = "D9"\nreason = "stale"\n')
    result = check([f])
    assert "unlimited-led" not in {x.rule for x in result.findings}
    waived = [x for fr in result.files for x in fr.waived]
    assert waived[0].rule == "unlimited-led" and waived[0].waived == "test jig only"
    assert [w.ref for w in result.unused_waivers] == ["D9"]
    doc = json.loads(_cli("check", str(f), "--format", "json").stdout)
    assert doc["waived"][0]["waived"] == "test jig only" and doc["unused_waivers"][0]["ref"] == "D9"


def test_field_waiver_on_the_part(tmp_path) -> None:
    f = _board(tmp_path, waive="unlimited-led: bench fixture, supply current-limited")
    result = check([f])
    assert "unlimited-led" not in {x.rule for x in result.findings}
    assert result.files[0].waived[0].waived == "bench fixture, supply current-limited"


@pytest.mark.parametrize(("waive", "words"), [("unlimted-led: x", "did you mean 'unlimited-led'?"),
                                              ("unlimited-led", "needs a reason")])
def test_bad_field_waiver_is_bad_input(tmp_path, waive: str, words: str) -> None:
    f = _board(tmp_path, waive=waive)
    with pytest.raises(LedlintError, match=words):
        check([f])
    r = _cli("check", str(f))
    assert r.returncode == 2 and r.stdout == "" and "Traceback" not in r.stderr


def test_json_finding_and_circuit_keys(tmp_path) -> None:
    doc = json.loads(_cli("check", str(_board(tmp_path)), "--format", "json").stdout)
    assert doc["schema"] == 1
    f = doc["findings"][0]
    assert {"rule", "severity", "message", "file", "line", "refs", "nets", "values", "hint",
            "fingerprint"} <= set(f)
    c = next(c for c in doc["circuits"] if c["id"] == "D2")
    assert {"file", "id", "kind", "leds", "ballast", "supply_net", "return_net", "current_a",
            "resistor_power_w", "headroom_v"} <= set(c)
    assert set(c["current_a"]) == {"nominal", "min", "max"}
    # D2: red LED (1.85 V at 20 mA, field-facts §5a) from 5 V through 1 kΩ. Ohm's law with Vf at the
    # operating current, from the Shockley equation with series resistance (field-facts §5c):
    # Vf(I) = 1.85 − n·Vt·ln(20 mA / I) − Rs·(20 mA − I), n = 2, Rs = 0.2 V / 20 mA = 10 Ω.
    i = 3e-3
    for _ in range(50):
        i = (5.0 - (1.85 - 2 * 0.025693 * math.log(0.020 / i) - 10 * (0.020 - i))) / 1000
    assert c["current_a"]["nominal"] == pytest.approx(i, rel=0.01)


def test_fingerprints_ignore_order_and_lines() -> None:
    assert fingerprint("r", ("R1", "D1"), ("GND", "+5V")) == fingerprint("r", ("D1", "R1"), ("+5V", "GND"))
    assert fingerprint("r", ("D1",), ()) != fingerprint("s", ("D1",), ())


def test_output_file_is_written_whole(tmp_path) -> None:
    out = tmp_path / "report.json"
    r = _cli("check", str(_board(tmp_path)), "--format", "json", "--output", str(out))
    assert r.returncode == 1 and r.stdout == "" and json.loads(out.read_text())["findings"]
    bad = tmp_path / "bad.net"
    bad.write_text("(export (version E)")
    out2 = tmp_path / "never.json"
    assert _cli("check", str(bad), "--output", str(out2)).returncode == 2 and not out2.exists()


def test_rules_and_explain_commands() -> None:
    r = _cli("rules", "--format", "json")
    ids = [x["id"] for x in json.loads(r.stdout)]
    for rid in ("shared-resistor-bank", "resistor-overload", "supply-headroom", "current-margin", "unlimited-led",
                "reverse-bias", "pin-overcurrent", "thermal-runaway", "junction-temperature", "missing-parameter",
                "driver-parallel-strings", "driver-headroom"):
        assert rid in ids
    e = _cli("explain", "thermal-runaway")
    assert e.returncode == 0 and "Formula" in e.stdout and "gain_limit" in e.stdout
    assert _cli("explain", "no-such-rule").returncode == 2


def test_the_public_api_checks_a_netlist_in_memory() -> None:
    # ledlint.api is what scripts and third-party rules import (DEVELOPERS.md): the same findings
    # as a file check, from text and a configuration mapping.
    from kicad8 import Board
    from ledlint import api

    b = Board("api", "api")
    b.resistor("R1", "47", "+5V", "/A")
    b.led("D1", "red", "/A", "GND", Vf="2.0V@20mA", If_max="20mA")
    result = api.check_text(b.text(), "api.net", api.from_mapping({"ambient": {"min": 25, "max": 25}}))
    assert {f.rule for f in result.findings} >= {"current-margin"}
    assert isinstance(result.board.analyses[0], api.StringResult)
    assert {r.id for r in api.load_rules(include_plugins=False)} >= {"current-margin", "unlimited-led"}
