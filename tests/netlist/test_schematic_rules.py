"""Connectivity rules the corpus does not exercise, on small hand-drawn schematics.

Each fixture in tests/fixtures/schematic/ was drawn for one rule, coordinates chosen by hand
on KiCad's 1.27 mm grid; every expected net below follows from the rule named beside it, not
from the reader's output. Sources: KiCad Schematic Editor manual (docs.kicad.org), chapter
"Schematic Creation and Editing" (sections on wires and junctions, labels, buses, power
symbols) and chapter "Hierarchical Schematics"; the file format at dev-docs.kicad.org,
"Schematic File Format"; kicad-netlist-format.md for the names KiCad generates.
"""

from __future__ import annotations

from pathlib import Path

from paths import SCHEMATIC_FIXTURES
from ledlint.netlist.kicad_sch import read_schematic
from ledlint.netlist.model import Netlist, PinType


def _nets(n: Netlist) -> dict[str, set[tuple[str, str]]]:
    return {net.name: {(p.ref, p.number) for p in net.pins} for net in n.nets}


def _read(name: str) -> Netlist:
    return read_schematic(SCHEMATIC_FIXTURES / name)


def test_rotated_and_mirrored_symbols_put_their_pins_where_the_format_says() -> None:
    # File format, "Symbol Section": (at X Y ANGLE) rotates the library drawing (whose y axis
    # points up) counterclockwise on the sheet, (mirror x|y) then flips it about that axis.
    # The LED's K (pin 1) is drawn at (-3.81, 0) and A (pin 2) at (3.81, 0); a label was put
    # on each pin end as those rules place it, so every label must meet exactly one pin.
    nets = _nets(_read("orientation.kicad_sch"))
    assert nets == {
        "/A0": {("D1", "2")}, "/K0": {("D1", "1")},  # 0°: A right, K left
        "/A90": {("D2", "2")}, "/K90": {("D2", "1")},  # 90°: A up (y - 3.81)
        "/A180": {("D3", "2")}, "/K180": {("D3", "1")},  # 180°: A left
        "/A270": {("D4", "2")}, "/K270": {("D4", "1")},  # 270°: A down
        "/AMY": {("D5", "2")}, "/KMY": {("D5", "1")},  # mirror y: A left
        "/A90MX": {("D6", "2")}, "/K90MX": {("D6", "1")},  # 90° then mirror x: A down
        "/R1TOP": {("R1", "1")}, "/R1BOTTOM": {("R1", "2")},  # R pin 1 drawn at (0, 3.81): top
    }


def test_units_of_one_symbol_merge_into_one_component() -> None:
    # Manual, "Symbols with multiple units": units share a reference and form one part. The
    # netlist takes each field from the lowest unit that fills it (kicad-netlist-format.md
    # §3.4), so Vf, set only on unit B, reaches the component. Unit B's open cathode gets
    # KiCad 7's unconnected name with the unit letter and the pad (§2.3 table).
    n = _read("multi_unit.kicad_sch")
    d1 = n.component("D1")
    assert d1 is not None and [c.ref for c in n.components].count("D1") == 1
    assert [(p.number, p.name, p.net) for p in d1.pins] == [
        ("1", "K", "GND"), ("2", "A", "/RED"), ("3", "K", "unconnected-(D1B-K-Pad3)"), ("4", "A", "/GREEN")]
    assert d1.fields == {"Vf": "2.1V@20mA"}
    assert _nets(n)["/RED"] == {("D1", "2"), ("R1", "1")} and _nets(n)["+5V"] == {("R1", "2")}


def test_a_solder_jumper_and_a_zero_ohm_link_are_parts_not_shorts() -> None:
    # A schematic joins pins only by wires and labels; an open solder jumper and a 0 Ω resistor
    # are parts whose two pins sit on two nets. Unlabelled nets take a pin's generated name,
    # a named pin's (JP1-A) before a numbered pad's (R1-Pad2) (kicad-netlist-format.md §2.3).
    n = _read("jumper_link.kicad_sch")
    assert _nets(n) == {
        "+5V": {("R1", "1")}, "Net-(JP1-A)": {("R1", "2"), ("JP1", "1")},
        "Net-(JP1-B)": {("JP1", "2"), ("R2", "1")}, "Net-(D1-A)": {("R2", "2"), ("D1", "2")},
        "GND": {("D1", "1")},
    }
    jp1, r2 = n.component("JP1"), n.component("R2")
    assert jp1 is not None and jp1.part == "SolderJumper_2_Open" and jp1.lib == "Jumper"
    assert jp1.exclude_from_bom and jp1.exclude_from_sim and not jp1.exclude_from_board
    assert r2 is not None and r2.value == "0"


def test_dnp_and_exclusion_flags_reach_the_model() -> None:
    # File format, "Symbol Section": (dnp yes), (in_bom no), (on_board no),
    # (exclude_from_sim yes). KiCad 5 designs marked DNP in the value (kicad-netlist-format.md §5).
    n = _read("flags.kicad_sch")
    flags = {c.ref: (c.dnp, c.exclude_from_bom, c.exclude_from_board, c.exclude_from_sim) for c in n.components}
    assert flags == {"D1": (True, False, False, False), "D2": (True, False, False, False),
                     "R1": (False, True, False, False), "R2": (False, False, True, False),
                     "R3": (False, False, False, True)}
    d1 = n.component("D1")
    assert d1 is not None and "dnp" in d1.properties


def test_bus_members_join_by_label_and_bus_entries_join_nothing() -> None:
    # Manual, "Buses": a bus LED[0..1] carries LED0 and LED1; a wire joins a member by its
    # label, and wire-to-bus entries "are only graphical and do not create a connection".
    # R1's wire carries LED0 on its middle; R2's has only an entry; R3 is labelled LED0
    # elsewhere on the sheet; R4 LED1.
    nets = _nets(_read("bus_entries.kicad_sch"))
    assert nets["/LED0"] == {("R1", "1"), ("R3", "1")}
    assert nets["/LED1"] == {("R4", "1")}
    assert nets["unconnected-(R2-Pad1)"] == {("R2", "1")}  # one pin alone (§2.3)


def test_crossing_wires_join_only_at_a_junction() -> None:
    # Manual, wires and junctions: two wires that cross are not connected unless a junction
    # marks the crossing; a wire ending on another wire's middle joins it through a junction
    # (docs.kicad.org kicad-python "Schematic": connection points "must exactly match in
    # position"; the junction is such a point on the other wire).
    nets = _nets(_read("junctions.kicad_sch"))
    assert nets["Net-(D1-A)"] == {("D1", "2"), ("D2", "1")}  # crossing, no junction
    assert nets["Net-(R1-Pad2)"] == {("R1", "2"), ("R2", "1")}
    assert nets["Net-(D3-A)"] == {("D3", "2"), ("D4", "1"), ("R3", "2"), ("R4", "1")}  # junction
    assert nets["Net-(D5-A)"] == {("D5", "2"), ("D6", "1"), ("R5", "2")}  # T with a junction
    assert nets["Net-(D7-A)"] == {("D7", "2"), ("D8", "1")}  # T without one: no connection
    assert nets["unconnected-(R7-Pad2)"] == {("R7", "2")}


def test_labels_attach_anywhere_on_a_wire_and_join_by_name() -> None:
    # Manual, "Labels": a label names the wire it is attached to, at its end or along it; a
    # label beside a wire names nothing; labels of one name on one sheet are one net; global
    # labels have no sheet path, and a local label of the same name on that sheet joins them.
    nets = _nets(_read("labels.kicad_sch"))
    assert nets["/MID"] == {("D1", "2")}
    assert nets["/END"] == {("D2", "2")}
    assert "/OFF" not in nets
    assert nets["/SIG"] == {("D3", "2"), ("D4", "2")}
    assert nets["EN"] == {("D5", "2"), ("D6", "2")}


def test_power_symbols_name_global_nets_by_value() -> None:
    # Manual, "Power symbols": power symbols of one name are one net on every sheet; from
    # KiCad 8 the net takes the symbol's value (kicad-symbols MR 4257), so a +5V symbol whose
    # value reads VLED is on VLED. A hidden power-input pin of an ordinary symbol joins the
    # global net of its pin name (kicad-netlist-format.md §4). Power symbols and flags are
    # not components.
    n = _read("power.kicad_sch")
    nets = _nets(n)
    assert nets["GND"] == {("D1", "1"), ("D2", "1"), ("U1", "4")}
    assert nets["+5V"] == {("R1", "1")} and nets["VLED"] == {("R2", "1")} and nets["VCC"] == {("U1", "3")}
    assert all(not c.ref.startswith("#") for c in n.components)


def test_no_connect_flags_and_no_connect_pins() -> None:
    # Manual, "No-connect flags"; the netlist marks a pin that sits alone on a net carrying
    # the flag (+no_connect, kicad-netlist-format.md §3.3). A pin of type no_connect gets the
    # unconnected name but no mark; an open pin on a named net is neither.
    n = _read("no_connect.kicad_sch")
    u1 = n.component("U1")
    assert u1 is not None
    pins = {p.number: p for p in u1.pins}
    assert pins["2"].net == "unconnected-(U1-OUT2-Pad2)" and pins["2"].no_connect
    assert pins["5"].net == "unconnected-(U1-NC-Pad5)" and not pins["5"].no_connect
    assert pins["5"].type is PinType.NO_CONNECT
    assert pins["1"].net == "Net-(D1-A)" and not pins["1"].no_connect  # named pins: first name wins


def test_sheet_pins_meet_hierarchical_labels_and_local_names_stay_on_their_sheet() -> None:
    # Manual, "Hierarchical Schematics": a sheet pin connects to the hierarchical label of
    # the same name inside the sheet; local labels connect only within their sheet, and a
    # local net's name carries its sheet path (/stage/NODE); global labels connect everywhere.
    n = _read("hierarchy/led_board.kicad_sch")
    assert _nets(n) == {
        "+5V": {("R1", "1")}, "GND": {("R4", "2")},
        "/stage/IN": {("R1", "2"), ("R10", "1")}, "/stage/OUT": {("D10", "1"), ("R4", "1")},
        "/stage/NODE": {("R10", "2"), ("D10", "2")}, "/NODE": {("R3", "1")},
        "EN": {("R2", "1"), ("D11", "2")},
        "unconnected-(D11-K-Pad1)": {("D11", "1")}, "unconnected-(R2-Pad2)": {("R2", "2")},
        "unconnected-(R3-Pad2)": {("R3", "2")},
    }
    d10 = n.component("D10")
    stage = SCHEMATIC_FIXTURES / "hierarchy" / "led_stage.kicad_sch"
    assert d10 is not None and d10.sheet == "/stage/" and Path(d10.file) == stage
    lines = stage.read_text(encoding="utf-8").splitlines()
    assert lines[d10.line - 1].startswith('  (symbol (lib_id "Device:LED") (at 74.93 50.8 180)')


def test_a_sheet_used_twice_has_references_per_instance() -> None:
    # File format, "Instance Path" and the symbol's instances: one sheet file, two sheet
    # instances (ch1, ch2), references from the path that names each instance; an entry for a
    # path that is no instance (R9) is ignored. Read through the project file, whose stem
    # names the root sheet.
    n = read_schematic(SCHEMATIC_FIXTURES / "multi_instance" / "dimmer.kicad_pro")
    assert {c.ref: c.sheet for c in n.components} == {"J1": "/", "R1": "/ch1/", "D1": "/ch1/", "R2": "/ch2/",
                                                     "D2": "/ch2/"}
    # The root's local labels outrank the sub-sheet's hierarchical label in naming (KiCad's
    # driver priority, CONNECTION_SUBGRAPH::PRIORITY: local label above hierarchical label).
    assert _nets(n) == {
        "/PWM1": {("J1", "1"), ("R1", "1")}, "/PWM2": {("J1", "2"), ("R2", "1")},
        "/ch1/A": {("R1", "2"), ("D1", "2")}, "/ch2/A": {("R2", "2"), ("D2", "2")},
        "GND": {("D1", "1"), ("D2", "1")},
    }
    assert [(s.number, s.name) for s in n.sheets] == [("1", "/"), ("2", "/ch1/"), ("3", "/ch2/")]
    assert n.path.endswith("dimmer.kicad_sch") and n.version == "E" and "20231120" in n.tool


def test_a_stacked_pin_stands_for_each_of_its_pads() -> None:
    # KiCad 10's stacked pin notation (string_utils.h, ExpandStackedPinNotation: "[1-4]" ->
    # 1, 2, 3, 4; "[AA1-AA3,AB4]" -> AA1, AA2, AA3, AB4): one drawn pin, one netlist node per
    # pad; an unconnected one is named after its lowest pad (KiCad's change that introduced it:
    # "Automatic net naming proceeds based on the smallest logical pin number in stacked groups").
    n = _read("stacked_pins.kicad_sch")
    u1 = n.component("U1")
    assert u1 is not None
    assert [(p.number, p.name, p.net) for p in u1.pins] == [
        ("1", "IN", "+5V"), ("2", "GND", "GND"), ("3", "OUT", "unconnected-(U1-OUT-Pad3)"),
        ("4", "GND", "GND"), ("5", "GND", "GND"), ("6", "OUT", "unconnected-(U1-OUT-Pad3)")]
