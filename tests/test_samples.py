"""The invented sample boards raise the findings they were designed to, and the fixed twin none."""

from __future__ import annotations

import pytest
from board_oven import oven_panel, oven_panel_fixed
from board_rgb import rgb_status
from board_worklight import work_light
from paths import SAMPLES

from ledlint.review.rules import load_rules
from ledlint.review.run import check

ERROR, WARNING, INFO = "error", "warning", "info"

# Per board: (rule, severity, refs) of every finding, as each board's comments describe it.
DESIGNED = {
    oven_panel: {
        # POWER: 100 Ω from +5V, ~29 mA nominal against If_max 20 mA; its 0603 over 0.1 W.
        ("current-margin", ERROR, ("D1", "R1")),
        ("resistor-overload", ERROR, ("R1",)),
        # HEAT: 33 Ω from a port pin rated 10 mA.
        ("current-margin", ERROR, ("D2", "R2")),
        ("pin-overcurrent", ERROR, ("D2", "R2", "U1")),
        # TIMER: blue (Vf_max 3.4 V) from a 3.3 V pin.
        ("supply-headroom", ERROR, ("D3", "R3")),
        # READY: "LED", no colour, no Vf.
        ("missing-parameter", INFO, ("D4", "R4")),
        # Knob backlight: three amber LEDs on one 39 Ω, in an 0805.
        ("shared-resistor-bank", ERROR, ("D5", "D6", "D7", "R5")),
        ("resistor-overload", ERROR, ("R5",)),
        # DOOR: fitted backwards.
        ("reverse-bias", ERROR, ("D8",)),
        # LAMP ON: a P-MOSFET on +5V, its gate on a 3.3 V port pin: it never turns off.
        ("switch-drive", ERROR, ("D9", "Q2", "R10", "U1")),
    },
    oven_panel_fixed: set(),
    work_light: {
        # Flood: 3 V × 60 mA = 0.18 W in each 0805 (1/8 W).
        ("resistor-overload", ERROR, ("R1",)),
        ("resistor-overload", ERROR, ("R2",)),
        ("resistor-overload", ERROR, ("R3",)),
        # Spot: two strings of three 1 W LEDs on one 4.7 Ω, 2.9 W nominal in a 5 W resistor.
        ("shared-resistor-bank", ERROR, ("D10", "D11", "D12", "D13", "D14", "D15", "R4")),
        ("thermal-runaway", WARNING, ("D10", "D11", "D12", "D13", "D14", "D15", "R4")),
        ("resistor-overload", ERROR, ("R4",)),
        # Courtesy light: four LEDs straight across +12V.
        ("unlimited-led", ERROR, ("D16", "D17", "D18", "D19")),
        # Inspection light: Q1 from a house symbol with drain and source swapped.
        ("switch-orientation", ERROR, ("D20", "Q1")),
        # Map light: a 1 W LED at 150 K/W on the FR-4 tab, within its current, past its Tj_max.
        ("junction-temperature", WARNING, ("D21", "R7")),
    },
    rgb_status: {
        # Status RGB: one anode resistor, each cathode on its own pin; blue and green on +3V3.
        ("shared-resistor-bank", INFO, ("D1", "R1")),
        ("supply-headroom", WARNING, ("D1", "R1")),  # green's Vf_max is the built-in +10 %: one step down
        # LINK: 22 Ω from a port pin (default 20 mA rating) into a 20 mA LED.
        ("current-margin", ERROR, ("D2", "R2")),
        ("pin-overcurrent", ERROR, ("D2", "R2", "U1")),
        # DISK: returns through the bezel connector.
        ("unrecognised-circuit", INFO, ("D3", "R3")),
        # FAN: on VCC, voltage unknown.
        ("missing-parameter", INFO, ("D4", "R4")),
    },
}
BOARDS = list(DESIGNED)


def findings(make) -> set[tuple[str, str, tuple[str, ...]]]:
    result = check([SAMPLES / f"{make().name}.net"])
    return {(f.rule, f.severity.value, tuple(sorted(f.refs))) for f in result.findings}


@pytest.mark.parametrize("make", BOARDS, ids=lambda m: m.__name__)
def test_sample_file_is_regenerated(make) -> None:
    """sample_boards/ holds what tests/make_boards.py writes today."""
    board = make()
    assert (SAMPLES / f"{board.name}.net").read_text(encoding="utf-8") == board.text()


@pytest.mark.parametrize("make", BOARDS, ids=lambda m: m.__name__)
def test_designed_findings(make) -> None:
    assert findings(make) == DESIGNED[make]


@pytest.mark.parametrize("make", BOARDS, ids=lambda m: m.__name__)
def test_nothing_beyond_the_design(make) -> None:
    assert findings(make) == DESIGNED[make]


def test_between_them_every_rule_but_the_driver_rules() -> None:
    hit = {rule for design in DESIGNED.values() for rule, _, _ in design}
    # The driver rules fire on the cabinet-light boards (tests/test_drivers.py); every other
    # built-in rule has a designed finding here, so a new rule needs a sample too.
    assert hit == {r.id for r in load_rules()} - {"driver-parallel-strings", "driver-headroom"}


def test_fixed_twin_has_no_error_or_warning() -> None:
    result = check([SAMPLES / "oven-panel-fixed.net"])
    assert not [f for f in result.findings if f.severity.value in (ERROR, WARNING)]
    assert all(a.solved for a in result.files[0].board.analyses)
