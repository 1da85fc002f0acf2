"""LUT networks for wider functions, each checked against a reference outside plaforge (Python integer
arithmetic, pyeda expressions), with don't-cares; the lower bounds; SAT verification beyond enumeration."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from tables import adder

from plaforge.core.cube import Cover, Cube
from plaforge.core.errors import InternalError
from plaforge.core.network import Lut, LutNetwork
from plaforge.core.table import Table
from plaforge.lut import LutOptions, lower_bounds, map_luts
from plaforge.minimize import minimize
from plaforge.verify.satcnf import check_network_any, check_network_sat


def _eval_all(net: LutNetwork, n: int) -> list[int]:
    return [net.evaluate(p) for p in range(1 << n)]


@pytest.mark.parametrize("w, k", [(3, 3), (4, 4), (6, 6), (6, 4)])
def test_adder_matches_integer_addition(w, k):
    t = adder(w)
    net = map_luts(t, minimize(t), k=k)
    assert all(len(lut.inputs) <= k for lut in net.luts)
    mask = (1 << w) - 1
    for p, got in enumerate(_eval_all(net, 2 * w)):
        assert got == (p & mask) + (p >> w)  # reference: Python integer addition
    lb = net.lower_bounds
    assert net.count >= lb["count"] and net.depth >= lb["depth"]


def test_six_bit_adder_with_6_luts_is_within_half_again_of_the_bound():
    # the aim: at most 1.5x the LUT-count lower bound on the 6-bit adder with k = 6
    t = adder(6)
    net = map_luts(t, minimize(t), k=6)
    assert net.lower_bounds["count"] == 7  # seven different non-trivial outputs
    assert net.count <= 1.5 * net.lower_bounds["count"]


def test_wide_and_tree_meets_the_tree_bounds():
    # common practice: a tree of k-LUTs of depth d reaches at most k**d inputs and c LUTs at most c(k-1)+1,
    # so a 16-input AND needs 5 four-input LUTs in 2 levels, and that is achievable.
    names = [f"x{i}" for i in range(16)]
    t = Table.from_function(names, ["y"], lambda p: [p == (1 << 16) - 1])
    net = map_luts(t, minimize(t), k=4, options=LutOptions(objective="depth"))
    assert (net.lower_bounds["count"], net.lower_bounds["depth"]) == (5, 2)
    assert (net.count, net.depth) == (5, 2)
    assert net.evaluate((1 << 16) - 1) == 1 and net.evaluate((1 << 16) - 2) == 0


def test_names_are_deterministic_and_avoid_inputs():
    t = Table.from_function(["n0", "n1", "n2", "n3", "n4"], ["y"], lambda p: [(p % 3 == 0) ^ (p > 20)])
    a, b = map_luts(t, minimize(t), k=3), map_luts(t, minimize(t), k=3)
    assert a.to_json() == b.to_json()  # byte-identical
    assert all(lut.name.startswith("n_") for lut in a.luts)
    assert [lut.name for lut in a.luts] == [f"n_{i}" for i in range(a.count)]


# -- against pyeda expressions, with don't-cares ------------------------------------------------------------------
EXPRESSIONS = [
    "x[0] & x[1] | x[2] & x[3] & ~x[4] | x[5] ^ x[6]",
    "(x[0] ^ x[1] ^ x[2] ^ x[3] ^ x[4] ^ x[5] ^ x[6] ^ x[7])",
    "x[7] & (x[0] | x[1]) | ~x[7] & (x[2] & x[3] | x[4] & ~x[5] & x[6])",
]


@pytest.mark.parametrize("text", EXPRESSIONS)
@pytest.mark.parametrize("k", [3, 4, 6])
def test_pyeda_expressions(text, k):
    from pyeda.inter import expr, exprvars

    x = exprvars("x", 8)
    f = expr(text)
    ref = np.array([int(f.restrict({x[i]: p >> i & 1 for i in range(8)})) for p in range(256)], dtype=bool)
    dc = (np.arange(256) % 7 == 3)  # some don't-cares
    t = Table.from_function([f"x{i}" for i in range(8)], ["y"], lambda p: [ref[p]], lambda p: [dc[p]])
    net = map_luts(t, minimize(t), k=k)
    for p in range(256):
        if not dc[p]:
            assert net.evaluate(p) == int(ref[p])  # reference: pyeda expression evaluation


@settings(max_examples=25, deadline=None)
@given(st.integers(min_value=2, max_value=7), st.integers(min_value=1, max_value=3),
       st.integers(min_value=2, max_value=5), st.randoms(use_true_random=False))
def test_random_tables_with_dont_cares(n, m, k, rnd):
    size = 1 << n
    vals = [np.array([rnd.random() < 0.5 for _ in range(size)]) for _ in range(m)]
    dcs = [np.array([rnd.random() < 0.3 for _ in range(size)]) for _ in range(m)]
    t = Table.from_function([f"i{b}" for b in range(n)], [f"o{j}" for j in range(m)],
                            lambda p: [v[p] for v in vals], lambda p: [d[p] for d in dcs])
    net = map_luts(t, minimize(t), k=k, options=LutOptions(verify=False))
    for p in range(size):
        got = net.evaluate(p)
        for j in range(m):
            if not dcs[j][p]:
                assert got >> j & 1 == int(vals[j][p])  # reference: the random table itself
    lb = lower_bounds(t, k)
    assert net.count >= lb["count"] and net.depth >= lb["depth"]


# -- SAT verification ------------------------------------------------------------------------------------------------
def test_sat_check_agrees_with_enumeration_and_finds_a_real_counterexample():
    t = adder(4)
    net = map_luts(t, minimize(t), k=4)
    assert check_network_sat(t, net).passed
    # flip one INIT bit of the LUT driving the top sum bit
    victim = net.drivers[-1]
    bad_luts = tuple(Lut(l.name, l.inputs, l.init ^ 1) if l.name == victim else l for l in net.luts)
    bad = LutNetwork(net.k, net.input_names, net.output_names, bad_luts, net.drivers)
    sat, exh = check_network_sat(t, bad), check_network_any(t, bad)
    assert not sat.passed and not exh.passed
    failing = [o for o in sat.outputs if not o.passed]
    assert failing and all(o.method == "sat" for o in failing)
    p, expected, actual = failing[0].failure
    j = t.output_names.index(failing[0].name)
    assert ((p & 15) + (p >> 4)) >> j & 1 == expected  # reference: integer addition at the counterexample
    assert bad.evaluate(p) >> j & 1 == actual


def test_wide_table_is_mapped_and_proven_without_enumerating():
    # 30 inputs, given as cubes: y = (x0..x9 all 1) OR (x10..x29 all 0 AND x0 = 0); z = NOT x29
    n = 30
    names = [f"x{i}" for i in range(n)]
    c1 = Cube((1 << 10) - 1, (1 << 10) - 1)
    c2 = Cube(((1 << 20) - 1) << 10 | 1, 0)
    z = Cube(1 << 29, 0, 2)
    t = Table(tuple(names), ("y", "z"), ((c1, c2), (z.with_outputs(2),)), ((), ()), (None, None))
    net = map_luts(t, minimize(t), k=6)
    assert net.drivers[1] != "x29"
    verdict = check_network_any(t, net)
    assert verdict.passed and all(o.method == "sat" for o in verdict.outputs)
    # spot checks against the definition
    assert net.evaluate((1 << 10) - 1) & 1 == 1
    assert net.evaluate(0) & 1 == 1 and net.evaluate(1) & 1 == 0
    assert net.evaluate(1 << 29) >> 1 & 1 == 0 and net.evaluate(0) >> 1 & 1 == 1
    # bounds by SAT: y depends essentially on all 30 inputs
    assert net.lower_bounds["depth"] == 2 and net.lower_bounds["count_cone"] == 6


def test_bad_arguments():
    t = adder(2)
    with pytest.raises(ValueError, match="k must be between 2 and 8, not 9"):
        map_luts(t, minimize(t), k=9)
    with pytest.raises(TypeError, match="needs a Table"):
        map_luts("t.pla", minimize(t))  # type: ignore[arg-type]
    with pytest.raises(TypeError, match="needs a Cover of the table, not Table"):
        map_luts(t, t)  # type: ignore[arg-type]
    other = Table.from_function(["a", "b", "c", "d"], t.output_names, lambda p: [p & 1 > 0] * 3)
    with pytest.raises(ValueError, match=r"the cover has inputs \['a', 'b', 'c', 'd'\].*the table has inputs"):
        map_luts(t, minimize(other))
    with pytest.raises(ValueError, match="objective must be 'area' or 'depth'"):
        LutOptions(objective="speed")  # type: ignore[arg-type]


def test_lut_budget_falls_back_to_cuts_on_the_cover():
    # a seeded random 8-input function: decomposition needs more than 3 LUTs, so with a budget of 3 the output is
    # rolled back and mapped by cuts on the cover; both networks must match the table (reference: the array)
    rnd = np.random.default_rng(5)
    vals = rnd.random(256) < 0.5
    t = Table.from_function([f"x{i}" for i in range(8)], ["y", "z"], lambda p: [vals[p], (p & 3) == 3])
    small = map_luts(t, minimize(t), k=4, options=LutOptions(lut_budget=3))
    assert "cover cuts" in small.method
    for p in range(256):
        assert small.evaluate(p) == int(vals[p]) | int(p & 3 == 3) << 1


def test_a_wrong_network_is_an_internal_error_not_a_failed_check():
    # every output mapped from the cover (no decomposition); the cover given computes x0 AND x1 where the table
    # says x0 OR x1, so the finished network is wrong, which the mapper reports as a fault, never as exit 1
    t = Table.from_function(["x0", "x1"], ["y"], lambda p: [(p & 3) > 0])  # reference: OR as integer test
    wrong = Cover(t.input_names, t.output_names, (Cube(0b11, 0b11),))
    with pytest.raises(InternalError, match=r"wrong network for outputs \['y'\].*unless the cover"):
        map_luts(t, wrong, k=4, options=LutOptions(decompose_limit=0))
