"""CSV truth tables (``.csv``): one header row naming the columns, then one row per input combination (or cube).

Vocabulary
----------
header cell
    ``[>]NAME[:WIDTH][=DEFAULT]``. A leading ``>`` marks an **output** column ("this value comes out"); every other
    column is an input. ``:WIDTH`` declares a bus of that many bits (member 0 the least significant; without it the
    column is one bit). ``=DEFAULT`` (outputs only) is the value of the column's bits at input combinations no row
    mentions: ``0``, ``1`` (every bit one) or ``dc`` (don't-care). Example: ``code:4, test, >seg_a=dc, >level:3``.
cell
    A bit column holds ``0``, ``1``, or ``-``/``x`` (don't-care). A bus column holds a number in decimal, ``0x``
    hex or ``0b`` binary, ``-``/``x`` for all bits don't-care, or a pattern with don't-care digits: ``0b1x0x``
    (binary digits, ``x``/``-`` free) or ``0x3x`` (hex digits, ``x`` = four free bits), missing digits on the left
    being 0 (as for a number; :func:`plaforge.formats._numbers.pattern`). A don't-care in an input cell
    makes the row cover both values; in an output cell it makes the output don't-care for the row's combinations.
settings
    Lines starting with ``#`` are comments. A comment line ``#! default = V`` (``V`` being ``0``, ``1`` or ``dc``)
    sets the default for every output column that does not give its own; without it the default is ``0``.
rows
    Each row must have as many cells as the header. Rows may overlap: where one gives an output bit as don't-care
    and another gives a value, don't-care wins (as in PLA); rows giving 1 and 0 for the same bit and combination are
    an error naming both lines and the combination (equal rows are fine). Cells are separated by commas (by ``;``
    or tabs when the header holds no comma); a cell may be quoted with ``"`` but may not span lines. Blank lines are skipped.

Example::

    #! default = dc
    code:2, en, >y:2, >valid=0
    0, 1, 0b00, 1
    1, 1, 0b01, 1
    2, 1, 0b1x, 1
    -, 0, -, 0
"""

from __future__ import annotations

import keyword
import os
import re
from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType

from ..core.cube import Cube, sharp
from ..core.errors import SpecError
from ..core.table import Bus, Table
from ._cubes import field_cube, find_overlap
from ._files import read_text
from ._numbers import parse_int, pattern
from .design import MAX_WIDTH

__all__ = ["parse_csv", "read_csv"]

_HEADER = re.compile(r"^(>)?\s*([A-Za-z_][A-Za-z0-9_]*)\s*(?::\s*(\d+))?\s*(?:=\s*(\S+))?$")
_SETTING = re.compile(r"^#!\s*([A-Za-z_]+)\s*=\s*(\S+)\s*$")
_DEFAULTS: Mapping[str, str] = MappingProxyType({"0": "0", "1": "1", "dc": "dc", "-": "dc", "x": "dc"})


@dataclass(frozen=True)
class _Column:
    name: str
    output: bool
    width: int
    bus: bool
    indices: tuple[int, ...]  # table input or output indices, LSB first
    default: str | None
    col: int  # 1-based character column of the header cell


def _split(line: str, delim: str, path: str, lineno: int) -> list[tuple[str, int]]:
    """Cells of one line with the 1-based column where each starts (quotes allowed, ``""`` for a quote)."""
    cells: list[tuple[str, int]] = []
    i, n = 0, len(line)
    while True:
        while i < n and line[i] in " \t" and line[i] != delim:
            i += 1
        start = i
        if i < n and line[i] == '"':
            i += 1
            buf = []
            while True:
                if i >= n:
                    raise SpecError(path, lineno, "quoted cell is not closed; add the closing '\"'", start + 1)
                if line[i] == '"':
                    if i + 1 < n and line[i + 1] == '"':
                        buf.append('"')
                        i += 2
                        continue
                    i += 1
                    break
                buf.append(line[i])
                i += 1
            text = "".join(buf)
            while i < n and line[i] in " \t" and line[i] != delim:
                i += 1
            if i < n and line[i] != delim:
                raise SpecError(path, lineno, f"text after a quoted cell; expected {delim!r}", i + 1)
        else:
            j = line.find(delim, i)
            j = n if j < 0 else j
            text = line[i:j].strip()
            i = j
        cells.append((text, start + 1))
        if i >= n:
            return cells
        i += 1  # skip the delimiter


def _cell_bits(text: str, col: _Column) -> tuple[int, int] | str:
    """``(care, value)`` over the column's bits, or an error message."""
    w = col.width
    top = (1 << w) - 1
    t = text.strip().lower().replace("_", "")
    if t in ("-", "x"):
        return 0, 0
    if not col.bus:
        if t in ("0", "1"):
            return 1, int(t)
        return f"{text!r} in bit column {col.name!r}; expected 0, 1, - or x"
    fits = f"{col.name!r} is {w} bits wide (0..{top:#x})"
    pat = pattern(t, w)
    if pat is not None:
        care, value = pat
        if value > top:
            return f"{text!r} does not fit: {fits}"
        return care, value
    v = parse_int(t)
    if v is None:
        return (f"{text!r} in bus column {col.name!r}; expected a number (12, 0xC, 0b1100), a pattern with x or - "
                f"digits (0b1x0x, 0x3x) or -")
    if v > top:
        return f"{text!r} does not fit: {fits}"
    return top, v


def parse_csv(text: str, path: str) -> Table:
    """Read a CSV truth table (see the module docs) into a :class:`~plaforge.table.Table`.

    ``text`` is the file contents; ``path`` names the file as for every reader (see :mod:`plaforge.formats`).

    Raises
    ------
    SpecError
        On a malformed header or cell (naming line and column), a row of the wrong length, or rows that disagree
        (naming both lines).

    Examples
    --------
    >>> t = parse_csv("a, b, >y\\n1, 1, 1\\n", "and.csv")
    >>> [t.evaluate(p)[0] for p in range(4)]
    [0, 0, 0, 1]
    """
    file_default = "0"
    header: list[_Column] | None = None
    delim = ","
    rows: list[tuple[int, Cube, list[tuple[int, int]]]] = []  # line, input cube, per output column (care, value)
    in_cols: list[_Column] = []
    out_cols: list[_Column] = []
    for lineno, raw in enumerate(text.splitlines(), 1):
        line = raw.rstrip("\r")
        s = line.strip()
        if not s:
            continue
        if s.startswith("#"):
            if s.startswith("#!"):
                m = _SETTING.match(s)
                if not m or m.group(1).lower() != "default":
                    raise SpecError(path, lineno, f"unknown setting {s!r}; the only setting is '#! default = 0|1|dc'")
                if header is not None:
                    raise SpecError(path, lineno, "'#! default' must come before the header row")
                v = _DEFAULTS.get(m.group(2).lower())
                if v is None:
                    raise SpecError(path, lineno, f"default {m.group(2)!r} not known; expected 0, 1 or dc")
                file_default = v
            continue
        if header is None:
            if "," not in line and (";" in line or "\t" in line):
                delim = ";" if ";" in line else "\t"
            header, in_cols, out_cols = _parse_header(_split(line, delim, path, lineno), path, lineno)
            continue
        cells = _split(line, delim, path, lineno)
        if len(cells) != len(header):
            raise SpecError(
                path, lineno,
                f"row has {len(cells)} cells but the header has {len(header)} "
                f"({', '.join(c.name for c in header)})",
            )
        care = value = 0
        outs: list[tuple[int, int]] = []
        for (cell, colno), col in zip(cells, header, strict=True):
            if cell == "":
                raise SpecError(path, lineno, f"empty cell for {col.name!r}; expected a value, or - for don't-care",
                                colno)
            got = _cell_bits(cell, col)
            if isinstance(got, str):
                raise SpecError(path, lineno, got, colno)
            if col.output:
                outs.append(got)
            else:
                c = field_cube(got[1], got[0], col.indices)
                care |= c.care
                value |= c.value
        rows.append((lineno, Cube(care, value), outs))
    if header is None:
        raise SpecError(path, 1, "no header row; expected a first line such as 'a, b:4, >y' (> marks outputs)")
    n = sum(c.width for c in in_cols)
    input_names = tuple(nm for c in in_cols for nm in ([c.name] if not c.bus else
                                                        [f"{c.name}[{b}]" for b in range(c.width)]))
    output_names = tuple(nm for c in out_cols for nm in ([c.name] if not c.bus else
                                                          [f"{c.name}[{b}]" for b in range(c.width)]))
    on: list[tuple[Cube, ...] | None] = []
    dc: list[tuple[Cube, ...] | None] = []
    off: list[tuple[Cube, ...] | None] = []
    for k, col in enumerate(out_cols):
        default = col.default or file_default
        for b, j in enumerate(col.indices):
            bit = 1 << j
            classes: dict[str, list[tuple[Cube, int]]] = {"1": [], "0": [], "dc": []}
            for lineno, cube, outs in rows:
                ocare, oval = outs[k]
                kind = ("1" if oval >> b & 1 else "0") if ocare >> b & 1 else "dc"
                classes[kind].append((cube, lineno))
            clash = find_overlap(classes["1"], classes["0"], n)
            if clash is not None:
                raise _disagree(path, clash, output_names[j], "1", "0", in_cols)
            sets: list[tuple[Cube, ...] | None] = [
                tuple(dict.fromkeys(Cube(c.care, c.value, bit) for c, _ in classes[kind])) for kind in ("1", "dc", "0")
            ]
            if default == "dc" and sets[1]:  # the DC rows are dropped as "the rest": cut them out of the others
                dcs = sets[1]
                sets[0], sets[2] = (tuple(sharp(s, dcs)) if s else s for s in (sets[0], sets[2]))
            sets[{"1": 0, "dc": 1, "0": 2}[default]] = None
            on.append(sets[0])
            dc.append(sets[1])
            off.append(sets[2])
    in_buses = tuple(Bus(c.name, c.indices, not c.bus) for c in in_cols)
    out_buses = tuple(Bus(c.name, c.indices, not c.bus) for c in out_cols)
    return Table(input_names, output_names, tuple(on), tuple(dc), tuple(off), input_buses=in_buses,
                 output_buses=out_buses, source=os.path.basename(path))


def read_csv(path: str | os.PathLike[str]) -> Table:
    """Read a CSV truth table from disk (see :func:`parse_csv`)."""
    return parse_csv(read_text(path), os.fspath(path))


def _parse_header(cells: list[tuple[str, int]], path: str, lineno: int
                  ) -> tuple[list[_Column], list[_Column], list[_Column]]:
    cols: list[_Column] = []
    n_in = n_out = 0
    seen: dict[str, int] = {}
    for text, colno in cells:
        m = _HEADER.match(text)
        if not m:
            raise SpecError(path, lineno, f"header cell {text!r} not understood; expected NAME, NAME:WIDTH, "
                                          f">NAME (an output) or >NAME:WIDTH=DEFAULT", colno)
        out, name, width_s, default_s = m.groups()
        if keyword.iskeyword(name):
            raise SpecError(path, lineno, f"column name {name!r} is a Python keyword; choose another", colno)
        if name in seen:
            raise SpecError(path, lineno, f"column {name!r} appears twice (columns at {seen[name]} and {colno})",
                            colno)
        seen[name] = colno
        width = int(width_s) if width_s is not None else 1
        if not 1 <= width <= MAX_WIDTH:
            raise SpecError(path, lineno, f"column {name!r} width {width} not allowed; expected 1 to {MAX_WIDTH}",
                            colno)
        default = None
        if default_s is not None:
            if not out:
                raise SpecError(path, lineno, f"input column {name!r} has a default; only outputs (>NAME) take one",
                                colno)
            default = _DEFAULTS.get(default_s.lower())
            if default is None:
                raise SpecError(path, lineno, f"default {default_s!r} for {name!r} not known; expected 0, 1 or dc",
                                colno)
        if out:
            idx = tuple(range(n_out, n_out + width))
            n_out += width
        else:
            idx = tuple(range(n_in, n_in + width))
            n_in += width
        cols.append(_Column(name, bool(out), width, width_s is not None and width > 1, idx, default, colno))
    outs = [c for c in cols if c.output]
    if not outs:
        raise SpecError(path, lineno, "no output column; mark outputs with '>' before the name, e.g. '>y'")
    return cols, [c for c in cols if not c.output], outs


def _disagree(path: str, clash: tuple[tuple[Cube, int], tuple[Cube, int]], out_name: str, x: str, y: str,
              in_cols: list[_Column]) -> SpecError:
    (c1, l1), (c2, l2) = clash
    kinds = {l1: x, l2: y}
    first, second = sorted((l1, l2))
    shared = c1.intersect(c2)
    assert shared is not None
    parts = []
    for col in in_cols:
        bits = [(shared.care >> i & 1, shared.value >> i & 1) for i in col.indices]
        if all(c for c, _ in bits):
            v = sum(val << b for b, (_c, val) in enumerate(bits))
            parts.append(f"{col.name}={v}")
        elif any(c for c, _ in bits):
            parts.append(f"{col.name}=0b" + "".join(str(val) if c else "x" for c, val in reversed(bits)))
    where = ", ".join(parts) or "every combination"
    return SpecError(
        path, second,
        f"rows on lines {first} and {second} disagree for output {out_name!r} at {where}: line {first} gives "
        f"{kinds[first]}, line {second} gives {kinds[second]}",
    )
