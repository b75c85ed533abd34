"""The command line as a user meets it: exit codes, formats, clean errors."""

from __future__ import annotations

import json
import subprocess
import sys
import tempfile

from paths import FIXTURES, SAMPLES


def run(*args: str, cwd=None) -> subprocess.CompletedProcess[str]:
    # A neutral working folder, so `python -m` imports the installed package, not the checkout.
    return subprocess.run([sys.executable, "-m", "ledlint", *args], capture_output=True, text=True,
                          cwd=cwd or tempfile.gettempdir())


def test_version() -> None:
    r = run("--version")
    assert r.returncode == 0 and r.stdout.startswith("ledlint ")


def test_folder_is_searched_for_netlists() -> None:
    r = run("check", str(SAMPLES), "--format", "json")
    assert r.returncode in (0, 1), r.stderr
    doc = json.loads(r.stdout)
    assert doc["schema"] == 1 and "findings" in doc and "circuits" in doc
    assert any(f["path"].endswith("bench-supply-status.net") for f in doc["files"])


def test_inventory_counts_in_json() -> None:
    r = run("check", str(FIXTURES / "kicad5-minimal.net"), "--format", "json")
    f = json.loads(r.stdout)["files"][0]
    assert (f["components"], f["nets"], f["leds"]) == (4, 5, 1)


def test_bad_input_is_one_line_exit_2_and_nothing_on_stdout(tmp_path) -> None:
    bad = tmp_path / "board.net"
    bad.write_text("(export (version E)\n  (components\n")
    r = run("check", str(bad), str(SAMPLES / "bench-supply-status.net"), "--format", "json")
    assert r.returncode == 2
    assert r.stdout == ""  # nothing half-written
    assert r.stderr.count("\n") == 1 and f"{bad}:2:14: error: unexpected end of file"  # just past the last token in r.stderr
    assert "Traceback" not in r.stderr


def test_missing_file_unknown_option_and_no_command() -> None:
    assert run("check", "nope.net").returncode == 2
    assert run("check", "--frobnicate", "x.net").returncode == 2
    assert run().returncode == 2


def test_empty_folder_is_an_error(tmp_path) -> None:
    r = run("check", str(tmp_path))
    assert r.returncode == 2 and "no *.net files" in r.stderr


def test_lazy_format_tables_match_their_modules() -> None:
    from ledlint import baseline, cli, diff

    assert cli.DIFF_FORMATS == tuple(diff.FORMATS) and cli.BASELINE_NAME == baseline.DEFAULT_NAME
    for module in cli.FORMATS.values():
        assert callable(cli._module(module).render)


def test_an_interrupt_is_one_line_and_exit_130(monkeypatch, capsys) -> None:
    """Ctrl-C: the shell's convention, 128 + SIGINT (common practice), and no traceback."""
    from ledlint import cli

    def interrupted(*args, **kwargs):
        raise KeyboardInterrupt

    monkeypatch.setattr(cli, "check", interrupted)
    assert cli.main(["check", str(SAMPLES)]) == 130
    assert capsys.readouterr().err == "ledlint: interrupted; nothing written\n"
