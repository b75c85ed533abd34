"""JSON report: a versioned document of findings, circuits and file inventories."""

from __future__ import annotations

import json
from typing import Any

from ledlint import __version__
from ledlint.findings import Finding
from ledlint.parts import led_parts
from ledlint.report.circuits import rows
from ledlint.run import RunResult

SCHEMA = 1


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


def document(result: RunResult) -> dict[str, Any]:
    files = []
    for r in result.files:
        n = r.netlist
        files.append({
            "path": r.path, "version": n.version, "tool": n.tool, "components": len(n.components),
            "nets": len(n.nets),
            "leds": led_parts(n.components),
            "circuits": len(r.board.circuits), "config": r.config_path or None,
            "notes": [{"line": x.line, "column": x.column, "message": x.message} for x in n.notes],
            "cautions": list(r.board.cautions),
        })
    return {
        "schema": SCHEMA,
        "tool": {"name": "ledlint", "version": __version__},
        "summary": result.counts() | {"files": len(result.files),
                                      "circuits": sum(len(r.board.circuits) for r in result.files)},
        "files": files,
        "findings": [finding_json(f) for f in result.findings],
        "waived": [finding_json(f) for r in result.files for f in r.waived],
        "unused_waivers": [{"rule": w.rule, "ref": w.ref or None, "fingerprint": w.fingerprint or None,
                            "reason": w.reason, "origin": w.origin} for w in result.unused_waivers],
        "unused_settings": list(result.unused_settings),
        "circuits": [c.as_json() for c in rows(result)],
    }


def render(result: RunResult) -> str:
    return json.dumps(document(result), indent=2, ensure_ascii=False) + "\n"
