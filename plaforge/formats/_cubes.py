"""Cube-set helpers shared by the readers: ranges and patterns as cubes, and overlap search.

Vocabulary
----------
field
    A run of consecutive table inputs read as one unsigned number (a bus): ``indices[b]`` is the table input holding
    bit ``b`` of the number (bit 0 is the least significant).
range cubes
    The inclusive range ``lo..hi`` of a ``w``-bit field as at most ``2*w`` disjoint cubes: the classic prefix
    decomposition (each cube fixes a prefix of high bits and leaves the low bits free), so ranges over 32-bit
    addresses never enumerate their points.

The readers take ``a # b`` (the points of ``a`` no cube of ``b`` holds) from :func:`plaforge.core.cube.sharp`.
"""

from __future__ import annotations

from collections.abc import Sequence

from ..core.cube import Cube

__all__ = [
    "and_lists",
    "field_cube",
    "find_overlap",
    "place",
    "range_cubes",
]


def place(care: int, value: int, indices: Sequence[int]) -> tuple[int, int]:
    """Move a (care, value) pair over field bits ``0..w-1`` onto the table inputs ``indices``."""
    c = v = 0
    for b, idx in enumerate(indices):
        if care >> b & 1:
            c |= 1 << idx
            if value >> b & 1:
                v |= 1 << idx
    return c, v


def field_cube(value: int, mask: int, indices: Sequence[int]) -> Cube:
    """The cube where the field's bits selected by ``mask`` equal those of ``value``."""
    c, v = place(mask, value & mask, indices)
    return Cube(c, v)


def range_cubes(lo: int, hi: int, indices: Sequence[int]) -> list[Cube]:
    """Disjoint cubes covering exactly the field values ``lo..hi`` (inclusive), at most ``2*w`` of them.

    >>> [c.text(4) for c in range_cubes(3, 12, range(4))]   # 3, 4..7, 8..11, 12 (bit 0 leftmost)
    ['1100', '--10', '--01', '0011']
    """
    w = len(indices)
    full = (1 << w) - 1
    out: list[Cube] = []
    x = lo
    while x <= hi:
        # largest aligned block starting at x that stays within hi
        size = x & -x if x else 1 << w
        while size > hi - x + 1:
            size >>= 1
        free = size.bit_length() - 1
        care = full & ~((1 << free) - 1)
        out.append(field_cube(x, care, indices))
        x += size
    return out


def and_lists(a: Sequence[Cube], b: Sequence[Cube]) -> list[Cube]:
    """Pairwise intersections of two cube lists (the AND of two unions)."""
    out: list[Cube] = []
    for x in a:
        for y in b:
            z = x.intersect(y)
            if z is not None:
                out.append(Cube(z.care, z.value, 1))
    return list(dict.fromkeys(out))


def find_overlap(
    a: Sequence[tuple[Cube, int]], b: Sequence[tuple[Cube, int]], n: int
) -> tuple[tuple[Cube, int], tuple[Cube, int]] | None:
    """The pair (from ``a``, from ``b``) of tagged cubes whose input parts share a point, or ``None``.

    Tags are line numbers; of all overlapping pairs the one whose later line comes first is returned (so a reader
    reports the first conflict in file order). Long lists are split on the input most cubes test (cubes free in it
    go to both halves) until they are short enough to compare pairwise, so two lists of ``k`` cubes cost about
    ``k log k`` tests when they are spread out, instead of ``k**2``.
    """
    if not a or not b:
        return None
    best: list[tuple[tuple[Cube, int], tuple[Cube, int]]] = []  # at most one pair: the best so far
    _overlap(sorted(a, key=lambda t: t[1]), sorted(b, key=lambda t: t[1]), 0, best)
    return best[0] if best else None


def _overlap(a: list[tuple[Cube, int]], b: list[tuple[Cube, int]], used: int,
             best: list[tuple[tuple[Cube, int], tuple[Cube, int]]]) -> None:
    if not a or not b:
        return
    if len(a) * len(b) > 4096:
        counts: dict[int, int] = {}
        for x, _ in a + b:
            m = x.care & ~used
            while m:
                low = m & -m
                counts[low] = counts.get(low, 0) + 1
                m ^= low
        if counts:
            bit = max(counts, key=lambda k: (counts[k], -k))
            if counts[bit] * 4 >= 3 * (len(a) + len(b)):  # splitting sends few cubes to both halves
                halves = []
                for side in (a, b):
                    zero = [t for t in side if not t[0].care & bit or not t[0].value & bit]
                    one = [t for t in side if not t[0].care & bit or t[0].value & bit]
                    halves.append((zero, one))
                _overlap(halves[0][0], halves[1][0], used | bit, best)
                _overlap(halves[0][1], halves[1][1], used | bit, best)
                return
    limit = max(best[0][0][1], best[0][1][1]) if best else None
    for item in a:  # both lists are in line order: stop once no pair can beat the best one
        if limit is not None and item[1] > limit:
            break
        x = item[0]
        for y in b:
            if limit is not None and y[1] > limit:
                break
            if (x.value ^ y[0].value) & x.care & y[0].care == 0:
                key = (max(item[1], y[1]), min(item[1], y[1]))
                if not best or key < (max(best[0][0][1], best[0][1][1]), min(best[0][0][1], best[0][1][1])):
                    best[:] = [(item, y)]
                    limit = key[0]
