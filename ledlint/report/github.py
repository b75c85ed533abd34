"""CI annotations: one workflow-command line per finding, which the runner pins to the netlist line."""

from __future__ import annotations

from ledlint.checks.findings import Finding, Severity
from ledlint.report import MAX_NOTES
from ledlint.sanitise import clip, printable
from ledlint.paths import posix_path
from ledlint.report.markdown import summary, unused_waiver
from ledlint.report import SAFETY
from ledlint.review.run import RunResult

COMMANDS = {Severity.ERROR: "error", Severity.WARNING: "warning", Severity.INFO: "notice"}
_MAX_REFS = 6  # in an annotation title; the message names the rest


def escape_data(text: str) -> str:
    """The runner's escapes for a command's message: %, CR and LF (a line break in a message is the
    runner's %0A, never a new log line); then no other unsafe character."""
    return printable(clip(text).replace("%", "%25").replace("\r", "%0D").replace("\n", "%0A"))


def escape_property(text: str) -> str:
    """The runner's escapes for a property value: those of a message, and ':' and ','."""
    return escape_data(text).replace(":", "%3A").replace(",", "%2C")


def command(name: str, message: str, **props: str | int) -> str:
    """One workflow command line: `::name key=value,…::message`."""
    args = ",".join(f"{k}={escape_property(str(v))}" for k, v in props.items() if v not in ("", 0))
    return f"::{name}{' ' + args if args else ''}::{escape_data(message)}"


def annotation(f: Finding) -> str:
    refs = ", ".join(f.refs[:_MAX_REFS]) + (" …" if len(f.refs) > _MAX_REFS else "")
    message = f.message + (f"\nFix: {f.hint}" if f.hint else "")
    return command(COMMANDS[f.severity], message, file=posix_path(f.file), line=f.line,
                   title=f"ledlint {f.rule}" + (f" ({refs})" if refs else ""))


def render(result: RunResult) -> str:
    lines = [annotation(f) for f in result.findings]
    for fr in result.files:
        lines += [command("warning", f"{c}. {SAFETY}", file=posix_path(fr.path), title="ledlint caution")
                  for c in fr.summary.cautions]
        lines += [command("notice", f"reader note: {n.message}", file=posix_path(fr.path), line=n.line,
                          col=n.column, title="ledlint reader") for n in fr.summary.notes[:MAX_NOTES]]
    lines += [command("warning", unused_waiver(w), title="ledlint waiver") for w in result.unused_waivers]
    lines += [command("warning", f"unused setting {s}", title="ledlint configuration") for s in result.unused_settings]
    lines.append("ledlint: " + summary(result))
    return "\n".join(lines) + "\n"
