"""The vectors a simulation drives when a table has too many inputs to drive every point.

Corner cases first: all zeros, all ones, walking ones, walking zeros, and both extreme corners of every ON cube
(its free inputs all 0, then all 1). Then ``samples`` points from a ``random.Random(seed)`` stream, half drawn
uniformly, half inside the ON cubes (a random cube, its free inputs random), so that outputs whose care points are
rare are still exercised. Duplicates are dropped, first occurrence kept: the same seed gives the same vectors.

:func:`sample_points` is the one generator: :func:`plaforge.verify.simulate.check_component` calls it, and the
stand-alone harness (:mod:`plaforge.emit.harness`) carries its source text. It therefore depends on nothing but the
standard library and is laid out as the ruff formatter lays out code at line length 88.
"""

from __future__ import annotations

__all__ = ["sample_points"]


def sample_points(
    n_inputs: int, on_cubes: list[tuple[int, int]], samples: int, seed: int
) -> tuple[list[int], int]:
    """Corner points, then seeded random points, without repeats; and how many corners.

    ``on_cubes`` are the ON cubes of every output as ``(care, value)`` masks, output by
    output; bit ``i`` of a point is input ``i``.
    """
    import random

    full = (1 << n_inputs) - 1
    points = [0, full]
    points += [1 << i for i in range(n_inputs)]
    points += [full ^ (1 << i) for i in range(n_inputs)]
    for care, value in on_cubes:
        points += [value, value | (full & ~care)]
    unique = dict.fromkeys(points)
    corners = len(unique)
    rng = random.Random(seed)
    for k in range(samples):
        point = rng.getrandbits(n_inputs) if n_inputs else 0
        if k % 2 and on_cubes:
            care, value = on_cubes[rng.randrange(len(on_cubes))]
            point = value | (point & full & ~care)
        unique[point] = None
    return list(unique), corners
