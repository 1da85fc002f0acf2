"""A Table's sets as its rows gave them, and point-set helpers shared by the minimizer's views of a function.

A compiled two-level minimizer takes two of the three sets of every output and works out the third itself: ON with
don't-cares (OFF is the rest) or ON with OFF (don't-care is the rest). :func:`given_sets` hands it exactly what the
spec's rows said, so nothing is complemented or subtracted cube by cube in Python on the way in (see
:meth:`plaforge.core.table.Table.cover_sets` for the fully separated sets other paths use).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from .cube import Cube
from .table import Table, cubes_bits, unpack_bits

__all__ = ["GivenSets", "cubes_points", "given_point_counts", "given_sets"]


@dataclass(frozen=True, eq=False)
class GivenSets:
    """A function as its rows gave it.

    ``kind`` ``"fd"``: ``on[j]`` and ``other[j]`` are output ``j``'s ON and DC cubes, OFF is the rest; ``"fr"``:
    ``other[j]`` are its OFF cubes and DC is the rest. Cubes carry ``outputs == 1 << j``; under ``"fd"`` a point in
    both ON and DC is don't-care. Nothing in it was complemented.
    """

    n: int
    m: int
    kind: str
    on: tuple[tuple[Cube, ...], ...]
    other: tuple[tuple[Cube, ...], ...]

    @property
    def given(self) -> int:
        """Number of cubes given, both sets of every output."""
        return sum(len(s) for s in self.on) + sum(len(s) for s in self.other)

    def point_arrays(self) -> tuple[list[np.ndarray], list[np.ndarray]]:
        """``(on, dc)``: per output a boolean array over the 2**n points, ON excluding DC (enumerates: small n)."""
        ons, dcs = [], []
        for j in range(self.m):
            on, other = cubes_points(self.on[j], self.n), cubes_points(self.other[j], self.n)
            dc = other if self.kind == "fd" else ~(on | other)
            ons.append(on & ~dc)
            dcs.append(dc)
        return ons, dcs


def given_sets(table: Table, inverted: int = 0) -> GivenSets | None:
    """``table``'s sets as given, when every output gives the same two: ON and DC (``"fd"``) or ON and OFF
    (``"fr"``); outputs in ``inverted`` swap ON and OFF. ``None`` when the outputs differ in which set is left
    implicit, or when the ON set is the implicit one."""
    ons, dcs, offs = [], [], []
    for j in range(table.n_outputs):
        swap = inverted >> j & 1
        ons.append(table.off[j] if swap else table.on[j])
        offs.append(table.on[j] if swap else table.off[j])
        dcs.append(table.dc[j])
    if any(s is None for s in ons):
        return None
    if all(s is not None for s in dcs):
        kind, others = "fd", dcs
    elif all(s is not None for s in offs):
        kind, others = "fr", offs
    else:
        return None

    def tagged(sets: list) -> tuple[tuple[Cube, ...], ...]:
        return tuple(tuple(c if c.outputs == 1 << j else c.with_outputs(1 << j) for c in s)
                     for j, s in enumerate(sets))

    return GivenSets(table.n_inputs, table.n_outputs, kind, tagged(ons), tagged(others))


def cubes_points(cubes: Sequence[Cube], n: int) -> np.ndarray:
    """Boolean array over the 2**n points, true on the points of ``cubes``: single points are set directly, larger
    cubes through :func:`plaforge.core.table.cubes_bits`."""
    full = (1 << n) - 1
    out = np.zeros(1 << n, dtype=bool)
    points = [c.value for c in cubes if c.care == full]
    if points:
        out[np.array(points, dtype=np.int64)] = True
    rest = [c for c in cubes if c.care != full]
    if rest:
        out |= unpack_bits(cubes_bits(rest, n), n)
    return out


def given_point_counts(table: Table, j: int) -> tuple[int, int, int]:
    """``(on, dc, off)`` point counts of output ``j`` from its sets as given (the implicit one is the rest; a point
    given both as DC and as ON or OFF is DC). Enumerates 2**n points: keep n small."""
    n = table.n_inputs
    given = [None if s is None else cubes_points(s, n) for s in (table.on[j], table.dc[j], table.off[j])]
    dc = given[1]
    if dc is None:
        dc = ~(given[0] | given[2])  # type: ignore[operator]
    on, off = ((None if g is None else g & ~dc) for g in (given[0], given[2]))
    total = 1 << n
    n_dc = int(dc.sum())
    n_on = int(on.sum()) if on is not None else total - n_dc - int(off.sum())  # type: ignore[union-attr]
    return n_on, n_dc, total - n_on - n_dc
