"""Write KiCad 8-style netlists from a compact description, for fixtures and sample boards.

The layout follows what KiCad 8 writes (kicad-netlist-format.md §1.4, §1.7, §7): every atom
quoted, two-space indent, comp-level description, `fields` ending in Footprint/Datasheet/
Description, Sheetname/Sheetfile properties, nets sorted by name in natural order, nodes by
reference and pin, `pinfunction` for named pins, auto names `Net-(D1-A)` (§2.3).
"""

from __future__ import annotations

import re
import uuid
from dataclasses import dataclass, field

# Library symbols: lib, part, description, keywords, pins as (number, name, type).
SYMBOLS: dict[str, tuple[str, str, str, str, tuple[tuple[str, str, str], ...]]] = {
    "LED": ("Device", "LED", "Light emitting diode", "LED diode",
            (("1", "K", "passive"), ("2", "A", "passive"))),
    "R": ("Device", "R", "Resistor", "R res resistor", (("1", "", "passive"), ("2", "", "passive"))),
    "C": ("Device", "C", "Unpolarized capacitor", "cap capacitor", (("1", "", "passive"), ("2", "", "passive"))),
    "D": ("Device", "D", "Diode", "diode", (("1", "K", "passive"), ("2", "A", "passive"))),
    "D_Zener": ("Device", "D_Zener", "Zener diode", "diode", (("1", "K", "passive"), ("2", "A", "passive"))),
    "Q_NPN_BEC": ("Device", "Q_NPN_BEC", "NPN transistor, base/emitter/collector", "transistor NPN",
                  (("1", "B", "input"), ("2", "E", "passive"), ("3", "C", "passive"))),
    "Q_NMOS_GSD": ("Device", "Q_NMOS_GSD", "N-MOSFET transistor, gate/source/drain", "transistor NMOS N-MOS N-MOSFET",
                   (("1", "G", "input"), ("2", "S", "passive"), ("3", "D", "passive"))),
    "Q_PMOS_GSD": ("Device", "Q_PMOS_GSD", "P-MOSFET transistor, gate/source/drain", "transistor PMOS P-MOS P-MOSFET",
                   (("1", "G", "input"), ("2", "S", "passive"), ("3", "D", "passive"))),
    # A house-library MOSFET whose pins carry numbers only: its roles rest on the package's usual order.
    "NMOS_SOT23": ("ledlint_demo", "NMOS_SOT23", "N-channel MOSFET (demo part)", "transistor NMOS",
                   (("1", "", "passive"), ("2", "", "passive"), ("3", "", "passive"))),
    "LED_RGBA": ("Device", "LED_RGBA", "RGB LED, red/green/blue/anode", "LED RGB diode",
                 (("1", "RK", "passive"), ("2", "GK", "passive"), ("3", "BK", "passive"), ("4", "A", "passive"))),
    "Conn_01x02": ("Connector_Generic", "Conn_01x02", "Generic connector, single row, 01x02", "connector",
                   (("1", "Pin_1", "passive"), ("2", "Pin_2", "passive"))),
    "D_Bridge_+-AA": ("Device", "D_Bridge_+-AA", "Diode bridge, +ve/-ve/AC/AC", "rectifier ACDC",
                      (("1", "+", "passive"), ("2", "-", "passive"), ("3", "~", "passive"), ("4", "~", "passive"))),
    "Conn_01x04": ("Connector_Generic", "Conn_01x04", "Generic connector, single row, 01x04", "connector",
                   (("1", "Pin_1", "passive"), ("2", "Pin_2", "passive"), ("3", "Pin_3", "passive"),
                    ("4", "Pin_4", "passive"))),
    # An invented 8-pin microcontroller for the sample boards: supply pins and four port pins.
    "MCU8": ("ledlint_demo", "MCU8", "8-pin microcontroller (demo part)", "MCU",
             (("1", "VDD", "power_in"), ("2", "PA0", "bidirectional"), ("3", "PA1", "bidirectional"),
              ("4", "PA2", "bidirectional"), ("5", "PA3", "bidirectional"), ("6", "PA4", "bidirectional"),
              ("7", "PA5", "bidirectional"), ("8", "VSS", "power_in"))),
    # The same with a backup-battery pin, which does not set the port pins' level.
    "MCU8B": ("ledlint_demo", "MCU8B", "8-pin microcontroller with battery backup (demo part)", "MCU",
              (("1", "VBAT", "power_in"), ("2", "PA0", "bidirectional"), ("3", "PA1", "bidirectional"),
               ("4", "VDD", "power_in"), ("5", "PA3", "bidirectional"), ("6", "PA4", "bidirectional"),
               ("7", "PA5", "bidirectional"), ("8", "VSS", "power_in"))),
    # An invented constant-current sink: one output, sense, supply and ground.
    "CCSINK": ("ledlint_demo", "CCSINK", "Linear LED current sink (demo part)", "LED driver",
               (("1", "VIN", "power_in"), ("2", "OUT", "passive"), ("3", "CS", "input"),
                ("4", "GND", "power_in"))),
}


@dataclass
class Part:
    ref: str
    symbol: str
    value: str
    footprint: str
    pins: dict[str, str]  # pin number -> net name
    fields: dict[str, str] = field(default_factory=dict)
    sheet: str = "/"
    dnp: bool = False


@dataclass
class Board:
    """An invented board: parts with their pin-to-net connections."""

    name: str
    title: str
    parts: list[Part] = field(default_factory=list)

    def add(self, ref: str, symbol: str, value: str, footprint: str, pins: dict[str, str],
            **fields: str) -> Part:
        part = Part(ref, symbol, value, footprint, pins, dict(fields))
        self.parts.append(part)
        return part

    def led(self, ref: str, value: str, anode: str, cathode: str,
            footprint: str = "LED_SMD:LED_0603_1608Metric", **fields: str) -> Part:
        return self.add(ref, "LED", value, footprint, {"2": anode, "1": cathode}, **fields)

    def resistor(self, ref: str, value: str, a: str, b: str,
                 footprint: str = "Resistor_SMD:R_0603_1608Metric", **fields: str) -> Part:
        return self.add(ref, "R", value, footprint, {"1": a, "2": b}, **fields)

    def text(self) -> str:
        return _Writer(self).render()


def auto_net(ref: str, pin_name: str, number: str) -> str:
    """KiCad 7+ default net name for a net driven by one pin (§2.3)."""
    return f"Net-({ref}-{pin_name})" if pin_name else f"Net-({ref}-Pad{number})"


def _q(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def _natural(text: str) -> tuple:
    return tuple(int(p) if p.isdigit() else p for p in re.split(r"(\d+)", text))


class _Writer:
    def __init__(self, board: Board) -> None:
        self.board = board

    def _uuid(self, ref: str) -> str:
        return str(uuid.uuid5(uuid.NAMESPACE_URL, f"ledlint-demo/{self.board.name}/{ref}"))

    def render(self) -> str:
        b = self.board
        out = [
            '(export (version "E")',
            "  (design",
            f'    (source {_q("/home/demo/" + b.name + "/" + b.name + ".kicad_sch")})',
            '    (date "2026-11-20T10:00:00+0000")',
            '    (tool "Eeschema 8.0.6")',
            '    (sheet (number "1") (name "/") (tstamps "/")',
            "      (title_block",
            f"        (title {_q(b.title)})",
            "        (company)",
            '        (rev "A")',
            "        (date)",
            f"        (source {_q(b.name + '.kicad_sch')})",
            *[f'        (comment (number "{i}") (value ""))' for i in range(1, 10)],
        ]
        out[-1] += ")))"  # closes title_block, sheet and design
        out.append("  (components")
        for part in sorted(b.parts, key=lambda p: _natural(p.ref)):
            out.extend(self._comp(part))
        out[-1] += ")"
        out.append("  (libparts")
        used = sorted({p.symbol for p in b.parts})
        for sym in used:
            out.extend(self._libpart(sym))
        out[-1] += ")"
        libs = sorted({SYMBOLS[s][0] for s in used})
        out.append("  (libraries")
        for lib in libs:
            out.append(f"    (library (logical {_q(lib)})")
            out.append(f'      (uri {_q("/usr/share/kicad/symbols/" + lib + ".kicad_sym")}))')
        out[-1] += ")"
        out.append("  (nets")
        out.extend(self._nets())
        out[-1] += "))"
        return "\n".join(out)  # KiCad ends the file at the last ")", no newline

    def _comp(self, part: Part) -> list[str]:
        lib, sym, desc, keywords, _ = SYMBOLS[part.symbol]
        lines = [
            f"    (comp (ref {_q(part.ref)})",
            f"      (value {_q(part.value)})",
            f"      (footprint {_q(part.footprint)})",
            '      (datasheet "~")',
            f"      (description {_q(desc)})",
            "      (fields",
        ]
        for name, text in part.fields.items():
            lines.append(f"        (field (name {_q(name)}) {_q(text)})")
        lines += [
            f'        (field (name "Footprint") {_q(part.footprint)})',
            '        (field (name "Datasheet") "~")',
            f'        (field (name "Description") {_q(desc)}))',
            f"      (libsource (lib {_q(lib)}) (part {_q(sym)}) (description {_q(desc)}))",
        ]
        for name, text in part.fields.items():
            lines.append(f"      (property (name {_q(name)}) (value {_q(text)}))")
        lines += [
            '      (property (name "Sheetname") (value "Root"))',
            f'      (property (name "Sheetfile") (value {_q(self.board.name + ".kicad_sch")}))',
            f"      (property (name \"ki_keywords\") (value {_q(keywords)}))",
        ]
        if part.dnp:
            lines.append('      (property (name "dnp"))')
        lines += [
            f'      (sheetpath (names {_q(part.sheet)}) (tstamps "/"))',
            f"      (tstamps {_q(self._uuid(part.ref))}))",
        ]
        return lines

    def _libpart(self, symbol: str) -> list[str]:
        lib, sym, desc, _, pins = SYMBOLS[symbol]
        lines = [
            f"    (libpart (lib {_q(lib)}) (part {_q(sym)})",
            f"      (description {_q(desc)})",
            '      (docs "~")',
            "      (fields",
            '        (field (name "Reference") "X")',
            f'        (field (name "Value") {_q(sym)})',
            '        (field (name "Footprint"))',
            '        (field (name "Datasheet") "~")',
            f'        (field (name "Description") {_q(desc)}))',
            "      (pins",
        ]
        for number, name, ptype in pins:
            lines.append(f"        (pin (num {_q(number)}) (name {_q(name)}) (type {_q(ptype)}))")
        lines[-1] += "))"
        return lines

    def _nets(self) -> list[str]:
        members: dict[str, list[tuple[str, str, str, str]]] = {}
        for part in self.board.parts:
            pins = {num: (name, ptype) for num, name, ptype in SYMBOLS[part.symbol][4]}
            for number, net in part.pins.items():
                name, ptype = pins[number]
                members.setdefault(net, []).append((part.ref, number, name, ptype))
        lines = []
        for code, net in enumerate(sorted(members, key=_natural), start=1):
            lines.append(f'    (net (code "{code}") (name {_q(net)}) (class "Default")')
            nodes = sorted(members[net], key=lambda n: (n[0], n[1]))
            for i, (ref, number, name, ptype) in enumerate(nodes):
                func = f" (pinfunction {_q(name)})" if name else ""
                end = ")" if i == len(nodes) - 1 else ""
                lines.append(f'      (node (ref {_q(ref)}) (pin {_q(number)}){func} (pintype {_q(ptype)})){end}')
        return lines
