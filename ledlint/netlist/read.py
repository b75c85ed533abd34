"""One entry for every KiCad input: a schematic or project, an XML netlist, or an s-expression netlist."""

from __future__ import annotations

import re
from pathlib import Path

from ledlint.errors import InputError, failure_reason
from ledlint.netlist.kicad_net import read_netlist
from ledlint.netlist.kicad_sch import read_schematic
from ledlint.netlist.kicad_xml import read_xml_netlist
from ledlint.netlist.model import Netlist

_SCHEMATIC_HEAD = re.compile(rb"\s*\(\s*kicad_sch[\s()]")


def read_design(path: str | Path) -> Netlist:
    """Read a .kicad_sch or .kicad_pro, or a netlist told XML or s-expression by its first bytes."""
    p = Path(path)
    if p.suffix in (".kicad_sch", ".kicad_pro"):
        return read_schematic(p)
    try:
        with open(p, "rb") as fh:
            head = fh.read(4096).removeprefix(b"\xef\xbb\xbf")
    except (FileNotFoundError, IsADirectoryError):
        return read_netlist(p)  # which words those cases
    except OSError as exc:
        raise InputError(f"cannot read: {failure_reason(exc)}", str(p)) from None
    if head.lstrip().startswith(b"<"):
        return read_xml_netlist(p)
    if _SCHEMATIC_HEAD.match(head):
        return read_schematic(p)
    return read_netlist(p)
