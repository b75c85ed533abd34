"""A connected design to the Netlist model, laid out as KiCad's netlist exporter lays it out.

Source: eeschema/netlist_exporters/netlist_exporter_xml.cpp.

* One component per reference; the units of a multi-unit symbol merge, each field taken from
  the lowest unit that fills it. Symbols whose reference starts with '#' (power symbols,
  flags) are not components.
* Components follow the sheets in page order, sorted by reference within a sheet; nets are
  sorted by name and their pins by reference and number, both in KiCad's order.
* A pin is marked no-connect (KiCad's `+no_connect`) when its net carries a no-connect flag and
  holds that one pin, or only pins stacked on one spot of one symbol.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from ledlint.frozen import FrozenMap
from ledlint.netlist.kicad_common import empty_marker, is_kicad_property, marked_dnp, natural
from ledlint.netlist.kicad_sch.connect import Nets, PinAt
from ledlint.netlist.kicad_sch.naming import stacked_numbers, unescape
from ledlint.netlist.kicad_sch.parse import LibPin, LibSymbol, PlacedSymbol
from ledlint.netlist.kicad_sch.read import Design, SheetInstance
from ledlint.netlist.model import Component, Net, Netlist, Note, Pin, PinType, Sheet

# KiCad's mandatory fields, which the model carries as attributes, not user fields.
_MANDATORY = frozenset({"Reference", "Value", "Footprint", "Datasheet", "Description"})


@dataclass(frozen=True, slots=True)
class _Unit:
    instance: int
    symbol: int
    unit: int


def _lib_part(sym: PlacedSymbol) -> tuple[str, str]:
    """Library and symbol name as the netlist's libsource gives them: from lib_id
    (`Device:LED` → Device, LED), or the schematic's own name when it keeps an edited copy."""
    if sym.lib_name:
        return "", sym.lib_name
    lib, colon, part = sym.lib_id.partition(":")
    return (lib, part) if colon else ("", sym.lib_id)


class _Assembler:
    def __init__(self, design: Design, nets: Nets) -> None:
        self.design = design
        self.nets = nets
        self.notes: list[Note] = []
        self.root_file = Path(design.root.path).name

    def sym(self, u: _Unit) -> PlacedSymbol:
        return self.design.instances[u.instance].file.symbols[u.symbol]

    def lib(self, u: _Unit) -> LibSymbol:
        return self.nets.libs[u.instance][u.symbol]

    def note(self, u: _Unit, message: str) -> None:
        sym = self.sym(u)
        path = self.design.instances[u.instance].file.path
        where = "" if path == self.design.root.path else f"{path}: "
        self.notes.append(Note(sym.line, sym.column, where + message))

    def units_by_ref(self) -> dict[str, list[_Unit]]:
        out: dict[str, list[_Unit]] = {}
        for i, inst in enumerate(self.design.instances):
            placed = [(p.ref, k) for k, p in enumerate(self.nets.placements[i])]
            for ref, k in sorted(placed, key=lambda rk: natural(rk[0])):
                if not ref or ref.startswith("#"):
                    continue
                out.setdefault(ref, []).append(_Unit(i, k, self.nets.placements[i][k].unit))
        return out

    def mandatory(self, units: list[_Unit]) -> dict[str, str]:
        """Value, footprint, datasheet and description: each the lowest unit's non-empty text
        (the exporter's rule); KiCad 6's per-instance value and footprint come first."""
        out: dict[str, str] = {}
        for u in units:
            place = self.nets.placements[u.instance][u.symbol]
            own = dict(self.sym(u).properties)
            texts = {"Value": place.value or own.get("Value", ""),
                     "Footprint": place.footprint or own.get("Footprint", ""),
                     "Datasheet": own.get("Datasheet", ""), "Description": own.get("Description", "")}
            for name, text in texts.items():
                text = empty_marker(text) if name in ("Value", "Datasheet") else text
                if text and name not in out:
                    out[name] = unescape(text)
        return out

    def component(self, ref: str, units: list[_Unit], flagged: set[tuple[str, str]]) -> Component:
        units = sorted(units, key=lambda x: x.unit)
        sym, lib, inst = self.sym(units[0]), self.lib(units[0]), self.design.instances[units[0].instance]
        fields: dict[str, str] = {}
        for u in units:
            for name, text in self.sym(u).properties:
                if name not in _MANDATORY and not is_kicad_property(name):
                    fields.setdefault(name, unescape(text))
        for name, text in inst.record.properties if inst.record is not None else ():
            fields.setdefault(name, text)  # a sheet's own fields reach every part in it (§1.4)
        properties = {"Sheetname": inst.record.name if inst.record is not None else "",
                      "Sheetfile": inst.record.file if inst.record is not None else self.root_file}
        for key in ("ki_keywords", "ki_fp_filters"):
            if lib.prop(key):
                properties[key] = lib.prop(key)
        flags = self.flags(units, inst)
        properties.update({name: "" for name, on in flags.items() if on})
        texts = self.mandatory(units)
        value = texts.get("Value", "")
        description = texts.get("Description") or lib.prop("Description") or lib.prop("ki_description")
        lib_name, part = _lib_part(sym)
        return Component(
            ref=ref, value=value, footprint=texts.get("Footprint", ""), datasheet=texts.get("Datasheet", ""),
            description=description, lib=lib_name, part=part, fields=FrozenMap(fields),
            properties=FrozenMap(properties), dnp=flags["dnp"] or marked_dnp(value, fields),
            exclude_from_bom=flags["exclude_from_bom"], sheet=inst.names, line=sym.line,
            pins=self.pins(ref, units, flagged), file=inst.file.path, exclude_from_board=flags["exclude_from_board"],
            exclude_from_sim=flags["exclude_from_sim"],
        )

    def flags(self, units: list[_Unit], inst: SheetInstance) -> dict[str, bool]:
        syms = [self.sym(u) for u in units]
        sim_off = any(s.flag("exclude_from_sim", False) or s.prop("Sim.Enable") == "0" for s in syms)
        return {
            "dnp": any(s.flag("dnp", False) for s in syms) or inst.flags.get("dnp", False),
            "exclude_from_bom": not all(s.flag("in_bom", True) for s in syms) or not inst.flags.get("in_bom", True),
            "exclude_from_board": not all(s.flag("on_board", True) for s in syms)
            or not inst.flags.get("on_board", True),
            "exclude_from_sim": sim_off or inst.flags.get("exclude_from_sim", False),
        }

    def pins(self, ref: str, units: list[_Unit], flagged: set[tuple[str, str]]) -> tuple[Pin, ...]:
        """Every pad of the symbol, placed units or not, KiCad 10's stacked pins one per pad."""
        lib = self.lib(units[0])
        numbers: dict[str, LibPin] = {}
        for pin in lib.pins:
            numbers.setdefault(pin.number, pin)
        alternates = [dict(self.sym(u).alternates) for u in units]
        out = []
        for number, drawn in numbers.items():
            name, ptype, net = drawn.name, drawn.type, None
            for u, chosen in zip(units, alternates):
                key = PinAt(u.instance, u.symbol, number)
                found = self.nets.pin_net.get(key)
                if found is None:
                    continue
                if net is not None and found != net:
                    self.note(u, f"pin {ref}.{number} is on two nets, {net!r} and {found!r}; kept on {net!r}")
                    continue
                net = found
                placed = self.nets.placed[key].pin
                alternate = chosen.get(number, "")
                alt_type = dict(placed.alternates).get(alternate) if alternate else None
                name, ptype = (alternate, alt_type) if alternate and alt_type else (placed.name, placed.type)
            kind = PinType.from_text(ptype)
            out += [Pin(ref, pad, name, kind, net, (ref, number) in flagged) for pad in stacked_numbers(number)]
        return tuple(sorted(out, key=lambda p: natural(p.number)))

    def no_connect_pins(self) -> set[tuple[str, str]]:
        """(ref, number) of pins alone, or stacked alone, on a net with a no-connect flag."""
        members: dict[str, list[PinAt]] = {}
        for key, net in self.nets.pin_net.items():
            if net in self.nets.no_connect:
                members.setdefault(net, []).append(key)
        out: set[tuple[str, str]] = set()
        for keys in members.values():
            first = self.nets.placed[keys[0]]
            stacked = all(k.instance == keys[0].instance and k.symbol == keys[0].symbol
                          and self.nets.placed[k].at == first.at and self.nets.placed[k].pin.name == first.pin.name
                          for k in keys)
            if stacked:
                out.update((self.nets.placements[k.instance][k.symbol].ref, k.number) for k in keys)
        return out

    def build(self, tool: str) -> Netlist:
        flagged = self.no_connect_pins()
        components = [self.component(ref, units, flagged) for ref, units in self.units_by_ref().items()]
        by_net: dict[str, list[Pin]] = {}
        for c in components:
            for p in c.pins:
                if p.net is not None:
                    by_net.setdefault(p.net, []).append(p)
        names = sorted(by_net, key=natural)
        nets = tuple(Net(str(n + 1), name, "", tuple(sorted(by_net[name], key=lambda p: (p.ref, p.number))))
                     for n, name in enumerate(names))
        for key in self.nets.bus_pins:
            self.note(_Unit(key.instance, key.symbol, 0), f"pin {key.number} sits on a bus, not a wire; it is on no net")
        notes = [n for path, found in self.design.notes.items() for n in _located(path, self.design.root.path, found)]
        sheets = tuple(Sheet(str(n + 1), inst.names, inst.tstamps) for n, inst in enumerate(self.design.instances))
        root = self.design.root
        return Netlist(path=root.path, version="E", tool=tool, source=root.path, sheets=sheets,
                       components=tuple(components), nets=nets, notes=tuple(notes + self.notes))


def _located(path: str, root: str, notes: list[Note]) -> list[Note]:
    return notes if path == root else [Note(n.line, n.column, f"{path}: {n.message}") for n in notes]


def assemble(design: Design, nets: Nets) -> Netlist:
    """The Netlist of a connected design."""
    root = design.root
    generator = "Eeschema" if root.generator == "eeschema" else root.generator or "unknown writer"
    version = f" {root.generator_version}" if root.generator_version else ""
    return _Assembler(design, nets).build(f"{generator}{version} schematic (version {root.version})")
