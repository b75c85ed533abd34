"""The recogniser puts every LED in exactly one circuit of the right kind."""

from __future__ import annotations

import pytest

from kicad8 import SYMBOLS, Board
from ledlint.config import Config
from ledlint.circuits.graph import NetGraph
from ledlint.netlist.kicad_net import parse_netlist, read_netlist
from ledlint.circuits.recognise import CircuitKind, LedCircuit, recognise
from ledlint.circuits.topology import ElementKind
from paths import CORPUS

# Test-only symbols: an addressable LED with its own controller, and an unnamed-pin NPN.
SYMBOLS.setdefault("PIXEL", ("ledlint_demo", "PIXEL", "RGB LED with integrated controller", "LED RGB pixel",
                             (("1", "VDD", "power_in"), ("2", "DOUT", "output"), ("3", "VSS", "power_in"),
                              ("4", "DIN", "input"))))
SYMBOLS.setdefault("NPN_SOT23", ("ledlint_demo", "NPN_SOT23", "NPN transistor, SOT-23", "transistor",
                                 (("1", "", "passive"), ("2", "", "passive"), ("3", "", "passive"))))
MCU = {"1": "+3V3", "2": "/P0", "3": "/P1", "4": "/P2", "5": "/P3", "6": "/P4", "7": "/P5", "8": "GND"}


def circuits(board: Board) -> tuple[LedCircuit, ...]:
    return recognise(NetGraph(parse_netlist(board.text(), board.name + ".net")), Config())


def only(board: Board) -> LedCircuit:
    cs = circuits(board)
    assert len(cs) == 1, cs
    return cs[0]


def test_single_led_with_ballast() -> None:
    b = Board("t", "t")
    b.resistor("R1", "330", "+5V", "Net-(D1-A)")
    b.led("D1", "red", "Net-(D1-A)", "GND")
    c = only(b)
    assert c.kind is CircuitKind.STRING and tuple(map(str, c.leds)) == ("D1",)
    assert (c.source.net, c.ret.net) == ("+5V", "GND") and [e.ref for e in c.resistors] == ["R1"]
    assert c.refs == ("D1", "R1") and c.nets == ("+5V", "GND")


def test_string_of_three_with_a_capacitor_across_one_led() -> None:
    b = Board("t", "t")
    b.resistor("R1", "680", "+12V", "/A")
    b.led("D1", "white", "/A", "/B")
    b.led("D2", "white", "/B", "/C")
    b.led("D3", "white", "/C", "GND")
    b.add("C1", "C", "100n", "Capacitor_SMD:C_0603_1608Metric", {"1": "/B", "2": "/C"})  # open at DC
    c = only(b)
    assert c.kind is CircuitKind.STRING and tuple(map(str, c.leds)) == ("D1", "D2", "D3")
    assert [e.id for e in c.branches[0].elements] == ["R1", "D1", "D2", "D3"]


def test_shared_resistor_bank_with_and_without_balancing() -> None:
    b = Board("t", "t")
    b.resistor("R1", "100", "+5V", "/N")
    for i in (1, 2, 3):
        b.led(f"D{i}", "red", "/N", "GND")
    c = only(b)
    assert c.kind is CircuitKind.BANK and c.node == "/N" and not c.individually_driven
    assert [e.ref for e in c.top] == ["R1"] and len(c.branches) == 3
    b2 = Board("t", "t")
    b2.resistor("R1", "47", "+5V", "/N")
    for i in (1, 2):
        b2.resistor(f"R{i + 1}", "22", "/N", f"/A{i}")
        b2.led(f"D{i}", "red", f"/A{i}", "GND")
    c2 = only(b2)
    assert c2.kind is CircuitKind.BANK and [e.ref for b_ in c2.branches for e in b_.elements
                                            if e.kind is ElementKind.RESISTOR] == ["R2", "R3"]


def test_common_anode_rgb_switched_by_pins_is_individually_driven() -> None:
    b = Board("t", "t")
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8", MCU)
    b.resistor("R1", "150", "+3V3", "/COM")
    b.add("D1", "LED_RGBA", "LED_RGB", "LED_SMD:LED_RGB_PLCC-4", {"4": "/COM", "1": "/P0", "2": "/P1", "3": "/P2"})
    c = only(b)
    assert c.kind is CircuitKind.BANK and c.individually_driven and tuple(map(str, c.leds)) == ("D1:B", "D1:G", "D1:R")
    assert {br.far.net for br in c.branches} == {"/P0", "/P1", "/P2"}


def test_both_ends_on_pins_is_multiplexed() -> None:
    b = Board("t", "t")
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8", MCU)
    b.resistor("R1", "220", "/P0", "/A")
    b.led("D1", "red", "/A", "/P1")
    c = only(b)
    assert c.kind is CircuitKind.MULTIPLEXED and "driver pins" in c.reason


def test_low_side_switch_is_a_drop_not_a_break() -> None:
    b = Board("t", "t")
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8", MCU)
    b.resistor("R1", "330", "+5V", "/A")
    b.led("D1", "red", "/A", "/K")
    b.add("Q1", "Q_NPN_BEC", "BC817", "Package_TO_SOT_SMD:SOT-23", {"1": "/B", "2": "GND", "3": "/K"})
    b.resistor("R2", "4k7", "/P0", "/B")
    c = only(b)
    assert c.kind is CircuitKind.STRING and (c.source.net, c.ret.net) == ("+5V", "GND")
    assert [e.kind for e in c.branches[0].elements] == [ElementKind.RESISTOR, ElementKind.LED, ElementKind.SWITCH]


def test_unnamed_sot23_npn_with_emitter_resistor_is_a_sink() -> None:
    b = Board("t", "t")
    b.led("D1", "red", "+12V", "/K")
    b.add("Q1", "NPN_SOT23", "NPN", "Package_TO_SOT_SMD:SOT-23", {"1": "/B", "2": "/E", "3": "/K"})
    b.resistor("R1", "33", "/E", "GND")
    b.resistor("R2", "1k", "+12V", "/B")
    b.add("D9", "D_Zener", "3V3", "Diode_SMD:D_SOD-123", {"1": "/B", "2": "GND"})
    c = only(b)
    assert c.kind is CircuitKind.SINK and c.sink.transistor.ref == "Q1"
    assert [e.ref for e in c.sink.sense] == ["R1"] and c.sink.reference.kind.value == "zener"
    assert "SOT-23" in c.sink.transistor.assumption


def test_reversed_led_is_a_string_from_ground() -> None:
    b = Board("t", "t")
    b.led("D1", "red", "GND", "/K")
    b.resistor("R1", "330", "/K", "+5V")
    c = only(b)
    assert c.kind is CircuitKind.STRING and c.source.net == "GND" and c.ret.net == "+5V"


def test_opposed_leds_in_one_string_are_blocked() -> None:
    b = Board("t", "t")
    b.resistor("R1", "330", "+5V", "/A")
    b.led("D1", "red", "/A", "/M")
    b.led("D2", "red", "GND", "/M")  # faces the other way
    c = only(b)
    assert c.blocked and [e.id for e in c.opposed] == ["D2"]


def test_unfitted_open_and_off_board_leds_are_accounted_for() -> None:
    b = Board("t", "t")
    b.resistor("R1", "330", "+5V", "/A")
    b.led("D1", "red", "/A", "GND").dnp = True
    b.resistor("R2", "330", "+5V", "/B")
    b.led("D2", "red", "/B", "/J")
    b.add("J1", "Conn_01x02", "Conn", "Connector:Conn_01x02", {"1": "/J", "2": "GND"})
    kinds = {c.id: c for c in circuits(b)}
    assert kinds["D1"].kind is CircuitKind.NOT_FITTED
    assert kinds["D2"].kind is CircuitKind.UNRECOGNISED and "off the board" in kinds["D2"].reason


def test_addressable_chain_is_one_circuit() -> None:
    b = Board("t", "t")
    for i in (1, 2, 3):
        b.add(f"D{i}", "PIXEL", "PIXEL", "LED_SMD:LED_PLCC-4",
              {"1": "+5V", "2": f"/D{i + 1}", "3": "GND", "4": f"/D{i}"})
    c = only(b)
    assert c.kind is CircuitKind.ADDRESSABLE and tuple(map(str, c.leds)) == ("D1", "D2", "D3") and c.source.net == "+5V"


def test_every_corpus_led_is_in_exactly_one_circuit(corpus) -> None:
    from ledlint.parts.kinds import Kind, classify, led_dies

    for path in corpus:
        n = read_netlist(path)
        cs = recognise(NetGraph(n), Config())
        ids = [str(i) for c in cs for i in c.leds]
        assert len(ids) == len(set(ids)), path.name
        expected = set()
        for comp in n.components:
            k = classify(comp)
            if k is Kind.LED_ADDRESSABLE:
                expected.add(comp.ref)
            elif k is Kind.LED:
                expected |= {f"{comp.ref}:{d.name}" if d.name else comp.ref for d in led_dies(comp)}
        assert set(ids) == expected, path.name
        for c in cs:
            if c.kind in (CircuitKind.UNRECOGNISED, CircuitKind.MULTIPLEXED, CircuitKind.ADDRESSABLE):
                assert c.reason, (path.name, c.id)


@pytest.mark.parametrize(("name", "kind", "leds"), [
    ("mains-led-lamp-strings.net", CircuitKind.SINK, 28),  # MANIFEST: 14 strings of 4 on two sinks
    ("antenna-switch-board.net", CircuitKind.MULTIPLEXED, 4),  # MANIFEST: four LEDs share one cathode R
    ("keyboard-per-key-rgb.net", CircuitKind.ADDRESSABLE, None),
    ("logic-probe-rgb-led.net", CircuitKind.BANK, 3),  # one RGB LED, anode resistor, cathodes on pins
])
def test_corpus_topologies_match_the_manifest(corpus, name: str, kind: CircuitKind, leds: int | None) -> None:
    cs = recognise(NetGraph(read_netlist(CORPUS / name)), Config())
    found = [c for c in cs if c.kind is kind]
    assert found and (leds is None or all(len(c.leds) == leds for c in found))


def test_multiplexed_is_listed_with_its_drivers_rail(tmp_path) -> None:
    """Not analysed, but the report names the rail its driver runs from (the IC's VDD)."""
    from ledlint.analysis.board import analyse

    b = Board("t", "t")
    b.add("U1", "MCU8", "MCU8", "Package_SO:SOIC-8", MCU)
    b.resistor("R1", "220", "/P0", "/A")
    b.led("D1", "red", "/A", "/P1")
    net = tmp_path / "t.net"
    net.write_text(b.text(), encoding="utf-8")
    [a] = analyse(read_netlist(net), Config()).analyses
    assert a.circuit.kind is CircuitKind.MULTIPLEXED and not a.solved and a.rail == MCU["1"]


def test_led_with_one_pin_in_the_netlist_is_not_silently_skipped() -> None:
    """No library parts and the cathode on no net (KiCad 5 leaves such pins out)."""
    text = ('(export (version "D") (components (comp (ref "D1") (value "LED") (libsource (lib "Device") '
            '(part "LED")))) (nets (net (code "1") (name "/A") (node (ref "D1") (pin "2")))))')
    [c] = recognise(NetGraph(parse_netlist(text, "one-pin.net")), Config())
    assert c.kind is CircuitKind.UNRECOGNISED and c.never_lights and "only one pin" in c.reason


def test_house_library_led_pins_and_unfitted_odd_ones() -> None:
    """LED ends named '+'/'-' or ANODE/CATHODE read as A/K (common practice in house libraries);
    an unfitted LED whose pins read as neither is still one not-fitted circuit, once."""
    text = '''(export (version "E") (design (tool "Eeschema 8.0.6"))
  (components
    (comp (ref "D1") (value "LED red") (libsource (lib "mylib") (part "LED_custom")))
    (comp (ref "D2") (value "LED red") (libsource (lib "mylib") (part "LED_custom")))
    (comp (ref "D3") (value "LED red") (libsource (lib "mylib") (part "LED_custom")) (property (name "dnp") (value "")))
    (comp (ref "R1") (value "1k")) (comp (ref "R2") (value "1k")))
  (nets
    (net (code "1") (name "+5V") (node (ref "R1") (pin "1")) (node (ref "R2") (pin "1")))
    (net (code "2") (name "/A1") (node (ref "R1") (pin "2")) (node (ref "D1") (pin "2") (pinfunction "+")))
    (net (code "3") (name "/A2") (node (ref "R2") (pin "2")) (node (ref "D2") (pin "2") (pinfunction "ANODE")))
    (net (code "4") (name "/X") (node (ref "D3") (pin "2") (pinfunction "X")))
    (net (code "5") (name "GND") (node (ref "D1") (pin "1") (pinfunction "-"))
      (node (ref "D2") (pin "1") (pinfunction "CATHODE")) (node (ref "D3") (pin "1") (pinfunction "Y")))))'''
    cs = recognise(NetGraph(parse_netlist(text, "odd.net")), Config())
    assert [(c.id, c.kind) for c in cs] == [("D1", CircuitKind.STRING), ("D2", CircuitKind.STRING),
                                           ("D3", CircuitKind.NOT_FITTED)]
    assert [c.source.net for c in cs[:2]] == ["+5V", "+5V"]
