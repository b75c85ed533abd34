"""The whole tool on real, fabricated boards: no crash, every LED accounted for, no false errors."""

from __future__ import annotations

import json
import subprocess
import sys
import tempfile

from ledlint.parts.kinds import Kind, classify, led_dies
from ledlint.netlist.kicad_net import read_netlist


def _leds(path) -> set[str]:
    out: set[str] = set()
    for comp in read_netlist(path).components:
        kind = classify(comp)
        if kind is Kind.LED_ADDRESSABLE:
            out.add(comp.ref)
        elif kind is Kind.LED:
            out |= {f"{comp.ref}:{d.name}" if d.name else comp.ref for d in led_dies(comp)} or {comp.ref}
    return out


def test_every_corpus_board_checks_cleanly(corpus) -> None:
    for path in corpus:
        r = subprocess.run([sys.executable, "-m", "ledlint", "check", str(path), "--format", "json"],
                           capture_output=True, text=True, cwd=tempfile.gettempdir())
        assert r.returncode in (0, 1), (path.name, r.stderr)
        assert "Traceback" not in r.stderr and r.stderr == "", (path.name, r.stderr)
        doc = json.loads(r.stdout)
        listed = [i for c in doc["circuits"] for i in c["leds"]]
        assert len(listed) == len(set(listed)), path.name  # no LED in two circuits
        assert set(listed) == _leds(path), path.name  # and none left out
        # These boards were built and work: an error on one of them would be a false alarm.
        errors = [f for f in doc["findings"] if f["severity"] == "error"]
        assert errors == [], (path.name, [f["message"] for f in errors])
        for f in doc["findings"]:
            assert f["refs"] and f["message"] and f["line"] > 0, (path.name, f)


def test_text_report_of_the_whole_corpus(corpus) -> None:
    folder = corpus[0].parent
    r = subprocess.run([sys.executable, "-m", "ledlint", "check", str(folder), "--circuits"], capture_output=True,
                       text=True, cwd=tempfile.gettempdir())
    assert r.returncode == 0 and "Traceback" not in r.stderr
    assert f"{len(corpus)} file(s)" in r.stdout
    assert "CAUTION" in r.stdout  # the lamp board's rectifier-fed strings (MANIFEST.md: behind a bridge)
