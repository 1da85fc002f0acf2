"""The vectors a simulation drives when a table has too many inputs to drive every point: a sample, not a proof.

Corner cases first: all zeros, all ones, walking ones, walking zeros, and both extreme corners of every ON and every
OFF cube (its free inputs all 0, then all 1). Then ``samples`` points from a ``random.Random(seed)`` stream, taking
turns among four kinds so that every region is visited however small it is:

* uniform over all points;
* inside an ON cube (a random cube, its free inputs random);
* inside an OFF cube (the same);
* just outside an ON or DC cube: a random point of a random cube with one of its fixed inputs flipped, where an
  output's value changes or a don't-care region ends.

A kind whose cube list is empty draws uniformly instead. Duplicates are dropped, first occurrence kept: the same seed
gives the same vectors.

:func:`sample_points` is the one generator: :func:`plaforge.verify.simulate.check_component` calls it, and the
stand-alone harness (:mod:`plaforge.emit.harness`) carries its source text. It therefore depends on nothing but the
standard library and is laid out as the ruff formatter lays out code at line length 88.
"""

from __future__ import annotations

__all__ = ["sample_points"]


def sample_points(
    n_inputs: int,
    cubes: dict[str, list[tuple[int, int]]],
    samples: int,
    seed: int,
) -> tuple[list[int], int]:
    """Corner points, then seeded random points, without repeats; and how many corners.

    ``cubes`` maps ``"on"``, ``"off"`` and ``"dc"`` to the cubes of every output's ON,
    OFF and don't-care sets as ``(care, value)`` masks, output by output; bit ``i`` of a
    point is input ``i``.
    """
    import random

    full = (1 << n_inputs) - 1
    on, off, dc = cubes.get("on", []), cubes.get("off", []), cubes.get("dc", [])
    points = [0, full]
    points += [1 << i for i in range(n_inputs)]
    points += [full ^ (1 << i) for i in range(n_inputs)]
    for care, value in on + off:
        points += [value, value | (full & ~care)]
    unique = dict.fromkeys(points)
    corners = len(unique)
    edges = [c for c in on + dc if c[0]]
    rng = random.Random(seed)
    for k in range(samples):
        point = rng.getrandbits(n_inputs) if n_inputs else 0
        pool = (None, on, off, edges)[k % 4]
        if pool:
            care, value = pool[rng.randrange(len(pool))]
            point = value | (point & full & ~care)
            if pool is edges:
                fixed = [i for i in range(n_inputs) if care >> i & 1]
                point ^= 1 << fixed[rng.randrange(len(fixed))]
        unique[point] = None
    return list(unique), corners
