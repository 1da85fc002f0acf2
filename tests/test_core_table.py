"""Table semantics: implicit sets, DC precedence, support, bit-parallel truth tables.

Outside references: sympy's SOPform (a minimal sum-of-products never mentions an input the function does not
depend on, so its free symbols are the true support of a completely specified function).
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy import symbols
from sympy.logic import SOPform

from plaforge import Cube, Table
from plaforge.core.table import bool_array_to_cubes, cubes_bits, pack_bool, point_bits, popcount_bits, unpack_bits


def brute_sets(table: Table, j: int):
    n = table.n_inputs
    on = {p for p in range(1 << n) if any(c.contains_point(p) for c in table.on_cubes(j))}
    dc = {p for p in range(1 << n) if any(c.contains_point(p) for c in table.dc_cubes(j))}
    off = {p for p in range(1 << n) if any(c.contains_point(p) for c in table.off_cubes(j))}
    return on, dc, off


def test_sets_partition_the_space_and_dc_wins():
    on = (Cube.parse("1--"),)
    dc = (Cube.parse("-11"),)
    t = Table(("a", "b", "c"), ("y",), (on,), (dc,), (None,))
    son, sdc, soff = brute_sets(t, 0)
    assert sdc == {0b110, 0b111}
    assert son == {0b001, 0b011, 0b101}
    assert son | sdc | soff == set(range(8)) and not (son & sdc) and not (son & soff)


@given(st.integers(1, 255), st.integers(0, 255), st.sampled_from(["on", "dc", "off"]))
@settings(max_examples=60, deadline=None)
def test_any_set_may_be_implicit(seed_a, seed_b, implicit):
    rng = np.random.default_rng(seed_a * 256 + seed_b)
    n = 4
    labels = rng.integers(0, 3, 1 << n)  # 0 on, 1 dc, 2 off
    sets = [tuple(bool_array_to_cubes(labels == k, n)) for k in range(3)]
    given_sets = [None if name == implicit else sets[k] for k, name in enumerate(["on", "dc", "off"])]
    t = Table(tuple(f"x{i}" for i in range(n)), ("y",), (given_sets[0],), (given_sets[1],), (given_sets[2],))
    son, sdc, soff = brute_sets(t, 0)
    assert son == set(np.flatnonzero(labels == 0).tolist())
    assert sdc == set(np.flatnonzero(labels == 1).tolist())
    assert soff == set(np.flatnonzero(labels == 2).tolist())


@given(st.lists(st.integers(0, 31), unique=True, max_size=32))
@settings(max_examples=80, deadline=None)
def test_support_matches_sympy(minterms):
    n = 5
    xs = symbols("x0:5")
    v = np.zeros(1 << n, dtype=bool)
    v[minterms] = True
    t = Table.from_function([f"x{i}" for i in range(n)], ["y"], lambda p: [v[p]])
    # sympy orders variables MSB first in minterm indices: map our point p to its bit list
    sym_minterms = [[(p >> i) & 1 for i in range(n)] for p in minterms]
    expr = SOPform(list(xs), sym_minterms)
    expected = {int(str(s)[1:]) for s in expr.free_symbols}
    got = {i for i in range(n) if t.support(0) >> i & 1}
    assert got == expected


def test_support_uses_dont_cares_to_drop_inputs():
    # y = a where b=1 is don't-care: only a matters.
    t = Table(("a", "b"), ("y",), ((Cube.parse("10"),),), ((Cube.parse("-1"),),), (None,))
    assert t.support_names(0) == ["a"]


def test_seventy_inputs_without_enumeration():
    n = 70
    names = tuple(f"bus[{i}]" for i in range(n))
    hi = 1 << 69
    on = (Cube(hi | 1, hi | 1), Cube(hi | 2, hi))
    t = Table(names, ("sel",), (on,), ((),), (None,))
    assert t.support_names(0) == ["bus[0]", "bus[1]", "bus[69]"]
    assert len(t.input_buses) == 1 and t.input_buses[0].width == 70
    on_mask, dc_mask = t.evaluate(hi | 1)
    assert on_mask == 1 and dc_mask == 0
    assert t.evaluate(hi | 2) == (0, 0)


@given(st.integers(0, 2**16 - 1), st.integers(1, 8))
@settings(max_examples=60, deadline=None)
def test_bit_parallel_truth_matches_points(word, n):
    rng = np.random.default_rng(word)
    v = rng.random(1 << n) < 0.4
    cubes = bool_array_to_cubes(v, n)
    bits = cubes_bits(cubes, n)
    assert (unpack_bits(bits, n) == v).all()
    assert (unpack_bits(pack_bool(v), n) == v).all()
    assert popcount_bits(bits) == int(v.sum())
    assert all(point_bits(bits, p) == v[p] for p in range(1 << n))


def test_from_function_full_adder_matches_definition():
    # full adder (common practice): s = a^b^c, co = majority
    t = Table.from_function(["a", "b", "c"], ["s", "co"],
                            lambda p: [np.bitwise_count(p) % 2 == 1, np.bitwise_count(p) >= 2])
    for p in range(8):
        ones = p.bit_count()
        assert t.evaluate(p) == ((ones & 1) | ((ones >= 2) << 1), 0)
    assert len(t.on_cubes(0)) == 4  # parity has no merges


def test_overlap_too_large_to_separate_is_a_clear_error(monkeypatch):
    import pytest

    import plaforge.core.table as table_mod
    from plaforge.core.errors import SizeLimit

    monkeypatch.setattr(table_mod, "SHARP_LIMIT", 4)
    n = 8
    dc = tuple(Cube.point(p, n) for p in (3, 77, 140, 201, 250, 9))
    t = Table(tuple(f"x{i}" for i in range(n)), ("y",), ((Cube(0b1, 0b1),),), (dc,), (None,), source="t.pla")
    with pytest.raises(SizeLimit, match="t.pla: output 'y': its ON rows overlap its don't-care rows"):
        t.on_cubes(0)
    # support falls back to the rows as given: y = x0 still depends on x0 only
    assert t.support_names(0) == ["x0"]


def test_cover_sets_hand_each_output_its_sets_once():
    n = 4
    on = (Cube.parse("1---"), Cube.parse("-1--"))
    dc = (Cube.parse("11--"), Cube.parse("0011"))
    t = Table(tuple(f"x{i}" for i in range(n)), ("y", "z"), (on, (Cube.parse("10--"),)), (dc, ()), (None, None))
    fs = t.cover_sets(0b01)  # y in complement: its ON set is y's OFF set
    assert fs is t.cover_sets(0b01)  # computed once
    son, sdc, soff = brute_sets(t, 0)
    assert {p for p in range(1 << n) if any(c.contains_point(p) for c in fs.on[0])} == soff
    assert {p for p in range(1 << n) if any(c.contains_point(p) for c in fs.dc[0])} == sdc
    pieces = t.on_pieces(0)  # given ON cut clear of the don't-cares
    assert {p for p in range(1 << n) if any(c.contains_point(p) for c in pieces)} == son
    on_arrays, dc_arrays = fs.point_arrays()
    assert set(np.flatnonzero(on_arrays[0]).tolist()) == soff
    assert set(np.flatnonzero(dc_arrays[0]).tolist()) == sdc
    zon, _, _ = brute_sets(t, 1)
    assert set(np.flatnonzero(on_arrays[1]).tolist()) == zon
    # identical input parts of different outputs are one multi-output cube
    joint = t.cover_sets(0).joint_on
    assert len({(c.care, c.value) for c in joint}) == len(joint)
    for j in range(2):
        parts = {(c.care, c.value) for c in t.cover_sets(0).on[j]}
        assert {(c.care, c.value) for c in joint if c.outputs >> j & 1} == parts
    assert Cube.parse("10--", 0b11) in joint  # y's piece 10-- is z's whole ON set
    # regions: every point lies in the region of its own signature
    for on_mask, dc_mask, cubes in fs.regions:
        for p in {p for p in range(1 << n) if any(c.contains_point(p) for c in cubes)}:
            assert on_mask == sum(1 << j for j in range(2) if on_arrays[j][p])
            assert dc_mask == sum(1 << j for j in range(2) if dc_arrays[j][p])
