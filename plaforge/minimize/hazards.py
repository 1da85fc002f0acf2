"""Covers free of static hazards for single-input changes.

A two-level cover is free of static hazards for single-input changes when every pair of adjacent points that must
stay 1 lies inside one product term of the output (Eichelberger's condition; see :mod:`plaforge.verify.hazards`).
Each such pair is a 1-dimensional cube inside the output's ON set, so some prime implicant holds it: the problem is
a covering problem over primes whose elements are the ON points *and* the adjacent ON pairs.

Scopes
------
``care`` (default)
    Pairs of care ON points only; a don't-care point may be left out of a term or not, as the minimizer likes.
``all``
    Don't-care points are made ON: the cover sets every don't-care point to 1 and covers every adjacent pair among
    ON and don't-care points, so no change between specified-or-not points can glitch.

Paths
-----
heuristic
    Start from the ordinary cover; for each hazard transition cube (itself an implicant), use an existing term of
    another output that holds it and is an implicant of this one, or expand it to a prime (drop literals while it
    meets no OFF point) and add it; then drop terms (output by output, most literals first) that the cover can lose
    and stay a hazard-free cover. Not proven minimum; the ordinary cover's lower bound still holds.
exact
    Multi-output primes (:mod:`plaforge.minimize.primes`), elements ``(ON point, output)`` and ``(adjacent pair,
    output)`` merged when the same primes hold them, and a CP-SAT model: minimum rows (shared cost) or terms summed
    per output, then minimum literals. At the time limit: the best cover found (or the heuristic one) and the bound.
"""

from __future__ import annotations

import math
import time
from collections.abc import Sequence

import numpy as np

from ..core.cube import Cover, Cube, cube_list_contains, merge_identical
from ..core.errors import InternalError, SizeLimit
from ..core.table import Table
from ..verify.hazards import output_hazards
from .covering import on_points
from .options import MinimizeOptions
from .primes import Budget, multi_output_primes
from .result import sort_cubes, term_count, verify_cover

__all__ = ["SCOPES", "added_terms", "hazard_free_cover"]

SCOPES = ("care", "all")
"""Which adjacent pairs a hazard-free cover must hold: ``care`` ON pairs only, or ``all`` (don't-cares made ON)."""


def _sets(table: Table, cover: Cover, j: int, scope: str) -> tuple[list[Cube], list[Cube], list[Cube]]:
    """(points that must stay 1, their don't-cares, OFF) of output ``j`` as the cover realizes it (raw OR)."""
    inv = cover.is_inverted(j)
    on = list(table.off_cubes(j) if inv else table.on_cubes(j))
    off = list(table.on_cubes(j) if inv else table.off_cubes(j))
    dc = list(table.dc_cubes(j))
    return (on + dc, [], off) if scope == "all" else (on, dc, off)


def _implicant(c: Cube, off: Sequence[Cube]) -> bool:
    return not any(c.intersects(o) for o in off)


def _expand(c: Cube, off: Sequence[Cube]) -> Cube:
    """A prime containing the implicant ``c``: literals dropped lowest input first while no OFF point is met."""
    m = c.care
    while m:
        low = m & -m
        m ^= low
        trial = Cube(c.care & ~low, c.value & ~low, c.outputs)
        if _implicant(trial, off):
            c = trial
    return c


def _add(cubes: list[Cube], c: Cube) -> None:
    for k, d in enumerate(cubes):
        if d.care == c.care and d.value == c.value:
            cubes[k] = d.with_outputs(d.outputs | c.outputs)
            return
    cubes.append(c)


def _valid(must: Sequence[Cube], terms: Sequence[Cube], n: int, changing: int) -> bool:
    return all(cube_list_contains(terms, c) for c in must) and not output_hazards(must, terms, n, changing)


def _heuristic(table: Table, cover: Cover, scope: str, changing: int, deadline: float) -> list[Cube]:
    n = table.n_inputs
    cubes = list(cover.cubes)
    sets = [_sets(table, cover, j, scope) for j in range(table.n_outputs)]
    for j, (must, _dc, off) in enumerate(sets):
        bit = 1 << j
        for c in must:  # scope "all": don't-care points the cover leaves out get a prime each
            mine = [d for d in cubes if d.outputs & bit]
            if not cube_list_contains(mine, c):
                _add(cubes, _expand(c.with_outputs(bit), off))
        while True:
            mine = [d for d in cubes if d.outputs & bit]
            found = output_hazards(must, mine, n, changing)
            if not found:
                break
            for t in sorted(found, key=lambda t: (-t.pairs(), t.input, t.cube.care, t.cube.value)):
                if any(d.outputs & bit and d.contains(t.cube) for d in cubes):
                    continue
                shared = next((k for k, d in enumerate(cubes) if d.contains(t.cube) and _implicant(d, off)), None)
                if shared is not None:
                    cubes[shared] = cubes[shared].with_outputs(cubes[shared].outputs | bit)
                else:
                    _add(cubes, _expand(t.cube.with_outputs(bit), off))
    # irredundancy: drop a term from an output when the output stays covered and hazard-free without it
    order = sorted(range(len(cubes)), key=lambda k: (-cubes[k].literals, cubes[k].care, cubes[k].value))
    for k in order:
        for j in range(table.n_outputs):
            if time.monotonic() > deadline:
                break
            if not cubes[k].outputs >> j & 1:
                continue
            # only the points and pairs inside the term depend on it
            t = cubes[k]
            inside = [x for x in (c.intersect(t) for c in sets[j][0]) if x is not None]
            rest = [d for q, d in enumerate(cubes) if q != k and d.outputs >> j & 1 and d.intersects(t)]
            if _valid(inside, rest, n, changing & ~t.care):
                cubes[k] = cubes[k].with_outputs(cubes[k].outputs & ~(1 << j))
    return [c for c in cubes if c.outputs]


def _elements(must: Sequence[Cube], n: int, changing: int) -> tuple[np.ndarray, np.ndarray]:
    """Elements of one output: ON points (``free`` 0) and adjacent ON pairs (lower point, ``free`` the changing
    input's bit), as parallel arrays (point, free mask)."""
    pts = on_points(must, n) if must else np.zeros(0, dtype=np.int64)
    points, frees = [pts], [np.zeros(pts.size, dtype=np.int64)]
    for i in range(n):
        bit = 1 << i
        if not changing & bit:
            continue
        low = pts[(pts & bit) == 0]
        low = low[np.isin(low | bit, pts)]
        points.append(low)
        frees.append(np.full(low.size, bit, dtype=np.int64))
    return np.concatenate(points), np.concatenate(frees)


def _exact(table: Table, cover: Cover, scope: str, changing: int, options: MinimizeOptions, deadline: float,
           seed: list[Cube]) -> tuple[list[Cube], bool, int]:
    """(cubes, rows proven minimum, lower bound) of the exact path; ``seed`` is the heuristic hazard-free cover."""
    from ortools.sat.python import cp_model

    n, m = table.n_inputs, table.n_outputs
    if n > options.exact_limit:
        raise SizeLimit(f"a hazard-free cover is proven minimum for at most {options.exact_limit} inputs, not {n}; "
                        "drop --exact")
    budget = Budget(deadline, options.memory_limit << 20)
    sets = [_sets(table, cover, j, scope) for j in range(m)]
    primes = multi_output_primes([s[0] + s[1] for s in sets], [s[0] for s in sets], n, budget,
                                 (options.memory_limit << 20) // 8192)
    per_output = options.cost == "per-output"
    care, value = primes.care, primes.value
    units: list[tuple[int, int]] = []  # (prime, outputs it feeds when chosen)
    index: dict[tuple[int, int], int] = {}
    for p in range(len(primes)):
        tag = primes.tag(p) & ((1 << m) - 1)
        if per_output:
            for j in range(m):
                if tag >> j & 1:
                    index[(p, j)] = len(units)
                    units.append((p, 1 << j))
        else:
            for j in range(m):
                index[(p, j)] = len(units)
            units.append((p, tag))
    rows: set[bytes] = set()
    constraints: list[np.ndarray] = []
    useful = [0] * len(units)
    for j, (must, _dc, _off) in enumerate(sets):
        idx = np.flatnonzero(primes.has(j))
        pt, free = _elements(must, n, changing)
        if not pt.size:
            continue
        budget.size(float(idx.size) * pt.size, f"for a {idx.size:,} x {pt.size:,} hazard covering matrix")
        budget.time("building the hazard covering problem")
        holds = ((pt[None, :] & care[idx, None]) == value[idx, None]) & ((free[None, :] & care[idx, None]) == 0)
        unit_of = np.array([index.get((int(p), j), -1) for p in idx], dtype=np.int64)
        for r in np.flatnonzero(holds.any(axis=1)):
            useful[int(unit_of[r])] |= 1 << j
        packed = np.packbits(holds, axis=0).T
        uniq = np.unique(packed, axis=0)
        for row in uniq:
            hit = np.flatnonzero(np.unpackbits(row)[:idx.size])
            if hit.size == 0:
                raise InternalError("an adjacent ON pair is held by no prime")
            con = np.unique(unit_of[hit])
            if con.tobytes() not in rows:
                rows.add(con.tobytes())
                constraints.append(con)
    lits = [int(care[p]).bit_count() for p, _ in units]
    model = cp_model.CpModel()
    x = [model.NewBoolVar(f"u{k}") for k in range(len(units))]
    for con in constraints:
        model.AddBoolOr([x[int(k)] for k in con])
    count = sum(x)
    model.Add(count <= term_count(seed, per_output))

    def solve(objective: object) -> tuple[int, float]:
        model.Minimize(objective)
        solver = cp_model.CpSolver()
        solver.parameters.num_workers = 2
        solver.parameters.random_seed = 1
        solver.parameters.max_time_in_seconds = max(0.05, deadline - time.monotonic())
        status = solver.Solve(model)
        if status not in (cp_model.OPTIMAL, cp_model.FEASIBLE):
            return -1, solver.BestObjectiveBound() if status != cp_model.INFEASIBLE else math.inf
        picked = [k for k in range(len(units)) if solver.BooleanValue(x[k])]
        solve.picked = picked  # type: ignore[attr-defined]
        return int(status == cp_model.OPTIMAL), solver.BestObjectiveBound()

    proven, bound = solve(count)
    if proven < 0:
        return seed, False, max(0, math.ceil(bound - 1e-6)) if bound != math.inf else 0
    best_rows = len(solve.picked)  # type: ignore[attr-defined]
    if proven:
        model.Add(count == best_rows)
        solve(sum(lits[k] * x[k] for k in range(len(units))))
    cubes = []
    for k in solve.picked:  # type: ignore[attr-defined]
        p, outs = units[k]
        c = Cube(int(care[p]), int(value[p]), outs & useful[k])
        if c.outputs:
            cubes.append(c)
    cubes = merge_identical(cubes)
    if term_count(cubes, per_output) > term_count(seed, per_output):
        return seed, False, math.ceil(bound - 1e-6)
    return cubes, bool(proven), best_rows if proven else math.ceil(bound - 1e-6)


def added_terms(before: Cover, after: Cover) -> list[Cube]:
    """The terms of ``after`` not in ``before``, each with only the outputs ``before`` did not feed from it."""
    old = {(c.care, c.value): c.outputs for c in before.cubes}
    out = []
    for c in after.cubes:
        extra = c.outputs & ~old.get((c.care, c.value), 0)
        if extra:
            out.append(c.with_outputs(extra))
    return out


def hazard_free_cover(table: Table, cover: Cover, *, scope: str = "care", changing: int | None = None,
                      options: MinimizeOptions | None = None) -> Cover:
    """A cover of ``table`` free of static hazards for single-input changes of the ``changing`` inputs.

    Parameters
    ----------
    table : Table
    cover : Cover
        The ordinary cover of ``table`` to start from (its inverted outputs and cost model are kept).
    scope : {"care", "all"}
        See the module docs.
    changing : int, optional
        Bitmask of the inputs that may change (default: all).
    options : MinimizeOptions, optional
        ``exact`` for the proven-minimum path; ``time_limit`` bounds the call; ``cost``, ``memory_limit``,
        ``exact_limit`` as for :func:`plaforge.minimize.minimize`.

    Returns
    -------
    Cover
        Verified against ``table`` and against Eichelberger's condition; ``extra`` gains ``("hazard_free",
        scope)``.

    Raises
    ------
    plaforge.core.errors.SizeLimit
        The exact path was asked for more inputs than ``options.exact_limit`` or estimated a step above the memory
        limit.
    """
    if scope not in SCOPES:
        raise ValueError(f"scope must be one of {SCOPES}, not {scope!r}")
    opts = options if options is not None else MinimizeOptions()
    t0 = time.perf_counter()
    deadline = time.monotonic() + opts.time_limit
    n = table.n_inputs
    mask = (1 << n) - 1 if changing is None else changing
    cubes = _heuristic(table, cover, scope, mask, deadline)
    optimal, bound = False, cover.lower_bound
    if opts.exact:
        cubes, optimal, found = _exact(table, cover, scope, mask, opts, deadline, cubes)
        bound = max(found, cover.lower_bound)  # a hazard-free cover is a cover: the ordinary bound holds too
    rows = sort_cubes(merge_identical(cubes))
    result = cover.with_(cubes=tuple(rows), method="exact" if opts.exact else "heuristic", optimal=optimal,
                         lower_bound=min(bound, term_count(rows, opts.cost == "per-output")),
                         extra=cover.extra + (("hazard_free", scope),))
    verify_cover(table, result, "the hazard-free cover")
    for j in range(table.n_outputs):
        must = _sets(table, result, j, scope)[0]
        if output_hazards(must, result.cubes_for(j), n, mask):
            raise InternalError(f"the hazard-free cover left a hazard on output {table.output_names[j]!r}")
    return result.with_(seconds=cover.seconds + time.perf_counter() - t0)
