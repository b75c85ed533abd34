"""Time of a full check on two hostile inputs (issue: no input may take quadratic time): one
resistor value of 8 MB, and one net with 100,000 nodes (100,000 resistors on one net).

Run: python benchmarks/hostile.py     Prints the best of three times of a check of each with every
report format drawn (target under 5 s on the 2-core reference machine), that time over sexpdata's
bare read of the same text (the check benchmark's target, 1.5x: time linear in the file however
its nodes are spread), and the check's peak memory over the file size.
"""

from __future__ import annotations

import sys
import tempfile
from pathlib import Path

import sexpdata

sys.path.insert(0, str(Path(__file__).parent))
from generate import best_of, peak_mb  # noqa: E402

from ledlint.report import github, json_doc, markdown, sarif  # noqa: E402
from ledlint.report import text as text_format  # noqa: E402
from ledlint.review.run import check  # noqa: E402

_LED = ('    (comp (ref "D1") (value "LED red") (footprint "LED_SMD:LED_0603_1608Metric")\n'
        '      (libsource (lib "Device") (part "LED")))\n')
_LIBPARTS = ('  (libparts (libpart (lib "Device") (part "LED") (pins (pin (num "1") (name "K") (type "passive"))\n'
             '    (pin (num "2") (name "A") (type "passive")))))\n')


def long_value(megabytes: int = 8) -> str:
    value = "1k" + "x" * (megabytes << 20)
    return ('(export (version "E")\n  (components\n' + _LED + f'    (comp (ref "R1") (value "{value}")))\n'
            + _LIBPARTS + '  (nets\n    (net (code "1") (name "+5V") (node (ref "R1") (pin "1")))\n'
            '    (net (code "2") (name "/A") (node (ref "R1") (pin "2")) (node (ref "D1") (pin "2")))\n'
            '    (net (code "3") (name "GND") (node (ref "D1") (pin "1")))))\n')


def wide_net(nodes: int = 100_000) -> str:
    comps = "".join(f'    (comp (ref "R{i}") (value "10k"))\n' for i in range(1, nodes + 1))
    members = "".join(f'      (node (ref "R{i}") (pin "1"))\n' for i in range(1, nodes + 1))
    return ('(export (version "E")\n  (components\n' + _LED + '    (comp (ref "RB") (value "330"))\n' + comps
            + '  )\n' + _LIBPARTS + '  (nets\n    (net (code "1") (name "GND") (node (ref "D1") (pin "1"))\n'
            + members + '    )\n    (net (code "2") (name "/A") (node (ref "RB") (pin "2")) (node (ref "D1") (pin "2")))\n'
            '    (net (code "3") (name "+5V") (node (ref "RB") (pin "1")))))\n')


def main() -> None:
    cases = (("an 8 MB value", long_value), ("a net of 100,000 nodes", wide_net),
             ("a net of 200,000 nodes", lambda: wide_net(200_000)))
    with tempfile.TemporaryDirectory() as tmp:
        for name, text_of in cases:
            path = Path(tmp) / "hostile.net"
            text = text_of()
            path.write_text(text, encoding="utf-8")

            def full() -> None:
                result = check([path])
                for fmt in (text_format, json_doc, sarif, github, markdown):
                    fmt.render(result)

            seconds = best_of(3, full)
            bare = best_of(3, lambda: sexpdata.loads(text))
            size = path.stat().st_size / 1e6
            ours = peak_mb(path, "check")
            print(f"{name:24s} ({size:.1f} MB): check and every report {seconds:.2f} s "
                  f"(target under 5 s), {seconds / bare:.2f}x sexpdata's bare read (target <= 1.5x); "
                  f"peak memory {ours:.0f} MB, {ours / size:.0f}x the file")


if __name__ == "__main__":
    main()
