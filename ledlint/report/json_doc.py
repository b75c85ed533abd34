"""JSON report: a versioned document of findings, circuits and file inventories."""

from __future__ import annotations

from typing import Any

from ledlint import __version__
from ledlint.checks.findings import Finding
from ledlint.report import circuit_note
from ledlint.sanitise import clip_all, json_text, text_id
from ledlint.analysis.summary import CircuitRow
from ledlint.review.diff import NetlistDiff, Reading
from ledlint.review.run import RunResult

SCHEMA = 1
DIFF_SCHEMA = 1


def finding_json(f: Finding) -> dict[str, Any]:
    out: dict[str, Any] = {
        "rule": f.rule, "severity": f.severity.value, "message": f.message, "file": f.file, "line": f.line,
        "refs": list(f.refs), "nets": list(f.nets), "sheet": f.sheet,
        "values": [{"name": v.name, "value": v.value, "unit": v.unit, "limit": v.limit,
                    "relation": v.relation or None} for v in f.values],
        "assumed": list(f.assumed), "hint": f.hint, "fingerprint": f.fingerprint, "circuit": f.circuit,
    }
    if f.waived:
        out["waived"] = f.waived
    return out


def row_json(r: CircuitRow) -> dict[str, object]:
    return {
        "file": r.file, "id": r.id, "kind": r.kind, "leds": list(r.leds),
        "ballast": list(r.ballast), "supply_net": r.supply_net, "return_net": r.return_net,
        "rail": r.rail,
        "current_a": (None if r.current is None else
                      {"nominal": r.current[0], "min": r.current[1], "max": r.current[2]}),
        "resistor_power_w": r.resistor_power_w, "headroom_v": r.headroom_v,
        "analysed": r.analysed, "note": circuit_note(r),
    }


def document(result: RunResult) -> dict[str, Any]:
    files = []
    for r in result.files:
        s = r.summary
        files.append({
            "path": r.path, "version": s.version, "tool": s.tool, "components": s.components, "nets": s.nets,
            "leds": s.leds, "circuits": s.circuits, "config": r.config_path or None,
            "notes": [{"line": x.line, "column": x.column, "message": x.message} for x in s.notes],
            "cautions": list(s.cautions),
        })
    doc: dict[str, Any] = {
        "schema": SCHEMA,
        "tool": {"name": "ledlint", "version": __version__},
        "summary": result.counts() | {"files": len(result.files),
                                      "circuits": sum(r.summary.circuits for r in result.files)},
        "files": files,
        "findings": [finding_json(f) for f in result.findings],
        "waived": [finding_json(f) for r in result.files for f in r.waived],
        "unused_waivers": [{"rule": w.rule, "ref": w.ref or None, "fingerprint": w.fingerprint or None,
                            "reason": w.reason, "origin": w.origin} for w in result.unused_waivers],
        "unused_settings": list(result.unused_settings),
        "circuits": [row_json(c) for r in result.files for c in r.summary.rows],
    }
    return _with_long_texts(doc, [t for r in result.files for f in (*r.findings, *r.waived) for t in f.long_texts])


def _with_long_texts(doc: dict[str, Any], texts: list[str]) -> dict[str, Any]:
    """The document with every text too long to read cut, and kept whole once in "long_texts" under
    the name the cut shows: a name of megabytes must not be repeated in every finding."""
    cut = {text_id(t): t for t in texts}  # the findings' messages, cut when they were made
    out: dict[str, Any] = clip_all(doc, cut)  # type: ignore[assignment]  # a dict stays a dict
    if cut:
        out["long_texts"] = cut
    return out


def render(result: RunResult) -> str:
    return json_text(document(result))


def _reading_json(r: Reading | None) -> dict[str, float | None] | None:
    return None if r is None else {"value": r.value, "min": r.low, "max": r.high}


def diff_document(d: NetlistDiff) -> dict[str, Any]:
    head = {"schema": DIFF_SCHEMA, "tool": {"name": "ledlint", "version": __version__},
            "old": d.old_path, "new": d.new_path}  # paths, kept whole
    doc = {
        "summary": d.counts(),
        "circuits": [{
            "status": c.status.value, "id": c.id, "old_id": c.old.id if c.old else None,
            "new_id": c.new.id if c.new else None, "kind": c.kind, "leds": list(c.leds),
            "leds_added": list(c.leds_added), "leds_removed": list(c.leds_removed), "elsewhere": list(c.elsewhere),
            "edits": [{"ref": e.ref, "what": e.what, "old": e.old, "new": e.new} for e in c.edits],
            "moved": [{"quantity": m.quantity.value, "subject": m.subject, "unit": m.unit,
                       "old": _reading_json(m.old), "new": _reading_json(m.new)} for m in c.moved],
            "findings_appeared": [finding_json(f) for f in c.appeared],
            "findings_gone": [finding_json(f) for f in c.gone],
        } for c in d.circuits],
        "findings_appeared": [finding_json(f) for f in d.appeared],
        "findings_gone": [finding_json(f) for f in d.gone],
    }
    shown = (*d.appeared, *d.gone, *(f for c in d.circuits for f in (*c.appeared, *c.gone)))
    return head | _with_long_texts(doc, [t for f in shown for t in f.long_texts])


def render_diff(d: NetlistDiff) -> str:
    return json_text(diff_document(d))
