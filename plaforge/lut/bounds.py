"""Output views for the mapper (support, local ON/OFF arrays) and proven lower bounds on LUT count and depth.

Lower bounds (``LutNetwork.lower_bounds``)
------------------------------------------
``e_j`` is the number of *essential* inputs of output ``j``: inputs ``i`` with an ON point and an OFF point that
differ in input ``i`` alone; every realization depends on them, whatever the don't-cares become (without
don't-cares ``e_j = |S_j|``).

* ``count >= max_j ceil((e_j - 1) / (k - 1))``: a tree of ``c`` k-LUTs has at most ``c (k - 1) + 1`` leaves;
* ``count >= D``: ``D`` outputs that pairwise no single function can serve (an ON point of one is an OFF point of
  the other), none realizable without a LUT (a constant or a plain input), need ``D`` distinct LUTs driving
  them (a greedy pairwise-incompatible set is used);
* ``depth >= max_j ceil(log_k e_j)``: ``d`` levels of k-LUTs reach at most ``k**d`` inputs.
The reported count bound is the larger of the first two.

Tables of at most :data:`plaforge.lut.points.POINT_LIMIT` inputs are examined on point arrays built from the sets as
given (:mod:`plaforge.lut.points`); wider ones within the enumeration limit by cube operations; beyond it by SAT
queries on the sets as given.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from ..core.cube import Cube
from ..core.table import DEFAULT_ENUM_LIMIT, Table, cubes_bits, unpack_bits
from .points import POINT_LIMIT, PointSets, greedy_support, project

__all__ = ["OutputSets", "essential_inputs", "lower_bounds"]


def _project(cubes: Sequence[Cube], support: Sequence[int]) -> list[Cube]:
    """Cubes restricted to ``support`` and renumbered so that ``support[b]`` becomes input ``b``."""
    out = []
    for c in cubes:
        care = value = 0
        for b, i in enumerate(support):
            if c.care >> i & 1:
                care |= 1 << b
                value |= (c.value >> i & 1) << b
        out.append(Cube(care, value))
    return out


def _local_sets(table: Table, j: int, support: Sequence[int]) -> tuple[np.ndarray, np.ndarray]:
    """ON and OFF of output ``j`` over its support as boolean arrays (inputs outside the support projected away)."""
    s = len(support)
    on = unpack_bits(cubes_bits(_project(table.on_cubes(j), support), s), s)
    off = unpack_bits(cubes_bits(_project(table.off_cubes(j), support), s), s)
    if (on & off).any():
        raise AssertionError(f"support of output {table.output_names[j]!r} drops a needed input")
    return on, off


class OutputSets:
    """Per output: its support, the inputs its rows mention, and ON/OFF arrays over a set of inputs.

    On point arrays for tables of at most POINT_LIMIT inputs (within ``enum_limit``), on cubes otherwise.
    """

    def __init__(self, table: Table, enum_limit: int = DEFAULT_ENUM_LIMIT) -> None:
        self.table = table
        self.points = PointSets(table) if table.n_inputs <= min(POINT_LIMIT, enum_limit) else None
        self._support: dict[int, int] = {}

    def support(self, j: int) -> int:
        """Bitmask of the inputs output ``j`` needs (greedy with don't-cares, in input order)."""
        if j not in self._support:
            if self.points is None:
                self._support[j] = self.table.support(j)
            else:
                on, off = self.points(j)
                self._support[j] = greedy_support(on, off, self.table.n_inputs, self.points.mentioned(j))
        return self._support[j]

    def mentioned(self, j: int) -> int:
        """Inputs the sets of output ``j`` test (projection onto them loses no don't-care)."""
        if self.points is not None:
            return self.points.mentioned(j)
        mask = 0
        for c in self.table.on_cubes(j) + self.table.off_cubes(j):
            mask |= c.care
        return mask

    def local(self, j: int, support: Sequence[int]) -> tuple[np.ndarray, np.ndarray]:
        """ON and OFF of output ``j`` over ``support`` as boolean arrays (other inputs projected away)."""
        if self.points is None:
            return _local_sets(self.table, j, support)
        on, off = self.points(j)
        n = self.table.n_inputs
        on_s, off_s = project(on, n, support), project(off, n, support)
        if (on_s & off_s).any():
            raise AssertionError(f"support of output {self.table.output_names[j]!r} drops a needed input")
        return on_s, off_s


def _essential_arrays(sets: PointSets, j: int) -> int:
    on, off = sets(j)
    ons = np.flatnonzero(on)
    return sum(1 << i for i in range(sets.n) if off[ons ^ (1 << i)].any())


def _trivial_arrays(sets: PointSets, j: int) -> bool:
    on, off = sets(j)
    ons, offs = np.flatnonzero(on), np.flatnonzero(off)
    if not ons.size or not offs.size:
        return True
    # an input that is 1 on every ON point and 0 on every OFF point
    return bool(int(np.bitwise_and.reduce(ons)) & ~int(np.bitwise_or.reduce(offs)))


def _incompatible_arrays(sets: PointSets, a: int, b: int) -> bool:
    (on_a, off_a), (on_b, off_b) = sets(a), sets(b)
    return bool((on_a & off_b).any() or (off_a & on_b).any())


def essential_inputs(table: Table, j: int) -> int:
    """Bitmask of inputs every realization of output ``j`` depends on (see module docs). Cube operations only."""
    on, off = table.on_cubes(j), table.off_cubes(j)
    mask = 0
    for i in range(table.n_inputs):
        bit = 1 << i
        for c in on:
            if c.care & bit:
                flipped = Cube(c.care, c.value ^ bit)
                if any(flipped.intersects(o) for o in off):
                    mask |= bit
                    break
    return mask


def _trivial(table: Table, j: int) -> bool:
    """Output ``j`` can be a constant or a plain input (no LUT at all)."""
    on, off = table.on_cubes(j), table.off_cubes(j)
    if not on or not off:
        return True
    for i in range(table.n_inputs):
        bit = 1 << i
        if all(c.care & bit and c.value & bit for c in on) and all(c.care & bit and not c.value & bit for c in off):
            return True
    return False


def _incompatible(table: Table, a: int, b: int) -> bool:
    return any(x.intersects(y) for x in table.on_cubes(a) for y in table.off_cubes(b)) or any(
        x.intersects(y) for x in table.off_cubes(a) for y in table.on_cubes(b))


def _essential_sat(table: Table, j: int) -> int:
    from ..verify.satcnf import sat_point

    mentioned = 0
    for sets in (table.on[j], table.dc[j], table.off[j]):
        for c in sets or ():
            mentioned |= c.care
    mask = 0
    for i in range(table.n_inputs):
        if mentioned >> i & 1 and sat_point(table, [(j, "on", 0), (j, "off", 1 << i)]) is not None:
            mask |= 1 << i
    return mask


def _trivial_sat(table: Table, j: int) -> bool:
    from ..verify.satcnf import sat_point

    if sat_point(table, [(j, "on", 0)]) is None or sat_point(table, [(j, "off", 0)]) is None:
        return True
    for i in range(table.n_inputs):
        if (sat_point(table, [(j, "on", 0)], [(-(i + 1),)]) is None
                and sat_point(table, [(j, "off", 0)], [(i + 1,)]) is None):
            return True
    return False


def _incompatible_sat(table: Table, a: int, b: int) -> bool:
    from ..verify.satcnf import sat_point

    return (sat_point(table, [(a, "on", 0), (b, "off", 0)]) is not None
            or sat_point(table, [(a, "off", 0), (b, "on", 0)]) is not None)


def lower_bounds(table: Table, k: int, enum_limit: int = DEFAULT_ENUM_LIMIT,
                 points: PointSets | None = None) -> dict[str, int]:
    """Proven lower bounds on LUT count and depth for ``table`` with k-LUTs (see module docs).

    Tables of at most POINT_LIMIT inputs are examined on point arrays, wider ones within ``enum_limit`` with cube
    operations, and wider still with SAT queries on the sets as given (no complement).

    Returns
    -------
    dict
        ``{"count": c, "depth": d, "count_cone": ..., "count_outputs": ...}``; ``count`` is the larger of the two
        count bounds. ``points`` reuses arrays already built for ``table``.
    """
    if table.n_inputs <= min(POINT_LIMIT, enum_limit):
        sets = points if points is not None else PointSets(table)
        essential = lambda t, j: _essential_arrays(sets, j)
        trivial = lambda t, j: _trivial_arrays(sets, j)
        incompatible = lambda t, a, b: _incompatible_arrays(sets, a, b)
    elif table.n_inputs > enum_limit:
        essential, trivial, incompatible = _essential_sat, _trivial_sat, _incompatible_sat
    else:
        essential, trivial, incompatible = essential_inputs, _trivial, _incompatible
    cone = depth = 0
    chosen: list[int] = []
    triv = [trivial(table, j) for j in range(table.n_outputs)]
    for j in range(table.n_outputs):
        e = essential(table, j).bit_count()
        if e >= 2:
            cone = max(cone, math.ceil((e - 1) / (k - 1)))
            depth = max(depth, math.ceil(math.log(e, k) - 1e-9))
        if e >= 1 and not triv[j] and all(incompatible(table, j, c) for c in chosen):
            chosen.append(j)
    if not all(triv):
        depth = max(depth, 1)
    return {"count": max(cone, len(chosen)), "depth": depth, "count_cone": cone, "count_outputs": len(chosen)}


