"""A table's outputs as boolean arrays over all ``2**n`` points, built from the sets as given.

The set a table leaves implicit is the complement of the other two, taken on the arrays (one ``~``) rather than
as cubes: a table of thousands of ON and OFF rows has a don't-care set whose cube complement is slow to compute,
while its arrays cost ``O(rows * 2**n / 64)``. Used up to :data:`POINT_LIMIT` inputs; the mapper's supports,
local functions and lower bounds come from these arrays.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from ..core.cube import Cube
from ..core.network import LutNetwork
from ..core.table import Table, cubes_bits, unpack_bits

__all__ = ["POINT_LIMIT", "PointSets", "cube_points", "greedy_support", "project", "wrong_outputs"]

POINT_LIMIT = 20


class PointSets:
    """ON and OFF arrays per output (a point given both as ON or OFF and as don't-care is a don't-care)."""

    def __init__(self, table: Table) -> None:
        self.table = table
        self.n = table.n_inputs
        self._cache: dict[int, tuple[np.ndarray, np.ndarray]] = {}

    def __call__(self, j: int) -> tuple[np.ndarray, np.ndarray]:
        if j not in self._cache:
            t, n = self.table, self.n
            given = [None if s is None else cube_points(s, n) for s in (t.on[j], t.dc[j], t.off[j])]
            known = [g for g in given if g is not None]
            rest = ~(known[0] | known[1]) if len(known) == 2 else np.zeros(1 << n, dtype=bool)
            on, dc, off = (g if g is not None else rest for g in given)
            self._cache[j] = (on & ~dc, off & ~dc)
        return self._cache[j]

    def mentioned(self, j: int) -> int:
        """Inputs some given row of output ``j`` tests (the output depends on no other)."""
        t = self.table
        mask = 0
        for s in (t.on[j], t.dc[j], t.off[j]):
            for c in s or ():
                mask |= c.care
        return mask


SCATTER_BITS = 10


def cube_points(cubes: Sequence[Cube], n: int) -> np.ndarray:
    """Boolean array over ``2**n`` points, true inside some cube: cubes with at most SCATTER_BITS free inputs
    have their points listed and scattered (a minterm is one store), wider ones go through the packed-bit
    builder."""
    out = np.zeros(1 << n, dtype=bool)
    full = (1 << n) - 1
    narrow: list[Cube] = []
    wide: list[Cube] = []
    for c in cubes:
        (narrow if (full & ~c.care).bit_count() <= SCATTER_BITS else wide).append(c)
    minterms = [c.value for c in narrow if c.care & full == full]
    if minterms:
        out[np.array(minterms, dtype=np.int64)] = True
    for c in narrow:
        if c.care & full == full:
            continue
        pts = np.array([c.value], dtype=np.int64)
        free = full & ~c.care
        while free:
            bit = free & -free
            pts = np.concatenate((pts, pts | bit))
            free ^= bit
        out[pts] = True
    if wide:
        out |= unpack_bits(cubes_bits(wide, n), n)
    return out


def greedy_support(on: np.ndarray, off: np.ndarray, n: int, candidates: int) -> int:
    """Inputs the output needs: each input of ``candidates`` in turn is dropped (the function projected across it)
    when ON and OFF stay apart, using don't-cares as they come; the others are needed. Done in both input orders,
    keeping the smaller result (sparse row lists let the first inputs tried go, whether needed or not)."""
    pts = np.arange(1 << n, dtype=np.int64)
    found = []
    for order in (range(n), range(n - 1, -1, -1)):
        keep, a, b = candidates, on, off
        for i in order:
            if not candidates >> i & 1:
                continue
            flip = pts ^ (1 << i)
            a2, b2 = a | a[flip], b | b[flip]
            if not (a2 & b2).any():
                a, b = a2, b2
                keep &= ~(1 << i)
        found.append(keep)
    return min(found, key=int.bit_count)


def project(arr: np.ndarray, n: int, support: Sequence[int]) -> np.ndarray:
    """``arr`` over all points as an array over ``support`` (true where some point with those values is true)."""
    pts = np.arange(1 << n, dtype=np.int64)
    q = np.zeros_like(pts)
    for b, i in enumerate(support):
        q |= ((pts >> i) & 1) << b
    return np.bincount(q[arr], minlength=1 << len(support)) > 0


def wrong_outputs(net: LutNetwork, sets: PointSets) -> list[str]:
    """Names of the outputs whose network value differs from the table at some ON or OFF point: every LUT is
    evaluated on all ``2**n`` points at once (INIT bit ``q`` at the point whose fan-ins read ``q``)."""
    n = sets.n
    pts = np.arange(1 << n, dtype=np.int64)
    values = {name: (pts >> i & 1).astype(bool) for i, name in enumerate(net.input_names)}
    values["0"], values["1"] = np.zeros(1 << n, dtype=bool), np.ones(1 << n, dtype=bool)
    for lut in net.luts:
        idx = np.zeros(1 << n, dtype=np.int64)
        for b, x in enumerate(lut.inputs):
            idx |= values[x].astype(np.int64) << b
        bits = np.array([lut.init >> q & 1 for q in range(1 << len(lut.inputs))], dtype=bool)
        values[lut.name] = bits[idx]
    bad = []
    for j, (name, d) in enumerate(zip(net.output_names, net.drivers)):
        on, off = sets(j)
        if (on & ~values[d]).any() or (off & values[d]).any():
            bad.append(name)
    return bad
