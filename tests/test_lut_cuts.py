"""Cut-based mapping: the FlowMap depth guarantee checked by brute force on small subject graphs.

Guarantee under test (FlowMap, Cong and Ding 1994): with every k-feasible cut kept, the mapped depth equals the
minimum depth over all k-LUT covers of the subject graph. The brute force enumerates cuts by a different method
(every node set of size <= k, checked by path search) and tries every combination of cut choices.
"""

from __future__ import annotations

import random

import numpy as np
import pytest
from lut_bruteforce import min_depth_bruteforce

from plaforge.core.network import LutNetwork
from plaforge.core.table import Table
from plaforge.lut import LutOptions, map_luts
from plaforge.lut.cuts import SubjectGraph, graph_from_network, map_subject, mapping_to_luts
from plaforge.minimize import minimize


def _random_graph(rnd: random.Random, n_pis: int, gates: int) -> SubjectGraph:
    g = SubjectGraph(tuple(f"i{b}" for b in range(n_pis)))
    while len(g) < n_pis + gates:
        a, b = rnd.sample(range(len(g)), 2)
        func = rnd.choice([0b1000, 0b1110, 0b0110, 0b0100, 0b0010, 0b0111, 0b1001])  # non-degenerate gates
        g.add((a, b), func)
    top = len(g) - 1
    g.outputs = [top, rnd.randrange(n_pis, top + 1)]
    return g


def _eval_graph(g: SubjectGraph, point: int) -> list[int]:
    vals = [point >> b & 1 for b in range(g.n_pis)]
    for v in range(g.n_pis, len(g)):
        idx = sum(vals[u] << b for b, u in enumerate(g.fanins[v]))
        vals.append(g.funcs[v] >> idx & 1)
    return [vals[o] for o in g.outputs]  # type: ignore[index]


@pytest.mark.parametrize("seed", range(12))
@pytest.mark.parametrize("k", [3, 4])
def test_depth_is_minimum_over_all_cut_covers(seed, k):
    rnd = random.Random(seed * 10 + k)
    g = _random_graph(rnd, n_pis=rnd.randint(3, 6), gates=rnd.randint(4, 8))
    m = map_subject(g, k, cut_limit=0)
    assert m.exhaustive
    assert m.depth == min_depth_bruteforce(g, k)
    # and the LUTs compute what the graph computes
    luts, drivers = mapping_to_luts(m)
    net = LutNetwork(k, g.pi_names, ("o0", "o1"), tuple(luts), tuple(drivers))
    assert all(len(lut.inputs) <= k for lut in luts)
    for p in range(1 << g.n_pis):
        got = net.evaluate(p)
        assert [got & 1, got >> 1 & 1] == _eval_graph(g, p)


def test_relaxed_mapping_never_uses_more_luts_than_needed_for_a_chain():
    # a chain of 2-input ANDs over 6 inputs: one 6-LUT suffices (common practice), 3-LUTs need 3 (tree bound)
    g = SubjectGraph(tuple(f"i{b}" for b in range(6)))
    v = g.add((0, 1), 0b1000)
    for b in range(2, 6):
        v = g.add((v, b), 0b1000)
    g.outputs = [v]
    assert map_subject(g, 6).count == 1
    m3 = map_subject(g, 3)
    assert m3.count == 3 and m3.depth == 3  # chain: depth 3 is the best over its own cuts
    assert min_depth_bruteforce(g, 3) == 3


@pytest.mark.parametrize("seed", range(6))
def test_mapper_depth_is_optimal_for_its_decomposed_network(seed):
    # map_luts with objective "depth": its depth equals the minimum over every cut cover of the network the
    # decomposition built (the subject graph of its cut pass)
    rnd = np.random.default_rng(seed)
    n = 6
    vals = rnd.random(1 << n) < 0.5
    t = Table.from_function([f"x{i}" for i in range(n)], ["y"], lambda p: [vals[p]])
    k = 3 + seed % 2
    cover = minimize(t)
    base = map_luts(t, cover, k, LutOptions(remap=False))
    best = map_luts(t, cover, k, LutOptions(objective="depth", cut_limit=0))
    g = graph_from_network(base)
    if len(g) - g.n_pis > 9:
        pytest.skip(f"decomposed network of {len(g) - g.n_pis} LUTs is too large to brute-force")
    assert best.depth == min_depth_bruteforce(g, k)
    assert best.depth <= base.depth
