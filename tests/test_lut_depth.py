"""The depth objective: never deeper than the area objective, never deeper than the Shannon bound, and the Shannon
multiplexer tree itself; each network checked against a reference outside plaforge (Python integer arithmetic,
math.sin, numpy random truth tables)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from plaforge.core.table import Table
from plaforge.lut import LutOptions, map_luts
from plaforge.lut.decompose import Decomposer, NetworkBuilder, shannon_depth, shannon_selects
from plaforge.lut.depth import output_levels
from plaforge.minimize import minimize


def _random_table(n: int, m: int, seed: int, p_dc: float = 0.1) -> tuple[Table, list[np.ndarray], list[np.ndarray]]:
    rng = np.random.default_rng(seed)
    draw = rng.random((m, 1 << n))
    on = [draw[j] < 0.45 for j in range(m)]
    dc = [(draw[j] >= 0.45) & (draw[j] < 0.45 + p_dc) for j in range(m)]
    t = Table.from_function([f"x{i}" for i in range(n)], [f"y{j}" for j in range(m)], lambda p: on, lambda p: dc)
    return t, on, dc


def _sine() -> Table:
    names = [f"x[{i}]" for i in range(8)]
    vals = [round(127.5 + 127.5 * math.sin(2 * math.pi * x / 256)) for x in range(256)]
    arr = np.array(vals, dtype=np.int64)
    return Table.from_function(names, [f"y[{i}]" for i in range(8)],
                               lambda p: [(arr[p] >> i & 1).astype(bool) for i in range(8)])


def test_shannon_select_count_and_bound():
    # integer arithmetic: the largest s with 2**s + s <= k is 1 for k = 3..5 (2 + 1 <= k < 4 + 2) and 2 for
    # k = 6..8 (4 + 2 <= k < 8 + 3); the bound is 1 + ceil((n - k) / s)
    assert [shannon_selects(k) for k in range(3, 9)] == [1, 1, 1, 2, 2, 2]
    assert shannon_depth(8, 4) == 5 and shannon_depth(20, 6) == 8 and shannon_depth(5, 6) == 1
    assert shannon_depth(9, 2) is None


@pytest.mark.parametrize("n, k, seed", [(9, 3, 1), (10, 4, 2), (11, 6, 3)])
def test_shannon_tree_meets_its_bound_and_computes_the_function(n, k, seed):
    t, on, dc = _random_table(n, 1, seed)
    builder = NetworkBuilder(t.input_names, k)
    dec = Decomposer(builder, k, reuse=False)
    u = builder.universe(tuple(range(n)))
    off = ~on[0] & ~dc[0]
    sig = dec.shannon(u, list(t.input_names), on[0] & ~dc[0], off)
    level: dict[str, int] = {}
    values = {name: (np.arange(1 << n) >> i & 1).astype(bool) for i, name in enumerate(t.input_names)}
    for node in builder.nodes:
        level[node.name] = 1 + max(level.get(x, 0) for x in node.inputs)
        idx = sum(values[x].astype(np.int64) << b for b, x in enumerate(node.inputs))
        bits = np.array([node.init >> q & 1 for q in range(1 << len(node.inputs))], dtype=bool)
        values[node.name] = bits[idx]
        assert len(node.inputs) <= k
    # reference: the numpy truth table the table was built from
    assert not (values[sig] & off).any() and (values[sig] | ~(on[0] & ~dc[0])).all()
    assert level[sig] <= shannon_depth(n, k)


@pytest.mark.parametrize("n, m, k, seed", [(7, 3, 3, 11), (8, 2, 4, 12), (8, 3, 4, 13), (8, 3, 6, 14)])
def test_depth_objective_never_deeper_than_area_nor_the_shannon_bound(n, m, k, seed):
    t, on, dc = _random_table(n, m, seed)
    cover = minimize(t)
    area = map_luts(t, cover, k)
    deep = map_luts(t, cover, k, LutOptions(objective="depth"))
    assert deep.depth <= area.depth
    for j, level in enumerate(output_levels(deep)):
        assert level <= shannon_depth(t.support(j).bit_count(), k)
    for p in range(1 << n):  # reference: the numpy truth tables
        got = deep.evaluate(p)
        for j in range(m):
            if not dc[j][p]:
                assert (got >> j & 1) == int(on[j][p])


def test_sine_table_at_k4_reaches_the_shannon_depth():
    # the sine table y = round(127.5 + 127.5 sin(2 pi x / 256)) (math.sin as reference); 8 inputs at k = 4 give
    # the Shannon bound 1 + ceil((8 - 4) / 1) = 5 levels
    t = _sine()
    net = map_luts(t, minimize(t), 4, LutOptions(objective="depth"))
    assert net.depth <= 5
    for x in range(256):
        assert net.evaluate(x) == round(127.5 + 127.5 * math.sin(2 * math.pi * x / 256))


def test_depth_objective_on_a_multiplier_computes_the_product():
    # 4 x 4-bit multiplier at k = 4 (Python integer multiplication as reference): some outputs take Shannon trees,
    # the others keep their own realizations
    names = [f"a[{i}]" for i in range(4)] + [f"b[{i}]" for i in range(4)]
    t = Table.from_function(names, [f"p[{i}]" for i in range(8)],
                            lambda p: [(((p & 15) * (p >> 4)) >> i & 1).astype(bool) for i in range(8)])
    net = map_luts(t, minimize(t), 4, LutOptions(objective="depth"))
    assert net.depth <= shannon_depth(8, 4)
    for p in range(256):
        assert net.evaluate(p) == (p & 15) * (p >> 4)


SINE8_DEPTH_K4 = 113  # LUTs measured at depth 5 with area recovery (379 before it)


def test_sine_table_depth_objective_recovers_area_at_the_same_depth():
    # math.sin as reference; the area objective's network is deeper (10 levels), the depth objective's holds 5
    t = _sine()
    cover = minimize(t)
    area = map_luts(t, cover, 4)
    deep = map_luts(t, cover, 4, LutOptions(objective="depth"))
    assert deep.depth <= 5 <= area.depth
    assert deep.count <= SINE8_DEPTH_K4
    for x in range(256):
        assert deep.evaluate(x) == round(127.5 + 127.5 * math.sin(2 * math.pi * x / 256))


@pytest.mark.parametrize("n, k, seed, slack", [(8, 4, 5, 0), (9, 3, 6, 0), (9, 4, 7, 1), (10, 6, 8, 0)])
def test_bounded_decomposition_stays_within_its_target_level(n, k, seed, slack):
    t, on, dc = _random_table(n, 2, seed)
    builder = NetworkBuilder(t.input_names, k)
    dec = Decomposer(builder, k, depth_aware=True)
    u = builder.universe(tuple(range(n)))
    target = shannon_depth(n, k) + slack
    sigs = [dec.bounded(u, list(t.input_names), on[j] & ~dc[j], ~on[j] & ~dc[j], target) for j in range(2)]
    values = {name: (np.arange(1 << n) >> i & 1).astype(bool) for i, name in enumerate(t.input_names)}
    for node in builder.nodes:
        idx = sum(values[x].astype(np.int64) << b for b, x in enumerate(node.inputs))
        bits = np.array([node.init >> q & 1 for q in range(1 << len(node.inputs))], dtype=bool)
        values[node.name] = bits[idx]
        assert len(node.inputs) <= k
    for j, sig in enumerate(sigs):
        assert dec.level(sig) <= target
        # reference: the numpy truth tables the table was built from
        care = ~dc[j]
        assert (values[sig][care] == on[j][care]).all()
