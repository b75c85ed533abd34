"""The pre-commit hook, through the real pre-commit package in a throwaway git repository."""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from conftest import workshop_panel
from paths import REPO

pre_commit = pytest.importorskip("pre_commit", reason="the pre-commit package is not installed (test extra)")
if shutil.which("git") is None:
    pytest.skip("git is not installed", allow_module_level=True)

MANIFEST = REPO / ".pre-commit-hooks.yaml"


def _git(*args: str, cwd: Path, env: dict[str, str] | None = None) -> subprocess.CompletedProcess[str]:
    return subprocess.run(["git", *args], cwd=cwd, capture_output=True, text=True, env=env, timeout=900)


def _new_repo(path: Path) -> None:
    path.mkdir()
    for args in (("init", "-q", "-b", "main"), ("config", "user.name", "Panel Designer"),
                 ("config", "user.email", "designer@example.invalid"), ("config", "commit.gpgsign", "false")):
        assert _git(*args, cwd=path).returncode == 0


def _snapshot(target: Path) -> str:
    """This working tree (committed or not) as a repository of its own: pre-commit installs a
    hook from a commit, and the hook under test is the one in the working tree."""
    listed = _git("ls-files", "-z", "--cached", "--others", "--exclude-standard", cwd=REPO)
    if listed.returncode != 0:
        pytest.skip(f"{REPO} is not a git checkout: {listed.stderr.strip()}")
    _new_repo(target)
    for name in filter(None, listed.stdout.split("\0")):
        source = REPO / name
        if source.is_file():
            (target / name).parent.mkdir(parents=True, exist_ok=True)
            shutil.copy2(source, target / name)
    assert _git("add", "-A", cwd=target).returncode == 0
    assert _git("commit", "-q", "-m", "snapshot", cwd=target).returncode == 0
    return _git("rev-parse", "HEAD", cwd=target).stdout.strip()


def test_manifest_is_valid() -> None:
    r = subprocess.run([sys.executable, "-m", "pre_commit", "validate-manifest", str(MANIFEST)],
                       capture_output=True, text=True)
    assert r.returncode == 0, r.stdout + r.stderr
    text = MANIFEST.read_text(encoding="utf-8")
    assert "entry: ledlint check" in text and "language: python" in text and r"files: \.net$" in text


def test_bad_netlist_commit_is_refused_and_good_one_passes(tmp_path: Path) -> None:
    sha = _snapshot(tmp_path / "ledlint")
    hardware = tmp_path / "hardware"
    _new_repo(hardware)
    (hardware / ".pre-commit-config.yaml").write_text(
        f"repos:\n  - repo: {(tmp_path / 'ledlint').as_posix()}\n    rev: {sha}\n    hooks:\n      - id: ledlint\n",
        encoding="utf-8")
    env = dict(os.environ, PRE_COMMIT_HOME=str(tmp_path / "pre-commit-cache"), PRE_COMMIT_COLOR="never")
    env.pop("PRE_COMMIT_ALLOW_NO_CONFIG", None)
    install = subprocess.run([sys.executable, "-m", "pre_commit", "install"], cwd=hardware, capture_output=True,
                             text=True, env=env)
    assert install.returncode == 0, install.stdout + install.stderr
    # Installing the hook's environment (pip from the package index) happens at the first commit.
    _git("add", ".pre-commit-config.yaml", cwd=hardware)
    first = _git("commit", "-q", "-m", "Hook configuration", cwd=hardware, env=env)
    assert first.returncode == 0, first.stdout + first.stderr

    board = hardware / "panel.net"
    board.write_text(workshop_panel("A").text(), encoding="utf-8")
    (hardware / "notes.txt").write_text("not a netlist: the hook leaves it alone\n", encoding="utf-8")
    _git("add", "panel.net", "notes.txt", cwd=hardware)
    bad = _git("commit", "-m", "Panel revision A", cwd=hardware, env=env)
    output = bad.stdout + bad.stderr
    assert bad.returncode != 0, output
    assert "unlimited-led" in output and "shared-resistor-bank" in output and "Failed" in output
    assert _git("rev-list", "--count", "HEAD", cwd=hardware).stdout.strip() == "1"  # nothing committed

    board.write_text(workshop_panel("C").text(), encoding="utf-8")
    _git("add", "panel.net", cwd=hardware)
    good = _git("commit", "-m", "Panel revision C", cwd=hardware, env=env)
    assert good.returncode == 0, good.stdout + good.stderr
    assert "Passed" in good.stdout + good.stderr
    assert _git("rev-list", "--count", "HEAD", cwd=hardware).stdout.strip() == "2"
    assert _git("show", "HEAD:panel.net", cwd=hardware).stdout == workshop_panel("C").text()
