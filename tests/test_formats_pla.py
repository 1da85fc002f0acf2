"""PLA reader and writer: hand-worked cases, an outside reference (pyeda), round trips, wide inputs."""

from __future__ import annotations

from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from pyeda.inter import Majority, Xor, exprvar

from plaforge.core.cube import Cover, Cube, cube_list_contains, sharp
from plaforge.core.errors import SpecError
from plaforge.core.table import Table, popcount_bits
from plaforge.formats._cubes import find_overlap, range_cubes
from plaforge.formats.pla import parse_cover, parse_pla, read_cover, read_pla, write_pla, write_table_pla

# Full adder truth table (common practice): s = a xor b xor cin, cout = majority(a, b, cin).
# Written by hand as a type-fd PLA with shared don't-care-free rows; cout uses three 2-literal terms.
FULL_ADDER = """\
# full adder, written by hand
.i 3
.o 2
.ilb a b cin
.ob s cout
.p 7
100 10
010 10
001 10
111 11
11- 01
1-1 01
-11 01
.e
"""


def _value(table: Table, j: int, point: int) -> int | None:
    on, dc = table.evaluate(point)
    if dc >> j & 1:
        return None
    return on >> j & 1


def test_full_adder_matches_pyeda() -> None:
    t = parse_pla(FULL_ADDER, "fa.pla")
    assert t.input_names == ("a", "b", "cin") and t.output_names == ("s", "cout")
    a, b, c = exprvar("a"), exprvar("b"), exprvar("c")
    ref = [Xor(a, b, c), Majority(a, b, c)]  # reference: pyeda expressions of the same functions
    for p in range(8):
        point = {a: p & 1, b: p >> 1 & 1, c: p >> 2 & 1}
        for j in range(2):
            assert _value(t, j, p) == int(ref[j].restrict(point)), (p, j)


def test_leftmost_column_is_input_zero() -> None:
    t = parse_pla(".i 3\n.o 1\n1-0 1\n", "x.pla")
    assert t.on_cubes(0) == (Cube(0b101, 0b001),)
    assert t.input_names == ("x[0]", "x[1]", "x[2]") and t.output_names == ("y[0]",)
    assert t.input_buses[0].name == "x" and t.input_buses[0].width == 3


@pytest.mark.parametrize(
    ("typ", "on", "dc", "off"),
    [
        # worked by hand over 2 inputs a (bit 0), b (bit 1); rows: "1- 1", "01 0", "00 -"
        ("f", {1, 3}, set(), {0, 2}),
        ("fd", {1, 3}, {0}, {2}),
        ("fr", {1, 3}, {0}, {2}),  # '-' means nothing in fr; point 0 is unmentioned -> don't-care
        ("fdr", {1, 3}, {0}, {2}),
    ],
)
def test_types(typ: str, on: set[int], dc: set[int], off: set[int]) -> None:
    t = parse_pla(f".i 2\n.o 1\n.type {typ}\n1- 1\n01 0\n00 -\n", "t.pla")
    got_on = {p for p in range(4) if _value(t, 0, p) == 1}
    got_dc = {p for p in range(4) if _value(t, 0, p) is None}
    got_off = {p for p in range(4) if _value(t, 0, p) == 0}
    assert (got_on, got_dc, got_off) == (on, dc, off)


def test_fr_unmentioned_is_dont_care_and_fdr_dash_wins() -> None:
    t = parse_pla(".i 2\n.o 1\n.type fr\n11 1\n00 0\n", "t.pla")
    assert [_value(t, 0, p) for p in range(4)] == [0, None, None, 1]
    t = parse_pla(".i 2\n.o 1\n.type fdr\n1- 1\n11 -\n0- 0\n", "t.pla")
    assert [_value(t, 0, p) for p in range(4)] == [0, 1, 0, None]


def test_phase_swaps_on_and_off() -> None:
    # '.phase 01': output 0 is realized in complement, output 1 as written
    t = parse_pla(".i 2\n.o 2\n.phase 01\n11 11\n", "t.pla")
    assert [_value(t, 0, p) for p in range(4)] == [1, 1, 1, 0]
    assert [_value(t, 1, p) for p in range(4)] == [0, 0, 0, 1]


def test_row_spacing_variants() -> None:
    a = parse_pla(".i 3\n.o 2\n1-0 10\n", "a.pla")
    b = parse_pla(".i 3\n.o 2\n1-010\n", "b.pla")
    c = parse_pla(".i 3\n.o 2\n1 - 0 | 1 0\n", "c.pla")
    assert a == b == c


def test_lines_after_end_are_ignored() -> None:
    t = parse_pla(".i 1\n.o 1\n1 1\n.e\ngarbage here\n", "t.pla")
    assert t.on_cubes(0) == (Cube(1, 1),)


def test_write_pla_layout() -> None:
    cover = Cover(("a", "b", "c"), ("y", "z"), (Cube(0b101, 0b001, 0b11), Cube(0b010, 0b010, 0b01)),
                  inverted=0b10, method="exact", optimal=True, lower_bound=2)
    text = write_pla(cover, "dir/spec.toml")
    lines = text.splitlines()
    assert lines[0].startswith("# plaforge") and "spec.toml" in lines[0] and "dir/" not in lines[0]
    assert "rows 2" in lines[1] and "literals 3" in lines[1] and "exact" in lines[1] and "lower bound 2" in lines[1]
    body = [ln for ln in lines if not ln.startswith("#")]
    assert body == [".i 3", ".o 2", ".ilb a b c", ".ob y z", ".type fd", ".phase 10", ".p 2", "1-0 11", "-1- 10",
                    ".e"]
    assert write_pla(cover, "dir/spec.toml") == text  # deterministic


def test_write_pla_skips_dead_cubes_and_rejects_bad_names() -> None:
    cover = Cover(("a",), ("y",), (Cube(1, 1, 1), Cube(1, 0, 0)))
    assert ".p 1" in write_pla(cover)
    with pytest.raises(ValueError, match="cannot be written"):
        write_pla(Cover(("a b",), ("y",), ()))


def test_cover_reads_back_and_evaluates_like_the_spec() -> None:
    t = parse_pla(FULL_ADDER, "fa.pla")
    cover = parse_cover(FULL_ADDER, "fa.pla")
    assert cover.rows == 7 and cover.method == "file"
    for p in range(8):
        assert cover.evaluate(p) == t.evaluate(p)[0]


def test_sixty_four_plus_inputs() -> None:
    n = 72
    # a 72-bit range compiled to cubes; no enumeration anywhere
    cubes = range_cubes(5, (1 << 71) + 12345, range(n))
    cover = Cover(tuple(f"a[{i}]" for i in range(n)), ("hit",), tuple(cubes))
    text = write_pla(cover)
    back = parse_cover(text, "wide.pla")
    assert back.cubes == cover.cubes
    t = parse_pla(text, "wide.pla")
    assert t.n_inputs == 72 and t.input_buses[0].width == 72
    assert t.evaluate(4)[0] == 0 and t.evaluate(5)[0] == 1 and t.evaluate((1 << 71) + 12345)[0] == 1
    assert t.evaluate((1 << 71) + 12346)[0] == 0
    assert len(t.off_cubes(0)) <= 2 * n  # complement by cubes, not by points


# -- property tests ----------------------------------------------------------------------------------------------
@st.composite
def covers(draw: st.DrawFn) -> Cover:
    n = draw(st.integers(0, 70))
    m = draw(st.integers(1, 4))
    cubes = []
    for _ in range(draw(st.integers(0, 8))):
        care = draw(st.integers(0, (1 << n) - 1))
        value = draw(st.integers(0, (1 << n) - 1)) & care
        cubes.append(Cube(care, value, draw(st.integers(1, (1 << m) - 1))))
    return Cover(tuple(f"i{k}" for k in range(n)), tuple(f"o{k}" for k in range(m)), tuple(cubes),
                 inverted=draw(st.integers(0, (1 << m) - 1)))


@given(covers())
@settings(max_examples=150, deadline=None)
def test_cover_round_trip(cover: Cover) -> None:
    back = parse_cover(write_pla(cover, "x.toml"), "x.pla")
    assert back.cubes == cover.cubes
    assert back.input_names == cover.input_names and back.output_names == cover.output_names
    assert back.inverted == cover.inverted


@st.composite
def tables(draw: st.DrawFn) -> Table:
    n = draw(st.sampled_from([0, 1, 3, 5, 8, 12, 33, 70]))
    m = draw(st.integers(1, 3))

    def cube_list() -> list[Cube]:
        out = []
        for _ in range(draw(st.integers(0, 4))):
            care = draw(st.integers(0, (1 << n) - 1))
            if n > 12:  # about one input in eight tested: keeps the derived complement sets small at 70 inputs
                care &= draw(st.integers(0, (1 << n) - 1)) & draw(st.integers(0, (1 << n) - 1))
            out.append(Cube(care, draw(st.integers(0, (1 << n) - 1)) & care))
        return out

    on, dc, off = [], [], []
    for _ in range(m):
        implicit = draw(st.sampled_from(["on", "dc", "off"]))
        a, b, c = cube_list(), cube_list(), cube_list()
        if implicit != "on" and implicit != "off":
            c = sharp(c, a)  # keep given ON and OFF disjoint
        on.append(None if implicit == "on" else tuple(a))
        dc.append(None if implicit == "dc" else tuple(b))
        off.append(None if implicit == "off" else tuple(c))
    return Table(tuple(f"in[{k}]" for k in range(n)), tuple(f"q{k}" for k in range(m)), tuple(on), tuple(dc),
                 tuple(off))


def _same_points(a: tuple[Cube, ...], b: tuple[Cube, ...]) -> bool:
    return all(cube_list_contains(b, x) for x in a) and all(cube_list_contains(a, y) for y in b)


@given(tables())
@settings(max_examples=80, deadline=None, suppress_health_check=[HealthCheck.too_slow])
def test_table_round_trip(table: Table) -> None:
    back = parse_pla(write_table_pla(table), "t.pla")
    assert back.input_names == table.input_names and back.output_names == table.output_names
    for j in range(table.n_outputs):
        if table.n_inputs <= 12:  # compare by truth tables
            (on1, dc1), (on2, dc2) = table.truth(j), back.truth(j)
            assert (on1 == on2).all() and (dc1 == dc2).all()
            assert popcount_bits(on1) == popcount_bits(on2)
        else:  # compare by cube containment both ways
            assert _same_points(table.on_cubes(j), back.on_cubes(j))
            assert _same_points(table.dc_cubes(j), back.dc_cubes(j))
            assert _same_points(table.off_cubes(j), back.off_cubes(j))


@given(st.integers(1, 40), st.data())
@settings(max_examples=100, deadline=None)
def test_range_cubes_exact(w: int, data: st.DataObject) -> None:
    lo = data.draw(st.integers(0, (1 << w) - 1))
    hi = data.draw(st.integers(lo, (1 << w) - 1))
    cubes = range_cubes(lo, hi, range(w))
    assert len(cubes) <= 2 * w
    for p in {lo, hi, max(lo - 1, 0), min(hi + 1, (1 << w) - 1), (lo + hi) // 2}:
        assert any(c.contains_point(p) for c in cubes) == (lo <= p <= hi)


def test_contradiction_names_both_lines() -> None:
    text = ".i 3\n.o 2\n.type fr\n1-- 10\n000 01\n11- 01\n"
    with pytest.raises(SpecError, match=r"t\.pla:6: rows on lines 4 and 6 contradict for output 'y\[0\]'"):
        parse_pla(text, "t.pla")


@given(st.integers(1, 14), st.integers(1, 3), st.data())
@settings(max_examples=40, deadline=None)
def test_find_overlap_matches_pairwise_search(n: int, density: int, data: st.DataObject) -> None:
    # reference: the plain pairwise search over every (a, b) pair, keeping the pair whose later line comes first
    def cubes(lines: list[int]) -> list[tuple[Cube, int]]:
        out = []
        for ln in lines:
            care = 0
            for _ in range(density):  # density 3 tests 7/8 of the inputs: long lists then get split
                care |= data.draw(st.integers(0, (1 << n) - 1))
            out.append((Cube(care, data.draw(st.integers(0, (1 << n) - 1)) & care), ln))
        return out

    k = data.draw(st.integers(1, 80))
    lines = data.draw(st.permutations(range(1, 2 * k + 1)))
    a = cubes(lines[:k])
    b = cubes(lines[k:])
    pairs = [(x, y) for x in a for y in b if x[0].intersects(y[0])]
    got = find_overlap(a, b, n)
    if not pairs:
        assert got is None
        return
    key = lambda pr: (max(pr[0][1], pr[1][1]), min(pr[0][1], pr[1][1]))
    assert got is not None and got[0][0].intersects(got[1][0])
    assert key(got) == min(key(p) for p in pairs)


@given(covers())
@settings(max_examples=60, deadline=None)
def test_written_cover_read_as_spec_is_the_covers_function(cover: Cover) -> None:
    # reading a written cover as a spec (honouring .phase) gives exactly the function Cover.evaluate computes
    if cover.n_inputs > 8:
        cover = Cover(cover.input_names[:8], cover.output_names,
                      tuple(Cube(c.care & 0xFF, c.value & 0xFF, c.outputs) for c in cover.cubes), cover.inverted)
    t = parse_pla(write_pla(cover), "c.pla")
    for p in range(1 << cover.n_inputs):
        assert t.evaluate(p) == (cover.evaluate(p), 0)


def test_read_functions_from_disk(tmp_path: Path) -> None:
    f = tmp_path / "fa.pla"
    f.write_text(FULL_ADDER, encoding="utf-8")
    assert read_pla(f) == parse_pla(FULL_ADDER, "fa.pla")
    assert read_cover(f).cubes == parse_cover(FULL_ADDER, "fa.pla").cubes
    with pytest.raises(SpecError, match=r"absent\.pla: no such file"):
        read_cover(tmp_path / "absent.pla")
