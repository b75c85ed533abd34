"""Full check of a generated 20,000-component board (10,000 LED circuits) next to sexpdata's bare
read of the same file, time and peak memory, and the command-line time of a typical
500-component board.

Run: python benchmarks/check.py     Prints best-of-three times, peak memory and the ratios.
"""

from __future__ import annotations

import subprocess
import sys
import tempfile
from pathlib import Path

import sexpdata

sys.path.insert(0, str(Path(__file__).parent))
from generate import best_of, netlist, peak_mb  # noqa: E402

from ledlint.review.run import check  # noqa: E402



def main() -> None:
    with tempfile.TemporaryDirectory() as tmp:
        big = Path(tmp) / "wall.net"
        big.write_text(netlist(10_000), encoding="utf-8")
        text = big.read_text(encoding="utf-8")
        full = best_of(3, lambda: check([big]))
        bare = best_of(3, lambda: sexpdata.loads(text))
        result = check([big])
        circuits = len(result.files[0].board.circuits)
        print(f"board: {len(result.files[0].netlist.components)} components, {circuits} LED circuits")
        print(f"ledlint full check (read, recognise, analyse, rules): {full:.2f} s")
        print(f"sexpdata.loads of the same text:                    {bare:.2f} s")
        print(f"ratio check / sexpdata read:                        {full / bare:.2f}x  (target <= 1.5x)")
        ours, theirs = peak_mb(big, "check"), peak_mb(big, "sexpdata")
        print(f"peak memory: ledlint check {ours:.0f} MB, sexpdata.loads {theirs:.0f} MB "
              f"({ours / theirs:.2f}x; the file is {big.stat().st_size / 1e6:.1f} MB)")

        small = Path(tmp) / "panel.net"
        small.write_text(netlist(250), encoding="utf-8")
        cli = [sys.executable, "-m", "ledlint", "check", str(small), "--fail-on", "never"]
        wall = best_of(3, lambda: subprocess.run(cli, capture_output=True, check=True, cwd=tmp))
        print(f"500-component board, `ledlint check` wall time incl. interpreter start: {wall:.2f} s "
              "(target < 1 s)")


if __name__ == "__main__":
    main()
