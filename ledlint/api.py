"""The library's public face: check files or a netlist already read, load the rules, and the types
a third-party rule or a script works with. Everything else may move between releases."""

from __future__ import annotations

from pathlib import Path
from typing import Sequence

from ledlint.analysis.results import (Analysis, BankResult, Blocked, Computed, CurrentDriven, DriverResult, Driven,
                                      Incomplete, LedResult, PinResult, ResistorResult, ResistorRole, Sharing,
                                      SinkResult, StringResult, VoltageDriven)
from ledlint.checks.findings import Finding, Severity, Value
from ledlint.checks.registry import Option, OptionOf, Rule, RuleContext, settings
from ledlint.circuits.circuit import CircuitKind, LedCircuit, LedString, Wired
from ledlint.config import Config, from_mapping
from ledlint.errors import ConfigError, InputError, LedlintError
from ledlint.netlist.kicad_net import parse_netlist, read_netlist
from ledlint.netlist.model import Component, Net, Netlist, Pin
from ledlint.parts.kinds import LedId
from ledlint.review.rules import load_rules
from ledlint.review.run import FileResult, RunResult, check, check_design

__all__ = [
    "Analysis", "BankResult", "Blocked", "CircuitKind", "Component", "Computed", "Config", "ConfigError",
    "CurrentDriven", "DriverResult", "Driven", "FileResult", "Finding", "Incomplete", "InputError", "LedCircuit",
    "LedId", "LedResult", "LedString", "LedlintError", "Net", "Netlist", "Option", "OptionOf", "Pin", "PinResult",
    "ResistorResult", "ResistorRole", "Rule", "RuleContext", "RunResult", "Severity", "Sharing", "SinkResult",
    "StringResult", "Value", "VoltageDriven", "Wired", "check_files", "check_netlist", "check_text", "from_mapping", "load_rules",
    "parse_netlist", "read_netlist",
]


def check_files(paths: Sequence[str | Path], *, config_path: str | None = None) -> RunResult:
    """Check netlist files as `ledlint check` does, each with the configuration found beside it
    (or `config_path`). Bad input raises LedlintError naming every bad file."""
    return check(paths, config_path=config_path)


def check_netlist(netlist: Netlist, config: Config | None = None, *, plugins: bool = True) -> FileResult:
    """Check a netlist already in memory, with a configuration (default: none) and the built-in
    rules and, unless told not to, those of installed plugins."""
    cfg = config or Config()
    rules = load_rules(include_plugins=plugins)
    result, _, _ = check_design(netlist, cfg, rules, settings(rules, cfg), netlist.path)
    return result


def check_text(text: str, name: str = "<string>", config: Config | None = None) -> FileResult:
    """Check the text of a KiCad netlist: the reader's errors are InputError, as for a file."""
    return check_netlist(parse_netlist(text, name), config)
