"""Markdown report: a compact table of findings for a pull-request comment, and the shared plain wording."""

from __future__ import annotations

import re

from ledlint.config import Waiver
from ledlint.paths import posix_path
from ledlint.checks.findings import Finding
from ledlint.report import MAX_NOTES, SAFETY, refs_text, shown
from ledlint.review.diff import NetlistDiff, Status, edit_text
from ledlint.review.run import RunResult

MAX_ROWS = 100  # a comment stays readable (and under the size a code host accepts); the rest is counted


def unused_waiver(w: Waiver) -> str:
    return f"unused waiver {w.rule} for {w.ref or w.fingerprint} ({w.origin}): it silences nothing"


def summary(result: RunResult) -> str:
    """One line for the whole run: files, circuits, findings by severity, waived."""
    counts = result.counts()
    circuits = sum(fr.summary.circuits for fr in result.files)
    analysed = sum(fr.summary.analysed for fr in result.files)
    waived = sum(len(fr.waived) for fr in result.files)
    return (f"{len(result.files)} file(s) · {circuits} circuit(s), {analysed} analysed · "
            f"{counts['error']} error(s) · {counts['warning']} warning(s) · {counts['info']} info"
            + (f" · {waived} waived" if waived else ""))


# Characters that make Markdown: emphasis, code, links, tables, strikethrough (CommonMark 0.31
# §2.4: any ASCII punctuation may be backslash-escaped), and '<' for HTML.
_MARKUP = re.compile(r"([\\`*_\[\]|~])")


def cell(text: str) -> str:
    """Text safe inside a table cell: one line, markup escaped, no stray HTML."""
    return _MARKUP.sub(r"\\\1", shown(" ".join(text.split()))).replace("<", "&lt;")


def code(text: str) -> str:
    """Text as a code span inside a table: backslashes are literal there, so only the table's '|'
    is escaped (GFM tables), and a span holding backticks is fenced with two (CommonMark §6.1)."""
    body = shown(" ".join(text.split())).replace("|", "\\|")
    return f"`` {body} ``" if "`" in body else f"`{body}`"


def _row(f: Finding) -> str:
    where = posix_path(f.file) + (f":{f.line}" if f.line else "")
    what = cell(f.message) + (f"<br>**fix:** {cell(f.hint)}" if f.hint else "")
    return f"| {f.severity.value} | `{f.rule}` | {code(where)} | {cell(refs_text(f.refs))} | {what} |"


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
        notes += [f"- **caution** {code(posix_path(fr.path))}: {cell(c)}. {SAFETY}" for c in fr.summary.cautions]
        notes += [f"- reader note {code(f'{posix_path(fr.path)}:{n.line}')}: {cell(n.message)}"
                  for n in fr.summary.notes[:MAX_NOTES]]
        if len(fr.summary.notes) > MAX_NOTES:
            notes.append(f"- … and {len(fr.summary.notes) - MAX_NOTES} more reader notes: see the full report")
    if notes:
        out += ["", *notes]
    return "\n".join(out) + "\n"


def render_diff(d: NetlistDiff) -> str:
    """A netlist diff as tables for a pull-request comment."""
    out = [f"**ledlint diff** {code(posix_path(d.old_path))} → {code(posix_path(d.new_path))} · {d.summary()}",
           ""]
    rows = []
    for c in d.circuits:
        if c.status is Status.UNCHANGED:
            continue
        rows.append(f"| {c.id} | {cell(c.describe())} | {cell(c.kind)} | | |")
        rows += [f"| {c.id} | edit {cell(e.ref)} {cell(e.what)} | | {cell(edit_text(e.old))} | {cell(edit_text(e.new))} |"
                 for e in c.edits if e.what != "part"]
        rows += [f"| {c.id} | {cell(e.text())} | | | |" for e in c.edits if e.what == "part"]
        rows += [f"| {c.id} | {cell(m.label)} | | {m.side(m.old)} | {m.side(m.new)} |" for m in c.moved]
    if rows:
        out += table(("circuit", "change", "kind", "was", "now"), rows)
    findings = [("appeared", f) for c in d.circuits for f in c.appeared] + [("appeared", f) for f in d.appeared]
    findings += [("went away", f) for c in d.circuits for f in c.gone] + [("went away", f) for f in d.gone]
    if findings:
        out += ["", *table(("finding", "severity", "rule", "parts", "message"),
                           [f"| {what} | {f.severity.value} | `{f.rule}` | {cell(refs_text(f.refs))} | "
                            f"{cell(f.message)} |" for what, f in findings])]
    if not rows and not findings:
        out.append("No electrical change.")
    return "\n".join(out) + "\n"
