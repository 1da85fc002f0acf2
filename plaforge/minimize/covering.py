"""Multi-output prime implicants and the covering problem over them, with its reductions and cheap bounds.

Primes come from :mod:`plaforge.minimize.primes` (generated from cubes; any number of outputs).

Covering problem
----------------
Elements are pairs ``(ON point, output)``; prime ``c`` covers ``(p, j)`` when ``p ∈ c`` and ``j`` is a useful
output of ``c``. Elements covered by exactly the same primes are merged into one *target* (a row of the covering
matrix; the word "row" is kept for the product terms of a cover). Reductions, to a fixed point: essential primes
(a target with a single prime), target dominance (a target whose primes include all primes of another target is
implied by it and dropped; found as the AND of the target bitsets of the smaller target's primes) and prime
dominance (a prime whose targets are a subset of another prime's targets, with no fewer literals, is dropped; found
as the AND of the prime bitsets of its targets). Both directions are Python-int bitsets.

Phase choice (*guards*)
    For the double-phase function (output ``j`` and its complement ``m + j``, see :mod:`plaforge.minimize.exact`)
    every element carries a *guard*: the output it belongs to, needed only when that output's phase is chosen.
    Elements merge only with equal guards; a target is essential only without a guard, and target dominance drops
    ``t2`` for ``t1`` only when ``t1`` has no guard or the same one. Prime dominance is unaffected.

Cost: ``O(primes x ON points)`` per output for the matrix (vectorized), estimated and budgeted first.
"""

from __future__ import annotations

import heapq
import time
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass

import numpy as np

from ..core.cube import Cube, cube_list_contains
from ..core.errors import LimitReached
from ..core.table import FunctionSets
from .primes import Budget, Primes, multi_output_primes

__all__ = [
    "CoverProblem",
    "Primes",
    "bits_of",
    "build_problem",
    "greedy_cover",
    "incompatible_points_bound",
    "independent_targets_bound",
    "on_points",
    "phase_lower_bound",
    "quick_lower_bound",
    "reduce_problem",
]


# -- covering problem ----------------------------------------------------------------------------------------------
def bits_of(x: int) -> Iterator[int]:
    """Indices of the set bits of ``x``, lowest first."""
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
    """Targets (merged elements) and primes as bitsets of each other, plus what the reductions decided.

    ``covered_by[t]``: bitset of the primes covering target ``t``; ``covers[p]``: bitset of the targets prime ``p``
    covers; ``guards[t]``: the output target ``t`` belongs to when it is needed only in that output's phase, else
    -1; ``open_targets`` / ``open_primes``: bitsets of what is still open; ``chosen``: essential primes already in
    the cover; ``elements[p]``: per useful output ``j`` of prime ``p``, the element ids (``(point, j)`` pairs) it
    covers.
    """

    primes: Primes
    n_elements: int
    covered_by: list[int]
    covers: list[int]
    literals: list[int]
    elements: list[list[tuple[int, np.ndarray]]]
    guards: list[int]
    open_targets: int
    open_primes: int
    chosen: list[int]

    def useful(self, p: int) -> int:
        """Outputs prime ``p`` covers some element of (bit ``j``: output ``j``)."""
        return sum(1 << j for j, _ in self.elements[p])

    def needed(self, outputs: int) -> int:
        """Bitset of the open targets needed when the guarded outputs in ``outputs`` are the chosen phases."""
        return sum(1 << t for t in bits_of(self.open_targets) if self.guards[t] < 0 or outputs >> self.guards[t] & 1)


def on_points(cubes: Sequence[Cube], n: int) -> np.ndarray:
    """Sorted distinct points of ``cubes`` (``int64``)."""
    parts = []
    for c in cubes:
        offs = np.zeros(1, dtype=np.int64)
        for b in bits_of(((1 << n) - 1) & ~c.care):
            offs = np.concatenate([offs, offs + (1 << b)])
        parts.append(c.value + offs)
    return np.unique(np.concatenate(parts)) if parts else np.zeros(0, dtype=np.int64)


def build_problem(primes: Primes, on: Sequence[Sequence[Cube]], n: int, budget: Budget,
                  guarded: bool = False) -> CoverProblem:
    """Covering matrix over ``(ON point, output)`` elements, elements covered by the same primes merged.

    With ``guarded`` every element's guard is its output (see the module docs); otherwise there are no guards.
    """
    points = sum(sum(2.0 ** (n - c.literals) for c in cubes) for cubes in on)
    budget.size(points * 24, f"for {points:,.0f} (ON point, output) elements")
    pts = [on_points(cubes, n) for cubes in on]
    work = sum(float(np.count_nonzero(primes.has(j))) * pts[j].size for j in range(len(on)))
    budget.size(work / 4, f"to relate {len(primes):,} primes to {points:,.0f} elements")
    el_parts: list[np.ndarray] = []
    pr_parts: list[np.ndarray] = []
    per_prime: list[list[tuple[int, np.ndarray]]] = [[] for _ in range(len(primes))]
    base = 0
    guard_of = np.zeros(0, dtype=np.int64)
    for j, pj in enumerate(pts):
        idx = np.flatnonzero(primes.has(j))
        if pj.size and idx.size:
            step = max(1, (1 << 22) // pj.size)
            for s in range(0, idx.size, step):
                budget.time("building the covering problem")
                sel = idx[s:s + step]
                inside = (pj[None, :] & primes.care[sel, None]) == primes.value[sel, None]
                rows, cols = np.nonzero(inside)
                ids = base + cols
                el_parts.append(ids)
                pr_parts.append(sel[rows])
                cuts = np.flatnonzero(np.diff(rows)) + 1
                for grp_r, grp_i in zip(np.split(rows, cuts), np.split(ids, cuts)):
                    if grp_r.size:
                        per_prime[int(sel[grp_r[0]])].append((j, grp_i))
        guard_of = np.concatenate([guard_of, np.full(pj.size, j if guarded else -1, dtype=np.int64)])
        base += pj.size
    n_el = base
    all_el = np.concatenate(el_parts) if el_parts else np.zeros(0, dtype=np.int64)
    all_pr = np.concatenate(pr_parts) if pr_parts else np.zeros(0, dtype=np.int64)
    order = np.lexsort((all_pr, all_el))
    all_el, all_pr = all_el[order], all_pr[order]
    cuts = np.flatnonzero(np.diff(all_el)) + 1
    n_pr = len(primes)
    target_of: dict[tuple[int, bytes], int] = {}
    target_primes: list[np.ndarray] = []
    guards: list[int] = []
    for g, e in zip(np.split(all_pr, cuts), np.split(all_el, cuts)) if all_el.size else ():
        key = (int(guard_of[e[0]]), g.tobytes())
        if key not in target_of:
            target_of[key] = len(target_primes)
            target_primes.append(g)
            guards.append(key[0])
    budget.size(2.0 * len(target_primes) * n_pr / 8, f"for a {len(target_primes):,} x {n_pr:,} covering matrix")
    covered_by = [_to_bitset(g, n_pr) for g in target_primes]
    covers = [0] * n_pr
    if target_primes:
        t_idx = np.concatenate([np.full(g.size, t, dtype=np.int64) for t, g in enumerate(target_primes)])
        p_idx = np.concatenate(target_primes)
        order = np.lexsort((t_idx, p_idx))
        t_idx, p_idx = t_idx[order], p_idx[order]
        cuts = np.flatnonzero(np.diff(p_idx)) + 1
        for grp_p, grp_t in zip(np.split(p_idx, cuts), np.split(t_idx, cuts)):
            covers[int(grp_p[0])] = _to_bitset(grp_t, len(target_primes))
    literals = [int(c).bit_count() for c in primes.care.tolist()]
    open_primes = sum(1 << p for p in range(n_pr) if covers[p])
    return CoverProblem(primes, n_el, covered_by, covers, literals, per_prime, guards,
                        (1 << len(target_primes)) - 1, open_primes, [])


def _drop_prime(pb: CoverProblem, p: int) -> None:
    pb.open_primes &= ~(1 << p)
    bit = ~(1 << p)
    for t in bits_of(pb.covers[p] & pb.open_targets):
        pb.covered_by[t] &= bit


def _drop_target(pb: CoverProblem, t: int) -> None:
    pb.open_targets &= ~(1 << t)
    bit = ~(1 << t)
    for p in bits_of(pb.covered_by[t]):
        pb.covers[p] &= bit


def reduce_problem(pb: CoverProblem, deadline: float, stop: Callable[[], bool] | None = None) -> None:
    """Essentials, target dominance and prime dominance, repeated until nothing changes (or the deadline, or
    ``stop()`` returning true, checked every few steps: each reduction alone keeps a minimum cover, so stopping
    anywhere leaves a sound problem)."""
    changed = True
    steps = 0

    def late() -> bool:
        nonlocal steps
        steps += 1
        return steps % 64 == 0 and (time.monotonic() >= deadline or (stop is not None and stop()))

    while changed and time.monotonic() < deadline:
        changed = False
        # essentials
        for t in list(bits_of(pb.open_targets)):
            if late():
                return
            if not pb.open_targets >> t & 1:
                continue
            ps = pb.covered_by[t]
            if pb.guards[t] < 0 and ps and ps & (ps - 1) == 0:
                p = ps.bit_length() - 1
                pb.chosen.append(p)
                for t2 in list(bits_of(pb.covers[p] & pb.open_targets)):
                    _drop_target(pb, t2)
                _drop_prime(pb, p)
                changed = True
        # target dominance: drop targets that contain all primes of a smaller target
        order = sorted(bits_of(pb.open_targets), key=lambda t: pb.covered_by[t].bit_count())
        for t in order:
            if late():
                return
            if not pb.open_targets >> t & 1:
                continue
            sup = pb.open_targets
            for p in bits_of(pb.covered_by[t]):
                sup &= pb.covers[p]
                if sup == 1 << t:
                    break
            sup &= ~(1 << t)
            for t2 in list(bits_of(sup)):
                if pb.guards[t] < 0 or pb.guards[t2] == pb.guards[t]:
                    _drop_target(pb, t2)
                    changed = True
        if time.monotonic() >= deadline:
            break
        # prime dominance: drop primes whose targets another prime covers at no more literals
        order = sorted(bits_of(pb.open_primes), key=lambda p: (pb.covers[p].bit_count(), -pb.literals[p]))
        for p in order:
            if late():
                return
            if not pb.open_primes >> p & 1:
                continue
            ts = pb.covers[p] & pb.open_targets
            if not ts:
                _drop_prime(pb, p)
                changed = True
                continue
            cand = pb.open_primes & ~(1 << p)
            for t in bits_of(ts):
                cand &= pb.covered_by[t]
                if not cand:
                    break
            lit = pb.literals[p]
            for q in bits_of(cand):
                if pb.literals[q] < lit or (pb.literals[q] == lit and (pb.covers[q] & pb.open_targets != ts or q < p)):
                    _drop_prime(pb, p)
                    changed = True
                    break


def independent_targets_bound(pb: CoverProblem) -> int:
    """Size of a greedy set of open unguarded targets pairwise sharing no prime: a lower bound on primes still
    needed."""
    blocked = 0
    count = 0
    for t in sorted((t for t in bits_of(pb.open_targets) if pb.guards[t] < 0), key=lambda t: (pb.covered_by[t].bit_count(), t)):
        if not pb.covered_by[t] & blocked:
            blocked |= pb.covered_by[t]
            count += 1
    return count


def greedy_cover(pb: CoverProblem, start: Sequence[int] = (), outputs: int = -1,
                 targets: int | None = None) -> list[int]:
    """Classical greedy set cover of the open targets needed for the phases ``outputs`` (see
    :meth:`CoverProblem.needed`; all when -1), or of the bitset ``targets`` when given, most new targets per prime,
    fewer literals on ties.

    ``start`` primes are taken first (e.g. the heuristic's cover mapped onto primes); greedy completes them. Gains
    only shrink as targets get covered, so a heap with lazy re-evaluation finds each best prime without rescanning
    all.
    """
    left = pb.needed(outputs) if targets is None else targets
    picked: list[int] = list(start)
    for p in picked:
        left &= ~pb.covers[p]
    heap = [(-(pb.covers[p] & left).bit_count(), pb.literals[p], p) for p in bits_of(pb.open_primes)
            if pb.covers[p] & left]
    heapq.heapify(heap)
    while left and heap:
        _, lit, p = heapq.heappop(heap)
        gain = (pb.covers[p] & left).bit_count()
        if gain == 0:
            continue
        if heap and (-gain, lit, p) > heap[0]:
            heapq.heappush(heap, (-gain, lit, p))
            continue
        picked.append(p)
        left &= ~pb.covers[p]
    return picked


def incompatible_points_bound(on: Sequence[Cube], f: Sequence[Cube], n: int, deadline: float,
                              stop: Callable[[], bool] | None = None) -> int:
    """Size of a greedy set of ON points of one output no two of which one implicant can hold: a lower bound on
    the product terms feeding that output.

    Two ON points share an implicant only when their supercube stays inside ``F = ON ∪ DC`` (``f``; a tautology
    check of the cofactor, no complement is built). Candidates are two opposite corners of every ON cube; the search
    stops at ``deadline`` (or once ``stop()`` is true) with what it has (still a bound, at least 1). 0 when ON is
    empty.
    """
    if not on:
        return 0
    full = (1 << n) - 1
    reps = sorted({c.value for c in on} | {c.value | (full & ~c.care) for c in on})
    fl = list(f)
    kept = [reps[0]]
    for p in reps[1:]:
        if time.monotonic() > deadline or (stop is not None and stop()):
            break
        if all(not cube_list_contains(fl, Cube(full & ~(p ^ q), p & ~(p ^ q))) for q in kept):
            kept.append(p)
    return len(kept)


def quick_lower_bound(fs: FunctionSets, per_output: bool, seconds: float = 1.0,
                      stop: Callable[[], bool] | None = None) -> int:
    """A lower bound on rows (or, per output, on summed terms) of any cover of ``fs``, without solving.

    Per output, :func:`incompatible_points_bound`; for rows their maximum (every output needs that many rows of its
    own), for the per-output cost their sum. Where the primes fit a small budget (``seconds``, 256 MB, 20 000
    primes) also the exact path's bound without its solver: essential primes after the reductions plus targets no two
    of which share a prime (a minimum cover can always be made of primes). Any width; 0 only when no output has an
    ON point. ``stop``, when given, ends the work early once it returns true (what was found is still a bound).
    """
    start = time.monotonic()
    alone = [incompatible_points_bound(fs.on[j], fs.on[j] + fs.dc[j], fs.n, start + seconds / 2 * (j + 1) / fs.m,
                                       stop) for j in range(fs.m)]
    deadline = start + seconds
    bound = sum(alone) if per_output else max(alone, default=0)
    groups = [[j] for j in range(fs.m)] if per_output else [list(range(fs.m))]
    total = 0
    try:
        for group in groups:
            sub_on = [fs.on[j] for j in group]
            if not any(sub_on):
                continue
            budget = Budget(deadline, 256 << 20, stop)
            primes = multi_output_primes([fs.on[j] + fs.dc[j] for j in group], sub_on, fs.n, budget, 20_000)
            pb = build_problem(primes, sub_on, fs.n, budget)
            before = independent_targets_bound(pb)
            reduce_problem(pb, deadline, stop)
            total += max(before, len(pb.chosen) + independent_targets_bound(pb))
    except LimitReached:
        return bound
    return max(bound, total)


def phase_lower_bound(true_sets: FunctionSets, comp_sets: FunctionSets, per_output: bool,
                      seconds: float = 1.0) -> int:
    """A lower bound valid for every output phase assignment: per output the smaller
    :func:`incompatible_points_bound` of its two phases; their maximum for rows, their sum per output."""
    start, m = time.monotonic(), true_sets.m
    each = [
        min(incompatible_points_bound(fs.on[j], fs.on[j] + fs.dc[j], fs.n, start + seconds * (2 * j + k + 1) / (2 * m))
            for k, fs in enumerate((true_sets, comp_sets)))
        for j in range(m)
    ]
    return sum(each) if per_output else max(each, default=0)
