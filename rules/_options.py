"""Rule options that more than one rule reads: each defined once, with its default and range, and
declared by the rule that owns it. A fix hint reads the owner's setting, so that following the
hint clears the owner's check."""

from __future__ import annotations

from ledlint.checks.registry import Option, OptionOf

MARGIN = OptionOf("current-margin", Option(
    "margin", 0.75, "fraction of If_max", "the share of If_max the worst case may reach", 0.05, 1.0))
DESIGN_FACTOR = OptionOf("resistor-overload", Option(
    "design_factor", 0.5, "fraction of rating", "the share of the derated rating to use", 0.05, 1.0))
MIN_RATIO = OptionOf("supply-headroom", Option(
    "min_ratio", 0.5, "fraction of nominal", "least low-corner current before a warning"))
DEAD_RATIO = OptionOf("supply-headroom", Option(
    "dead_ratio", 0.1, "fraction of nominal", "below this the string counts as not conducting"))
