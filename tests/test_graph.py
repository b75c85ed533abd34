"""Graph queries the recogniser builds on."""

from __future__ import annotations

from paths import CORPUS, SAMPLES
from ledlint.circuits.graph import NetGraph
from ledlint.netlist.kicad_net import read_netlist


def test_queries_on_the_sample_board() -> None:
    g = NetGraph(read_netlist(SAMPLES / "bench-supply-status.net"))
    assert g.nets_of("D1") == {"1": "GND", "2": "Net-(D1-A)"}
    assert {(p.ref, p.number) for p in g.pins_on("Net-(D1-A)")} == {("D1", "2"), ("R1", "2")}
    assert g.degree("Net-(D1-A)") == 2 and g.degree("no-such-net") == 0
    assert g.across("R1", "2") == "+5V" and g.across("D1", "2") == "GND"
    assert g.across("U1", "1") is None  # not a two-terminal part
    assert g.across("R1", "3") is None  # no such pin: no other side either
    assert [c.ref for c in g.parts_on("GND")] == ["C1", "D1", "D2", "D3", "J1", "U1"]


def test_shared_cathode_resistor_in_a_real_board(corpus) -> None:
    # MANIFEST.md: four LEDs share one cathode resistor, Net-(DAG1-Pad1) = DAG1-DAG4 + R1.
    g = NetGraph(read_netlist(CORPUS / "antenna-switch-board.net"))
    refs = sorted(c.ref for c in g.parts_on("Net-(DAG1-Pad1)"))
    assert refs == ["DAG1", "DAG2", "DAG3", "DAG4", "R1"]
    # ... and that resistor returns to a gate output, not to ground (U6 pin 4 in the file).
    assert g.across("R1", "1") == "Net-(R1-Pad2)"
    assert {(p.ref, p.number) for p in g.pins_on("Net-(R1-Pad2)")} == {("R1", "2"), ("U6", "4"), ("R4", "2")}
