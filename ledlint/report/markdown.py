"""Markdown report: a compact table of findings for a pull-request comment, and the shared plain wording."""

from __future__ import annotations

import os
from pathlib import Path

from ledlint.config import Waiver
from ledlint.findings import Finding
from ledlint.report import printable
from ledlint.report.text import SAFETY
from ledlint.run import RunResult

MAX_ROWS = 100  # a comment stays readable (and under the size a code host accepts); the rest is counted
_MAX_REFS = 8


def posix_path(path: str | Path, start: str | Path | None = None) -> str:
    """`path` relative to `start` (default: the working folder) with forward slashes; absolute
    when it cannot be made relative (another drive)."""
    target = Path(path).resolve()
    try:
        return Path(os.path.relpath(target, Path(start or os.getcwd()).resolve())).as_posix()
    except ValueError:
        return target.as_posix()


def unused_waiver(w: Waiver) -> str:
    return f"unused waiver {w.rule} for {w.ref or w.fingerprint} ({w.origin}): it silences nothing"


def summary(result: RunResult) -> str:
    """One line for the whole run: files, circuits, findings by severity, waived."""
    counts = result.counts()
    circuits = sum(len(fr.board.circuits) for fr in result.files)
    analysed = sum(a.solved for fr in result.files for a in fr.board.analyses)
    waived = sum(len(fr.waived) for fr in result.files)
    return (f"{len(result.files)} file(s) · {circuits} circuit(s), {analysed} analysed · "
            f"{counts['error']} error(s) · {counts['warning']} warning(s) · {counts['info']} info"
            + (f" · {waived} waived" if waived else ""))


def cell(text: str) -> str:
    """Text safe inside a table cell: one line, pipes escaped, no stray HTML."""
    return printable(" ".join(text.split())).replace("\\", "\\\\").replace("|", "\\|").replace("<", "&lt;")


def refs_text(refs: tuple[str, ...]) -> str:
    return ", ".join(refs[:_MAX_REFS]) + (f" … ({len(refs)} parts)" if len(refs) > _MAX_REFS else "")


def _row(f: Finding) -> str:
    where = posix_path(f.file) + (f":{f.line}" if f.line else "")
    what = cell(f.message) + (f"<br>**fix:** {cell(f.hint)}" if f.hint else "")
    return f"| {f.severity.value} | `{f.rule}` | `{cell(where)}` | {cell(refs_text(f.refs))} | {what} |"


def table(header: tuple[str, ...], rows: list[str]) -> list[str]:
    return ["| " + " | ".join(header) + " |", "|" + "---|" * len(header), *rows]


def render(result: RunResult) -> str:
    findings = result.findings
    out = [f"**ledlint** · {summary(result)}", ""]
    if findings:
        out += table(("severity", "rule", "where", "parts", "finding"), [_row(f) for f in findings[:MAX_ROWS]])
        if len(findings) > MAX_ROWS:
            out += ["", f"… and {len(findings) - MAX_ROWS} more finding(s): see the full report."]
    else:
        out.append("No findings.")
    notes = [f"- {cell(unused_waiver(w))}" for w in result.unused_waivers]
    notes += [f"- unused setting {cell(s)}" for s in result.unused_settings]
    for fr in result.files:
        notes += [f"- **caution** `{cell(posix_path(fr.path))}`: {cell(c)}. {SAFETY}" for c in fr.board.cautions]
        notes += [f"- reader note `{cell(posix_path(fr.path))}:{n.line}`: {cell(n.message)}" for n in fr.netlist.notes]
    if notes:
        out += ["", *notes]
    return "\n".join(out) + "\n"
