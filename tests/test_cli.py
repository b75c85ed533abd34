"""The command line as a user meets it: exit codes, formats, clean errors."""

from __future__ import annotations

import json
import os
import subprocess
import sys
import tempfile

import pytest

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
    from ledlint import cli
    from ledlint.review import baseline

    assert cli.BASELINE_NAME == baseline.DEFAULT_NAME
    for fmt in cli.DIFF_FORMATS:
        assert callable(cli._module(cli.FORMATS[fmt]).render_diff)
    for module in cli.FORMATS.values():
        assert callable(cli._module(module).render)


def test_an_interrupt_is_one_line_and_exit_130(monkeypatch, capsys) -> None:
    """Ctrl-C: the shell's convention, 128 + SIGINT (common practice), and no traceback."""
    from ledlint import cli
    from ledlint.review import run

    def interrupted(*args, **kwargs):
        raise KeyboardInterrupt

    monkeypatch.setattr(run, "check", interrupted)  # the command line loads it when it checks
    assert cli.main(["check", str(SAMPLES)]) == 130
    assert capsys.readouterr().err == "ledlint: interrupted; nothing written\n"


@pytest.mark.skipif(not os.path.exists("/dev/full"), reason="needs /dev/full")
def test_a_full_disk_on_standard_output_is_a_clear_error() -> None:
    with open("/dev/full", "w") as full:
        r = subprocess.run([sys.executable, "-m", "ledlint", "check", str(SAMPLES / "rgb-status.net")],
                           stdout=full, stderr=subprocess.PIPE, text=True, cwd=tempfile.gettempdir())
    assert r.returncode == 2 and "cannot write the report to standard output" in r.stderr
    assert "Traceback" not in r.stderr


@pytest.mark.skipif(not os.path.exists("/dev/zero"), reason="needs /dev/zero")
def test_an_endless_binary_stream_is_refused_at_once() -> None:
    r = run("check", "/dev/zero")
    assert r.returncode == 2 and "binary file (NUL byte)" in r.stderr


@pytest.mark.parametrize("argv", [["--version"], ["rules"], ["explain", "current-margin"]])
def test_listing_the_rules_loads_no_numerical_or_graph_library(argv: list[str]) -> None:
    # `--version`, `rules` and `explain` answer at once: numpy, networkx and rich load only when a
    # board is checked or a report drawn (run in a fresh interpreter, whose modules start empty).
    code = ("import sys; from ledlint.cli import main\n"
            "try:\n    main(sys.argv[1:])\nexcept SystemExit:\n    pass\n"
            "print(sorted(m for m in sys.modules if m.split('.')[0] in ('numpy', 'networkx', 'rich')))")
    done = subprocess.run([sys.executable, "-c", code, *argv], capture_output=True, text=True)
    assert done.stdout.strip().splitlines()[-1] == "[]", done.stdout + done.stderr
