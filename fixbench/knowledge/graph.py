"""A family's stages and links as a networkx DiGraph, and the order power flows through it."""

from __future__ import annotations

import networkx as nx

from fixbench.knowledge.model import Family


def stage_graph(family: Family) -> nx.DiGraph:
    """Stages as nodes (with title, role, side), links as edges (with kind: power or control)."""
    graph = nx.DiGraph(family=family.id)
    for stage in family.stages:
        graph.add_node(stage.id, title=stage.title, role=stage.role, side=stage.side)
    for link in family.links:
        graph.add_edge(link.source, link.target, kind=link.kind)
    return graph


def power_order(family: Family) -> list[str]:
    """Stages in the order power reaches them (a topological order of the power links); stages no
    power link reaches come last, in file order."""
    power = nx.DiGraph()
    power.add_nodes_from(s.id for s in family.stages)
    power.add_edges_from((l.source, l.target) for l in family.links if l.kind == "power")
    file_order = {s.id: i for i, s in enumerate(family.stages)}
    return list(nx.lexicographical_topological_sort(power, key=lambda s: file_order[s]))
