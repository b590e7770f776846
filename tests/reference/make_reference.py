#!/usr/bin/env python3
"""Writes the networkx reference values the Rust tests compare against.

Run from the repository root:  python3 tests/reference/make_reference.py
Needs: pip install networkx numpy

Datasets (both ship with networkx):
- Zachary's karate club (Zachary 1977, J. Anthropol. Res. 33:452-473):
  networkx.karate_club_graph()
- Les Miserables co-appearances (Knuth 1993, The Stanford GraphBase):
  networkx.les_miserables_graph()

Outputs:
- tests/data/karate.csv   source,target           (no weights)
- tests/data/lesmis.csv   source,target,weight    (co-appearance counts)
- tests/reference/networkx_reference.json
"""
import json
import os

import networkx as nx

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))


def write_edges(g, name, weight):
    path = os.path.join(ROOT, "tests", "data", name)
    with open(path, "w", newline="\n") as f:
        f.write("source,target,weight\n" if weight else "source,target\n")
        for u, v, d in g.edges(data=True):
            if weight:
                f.write(f"{u},{v},{d['weight']}\n")
            else:
                f.write(f"{u},{v}\n")


def summary(g, source, fixture):
    ids = [str(v) for v in g.nodes()]
    comps = sorted((len(c) for c in nx.connected_components(g)), reverse=True)
    core = nx.core_number(g)
    return {
        "source": source,
        "fixture": fixture,
        "nodes": g.number_of_nodes(),
        "edges": g.number_of_edges(),
        "degree": {str(v): d for v, d in g.degree()},
        "components": len(comps),
        "component_sizes": comps,
        "core_number": {str(v): core[v] for v in g.nodes()},
        "max_core": max(core.values()),
        "transitivity": nx.transitivity(g),
        "degree_assortativity": nx.degree_assortativity_coefficient(g),
        "node_order": ids,
    }


def main():
    karate = nx.karate_club_graph()
    lesmis = nx.les_miserables_graph()
    write_edges(karate, "karate.csv", weight=False)
    write_edges(lesmis, "lesmis.csv", weight=True)
    out = {
        "generator": "tests/reference/make_reference.py",
        "networkx_version": nx.__version__,
        "datasets": {
            "karate": summary(
                karate, "Zachary 1977 via networkx.karate_club_graph()", "tests/data/karate.csv"
            ),
            "lesmis": summary(
                lesmis, "Knuth 1993 via networkx.les_miserables_graph()", "tests/data/lesmis.csv"
            ),
        },
    }
    path = os.path.join(ROOT, "tests", "reference", "networkx_reference.json")
    with open(path, "w", newline="\n") as f:
        json.dump(out, f, indent=1, sort_keys=False)
        f.write("\n")


if __name__ == "__main__":
    main()
