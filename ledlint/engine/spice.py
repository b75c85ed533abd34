"""A SPICE deck of one engine case, and an ngspice runner: an independent check of a solve.

The deck is the engine's circuit element by element: the supply (or an ideal current
source), the common path (source resistance, ballast, switch resistance, and the switch
drop as a voltage source), and each branch behind a 0 V source that measures its current.
Every LED is a SPICE diode with the parameters the engine fitted (IS, N, RS, and the EG
and XTI that give its tc) and its own junction temperature (instance ``temp``).
"""

from __future__ import annotations

import re
import shutil
import subprocess
from dataclasses import dataclass

import numpy as np

from ledlint.engine.constants import ZERO_CELSIUS
from ledlint.engine.diode import Fit
from ledlint.engine.model import Circuit, ModelError
from ledlint.engine.solver import Cases, Setup

# ngspice's defaults (reltol 1e-3) leave about 1e-5 relative error in an operating point;
# these tighten it to about 1e-10, far below what the checks compare.
_OPTIONS = ".options tnom=25 gmin=1e-12 reltol=1e-10 vntol=1e-13 abstol=1e-18"
_RESULT = re.compile(r"^\s*(\S+)\s*=\s*([-+0-9.eE]+)\s*$")


def _number(x: float) -> str:
    return repr(float(x))


def _series(lines: list[str], start: str, end: str, prefix: str,
            elements: list[tuple[str, str]]) -> list[str]:
    """Chain ``elements`` (name, value) from node ``start`` to ``end``; returns every node."""
    nodes = [start] + [f"{prefix}{i}" for i in range(1, len(elements))] + [end]
    for (name, value), a, b in zip(elements, nodes, nodes[1:]):
        lines.append(f"{name} {a} {b} {value}")
    return nodes


@dataclass(frozen=True)
class Deck:
    """A SPICE deck and where its LEDs sit in it."""

    text: str
    branches: int
    led_nodes: tuple[tuple[str, str], ...]  # (anode, cathode) of each LED


def deck(circuit: Circuit, cases: Cases, s: int = 0) -> Deck:
    """The SPICE deck of case ``s`` of ``cases``, printing what :func:`run_ngspice` reads."""
    setup = Setup.of(circuit)
    setup.check(cases)
    fit = Fit.of(setup.table, cases.vf[s : s + 1])
    table = setup.table
    lines = ["* ledlint engine case", _OPTIONS]
    if circuit.current_driven:
        lines.append(f"I1 0 top DC {_number(cases.drive[s])}")
    else:
        lines.append(f"V1 src 0 DC {_number(cases.drive[s])}")
        path = [(name, _number(r)) for name, r in (("Rsource", circuit.r_source),
                                                    ("Rseries", cases.r_series[s]),
                                                    ("Rswitch", cases.r_switch[s])) if r > 0]
        # The switch drop is a source against the current; at 0 V it joins its nodes.
        _series(lines, "src", "top", "p", path + [("Vswitch", f"DC {_number(cases.v_switch[s])}")])
    led_nodes: list[tuple[str, str]] = []
    first = 0
    for k, branch in enumerate(circuit.branches):
        leds = range(first, first + len(branch.leds))
        first += len(branch.leds)
        elements = [(f"Vb{k}", "DC 0")]
        if cases.r_branch[s, k] > 0:
            elements.append((f"Rb{k}", _number(cases.r_branch[s, k])))
        elements += [(f"D{j}", f"LED{j} temp={_number(cases.tj[s, j])}") for j in leds]
        nodes = _series(lines, "top", "0", f"b{k}_", elements)
        led_nodes += list(zip(nodes[-len(leds) - 1 : -1], nodes[-len(leds):]))
        for j in leds:
            lines.append(
                f".model LED{j} D(IS={_number(np.exp(fit.ln_is_nom[0, j]))} N={_number(table.n[j])} "
                f"RS={_number(table.r_s[j])} EG={_number(fit.eg[0, j])} XTI={_number(table.xti[j])} "
                f"TNOM={_number(table.t_nom[j] - ZERO_CELSIUS)})"
            )
    nodes = sorted({n for pair in led_nodes for n in pair if n != "0"})
    probes = ["v(top)"] + ([] if circuit.current_driven else ["i(V1)"])
    probes += [f"i(Vb{k})" for k in range(len(circuit.branches))] + [f"v({n})" for n in nodes]
    lines += [".control", "set numdgt=14", "op", "print " + " ".join(probes), ".endc", ".end", ""]
    return Deck(text="\n".join(lines), branches=len(circuit.branches), led_nodes=tuple(led_nodes))


@dataclass(frozen=True)
class SpiceResult:
    """An ngspice operating point, in the engine's terms."""

    node_voltage: float  # V across the bank
    supply_current: float  # A the supply delivers (NaN for a current drive)
    branch_current: tuple[float, ...]
    led_voltage: tuple[float, ...]


def ngspice_available() -> bool:
    return shutil.which("ngspice") is not None


def run_ngspice(spice: Deck, timeout: float = 120.0) -> SpiceResult:
    """Run ``ngspice -b`` on ``spice`` and read its operating point."""
    executable = shutil.which("ngspice")
    if executable is None:
        raise ModelError("ngspice is not installed (it is not on PATH)")
    done = subprocess.run([executable, "-b"], input=spice.text, capture_output=True, text=True,
                          timeout=timeout, check=False)
    values: dict[str, float] = {}
    for line in done.stdout.splitlines():
        match = _RESULT.match(line)
        if match:
            values[match.group(1).lower()] = float(match.group(2))
    if "v(top)" not in values:
        raise ModelError(f"ngspice gave no operating point:\n{done.stdout[-2000:]}{done.stderr[-2000:]}")

    def voltage(node: str) -> float:
        return 0.0 if node == "0" else values[f"v({node.lower()})"]

    return SpiceResult(
        node_voltage=values["v(top)"],
        supply_current=-values["i(v1)"] if "i(v1)" in values else float("nan"),
        branch_current=tuple(values[f"i(vb{k})"] for k in range(spice.branches)),
        led_voltage=tuple(voltage(a) - voltage(c) for a, c in spice.led_nodes),
    )
