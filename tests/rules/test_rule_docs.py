"""Every rule documents itself: the six sections, printed by `ledlint explain ID`."""

from __future__ import annotations

import re
import subprocess
import sys
import tempfile

import pytest

from ledlint.cli import main
from ledlint.checks.registry import DOC_SECTIONS
from ledlint.review.rules import load_rules

RULES = {r.id: r for r in load_rules(include_plugins=False)}


def sections(doc: str) -> dict[str, str]:
    """Section title (a line of its own, not indented) → its indented body."""
    found: dict[str, list[str]] = {}
    current = None
    for line in doc.splitlines():
        if line in DOC_SECTIONS:
            current = line
            found[current] = []
        elif current is not None:
            found[current].append(line)
    return {title: "\n".join(body).strip("\n") for title, body in found.items()}


@pytest.mark.parametrize("rule_id", sorted(RULES))
def test_docstring_has_every_section(rule_id: str) -> None:
    doc = RULES[rule_id].doc
    assert doc.splitlines()[0].startswith(f"{rule_id}: "), "the first line names the rule"
    found = sections(doc)
    assert list(found) == list(DOC_SECTIONS), f"{rule_id}: sections {list(found)}"
    for title, body in found.items():
        assert body.strip(), f"{rule_id}: section {title!r} is empty"
        assert all(not line or line.startswith("    ") for line in body.splitlines()), \
            f"{rule_id}: section {title!r} is not indented under its title"


@pytest.mark.parametrize("rule_id", sorted(RULES))
def test_explain_prints_the_documentation(rule_id: str, capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["explain", rule_id]) == 0
    out = capsys.readouterr().out
    rule = RULES[rule_id]
    assert out.startswith(rule.doc.strip())
    assert f"Default severity: {rule.severity.value}" in out
    for option in rule.options:
        assert re.search(rf"^    {option.name} = ", out, re.M), f"option {option.name} not listed"


def test_explain_from_the_command_line() -> None:
    r = subprocess.run([sys.executable, "-m", "ledlint", "explain", "reverse-bias"], capture_output=True, text=True,
                       cwd=tempfile.gettempdir())
    assert r.returncode == 0 and r.stderr == ""
    assert all(f"\n{title}\n" in r.stdout for title in DOC_SECTIONS)


def test_explain_unknown_rule_suggests_the_nearest(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["explain", "reverse-bais"]) == 2
    assert "reverse-bias" in capsys.readouterr().err


def test_every_rule_module_is_listed_and_declares_what_it_reads() -> None:
    # Built-in rules are listed explicitly (rules/__init__.py); a module left off would never run.
    import ledlint.rules
    from pathlib import Path

    modules = {p.stem for p in Path(ledlint.rules.__file__).parent.glob("*.py") if not p.stem.startswith("_")}
    assert modules == set(ledlint.rules.BUILTIN)
    assert all(r.kinds for r in RULES.values()), [r.id for r in RULES.values() if not r.kinds]


def test_shared_options_are_declared_by_the_rule_that_owns_them() -> None:
    # A rule reads another's option through one definition (rules/_options.py), never by restating
    # its default: the owner declares that very Option.
    from ledlint.checks.registry import OptionOf
    from ledlint.rules import _options

    shared = [v for v in vars(_options).values() if isinstance(v, OptionOf)]
    assert shared
    for s in shared:
        assert any(o is s.option for o in RULES[s.rule].options), (s.rule, s.option.name)
