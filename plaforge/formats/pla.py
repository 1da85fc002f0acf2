"""PLA text: reading a spec or a cover, and writing a cover.

Vocabulary
----------
PLA file
    The open, trade-wide two-level format: directives ``.i N`` (inputs), ``.o M`` (outputs), ``.ilb`` and ``.ob``
    (names), ``.p P`` (row count), ``.type f|fd|fr|fdr|r|dr``, ``.phase`` and ``.e``/``.end``; ``#`` starts a comment.
    Every other line is a row: an input part of N characters (``0``, ``1``, ``-``; ``x``/``X`` read as ``-``), the
    leftmost being input 0, then an output part of M characters. Whitespace may separate the two parts (or not).
row (product term)
    An input part is a cube; its output part says, per output, what the cube means for that output.
type
    Which sets the rows give: ``f``, ``fd`` (default), ``fr``, ``fdr``, ``r`` or ``dr``; a letter in the type says
    which output character counts (``f``: ``1`` is ON, ``r``: ``0`` is OFF, ``d``: ``-`` is don't-care; ``~`` never
    counts). The set no letter names is "the rest": OFF without ``r``, ON without ``f``, don't-care when both are
    there. A point a row gives as don't-care is don't-care even if another row gives it as ON or OFF. A point given
    as both ON and OFF for the same output is a contradiction: an error naming both lines. The table of characters
    per type is in docs/conventions.md ("The PLA dialect").
phase
    ``.phase`` has one character per output: ``1`` the rows realize the output as written, ``0`` they realize its
    complement (for devices with programmable output polarity). Reading a spec with phase ``0`` for an output swaps
    the roles of ON and OFF for it.

Checks made while reading: ``.i``/``.o`` present before the first row and given once; ``.ilb``/``.ob`` counts agree
with ``.i``/``.o`` and names are unique; each row has exactly N + M characters (the message says which part is
short or long); characters are valid (the message gives the column); ``.p``, when present, equals the number of
rows (an error naming the ``.p`` line, since a mismatch usually means a truncated or hand-edited file); unknown
directives are errors with a suggestion. Lines after ``.e`` are ignored.

Everything is cube-level: a 40-input PLA loads without enumerating a single point.
"""

from __future__ import annotations

import difflib
import os
import re
from dataclasses import dataclass, field

from ..core.cube import Cover, Cube, sharp
from ..core.errors import SpecError
from ..core.table import Table
from ._cubes import find_overlap
from ._files import read_text

__all__ = [
    "PlaFile",
    "parse_cover",
    "parse_pla",
    "parse_pla_file",
    "read_cover",
    "read_pla",
    "write_pla",
    "write_table_pla",
]

MAX_PORTS = 65536  # largest .i / .o accepted
_TYPES = ("f", "fd", "fr", "fdr", "r", "dr")
_DIRECTIVES = (".i", ".o", ".ilb", ".ob", ".p", ".type", ".phase", ".e", ".end")
_IN_CARE = str.maketrans("01-xX", "11000")
_IN_VALUE = str.maketrans("01-xX", "01000")
_BAD_IN = re.compile(r"[^01\-xX]")
_BAD_OUT = re.compile(r"[^01\-~]")


@dataclass
class PlaFile:
    """A PLA file as read, before any interpretation of its type.

    ``rows`` holds ``(cube, line, ones, zeros, dashes)``: the input cube and, as output bitmasks, where the output
    part has ``1``, ``0`` and ``-``.
    """

    path: str
    n_inputs: int
    n_outputs: int
    input_names: tuple[str, ...]
    output_names: tuple[str, ...]
    type: str = "fd"
    phase: int = 0  # bit j set: output j complemented
    rows: list[tuple[Cube, int, int, int, int]] = field(default_factory=list)


def _mask(part: str, ch: str) -> int:
    """Bitmask of the positions of ``ch`` in ``part`` (position 0 -> bit 0)."""
    m = 0
    start = part.find(ch)
    while start >= 0:
        m |= 1 << start
        start = part.find(ch, start + 1)
    return m


def _int_arg(path: str, lineno: int, directive: str, args: list[str], col: int) -> int:
    if len(args) != 1:
        raise SpecError(path, lineno, f"{directive} takes one number, got {len(args)} words", col)
    try:
        v = int(args[0])
    except ValueError:
        raise SpecError(path, lineno, f"{directive} needs a whole number, not {args[0]!r}", col) from None
    if v < 0:
        raise SpecError(path, lineno, f"{directive} must not be negative, got {v}", col)
    if directive == ".o" and v == 0:
        raise SpecError(path, lineno, ".o 0 declares no outputs; expected at least one output", col)
    if directive in (".i", ".o") and v > MAX_PORTS:
        raise SpecError(path, lineno, f"{directive} {v} is more than plaforge handles ({MAX_PORTS})", col)
    return v


def _check_names(path: str, lineno: int, what: str, names: list[str], expected: int | None, count_dir: str,
                 comment: bool) -> None:
    if expected is not None and len(names) != expected:
        hint = " ('#' starts a comment, so the names after it were dropped; names may not contain '#')" \
            if comment and len(names) < expected else ""
        raise SpecError(path, lineno, f"{what} gives {len(names)} names but {count_dir} says {expected}{hint}")
    seen: dict[str, int] = {}
    for k, nm in enumerate(names):
        if nm in seen:
            raise SpecError(path, lineno, f"{what} names {nm!r} twice (positions {seen[nm] + 1} and {k + 1})")
        seen[nm] = k


def parse_pla_file(text: str, path: str) -> PlaFile:
    """Read PLA text into a :class:`PlaFile` (syntax and widths checked, type not yet applied).

    Raises
    ------
    SpecError
        On any malformed line, naming the line (and column for bad characters).
    """
    n: int | None = None
    m: int | None = None
    ilb: tuple[list[str], int, bool] | None = None  # names, line, whether a '#' cut the line short
    ob: tuple[list[str], int, bool] | None = None
    p_decl: tuple[int, int] | None = None
    typ = "fd"
    phase_decl: tuple[str, int] | None = None
    seen_dirs: dict[str, int] = {}
    rows: list[tuple[Cube, int, int, int, int]] = []
    lines = text.splitlines()
    last_line = len(lines)

    def ready(lineno: int) -> tuple[int, int]:
        if n is None:
            raise SpecError(path, lineno, "row before any .i directive; expected '.i N' (number of inputs) first")
        if m is None:
            raise SpecError(path, lineno, "row before any .o directive; expected '.o M' (number of outputs) first")
        return n, m

    for lineno, raw in enumerate(lines, 1):
        line = raw.split("#", 1)[0]
        stripped = line.strip()
        if not stripped:
            continue
        lead = len(line) - len(line.lstrip())
        if stripped.startswith("."):
            words = stripped.split()
            d = words[0].lower()
            args = words[1:]
            col = lead + 1
            if d in (".e", ".end"):
                last_line = lineno
                break
            if d not in _DIRECTIVES:
                hint = difflib.get_close_matches(d, _DIRECTIVES, n=1)
                extra = f" (did you mean {hint[0]!r}?)" if hint else ""
                if d == ".mv":
                    extra = " (multiple-valued inputs are not supported, only binary ones)"
                raise SpecError(
                    path, lineno, f"unknown directive {words[0]!r}{extra}; expected one of {' '.join(_DIRECTIVES)}", col
                )
            if d in seen_dirs:
                raise SpecError(path, lineno, f"{d} given twice (first on line {seen_dirs[d]})", col)
            seen_dirs[d] = lineno
            if d in (".i", ".o") and rows:
                raise SpecError(path, lineno, f"{d} after the first row (line {rows[0][1]}); put it before the rows")
            if d == ".i":
                n = _int_arg(path, lineno, d, args, col)
            elif d == ".o":
                m = _int_arg(path, lineno, d, args, col)
            elif d == ".p":
                p_decl = (_int_arg(path, lineno, d, args, col), lineno)
            elif d == ".ilb":
                ilb = (args, lineno, "#" in raw)
            elif d == ".ob":
                ob = (args, lineno, "#" in raw)
            elif d == ".type":
                if len(args) != 1 or args[0].lower() not in _TYPES:
                    got = " ".join(args) or "nothing"
                    raise SpecError(path, lineno, f".type {got!r} is not known; expected f, fd, fr, fdr, r or dr", col)
                typ = args[0].lower()
            elif d == ".phase":
                if len(args) != 1 or set(args[0]) - {"0", "1"}:
                    raise SpecError(path, lineno, ".phase needs one word of 0/1 characters, one per output", col)
                phase_decl = (args[0], lineno)
            continue
        # a row
        ni, mo = ready(lineno)
        words = stripped.split()
        if len(words) == 2 and ni > 0 and (len(words[0]) == ni or len(words[0]) + len(words[1]) != ni + mo):
            inp, out = words
            in_col = lead + 1
            out_col = line.index(out, lead + len(inp)) + 1
            if len(inp) != ni:
                raise SpecError(
                    path, lineno, f"input part {inp!r} has {len(inp)} characters, expected {ni} (.i {ni})", in_col
                )
            if len(out) != mo:
                raise SpecError(
                    path, lineno, f"output part {out!r} has {len(out)} characters, expected {mo} (.o {mo})", out_col
                )
        else:
            # parts run together or are split by spaces: take the non-space characters in order
            cols = [k for k, ch in enumerate(line) if not ch.isspace() and ch != "|"]
            chars = "".join(line[k] for k in cols)
            if len(chars) != ni + mo:
                raise SpecError(
                    path,
                    lineno,
                    f"row has {len(chars)} characters, expected {ni + mo} (.i {ni} inputs then .o {mo} outputs)",
                    lead + 1,
                )
            inp, out = chars[:ni], chars[ni:]
            in_col = out_col = 0  # columns looked up below through ``cols``
            bad = _BAD_IN.search(inp)
            if bad:
                k = cols[bad.start()]
                raise SpecError(
                    path, lineno, f"input character {line[k]!r} not allowed; expected 0, 1, - or x", k + 1
                )
            bad = _BAD_OUT.search(out)
            if bad:
                k = cols[ni + bad.start()]
                raise SpecError(path, lineno, f"output character {line[k]!r} not allowed; expected 1, 0, - or ~", k + 1)
        if in_col:
            bad = _BAD_IN.search(inp)
            if bad:
                raise SpecError(
                    path, lineno, f"input character {bad.group()!r} not allowed; expected 0, 1, - or x",
                    in_col + bad.start(),
                )
            bad = _BAD_OUT.search(out)
            if bad:
                raise SpecError(
                    path, lineno, f"output character {bad.group()!r} not allowed; expected 1, 0, - or ~",
                    out_col + bad.start(),
                )
        rev = inp[::-1]
        care = int(rev.translate(_IN_CARE), 2) if ni else 0
        value = int(rev.translate(_IN_VALUE), 2) if ni else 0
        rows.append((Cube(care, value), lineno, _mask(out, "1"), _mask(out, "0"), _mask(out, "-")))

    if n is None or m is None:
        which = ".i" if n is None else ".o"
        raise SpecError(path, max(1, last_line), f"missing {which} directive; a PLA file needs '.i N' and '.o M'")
    if p_decl is not None and p_decl[0] != len(rows):
        raise SpecError(
            path,
            p_decl[1],
            f".p says {p_decl[0]} rows but the file has {len(rows)}; is the file truncated? fix .p or the rows",
        )
    if ilb is not None:
        _check_names(path, ilb[1], ".ilb", ilb[0], n, f".i {n} (line {seen_dirs['.i']})", ilb[2])
        in_names = tuple(ilb[0])
    else:
        in_names = tuple(f"x[{i}]" for i in range(n))
    if ob is not None:
        _check_names(path, ob[1], ".ob", ob[0], m, f".o {m} (line {seen_dirs['.o']})", ob[2])
        out_names = tuple(ob[0])
    else:
        out_names = tuple(f"y[{j}]" for j in range(m))
    both = set(in_names) & set(out_names)
    if both:
        where = ob[1] if ob is not None else ilb[1] if ilb is not None else 1
        raise SpecError(path, where, f"name {min(both)!r} is both an input and an output; rename one")
    phase = 0
    if phase_decl is not None:
        word, ln = phase_decl
        if len(word) != m:
            raise SpecError(path, ln, f".phase has {len(word)} characters, expected {m} (one per output)")
        phase = sum(1 << j for j, ch in enumerate(word) if ch == "0")
    return PlaFile(path, n, m, in_names, out_names, typ, phase, rows)


def parse_pla(text: str, path: str) -> Table:
    """Read a PLA spec into a :class:`~plaforge.table.Table` (see the module docs for the type semantics).

    ``text`` is the file contents; ``path`` names the file as for every reader (see :mod:`plaforge.formats`).

    Raises
    ------
    SpecError
        On malformed input or contradictory rows (ON and OFF for the same point and output; both lines named).

    Examples
    --------
    >>> t = parse_pla(".i 2\\n.o 1\\n.ilb a b\\n.ob y\\n11 1\\n.e\\n", "and.pla")
    >>> t.on_cubes(0)
    (Cube(care=0b11, value=0b11, outputs=0b1),)
    """
    pf = parse_pla_file(text, path)
    n, m = pf.n_inputs, pf.n_outputs
    on: list[tuple[Cube, ...] | None] = []
    dc: list[tuple[Cube, ...] | None] = []
    off: list[tuple[Cube, ...] | None] = []
    t = pf.type
    for j in range(m):
        bit = 1 << j
        f_rows = [(c, ln) for c, ln, ones, _z, _d in pf.rows if ones & bit] if "f" in t else []
        r_rows = [(c, ln) for c, ln, _o, zeros, _d in pf.rows if zeros & bit] if "r" in t else []
        d_rows = [(c, ln) for c, ln, _o, _z, dashes in pf.rows if dashes & bit] if "d" in t else []
        clash = find_overlap(f_rows, r_rows, n)
        if clash is not None:
            (c1, l1), (c2, l2) = sorted(clash, key=lambda x: x[1])
            pt = c1.intersect(c2)
            assert pt is not None
            raise SpecError(
                path,
                max(l1, l2),
                f"rows on lines {l1} and {l2} contradict for output {pf.output_names[j]!r}: both hold input "
                f"{pt.text(n)!r}, one as 1 and one as 0",
            )
        f = tuple(Cube(c.care, c.value, bit) for c, _ in f_rows)
        r = tuple(Cube(c.care, c.value, bit) for c, _ in r_rows)
        d = tuple(Cube(c.care, c.value, bit) for c, _ in d_rows)
        # the set no row gives is "the rest": OFF without r, ON without f, otherwise DC
        if "r" not in t:
            s_on, s_dc, s_off = f, d, None
        elif "f" not in t:
            s_on, s_dc, s_off = None, d, r
        else:  # explicit don't-cares win over ON/OFF rows; unmentioned points are don't-care
            s_on = tuple(sharp(f, d)) if d else f
            s_off = tuple(sharp(r, d)) if d else r
            s_dc = None
        if pf.phase >> j & 1:
            s_on, s_off = s_off, s_on
        on.append(s_on)
        dc.append(s_dc)
        off.append(s_off)
    return Table(pf.input_names, pf.output_names, tuple(on), tuple(dc), tuple(off), source=os.path.basename(path))


def read_pla(path: str | os.PathLike[str]) -> Table:
    """Read a PLA spec file (see :func:`parse_pla`); :class:`SpecError` if it cannot be read or is malformed."""
    return parse_pla(read_text(path), os.fspath(path))


def parse_cover(text: str, path: str) -> Cover:
    """Read PLA text as a cover: each row with a ``1`` in its output part becomes one cube feeding those outputs.

    Rows are kept in file order and are not merged, so reading what :func:`write_pla` wrote gives back the same
    cubes. ``0``/``-``/``~`` output characters add nothing to a cover (whatever the type); ``.phase`` sets
    :attr:`Cover.inverted`.

    Raises
    ------
    SpecError
        On malformed input.
    """
    pf = parse_pla_file(text, path)
    cubes = tuple(Cube(c.care, c.value, ones) for c, _ln, ones, _z, _d in pf.rows if ones)
    return Cover(pf.input_names, pf.output_names, cubes, inverted=pf.phase, method="file")


def read_cover(path: str | os.PathLike[str]) -> Cover:
    """Read a PLA cover file (see :func:`parse_cover`); :class:`SpecError` if it cannot be read or is malformed."""
    return parse_cover(read_text(path), os.fspath(path))


def write_pla(cover: Cover, source: str | None = None) -> str:
    """PLA text for a cover (type ``fd``; byte-identical for equal covers).

    A leading ``#`` comment says plaforge produced it, from which source, and the figures (rows, literals, method,
    whether proven optimal, lower bound). Then ``.i .o .ilb .ob .type``, ``.phase`` when some output is realized in
    complement, ``.p``, one row per cube (input part as :meth:`Cube.text`, output part ``1`` for each output the cube
    feeds and ``0`` otherwise) and ``.e``. Cubes that feed no output are left out (they do nothing).

    Parameters
    ----------
    cover : Cover
    source : str, optional
        Spec file name for the comment.

    Raises
    ------
    ValueError
        If a name contains whitespace or ``#`` (it could not be read back).
    """
    n, m = cover.n_inputs, cover.n_outputs
    for name in cover.input_names + cover.output_names:
        if not name or any(ch.isspace() for ch in name) or "#" in name:
            raise ValueError(f"name {name!r} cannot be written to a PLA file (empty, whitespace or '#')")
    cubes = [c for c in cover.cubes if c.outputs & ((1 << m) - 1)]
    lits = sum(c.literals for c in cubes)
    lines = [
        f"# plaforge cover{' of ' + os.path.basename(source) if source else ''}",
        (f"# rows {len(cubes)}, literals {lits}, method {cover.method}, "
        f"optimal {'yes' if cover.optimal else 'not proven'}, lower bound {cover.lower_bound}, cost {cover.cost}"),
        f".i {n}",
        f".o {m}",
    ]
    if n:
        lines.append(".ilb " + " ".join(cover.input_names))
    if m:
        lines.append(".ob " + " ".join(cover.output_names))
    lines.append(".type fd")
    if cover.inverted & ((1 << m) - 1):
        lines.append(".phase " + "".join("0" if cover.inverted >> j & 1 else "1" for j in range(m)))
    lines.append(f".p {len(cubes)}")
    for c in cubes:
        out = "".join("1" if c.outputs >> j & 1 else "0" for j in range(m))
        lines.append(f"{c.text(n)} {out}" if n else out)
    lines.append(".e")
    return "\n".join(lines) + "\n"


def write_table_pla(table: Table) -> str:
    """PLA text (type ``fdr``) giving a Table's ON, DC and OFF sets explicitly, so nothing depends on defaults.

    Rows with the same input cube are merged across outputs; an output a row says nothing about gets ``~``. Reading
    the text back with :func:`parse_pla` gives a Table with the same three sets for every output.

    Parameters
    ----------
    table : Table

    Raises
    ------
    ValueError
        If a name contains whitespace or ``#``.
    """
    n, m = table.n_inputs, table.n_outputs
    for name in table.input_names + table.output_names:
        if not name or any(ch.isspace() for ch in name) or "#" in name:
            raise ValueError(f"name {name!r} cannot be written to a PLA file (empty, whitespace or '#')")
    rows: dict[tuple[int, int], list[str]] = {}
    for j in range(m):
        for ch, cubes in (("1", table.on_cubes(j)), ("-", table.dc_cubes(j)), ("0", table.off_cubes(j))):
            for c in cubes:
                rows.setdefault((c.care, c.value), ["~"] * m)[j] = ch
    lines = [f"# plaforge table{' of ' + table.source if table.source else ''}: ON, DC and OFF rows per output",
             f".i {n}", f".o {m}"]
    if n:
        lines.append(".ilb " + " ".join(table.input_names))
    if m:
        lines.append(".ob " + " ".join(table.output_names))
    lines += [".type fdr", f".p {len(rows)}"]
    for (care, value), outs in rows.items():
        text = Cube(care, value).text(n)
        lines.append(f"{text} {''.join(outs)}" if n else "".join(outs))
    lines.append(".e")
    return "\n".join(lines) + "\n"
