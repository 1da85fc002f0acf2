"""Multi-output prime implicants and the covering problem over them, with its reductions and cheap bounds.

Multi-output primes
-------------------
Let ``F_j = ON_j ∪ DC_j`` (as point sets) and, for a cube ``c``, let its *tag* be
``S(c) = {j : c ⊆ F_j}``: the outputs ``c`` may feed without reaching an OFF point. Tags are antitone (``c ⊆ d``
implies ``S(d) ⊆ S(c)``). A *multi-output prime* is a cube with ``S(c) ≠ ∅`` none of whose one-literal expansions
``d`` keeps the whole tag (``S(d) ≠ S(c)``); equivalently ``c`` is a prime implicant of the product function
``AND_{j∈S(c)} F_j``, which is the prime of multi-output Quine-McCluskey. Any cover can be rewritten, cube by cube
(``c`` feeding ``T`` ↦ a prime of ``AND_{j∈T} F_j`` containing it), into one made of such primes with no more
product terms and no more literals, so the search may be restricted to them.

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
output of ``c``. Elements covered by exactly the same primes are merged into one *target* (a row of the covering
matrix; the word "row" is kept for the product terms of a cover). Reductions, to a fixed point: essential primes
(a target with a single prime), target dominance (a target whose primes include all primes of another target is
implied by it and dropped; found as the AND of the target bitsets of the smaller target's primes) and prime
dominance (a prime whose targets are a subset of another prime's targets, with no fewer literals, is dropped; found
as the AND of the prime bitsets of its targets). Both directions are Python-int bitsets.

Cost: ``O(n 3**n)`` for the tags, ``O(sum of prime sizes)`` for the matrix.
"""

from __future__ import annotations

import heapq
import time
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass

import numpy as np

from ..core.errors import SizeLimit
from ..core.table import FunctionSets

__all__ = [
    "CoverProblem",
    "Primes",
    "bits_of",
    "build_problem",
    "greedy_cover",
    "independent_targets_bound",
    "multi_output_primes",
    "quick_lower_bound",
    "reduce_problem",
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
    """Multi-output primes: parallel arrays of ``care``, ``value`` masks and ``useful`` outputs.

    ``cube_tags`` is the ternary table they were found in: the tag of every one of the ``3**n`` cubes (see
    :func:`ternary_tags`).
    """

    care: np.ndarray
    value: np.ndarray
    useful: np.ndarray
    cube_tags: np.ndarray

    def __len__(self) -> int:
        return int(self.care.size)


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
    return Primes(care, value, useful[keep], t)


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
    covers; ``open_targets`` / ``open_primes``: bitsets of what is still open; ``chosen``: essential primes already
    in the cover; ``elements[p]``: per useful output ``j`` of prime ``p``, the element ids (``(point, j)`` pairs) it
    covers.
    """

    primes: Primes
    n_elements: int
    covered_by: list[int]
    covers: list[int]
    literals: list[int]
    elements: list[list[tuple[int, np.ndarray]]]
    open_targets: int
    open_primes: int
    chosen: list[int]


def build_problem(primes: Primes, on: Sequence[np.ndarray], n: int) -> CoverProblem:
    """Covering matrix over ``(ON point, output)`` elements, elements covered by the same primes merged."""
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
            for b in bits_of(free):
                offs = np.concatenate([offs, offs + (1 << b)])
            offsets[free] = offs
        pts = int(primes.value[i]) + offs
        mine = []
        for j in bits_of(int(primes.useful[i])):
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
    per_element = np.split(all_pr, bounds) if all_el.size else []
    n_pr = len(primes)
    target_of: dict[bytes, int] = {}
    covered_by: list[int] = []
    target_primes: list[np.ndarray] = []
    for g in per_element:
        key = g.tobytes()
        if key not in target_of:
            target_of[key] = len(covered_by)
            covered_by.append(_to_bitset(g, n_pr))
            target_primes.append(g)
    # per prime: the transpose
    if target_primes:
        t_idx = np.concatenate([np.full(g.size, t, dtype=np.int64) for t, g in enumerate(target_primes)])
        p_idx = np.concatenate(target_primes)
        order = np.lexsort((t_idx, p_idx))
        t_idx, p_idx = t_idx[order], p_idx[order]
    else:
        t_idx = p_idx = np.zeros(0, dtype=np.int64)
    covers = [0] * n_pr
    if p_idx.size:
        cuts = np.flatnonzero(np.diff(p_idx)) + 1
        for grp_p, grp_t in zip(np.split(p_idx, cuts), np.split(t_idx, cuts)):
            covers[int(grp_p[0])] = _to_bitset(grp_t, len(covered_by))
    literals = [int(c).bit_count() for c in primes.care.tolist()]
    open_primes = 0
    for p in range(n_pr):
        if covers[p]:
            open_primes |= 1 << p
    return CoverProblem(primes, n_el, covered_by, covers, literals, elements, (1 << len(covered_by)) - 1,
                        open_primes, [])


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


def reduce_problem(pb: CoverProblem, deadline: float) -> None:
    """Essentials, target dominance and prime dominance, repeated until nothing changes (or the deadline)."""
    changed = True
    while changed and time.monotonic() < deadline:
        changed = False
        # essentials
        for t in list(bits_of(pb.open_targets)):
            if not pb.open_targets >> t & 1:
                continue
            ps = pb.covered_by[t]
            if ps and ps & (ps - 1) == 0:
                p = ps.bit_length() - 1
                pb.chosen.append(p)
                for t2 in list(bits_of(pb.covers[p] & pb.open_targets)):
                    _drop_target(pb, t2)
                _drop_prime(pb, p)
                changed = True
        # target dominance: drop targets that contain all primes of a smaller target
        order = sorted(bits_of(pb.open_targets), key=lambda t: pb.covered_by[t].bit_count())
        for t in order:
            if not pb.open_targets >> t & 1:
                continue
            sup = pb.open_targets
            for p in bits_of(pb.covered_by[t]):
                sup &= pb.covers[p]
                if sup == 1 << t:
                    break
            sup &= ~(1 << t)
            for t2 in list(bits_of(sup)):
                _drop_target(pb, t2)
                changed = True
        if time.monotonic() >= deadline:
            break
        # prime dominance: drop primes whose targets another prime covers at no more literals
        order = sorted(bits_of(pb.open_primes), key=lambda p: (pb.covers[p].bit_count(), -pb.literals[p]))
        for p in order:
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
    """Size of a greedy set of open targets pairwise sharing no prime: a lower bound on primes still needed."""
    blocked = 0
    count = 0
    for t in sorted(bits_of(pb.open_targets), key=lambda t: (pb.covered_by[t].bit_count(), t)):
        if not pb.covered_by[t] & blocked:
            blocked |= pb.covered_by[t]
            count += 1
    return count


def greedy_cover(pb: CoverProblem, start: Sequence[int] = ()) -> list[int]:
    """Classical greedy set cover of the open targets (most new targets per prime, fewer literals on ties).

    ``start`` primes are taken first (e.g. the heuristic's cover mapped onto primes); greedy completes them. Gains
    only shrink as targets get covered, so a heap with lazy re-evaluation finds each best prime without rescanning
    all.
    """
    left = pb.open_targets
    picked: list[int] = list(start)
    for p in picked:
        left &= ~pb.covers[p]
    heap = [(-(pb.covers[p] & left).bit_count(), pb.literals[p], p) for p in bits_of(pb.open_primes)]
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


def quick_lower_bound(fs: FunctionSets, per_output: bool) -> int:
    """A lower bound on rows (or, per output, on summed terms) of any cover of ``fs``, without solving.

    Essential primes found by the reductions (at most a second of them), plus the independent-target bound of what
    is left: targets no two of which share a prime each need a prime of their own, and a minimum cover can always be
    made of primes. Cost: the prime generation, matrix and reductions of the exact path, no solver.
    """
    on, dc = fs.point_arrays()
    groups = [[j] for j in range(fs.m)] if per_output else [list(range(fs.m))]
    total = 0
    for group in groups:
        sub_on = [on[j] for j in group]
        if not any(a.any() for a in sub_on):
            continue
        pb = build_problem(multi_output_primes(sub_on, [dc[j] for j in group], fs.n), sub_on, fs.n)
        before = independent_targets_bound(pb)
        reduce_problem(pb, time.monotonic() + 1.0)
        total += max(before, len(pb.chosen) + independent_targets_bound(pb))
    return total
