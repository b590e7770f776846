#!/usr/bin/env python3
"""Reference values for tests/immunize.rs, computed with networkx and scipy
(general-purpose libraries), independent of spreadplan.

Run from the repository root:  python3 tests/reference/immunize_reference.py
Writes tests/reference/immunize_reference.json.

1. Zachary's karate club and Les Miserables (networkx's built-in copies,
   node names as ids). Node indices = order of first appearance in the edge
   list below (the same rule spreadplan's loader uses). Static degree order
   and adaptive degree order, both breaking ties by the lower index; the
   largest connected component after removing the first k nodes.
2. Targeted (highest-degree-first) removal threshold on a power-law
   configuration model, Callaway, Newman, Strogatz & Watts (2000), PRL
   85:5468: with occupation q_k (1 below the cut class, fractional at it, 0
   above), the giant component vanishes where
   sum_k k (k-1) p_k q_k / sum_k k p_k = 1 (T = 1). Solved with scipy's brentq.
3. Random immunization on the same distribution: v_c = (1 - 1/(T kappa))/eff,
   kappa = (<k^2> - <k>)/<k> (Callaway et al. 2000; Cohen et al. 2000).
"""
import json
import os

import networkx as nx
from scipy.optimize import brentq


def indexed_edges(g):
    index = {}
    edges = []
    for u, v in g.edges():
        for x in (u, v):
            if x not in index:
                index[x] = len(index)
        edges.append((str(u), str(v)))
    return index, edges


def largest_after(g, order, ks):
    out = []
    for k in ks:
        h = g.copy()
        h.remove_nodes_from(order[:k])
        out.append(max((len(c) for c in nx.connected_components(h)), default=0))
    return out


def static_degree(g, index):
    return sorted(g.nodes(), key=lambda v: (-g.degree(v), index[v]))


def adaptive_degree(g, index):
    h = g.copy()
    order = []
    while h.number_of_nodes():
        v = max(h.nodes(), key=lambda v: (h.degree(v), -index[v]))
        order.append(v)
        h.remove_node(v)
    return order


def graph_case(name, g):
    index, edges = indexed_edges(g)
    ks = list(range(0, 11))
    st = static_degree(g, index)
    ad = adaptive_degree(g, index)
    return {
        "name": name,
        "edges": edges,
        "nodes": g.number_of_nodes(),
        "k": ks,
        "static_order": [str(v) for v in st[:10]],
        "adaptive_order": [str(v) for v in ad[:10]],
        "static_largest": largest_after(g, st, ks),
        "adaptive_largest": largest_after(g, ad, ks),
    }


def powerlaw(alpha, kmin, kmax):
    w = {k: k ** (-alpha) for k in range(kmin, kmax + 1)}
    z = sum(w.values())
    return {k: x / z for k, x in w.items()}


def targeted_threshold(p):
    mean = sum(k * x for k, x in p.items())
    ks = sorted(p)

    def excess(f):
        # remove the top fraction f of people, highest degrees first
        left = f
        total = 0.0
        for k in reversed(ks):
            take = min(left, p[k])
            left -= take
            total += k * (k - 1) * (p[k] - take)
        return total / mean - 1.0

    return brentq(excess, 0.0, 1.0, xtol=1e-12)


def kappa(p):
    m1 = sum(k * x for k, x in p.items())
    m2 = sum(k * k * x for k, x in p.items())
    return (m2 - m1) / m1


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    cases = [
        graph_case("karate", nx.karate_club_graph()),
        graph_case("lesmis", nx.les_miserables_graph()),
    ]
    alpha, kmin, kmax = 2.7, 2, 60
    p = powerlaw(alpha, kmin, kmax)
    t, eff = 0.3, 0.8
    kap = kappa(p)
    out = {
        "networkx": nx.__version__,
        "graphs": cases,
        "powerlaw": {
            "alpha": alpha,
            "kmin": kmin,
            "kmax": kmax,
            "targeted_fc": targeted_threshold(p),
            "kappa": kap,
            "transmissibility": t,
            "efficacy": eff,
            "random_vc": (1.0 - 1.0 / (t * kap)) / eff,
        },
    }
    with open(os.path.join(here, "immunize_reference.json"), "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
