"""A networkx view of a netlist: net, pin and component nodes, and the queries on them.

Nodes are ("net", name), ("pin", ref, number) and ("part", ref); every pin joins its
component and, when connected, its net. Walking "through" a part goes pin → part → pin.
"""

from __future__ import annotations

from typing import Iterator

from ledlint.netlist.model import Component, Net, Netlist, Pin


def net_node(name: str) -> tuple[str, str]:
    return ("net", name)


def pin_node(ref: str, number: str) -> tuple[str, str, str]:
    return ("pin", ref, number)


def part_node(ref: str) -> tuple[str, str]:
    return ("part", ref)


class NetGraph:
    """Connectivity queries over one netlist (read-only once built)."""

    def __init__(self, netlist: Netlist) -> None:
        import networkx as nx  # loaded when a board is checked, not to list the rules

        self.netlist = netlist
        g: nx.Graph[object] = nx.Graph()
        # Built in bulk: a board's nodes and edges number in the hundreds of thousands.
        g.add_nodes_from((net_node(net.name), {"net": net}) for net in netlist.nets)
        g.add_nodes_from((part_node(c.ref), {"component": c}) for c in netlist.components)
        g.add_nodes_from((pin_node(p.ref, p.number), {"pin": p}) for c in netlist.components for p in c.pins)
        g.add_edges_from((part_node(p.ref), pin_node(p.ref, p.number)) for c in netlist.components for p in c.pins)
        g.add_edges_from((pin_node(p.ref, p.number), net_node(p.net)) for c in netlist.components for p in c.pins
                         if p.net is not None)
        self.g = g

    def component(self, ref: str) -> Component | None:
        return self.netlist.component(ref)

    def net(self, name: str) -> Net | None:
        return self.netlist.net(name)

    def nets_of(self, ref: str) -> dict[str, str]:
        """Pin number → net name for every connected pin of a component."""
        comp = self.netlist.component(ref)
        return {p.number: p.net for p in comp.pins if p.net is not None} if comp else {}

    def pins_on(self, net: str) -> tuple[Pin, ...]:
        """The component pins on a net."""
        node = net_node(net)
        if node not in self.g:
            return ()
        return tuple(self.g.nodes[n]["pin"] for n in self.g.neighbors(node))

    def degree(self, net: str) -> int:
        """How many component pins sit on a net."""
        node = net_node(net)
        return self.g.degree(node) if node in self.g else 0

    def across(self, ref: str, number: str) -> str | None:
        """For a two-terminal part, the net on the side opposite pin `number`."""
        part = part_node(ref)
        if part not in self.g or self.g.degree(part) != 2:
            return None
        pins = list(self.g.neighbors(part))
        if number not in (node[2] for node in pins):
            return None  # not a pin of this part: there is no "other side"
        for node in pins:
            if node[2] != number:
                pin: Pin = self.g.nodes[node]["pin"]
                return pin.net
        return None

    def parts_on(self, net: str) -> Iterator[Component]:
        """The distinct components with a pin on a net, in pin order."""
        seen: set[str] = set()
        for pin in self.pins_on(net):
            if pin.ref not in seen:
                seen.add(pin.ref)
                comp = self.netlist.component(pin.ref)
                if comp is not None:
                    yield comp
