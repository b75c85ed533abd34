"""KiCad's XML netlist reads into the same model as the s-expression netlist it mirrors.

The fixtures in tests/fixtures/xml/ are s-expression netlists rewritten by hand in KiCad's XML
layout (eeschema/netlist_exporters/netlist_exporter_xml.cpp: attributes where the .net writes
`(name value)`, elements for the other lists, text for trailing atoms): legacy_power.xml from
the corpus's legacy_power.net (KiCad 6.0.10), kicad5-minimal.xml from the project's KiCad 5
fixture. Each is checked against the project's .net reader on its source.
"""

from __future__ import annotations

import random
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from paths import FIXTURES, SCHEMATICS
from ledlint.errors import InputError
from ledlint.netlist.kicad_net import read_netlist
from ledlint.netlist.kicad_xml import parse_xml_netlist, read_xml_netlist
from ledlint.netlist.model import Netlist

XML = FIXTURES / "xml"


def _content(n: Netlist) -> tuple[object, ...]:
    """Everything the model holds but source line numbers."""
    comps = tuple((c.ref, c.value, c.footprint, c.datasheet, c.description, c.lib, c.part, dict(c.fields),
                   dict(c.properties), c.dnp, c.exclude_from_bom, c.exclude_from_board, c.sheet,
                   tuple((p.number, p.name, p.type, p.net, p.no_connect) for p in c.pins)) for c in n.components)
    nets = tuple((net.code, net.name, net.netclass, tuple((p.ref, p.number) for p in net.pins)) for net in n.nets)
    return n.version, n.tool, n.source, n.date, n.sheets, comps, nets, tuple(x.message for x in n.notes)


def test_kicad6_xml_reads_as_its_netlist() -> None:
    source = SCHEMATICS / "kicad-qa" / "legacy_power" / "legacy_power.net"
    if not source.is_file():
        pytest.skip(f"schematic corpus not found at {SCHEMATICS}")
    assert _content(read_xml_netlist(XML / "legacy_power.xml")) == _content(read_netlist(source))


def test_kicad5_xml_reads_as_its_netlist() -> None:
    # Version D: no pin functions or types on nodes, names from libparts and an alias,
    # nodes repeated once per unit, a '#' power node, a value-less DNP field (kicad-netlist-format.md §1.7, §3, §5).
    xml = read_xml_netlist(XML / "kicad5-minimal.xml")
    assert _content(xml) == _content(read_netlist(FIXTURES / "kicad5-minimal.net"))
    assert xml.component("R1").dnp and xml.source == "C:\\work\\demo\\lamp\\lamp.sch"


def test_xml_keeps_what_the_netlist_for_the_board_leaves_out() -> None:
    # netlist_exporter_xml.cpp: without GNL_OPT_KICAD a part excluded from the board stays,
    # with an exclude_from_board property; recent releases unescape net names in XML, so a '/'
    # typed in a label reads as '/' (kicad-netlist-format.md §2.3); the net class is an attribute.
    n = read_xml_netlist(XML / "kicad9-panel.xml")
    r1, d1, u1 = n.component("R1"), n.component("D1"), n.component("U1")
    assert r1 is not None and r1.exclude_from_board and r1.exclude_from_sim and r1.sheet == "/status leds/"
    assert d1 is not None and d1.dnp and d1.fields == {"Vf": "2.0V@20mA"} and d1.description == "Light emitting diode"
    assert u1 is not None and u1.exclude_from_bom
    assert n.net("/status leds/DRIVE/SENSE") is not None and n.net("+12V").netclass == "Power"
    plus = u1.pin("5")
    assert plus is not None and plus.no_connect and plus.net == "unconnected-(U1B-+-Pad5)" and plus.name == "+"
    assert u1.pin("7") is not None and u1.pin("7").net is None  # unit B's output is on no net
    assert [s.name for s in n.sheets] == ["/", "/status leds/"]


def test_component_and_net_lines_are_those_of_their_elements() -> None:
    path = XML / "legacy_power.xml"
    lines = path.read_text(encoding="utf-8").splitlines()
    n = read_xml_netlist(path)
    for c in n.components:
        assert lines[c.line - 1].strip() == f'<comp ref="{c.ref}">'
    for net in n.nets:
        assert lines[net.line - 1].strip().startswith(f'<net code="{net.code}" name="{net.name}"')


@pytest.mark.parametrize(
    ("data", "words", "line"),
    [
        (b"", "empty file", 1),
        (b"<export version='E'><components>", "malformed XML", 1),
        (b'<?xml version="1.0"?>\n<kicad_sch/>', "<kicad_sch>", 2),
        (b'<?xml version="1.0"?>\n<!DOCTYPE lolz [<!ENTITY lol "lol"><!ENTITY lol2 "&lol;&lol;">]>\n'
         b"<export>&lol2;</export>", "document type declaration", 2),
        (b'<?xml version="1.0"?>\n<!DOCTYPE export SYSTEM "file:///etc/passwd">\n<export/>',
         "document type declaration", 2),
        (b'<?xml version="1.0"?>\n<export>\n  <x>&ext;</x>\n</export>', "undefined entity", 3),
        (b'<export version="E">\n<components>\n<comp><value>x</value></comp>\n</components>\n</export>',
         "without a reference", 3),
        (b'<?xml version="1.0" encoding="no-such"?><export/>', "malformed XML", 1),
    ],
)
def test_bad_xml_gives_one_error_at_its_place(data: bytes, words: str, line: int) -> None:
    with pytest.raises(InputError) as info:
        parse_xml_netlist(data, "bad.xml")
    assert words in info.value.message and info.value.path == "bad.xml" and info.value.line == line


def test_missing_file_and_folder(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="no such file"):
        read_xml_netlist(tmp_path / "nope.xml")
    with pytest.raises(InputError, match="folder"):
        read_xml_netlist(tmp_path)


_SEEDS = [p.read_bytes() for p in sorted(XML.glob("*.xml"))]


@settings(max_examples=300, deadline=None)
@given(st.integers(0, len(_SEEDS) - 1), st.randoms(use_true_random=False))
def test_mutated_xml_only_raises_the_readers_error(which: int, rng: random.Random) -> None:
    data = bytearray(_SEEDS[which])
    for _ in range(rng.randint(1, 6)):
        i = rng.randrange(len(data)) if data else 0
        op = rng.choice(["delete", "insert", "cut"])
        if op == "delete" and data:
            del data[i]
        elif op == "insert":
            data[i:i] = rng.choice([b"<", b">", b'"', b"&", b"/", b"<!DOCTYPE x>", b"\x00", b"\xff", b"<a>", b"]]>"])
        else:
            del data[i:]
    try:
        parse_xml_netlist(bytes(data), "mutated.xml")
    except InputError:
        pass


_TAGS = st.sampled_from(["export", "design", "components", "comp", "value", "fields", "field", "libsource",
                         "property", "sheetpath", "nets", "net", "node", "libparts", "libpart", "pins", "pin",
                         "aliases", "alias", "units", "groups", "sheet", "tool"])
_ATTRS = st.dictionaries(st.sampled_from(["ref", "pin", "name", "code", "value", "num", "type", "pinfunction",
                                          "pintype", "lib", "part", "names", "version"]),
                         st.sampled_from(["R1", "1", "", "#PWR1", "A_1", "passive+no_connect", "E", "D", "~"]),
                         max_size=4)
_ELEMENT = st.recursive(
    st.tuples(_TAGS, _ATTRS).map(lambda t: f"<{t[0]}" + "".join(f' {k}="{v}"' for k, v in t[1].items()) + "/>"),
    lambda kids: st.tuples(_TAGS, _ATTRS, st.lists(kids, max_size=4)).map(
        lambda t: f"<{t[0]}" + "".join(f' {k}="{v}"' for k, v in t[1].items()) + ">" + "".join(t[2]) + f"</{t[0]}>"),
    max_leaves=30)


@settings(max_examples=300, deadline=None)
@given(st.lists(_ELEMENT, max_size=5))
def test_random_netlist_shaped_xml_only_raises_the_readers_error(parts: list[str]) -> None:
    try:
        parse_xml_netlist(('<export version="E">' + "".join(parts) + "</export>").encode(), "random.xml")
    except InputError:
        pass
