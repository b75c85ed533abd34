"""Every real netlist in the corpus reads, and its counts match an independent regex scan."""

from __future__ import annotations

import re
from pathlib import Path

from paths import CORPUS

from ledlint.parts.kinds import Kind, classify
from ledlint.netlist.kicad_net import read_netlist

# The independent count is the corpus MANIFEST's own method ("How the numbers were
# counted"): naive regexes over the decoded text, nothing shared with the reader.
_ATOM = r'"(?:[^"\\]|\\.)*"|[^()\s"]+'
_COMP = re.compile(r"\(comp\s+\(ref\s")
_NET = re.compile(r"\(net\s+\(code\s+(?:" + _ATOM + r")\)\s+\(name\s")
_COMP_BLOCK = re.compile(r"\(comp\s+\(ref\s+(" + _ATOM + r")\)(.*?)(?=\(comp\s+\(ref\s|\(libparts|\Z)", re.S)
_EXCLUDED_REF = re.compile(r"^(J|P|SW|K|TP|CON|U|Brd|MX)")


def _field(block: str, head: str) -> str:
    m = re.search(r"\(" + head + r"\s+(" + _ATOM + ")", block)
    return m.group(1).strip('"') if m else ""


def _ledish() -> re.Pattern[str]:
    """The MANIFEST's LED-like pattern, read from the MANIFEST itself (its `/…/i` in the LED-like
    bullet), so the count follows the corpus's own definition."""
    text = (CORPUS / "MANIFEST.md").read_text(encoding="utf-8")
    m = re.search(r"\*\*LED-like\*\*.*?`/([^`]+)/i`", text, re.S)
    assert m, "the MANIFEST's LED-like pattern"
    return re.compile(m.group(1), re.I)


def regex_counts(text: str) -> tuple[int, int, int]:
    ledish = _ledish()
    leds = 0
    for m in _COMP_BLOCK.finditer(text):
        ref, block = m.group(1).strip('"'), m.group(2)
        value, part = _field(block, "value"), _field(block, "part")
        if not (ledish.search(value) or ledish.search(part)):
            continue
        if "OLED" in value.upper() or "OLED" in part.upper():
            continue
        if _EXCLUDED_REF.match(ref) and not ref.startswith("LED"):
            continue
        if re.search(r"conn|_NoLED|SW_", part, re.I):
            continue
        leds += 1
    return len(_COMP.findall(text)), len(_NET.findall(text)), leds


# LEDs the MANIFEST's naive scan leaves out, each read off the file itself: the scan drops refs
# starting with P as connectors.
_MISSED_BY_THE_SCAN = {"esp32-poe-board-status-leds.net": ("PWR1",)}  # value LED/RED/0603


def test_every_corpus_file_reads_with_independently_counted_parts(corpus: list[Path]) -> None:
    assert len(corpus) >= 9
    for path in corpus:
        netlist = read_netlist(path)
        comps, nets, leds = regex_counts(path.read_text(encoding="utf-8"))
        missed = _MISSED_BY_THE_SCAN.get(path.name, ())
        assert all(netlist.component(ref).value.startswith("LED/") for ref in missed)
        leds += len(missed)
        ours = sum(classify(c) in (Kind.LED, Kind.LED_ADDRESSABLE) for c in netlist.components)
        assert (len(netlist.components), len(netlist.nets), ours) == (comps, nets, leds), path.name
        assert netlist.notes == (), path.name


def test_the_regex_scan_reproduces_the_manifest_table(corpus: list[Path]) -> None:
    # The table in ../shared/corpus/real/MANIFEST.md (components, LED-like, nets).
    manifest = {
        "logic-probe-rgb-led.net": (7, 9, 1), "tiny-fpga-board.net": (44, 70, 2),
        "split-keyboard-rgb-underglow.net": (87, 76, 27), "antenna-switch-board.net": (152, 203, 18),
        "printer-controller-board.net": (356, 288, 13), "sdr-transceiver-mainboard.net": (413, 378, 6),
        "macropad-rgb-keys.net": (22, 27, 6), "mains-led-lamp-strings.net": (78, 55, 56),
        "keyboard-per-key-rgb.net": (299, 243, 98),
    }
    for path in corpus:
        if path.name in manifest:
            assert regex_counts(path.read_text(encoding="utf-8")) == manifest[path.name], path.name
