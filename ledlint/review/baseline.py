"""Baselines: a versioned JSON record of known findings, so that a check counts only new ones.

The file (written by `ledlint baseline`, read by `ledlint check --baseline`):

    {
      "ledlint_baseline": 1,
      "written_by": "ledlint 0.1.0",
      "entries": [
        {"file": "boards/panel.net", "rule": "supply-headroom", "fingerprint": "3f0c…",
         "severity": "warning", "refs": ["D3", "R3"], "nets": ["+3V3", "GND"], "message": "…"}
      ]
    }

`file` is the netlist's path relative to the folder of the baseline file, with forward slashes,
so the baseline works from any working folder. A finding is known when an entry has its file
and fingerprint (rule, sorted refs, sorted nets: never line numbers or the order of the
export) and a severity no worse than the recorded one: a warning that has become an error is
new. Each entry accounts for one finding. `refs`, `nets` and `message` are for the
reader of the file and for naming stale entries; matching ignores them. An entry is stale
when its file was checked and nothing in it matched (entries of files not checked in a run,
as in a hook that sees only the changed files, are left alone). Entries are sorted,
and the file holds no date, so re-recording an unchanged board changes nothing.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

from ledlint.sanitise import json_text
from ledlint import __version__
from ledlint.errors import LedlintError, read_utf8
from ledlint.checks.findings import Finding, Severity
from ledlint.paths import posix_path
from ledlint.review.run import FileResult, RunResult

FORMAT_KEY = "ledlint_baseline"
VERSION = 1
DEFAULT_NAME = "ledlint-baseline.json"


@dataclass(frozen=True)
class Entry:
    file: str
    rule: str
    fingerprint: str
    severity: Severity = Severity.ERROR  # the worst a matching finding may be (older files: any)
    refs: tuple[str, ...] = ()
    nets: tuple[str, ...] = ()
    message: str = ""

    @property
    def key(self) -> tuple[str, str]:
        return (self.file, self.fingerprint)

    def describe(self) -> str:
        return f"{self.rule} on {', '.join(self.refs) or self.fingerprint} in {self.file}"


@dataclass(frozen=True)
class Baseline:
    path: str
    entries: tuple[Entry, ...]


@dataclass(frozen=True)
class Comparison:
    """A run set against a baseline: `result` has the known findings moved to the waived ones."""

    baseline: Baseline
    result: RunResult
    new: tuple[Finding, ...]
    known: tuple[Finding, ...]
    stale: tuple[Entry, ...]  # entries that matched no finding: fixed, the part renamed, or now more severe
    worse: frozenset[tuple[str, str]] = frozenset()  # (file, fingerprint) of stale entries still found, more severe

    def summary(self) -> list[str]:
        """Lines for the user: what the baseline accounted for and what in it no longer matches."""
        stale = f"{len(self.stale)} stale entr{'y' if len(self.stale) == 1 else 'ies'}"
        lines = [f"baseline {self.baseline.path}: {len(self.known)} known finding(s) not counted, "
                 f"{len(self.new)} new, {stale}"]
        lines += [f"baseline {self.baseline.path}: stale entry, "
                  f"{'now more severe' if e.key in self.worse else 'no longer found'}: {e.describe()}"
                  for e in self.stale]
        return lines


def _folder(baseline_path: str | Path) -> Path:
    return Path(baseline_path).resolve().parent


def entries(result: RunResult, baseline_path: str | Path) -> tuple[Entry, ...]:
    """An entry for every active finding of the run, files relative to the baseline's folder."""
    folder = _folder(baseline_path)
    out = [Entry(posix_path(f.file, folder), f.rule, f.fingerprint, f.severity, f.refs, f.nets, f.message)
           for f in result.findings]
    return tuple(sorted(out, key=lambda e: (e.file, e.rule, e.fingerprint, e.refs, e.message)))


def document(items: tuple[Entry, ...]) -> dict[str, Any]:
    return {FORMAT_KEY: VERSION, "written_by": f"ledlint {__version__}",
            "entries": [{"file": e.file, "rule": e.rule, "fingerprint": e.fingerprint,
                         "severity": e.severity.value, "refs": list(e.refs),
                         "nets": list(e.nets), "message": e.message} for e in items]}


def render(result: RunResult, baseline_path: str | Path) -> str:
    """The baseline file's text for this run."""
    return json_text(document(entries(result, baseline_path)))


def _strings(raw: Any, where: str, path: str) -> tuple[str, ...]:
    if not isinstance(raw, list) or not all(isinstance(x, str) for x in raw):
        raise LedlintError(f"{where}: expected a list of strings", path)
    return tuple(raw)


def _entry(raw: Any, i: int, path: str) -> Entry:
    where = f"entry {i}"
    if not isinstance(raw, dict):
        raise LedlintError(f"{where}: expected an object", path)
    for key in ("file", "rule", "fingerprint"):
        if not isinstance(raw.get(key), str) or not raw[key]:
            raise LedlintError(f"{where}: '{key}' must be a non-empty string", path)
    message = raw.get("message", "")
    if not isinstance(message, str):
        raise LedlintError(f"{where}: 'message' must be a string", path)
    levels = [s.value for s in Severity]
    severity = raw.get("severity", "error")
    if severity not in levels:
        raise LedlintError(f"{where}: 'severity' must be one of {', '.join(levels)}", path)
    return Entry(raw["file"], raw["rule"], raw["fingerprint"], Severity(severity),
                 _strings(raw.get("refs", []), where + " refs", path),
                 _strings(raw.get("nets", []), where + " nets", path), message)


def parse(text: str, path: str) -> Baseline:
    """Read a baseline file's text; LedlintError naming the problem when it is not one."""
    try:
        data = json.loads(text)
    except json.JSONDecodeError as exc:
        raise LedlintError(f"not a baseline file: {exc.msg}", path, exc.lineno, exc.colno) from None
    except RecursionError:  # the decoder recurses once per level of nesting
        raise LedlintError("not a baseline file: nested too deeply", path) from None
    if not isinstance(data, dict) or FORMAT_KEY not in data:
        raise LedlintError(f"not a baseline file: no '{FORMAT_KEY}' key (write one with `ledlint baseline`)", path)
    version = data[FORMAT_KEY]
    if type(version) is not int or version != VERSION:  # true == 1 in Python, not in the format
        raise LedlintError(f"baseline version {version!r}: this ledlint reads version {VERSION}", path)
    raw = data.get("entries")
    if not isinstance(raw, list):
        raise LedlintError("'entries' must be a list", path)
    return Baseline(path, tuple(_entry(e, i, path) for i, e in enumerate(raw, start=1)))


def load(path: str | Path) -> Baseline:
    return parse(read_utf8(path, "baseline"), str(path))


def compare(result: RunResult, baseline: Baseline) -> Comparison:
    """Split the run's findings into new and known, and find the entries nothing matched."""
    folder = _folder(baseline.path)
    remaining: dict[tuple[str, str], list[Entry]] = {}
    for e in sorted(baseline.entries, key=lambda e: e.severity.rank):  # the mildest entry that covers a finding
        remaining.setdefault(e.key, []).append(e)
    reason = f"known: recorded in baseline {baseline.path}"
    checked = {posix_path(fr.path, folder) for fr in result.files}
    files: list[FileResult] = []
    new: list[Finding] = []
    known: list[Finding] = []
    for fr in result.files:
        name = posix_path(fr.path, folder)
        active, silenced = [], []
        for f in fr.findings:
            covering = [e for e in remaining.get((name, f.fingerprint), []) if e.severity.rank >= f.severity.rank]
            if covering:
                remaining[(name, f.fingerprint)].remove(covering[0])
                silenced.append(replace(f, waived=reason))
            else:
                active.append(f)
        new += active
        known += silenced
        files.append(replace(fr, findings=tuple(active),
                             waived=tuple(sorted((*fr.waived, *silenced), key=lambda f: f.sort_key))))
    order = {id(e): i for i, e in enumerate(baseline.entries)}
    stale = sorted((e for left in remaining.values() for e in left if e.file in checked), key=lambda e: order[id(e)])
    found = {(posix_path(f.file, folder), f.fingerprint) for f in new}
    worse = frozenset(e.key for e in stale if e.key in found)
    return Comparison(baseline, replace(result, files=tuple(files)), tuple(new), tuple(known), tuple(stale), worse)
