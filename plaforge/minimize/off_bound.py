"""A lower bound on product terms when a table gives ON and OFF rows and leaves the don't-cares implicit.

A product term that feeds output ``j`` must not touch ``j``'s OFF set. Two ON points ``p`` and ``q`` of ``j`` can
therefore share a term only if their supercube (the smallest cube holding both) misses every OFF cube of ``j``; a
set of ON points no two of which can share a term needs that many terms for ``j`` alone. The set is built greedily
from two opposite corners of every ON cube, in a fixed order, until a deadline; whatever it holds then is still a
bound. Nothing is complemented: the test is one intersection per (pair, OFF cube), vectorized over the OFF cubes.

This is the ``.type fr`` counterpart of :func:`plaforge.minimize.covering.incompatible_points_bound`, which needs the
don't-cares (or ON ∪ DC) as cubes.
"""

from __future__ import annotations

import time
from collections.abc import Callable, Sequence

import numpy as np

from ..core.cube import Cube

__all__ = ["off_incompatible_bound", "off_lower_bound"]

#: Most inputs the vectorized (64-bit) test handles; wider tables use a plain loop under the same deadline.
WORD = 64


def _separated_by_off(p: int, kept: np.ndarray, off_care: np.ndarray, off_value: np.ndarray, full: int
                      ) -> bool:
    """True when, for every kept point ``q``, the supercube of ``p`` and ``q`` meets some OFF cube."""
    diff = np.bitwise_xor(kept, np.uint64(p))
    care = np.bitwise_and(np.bitwise_not(diff), np.uint64(full))            # literals the supercube keeps
    value = np.bitwise_and(np.uint64(p), care)
    # supercube k meets OFF cube o iff they agree wherever both test an input
    clash = (value[:, None] ^ off_value[None, :]) & care[:, None] & off_care[None, :]
    return bool((clash == 0).any(axis=1).all())


def off_incompatible_bound(on: Sequence[Cube], off: Sequence[Cube], n: int, deadline: float,
                           stop: Callable[[], bool] | None = None) -> int:
    """Size of a greedy set of ON points of one output (given by ON cubes ``on`` and OFF cubes ``off``) no two of
    which one product term can hold; 0 when ON is empty, at least 1 otherwise. Stops at ``deadline`` or once
    ``stop()`` is true."""

    def late() -> bool:
        return time.monotonic() > deadline or (stop is not None and stop())

    if not on:
        return 0
    full = (1 << n) - 1
    reps = sorted({c.value for c in on} | {c.value | (full & ~c.care) for c in on})
    if not off:
        return 1
    if n <= WORD:
        off_care = np.array([c.care for c in off], dtype=np.uint64)
        off_value = np.array([c.value for c in off], dtype=np.uint64)
        kept = [reps[0]]
        arr = np.array(kept, dtype=np.uint64)
        for p in reps[1:]:
            if late():
                break
            if _separated_by_off(p, arr, off_care, off_value, full):
                kept.append(p)
                arr = np.array(kept, dtype=np.uint64)
        return len(kept)
    kept_w = [reps[0]]
    for p in reps[1:]:
        if late():
            break
        ok = True
        for q in kept_w:
            care = full & ~(p ^ q)
            value = p & care
            if not any(((value ^ o.value) & care & o.care) == 0 for o in off):
                ok = False
                break
        if ok:
            kept_w.append(p)
    return len(kept_w)


def off_lower_bound(ons: Sequence[Sequence[Cube]], offs: Sequence[Sequence[Cube]], n: int, per_output: bool,
                    seconds: float, stop: Callable[[], bool] | None = None) -> int:
    """A lower bound on rows (the largest per-output bound: every output needs that many terms of its own) or,
    under the per-output cost, on the summed terms, within about ``seconds`` (or until ``stop()`` is true)."""
    start, m = time.monotonic(), len(ons)
    each = [off_incompatible_bound(ons[j], offs[j], n, start + seconds * (j + 1) / max(m, 1), stop)
            for j in range(m)]
    return sum(each) if per_output else max(each, default=0)
