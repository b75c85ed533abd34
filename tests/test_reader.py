"""The reader turns every generation of KiCad netlist into the same model."""

from __future__ import annotations

import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from paths import CORPUS, FIXTURES, SAMPLES
from ledlint.errors import InputError
from ledlint.netlist.model import PinType
from ledlint.netlist.kicad_net import decode, parse_netlist, read_netlist


def test_kicad5_bare_atoms_libpart_names_and_duplicates() -> None:
    n = read_netlist(FIXTURES / "kicad5-minimal.net")
    assert n.version == "D" and n.tool == "Eeschema (5.1.5)-3"
    assert n.source == "C:\\work\\demo\\lamp\\lamp.sch"  # bare atom: backslashes literal (§2.2)
    d1 = n.component("D1")
    # v5 nodes carry only ref and pin; names and types come from libparts (§3.1).
    assert {(p.number, p.name, p.type) for p in d1.pins} == {("1", "K", PinType.PASSIVE), ("2", "A", PinType.PASSIVE)}
    assert d1.fields == {"Vf": "2.0V@20mA", "Description": "LED RED 0805"}  # v5 user fields
    # The alias 74HC125 resolves to libpart 74LS125; old type spellings are normalised (§3.3).
    u1 = n.component("U1")
    assert u1.value == ""  # '~' is KiCad's empty marker (§6.11)
    assert u1.pin("3").type is PinType.TRI_STATE and u1.pin("5").type is PinType.BIDIRECTIONAL
    assert u1.pin("1").name == ""  # pin name '~' means unnamed
    # v5 repeats (ref, pin) once per unit; nets are de-duplicated, '#' refs dropped (§1.7, §4).
    gnd = n.net("GND")
    assert [(p.ref, p.number) for p in gnd.pins] == [("D1", "1"), ("U1", "7")]
    assert n.net("/LED[0]") is not None and n.net("/a;b") is not None
    assert n.component("R1").dnp  # KiCad 5 convention: a user field DNP = yes
    assert not n.component("R2").dnp
    assert n.component("D1").line == 18 and gnd.line == 84  # grep -n in the fixture


def test_kicad10_layout_and_name_number_pin_functions() -> None:
    n = read_netlist(FIXTURES / "kicad10-minimal.net")
    d1 = n.component("D1")
    assert {p.number: p.name for p in d1.pins} == {"1": "K", "2": "A"}  # "K_1" -> "K" (§3.2)
    u1 = n.component("U1")
    assert u1.pin("13").name == "GND" and u1.pin("8").name == "P1.12_D7_RX"
    assert u1.pin("19").name == ""  # an unnamed pin is written as its number alone
    assert u1.pin("8").type is PinType.OUTPUT and u1.pin("8").no_connect
    assert d1.dnp and d1.exclude_from_bom
    assert "dnp" in d1.properties and "dnp" not in d1.fields
    assert d1.fields == {}  # Footprint/Datasheet/Description repeats are KiCad's own (§1.4)
    assert n.net("unconnected-(U2-SCL{slash}SPI_SLK-Pad19)") is not None  # name kept as written
    assert n.net("GND").netclass == "Default"
    assert d1.line == 14


def test_kicad8_sample_board_user_fields_and_properties() -> None:
    n = read_netlist(SAMPLES / "bench-supply-status.net")
    d1 = n.component("D1")
    assert d1.fields == {"Vf": "2.1V@20mA", "If_max": "25mA"}
    assert d1.field("vf") == "2.1V@20mA"  # field names match without regard to case
    assert set(d1.properties) == {"Sheetname", "Sheetfile", "ki_keywords"}
    assert d1.description == "Light emitting diode" and d1.lib == "Device" and d1.part == "LED"


def test_kicad6_real_file_with_crlf_escapes_and_overbar_markup(corpus) -> None:
    n = read_netlist(CORPUS / "mains-led-lamp-strings.net")
    assert n.version == "E" and n.tool == "Eeschema (6.0.1)"
    assert "\\" in n.source and "\\\\" not in n.source  # "\\" escapes resolved (§6.10)
    assert all(c.sheet == "/" for c in n.components)


def test_hierarchical_sheets_and_quote_escapes(corpus) -> None:
    n = read_netlist(CORPUS / "sdr-transceiver-mainboard.net")
    assert len(n.sheets) == 4
    assert any(net.name.startswith("/mcu/usb/power/") for net in n.nets)
    assert any('"' in v for c in n.components for v in c.fields.values())  # \" inside field text


def test_utf8_bom_is_stripped_and_bad_bytes_are_noted() -> None:
    text, notes = decode(b"\xef\xbb\xbf(export (version E))")
    assert text.startswith("(export") and notes == []
    text, notes = decode(b'(export (version "E")\n  (design (date "\xff")))')
    assert "\ufffd" in text and notes[0].line == 2 and "0xFF" in notes[0].message


@pytest.mark.parametrize(
    ("data", "words"),
    [
        (b"\x7fELF\x00\x01\x02", "binary"),
        (b"\xff\xfe(\x00e\x00", "binary"),
        (b"\x89PNG\r\n\x1a\n", "not a text file"),
        (b"(kicad_pcb (version 20221018))", "board file"),
        (b"(kicad_sch (version 20231120))", "schematic file"),
        (b"(design (source x))", "expected '(export'"),
        (b'{"findings": []}', "JSON"),
        (b"(export (version E) (components (comp (value x))))", "without a reference"),
    ],
)
def test_non_netlists_get_a_clear_error(tmp_path, data: bytes, words: str) -> None:
    f = tmp_path / "bad.net"
    f.write_bytes(data)
    with pytest.raises(InputError) as info:
        read_netlist(f)
    assert words in info.value.message and info.value.path == str(f) and info.value.line >= 1


def test_missing_file_and_folder(tmp_path) -> None:
    with pytest.raises(InputError, match="no such file"):
        read_netlist(tmp_path / "nope.net")
    with pytest.raises(InputError, match="folder"):
        read_netlist(tmp_path)


def test_truncated_real_file_points_at_the_end(corpus) -> None:
    text = (CORPUS / "tiny-fpga-board.net").read_text(encoding="utf-8")
    cut = text[: len(text) // 2]
    with pytest.raises(InputError) as info:
        parse_netlist(cut, "cut.net")
    assert "end of file" in info.value.message
    assert info.value.line == cut.count("\n") + 1


def test_pin_on_two_nets_is_noted_not_fatal() -> None:
    n = parse_netlist('(export (version "E") (components (comp (ref "R1") (value "1k")))'
                      ' (nets (net (code "1") (name "A") (node (ref "R1") (pin "1")))'
                      ' (net (code "2") (name "B") (node (ref "R1") (pin "1")))))')
    assert n.component("R1").pin("1").net == "A"
    assert any("two nets" in note.message for note in n.notes)


def test_a_net_without_a_name_gets_one_a_report_can_show() -> None:
    # KiCad names every net (kicad-netlist-format.md); a hand-edited file may leave one empty.
    n = parse_netlist('(export (version "E") (components (comp (ref "R1") (value "1k")))'
                      ' (nets (net (code "7") (name "") (node (ref "R1") (pin "1")))))')
    assert n.component("R1").pin("1").net == "(unnamed net 7)"
    assert [note.message for note in n.notes] == ["a net without a name; reported as (unnamed net 7)"]


def test_a_2013_export_names_its_unnamed_nets_as_later_kicad_does() -> None:
    # KiCad's 2013 releases (version D) wrote (name "") for every unlabelled net, told apart by
    # code (corpus MANIFEST, bench-supply kit); KiCad 5 and 6 name such a net Net-(REF-PadN)
    # after a pin on it (kicad-netlist-format.md, net-name shapes). That is no fault of the file.
    n = parse_netlist("(export (version D) (components (comp (ref R1) (value 1k)) (comp (ref D1) (value LED)))"
                      ' (nets (net (code 1) (name "") (node (ref R1) (pin 2)) (node (ref D1) (pin 2)))'
                      ' (net (code 2) (name "") (node (ref R1) (pin 1)))))')
    assert n.component("D1").pin("2").net == "Net-(R1-Pad2)"
    assert n.component("R1").pin("1").net == "Net-(R1-Pad1)"
    assert n.notes == ()


def test_kicad10_pin_functions_are_known_without_the_tool_line() -> None:
    # KiCad 10 writes pinfunction as name_number (kicad-netlist-format.md §3.2); a file that lost
    # its tool line, or a nightly's, shows it by every named pin carrying its number.
    n = parse_netlist('(export (version "E") (components (comp (ref "D1") (value "red")) (comp (ref "U1") (value "M")))'
                      ' (nets (net (code "1") (name "A") (node (ref "D1") (pin "2") (pinfunction "A_2")))'
                      ' (net (code "2") (name "B") (node (ref "D1") (pin "1") (pinfunction "K_1"))'
                      ' (node (ref "U1") (pin "3") (pinfunction "PA0_3")) (node (ref "U1") (pin "4") (pinfunction "4")))))')
    assert {p.number: p.name for p in n.component("D1").pins} == {"1": "K", "2": "A"}
    assert {p.number: p.name for p in n.component("U1").pins} == {"3": "PA0", "4": ""}


def test_unknown_version_and_unknown_sections_are_tolerated() -> None:
    # (A netlist with no components and no nets is an error of its own: see test_hostile.py.)
    n = parse_netlist('(export (version "F") (future (x)) (components (comp (ref "R1") (value "1k"))) (nets))')
    assert [c.ref for c in n.components] == ["R1"] and "unknown netlist version" in n.notes[0].message


def _mutations(text: str, rng: random.Random) -> str:
    ops = ["delete", "insert", "swap", "cut"]
    chars = list(text)
    for _ in range(rng.randint(1, 6)):
        op = rng.choice(ops)
        i = rng.randrange(len(chars)) if chars else 0
        if op == "delete" and chars:
            del chars[i]
        elif op == "insert":
            chars.insert(i, rng.choice('()"\\ \n\tx~#;\x00é'))
        elif op == "swap" and len(chars) > 1:
            j = rng.randrange(len(chars))
            chars[i], chars[j] = chars[j], chars[i]
        elif op == "cut":
            chars = chars[:i]
    return "".join(chars)


_SEEDS = [(FIXTURES / "kicad5-minimal.net").read_text(), (FIXTURES / "kicad10-minimal.net").read_text(),
          (SAMPLES / "bench-supply-status.net").read_text()]


@settings(max_examples=400, deadline=None)
@given(st.integers(0, 2), st.randoms(use_true_random=False))
def test_mutated_netlists_only_raise_the_readers_error(which: int, rng: random.Random) -> None:
    text = _mutations(_SEEDS[which], rng)
    try:
        parse_netlist(text, "mutated.net")
    except InputError:
        pass


_atom = st.sampled_from(['"R1"', "R1", '"1"', "1", '""', "~", '"Net-(D1-A)"', "GND", '"K_1"', "x"])
_head = st.sampled_from(["export", "version", "components", "comp", "ref", "value", "fields", "field", "name",
                         "libsource", "part", "property", "nets", "net", "node", "pin", "pinfunction", "pintype",
                         "code", "libparts", "libpart", "pins", "num", "type", "sheetpath", "names", "design",
                         "sheet", "aliases", "alias"])
_tree = st.recursive(_atom, lambda kids: st.tuples(_head, st.lists(kids, max_size=4)).map(
    lambda t: "(" + t[0] + " " + " ".join(t[1]) + ")"), max_leaves=30)


@settings(max_examples=400, deadline=None)
@given(st.lists(_tree, max_size=5))
def test_random_netlist_shaped_trees_only_raise_the_readers_error(parts: list[str]) -> None:
    try:
        parse_netlist('(export (version "E") ' + " ".join(parts) + ")", "random.net")
    except InputError:
        pass


def test_old_mac_line_endings_still_give_line_numbers() -> None:
    # A lone CR ends a line (the classic Mac convention, as editors count it).
    text = '(export (version "E")\r  (components\r    (comp (ref "R1") (value "1k))))\r'
    with pytest.raises(InputError) as info:
        parse_netlist(text, "cr.net")
    assert info.value.line == 3


def test_a_release_that_names_itself_keeps_pin_names_that_end_in_their_number() -> None:
    # KiCad 7.0.5 exported a connector whose pins are named Pin_1..Pin_3 (KiCad's own QA netlist
    # bus_connection.net); only KiCad 10 writes name_number, so a 7.0 tool line rules that out
    # (kicad-netlist-format.md §3.2).
    n = parse_netlist('(export (version "E") (design (tool "Eeschema 7.0.5-1-g5c5f077a4a-dirty"))'
                      ' (components (comp (ref "J1") (value "Conn_01x03")))'
                      ' (nets (net (code "1") (name "/top.x") (node (ref "J1") (pin "1") (pinfunction "Pin_1")))'
                      ' (net (code "2") (name "/top.y") (node (ref "J1") (pin "2") (pinfunction "Pin_2")))'
                      ' (net (code "3") (name "/top.z") (node (ref "J1") (pin "3") (pinfunction "Pin_3")))))')
    assert [p.name for p in n.component("J1").pins] == ["Pin_1", "Pin_2", "Pin_3"]
