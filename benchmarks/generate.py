"""Generate large, realistic KiCad 8-style netlists for the benchmarks (invented boards)."""

from __future__ import annotations

import gc
import subprocess
import sys
import time
from pathlib import Path
from typing import Callable

_HEADER = """(export (version "E")
  (design
    (source "/home/bench/indicator-wall.kicad_sch")
    (date "2026-01-01T00:00:00+0000")
    (tool "Eeschema 8.0.4")
    (sheet (number "1") (name "/") (tstamps "/")
      (title_block
        (title "Indicator wall")
        (company)
        (rev "A")
        (date)
        (source "indicator-wall.kicad_sch"))))
  (components
"""

_COLOURS = ("red", "green InGaN", "blue", "yellow", "white", "orange", "green GaP")
# Ballast values cycle through E12 so that no two neighbouring circuits are alike.
_BALLASTS = ("150", "180", "220", "270", "330", "390", "470", "560", "680", "820", "1k", "1k2")
_RAILS = ("+5V", "+3V3", "+12V")


def _comp(ref: str, value: str, footprint: str, part: str, description: str, uuid: int) -> str:
    return (
        f'    (comp (ref "{ref}")\n'
        f'      (value "{value}")\n'
        f'      (footprint "{footprint}")\n'
        f'      (description "{description}")\n'
        f'      (fields\n'
        f'        (field (name "Footprint") "{footprint}")\n'
        f'        (field (name "Datasheet"))\n'
        f'        (field (name "Description") "{description}"))\n'
        f'      (libsource (lib "Device") (part "{part}") (description "{description}"))\n'
        f'      (property (name "Sheetname") (value "Root"))\n'
        f'      (property (name "Sheetfile") (value "indicator-wall.kicad_sch"))\n'
        f'      (sheetpath (names "/") (tstamps "/"))\n'
        f'      (tstamps "{uuid:08x}-0000-4000-8000-000000000000"))\n'
    )


def _node(ref: str, pin: str, function: str | None) -> str:
    extra = f' (pinfunction "{function}")' if function else ""
    return f'      (node (ref "{ref}") (pin "{pin}"){extra} (pintype "passive"))'


def best_of(runs: int, fn: Callable[[], object]) -> float:
    """The shortest of `runs` timings of fn(), in seconds: the least disturbed by the machine.

    Each run starts from a collected heap with the cyclic collector paused, as ledlint runs a
    check: so a baseline is not charged for collecting what an earlier run left behind."""
    times = []
    for _ in range(runs):
        gc.collect()
        gc.disable()
        try:
            start = time.perf_counter()
            fn()
            times.append(time.perf_counter() - start)
        finally:
            gc.enable()
    return min(times)


def netlist(circuits: int) -> str:
    """A board with `circuits` LED + resistor pairs (2 components each) on three rails."""
    out = [_HEADER]
    for i in range(1, circuits + 1):
        colour = _COLOURS[i % len(_COLOURS)]
        out.append(_comp(f"D{i}", f"LED {colour}", "LED_SMD:LED_0603_1608Metric", "LED",
                         "Light emitting diode", 2 * i))
        out.append(_comp(f"R{i}", _BALLASTS[i % len(_BALLASTS)], "Resistor_SMD:R_0603_1608Metric", "R",
                         "Resistor", 2 * i + 1))
    out.append("  )\n  (libparts\n")
    out.append('    (libpart (lib "Device") (part "LED")\n      (description "Light emitting diode")\n'
               '      (fields (field (name "Reference") "D") (field (name "Value") "LED"))\n'
               '      (pins\n        (pin (num "1") (name "K") (type "passive"))\n'
               '        (pin (num "2") (name "A") (type "passive"))))\n')
    out.append('    (libpart (lib "Device") (part "R")\n      (description "Resistor")\n'
               '      (fields (field (name "Reference") "R") (field (name "Value") "R"))\n'
               '      (pins\n        (pin (num "1") (name "") (type "passive"))\n'
               '        (pin (num "2") (name "") (type "passive")))))\n')
    out.append('  (libraries\n    (library (logical "Device")\n'
               '      (uri "/usr/share/kicad/symbols/Device.kicad_sym")))\n  (nets\n')
    code = 0
    for k, rail in enumerate(_RAILS):
        code += 1
        out.append(f'    (net (code "{code}") (name "{rail}") (class "Default")\n')
        out.append("\n".join(_node(f"R{i}", "1", None) for i in range(1, circuits + 1) if i % len(_RAILS) == k)
                   + ")\n")
    code += 1
    out.append(f'    (net (code "{code}") (name "GND") (class "Default")\n')
    out.append("\n".join(_node(f"D{i}", "1", "K") for i in range(1, circuits + 1)) + ")\n")
    for i in range(1, circuits + 1):
        code += 1
        out.append(f'    (net (code "{code}") (name "Net-(D{i}-A)") (class "Default")\n')
        out.append(_node(f"D{i}", "2", "A") + "\n" + _node(f"R{i}", "2", None) + ")\n")
    out.append("  ))\n")
    return "".join(out)



# Each measured in a fresh interpreter, so that one does not inherit the other's heap: the peak
# resident set size of reading the file and doing the one job (VmHWM, kB; getrusage's maxrss
# would carry the parent's peak over the fork).
_PEAK = """
import sys
path = sys.argv[1]
if sys.argv[2] == "check":
    from ledlint.review.run import check
    check([path])
else:
    import sexpdata
    sexpdata.loads(open(path, encoding="utf-8").read())
print(next(line.split()[1] for line in open("/proc/self/status") if line.startswith("VmHWM")))
"""


def peak_mb(path: Path, job: str) -> float:
    done = subprocess.run([sys.executable, "-c", _PEAK, str(path), job], capture_output=True, text=True, check=True)
    return int(done.stdout.split()[-1]) / 1024


if __name__ == "__main__":
    sys.stdout.write(netlist(int(sys.argv[1]) if len(sys.argv) > 1 else 10_000))
