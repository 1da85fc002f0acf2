"""Heuristic two-level minimization: the Espresso-II heuristic (pyeda's compiled minimizer) driven by cubes.

Positional cube notation
------------------------
pyeda's low-level ``espresso(ninputs, noutputs, cover, intype)`` takes a set of rows ``(inpart, outpart)``. The
input part holds one integer per input: ``1`` = the literal ``x'`` (input must be 0), ``2`` = ``x`` (must be 1),
``3`` = no literal. The output part holds one entry per output: ``1`` = the row belongs to that output's ON set
(F-type), ``2`` = to its don't-care set (D-type), ``0`` = neither. A plaforge :class:`~plaforge.cube.Cube` with
``care``/``value`` masks maps to it bit by bit, so nothing is ever enumerated: a 40-input table given as cubes is
fed as its cubes.

Rows are built from the Table's ON and DC cubes of all outputs at once, with identical input parts merged across
outputs (one row ``(c, outputs where c is ON)`` instead of one row per output), so the minimizer sees the
multi-output function and shares product terms between outputs. Under the ``per-output`` cost each output is
minimized alone and identical terms are merged only afterwards (they still count once per output).

Starting covers
---------------
The minimizer is a local descent, so where it starts matters. Under the shared cost two starts are tried and the
better result kept (fewer rows, then fewer literals): the Table's own cubes as above, and, for tables of at most
:data:`SIGNATURE_LIMIT` inputs, the regions of constant output signature (which outputs are ON and which DC) written
as cubes, each row carrying the whole signature. Up to the same width each start is followed by one more descent from its own result.

Isolation and trust
-------------------
The compiled minimizer keeps global configuration (``set_config``), which is reset to its defaults before every
call, and it may end the whole process on some internal errors. By default it therefore runs in a forked child
process with a time limit; a crash, a timeout or an answer that fails re-verification raises
:class:`plaforge.core.errors.InternalError`. Re-verification is exhaustive and bit-parallel up to the enumeration limit,
and cube-based above it (every cover cube inside ON ∪ DC, every ON cube inside the cover, both as tautology checks
of cofactors).
"""

from __future__ import annotations

import multiprocessing
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from types import MappingProxyType
from typing import Any

from ..core.cube import Cover, Cube, complement, cube_list_contains
from ..core.errors import InternalError, TimeLimit
from ..core.table import DEFAULT_ENUM_LIMIT, Table
from .options import MinimizeOptions

__all__ = [
    "MINIMIZER_DEFAULTS",
    "FunctionSets",
    "cover_cubes",
    "decode_row",
    "encode_cube",
    "heuristic_cubes",
    "merge_identical",
    "minimize_heuristic",
    "sort_cubes",
    "table_sets",
    "verify_cover",
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


@dataclass(frozen=True)
class FunctionSets:
    """ON and DC cubes per output of the function actually minimized (after any phase choice).

    ``on[j]`` / ``dc[j]`` hold cubes with ``outputs == 1 << j``. With output ``j`` inverted, ``on[j]`` is the
    Table's OFF set of ``j`` (the complement's ON set) and ``dc[j]`` is unchanged.
    """

    n: int
    m: int
    on: tuple[tuple[Cube, ...], ...]
    dc: tuple[tuple[Cube, ...], ...]
    inverted: int = 0


def table_sets(table: Table, inverted: int = 0) -> FunctionSets:
    """The ON/DC cubes of ``table``, with the outputs in ``inverted`` replaced by their complements.

    ON cubes may overlap DC cubes only where the pieces below would be too many; points in both are don't-care. Where the Table gives a set explicitly together with don't-cares,
    the minimizer is fed the given cubes cut by the complement of the DC set (:func:`_cut_by_complement`) when that
    stays small: measured on the 40-input suite entry, the minimizer runs about ten times faster from those pieces
    than from the same set trimmed cube by cube, or from the untrimmed cubes.
    """
    m = table.n_outputs

    def care(j: int) -> tuple[Cube, ...]:
        inv = bool(inverted >> j & 1)
        given = table.off[j] if inv else table.on[j]
        dc = table.dc_cubes(j)
        if given is not None and dc:
            pieces = _cut_by_complement(given, dc, 1 << j)
            if pieces is not None:
                return pieces
            # Too many pieces: feed the given cubes as they are. They may overlap the don't-cares, which the
            # minimizer treats as don't-care (F ∩ D is free), and _cube_check tests ON ⊆ cover ∪ DC.
            return tuple(c.with_outputs(1 << j) for c in given)
        return table.off_cubes(j) if inv else table.on_cubes(j)

    on = tuple(care(j) for j in range(m))
    dc = tuple(table.dc_cubes(j) for j in range(m))
    return FunctionSets(table.n_inputs, m, on, dc, inverted)


#: Most pieces :func:`_cut_by_complement` may produce before the given cubes are used untrimmed instead.
CUT_LIMIT = 20000
#: Most don't-care cubes :func:`_cut_by_complement` complements as a whole.
CUT_DC_LIMIT = 64


def _cut_by_complement(cubes: Sequence[Cube], dc: Sequence[Cube], outputs: int) -> tuple[Cube, ...] | None:
    """``cubes`` minus the points of ``dc``, as the intersections of each cube with each cube of ``¬dc``.

    ``None`` when that would exceed :data:`CUT_LIMIT` pieces (the product of the two list sizes bounds it).
    """
    if not any(x.intersects(y) for x in cubes for y in dc):
        return tuple(c.with_outputs(outputs) for c in cubes)
    if len(dc) > CUT_DC_LIMIT:  # the complement of many scattered cubes over many inputs can itself explode
        return None
    comp = complement(list(dc))
    if len(comp) * len(cubes) > CUT_LIMIT:
        return None
    out = []
    for x in cubes:
        for y in comp:
            z = x.intersect(y)
            if z is not None:
                out.append(Cube(z.care, z.value, outputs))
    return tuple(dict.fromkeys(out))


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


def merge_identical(cubes: Sequence[Cube]) -> list[Cube]:
    """One cube per distinct input part, feeding the union of the outputs (first-seen order)."""
    merged: dict[tuple[int, int], int] = {}
    for c in cubes:
        key = (c.care, c.value)
        merged[key] = merged.get(key, 0) | c.outputs
    return [Cube(care, value, out) for (care, value), out in merged.items() if out]


def sort_cubes(cubes: Sequence[Cube]) -> list[Cube]:
    """Deterministic order: by the outputs fed (output 0 first), then fewer literals, then the masks."""
    def key(c: Cube) -> tuple[int, int, int, int]:
        low = (c.outputs & -c.outputs).bit_length()
        return (low, c.literals, c.care, c.value)
    return sorted(cubes, key=key)


def _rows(n: int, m: int, on: Sequence[Sequence[Cube]], dc: Sequence[Sequence[Cube]]) -> set[tuple]:
    """Rows for the compiled minimizer: identical input parts merged across outputs, ON and DC rows apart."""
    rows: set[tuple] = set()
    for sets, mark in ((on, 1), (dc, 2)):
        merged = merge_identical([c.with_outputs(1 << j) for j in range(m) for c in sets[j]])
        for c in merged:
            rows.add((encode_cube(c, n), tuple(mark if c.outputs >> j & 1 else 0 for j in range(m))))
    return rows


def _minimizer_jobs(jobs: list[tuple[int, int, set[tuple], bool]]) -> list[list[tuple]]:
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


def _row_cost(rows: Sequence[tuple]) -> tuple[int, int]:
    return len(rows), sum(1 for inp, _ in rows for v in inp if v != 3)


def _signature_rows(fs: FunctionSets) -> set[tuple] | None:
    """Rows from the regions where the output signature (ON/DC per output) is constant; ``None`` if too wide.

    Only for ``n <= SIGNATURE_LIMIT`` (the packed truth tables are built from the cubes): each region is written as
    cubes, each row carrying the whole signature (``1`` ON, ``2`` DC), the joint view of the function.
    """
    n, m = fs.n, fs.m
    if n > SIGNATURE_LIMIT or m > 64:
        return None
    import numpy as np

    from ..core.table import bool_array_to_cubes, cubes_bits, unpack_bits

    on_sig = np.zeros(1 << n, dtype=np.uint64)
    dc_sig = np.zeros(1 << n, dtype=np.uint64)
    for j in range(m):
        bit = np.uint64(1 << j)
        dc = unpack_bits(cubes_bits(fs.dc[j], n), n)
        on = unpack_bits(cubes_bits(fs.on[j], n), n) & ~dc
        on_sig[on] |= bit
        dc_sig[dc] |= bit
    pairs = np.stack([on_sig, dc_sig], axis=1)
    uniq, inverse = np.unique(pairs, axis=0, return_inverse=True)
    inverse = inverse.reshape(-1)
    rows: set[tuple] = set()
    for k, (on_m, dc_m) in enumerate(uniq.tolist()):
        if not on_m:
            continue
        outpart = tuple(1 if on_m >> j & 1 else 2 if dc_m >> j & 1 else 0 for j in range(m))
        for c in bool_array_to_cubes(inverse == k, n):
            rows.add((encode_cube(c, n), outpart))
        if dc_m:
            dc_part = tuple(2 if dc_m >> j & 1 else 0 for j in range(m))
            for c in bool_array_to_cubes(inverse == k, n):
                rows.add((encode_cube(c, n), dc_part))
    for k, (on_m, dc_m) in enumerate(uniq.tolist()):
        if dc_m and not on_m:
            dc_part = tuple(2 if dc_m >> j & 1 else 0 for j in range(m))
            for c in bool_array_to_cubes(inverse == k, n):
                rows.add((encode_cube(c, n), dc_part))
    return rows


def _child(conn: Any, fn: Callable[..., Any], args: tuple) -> None:  # pragma: no cover - runs in the child
    try:
        conn.send(("ok", fn(*args)))
    except BaseException as exc:  # noqa: BLE001 - everything is reported to the parent
        conn.send(("error", f"{type(exc).__name__}: {exc}"))
    finally:
        conn.close()


def run_isolated(fn: Callable[..., Any], args: tuple, timeout: float, what: str) -> Any:
    """Call ``fn(*args)`` in a child process; its result, or :class:`InternalError` on crash, error or timeout.

    Uses ``fork`` where available (a few milliseconds), ``spawn`` elsewhere. ``fn`` and its result must pickle.
    """
    methods = multiprocessing.get_all_start_methods()
    ctx = multiprocessing.get_context("fork" if "fork" in methods else "spawn")
    recv, send = ctx.Pipe(duplex=False)
    proc = ctx.Process(target=_child, args=(send, fn, args), daemon=True)
    proc.start()
    send.close()
    try:
        if not recv.poll(timeout):
            raise TimeLimit(f"{what} did not finish within {timeout:g} s", "--time-limit")
        try:
            status, payload = recv.recv()
        except EOFError:
            proc.join(5)
            raise InternalError(
                f"{what} crashed (exit status {proc.exitcode}) on this input; the cover could not be computed"
            ) from None
    finally:
        if proc.is_alive():
            proc.kill()
        proc.join(5)
        recv.close()
    if status != "ok":
        raise InternalError(f"{what} failed: {payload}")
    return payload


def cover_cubes(fs: FunctionSets, per_output: bool, options: MinimizeOptions) -> list[Cube]:
    """Minimized cubes for ``fs``: jointly (shared terms) or each output alone, identical terms merged."""
    n, m = fs.n, fs.m
    jobs: list[tuple[int, int, set[tuple], bool]] = []
    if per_output:
        for j in range(m):
            one_on = [[c.with_outputs(1) for c in fs.on[j]]]
            one_dc = [[c.with_outputs(1) for c in fs.dc[j]]]
            jobs.append((n, 1, _rows(n, 1, one_on, one_dc), bool(fs.dc[j])))
    else:
        jobs.append((n, m, _rows(n, m, fs.on, fs.dc), any(fs.dc)))
        sig = _signature_rows(fs)
        if sig is not None:
            jobs.append((n, m, sig, any(fs.dc)))
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


def heuristic_cubes(fs: FunctionSets, options: MinimizeOptions) -> list[Cube]:
    """Alias of :func:`cover_cubes` taking the cost model from ``options``."""
    return cover_cubes(fs, options.cost == "per-output", options)


def _cube_check(fs: FunctionSets, cubes: Sequence[Cube]) -> str | None:
    """Cube-based check of ON ⊆ cover ⊆ ON ∪ DC per output (tautology checks; no enumeration)."""
    for j in range(fs.m):
        mine = [c for c in cubes if c.outputs >> j & 1]
        allowed = list(fs.on[j]) + list(fs.dc[j])
        for c in mine:
            if not cube_list_contains(allowed, c):
                return f"output {j}: cover cube {c!r} reaches the OFF set"
        for c in fs.on[j]:
            if not cube_list_contains(mine + list(fs.dc[j]), c):
                return f"output {j}: ON cube {c!r} is not covered"
    return None


def verify_cover(table: Table, cover: Cover, what: str) -> None:
    """Raise :class:`InternalError` unless ``cover`` realizes ``table`` (ON ⊆ cover ⊆ ON ∪ DC, inversion honoured).

    Exhaustive bit-parallel check up to :data:`plaforge.table.DEFAULT_ENUM_LIMIT` inputs, cube-based above.
    """
    if table.n_inputs <= DEFAULT_ENUM_LIMIT:
        from ..verify.equivalence import check_cover

        verdict = check_cover(table, cover)
        bad = [o for o in verdict.outputs if not o.passed]
        if bad:
            o = bad[0]
            raise InternalError(f"{what} returned a wrong cover: output {o.name!r} fails at point {o.failure}")
        return
    problem = _cube_check(table_sets(table, cover.inverted), cover.cubes)
    if problem:
        raise InternalError(f"{what} returned a wrong cover: {problem}")


#: Most inputs for which the heuristic path also computes the independent-row lower bound of the exact path.
BOUND_LIMIT = 10


def trivial_lower_bound(fs: FunctionSets) -> int:
    """Rows every cover needs at least, from the cubes alone: 1 if some output has a nonempty ON set."""
    return 1 if any(fs.on) else 0


def minimize_heuristic(table: Table, options: MinimizeOptions, inverted: int = 0) -> Cover:
    """Heuristic cover of ``table`` (outputs in ``inverted`` realized in complement), verified.

    ``lower_bound`` is the independent-row bound of :func:`plaforge.minimize.exact.quick_lower_bound` up to
    :data:`BOUND_LIMIT` inputs (1 above it when some output is nonempty); ``optimal`` is true only when the cover
    meets that bound, which then proves it minimum.
    """
    t0 = time.perf_counter()
    fs = table_sets(table, inverted)
    cubes = heuristic_cubes(fs, options)
    per_output = options.cost == "per-output"
    count = sum(c.outputs.bit_count() for c in cubes) if per_output else len(cubes)
    bound = trivial_lower_bound(fs)
    if table.n_inputs <= BOUND_LIMIT:
        from .exact import quick_lower_bound

        bound = max(bound, quick_lower_bound(table, inverted, per_output))
    cover = Cover(
        table.input_names, table.output_names, tuple(cubes), inverted=inverted, method="heuristic",
        optimal=count <= bound, lower_bound=min(bound, count), seconds=0.0, cost=options.cost,
    )
    verify_cover(table, cover, "the heuristic minimizer")
    return cover.with_(seconds=time.perf_counter() - t0)
