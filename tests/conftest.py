"""Shared fixtures for the tests."""

from __future__ import annotations

from pathlib import Path

import pytest

from paths import CORPUS, corpus_files


@pytest.fixture
def corpus() -> list[Path]:
    files = corpus_files()
    if not files:
        pytest.skip(f"real-netlist corpus not found at {CORPUS}")
    return files


# Golden files (tests/golden/): each output format's exact text for a fixed invented board.
# `pytest --regen-golden` rewrites them from the current output; review the diff before committing.
GOLDEN = Path(__file__).resolve().parent / "golden"


def pytest_addoption(parser: pytest.Parser) -> None:
    parser.addoption("--regen-golden", action="store_true", default=False,
                     help="rewrite the golden files in tests/golden/ from the current output")


@pytest.fixture
def golden(request: pytest.FixtureRequest):
    """Compare text with tests/golden/NAME, or rewrite that file under --regen-golden."""
    regen = request.config.getoption("--regen-golden")

    def compare(name: str, text: str) -> None:
        path = GOLDEN / name
        if regen:
            path.parent.mkdir(parents=True, exist_ok=True)
            path.write_text(text, encoding="utf-8")
            return
        if not path.exists():
            pytest.fail(f"no golden file {path}: run `pytest --regen-golden` and review it")
        expected = path.read_text(encoding="utf-8")
        if text != expected:
            import difflib

            diff = "".join(difflib.unified_diff(expected.splitlines(True), text.splitlines(True),
                                                f"golden/{name}", "output"))
            pytest.fail(f"output differs from golden/{name} (if intended: `pytest --regen-golden`, "
                        f"then review the diff):\n{diff}")

    return compare


def workshop_panel(revision: str = "A", *, waive: bool = False):
    """An invented workshop lamp panel in three revisions, for the report, baseline, diff and hook tests.

    A: mistakes on purpose: a 47 Ω ballast on +12V, an LED straight across +5V, two LEDs sharing
    one resistor. B: those fixed, an LED added on +3V3 with too little headroom. C: B without the
    new LED and with larger ballast resistors: no errors or warnings.
    """
    from kicad8 import Board

    b = Board("workshop-panel", f"Workshop lamp panel, revision {revision}")
    b.add("J1", "Conn_01x02", "Conn_01x02", "Connector_PinHeader_2.54mm:PinHeader_1x02_P2.54mm_Vertical",
          {"1": "+12V", "2": "GND"})
    b.led("D1", "red", "Net-(D1-A)", "GND", Vf="2.0V@20mA", If_max="30mA")
    b.led("D3", "green", "Net-(D3-A)", "GND", Vf="2.1V@20mA", If_max="25mA")
    b.resistor("R6", "330", "+5V", "Net-(D6-A)")
    b.led("D6", "red", "Net-(D6-A)", "GND", Vf="2.0V@20mA", If_max="20mA")
    if revision == "A":
        b.resistor("R1", "47", "+12V", "Net-(D1-A)")
        waiver = {"ledlint_waive": "unlimited-led: lit from a current-limited bench supply only"} if waive else {}
        b.led("D2", "white", "+5V", "GND", **waiver)
        b.resistor("R3", "100", "+5V", "Net-(D3-A)")
        b.led("D4", "green", "Net-(D3-A)", "GND", Vf="2.1V@20mA", If_max="25mA")
        return b
    chip = "Resistor_SMD:R_0603_1608Metric" if revision == "B" else "Resistor_SMD:R_1206_3216Metric"
    b.resistor("R1", "510", "+12V", "Net-(D1-A)", footprint="Resistor_SMD:R_1210_3225Metric")
    b.resistor("R3", "200", "+5V", "Net-(D3-A)", footprint=chip)
    b.resistor("R4", "200", "+5V", "Net-(D4-A)", footprint=chip)
    b.led("D4", "green", "Net-(D4-A)", "GND", Vf="2.1V@20mA", If_max="25mA")
    if revision == "B":
        b.resistor("R5", "15", "+3V3", "Net-(D5-A)")
        b.led("D5", "white", "Net-(D5-A)", "GND", Vf="3.0V@20mA", Vf_max="3.4V", If_max="30mA")
    return b


@pytest.fixture
def panel_files(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> dict[str, str]:
    """The three revisions written to boards/panel-<rev>.net below a fresh working folder."""
    monkeypatch.chdir(tmp_path)
    (tmp_path / "boards").mkdir()
    out = {}
    for rev in "ABC":
        name = f"boards/panel-{rev.lower()}.net"
        (tmp_path / name).write_text(workshop_panel(rev).text(), encoding="utf-8")
        out[rev] = name
    return out


@pytest.fixture
def fixed_run(tmp_path: Path, monkeypatch: pytest.MonkeyPatch):
    """A run with findings written out by hand (not computed), for the format golden files: they
    pin each format's layout, and stay put when a rule's wording or the engine's figures change.
    The netlist is real (revision A with a field waiver on D2), so lines and waivers are too."""
    from ledlint.analysis.results import BoardAnalysis
    from ledlint.analysis.summary import summarise
    from ledlint.config import Waiver
    from ledlint.checks.findings import Finding, Severity, Value
    from ledlint.netlist.kicad_net import read_netlist
    from ledlint.checks.registry import Option, Rule
    from ledlint.review.run import FileResult, RunResult

    monkeypatch.chdir(tmp_path)
    (tmp_path / "boards").mkdir()
    path = "boards/panel-a.net"
    (tmp_path / path).write_text(workshop_panel("A", waive=True).text(), encoding="utf-8")
    netlist = read_netlist(path)
    line = {c.ref: c.line for c in netlist.components}

    def rule(rid: str, summary: str, severity: Severity, options: tuple[Option, ...] = ()) -> Rule:
        doc = (f"{rid}: {summary}.\n\nWhat it flags\n    The demo condition of {rid}, over two\n    lines.\n\n"
               "Why it matters\n    A reason.\n\nExample\n    An example.\n\nFix\n    A fix.\n\n"
               "Formula\n    I = (V - Vf) / R\n\nSource\n    Ohm's law.\n")
        return Rule(rid, summary, severity, lambda ctx: iter(()), options, doc)

    rules = (rule("current-margin", "worst-case LED current against If_max", Severity.WARNING,
                  (Option("margin", 0.75, "", "fraction of If_max"),)),
             rule("resistor-overload", "ballast dissipation against its rating", Severity.ERROR),
             rule("unlimited-led", "an LED with nothing to limit its current", Severity.ERROR))

    def finding(rid: str, severity: Severity, message: str, refs: tuple[str, ...], nets: tuple[str, ...],
                hint: str = "", waived: str = "", values: tuple[Value, ...] = (), in_source: bool = False) -> Finding:
        return Finding(rid, severity, message, path, line[refs[0]], refs, nets, values=values,
                       assumed=("+12V 11.4-12.6 V (net name: ±5 % default)",), hint=hint, circuit=refs[0],
                       waived=waived, waived_in_source=in_source)

    active = (
        finding("current-margin", Severity.ERROR, "D1 can carry 219 mA, above its If_max of 30 mA | 7.3×",
                ("D1", "R1"), ("+12V", "GND"), "use 510 Ω (E24)",
                values=(Value("worst", 0.219, "A", 0.030, ">"),)),
        finding("resistor-overload", Severity.WARNING, "R3 dissipates up to 124 mW, 50% of <its> rating",
                ("R3", "D3", "D4"), ("+5V", "Net-(D3-A)")),
    )
    waived = (
        finding("unlimited-led", Severity.ERROR, "D2 sits across +5V and GND", ("D2",), ("+5V", "GND"),
                waived="lit from a current-limited bench supply only", in_source=True),  # the field on D2
        finding("resistor-overload", Severity.ERROR, "R1 dissipates up to 2.15 W", ("R1",), ("+12V", "GND"),
                waived="R1 is a 2 W part on the assembly drawing"),
    )
    board = BoardAnalysis(netlist, (), (), ())
    named = (r for f in (*active, *waived) for r in f.refs)
    fr = FileResult(path, netlist, board, active, waived, "ledlint.toml", summarise(path, board, named))
    unused = (Waiver("current-margin", "D9 was removed", ref="D9", origin="ledlint.toml [[waivers]] #2"),)
    return RunResult((fr,), rules, unused)
