"""Safety cautions: where a board shows mains or more than 60 V DC, the report says so and defers
to the applicable standards, local codes and qualified review."""

from __future__ import annotations

from typing import Iterable

from ledlint.analysis.supplies import Supply
from ledlint.circuits.topology import Terminal
from ledlint.config import Config
from ledlint.netlist.model import Component, Netlist
from ledlint.parts.kinds import Kind, classify
from ledlint.parts.params import rail_params
from ledlint.parts.rails import is_mains_name

HIGH_VOLTAGE = 60.0  # V DC: above it the usual safety caution applies (SELV limit, common practice)


def cautions(netlist: Netlist, sources: Iterable[Terminal | None], supplies: Iterable[tuple[str, Supply | None]],
             config: Config) -> tuple[str, ...]:
    """Where the board shows mains or more than 60 V DC (the usual safety caution): mains net
    names, circuits fed by a bridge rectifier, circuits and rails above 60 V."""
    out = []
    mains = sorted({n.name for n in netlist.nets if is_mains_name(n.name)})
    if mains:
        out.append(f"mains nets on the board: {', '.join(mains[:5])}")
    bridges = sorted({t.pin.ref for t in sources if t and t.pin
                      and classify(netlist.component(t.pin.ref) or Component("", "")) is Kind.BRIDGE})
    if bridges:
        out.append(f"LEDs fed by rectifier {', '.join(bridges)} (an AC input, possibly mains)")
    # One caution for everything above the limit, each with the figure that crossed it: a rail
    # named 58 V crosses it only at its +5 % maximum, and the reader should see why.
    high = []
    for n in netlist.nets:
        r = rail_params(n.name, config)
        if r and not r.ground and (peak := max(abs(r.maximum), abs(r.minimum))) > HIGH_VOLTAGE:
            high.append(f"net {n.name} up to {peak:.3g} V ({r.nominal:g} V nominal)")
    if len(high) > 5:
        high[5:] = [f"{len(high) - 5} more such nets"]
    circuits = sorted({cid for cid, s in supplies
                       if s and max(abs(s.volts.maximum), abs(s.volts.minimum)) > HIGH_VOLTAGE})
    if circuits:
        more = f" and {len(circuits) - 5} more" if len(circuits) > 5 else ""
        high.append(f"LED circuit{'s' if len(circuits) > 1 else ''} {', '.join(circuits[:5])}{more}")
    if high:
        out.append(f"above {HIGH_VOLTAGE:g} V DC: {'; '.join(high)}")
    return tuple(out)
