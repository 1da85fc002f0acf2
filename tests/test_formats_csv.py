"""CSV truth tables: hand-worked cases and outside references (sympy)."""

from __future__ import annotations

from pathlib import Path

import pytest
from sympy import symbols
from sympy.logic import SOPform

from plaforge.bundled import sample_path
from plaforge.core.errors import SpecError
from plaforge.core.table import Table
from plaforge.formats import read_spec
from plaforge.formats.csv import parse_csv
from plaforge.formats.pla import parse_pla


def _value(table: Table, j: int, point: int) -> int | None:
    on, dc = table.evaluate(point)
    return None if dc >> j & 1 else on >> j & 1


def test_sympy_sopform_example_agrees_with_table() -> None:
    # Outside reference: the SOPform example of sympy's documentation (minterms and don't-cares over w, x, y, z),
    # from memory. sympy minimizes the same function; its result must be 1 on our ON set and 0 on our OFF set.
    text = "w, x, y, z, >f\n0,0,0,1,1\n0,0,1,1,1\n0,1,1,1,1\n1,0,1,1,1\n1,1,1,1,1\n0,0,0,0,-\n0,0,1,0,-\n0,1,0,1,-\n"
    t = parse_csv(text, "sop.csv")
    w, x, y, z = symbols("w x y z")
    minterms = [[0, 0, 0, 1], [0, 0, 1, 1], [0, 1, 1, 1], [1, 0, 1, 1], [1, 1, 1, 1]]
    dontcares = [[0, 0, 0, 0], [0, 0, 1, 0], [0, 1, 0, 1]]
    f = SOPform([w, x, y, z], minterms, dontcares)
    counts = {0: 0, 1: 0, None: 0}
    for p in range(16):
        vals = {w: p & 1, x: p >> 1 & 1, y: p >> 2 & 1, z: p >> 3 & 1}  # column order = input order, bit 0 first
        ours = _value(t, 0, p)
        counts[ours] += 1
        if ours is not None:
            assert bool(f.subs(vals)) == bool(ours), p
    assert counts == {1: 5, None: 3, 0: 8}


def test_bus_columns_and_defaults() -> None:
    # hand-worked: code is a 2-bit bus (code[0] = input 0), en input 2; y 2-bit output, valid output
    text = "#! default = dc\ncode:2, en, >y:2, >valid=0\n0, 1, 0b00, 1\n1, 1, 0b01, 1\n2, 1, 0b1x, 1\n-, 0, -, 0\n"
    t = parse_csv(text, "x.csv")
    assert t.input_names == ("code[0]", "code[1]", "en")
    assert t.output_names == ("y[0]", "y[1]", "valid")
    assert [b.name for b in t.input_buses] == ["code", "en"] and t.input_buses[0].width == 2
    p = lambda code, en: code | en << 2
    assert [_value(t, 0, p(c, 1)) for c in range(4)] == [0, 1, None, None]
    assert [_value(t, 1, p(c, 1)) for c in range(4)] == [0, 0, 1, None]  # code 3 unmentioned -> file default dc
    assert [_value(t, 2, p(c, 1)) for c in range(4)] == [1, 1, 1, 0]  # column default 0
    assert [_value(t, 2, p(c, 0)) for c in range(4)] == [0, 0, 0, 0]


@pytest.mark.parametrize(("cell", "expected"), [
    ("10", [10]), ("0xA", [10]), ("0b1010", [10]), ("0b1x1x", [10, 11, 14, 15]), ("0xx", list(range(16))),
    ("-", list(range(16))), ("0b1_010", [10]),
])
def test_bus_cell_forms(cell: str, expected: list[int]) -> None:
    t = parse_csv(f"a:4, >y\n{cell}, 1\n", "c.csv")
    assert [v for v in range(16) if _value(t, 0, v) == 1] == expected


def test_default_one_and_semicolons() -> None:
    t = parse_csv("a; b; >y=1\n1; 1; 0\n", "s.csv")
    assert [_value(t, 0, v) for v in range(4)] == [1, 1, 1, 0]


def test_agreeing_duplicates_are_fine_and_quotes() -> None:
    t = parse_csv('a, "b", >y\n1, -, 1\n1, 1, 1\n"1", 1, 1\n', "d.csv")
    assert [_value(t, 0, v) for v in range(4)] == [0, 1, 0, 1]


def test_disagreeing_rows_name_both_lines() -> None:
    with pytest.raises(SpecError, match=r"d\.csv:4: rows on lines 2 and 4 disagree for output 'y' at a=1, b=1"):
        parse_csv("a, b, >y\n1, -, 1\n0, 0, 0\n1, 1, 0\n", "d.csv")


def test_dont_care_cell_wins_over_a_value_as_in_pla() -> None:
    # docs/formats.md (CSV rows, PLA types): where one row gives don't-care and another a value, don't-care wins,
    # whatever the default; the same rows in PLA (type fdr) read the same way.
    for default in ("0", "1", "dc"):
        t = parse_csv(f"#! default = {default}\na, b, >y\n1, -, 1\n0, -, 0\n1, 1, -\n-, 0, -\n", "d.csv")
        p = parse_pla(".i 2\n.o 1\n.type fdr\n1- 1\n0- 0\n11 -\n-0 -\n", "d.pla")
        assert [_value(t, 0, v) for v in range(4)] == [None, None, 0, None] == [_value(p, 0, v) for v in range(4)]


def test_disagreeing_bus_rows_show_pattern() -> None:
    with pytest.raises(SpecError, match=r"lines 2 and 3 disagree for output 'y\[1\]' at a=13"):
        parse_csv("a:4, >y:2\n0b11x1, 3\n13, 1\n", "d.csv")


def test_segment_sample() -> None:
    t = read_spec(sample_path("segment_display.csv"))
    assert t.n_inputs == 6 and t.n_outputs == 7
    seg = lambda code, lamp=0, blank=0: [_value(t, j, code | lamp << 4 | blank << 5) for j in range(7)]
    assert seg(8) == [1] * 7
    assert seg(1) == [0, 1, 1, 0, 0, 0, 0]  # common practice: digit 1 lights segments b and c
    assert seg(14) == [None] * 7 and seg(15) == [None] * 7
    assert seg(3, lamp=1, blank=1) == [1] * 7
    assert seg(3, blank=1) == [0] * 7


def test_read_csv_from_disk(tmp_path: Path) -> None:
    from plaforge.formats.csv import read_csv

    f = tmp_path / "t.txt"  # the reader functions do not care about the extension
    f.write_text("a, >y\n1, 1\n", encoding="utf-8")
    assert [_value(read_csv(f), 0, p) for p in range(2)] == [0, 1]
