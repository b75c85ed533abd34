"""One check run: netlists → configuration → analysis → rules → waivers. The library's entry point."""

from __future__ import annotations

import gc
import os
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, replace
from pathlib import Path
from contextlib import contextmanager
from typing import Callable, Iterable, Iterator, Sequence

from ledlint import config as configuration
from ledlint.analysis.board import analyse
from ledlint.analysis.results import BoardAnalysis
from ledlint.analysis.summary import BoardSummary, summarise
from ledlint.config import WAIVER_FIELD, Config, Waiver
from ledlint.errors import ConfigError, LedlintError
from ledlint.checks.findings import Finding, Severity
from ledlint.netlist.model import Netlist
from ledlint.netlist.kicad_net import read_netlist
from ledlint.checks.registry import Rule, RuleSettings, run_rules, settings
from ledlint.review.rules import load_rules

_PARALLEL_FROM = 8  # files; below this, starting worker processes costs more than it saves


@dataclass(frozen=True)
class FileResult:
    path: str  # as the user named it
    netlist: Netlist
    board: BoardAnalysis
    findings: tuple[Finding, ...]  # active, most severe first
    waived: tuple[Finding, ...]  # silenced by a waiver, with its reason
    config_path: str
    summary: BoardSummary  # what the reports show of the board


@dataclass(frozen=True)
class RunResult:
    files: tuple[FileResult, ...]
    rules: tuple[Rule, ...]
    unused_waivers: tuple[Waiver, ...]
    unused_settings: tuple[str, ...] = ()  # part tables of a configuration that matched no part

    @property
    def findings(self) -> tuple[Finding, ...]:
        return tuple(f for r in self.files for f in r.findings)

    def counts(self) -> dict[str, int]:
        out = {s.value: 0 for s in Severity}
        for f in self.findings:
            out[f.severity.value] += 1
        return out

    def failed(self, fail_on: str) -> bool:
        if fail_on == "never":
            return False
        threshold = Severity(fail_on).rank
        return any(f.severity.rank >= threshold for f in self.findings)


def field_waivers(netlist: Netlist, rule_ids: set[str]) -> list[Waiver]:
    """Waivers written on parts: a field `ledlint_waive` = "rule-id[, rule-id]: reason"."""
    out = []
    for comp in netlist.components:
        text = comp.field(WAIVER_FIELD)
        if text is None:
            continue
        rules, sep, reason = text.partition(":")
        where = f"field {WAIVER_FIELD} on {comp.ref}"
        if not sep or not reason.strip():
            raise ConfigError(f"{where}: write 'rule-id: reason'; a waiver needs a reason", netlist.path, comp.line)
        for rid in (r.strip() for r in rules.split(",") if r.strip()):
            if rid not in rule_ids:
                raise ConfigError(f"{where}: no rule {rid!r}{configuration.suggest(rid, sorted(rule_ids))}",
                                  netlist.path, comp.line)
            out.append(Waiver(rid, reason.strip(), ref=comp.ref, origin=f"{where} ({netlist.path}, line {comp.line})",
                              in_source=True))
    return out


def _matches(w: Waiver, f: Finding) -> bool:
    return w.rule == f.rule and ((bool(w.ref) and w.ref in f.refs) or (bool(w.fingerprint) and
                                                                       w.fingerprint == f.fingerprint))


def apply_waivers(findings: list[Finding], waivers: list[Waiver]) -> tuple[list[Finding], list[Finding], set[int]]:
    """Split findings into active and waived; also the indices of waivers that matched."""
    active, waived, used = [], [], set()
    for f in findings:
        hit = next((i for i, w in enumerate(waivers) if _matches(w, f)), None)
        if hit is None:
            active.append(f)
        else:
            used.add(hit)
            waived.append(replace(f, waived=waivers[hit].reason, waived_in_source=waivers[hit].in_source))
    return active, waived, used


@dataclass(frozen=True)
class _Job:
    path: str
    config: Config
    rule_settings: RuleSettings


@contextmanager
def _no_cycle_collection() -> Iterator[None]:
    """Pause the cyclic garbage collector for one file's check. A big board builds millions of
    small objects that live to the end, and the collector's passes over them cost a third of
    the run (benchmarks/check.py); the little cyclic garbage made meanwhile waits until after."""
    was = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was:
            gc.enable()


def _check_one(job: _Job) -> tuple[FileResult, list[Waiver], set[int]]:
    with _no_cycle_collection():
        return _check_file(job)


def _check_file(job: _Job) -> tuple[FileResult, list[Waiver], set[int]]:
    return check_design(read_netlist(job.path), job.config, load_rules(), job.rule_settings, job.path)


def check_design(netlist: Netlist, config: Config, rules: tuple[Rule, ...], rule_settings: RuleSettings,
                 path: str) -> tuple[FileResult, list[Waiver], set[int]]:
    """One design read already: analysis, rules and waivers. Also the waivers written on its parts
    that silenced nothing, and which of the configuration's waivers did silence something."""
    board = analyse(netlist, config)
    findings = run_rules(rules, board, path, rule_settings)
    own = field_waivers(netlist, {r.id for r in rules})
    waivers = list(config.waivers) + own
    active, waived, used = apply_waivers(findings, waivers)
    unused_own = [w for i, w in enumerate(waivers) if i >= len(config.waivers) and i not in used]
    used_config = {i for i in used if i < len(config.waivers)}
    named = (r for f in (*active, *waived) for r in f.refs)
    return (FileResult(path, netlist, board, tuple(active), tuple(waived), config.path,
                       summarise(path, board, named)), unused_own, used_config)


def check(paths: Sequence[str | Path], *, config_path: str | None = None,
          progress: Callable[[int, int], None] | None = None) -> RunResult:
    """Check netlist files. Raises LedlintError (with every bad file named) on bad input."""
    rules = load_rules()
    configs: dict[str, Config] = {}
    jobs = []
    for path in paths:
        cfg_file = config_path or (str(p) if (p := configuration.discover(path)) else "")
        if cfg_file not in configs:
            configs[cfg_file] = configuration.load(cfg_file) if cfg_file else Config()
        cfg = configs[cfg_file]
        jobs.append(_Job(str(path), cfg, settings(rules, cfg)))
    results: list[tuple[FileResult, list[Waiver], set[int]] | LedlintError] = []
    if len(jobs) >= _PARALLEL_FROM and (os.cpu_count() or 1) > 1:
        with ProcessPoolExecutor() as pool:
            for i, r in enumerate(pool.map(_safe_check, jobs), start=1):
                results.append(r)
                if progress:
                    progress(i, len(jobs))
    else:
        for i, job in enumerate(jobs, start=1):
            results.append(_safe_check(job))
            if progress:
                progress(i, len(jobs))
    errors = [r for r in results if isinstance(r, LedlintError)]
    if errors:
        raise BadInput(errors)
    done = [r for r in results if not isinstance(r, LedlintError)]
    unused: list[Waiver] = [w for _, own, _ in done for w in own]
    for cfg in configs.values():
        used: set[int] = set().union(*(u for (res, _, u) in done if res.config_path == cfg.path))
        unused += [w for i, w in enumerate(cfg.waivers) if i not in used]
    files = tuple(r for r, _, _ in done)
    return RunResult(files, rules, tuple(unused), _unused_settings(configs.values(), files))


def _unused_settings(configs: Iterable[Config], files: tuple[FileResult, ...]) -> tuple[str, ...]:
    """Each [refs.X], [values.X] or [symbols.X] table that matched no part of the files it applied
    to: a mistyped reference would otherwise change nothing, silently."""
    out = []
    for cfg in configs:
        parts = [c for f in files if f.config_path == cfg.path for c in f.netlist.components]
        seen = {"refs": {c.ref for c in parts}, "values": {c.value for c in parts},
                "symbols": {c.part for c in parts} | {f"{c.lib}:{c.part}" for c in parts}}
        for label, table in (("refs", cfg.refs), ("values", cfg.values), ("symbols", cfg.symbols)):
            out += [f"{cfg.path} [{label}.{key!r}]: matches no part in the netlists checked"
                    for key in table if key not in seen[label]]
    return tuple(out)


def _safe_check(job: _Job) -> tuple[FileResult, list[Waiver], set[int]] | LedlintError:
    try:
        return _check_one(job)
    except LedlintError as exc:
        return exc


class BadInput(LedlintError):
    """Several input problems at once: each file that could not be read or configured."""

    def __init__(self, errors: list[LedlintError]) -> None:
        super().__init__("; ".join(str(e) for e in errors))
        self.errors = errors

    def __str__(self) -> str:
        return "\n".join(str(e) for e in self.errors)
