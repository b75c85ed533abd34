"""Parallel strings on one current output: the engine's split against ngspice, string by string."""

from __future__ import annotations

import math
import re
import shutil
import subprocess
from dataclasses import dataclass
from pathlib import Path

import pytest

from kicad8 import Board
from ledlint.circuits.recognise import CircuitKind
from ledlint.review.run import FileResult
from test_drivers import analysis, run


@dataclass(frozen=True)
class Point:
    drive: float
    vf: tuple[float, ...]  # each LED's Vf at its test current, 25 °C


def spice_split(result: FileResult, point: Point) -> list[float]:
    """Branch currents from ngspice: an ideal current source into the strings, each LED a SPICE
    diode with the engine's n and R_s and IS fitted to its Vf at the test current, 25 °C."""
    a = analysis(result, "D1")
    leds = {str(r.id): r.params for r in a.leds}
    vt = 1.380649e-23 * 298.15 / 1.602176634e-19  # kT/q at 25 °C (CODATA)
    lines = ["* parallel strings on one current source", ".options tnom=25 gmin=1e-12 reltol=1e-9 abstol=1e-15",
             ".temp 25", f"I1 0 top DC {point.drive!r}"]
    j = 0
    for k, branch in enumerate(a.circuit.branches):
        node = f"s{k}_0"
        lines.append(f"Vb{k} top {node} DC 0")
        for n, led in enumerate(branch.leds):
            p = leds[led.id]
            # IS from I = IS·(exp((V − I·RS)/(n·Vt)) − 1) at the datasheet point (ngspice manual §7.3).
            i_s = p.i_test.value / math.expm1((point.vf[j] - p.i_test.value * p.r_s) / (p.n * vt))
            nxt = "0" if n == len(branch.leds) - 1 else f"s{k}_{n + 1}"
            lines += [f"D{j} {node} {nxt} M{j}", f".model M{j} D(IS={i_s!r} N={p.n!r} RS={p.r_s!r})"]
            node, j = nxt, j + 1
    probes = " ".join(f"i(Vb{k})" for k in range(len(a.circuit.branches)))
    lines += [".control", "set numdgt=12", "op", f"print {probes}", ".endc", ".end", ""]
    done = subprocess.run(["ngspice", "-b"], input="\n".join(lines), capture_output=True, text=True, timeout=60)
    got = dict(re.findall(r"^i\(vb(\d+)\)\s*=\s*([-+0-9.eE]+)", done.stdout, re.M | re.I))
    assert len(got) == len(a.circuit.branches), done.stdout + done.stderr
    return [float(got[str(k)]) for k in range(len(a.circuit.branches))]


SPLIT_VF = ((3.00, 3.08, 2.96), (2.94, 3.02, 2.98), (3.10, 2.92, 3.04))


def split_board(strings: int) -> Board:
    b = Board(f"split{strings}", "Demo parallel strings")
    b.add("U1", "CCSINK", "CCSINK", "Package_TO_SOT_SMD:SOT-23-5", {"1": "+12V", "2": "/OUT", "3": "/CS", "4": "GND"},
          driver="linear", vref="200mV", vref_tolerance="2%")
    b.resistor("R1", "3R3 1%", "/CS", "GND")
    for s in range(strings):
        nets = ["+12V", f"/S{s}a", f"/S{s}b", "/OUT"]
        for k in range(3):
            vf = SPLIT_VF[s][k]
            b.led(f"D{3 * s + k + 1}", "white", nets[k], nets[k + 1], footprint="LED_SMD:LED_PLCC_2835",
                  Vf=f"{vf}V@30mA", Vf_min=f"{vf - 0.15:.2f}V", Vf_max=f"{vf + 0.15:.2f}V", If_max="100mA")
    return b


@pytest.mark.skipif(shutil.which("ngspice") is None, reason="ngspice is not on PATH (Debian: apt-get install ngspice)")
@pytest.mark.parametrize("strings", [2, 3])
def test_split_against_ngspice(tmp_path: Path, strings: int) -> None:
    # No thermal resistance (a PLCC-2835 is not an indicator package) and 25 °C: the engine's
    # currents at the nominal corner and at each string's hogging corner against ngspice.
    result = run(split_board(strings), tmp_path)
    a = analysis(result, "D1")
    assert a.circuit.kind is CircuitKind.DRIVER and len(a.circuit.branches) == strings
    per_led = {str(r.id): r for r in a.leds}
    first = [f"D{3 * s + 1}" for s in range(strings)]  # one LED of each string carries its current
    vf = tuple(v for row in SPLIT_VF[:strings] for v in row)
    nominal = spice_split(result, Point(0.2 / 3.3, vf))
    assert [per_led[d].current.nominal for d in first] == pytest.approx(nominal, rel=0.01)
    assert sum(nominal) == pytest.approx(0.2 / 3.3, rel=1e-6)  # the source's current, all of it
    assert max(nominal) / min(nominal) > 1.2  # the split really is uneven: Vf decides
    most = 0.2 * 1.02 / (3.3 * 0.99)
    hogged = []
    for s in range(strings):
        # String s at its lowest Vf, the others at their highest, the most drive: it hogs.
        hog = tuple(v - 0.15 if j // 3 == s else v + 0.15 for j, v in enumerate(vf))
        hogged.append(spice_split(result, Point(most, hog))[s])
        assert per_led[first[s]].current.maximum == pytest.approx(hogged[-1], rel=0.01)
    assert a.sharing.worst_current == pytest.approx(max(hogged), rel=0.01)
