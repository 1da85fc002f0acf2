"""The examples in docs/formats.md parse and mean what the text says."""

from __future__ import annotations

import re
from pathlib import Path

from plaforge.core.table import Table
from plaforge.formats.csv import parse_csv
from plaforge.formats.design import parse_design
from plaforge.formats.pla import parse_pla

DOC = Path(__file__).resolve().parent.parent / "docs" / "formats.md"


def _blocks() -> list[str]:
    return re.findall(r"```[a-z]*\n(.*?)```", DOC.read_text(encoding="utf-8"), flags=re.DOTALL)


def _value(table: Table, j: int, point: int) -> int | None:
    on, dc = table.evaluate(point)
    return None if dc >> j & 1 else on >> j & 1


def test_pla_example_is_a_comparator() -> None:
    t = parse_pla(_blocks()[0], "cmp.pla")
    for x in range(4):
        for y in range(4):
            p = x | y << 2
            assert (_value(t, 0, p), _value(t, 1, p)) == (int(x == y), int(x > y))  # common practice: comparison


def test_csv_example() -> None:
    t = parse_csv(_blocks()[1], "enc.csv")
    assert t.input_names == ("req[0]", "req[1]", "en")
    grant = lambda p: [_value(t, j, p) for j in range(2)]
    assert grant(2 | 4) == [0, 1] and grant(3 | 4) == [None, 1] and grant(3) == [None, None]
    assert [_value(t, 2, r | 4) for r in range(4)] == [0, 1, 1, 1]


def test_design_example() -> None:
    t = parse_design(_blocks()[2], "cs.toml")
    assert t.n_inputs == 13
    wr = 1 << 12
    names = t.output_names
    assert _value(t, names.index("flash"), 0x123) == 1 and _value(t, names.index("flash"), 0x123 | wr) == 0
    assert _value(t, names.index("sram"), 0x923) == 1 and _value(t, names.index("bank[1]"), 0x923) == 1
    assert _value(t, names.index("bank[0]"), 0x923) is None
    cube = [names.index(f"cube[{b}]") for b in range(6)]
    val = lambda p: sum(_value(t, j, p) << b for b, j in enumerate(cube))
    assert val(0x003) == 27 and val(0xC03 | wr) == 0 and val(0xC03) == 27  # 3 ** 3, common practice


def test_module_doctests() -> None:
    import doctest

    import plaforge.formats._cubes as cubes
    import plaforge.formats.csv as csv_mod
    from plaforge.formats import design, expr, pla

    for mod in (cubes, csv_mod, design, expr, pla):
        res = doctest.testmod(mod)
        assert res.failed == 0 and res.attempted > 0, mod.__name__
