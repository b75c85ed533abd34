"""Read time of the largest schematic in the corpus, next to reading the netlist KiCad exported from it.

Run: python benchmarks/schematic.py [folder]
(default: the 98-key keyboard pair in ../shared/corpus/schematic/real/, or LEDLINT_SCHEMATICS)
Prints the best of nine runs of each, taken in turns so that a busy machine slows both alike,
and the ratio schematic / netlist (target <= 1.5x).
"""

from __future__ import annotations

import os
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).parent))
from generate import best_of  # noqa: E402

from ledlint.netlist.kicad_net import read_netlist  # noqa: E402
from ledlint.netlist.kicad_sch import read_schematic  # noqa: E402

_REPO = Path(__file__).resolve().parent.parent
_CORPUS = Path(os.environ.get("LEDLINT_SCHEMATICS") or _REPO.parent / "shared" / "corpus" / "schematic")


def main() -> None:
    folder = Path(sys.argv[1]) if len(sys.argv) > 1 else _CORPUS / "real" / "keyboard-98-addressable-6.0"
    pairs = sorted(folder.glob("*.net"))
    if not pairs:
        sys.exit(f"no .net beside a schematic in {folder}")
    net = pairs[0]
    sch = net.with_suffix(".kicad_sch")
    schematic = netlist = float("inf")
    for _ in range(9):
        schematic = min(schematic, best_of(1, lambda: read_schematic(sch)))
        netlist = min(netlist, best_of(1, lambda: read_netlist(net)))
    design = read_schematic(sch)
    print(f"schematic: {sch.name}, {sch.stat().st_size / 1e3:.0f} kB, {len(design.components)} components, "
          f"{len(design.nets)} nets; netlist {net.stat().st_size / 1e3:.0f} kB")
    print(f"ledlint read_schematic (.kicad_sch -> model): {schematic * 1000:.1f} ms")
    print(f"ledlint read_netlist   (.net -> model):       {netlist * 1000:.1f} ms")
    print(f"ratio schematic / netlist:                    {schematic / netlist:.2f}x  (target <= 1.5x)")


if __name__ == "__main__":
    main()
