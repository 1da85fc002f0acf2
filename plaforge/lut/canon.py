"""A canonical input order derived from the function, so that the mapping does not depend on column order.

The mapper works on the table with its inputs sorted by a signature computed from the function alone; every
remaining tie-break inside the mapper (first signal, first bound set, greedy don't-care use) then follows that
order, not the order of the spec's columns. Inputs with equal signatures are usually interchangeable (swapping
them leaves every output unchanged, as ``a[i]`` and ``b[i]`` of an adder); for those the result is the same up
to renaming whatever order they keep.

Signature of input ``i`` (per output ``j``, in output order)
    ``|ON_j ∩ {x_i = 1}|``, ``|OFF_j ∩ {x_i = 1}|`` and the number of ON points whose neighbour across ``x_i`` is
    OFF; refined once by the sorted multiset, over the other inputs ``l``, of ``(signature of l, |ON_j ∩ {x_i =
    x_l = 1}|, |OFF_j ∩ {x_i = x_l = 1}|)``. Cost ``O(n**2 * m * 2**n)`` bit operations, so only tables up to
    :data:`CANON_LIMIT` inputs are reordered (wider ones keep their order).
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from ..core.cube import Cover, Cube
from ..core.table import Table
from .points import PointSets

__all__ = ["CANON_LIMIT", "canonical_order", "permute_cover", "permute_table"]

CANON_LIMIT = 16


def canonical_order(table: Table) -> tuple[int, ...]:
    """Input indices in canonical order (see module docs); the identity for tables wider than CANON_LIMIT."""
    n, m = table.n_inputs, table.n_outputs
    if n > CANON_LIMIT or n < 2:
        return tuple(range(n))
    pts = np.arange(1 << n, dtype=np.int64)
    lits = [((pts >> i) & 1).astype(bool) for i in range(n)]
    sets = PointSets(table)
    ons, offs = [sets(j)[0] for j in range(m)], [sets(j)[1] for j in range(m)]
    first = []
    for i in range(n):
        sig = []
        for on, off in zip(ons, offs):
            flip = off[pts ^ (1 << i)]
            sig += [int((on & lits[i]).sum()), int((off & lits[i]).sum()), int((on & flip).sum())]
        first.append(tuple(sig))
    second = []
    for i in range(n):
        pairs = []
        for ell in range(n):
            if ell == i:
                continue
            both = lits[i] & lits[ell]
            pairs.append((first[ell], tuple(int((a & both).sum()) for s in zip(ons, offs) for a in s)))
        second.append((first[i], tuple(sorted(pairs))))
    return tuple(sorted(range(n), key=lambda i: (second[i], i)))


def _move(mask: int, order: Sequence[int]) -> int:
    """Bit ``order[b]`` of ``mask`` becomes bit ``b``."""
    out = 0
    for b, old in enumerate(order):
        out |= (mask >> old & 1) << b
    return out


def _cubes(cubes: Sequence[Cube] | None, order: Sequence[int]) -> tuple[Cube, ...] | None:
    if cubes is None:
        return None
    return tuple(Cube(_move(c.care, order), _move(c.value, order), c.outputs) for c in cubes)


def permute_table(table: Table, order: Sequence[int]) -> Table:
    """The table with new input ``b`` being old input ``order[b]`` (names move with their columns)."""
    return Table(tuple(table.input_names[i] for i in order), table.output_names,
                 tuple(_cubes(s, order) for s in table.on), tuple(_cubes(s, order) for s in table.dc),
                 tuple(_cubes(s, order) for s in table.off), source=table.source)


def permute_cover(cover: Cover, order: Sequence[int]) -> Cover:
    """The cover with its inputs in the same new order as :func:`permute_table`."""
    return cover.with_(input_names=tuple(cover.input_names[i] for i in order), cubes=_cubes(cover.cubes, order))
