"""The README's shown output is the tool's real output (common practice: docs that cannot drift)."""

from __future__ import annotations

import os
import re
import subprocess
import sys

from paths import REPO as ROOT

from ledlint.review.rules import load_rules

README = (ROOT / "README.md").read_text(encoding="utf-8")


def test_real_output_block_matches_the_tool() -> None:
    m = re.search(r"Real output, `ledlint check (\S+)`[^\n]*\n\n```\n(.*?)\n```", README, re.S)
    assert m, "the README's real-output block"
    env = dict(os.environ, COLUMNS="100", NO_COLOR="1")
    r = subprocess.run([sys.executable, "-m", "ledlint", "check", m.group(1)], cwd=ROOT, env=env,
                       capture_output=True, text=True)
    assert r.returncode == 1
    assert r.stdout.rstrip("\n") == m.group(2)


def test_rule_table_lists_every_rule() -> None:
    section = README.split("## What it checks", 1)[1].split("\n## ", 1)[0]
    table = set(re.findall(r"^\| `([a-z-]+)` \|", section, re.M))
    assert table == {r.id for r in load_rules()}
