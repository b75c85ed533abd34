"""Analysis of a whole board: each recognised circuit's operating point over tolerance, supply and
temperature, by the analyser of its kind, with the engine solves of every circuit batched.

Builds the engine's description of a circuit from the recogniser's topology and the parts'
parameters, solves its corners (and a Monte Carlo for parallel strings), and derives what the
rules compare with limits. Knows nothing of rules.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any, Callable

from ledlint.analysis.batch import Job, solve_all
from ledlint.analysis.current import analyse_driver, analyse_sink
from ledlint.analysis.elements import Parts
from ledlint.analysis.results import Analysis, BoardAnalysis, Computed, Incomplete
from ledlint.analysis.safety import cautions
from ledlint.analysis.supplies import rail_of
from ledlint.analysis.voltage import analyse_bank, analyse_string
from ledlint.circuits.addressable import Addressable
from ledlint.circuits.bank import ResistorBank
from ledlint.circuits.circuit import LedCircuit, Wired
from ledlint.circuits.driver import DriverOutput
from ledlint.circuits.graph import NetGraph
from ledlint.circuits.recognise import recognise
from ledlint.circuits.sink import CurrentSink
from ledlint.circuits.string import SeriesString
from ledlint.config import Config
from ledlint.engine import ModelError
from ledlint.netlist.model import Netlist
from ledlint.parts.params import Missing

# The analyser of each circuit kind that has one; the others (addressable, multiplexed, not
# fitted, unrecognised) are listed with their rail, not computed.
ANALYSERS: dict[type[LedCircuit], Callable[[Parts, Any], Analysis | Job[Analysis]]] = {
    SeriesString: analyse_string,
    ResistorBank: analyse_bank,
    CurrentSink: analyse_sink,
    DriverOutput: analyse_driver,
}


def _rail(graph: NetGraph, config: Config, c: LedCircuit) -> str:
    if isinstance(c, Addressable):  # the LEDs' own supply pins are on the source net
        return c.source.net if c.source else ""
    far = [b.far for b in c.branches] if isinstance(c, Wired) else []
    return rail_of(graph, config, [*c.ends, *far])


def analyse(netlist: Netlist, config: Config) -> BoardAnalysis:
    """Recognise and analyse every LED circuit of a netlist."""
    graph = NetGraph(netlist)
    circuits = recognise(graph, config)
    parts = Parts(graph, config)

    def start(c: LedCircuit) -> Analysis | Job[Analysis]:
        analyser = ANALYSERS.get(type(c))
        return analyser(parts, c) if analyser else Analysis(c)

    def unmodelled(i: int, exc: ModelError) -> Analysis:
        return Incomplete(circuits[i], missing=(Missing("a usable model", f"the part values cannot be modelled: "
                                                        f"{exc.message}", "check the LED and resistor values"),))

    analyses = solve_all([start(c) for c in circuits], unmodelled)
    given = config.ambient_set
    ambient = (f"ambient {config.ambient_min_c:g} to {config.ambient_max_c:g} °C "
               f"({config.path + ' [ambient]' if given else 'the default for an indoor product; set [ambient]'})")
    done = tuple(replace(a, ambient_basis=ambient, rail=_rail(graph, config, a.circuit)) if isinstance(a, Computed)
                 else replace(a, rail=_rail(graph, config, a.circuit)) for a in analyses)
    supplies = [(a.circuit.id, a.supply if isinstance(a, (Incomplete, Computed)) else None) for a in done]
    caution = cautions(netlist, [c.ends[0] for c in circuits], supplies, config)
    return BoardAnalysis(netlist, circuits, done, caution)
