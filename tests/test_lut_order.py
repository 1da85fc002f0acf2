"""Column order, LUT size and sharing: permuting a spec's inputs leaves the LUT count unchanged, a larger k never
gives a larger network, and equal LUTs are built once. Networks checked against Python integer arithmetic."""

from __future__ import annotations

import numpy as np
import pytest

from plaforge.core.network import Lut, LutNetwork
from plaforge.core.table import Table
from plaforge.lut import map_luts
from plaforge.lut.mapper import tidy_network
from plaforge.minimize import minimize


def _arith(widths: tuple[int, int], op, order: list[int]) -> tuple[Table, list[int]]:
    """``op(a, b)`` for a of widths[0] bits and b of widths[1] bits; spec column c carries logical bit order[c]."""
    wa, wb = widths
    names = [f"a[{i}]" for i in range(wa)] + [f"b[{i}]" for i in range(wb)]
    width = (op((1 << wa) - 1, (1 << wb) - 1)).bit_length()

    def fn(p):
        logical = np.zeros_like(p)
        for c, bit in enumerate(order):
            logical |= ((p >> c) & 1) << bit
        r = op(logical & ((1 << wa) - 1), logical >> wa)
        return [(r >> i & 1).astype(bool) for i in range(width)]

    return Table.from_function([names[b] for b in order], [f"r[{i}]" for i in range(width)], fn), list(order)


def _random(n: int, m: int, seed: int, order: list[int]) -> Table:
    rng = np.random.default_rng(seed)
    draw = rng.random((m, 1 << n))
    pts = np.arange(1 << n)
    logical = np.zeros_like(pts)
    for c, bit in enumerate(order):
        logical |= ((pts >> c) & 1) << bit
    on = [draw[j][logical] < 0.4 for j in range(m)]
    dc = [(draw[j][logical] >= 0.4) & (draw[j][logical] < 0.5) for j in range(m)]
    return Table.from_function([f"x{b}" for b in order], [f"y{j}" for j in range(m)], lambda p: on, lambda p: dc)


def _check_arith(net: LutNetwork, order: list[int], op, wa: int) -> None:
    n = len(order)
    for p in range(1 << n):
        logical = sum((p >> c & 1) << bit for c, bit in enumerate(order))
        assert net.evaluate(p) == op(logical & ((1 << wa) - 1), logical >> wa)  # reference: Python integers


ADD = (lambda a, b: a + b)
MUL = (lambda a, b: a * b)


@pytest.mark.parametrize("widths, op, k", [((6, 6), ADD, 6), ((4, 4), MUL, 4), ((3, 3), MUL, 6)])
def test_permuting_operand_columns_keeps_the_count(widths, op, k):
    n = sum(widths)
    rng = np.random.default_rng(n * 7 + k)
    orders = [list(range(n)), [b for b in reversed(range(n))], [int(x) for x in rng.permutation(n)]]
    counts = []
    for order in orders:
        t, order = _arith(widths, op, order)
        net = map_luts(t, minimize(t), k)
        _check_arith(net, order, op, widths[0])
        counts.append(net.count)
    assert len(set(counts)) == 1, counts


def test_six_bit_adder_msb_first_needs_seven_luts_at_k6():
    # one LUT per sum bit (7 outputs, each a different function): the count lower bound, reached in either order
    t, order = _arith((6, 6), ADD, [5, 4, 3, 2, 1, 0, 11, 10, 9, 8, 7, 6])
    net = map_luts(t, minimize(t), 6)
    _check_arith(net, order, ADD, 6)
    assert net.count == 7


@pytest.mark.parametrize("n, m, seed", [(7, 3, 21), (7, 2, 22), (8, 2, 23)])
def test_permuting_random_columns_keeps_the_count(n, m, seed):
    rng = np.random.default_rng(seed)
    counts = []
    for order in (list(range(n)), [int(x) for x in rng.permutation(n)]):
        t = _random(n, m, seed, order)
        counts.append(map_luts(t, minimize(t), 4).count)
    assert counts[0] == counts[1]


def test_larger_k_never_gives_a_larger_network():
    # a 6-input, 32-output demultiplexer: y[i] = d when the 5-bit select equals i (Python integer comparison)
    names = [f"s[{i}]" for i in range(5)] + ["d"]
    t = Table.from_function(names, [f"y[{i}]" for i in range(32)],
                            lambda p: [((p & 31) == i) & ((p >> 5) == 1) for i in range(32)])
    cover = minimize(t)
    counts = [map_luts(t, cover, k).count for k in (3, 4, 5, 6)]
    assert counts == sorted(counts, reverse=True), counts
    net = map_luts(t, cover, 6)
    for p in range(64):
        assert net.evaluate(p) == ((1 << (p & 31)) if p >> 5 else 0)


def test_equal_luts_with_swapped_fan_ins_are_built_once():
    # common practice: AND is commutative, so AND(a, b) and AND(b, a) (both INIT 0x8) are one LUT
    net = LutNetwork(4, ("a", "b"), ("y", "z"), (Lut("p", ("a", "b"), 0x8), Lut("q", ("b", "a"), 0x8)), ("p", "q"))
    tidy = tidy_network(net)
    assert tidy.count == 1 and tidy.drivers == ("n0", "n0")
