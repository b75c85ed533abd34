"""The whole check on mutated boards: whatever the values, pin names and net names say, the tool
answers with findings or its own error, never a crash (common practice: property testing)."""

from __future__ import annotations

import random
import re

from hypothesis import given, settings
from hypothesis import strategies as st

import tempfile
from pathlib import Path

from ledlint.errors import LedlintError
from ledlint.report import json_doc, sarif, text
from ledlint.review.run import check
from paths import FIXTURES, SAMPLES

# What a schematic's strings may hold, odd ones foremost: values, units, pin names, rail names.
_TOKENS = ["", "0", "0R", "R", "1/4W", "1/4w", "0,25W", "-5V", "+0V", "0V", "-0V", "1e300", "1e-300", "DNP", "NC", "?",
           "A", "K", "+", "-", "C", "E", "B", "G", "S", "D", "X", "GND", "+3V3", "+5V", "+72V", "230VAC", "VCC", "VBUS",
           "LED", "red", "white", "RGB", "Q_PMOS_GSD", "Q_NPN_BEC", "R", "2.0V@20mA", "3V@0mA", "20mA", "0mA", "nan",
           "inf", "-1", "1k", "10 1%", "4K7", "Tolerance", "Power", "Vf", "If_max", "Rth", "-400K/W", "~", "/",
           "Net-(D1-A)", "passive", "power_in", "output", "bidirectional", "no_connect"]
_STRING = re.compile(r'"((?:[^"\\]|\\.)*)"')
_SEEDS = [p.read_text(encoding="utf-8") for p in sorted(SAMPLES.glob("*.net"))] + \
         [(FIXTURES / "kicad5-minimal.net").read_text(encoding="utf-8"),
          (FIXTURES / "kicad10-minimal.net").read_text(encoding="utf-8")]


def _mutate(text: str, rng: random.Random) -> str:
    spans = [m.span(1) for m in _STRING.finditer(text)]
    for start, end in sorted(rng.sample(spans, min(len(spans), rng.randint(1, 12))), reverse=True):
        text = text[:start] + rng.choice(_TOKENS) + text[end:]
    return text


def _checks_cleanly(board: str) -> None:
    """A report in every machine format, or ledlint's own error; anything else fails the test."""
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "board.net"
        path.write_text(board, encoding="utf-8")
        try:
            result = check([path])
        except LedlintError:
            return
        for fmt in (text, json_doc, sarif):
            fmt.render(result)


@settings(max_examples=120, deadline=None)
@given(st.integers(0, len(_SEEDS) - 1), st.randoms(use_true_random=False))
def test_mutated_boards_check_without_a_crash(which: int, rng: random.Random) -> None:
    _checks_cleanly(_mutate(_SEEDS[which], rng))


# A reference is opaque text: any of these, given to a component and to every node naming it.
_REFS = ["D2:x", "D1:", ":D1", "D1::R", "D 1", "D1\\\\", 'D1\\"', "D1(2)", "D1;", "#D1", "D1\u202e", "D1\x1b[2J",
         "D\u00e91", "D1/2", "D1.A", "LED", "D", "1", "D1-A", "Net-(D1-A)", "R1", "~"]
_REF = re.compile(r'\(ref "((?:[^"\\]|\\.)*)"\)')


def _rename(text: str, rng: random.Random) -> str:
    refs = sorted({m.group(1) for m in _REF.finditer(text)})
    for old in rng.sample(refs, min(len(refs), rng.randint(1, 3))):
        text = text.replace(f'(ref "{old}")', f'(ref "{rng.choice(_REFS)}")')
    return text


@settings(max_examples=80, deadline=None)
@given(st.integers(0, len(_SEEDS) - 1), st.randoms(use_true_random=False))
def test_references_renamed_with_their_nodes_check_without_a_crash(which: int, rng: random.Random) -> None:
    """A component's ref and every node naming it change together, so the board stays wired and
    the new name reaches the recogniser (a ref holding ':' once crashed it)."""
    _checks_cleanly(_rename(_SEEDS[which], rng))
