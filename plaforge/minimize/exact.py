"""Exact two-level minimization: multi-output primes, a reduced covering problem, CP-SAT.

Multi-output primes
-------------------
Let ``F_j = ON_j ∪ DC_j`` (as point sets) and, for a cube ``c``, let its *tag* be
``S(c) = {j : c ⊆ F_j}``: the outputs ``c`` may feed without reaching an OFF point. Tags are antitone (``c ⊆ d``
implies ``S(d) ⊆ S(c)``). A *multi-output prime* is a cube with ``S(c) ≠ ∅`` none of whose one-literal expansions
``d`` keeps the whole tag (``S(d) ≠ S(c)``); equivalently ``c`` is a prime implicant of the product function
``AND_{j∈S(c)} F_j``, which is the prime of multi-output Quine-McCluskey. Any cover can be rewritten, cube by cube
(``c`` feeding ``T`` ↦ a prime of ``AND_{j∈T} F_j`` containing it), into one made of such primes with no more rows
and no more literals, so the search may be restricted to them.

Tags of all ``3**n`` cubes at once (ternary table)
    An array of shape ``(3,)*n`` holds one ``uint64`` tag per cube; axis ``a`` is input ``n-1-a`` and digit 0/1/2
    means literal ``x'``/``x``/absent. Points (digits 0/1) get the bitmask of outputs whose ``F_j`` holds them;
    then for each axis in turn ``T[..2..] = T[..0..] & T[..1..]``. After axis ``a`` every entry whose digits beyond
    ``a`` are 0/1 is exact, so after the last axis all are: ``n`` vectorized passes over ``3**n`` words
    (0.5 M words at n = 12). The same pass with ``|`` over the ON sets gives, per cube, the outputs whose ON set it
    meets; a prime is kept only if it meets the ON set of an output in its tag (its *useful outputs*).

Covering problem
----------------
Elements are pairs ``(ON point, output)``; prime ``c`` covers ``(p, j)`` when ``p ∈ c`` and ``j`` is a useful
output of ``c``. Elements covered by the same primes are merged into one row. Reductions, to a fixed point:
essential primes (a row with a single prime), row dominance (a row whose primes include all primes of another row
is implied by it and dropped; found as the AND of the column bitsets of the smaller row's primes) and column
dominance (a prime whose rows are a subset of another prime's rows, with no fewer literals, is dropped; found as the
AND of the row bitsets of its rows). Rows and columns are Python-int bitsets.

Solver
------
The reduced problem is a unicost set cover, solved with OR-Tools CP-SAT: it takes a wall-clock limit natively,
reports the best objective bound while it runs (so a stopped run still yields a proven lower bound), and proves
optimality with its LP relaxation, unsatisfiable cores and clause learning. It runs 2 workers (one per core of the
target machine): the LP-heavy and the core-based full-problem searches, in deterministic interleaved mode.
Stage 1 minimizes the number of primes (rows); stage 2 fixes that number and minimizes literals. The better of a
greedy cover and the heuristic's cover mapped onto primes (and completed greedily) bounds each stage from above.
The reported lower bound on rows is
``essentials + max(CP-SAT bound, independent-row bound)``, where the independent-row bound is the size of a set of
rows no two of which share a prime (each needs its own prime).

Cost: ``O(n 3**n)`` for the tags, ``O(sum of prime sizes)`` for the matrix, then the solver's time.
"""

from __future__ import annotations

import heapq
import math
import time
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass, replace

import numpy as np

from ..core.cube import Cover, Cube
from ..core.errors import InternalError, LimitReached, SizeLimit
from ..core.table import Table, _valid_mask, unpack_bits
from .heuristic import FunctionSets, cover_cubes, merge_identical, sort_cubes, table_sets, verify_cover
from .options import MinimizeOptions
from .progress import Progress

__all__ = [
    "CoverProblem",
    "ExactResult",
    "Primes",
    "build_problem",
    "minimize_exact",
    "multi_output_primes",
    "reduce_problem",
    "solve_exact",
    "ternary_tags",
]


# -- ternary table and primes --------------------------------------------------------------------------------------
def _axis(n: int, a: int, v: int) -> tuple[slice | int, ...]:
    idx: list[slice | int] = [slice(None)] * n
    idx[a] = v
    return tuple(idx)


def ternary_tags(point_tags: np.ndarray, n: int, op: Callable[[np.ndarray, np.ndarray], np.ndarray]) -> np.ndarray:
    """Extend per-point masks to all ``3**n`` cubes with ``op`` (``&``: contained in; ``|``: meets).

    ``point_tags[p]`` is the mask of point ``p`` (bit ``i`` of ``p`` is input ``i``). Returns shape ``(3,)*n``;
    axis ``a`` is input ``n-1-a``, digit 2 means the input is absent from the cube.
    """
    t = np.zeros((3,) * n, dtype=np.uint64)
    t[(slice(0, 2),) * n] = point_tags.reshape((2,) * n)
    for a in range(n):
        t[_axis(n, a, 2)] = op(t[_axis(n, a, 0)], t[_axis(n, a, 1)])
    return t


@dataclass(frozen=True)
class Primes:
    """Multi-output primes: parallel arrays of ``care``, ``value`` masks, full ``tag`` and ``useful`` outputs."""

    care: np.ndarray
    value: np.ndarray
    tag: np.ndarray
    useful: np.ndarray

    def __len__(self) -> int:
        return int(self.care.size)

    def cube(self, i: int) -> Cube:
        return Cube(int(self.care[i]), int(self.value[i]), int(self.useful[i]))


def multi_output_primes(on: Sequence[np.ndarray], dc: Sequence[np.ndarray], n: int) -> Primes:
    """All useful multi-output primes of the function with point sets ``on[j]``, ``dc[j]`` (boolean arrays)."""
    m = len(on)
    if m > 64:
        raise SizeLimit(f"the exact path handles at most 64 outputs at once, not {m}; use --cost per-output")
    size = 1 << n
    f_tags = np.zeros(size, dtype=np.uint64)
    on_tags = np.zeros(size, dtype=np.uint64)
    for j in range(m):
        bit = np.uint64(1 << j)
        f_tags[on[j] | dc[j]] |= bit
        on_tags[on[j]] |= bit
    t = ternary_tags(f_tags, n, np.bitwise_and)
    u = ternary_tags(on_tags, n, np.bitwise_or)
    useful = t & u
    keep = useful != 0
    for a in range(n):
        mid = t[_axis(n, a, 2)]
        for v in (0, 1):
            sl = _axis(n, a, v)
            keep[sl] &= t[sl] != mid
    coords = np.nonzero(keep)
    care = np.zeros(coords[0].size if n else int(keep.sum()), dtype=np.int64)
    value = np.zeros_like(care)
    for a, digits in enumerate(coords):
        bit = np.int64(1 << (n - 1 - a))
        care |= np.where(digits != 2, bit, np.int64(0))
        value |= np.where(digits == 1, bit, np.int64(0))
    return Primes(care, value, t[keep], useful[keep])


# -- covering problem ----------------------------------------------------------------------------------------------
def _bits_of(x: int) -> Iterator[int]:
    while x:
        low = x & -x
        yield low.bit_length() - 1
        x ^= low


def _to_bitset(indices: np.ndarray, size: int) -> int:
    if indices.size == 0:
        return 0
    flags = np.zeros(size + 7, dtype=bool)
    flags[indices] = True
    return int.from_bytes(np.packbits(flags, bitorder="little").tobytes(), "little")


@dataclass
class CoverProblem:
    """Rows (merged elements) and columns (primes) as bitsets, plus what the reductions decided.

    ``rows[r]``: bitset of primes covering row ``r``; ``cols[p]``: bitset of rows prime ``p`` covers; ``alive_rows``
    / ``alive_cols``: bitsets of what is still open; ``chosen``: essential primes already in the cover;
    ``elements[p]``: per useful output ``j`` of prime ``p``, the element ids (``(point, j)`` pairs) it covers.
    """

    primes: Primes
    n_elements: int
    rows: list[int]
    cols: list[int]
    literals: list[int]
    elements: list[list[tuple[int, np.ndarray]]]
    alive_rows: int
    alive_cols: int
    chosen: list[int]


def build_problem(primes: Primes, on: Sequence[np.ndarray], n: int) -> CoverProblem:
    """Covering matrix over ``(ON point, output)`` elements, identical rows merged."""
    size = 1 << n
    m = len(on)
    eid = []
    base = 0
    for j in range(m):
        ids = np.full(size, -1, dtype=np.int64)
        where = np.flatnonzero(on[j])
        ids[where] = np.arange(base, base + where.size)
        base += where.size
        eid.append(ids)
    n_el = base
    full = size - 1
    offsets: dict[int, np.ndarray] = {}
    elements: list[list[tuple[int, np.ndarray]]] = []
    pr_parts: list[np.ndarray] = []
    el_parts: list[np.ndarray] = []
    for i in range(len(primes)):
        free = full & ~int(primes.care[i])
        offs = offsets.get(free)
        if offs is None:
            offs = np.zeros(1, dtype=np.int64)
            for b in _bits_of(free):
                offs = np.concatenate([offs, offs + (1 << b)])
            offsets[free] = offs
        pts = int(primes.value[i]) + offs
        mine = []
        for j in _bits_of(int(primes.useful[i])):
            ids = eid[j][pts]
            ids = ids[ids >= 0]
            mine.append((j, ids))
            el_parts.append(ids)
            pr_parts.append(np.full(ids.size, i, dtype=np.int64))
        elements.append(mine)
    all_el = np.concatenate(el_parts) if el_parts else np.zeros(0, dtype=np.int64)
    all_pr = np.concatenate(pr_parts) if pr_parts else np.zeros(0, dtype=np.int64)
    order = np.lexsort((all_pr, all_el))
    all_el, all_pr = all_el[order], all_pr[order]
    bounds = np.flatnonzero(np.diff(all_el)) + 1
    groups = np.split(all_pr, bounds) if all_el.size else []
    n_pr = len(primes)
    sig_row: dict[bytes, int] = {}
    rows: list[int] = []
    row_primes: list[np.ndarray] = []
    for g in groups:
        key = g.tobytes()
        if key not in sig_row:
            sig_row[key] = len(rows)
            rows.append(_to_bitset(g, n_pr))
            row_primes.append(g)
    # columns: transpose
    if row_primes:
        r_idx = np.concatenate([np.full(g.size, r, dtype=np.int64) for r, g in enumerate(row_primes)])
        p_idx = np.concatenate(row_primes)
        order = np.lexsort((r_idx, p_idx))
        r_idx, p_idx = r_idx[order], p_idx[order]
    else:
        r_idx = p_idx = np.zeros(0, dtype=np.int64)
    cols = [0] * n_pr
    if p_idx.size:
        cuts = np.flatnonzero(np.diff(p_idx)) + 1
        for grp_p, grp_r in zip(np.split(p_idx, cuts), np.split(r_idx, cuts)):
            cols[int(grp_p[0])] = _to_bitset(grp_r, len(rows))
    literals = [int(c).bit_count() for c in primes.care.tolist()]
    alive_cols = 0
    for p in range(n_pr):
        if cols[p]:
            alive_cols |= 1 << p
    return CoverProblem(primes, n_el, rows, cols, literals, elements, (1 << len(rows)) - 1, alive_cols, [])


def _drop_col(pb: CoverProblem, p: int) -> None:
    pb.alive_cols &= ~(1 << p)
    bit = ~(1 << p)
    for r in _bits_of(pb.cols[p] & pb.alive_rows):
        pb.rows[r] &= bit


def _drop_row(pb: CoverProblem, r: int) -> None:
    pb.alive_rows &= ~(1 << r)
    bit = ~(1 << r)
    for p in _bits_of(pb.rows[r]):
        pb.cols[p] &= bit


def reduce_problem(pb: CoverProblem, deadline: float) -> None:
    """Essentials, row dominance and column dominance, repeated until nothing changes (or the deadline)."""
    changed = True
    while changed and time.monotonic() < deadline:
        changed = False
        # essentials
        for r in list(_bits_of(pb.alive_rows)):
            if not pb.alive_rows >> r & 1:
                continue
            ps = pb.rows[r]
            if ps and ps & (ps - 1) == 0:
                p = ps.bit_length() - 1
                pb.chosen.append(p)
                for r2 in list(_bits_of(pb.cols[p] & pb.alive_rows)):
                    _drop_row(pb, r2)
                _drop_col(pb, p)
                changed = True
        # row dominance: drop rows that contain all primes of a smaller row
        order = sorted(_bits_of(pb.alive_rows), key=lambda r: pb.rows[r].bit_count())
        for r in order:
            if not pb.alive_rows >> r & 1:
                continue
            sup = pb.alive_rows
            for p in _bits_of(pb.rows[r]):
                sup &= pb.cols[p]
                if sup == 1 << r:
                    break
            sup &= ~(1 << r)
            for r2 in list(_bits_of(sup)):
                _drop_row(pb, r2)
                changed = True
        if time.monotonic() >= deadline:
            break
        # column dominance: drop primes whose rows another prime covers at no more literals
        order = sorted(_bits_of(pb.alive_cols), key=lambda p: (pb.cols[p].bit_count(), -pb.literals[p]))
        for p in order:
            if not pb.alive_cols >> p & 1:
                continue
            rs = pb.cols[p] & pb.alive_rows
            if not rs:
                _drop_col(pb, p)
                changed = True
                continue
            cand = pb.alive_cols & ~(1 << p)
            for r in _bits_of(rs):
                cand &= pb.rows[r]
                if not cand:
                    break
            lit = pb.literals[p]
            for q in _bits_of(cand):
                if pb.literals[q] < lit or (pb.literals[q] == lit and (pb.cols[q] & pb.alive_rows != rs or q < p)):
                    _drop_col(pb, p)
                    changed = True
                    break


def independent_rows_bound(pb: CoverProblem) -> int:
    """Size of a greedy set of open rows pairwise sharing no prime: a lower bound on primes still needed."""
    blocked = 0
    count = 0
    for r in sorted(_bits_of(pb.alive_rows), key=lambda r: (pb.rows[r].bit_count(), r)):
        if not pb.rows[r] & blocked:
            blocked |= pb.rows[r]
            count += 1
    return count


def greedy_cover(pb: CoverProblem, start: Sequence[int] = ()) -> list[int]:
    """Classical greedy set cover of the open rows (most new rows per prime, fewer literals on ties).

    ``start`` primes are taken first (e.g. the heuristic's cover mapped onto primes); greedy completes them. Gains
    only shrink as rows get covered, so a heap with lazy re-evaluation finds each best prime without rescanning all.
    """
    left = pb.alive_rows
    picked: list[int] = list(start)
    for p in picked:
        left &= ~pb.cols[p]
    heap = [(-(pb.cols[p] & left).bit_count(), pb.literals[p], p) for p in _bits_of(pb.alive_cols)]
    heapq.heapify(heap)
    while left and heap:
        _, lit, p = heapq.heappop(heap)
        gain = (pb.cols[p] & left).bit_count()
        if gain == 0:
            continue
        if heap and (-gain, lit, p) > heap[0]:
            heapq.heappush(heap, (-gain, lit, p))
            continue
        picked.append(p)
        left &= ~pb.cols[p]
    return picked


# -- mapping heuristic cubes to primes -----------------------------------------------------------------------------
def _ternary_index(care: int, value: int, n: int) -> tuple[int, ...]:
    return tuple((1 if value >> i & 1 else 0) if care >> i & 1 else 2 for i in range(n - 1, -1, -1))


def _map_to_primes(cubes: Sequence[Cube], primes: Primes, tags: np.ndarray, n: int) -> list[int]:
    """Expand each cube to a prime keeping its outputs in the tag; indices into ``primes`` where found."""
    index = {(int(c), int(v)): i for i, (c, v) in enumerate(zip(primes.care.tolist(), primes.value.tolist()))}
    out = []
    for cube in cubes:
        care, value = cube.care, cube.value
        need = np.uint64(cube.outputs)
        if tags[_ternary_index(care, value, n)] & need != need:
            continue
        for i in range(n):
            bit = 1 << i
            if care & bit:
                c2, v2 = care & ~bit, value & ~bit
                if tags[_ternary_index(c2, v2, n)] & need == need:
                    care, value = c2, v2
        i = index.get((care, value))
        if i is not None:
            out.append(i)
    return out


# -- solving -------------------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class ExactResult:
    """Chosen prime indices, with whether rows (and literals) were proven minimum and the row lower bound."""

    chosen: tuple[int, ...]
    optimal: bool
    literals_optimal: bool
    lower_bound: int
    stats: tuple[tuple[str, object], ...]


def _cp_sat(pb: CoverProblem, cols: list[int], rows: list[int], hint: set[int], deadline: float,
            progress: Progress, rows_target: int | None) -> tuple[list[int] | None, bool, float]:
    """One CP-SAT solve: minimum primes (``rows_target`` None) or minimum literals at ``rows_target`` primes.

    ``hint`` is a known cover; the model asks for one no worse. Returns (chosen primes or None, proven, bound).
    """
    from ortools.sat.python import cp_model

    model = cp_model.CpModel()
    x = {p: model.NewBoolVar(f"p{p}") for p in cols}
    for r in rows:
        model.AddBoolOr([x[p] for p in _bits_of(pb.rows[r])])
    # The known cover enters as an upper bound, not as a solution hint: on these set-cover models a hint steered
    # the search into long detours (the 9-input symmetric function took 10 s with it, 4 s with the bound).
    if rows_target is None:
        model.Add(sum(x.values()) <= len(hint))
        model.Minimize(sum(x.values()))
    else:
        model.Add(sum(x.values()) == rows_target)
        lits = sum(pb.literals[p] * x[p] for p in cols)
        model.Add(lits <= sum(pb.literals[p] for p in hint))
        model.Minimize(lits)
    solver = cp_model.CpSolver()
    # Two workers, one per core: an LP-based search (its bound proves set-cover minima quickly) and a core-based
    # one (MaxSAT-style unsatisfiable cores raise the bound); interleaved deterministically, so the same input gives
    # the same cover.
    solver.parameters.num_workers = 2
    solver.parameters.subsolvers.extend(["max_lp", "core"])
    solver.parameters.interleave_search = True
    solver.parameters.random_seed = 1
    solver.parameters.max_time_in_seconds = max(0.05, deadline - time.monotonic())
    what = "rows" if rows_target is None else "literals"

    class _Seen(cp_model.CpSolverSolutionCallback):
        def on_solution_callback(self) -> None:
            progress.update(**{f"best {what}": round(self.ObjectiveValue())})

    solver.best_bound_callback = lambda b: progress.update(**{f"{what} bound": math.ceil(b - 1e-6)})
    status = solver.Solve(model, _Seen())
    if status in (cp_model.OPTIMAL, cp_model.FEASIBLE):
        picked = [p for p in cols if solver.BooleanValue(x[p])]
        return picked, status == cp_model.OPTIMAL, solver.BestObjectiveBound()
    if status == cp_model.INFEASIBLE:
        return None, False, float("inf")
    return None, False, solver.BestObjectiveBound()


def solve_exact(on: Sequence[np.ndarray], dc: Sequence[np.ndarray], n: int, heuristic: Sequence[Cube],
                deadline: float, progress: Progress) -> tuple[Primes, CoverProblem, ExactResult]:
    """Minimum cover of the function with point sets ``on``/``dc``; see the module docs for the method."""
    progress.stage("generating multi-output primes")
    primes = multi_output_primes(on, dc, n)
    progress.update(primes=len(primes))
    progress.stage("building the covering problem")
    pb = build_problem(primes, on, n)
    n_rows0, n_cols0 = pb.alive_rows.bit_count(), pb.alive_cols.bit_count()
    progress.update(elements=pb.n_elements, rows=n_rows0)
    progress.stage("reducing (essentials, dominance)")
    reduce_problem(pb, deadline)
    rows = list(_bits_of(pb.alive_rows))
    cols = list(_bits_of(pb.alive_cols))
    ess = len(pb.chosen)
    progress.update(essential=ess, **{"rows left": len(rows), "primes left": len(cols)})
    stats: list[tuple[str, object]] = [
        ("primes", len(primes)), ("elements", pb.n_elements), ("rows", n_rows0), ("columns", n_cols0),
        ("essential", ess), ("rows_reduced", len(rows)), ("columns_reduced", len(cols)),
    ]
    if not rows:
        return primes, pb, ExactResult(tuple(pb.chosen), True, True, ess, tuple(stats))
    indep = independent_rows_bound(pb)
    greedy = greedy_cover(pb)
    tags_full = ternary_tags(_point_tags(on, dc, n), n, np.bitwise_and)
    mapped = [p for p in dict.fromkeys(_map_to_primes(heuristic, primes, tags_full, n)) if pb.alive_cols >> p & 1]
    completed = greedy_cover(pb, mapped)
    hint = completed if len(completed) < len(greedy) else greedy
    progress.update(**{"best rows": ess + len(hint), "rows bound": ess + indep})
    if time.monotonic() < deadline:
        progress.stage("solving minimum cover (CP-SAT)")
        picked, proven, bound = _cp_sat(pb, cols, rows, set(hint), deadline, _Offset(progress, ess), None)
    else:
        picked, proven, bound = None, False, 0.0
    if picked is None or len(picked) > len(hint):
        picked, proven = list(hint), False
    lb = ess + max(indep, math.ceil(bound - 1e-6) if math.isfinite(bound) else 0)
    if proven:
        lb = ess + len(picked)
    lb = min(lb, ess + len(picked))
    # Literals at this row count are at least the sum of the len(picked) smallest literal counts; when the cover
    # already meets that bound (e.g. all primes equally wide) there is nothing for stage 2 to find.
    floor = sum(sorted(pb.literals[p] for p in cols)[: len(picked)])
    lit_opt = sum(pb.literals[p] for p in picked) == floor
    if not lit_opt and time.monotonic() < deadline - 0.2:
        progress.stage("minimizing literals at that row count (CP-SAT)")
        picked2, lit_opt, _ = _cp_sat(pb, cols, rows, set(picked), deadline, progress, len(picked))
        if picked2 is not None:
            lits = sum(pb.literals[p] for p in picked)
            if sum(pb.literals[p] for p in picked2) <= lits:
                picked = picked2
    stats.append(("independent_bound", ess + indep))
    return primes, pb, ExactResult(tuple(pb.chosen) + tuple(picked), proven, proven and lit_opt, lb, tuple(stats))


class _Offset:
    """Progress proxy adding the essential primes to row counts shown."""

    def __init__(self, inner: Progress, offset: int) -> None:
        self.inner, self.offset = inner, offset

    def update(self, **fields: int) -> None:
        self.inner.update(**{k: v + self.offset for k, v in fields.items()})

    def stage(self, text: str) -> None:
        self.inner.stage(text)


def _point_tags(on: Sequence[np.ndarray], dc: Sequence[np.ndarray], n: int) -> np.ndarray:
    tags = np.zeros(1 << n, dtype=np.uint64)
    for j in range(len(on)):
        tags[on[j] | dc[j]] |= np.uint64(1 << j)
    return tags


def _irredundant(pb: CoverProblem, chosen: Sequence[int]) -> list[Cube]:
    """Cubes of the chosen primes, each feeding only outputs where it is not redundant."""
    count = np.zeros(pb.n_elements, dtype=np.int64)
    for p in chosen:
        for _, ids in pb.elements[p]:
            np.add.at(count, ids, 1)
    outputs = {p: int(pb.primes.useful[p]) for p in chosen}
    for p in sorted(chosen, key=lambda p: (-pb.literals[p], p)):
        for j, ids in pb.elements[p]:
            if ids.size == 0 or (count[ids] >= 2).all():
                outputs[p] &= ~(1 << j)
                np.add.at(count, ids, -1)
    return [Cube(int(pb.primes.care[p]), int(pb.primes.value[p]), outputs[p]) for p in chosen if outputs[p]]


def quick_lower_bound(table: Table, inverted: int, per_output: bool) -> int:
    """A lower bound on rows (or, per output, on summed terms) without solving.

    Essential primes found by the reductions (at most a second of them), plus the independent-row bound of what is
    left: rows no two of which share a prime each need a prime of their own, and a minimum cover can always be made
    of primes. Cost: the prime generation, matrix and reductions of the exact path, no solver.
    """
    n = table.n_inputs
    on, dc = _point_sets(table, inverted)
    groups = [[j] for j in range(table.n_outputs)] if per_output else [list(range(table.n_outputs))]
    total = 0
    for group in groups:
        sub_on = [on[j] for j in group]
        if not any(a.any() for a in sub_on):
            continue
        pb = build_problem(multi_output_primes(sub_on, [dc[j] for j in group], n), sub_on, n)
        before = independent_rows_bound(pb)
        reduce_problem(pb, time.monotonic() + 1.0)
        total += max(before, len(pb.chosen) + independent_rows_bound(pb))
    return total


# -- the public entry ----------------------------------------------------------------------------------------------
def _point_sets(table: Table, inverted: int) -> tuple[list[np.ndarray], list[np.ndarray]]:
    n = table.n_inputs
    on, dc = [], []
    for j in range(table.n_outputs):
        on_b, dc_b = table.truth(j, limit=max(n, 1))
        if inverted >> j & 1:
            on_b = ~(on_b | dc_b) & _valid_mask(n)
        on.append(unpack_bits(on_b, n))
        dc.append(unpack_bits(dc_b, n))
    return on, dc


def minimize_exact(table: Table, options: MinimizeOptions, inverted: int = 0) -> Cover:
    """Proven-minimum cover of ``table`` (rows, then literals) under ``options.cost``; verified."""
    t0 = time.perf_counter()
    deadline = time.monotonic() + options.time_limit
    n, m = table.n_inputs, table.n_outputs
    if n > options.exact_limit:
        raise SizeLimit(
            f"{table.source or 'table'}: the exact path enumerates 3^{n} cubes, above its limit of "
            f"{options.exact_limit} inputs; use the heuristic (drop --exact)"
        )
    on, dc = _point_sets(table, inverted)
    fs: FunctionSets = table_sets(table, inverted)
    per_output = options.cost == "per-output"
    # The heuristic cover only seeds the solver (and is the fallback): a third of the budget, and none at all is fine.
    try:
        heur: list[Cube] | None = cover_cubes(
            fs, per_output, replace(options, time_limit=max(0.5, options.time_limit / 3)))
    except (InternalError, LimitReached):
        heur = None
    with Progress(options.progress, f"exact minimization of {table.source or 'table'}") as progress:
        groups = [[j] for j in range(m)] if per_output else [list(range(m))]
        cubes: list[Cube] = []
        optimal = lits_optimal = True
        bound = 0
        stats: list[tuple[str, object]] = []
        for k, group in enumerate(groups):
            left = len(groups) - k
            sub_deadline = time.monotonic() + max(0.1, (deadline - time.monotonic()) / left)
            sub_on = [on[j] for j in group]
            sub_dc = [dc[j] for j in group]
            mask = sum(1 << j for j in group)
            sub_heur = [
                Cube(c.care, c.value, _squeeze(c.outputs & mask, group)) for c in heur or () if c.outputs & mask
            ]
            if per_output:
                progress.stage(f"output {table.output_names[group[0]]}")
            _, pb, res = solve_exact(sub_on, sub_dc, n, sub_heur, sub_deadline, progress)
            got = [Cube(c.care, c.value, _spread(c.outputs, group)) for c in _irredundant(pb, res.chosen)]
            if heur is not None and len(got) > len(sub_heur):  # the solver did worse than its seed: keep the seed
                got = [Cube(c.care, c.value, _spread(c.outputs, group)) for c in sub_heur]
            cubes += got
            optimal &= res.optimal
            lits_optimal &= res.literals_optimal
            bound += res.lower_bound
            stats += [(f"{k}:{key}" if per_output else key, v) for key, v in res.stats]
    cubes = sort_cubes(merge_identical(cubes))
    total = sum(c.outputs.bit_count() for c in cubes) if per_output else len(cubes)
    cover = Cover(
        table.input_names, table.output_names, tuple(cubes), inverted=inverted, method="exact",
        optimal=optimal, lower_bound=min(bound, total), seconds=0.0, cost=options.cost,
        extra=tuple(stats) + (("literals_optimal", lits_optimal),),
    )
    verify_cover(table, cover, "the exact minimizer")
    return cover.with_(seconds=time.perf_counter() - t0)


def _squeeze(outputs: int, group: Sequence[int]) -> int:
    return sum(1 << k for k, j in enumerate(group) if outputs >> j & 1)


def _spread(outputs: int, group: Sequence[int]) -> int:
    return sum(1 << j for k, j in enumerate(group) if outputs >> k & 1)
