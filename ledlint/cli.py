"""Command line: `ledlint check`, `baseline`, `diff`, `rules`, `explain`. Parses options, runs the library, prints."""

from __future__ import annotations

import argparse
import importlib
import os
import sys
import tempfile
import time
import traceback
from contextlib import contextmanager
from pathlib import Path
from types import ModuleType
from typing import TYPE_CHECKING, Callable, Iterator, Sequence

from ledlint import __version__
from ledlint.errors import LedlintError, failure_reason
from ledlint.sanitise import shown
from ledlint.checks.findings import FAIL_LEVELS
from ledlint.review.inputs import find_netlists
from ledlint.review.rules import load_rules

if TYPE_CHECKING:
    from ledlint.review.run import RunResult

EXIT_CLEAN, EXIT_FINDINGS, EXIT_BAD_INPUT, EXIT_INTERNAL = 0, 1, 2, 3
EXIT_INTERRUPTED = 130  # the shell's 128 + SIGINT

# Format name → the module whose render(result) writes it; imported only when asked for, so a
# check does not pay for the formats it does not print.
FORMATS: dict[str, str] = {
    "text": "ledlint.report.text",
    "json": "ledlint.report.json_doc",
    "sarif": "ledlint.report.sarif",
    "github": "ledlint.report.github",
    "markdown": "ledlint.report.markdown",
}
DIFF_FORMATS = ("text", "json", "markdown")  # ledlint.diff.FORMATS; tests/test_cli.py keeps them equal
BASELINE_NAME = "ledlint-baseline.json"  # ledlint.baseline.DEFAULT_NAME, likewise


def _module(name: str) -> ModuleType:
    return importlib.import_module(name)


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="ledlint", description="Design-rule checks for the LED circuits in KiCad schematic netlists.")
    parser.add_argument("--version", action="version", version=f"ledlint {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    c = sub.add_parser("check", help="check netlist files or folders of them")
    c.add_argument("paths", nargs="+", metavar="PATH", help="a .net file, a folder or a glob")
    c.add_argument("--format", choices=sorted(FORMATS), default="text", help="report format (default text)")
    c.add_argument("--circuits", action="store_true", help="add a table of every circuit's operating point")
    c.add_argument("--fail-on", choices=FAIL_LEVELS, default="error",
                   help="exit 1 when a finding at or above this severity remains (default error)")
    c.add_argument("--config", metavar="FILE", help="use this ledlint.toml instead of searching for one")
    c.add_argument("--output", "-o", metavar="FILE", help="write the report to FILE (written whole, or not at all)")
    c.add_argument("--baseline", metavar="PATH",
                   help="count only findings not recorded in this baseline file; report its stale entries")
    b = sub.add_parser("baseline", help="record the current findings, so that later checks count only new ones")
    b.add_argument("paths", nargs="+", metavar="PATH", help="a .net file, a folder or a glob")
    b.add_argument("--config", metavar="FILE", help="use this ledlint.toml instead of searching for one")
    b.add_argument("--output", "-o", metavar="FILE", default=BASELINE_NAME,
                   help=f"the baseline file to write (default {BASELINE_NAME})")
    d = sub.add_parser("diff", help="what changed electrically between two versions of a netlist")
    d.add_argument("old", metavar="OLD", help="the netlist before the change")
    d.add_argument("new", metavar="NEW", help="the netlist after it")
    d.add_argument("--format", choices=DIFF_FORMATS, default="text", help="report format (default text)")
    d.add_argument("--config", metavar="FILE", help="use this ledlint.toml for both instead of searching")
    d.add_argument("--output", "-o", metavar="FILE", help="write the report to FILE (written whole, or not at all)")
    r = sub.add_parser("rules", help="list the rules")
    r.add_argument("--format", choices=("text", "json"), default="text")
    e = sub.add_parser("explain", help="print a rule's documentation")
    e.add_argument("rule", metavar="RULE")
    return parser


def write_whole(out: str, destination: str | None, inputs: Sequence[str | Path] = ()) -> None:
    """Write all of a report or none of it: to a temporary file first, then renamed into place.

    The path named is what is replaced: a symlink there becomes the report itself, and whatever
    it pointed to is left alone (a link in a pull request must not aim the report at a file
    elsewhere). A pipe or device, or a link to one, is written to as it is, since renaming a file
    over it would destroy it. A path that is one of the run's inputs is refused. A new file gets
    the usual permissions (the umask's), a replaced one keeps its own."""
    if destination is None:
        try:
            sys.stdout.write(out)
            sys.stdout.flush()
        except BrokenPipeError:
            raise
        except OSError as exc:
            raise LedlintError(f"cannot write the report to standard output: {failure_reason(exc)}") from None
        return
    target = Path(destination)
    if any(_same_file(target, i) for i in inputs):
        raise LedlintError("refusing to write the report over an input of this run", destination)
    if target.exists() and not target.is_file():
        try:
            with open(target, "w", encoding="utf-8") as fh:
                fh.write(out)
        except OSError as exc:
            raise LedlintError(f"cannot write the report: {failure_reason(exc)}", destination) from None
        return
    try:
        fd, tmp = tempfile.mkstemp(dir=target.parent, prefix=".ledlint-")
    except OSError as exc:
        raise LedlintError(f"cannot write the report here: {failure_reason(exc)}", destination) from None
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(out)
        kept = target.stat().st_mode & 0o7777 if target.is_file() and not target.is_symlink() else None
        os.chmod(tmp, kept if kept is not None else 0o666 & ~_umask())
        os.replace(tmp, target)
    except OSError as exc:
        Path(tmp).unlink(missing_ok=True)
        raise LedlintError(f"cannot write the report: {failure_reason(exc)}", destination) from None
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise


def _same_file(a: Path, b: str | Path) -> bool:
    try:
        return a.exists() and os.path.samefile(a, b)
    except OSError:
        return False


def _umask() -> int:
    mask = os.umask(0)  # the only way to read it is to set it
    os.umask(mask)
    return mask


@contextmanager
def _progress() -> Iterator[Callable[[int, int], None] | None]:
    """A progress bar on standard error when it is a terminal and the run takes long (half a
    second or more); the report on standard output is never touched, and an interrupt clears it."""
    if not sys.stderr.isatty():
        yield None
        return
    from rich.console import Console
    from rich.progress import Progress

    bar = Progress(console=Console(stderr=True), transient=True)
    task = None
    started = time.monotonic()

    def update(done: int, total: int) -> None:
        nonlocal task
        if task is None:
            if done == total or time.monotonic() - started < 0.5:
                return
            bar.start()
            task = bar.add_task("checking", total=total)
        bar.update(task, completed=done)

    try:
        yield update
    finally:
        bar.stop()


def _render(fmt: str, result: RunResult, args: argparse.Namespace) -> str:
    if fmt == "text":
        color = args.output is None and sys.stdout.isatty() and "NO_COLOR" not in os.environ
        width = os.get_terminal_size().columns if color else 100
        return _module(FORMATS["text"]).render(result, circuits=args.circuits, color=color, width=width)
    return _module(FORMATS[fmt]).render(result)


def _inputs(result: RunResult, args: argparse.Namespace) -> list[str]:
    """What a run read: its netlists, their configuration files, a baseline."""
    read = [f.path for f in result.files] + [f.config_path for f in result.files if f.config_path]
    return read + [p for p in (getattr(args, "config", None), getattr(args, "baseline", None)) if p]


def cmd_check(args: argparse.Namespace) -> int:
    from ledlint.review.run import check  # the analysis, numpy and the graph library load only to check

    baseline = _module("ledlint.review.baseline")
    known = baseline.load(args.baseline) if args.baseline else None
    with _progress() as progress:
        result = check(find_netlists(args.paths), config_path=args.config, progress=progress)
    if known is not None:
        compared = baseline.compare(result, known)
        result = compared.result
        for line in compared.summary():
            print(shown(line), file=sys.stderr)
    write_whole(_render(args.format, result, args), args.output, _inputs(result, args))
    return EXIT_FINDINGS if result.failed(args.fail_on) else EXIT_CLEAN


def cmd_baseline(args: argparse.Namespace) -> int:
    from ledlint.review.run import check

    with _progress() as progress:
        result = check(find_netlists(args.paths), config_path=args.config, progress=progress)
    write_whole(_module("ledlint.review.baseline").render(result, args.output), args.output, _inputs(result, args))
    print(f"{args.output}: recorded {len(result.findings)} finding(s) from {len(result.files)} file(s)",
          file=sys.stderr)
    return EXIT_CLEAN


def cmd_diff(args: argparse.Namespace) -> int:
    diff = _module("ledlint.review.diff").diff_files(args.old, args.new, config_path=args.config)
    write_whole(_module(FORMATS[args.format]).render_diff(diff), args.output, [args.old, args.new, args.config or ""])
    return EXIT_CLEAN


def cmd_rules(args: argparse.Namespace) -> int:
    rules = load_rules()
    if args.format == "json":
        from ledlint.checks.registry import rule_doc
        from ledlint.sanitise import json_text

        sys.stdout.write(json_text([rule_doc(r) for r in rules]))
    else:
        width = max(len(r.id) for r in rules)
        for r in rules:
            sys.stdout.write(f"{r.id:{width}}  {r.severity.value:7}  {shown(r.summary)}\n")
    return EXIT_CLEAN


def cmd_explain(args: argparse.Namespace) -> int:
    rules = {r.id: r for r in load_rules()}
    if args.rule not in rules:
        from ledlint.config import suggest

        raise LedlintError(f"no rule {args.rule!r}{suggest(args.rule, sorted(rules))}")
    r = rules[args.rule]
    options = "".join(f"\n    {o.name} = {o.default:g} ({o.unit}): {o.doc}" for o in r.options)
    sys.stdout.write(r.doc.strip() + "\n\nDefault severity: " + r.severity.value
                     + (f"\nOptions ([rules.{r.id}] in ledlint.toml):{options}" if options else "") + "\n")
    return EXIT_CLEAN


COMMANDS: dict[str, Callable[[argparse.Namespace], int]] = {
    "check": cmd_check, "baseline": cmd_baseline, "diff": cmd_diff, "rules": cmd_rules, "explain": cmd_explain,
}


def main(argv: Sequence[str] | None = None) -> int:
    parser = _parser()
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help(sys.stderr)
        return EXIT_BAD_INPUT
    try:
        return COMMANDS[args.command](args)
    except LedlintError as exc:
        print(str(exc), file=sys.stderr)
        return EXIT_BAD_INPUT
    except BrokenPipeError:
        return EXIT_CLEAN
    except KeyboardInterrupt:
        print("ledlint: interrupted; nothing written", file=sys.stderr)
        return EXIT_INTERRUPTED
    except Exception as exc:  # a bug in ledlint, not in the input: never exit 1, which means findings
        where = traceback.extract_tb(exc.__traceback__)[-1]
        print(f"ledlint: internal error: {type(exc).__name__}: {shown(str(exc))} "
              f"(at {Path(where.filename).name}:{where.lineno}); "
              "this is a bug in ledlint, please report it with the netlist", file=sys.stderr)
        if os.environ.get("LEDLINT_DEBUG"):
            traceback.print_exc()
        return EXIT_INTERNAL
