"""Multi-output prime implicants generated from cubes: the work grows with the function, not with ``3**n``.

Definitions
-----------
Let ``F_j = ON_j ∪ DC_j`` and, for a cube ``c``, its *tag* ``S(c) = {j : c ⊆ F_j}`` (the outputs ``c`` may feed
without reaching an OFF point). A *multi-output prime* is a prime implicant of the product ``F_T = AND_{j∈T} F_j``
for some nonempty ``T``, as in multi-output Quine-McCluskey. Any cover can be rewritten cube by cube into one made of
such primes with no more product terms and no more literals, so the exact search may be restricted to them. If ``c``
is a prime of ``F_T`` and ``c ⊆ F_k`` then ``c`` is also a prime of ``F_{T∪{k}}`` (``F_{T∪{k}} ⊆ F_T``), so a prime's
tag is the union of the ``T`` it is a prime of.

Single output (recursive Shannon expansion)
    ``primes(f)`` for a cover of ``f``: after single-cube containment, a cover with the universe cube gives the
    universe; a unate cover's remaining cubes are exactly its primes (a unate function has a unique prime cover);
    otherwise, on the most binate input ``x``, ``P0 = primes(f_x')``, ``P1 = primes(f_x)``, and ``primes(f)`` is the
    maximal set of ``{p ∩ q}`` (``p ∈ P0``, ``q ∈ P1``; free in ``x``), ``x'p`` for ``p ∈ P0`` contained in none of
    them, and ``x q`` likewise (the classical recursive prime generation).
Several outputs (iterated products)
    ``primes(F_T ∧ F_k)`` are the maximal cubes among ``{p ∩ q : p ∈ primes(F_T), q ∈ primes(F_k)}``. Outputs are
    added one at a time: the candidates are the multi-output primes so far, the primes of ``F_k`` (tag ``{k}``) and
    all nonempty pairwise intersections (tag ``T ∪ {k}``); identical cubes merge their tags; a candidate ``(c, T)`` is
    dropped when another ``(d, T')`` has ``d ⊋ c`` and ``T ⊆ T'`` (then ``c`` is no prime of ``F_T``). Primes of a
    single ``F_k`` that meet no ON cube of any output are dropped at once (their sub-cubes never meet one either);
    the covering problem drops the other useless ones.

Tags are ``uint64`` words, ``ceil(m/64)`` per cube, so any number of outputs fits; input masks are ``int64``, so at
most :data:`MAX_INPUTS` inputs.

Budget
------
Every step checks the deadline (:class:`~plaforge.core.errors.TimeLimit` naming ``--time-limit``) and estimates its
memory before allocating (:class:`~plaforge.core.errors.SizeLimit` naming ``--memory-limit``, with the figure).
"""

from __future__ import annotations

import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from ..core.cube import Cube
from ..core.errors import SizeLimit, TimeLimit

__all__ = ["MAX_INPUTS", "Budget", "Primes", "multi_output_primes", "popcount"]

#: Most inputs the cube arrays hold (``int64`` masks, sign bit unused).
MAX_INPUTS = 62

#: Elements of a broadcast block (pairs compared at once); bounds the temporary memory of each numpy step.
_BLOCK = 1 << 21


def popcount(a: np.ndarray) -> np.ndarray:
    """Set bits per entry of an integer array."""
    return np.bitwise_count(a).astype(np.int64)


@dataclass(frozen=True)
class Budget:
    """Deadline (``time.monotonic()`` seconds) and memory (bytes) a step may use; ``check`` raises past them.
    ``stop``, when given, ends the step early as the deadline would once it returns true."""

    deadline: float
    memory: int
    stop: Callable[[], bool] | None = None

    def time(self, what: str) -> None:
        if time.monotonic() > self.deadline or (self.stop is not None and self.stop()):
            raise TimeLimit(f"the exact path ran out of time {what}", "--time-limit")

    def size(self, nbytes: float, what: str) -> None:
        if nbytes > self.memory:
            raise SizeLimit(
                f"the exact path would need about {nbytes / 2**20:,.0f} MB {what}, above the memory limit of "
                f"{self.memory / 2**20:,.0f} MB", "--memory-limit")


@dataclass(frozen=True)
class Primes:
    """Multi-output primes: parallel ``care``/``value`` arrays (``int64``) and ``tags`` (``uint64``, shape
    ``(count, words)``: bit ``j % 64`` of word ``j // 64`` when the prime may feed output ``j``)."""

    care: np.ndarray
    value: np.ndarray
    tags: np.ndarray

    def __len__(self) -> int:
        return int(self.care.size)

    def tag(self, i: int) -> int:
        """Tag of prime ``i`` as a Python int (bit ``j``: output ``j``)."""
        return sum(int(w) << (64 * k) for k, w in enumerate(self.tags[i].tolist()))

    def has(self, j: int) -> np.ndarray:
        """Boolean mask of the primes whose tag holds output ``j``."""
        return (self.tags[:, j // 64] >> np.uint64(j % 64)) & np.uint64(1) != 0


def _arrays(cubes: Sequence[Cube]) -> tuple[np.ndarray, np.ndarray]:
    care = np.fromiter((c.care for c in cubes), dtype=np.int64, count=len(cubes))
    value = np.fromiter((c.value for c in cubes), dtype=np.int64, count=len(cubes))
    return care, value


def _contained_in_any(care: np.ndarray, value: np.ndarray, dcare: np.ndarray, dvalue: np.ndarray,
                      budget: Budget, strict_tags: tuple[np.ndarray, np.ndarray] | None = None,
                      strict: bool = True) -> np.ndarray:
    """Per cube ``i``: is it inside some cube ``d`` of the second list (different from it unless ``strict`` is
    false), with, when ``strict_tags=(tags_i, tags_d)`` is given, ``tag_i ⊆ tag_d``?"""
    out = np.zeros(care.size, dtype=bool)
    if care.size == 0 or dcare.size == 0:
        return out
    step = max(1, _BLOCK // dcare.size)
    for s in range(0, care.size, step):
        c, v = care[s:s + step, None], value[s:s + step, None]
        inside = ((dcare[None, :] & ~c) == 0) & ((v & dcare[None, :]) == dvalue[None, :])
        if strict:
            inside &= (dcare[None, :] != c) | (dvalue[None, :] != v)
        if strict_tags is not None:
            ti, td = strict_tags
            inside &= ((ti[s:s + step, None, :] & ~td[None, :, :]) == 0).all(axis=2)
        out[s:s + step] = inside.any(axis=1)
        budget.time("comparing cubes")
    return out


def _scc(care: np.ndarray, value: np.ndarray, budget: Budget) -> tuple[np.ndarray, np.ndarray]:
    """Distinct cubes none of which lies inside another (fewest literals first)."""
    if care.size <= 1:
        return care, value
    pairs = np.unique(np.stack([care, value], axis=1), axis=0)
    care, value = pairs[:, 0], pairs[:, 1]
    order = np.argsort(popcount(care), kind="stable")
    care, value = care[order], value[order]
    drop = _contained_in_any(care, value, care, value, budget)
    return care[~drop], value[~drop]


def _single_primes(care: np.ndarray, value: np.ndarray, budget: Budget) -> tuple[np.ndarray, np.ndarray]:
    """Primes of the single-output function covered by the cubes ``care``/``value`` (see the module docs)."""
    care, value = _scc(care, value, budget)
    if care.size == 0 or (care == 0).any():
        return (np.zeros(1, np.int64), np.zeros(1, np.int64)) if care.size else (care, value)
    pos = np.bitwise_or.reduce(care & value)
    neg = np.bitwise_or.reduce(care & ~value)
    binate = int(pos & neg)
    if binate == 0:
        return care, value
    budget.time("generating primes")
    best, bit = -1, 0
    for i in range(int(binate).bit_length()):
        b = 1 << i
        if binate & b:
            cnt = int(np.count_nonzero(care & b))
            if cnt > best:
                best, bit = cnt, b
    b = np.int64(bit)
    has = (care & b) != 0
    pos_lit = has & ((value & b) != 0)
    neg_lit = has & ~pos_lit
    p0c, p0v = _single_primes(care[~pos_lit] & ~b, value[~pos_lit] & ~b, budget)
    p1c, p1v = _single_primes(care[~neg_lit] & ~b, value[~neg_lit] & ~b, budget)
    cc, cv = _intersections(p0c, p0v, p1c, p1v, budget)
    cc, cv = _scc(cc, cv, budget)
    keep0 = ~_contained_in_any(p0c, p0v, cc, cv, budget, strict=False)
    keep1 = ~_contained_in_any(p1c, p1v, cc, cv, budget, strict=False)
    return (np.concatenate([cc, p0c[keep0] | b, p1c[keep1] | b]),
            np.concatenate([cv, p0v[keep0], p1v[keep1] | b]))


def _intersections(ac: np.ndarray, av: np.ndarray, bc: np.ndarray, bv: np.ndarray, budget: Budget,
                   index: bool = False) -> tuple[np.ndarray, ...]:
    """Nonempty pairwise intersections of two cube lists (and, with ``index``, the index into the first list)."""
    budget.size(ac.size * bc.size * 17.0, f"for {ac.size:,} x {bc.size:,} cube intersections")
    parts_c, parts_v, parts_i = [], [], []
    step = max(1, _BLOCK // max(1, bc.size))
    for s in range(0, ac.size, step):
        c1, v1 = ac[s:s + step, None], av[s:s + step, None]
        ok = ((v1 ^ bv[None, :]) & c1 & bc[None, :]) == 0
        ii, kk = np.nonzero(ok)
        parts_c.append(ac[s + ii] | bc[kk])
        parts_v.append(av[s + ii] | bv[kk])
        parts_i.append(s + ii)
        budget.time("intersecting primes")
    empty = np.zeros(0, np.int64)
    out = (np.concatenate(parts_c) if parts_c else empty, np.concatenate(parts_v) if parts_v else empty)
    return out + ((np.concatenate(parts_i) if parts_i else empty),) if index else out


def _meets_any(care: np.ndarray, value: np.ndarray, oc: np.ndarray, ov: np.ndarray, budget: Budget) -> np.ndarray:
    out = np.zeros(care.size, dtype=bool)
    if oc.size == 0:
        return out
    step = max(1, _BLOCK // oc.size)
    for s in range(0, care.size, step):
        c, v = care[s:s + step, None], value[s:s + step, None]
        out[s:s + step] = (((v ^ ov[None, :]) & c & oc[None, :]) == 0).any(axis=1)
        budget.time("relating primes to the ON set")
    return out


def multi_output_primes(f: Sequence[Sequence[Cube]], on: Sequence[Sequence[Cube]], n: int, budget: Budget,
                        max_primes: int) -> Primes:
    """Multi-output primes of the function whose output ``j`` has ``F_j`` covered by ``f[j]`` and ON set ``on[j]``.

    Primes meeting no ON cube of any output are left out. More than ``max_primes`` candidates at any step raise
    :class:`~plaforge.core.errors.SizeLimit` naming ``--memory-limit`` (the limit is derived from it).
    """
    if n > MAX_INPUTS:
        raise SizeLimit(f"the exact path handles at most {MAX_INPUTS} inputs, not {n}; use the heuristic (drop "
                        "--exact)")
    m = len(f)
    words = max(1, (m + 63) // 64)
    oc, ov = _arrays([c for cubes in on for c in cubes])
    care = np.zeros(0, np.int64)
    value = np.zeros(0, np.int64)
    tags = np.zeros((0, words), np.uint64)
    for k in range(m):
        if not f[k]:
            continue
        pc, pv = _single_primes(*_arrays(f[k]), budget)
        useful = _meets_any(pc, pv, oc, ov, budget)
        pc, pv = pc[useful], pv[useful]
        if pc.size == 0:
            continue
        kbit = np.zeros(words, np.uint64)
        kbit[k // 64] = np.uint64(1) << np.uint64(k % 64)
        ic, iv, ii = _intersections(care, value, pc, pv, budget, index=True)
        it = tags[ii] | kbit
        cand_c = np.concatenate([care, pc, ic])
        cand_v = np.concatenate([value, pv, iv])
        cand_t = np.concatenate([tags, np.tile(kbit, (pc.size, 1)), it])
        if cand_c.size > max_primes:
            raise SizeLimit(
                f"the exact path met {cand_c.size:,} candidate primes after {k + 1} of {m} outputs, above its limit "
                f"of {max_primes:,} (set by the memory limit)", "--memory-limit")
        care, value, tags = _merge_and_filter(cand_c, cand_v, cand_t, budget)
    return Primes(care, value, tags)


def _merge_and_filter(care: np.ndarray, value: np.ndarray, tags: np.ndarray,
                      budget: Budget) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Identical cubes merged (tags OR-ed), then those inside another cube with a superset tag dropped."""
    pairs, inv = np.unique(np.stack([care, value], axis=1), axis=0, return_inverse=True)
    inv = inv.reshape(-1)
    merged = np.zeros((pairs.shape[0], tags.shape[1]), np.uint64)
    np.bitwise_or.at(merged, inv, tags)
    care, value = pairs[:, 0], pairs[:, 1]
    order = np.lexsort((value, care, popcount(care)))
    care, value, merged = care[order], value[order], merged[order]
    lits = popcount(care)
    drop = np.zeros(care.size, dtype=bool)
    # a cube can only lie strictly inside cubes with fewer literals: compare each literal level with those before it
    starts = np.searchsorted(lits, np.arange(lits.max() + 2 if lits.size else 1))
    for level in range(1, len(starts) - 1):
        lo, hi = starts[level], starts[level + 1]
        if lo == hi or lo == 0:
            continue
        drop[lo:hi] = _contained_in_any(care[lo:hi], value[lo:hi], care[:lo], value[:lo], budget,
                                        (merged[lo:hi], merged[:lo]))
        budget.time("filtering primes")
    return care[~drop], value[~drop], merged[~drop]
