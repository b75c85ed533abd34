"""Read time of a generated 20,000-component netlist, next to sexpdata's bare loads of it.

Run: python benchmarks/read.py [circuits]   (default 10,000 LED circuits = 20,000 components)
Prints the best of three runs of each, and the ratio reader / sexpdata.
"""

from __future__ import annotations

import sys
import tempfile
from pathlib import Path

import sexpdata

sys.path.insert(0, str(Path(__file__).parent))
from generate import best_of, netlist  # noqa: E402

from ledlint.netlist.kicad_net import read_netlist  # noqa: E402



def main() -> None:
    circuits = int(sys.argv[1]) if len(sys.argv) > 1 else 10_000
    text = netlist(circuits)
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "bench.net"
        path.write_text(text, encoding="utf-8")
        ours = best_of(3, lambda: read_netlist(path))
        # sexpdata with its defaults, on text already in memory: the floor the reader is held to.
        bare = best_of(3, lambda: sexpdata.loads(text))
        comps = len(read_netlist(path).components)
    print(f"netlist: {comps} components, {len(text) / 1e6:.1f} MB")
    print(f"ledlint read_netlist (file -> model):  {ours:.3f} s")
    print(f"sexpdata.loads (text -> lists):        {bare:.3f} s")
    print(f"ratio ledlint / sexpdata:              {ours / bare:.2f}x  (target <= 1.2x)")


if __name__ == "__main__":
    main()
