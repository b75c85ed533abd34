"""Reader: KiCad 6–10 schematics (.kicad_sch, or the .kicad_pro that names the root) to the Netlist model.

Stages: read (files and hierarchy) → geometry (what touches on a sheet) → connect (nets across
sheets, and their names) → assemble (the model). Every problem with the input is an InputError.
"""

from __future__ import annotations

from pathlib import Path

from ledlint.netlist.kicad_sch.assemble import assemble
from ledlint.netlist.kicad_sch.connect import build_nets
from ledlint.netlist.kicad_sch.read import load_design
from ledlint.netlist.model import Netlist

__all__ = ["read_schematic"]


def read_schematic(path: str | Path) -> Netlist:
    """Read a root schematic, or a project file whose stem names it, with all its sub-sheets."""
    design = load_design(Path(path))
    return assemble(design, build_nets(design))
