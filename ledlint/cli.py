"""Command line: `ledlint check PATH...` and friends. Parses options, runs the library, prints."""

from __future__ import annotations

import argparse
import glob
import json
import sys
from pathlib import Path
from typing import Sequence

from ledlint import __version__
from ledlint.errors import LedlintError
from ledlint.model import Netlist
from ledlint.parts import Kind, classify
from ledlint.reader import read_netlist

EXIT_CLEAN, EXIT_FINDINGS, EXIT_BAD_INPUT = 0, 1, 2


def find_netlists(paths: Sequence[str]) -> list[Path]:
    """Files as given; folders searched for *.net (hidden folders skipped); globs expanded."""
    found: list[Path] = []
    for raw in paths:
        p = Path(raw)
        if p.is_dir():
            found.extend(sorted(f for f in p.rglob("*.net")
                                if f.is_file() and not any(part.startswith(".") for part in f.relative_to(p).parts)))
        elif not p.exists() and glob.has_magic(raw):
            matches = sorted(Path(m) for m in glob.glob(raw, recursive=True))
            if not matches:
                raise LedlintError("no file matches this pattern", raw)
            found.extend(matches)
        else:
            found.append(p)
    if not found:
        raise LedlintError("no *.net files found in " + ", ".join(paths))
    return list(dict.fromkeys(found))


def inventory(netlist: Netlist) -> dict[str, object]:
    kinds = [classify(c) for c in netlist.components]
    return {
        "path": netlist.path,
        "version": netlist.version,
        "tool": netlist.tool,
        "components": len(netlist.components),
        "nets": len(netlist.nets),
        "leds": sum(k in (Kind.LED, Kind.LED_ADDRESSABLE) for k in kinds),
    }


def _build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="ledlint",
        description="Design-rule checks for the LED circuits in KiCad schematic netlists.",
    )
    parser.add_argument("--version", action="version", version=f"ledlint {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    check = sub.add_parser("check", help="check netlist files or folders of them")
    check.add_argument("paths", nargs="+", metavar="PATH", help="a .net file, a folder or a glob")
    check.add_argument("--format", choices=("text", "json"), default="text", help="report format (default text)")
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    parser = _build_parser()
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help(sys.stderr)
        return EXIT_BAD_INPUT
    try:
        paths = find_netlists(args.paths)
        netlists, errors = [], []
        for path in paths:
            try:
                netlists.append(read_netlist(path))
            except LedlintError as exc:
                errors.append(exc)
        if errors:
            for exc in errors:
                print(str(exc), file=sys.stderr)
            return EXIT_BAD_INPUT
    except LedlintError as exc:
        print(str(exc), file=sys.stderr)
        return EXIT_BAD_INPUT
    files = [inventory(n) for n in netlists]
    if args.format == "json":
        out = json.dumps({"schema": 1, "tool": {"name": "ledlint", "version": __version__},
                          "files": files, "findings": [], "circuits": []}, indent=2, ensure_ascii=False)
    else:
        out = "\n".join(
            f"{f['path']}: {f['components']} components, {f['nets']} nets, {f['leds']} LEDs "
            f"(netlist version {f['version']}, {f['tool'] or 'unknown tool'})" for f in files)
    sys.stdout.write(out + "\n")
    return EXIT_CLEAN
