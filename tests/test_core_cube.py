"""Cube algebra and cube-list complement, checked against brute-force enumeration and sympy."""

from __future__ import annotations

import itertools

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from plaforge.core.cube import (
    CUT_DC_LIMIT,
    Cover,
    Cube,
    SharpTooLarge,
    complement,
    cube_list_contains,
    cut_by_complement,
    merge_identical,
    sharp,
)


def cubes_strategy(n: int, max_cubes: int = 6):
    def make(pairs):
        return [Cube(c, v & c) for c, v in pairs]

    mask = (1 << n) - 1
    return st.lists(st.tuples(st.integers(0, mask), st.integers(0, mask)), max_size=max_cubes).map(make)


def points_of(cubes, n):
    return {p for p in range(1 << n) if any(c.contains_point(p) for c in cubes)}


def test_parse_and_text_round_trip():
    # PLA convention (common practice): leftmost column is the first input.
    c = Cube.parse("1-0x")
    assert c.care == 0b0101 and c.value == 0b0001
    assert c.text(4) == "1-0-"
    assert c.literals == 2


def test_parse_rejects_bad_character():
    with pytest.raises(ValueError, match="expected 0, 1, - or x"):
        Cube.parse("1z0")


def test_value_outside_care_is_a_programmer_error():
    with pytest.raises(ValueError, match="outside care"):
        Cube(0b01, 0b10)


def test_repr_is_valid_code():
    c = Cube(0b101, 0b100, 0b11)
    assert eval(repr(c)) == c  # repr is pasteable (STYLE.md); eval on our own repr only


@given(cubes_strategy(5))
@settings(max_examples=200, deadline=None)
def test_complement_is_exact(cubes):
    n = 5
    comp = complement(cubes)
    assert points_of(comp, n) == set(range(1 << n)) - points_of(cubes, n)


@given(cubes_strategy(5), cubes_strategy(5))
@settings(max_examples=200, deadline=None)
def test_sharp_and_cut_give_the_points_of_a_not_in_b(a, b):
    n = 5
    expected = points_of(a, n) - points_of(b, n)
    tagged = [c.with_outputs(0b10) for c in a]
    pieces = sharp(tagged, b)
    assert points_of(pieces, n) == expected
    assert all(c.outputs == 0b10 for c in pieces)  # each piece feeds what its cube of a fed
    cut = cut_by_complement(a, b, 0b100)
    assert cut is not None and points_of(cut, n) == expected
    assert all(c.outputs == 0b100 for c in cut)


def test_sharp_limit_and_cut_limit():
    n = 10
    a = [Cube.universe()]
    b = [Cube.point(p, n) for p in range(0, 1 << n, 3)]
    with pytest.raises(SharpTooLarge, match="more than 5 cubes"):
        sharp(a, b, limit=5)
    assert len(b) > CUT_DC_LIMIT and cut_by_complement(a, b, 1) is None


def test_merge_identical_joins_outputs_in_first_seen_order():
    x, y = Cube.parse("1-"), Cube.parse("-0")
    merged = merge_identical([x.with_outputs(1), y.with_outputs(2), x.with_outputs(4), y.with_outputs(0)])
    assert merged == [x.with_outputs(5), y.with_outputs(2)]
    assert merge_identical([y.with_outputs(0)]) == []


@given(cubes_strategy(5), st.integers(0, 31), st.integers(0, 31))
@settings(max_examples=200, deadline=None)
def test_containment_matches_enumeration(cubes, care, value):
    n = 5
    probe = Cube(care, value & care)
    expected = set(probe.points(n)) <= points_of(cubes, n)
    assert cube_list_contains(cubes, probe) == expected


@given(st.integers(0, 63), st.integers(0, 63), st.integers(0, 63), st.integers(0, 63))
def test_intersection_and_supercube(c1, v1, c2, v2):
    n = 6
    a, b = Cube(c1, v1 & c1), Cube(c2, v2 & c2)
    pa, pb = set(a.points(n)), set(b.points(n))
    inter = a.intersect(b)
    assert (inter is None) == (not (pa & pb))
    if inter is not None:
        assert set(inter.points(n)) == pa & pb
    sup = a.supercube(b)
    assert pa | pb <= set(sup.points(n))
    assert a.distance(b) == 0 or inter is None


def test_wide_cubes_cost_nothing_extra():
    # 96 inputs: containment/complement stay int operations.
    n = 96
    big = Cube(1 << 95, 1 << 95)
    small = Cube((1 << 95) | 1, (1 << 95) | 1)
    assert big.contains(small) and not small.contains(big)
    comp = complement([big])
    assert comp == [Cube(1 << 95, 0)]
    assert cube_list_contains([big, Cube(1 << 95, 0)], Cube(0, 0))
    assert len(Cube.universe().text(n)) == n


def test_cover_figures_and_evaluation():
    # full adder sum as its four minterms, carry as three terms (common practice).
    names = ("a", "b", "cin")
    s = [Cube.parse(t, 0b01) for t in ("100", "010", "001", "111")]
    co = [Cube.parse(t, 0b10) for t in ("11-", "1-1", "-11")]
    cov = Cover(names, ("s", "co"), tuple(s + co))
    assert cov.rows == 7 and cov.literals == 18
    assert cov.terms() == {"s": 4, "co": 3}
    for p in range(8):
        ones = p.bit_count()
        assert cov.evaluate(p) == (ones & 1) | ((ones >= 2) << 1)
    inv = cov.with_(inverted=0b10)
    assert all(inv.evaluate(p) >> 1 & 1 == (p.bit_count() < 2) for p in range(8))


def test_points_enumeration_matches_definition():
    n = 4
    for care, value in itertools.product(range(16), repeat=2):
        if value & ~care:
            continue
        c = Cube(care, value)
        assert sorted(c.points(n)) == [p for p in range(16) if p & care == value]
