"""Heuristic two-level minimization: the Espresso-II heuristic (pyeda's compiled minimizer) driven by cubes.

Positional cube notation
------------------------
pyeda's low-level ``espresso(ninputs, noutputs, cover, intype)`` takes a set of rows ``(inpart, outpart)``. The
input part holds one integer per input: ``1`` = the literal ``x'`` (input must be 0), ``2`` = ``x`` (must be 1),
``3`` = no literal. The output part holds one entry per output: ``1`` = the row belongs to that output's ON set
(F-type), ``2`` = to its don't-care set (D-type), ``0`` = neither. A plaforge :class:`~plaforge.core.cube.Cube` with
``care``/``value`` masks maps to it bit by bit, so nothing is ever enumerated: a 40-input table given as cubes is
fed as its cubes.

Rows are built from the ON and DC cubes of all outputs at once, with identical input parts merged across
outputs (one row ``(c, outputs where c is ON)`` instead of one row per output), so the minimizer sees the
multi-output function and shares product terms between outputs. Under the ``per-output`` cost each output is
minimized alone and identical terms are merged only afterwards (they still count once per output).

Starting covers
---------------
The minimizer is a local descent, so where it starts matters. Under the shared cost two starts are tried and the
better result kept (fewer rows, then fewer literals): the Table's own cubes as above, and, for tables of at most
:data:`SIGNATURE_LIMIT` inputs, the regions of constant output signature (which outputs are ON and which DC) written
as cubes, each row carrying the whole signature. Up to the same width each start is followed by one more descent
from its own result.

Input sets
----------
The cubes come from :meth:`plaforge.core.table.Table.cover_sets`, computed once per table and phase choice: the ON
sets (OFF sets for outputs realized in complement) cut clear of the don't-cares, the DC sets, their multi-output
merged lists and the signature regions.

Isolation and trust
-------------------
The compiled minimizer keeps global configuration (``set_config``), which is reset to its defaults before every
call, and it may end the whole process on some internal errors. By default it therefore runs in a child process
with a time limit (:func:`plaforge.minimize.child.run_isolated`: a timeout is a ``TimeLimit``, running out of memory
a ``SizeLimit``, a crash an ``InternalError``). Its answer is re-verified against the Table
(:func:`plaforge.minimize.result.verify_cover`); one that fails is an ``InternalError``.
"""

from __future__ import annotations

from collections.abc import Sequence
from types import MappingProxyType

from ..core.cube import Cover, Cube, merge_identical
from ..core.errors import InternalError
from ..core.table import FunctionSets, Table
from .child import run_isolated
from .covering import quick_lower_bound
from .options import MinimizeOptions
from .result import checked_cover, sort_cubes, term_count

__all__ = [
    "MINIMIZER_DEFAULTS",
    "decode_row",
    "encode_cube",
    "heuristic_cubes",
    "minimize_heuristic",
]

#: Most inputs for which the signature-region starting cover is also tried (it builds packed truth tables).
SIGNATURE_LIMIT = 16

#: pyeda's own defaults for the compiled minimizer's global switches (restored before every call).
MINIMIZER_DEFAULTS: MappingProxyType[str, bool] = MappingProxyType({
    "single_expand": False,
    "remove_essential": True,
    "force_irredundant": True,
    "unwrap_onset": True,
    "recompute_onset": False,
    "use_super_gasp": False,
    "skip_make_sparse": False,
})

#: A row of the compiled minimizer: input part, output part (positional cube notation, see the module docs).
Row = tuple[tuple[int, ...], tuple[int, ...]]
#: One call of the compiled minimizer: ``(inputs, outputs, rows, has_dc)``.
Job = tuple[int, int, set[Row], bool]


def encode_cube(cube: Cube, n: int) -> tuple[int, ...]:
    """Input part of ``cube`` in positional cube notation (1 = ``x'``, 2 = ``x``, 3 = no literal)."""
    care, value = cube.care, cube.value
    return tuple((2 if value >> i & 1 else 1) if care >> i & 1 else 3 for i in range(n))


def decode_row(inpart: Sequence[int], outpart: Sequence[int]) -> Cube:
    """A Cube from a positional-notation row; outputs are those whose entry is 1."""
    care = value = 0
    for i, v in enumerate(inpart):
        if v == 1:
            care |= 1 << i
        elif v == 2:
            care |= 1 << i
            value |= 1 << i
        elif v != 3:
            raise InternalError(f"minimizer returned input entry {v!r} at column {i}; expected 1, 2 or 3")
    outputs = 0
    for j, v in enumerate(outpart):
        if v == 1:
            outputs |= 1 << j
    return Cube(care, value, outputs)


def _rows(n: int, m: int, joint_on: Sequence[Cube], joint_dc: Sequence[Cube]) -> set[Row]:
    """Rows from multi-output ON and DC cubes (identical input parts already merged), ON and DC rows apart."""
    rows: set[Row] = set()
    for cubes, mark in ((joint_on, 1), (joint_dc, 2)):
        for c in cubes:
            rows.add((encode_cube(c, n), tuple(mark if c.outputs >> j & 1 else 0 for j in range(m))))
    return rows


def _signature_rows(fs: FunctionSets) -> set[Row]:
    """Rows from the regions where the output signature (ON/DC per output) is constant, each row carrying the whole
    signature (``1`` ON, ``2`` DC): the joint view of the function."""
    n, m = fs.n, fs.m
    rows: set[Row] = set()
    for on_m, dc_m, cubes in fs.regions:
        if not on_m:
            continue
        outpart = tuple(1 if on_m >> j & 1 else 2 if dc_m >> j & 1 else 0 for j in range(m))
        for c in cubes:
            rows.add((encode_cube(c, n), outpart))
        if dc_m:
            dc_part = tuple(2 if dc_m >> j & 1 else 0 for j in range(m))
            for c in cubes:
                rows.add((encode_cube(c, n), dc_part))
    for on_m, dc_m, cubes in fs.regions:
        if dc_m and not on_m:
            dc_part = tuple(2 if dc_m >> j & 1 else 0 for j in range(m))
            for c in cubes:
                rows.add((encode_cube(c, n), dc_part))
    return rows


def _minimizer_jobs(jobs: list[Job]) -> list[list[Row]]:
    """Run the compiled minimizer on each job ``(n, m, rows, has_dc)``; results as sorted row lists.

    Each job is minimized, then (up to :data:`SIGNATURE_LIMIT` inputs, where it is cheap) its result is fed back
    once with the same don't-care rows (a second descent from a prime, irredundant start often drops a few more
    rows); the better of the two is kept.
    """
    from pyeda.boolalg.espresso import DTYPE, FTYPE, espresso, set_config

    out = []
    for n, m, rows, has_dc in jobs:
        if not any(1 in outpart for _, outpart in rows):
            out.append([])
            continue
        kind = FTYPE | DTYPE if has_dc else FTYPE
        set_config(**MINIMIZER_DEFAULTS)
        first = sorted(espresso(n, m, rows, intype=kind))
        if n > SIGNATURE_LIMIT:
            out.append(first)
            continue
        dc_rows = {(inp, tuple(2 if v == 2 else 0 for v in outp)) for inp, outp in rows if 2 in outp}
        set_config(**MINIMIZER_DEFAULTS)
        second = sorted(espresso(n, m, set(first) | dc_rows, intype=kind))
        out.append(second if _row_cost(second) < _row_cost(first) else first)
    return out


def _row_cost(rows: Sequence[Row]) -> tuple[int, int]:
    return len(rows), sum(1 for inp, _ in rows for v in inp if v != 3)


def heuristic_cubes(fs: FunctionSets, options: MinimizeOptions) -> list[Cube]:
    """Minimized cubes for ``fs`` under ``options.cost``: jointly (shared terms) or each output alone, identical
    terms merged, in :func:`plaforge.minimize.result.sort_cubes` order (not yet verified)."""
    n, m = fs.n, fs.m
    per_output = options.cost == "per-output"
    jobs: list[Job] = []
    if per_output:
        for j in range(m):
            one_on = merge_identical(c.with_outputs(1) for c in fs.on[j])
            one_dc = merge_identical(c.with_outputs(1) for c in fs.dc[j])
            jobs.append((n, 1, _rows(n, 1, one_on, one_dc), bool(fs.dc[j])))
    else:
        jobs.append((n, m, _rows(n, m, fs.joint_on, fs.joint_dc), any(fs.dc)))
        if n <= SIGNATURE_LIMIT and m <= 64:
            jobs.append((n, m, _signature_rows(fs), any(fs.dc)))
    if options.isolate:
        results = run_isolated(_minimizer_jobs, (jobs,), options.time_limit, "the heuristic minimizer")
    else:
        results = _minimizer_jobs(jobs)
    if not per_output:
        results = [min(results, key=_row_cost)]
    cubes: list[Cube] = []
    for k, res in enumerate(results):
        for inpart, outpart in res:
            c = decode_row(inpart, outpart)
            if per_output:
                c = c.with_outputs((1 << k) if c.outputs else 0)
            if c.outputs:
                cubes.append(c)
    return sort_cubes(merge_identical(cubes))


def minimize_heuristic(table: Table, options: MinimizeOptions, inverted: int = 0) -> Cover:
    """Heuristic cover of ``table`` (outputs in ``inverted`` realized in complement), verified.

    ``lower_bound`` is :func:`plaforge.minimize.covering.quick_lower_bound` (budgeted, any width); ``optimal`` is
    true only when the cover meets that bound, which then proves it minimum.
    """
    fs = table.cover_sets(inverted)
    cubes = heuristic_cubes(fs, options)
    per_output = options.cost == "per-output"
    count = term_count(cubes, per_output)
    bound = quick_lower_bound(fs, per_output)
    return checked_cover(table, cubes, options, inverted, "heuristic", count <= bound, bound)
