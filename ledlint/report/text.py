"""Terminal report: findings grouped by file, most severe first, each with parts, nets, numbers and fix."""

from __future__ import annotations

import io
import textwrap

from rich.console import Console
from rich.markup import escape
from rich.table import Table

from ledlint.checks.findings import Finding, Severity, quantity
from ledlint.report import MAX_NOTES, SAFETY, circuit_note, refs_text, shown
from ledlint.sanitise import clip
from ledlint.analysis.summary import BoardSummary, CircuitRow
from ledlint.paths import posix_path
from ledlint.review.diff import NetlistDiff, Status
from ledlint.review.run import FileResult, RunResult

# Short names for the circuit table; the JSON and SARIF use the kinds' full names.
_SHORT = {"series-string": "string", "shared-resistor-bank": "bank", "current-sink": "sink",
          "constant-current-driver": "driver", "addressable": "addressable", "multiplexed": "multiplexed",
          "not-fitted": "not fitted", "unrecognised": "unrecognised"}
_STYLE = {Severity.ERROR: "bold red", Severity.WARNING: "bold yellow", Severity.INFO: "cyan"}

_INDENT = 8


def _wrapped(label: str, body: str, width: int, style: str = "") -> list[str]:
    """Lines with a right-aligned label and a hanging indent, escaped for rich markup."""
    lines = textwrap.wrap(shown(body), width=max(width - _INDENT, 20), break_on_hyphens=False) or [""]
    pad = " " * (_INDENT - 1 - len(label))
    head = f"{pad}[{style}]{escape(label)}[/] " if style else f"{pad}{escape(label)} "
    out = [head + escape(lines[0])]
    out += [" " * _INDENT + escape(line) for line in lines[1:]]
    return out


def _finding(f: Finding, width: int) -> list[str]:
    where = f"line {f.line}" if f.line else ""
    refs = refs_text(f.refs)
    head = " · ".join(x for x in (f.rule, where, refs, ("nets " + ", ".join(map(clip, f.nets))) if f.nets else "") if x)
    lines = _wrapped(f.severity.value.upper(), head, width, _STYLE[f.severity])
    lines += _wrapped("", f.message, width)
    if f.hint:
        lines += _wrapped("fix", f.hint, width, "green")
    if f.assumed:
        shown = list(f.assumed[:5]) + ([f"… and {len(f.assumed) - 5} more (see --format json)"]
                                       if len(f.assumed) > 5 else [])
        lines += _wrapped("assumed", "; ".join(shown), width, "dim")
    if f.waived:
        lines += _wrapped("waived", f.waived, width, "dim")
    return lines


def _amps(x: float | None) -> str:
    return "—" if x is None else quantity(x, "A")


def _short(text: str, limit: int = 64) -> str:
    return text if len(text) <= limit else text[: limit - 1] + "…"


def _circuit_table(rows: list[CircuitRow]) -> Table:
    table = Table(show_edge=False, pad_edge=False, box=None, header_style="bold")
    for name in ("circuit", "kind", "LEDs", "supply → return", "ballast", "I nom", "I range", "P max", "headroom"):
        table.add_column(name, no_wrap=name in ("circuit", "kind", "ballast", "I nom", "I range", "P max", "headroom"))
    for r in rows:
        leds = ", ".join(r.leds) if len(r.leds) <= 3 else f"{r.leds[0]} … ({len(r.leds)})"
        if r.current is None:
            note = circuit_note(r)
            nom, rng = "—", _short(note) if note else "—"
        else:
            nom, rng = _amps(r.current[0]), f"{_amps(r.current[1])} – {_amps(r.current[2])}"
        ends = f"{r.supply_net or (f'rail {r.rail}' if r.rail else '?')} → {r.return_net or '?'}"
        cells = (r.id, _SHORT.get(r.kind, r.kind), leds, ends, ", ".join(r.ballast) or "—", nom, rng,
                 "—" if r.resistor_power_w is None else quantity(r.resistor_power_w, "W"),
                 "—" if r.headroom_v is None else quantity(r.headroom_v, "V"))
        table.add_row(*(escape(shown(c)) for c in cells))  # names from the netlist are text, not markup
    return table


def _coverage(s: BoardSummary) -> str:
    """How many circuits were analysed, and why the others were not: a skipped circuit must not
    read as a passed one."""
    return ", ".join([f"{s.analysed} analysed"] + [f"{k} {why}" for why, k in s.skipped])


def _print_wide(console: Console, table: Table) -> None:
    """A table at its natural width (up to 200 columns): squeezed to a terminal's 80 or 100, net
    names and notes shrink to "/m…", and a reviewer would rather scroll than guess."""
    saved = console.width
    console.width = max(saved, console.measure(table, options=console.options.update_width(200)).maximum)
    try:
        console.print(table)
    finally:
        console.width = saved


def _file(console: Console, fr: FileResult, circuits: bool) -> None:
    s = fr.summary
    leds = f"{s.leds} LED(s)" + (f" ({s.dies} dies)" if s.dies > s.leds else "")
    console.print(f"[bold]{escape(shown(fr.path))}[/]  {s.components} parts, {s.nets} nets, "
                  f"{leds} in {s.circuits} circuit(s), "
                  f"{_coverage(s)} · {escape(shown(s.tool or 'unknown tool'))}", soft_wrap=True)
    for note in s.notes[:MAX_NOTES]:
        console.print(f"  [dim]reader note, line {note.line}: {escape(shown(note.message))}[/]")
    if len(s.notes) > MAX_NOTES:
        console.print(f"  [dim]… and {len(s.notes) - MAX_NOTES} more reader notes (see --format json)[/]")
    if fr.findings:
        console.print("\n".join(line for f in fr.findings for line in _finding(f, console.width)), soft_wrap=True)
    if fr.waived:
        console.print(f"  [dim]{len(fr.waived)} finding(s) waived[/]")
    if not fr.findings:
        console.print("  no findings")
    if circuits and s.rows:
        _print_wide(console, _circuit_table(list(s.rows)))
    for c in s.cautions:
        console.print(f"[bold red]CAUTION[/] {escape(shown(c))}. {SAFETY}")
    console.print()


def render(result: RunResult, *, circuits: bool = False, color: bool = False, width: int = 100) -> str:
    buf = io.StringIO()
    console = Console(file=buf, width=width, force_terminal=color, no_color=not color, highlight=False,
                      emoji=False, soft_wrap=False)
    for fr in result.files:
        _file(console, fr, circuits)
    for w in result.unused_waivers:
        console.print(f"[yellow]unused waiver[/] {escape(shown(w.rule))} for {escape(shown(w.ref or w.fingerprint))} "
                      f"({escape(shown(w.origin))}): it silences nothing")
    for s in result.unused_settings:
        console.print(f"[yellow]unused setting[/] {escape(shown(s))}")
    counts = result.counts()
    total = sum(fr.summary.circuits for fr in result.files)
    analysed = sum(fr.summary.analysed for fr in result.files)
    console.print(f"{len(result.files)} file(s) · {total} circuit(s), {analysed} analysed · "
                  f"{counts['error']} error(s) · {counts['warning']} warning(s) · {counts['info']} info")
    return "".join(line.rstrip() + "\n" for line in buf.getvalue().splitlines())  # no padding at line ends


_MARK = {Status.ADDED: "+", Status.REMOVED: "-", Status.CHANGED: "~"}


def _finding_line(sign: str, f: Finding) -> str:
    return f"{sign} {f.severity.value} {f.rule} ({refs_text(f.refs)}): {f.message}"


def render_diff(d: NetlistDiff) -> str:
    """A netlist diff, circuit by circuit: the edits, the figures that moved, the findings."""
    out = [f"{posix_path(d.old_path)} → {posix_path(d.new_path)}"]
    for c in d.circuits:
        if c.status is Status.UNCHANGED:
            continue
        out.append(f"{_MARK[c.status]} {c.id}  {c.kind}  ({', '.join(c.leds)}) {c.describe()}")
        out += [f"    edit {e.text()}" for e in c.edits]
        width = max((len(m.label) for m in c.moved), default=0)
        out += [f"    {m.label:{width}}  {m.side(m.old)} → {m.side(m.new)}" for m in c.moved]
        out += [f"    {_finding_line('+', f)}" for f in c.appeared] + [f"    {_finding_line('-', f)}" for f in c.gone]
    if d.appeared or d.gone:
        out.append("board")
        out += [f"    {_finding_line('+', f)}" for f in d.appeared] + [f"    {_finding_line('-', f)}" for f in d.gone]
    out.append(d.summary())
    return "\n".join(out) + "\n"
