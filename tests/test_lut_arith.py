"""Arithmetic tables: the word-level additive decomposition (plaforge.lut.arith) and what it gives the mapper on
multipliers. Networks are checked by exhaustive evaluation against Python integer arithmetic (the product ``a * b``,
common practice)."""

from __future__ import annotations

import numpy as np
import pytest

from plaforge.core.table import Table
from plaforge.lut import LutOptions, map_luts
from plaforge.lut.arith import additive_split, interaction_graph, moebius
from plaforge.minimize import minimize

MUL4X4_K4 = 26  # LUTs measured for the 4x4-bit multiplier at k = 4 (63 before the additive decomposition)
MUL4X4_K6 = 15  # the same at k = 6 (20 before)


def _multiplier(wa: int, wb: int, order: list[int] | None = None) -> tuple[Table, list[int]]:
    """``r = a * b``; spec column ``c`` carries logical input ``order[c]`` (``a[0..wa-1]`` then ``b[0..wb-1]``)."""
    n = wa + wb
    order = list(range(n)) if order is None else order
    names = [f"a[{i}]" for i in range(wa)] + [f"b[{i}]" for i in range(wb)]

    def fn(p):
        logical = np.zeros_like(p)
        for c, bit in enumerate(order):
            logical |= ((p >> c) & 1) << bit
        r = (logical & ((1 << wa) - 1)) * (logical >> wa)
        return [(r >> i & 1).astype(bool) for i in range(n)]

    table = Table.from_function([names[b] for b in order], [f"r[{i}]" for i in range(n)], fn)
    return table, order


def _check_product(net, order: list[int], wa: int) -> None:
    for p in range(1 << len(order)):
        logical = sum((p >> c & 1) << bit for c, bit in enumerate(order))
        a, b = logical & ((1 << wa) - 1), logical >> wa
        assert net.evaluate(p) == a * b, (p, a, b)  # reference: Python integer multiplication


@pytest.mark.parametrize("k, figure", [(4, MUL4X4_K4), (6, MUL4X4_K6)])
def test_four_by_four_multiplier_meets_the_measured_count(k, figure):
    t, order = _multiplier(4, 4)
    net = map_luts(t, minimize(t), k)
    assert net.count <= figure, (k, net.count)
    assert all(len(lut.inputs) <= k for lut in net.luts)
    _check_product(net, order, 4)


def test_four_by_four_multiplier_at_k4_is_within_the_issue_aim_in_any_column_order():
    rng = np.random.default_rng(12)
    orders = [list(range(8)),
              [4, 5, 6, 7, 0, 1, 2, 3],  # b given before a
              [0, 4, 1, 5, 2, 6, 3, 7],  # a and b interleaved
              [int(x) for x in rng.permutation(8)]]
    counts = []
    for order in orders:
        t, order = _multiplier(4, 4, order)
        net = map_luts(t, minimize(t), 4)
        _check_product(net, order, 4)
        counts.append(net.count)
    assert len(set(counts)) == 1, counts
    assert counts[0] <= MUL4X4_K4


def test_unequal_multiplier_count_is_monotone_in_k_and_order_free():
    # a 4x3-bit multiplier (7 inputs, 7 outputs), operands swapped as a second column order
    counts = {}
    for order in (list(range(7)), [4, 5, 6, 0, 1, 2, 3]):
        t, order = _multiplier(4, 3, order)
        cover = minimize(t)
        row = []
        for k in (3, 4, 5, 6):
            net = map_luts(t, cover, k)
            _check_product(net, order, 4)
            row.append(net.count)
        counts[tuple(order)] = row
    rows = list(counts.values())
    assert rows[0] == rows[1], counts
    assert rows[0] == sorted(rows[0], reverse=True), rows[0]


def test_moebius_coefficients_rebuild_the_function():
    # the multilinear form sum_S c_S prod_{i in S} x_i evaluated directly at every point (integer arithmetic)
    rng = np.random.default_rng(3)
    n = 5
    values = rng.integers(0, 50, 1 << n)
    c = moebius(values, n)
    for p in range(1 << n):
        assert sum(int(c[s]) for s in range(1 << n) if s & p == s) == values[p]


def test_product_word_splits_on_one_operand():
    # a * b = sum_j 2**j * b_j * a (common practice): the monomials are a_i * b_j, so the interaction graph is
    # complete bipartite between the operands and the smallest separator is one whole operand
    n = 6
    p = np.arange(1 << n)
    word = (p & 7) * (p >> 3)
    adj = interaction_graph(word, n)
    assert adj == [0b111000] * 3 + [0b000111] * 3
    cmask, comps = additive_split(word, n)
    assert cmask in (0b000111, 0b111000)
    assert sorted(comps) == sorted(1 << i for i in range(n) if not cmask >> i & 1)


def test_words_without_a_separator_give_none():
    # the parity of 4 inputs times 8 (one output bit set) is not a sum of functions of fewer inputs: in its
    # multilinear form every pair of inputs shares a monomial
    n = 4
    p = np.arange(1 << n)
    parity = np.array([int(x).bit_count() & 1 for x in p]) * 8
    assert additive_split(parity, n) is None
    # a sum of independent terms splits with no separator at all: (x0 & x1) + 2 * (x2 | x3)
    word = ((p & 1) & (p >> 1 & 1)) + 2 * ((p >> 2 & 1) | (p >> 3 & 1))
    cmask, comps = additive_split(word, n)
    assert cmask == 0 and sorted(comps) == [0b0011, 0b1100]


def test_tables_with_dont_cares_are_left_to_the_other_methods():
    # a 3x3-bit product with r[0] a don't-care at a = b = 7: no integer word, the mapper still meets the table
    names = [f"a[{i}]" for i in range(3)] + [f"b[{i}]" for i in range(3)]
    t = Table.from_function(names, [f"r[{i}]" for i in range(6)],
                            lambda p: [(((p & 7) * (p >> 3)) >> i & 1).astype(bool) for i in range(6)],
                            lambda p: [(p == 63) & (i == 0) for i in range(6)])
    net = map_luts(t, minimize(t), 4)
    assert "additive" not in net.method
    for p in range(64):
        mask = ~1 if p == 63 else ~0  # r[0] is free at a = b = 7
        assert net.evaluate(p) & mask == ((p & 7) * (p >> 3)) & mask  # reference: Python integer multiplication


def test_depth_objective_is_not_deeper_than_area_on_the_multiplier():
    t, order = _multiplier(4, 4)
    cover = minimize(t)
    area = map_luts(t, cover, 4)
    depth = map_luts(t, cover, 4, LutOptions(objective="depth"))
    _check_product(depth, order, 4)
    assert depth.depth <= area.depth


def test_product_bits_listed_most_significant_first_map_the_same():
    # the same 4x4-bit product with the output columns r[7] .. r[0]: the word is read the other way round
    t, _ = _multiplier(4, 4)
    lsb_first = map_luts(t, minimize(t), 4).count
    names = [f"a[{i}]" for i in range(4)] + [f"b[{i}]" for i in range(4)]
    rev = Table.from_function(names, [f"r[{7 - i}]" for i in range(8)],
                              lambda p: [(((p & 15) * (p >> 4)) >> (7 - i) & 1).astype(bool) for i in range(8)])
    net = map_luts(rev, minimize(rev), 4)
    assert net.count == lsb_first
    for p in range(256):
        got = net.evaluate(p)
        assert sum((got >> j & 1) << (7 - j) for j in range(8)) == (p & 15) * (p >> 4)  # Python integers
