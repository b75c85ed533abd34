"""SARIF 2.1.0 report (OASIS standard): one result per finding, the rules from the registry."""

from __future__ import annotations

import textwrap
from pathlib import Path
from typing import Any
from urllib.parse import quote

from ledlint.sanitise import clip_all, json_text, text_id
from ledlint import __version__
from ledlint.checks.findings import Finding, Severity
from ledlint.analysis.summary import BoardSummary
from ledlint.checks.registry import DOC_SECTIONS, Rule, rule_doc
from ledlint.report.json_doc import finding_json
from ledlint.paths import posix_path
from ledlint.report.markdown import unused_waiver
from ledlint.report import SAFETY
from ledlint.review.run import FileResult, RunResult

SARIF_VERSION = "2.1.0"
SARIF_SCHEMA = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"
# SARIF §3.27.17: keys of partialFingerprints name the method and its version.
FINGERPRINT_KEY = "ledlintFingerprint/v1"
LEVELS = {Severity.ERROR: "error", Severity.WARNING: "warning", Severity.INFO: "note"}
_PROPERTIES = ("severity", "values", "assumed", "hint", "circuit", "sheet")



def _sentence(text: str) -> str:
    """Text ending as a sentence, so the fix that follows reads as the next one."""
    return text if text.endswith(".") else text + "."

def artifact_uri(path: str | Path, start: str | Path | None = None) -> str:
    """A relative URI reference for a netlist (RFC 3986: spaces and the like percent-encoded)."""
    return quote(posix_path(path, start), safe="/")


def doc_sections(doc: str) -> dict[str, str]:
    """A rule docstring's sections (headings at the margin, bodies indented), dedented."""
    sections: dict[str, list[str]] = {}
    current: list[str] | None = None
    for line in doc.splitlines():
        if line.strip() in DOC_SECTIONS and not line[:1].isspace():
            current = sections.setdefault(line.strip(), [])
        elif current is not None:
            current.append(line)
    return {name: textwrap.dedent("\n".join(body)).strip() for name, body in sections.items()}


def _reflow(text: str) -> str:
    """Join a docstring's wrapped lines into paragraphs, so a viewer can wrap them itself."""
    return "\n\n".join(" ".join(p.split()) for p in text.split("\n\n") if p.strip())


def rule_descriptor(rule: Rule) -> dict[str, Any]:
    """SARIF reportingDescriptor (§3.49): id, descriptions, help and default level of one rule."""
    meta = rule_doc(rule)
    sections = doc_sections(meta["doc"])
    markdown = "\n\n".join(f"**{name}**\n\n{_reflow(body)}" for name, body in sections.items())
    out: dict[str, Any] = {
        "id": meta["id"],
        "shortDescription": {"text": meta["summary"]},
        "fullDescription": {"text": _reflow(sections.get("What it flags", meta["summary"]))},
        "help": {"text": textwrap.dedent(meta["doc"]).strip(), "markdown": markdown or meta["summary"]},
        "defaultConfiguration": {"level": LEVELS[rule.severity]},
    }
    if meta["options"]:
        out["properties"] = {"options": meta["options"]}
    return out


def _logical(f: Finding) -> list[dict[str, str]]:
    sheet = f.sheet.rstrip("/") + "/"
    # SARIF §3.28.4 wants the logical locations unique; a rule may name a part twice.
    return ([{"name": ref, "fullyQualifiedName": sheet + ref, "kind": "component"} for ref in dict.fromkeys(f.refs)]
            + [{"name": net, "kind": "net"} for net in dict.fromkeys(f.nets)])


def _physical(uri: str, line: int) -> dict[str, Any]:
    out: dict[str, Any] = {"artifactLocation": {"uri": uri}}
    if line > 0:
        out["region"] = {"startLine": line}
    return out


def _related(f: Finding, board: BoardSummary, uri: str) -> list[dict[str, Any]]:
    out: list[dict[str, Any]] = []
    for ref in dict.fromkeys(f.refs):
        part = board.part(ref)
        if part is not None and part.line > 0:
            out.append({"id": len(out) + 1, "physicalLocation": _physical(uri, part.line),
                        "message": {"text": f"{ref} ({part.value})" if part.value else ref}})
    return out


def _result(f: Finding, fr: FileResult, index: dict[str, int], uri: str) -> dict[str, Any]:
    props = finding_json(f)
    out: dict[str, Any] = {
        "ruleId": f.rule,
        "level": LEVELS[f.severity],
        "message": {"text": _sentence(f.message) + (f" Fix: {_sentence(f.hint)}" if f.hint else "")},
        "locations": [{"physicalLocation": _physical(uri, f.line), "logicalLocations": _logical(f)}],
        "partialFingerprints": {FINGERPRINT_KEY: f.fingerprint},
        "properties": {k: props[k] for k in _PROPERTIES},
    }
    if f.rule in index:
        out["ruleIndex"] = index[f.rule]
    related = _related(f, fr.summary, uri)
    if related:
        out["relatedLocations"] = related
    if f.waived:
        out["suppressions"] = [{"kind": "inSource" if f.waived_in_source else "external",
                                "status": "accepted", "justification": f.waived}]
    return out


def _notifications(result: RunResult, start: str | Path | None) -> list[dict[str, Any]]:
    out: list[dict[str, Any]] = []
    for fr in result.files:
        out += [{"level": "warning", "message": {"text": f"caution: {c}. {SAFETY}"},
                 "locations": [{"physicalLocation": _physical(artifact_uri(fr.path, start), 0)}]}
                for c in fr.summary.cautions]
        for note in fr.summary.notes:
            location = _physical(artifact_uri(fr.path, start), note.line)
            if "region" in location and note.column > 0:
                location["region"]["startColumn"] = note.column
            out.append({"level": "note", "message": {"text": f"reader note: {note.message}"},
                        "locations": [{"physicalLocation": location}]})
    for w in result.unused_waivers:
        out.append({"level": "warning", "message": {"text": unused_waiver(w)}})
    out += [{"level": "warning", "message": {"text": f"unused setting {s}"}} for s in result.unused_settings]
    return out


def document(result: RunResult, start: str | Path | None = None) -> dict[str, Any]:
    """The SARIF log as a mapping; artifact paths relative to `start` (default: the working folder)."""
    index = {r.id: i for i, r in enumerate(result.rules)}
    results = []
    for fr in result.files:
        uri = artifact_uri(fr.path, start)
        results += [_result(f, fr, index, uri) for f in (*fr.findings, *fr.waived)]
    run: dict[str, Any] = {
        "tool": {"driver": {"name": "ledlint", "version": __version__, "semanticVersion": __version__,
                            "rules": [rule_descriptor(r) for r in result.rules]}},
        "invocations": [{"executionSuccessful": True,
                         "toolExecutionNotifications": _notifications(result, start)}],
        "columnKind": "unicodeCodePoints",
        "results": results,
    }
    # A text of megabytes is cut wherever it shows, and kept whole once in the run's property bag
    # (SARIF 2.1.0 §3.8), as the JSON report keeps it.
    cut = {text_id(t): t for fr in result.files for f in (*fr.findings, *fr.waived) for t in f.long_texts}
    run = clip_all(run, cut)  # type: ignore[assignment]  # a dict stays a dict
    if cut:
        run["properties"] = {"long_texts": cut}
    return {"$schema": SARIF_SCHEMA, "version": SARIF_VERSION, "runs": [run]}


def render(result: RunResult) -> str:
    return json_text(document(result))
