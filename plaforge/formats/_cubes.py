"""Cube-set helpers shared by the readers: ranges and patterns as cubes, sharp, and overlap search.

Vocabulary
----------
field
    A run of consecutive table inputs read as one unsigned number (a bus): ``indices[b]`` is the table input holding
    bit ``b`` of the number (bit 0 is the least significant).
range cubes
    The inclusive range ``lo..hi`` of a ``w``-bit field as at most ``2*w`` disjoint cubes: the classic prefix
    decomposition (each cube fixes a prefix of high bits and leaves the low bits free), so ranges over 32-bit
    addresses never enumerate their points.
sharp
    ``a # b``: the points of cube list ``a`` that no cube of ``b`` holds, as cubes. Computed per cube of ``a`` from
    the complement of only those cubes of ``b`` that touch it, so disjoint lists cost one intersection test per pair.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence

from ..cube import Cube, complement

__all__ = [
    "and_lists",
    "field_cube",
    "find_overlap",
    "pattern_cube",
    "place",
    "range_cubes",
    "sharp",
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


def pattern_cube(care: int, value: int, indices: Sequence[int]) -> Cube:
    """Same as :func:`field_cube` with (care, value) naming."""
    return field_cube(value, care, indices)


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


def sharp(a: Iterable[Cube], b: Sequence[Cube], outputs: int = 1) -> list[Cube]:
    """Points of ``a`` not in any cube of ``b``, as cubes feeding ``outputs``."""
    out: list[Cube] = []
    for x in a:
        touching = [y for y in b if y.intersects(x)]
        if not touching:
            out.append(Cube(x.care, x.value, outputs))
            continue
        # complement of the touching cubes inside x: cofactor them by x, complement, then re-impose x
        cof = [Cube(y.care & ~x.care, y.value & ~x.care) for y in touching]
        for z in complement(cof):
            out.append(Cube(z.care | x.care, z.value | x.value, outputs))
    return list(dict.fromkeys(out))


def find_overlap(
    a: Sequence[tuple[Cube, int]], b: Sequence[tuple[Cube, int]], n: int
) -> tuple[tuple[Cube, int], tuple[Cube, int]] | None:
    """First pair (from ``a``, from ``b``) of tagged cubes whose input parts share a point, or ``None``.

    Minterms (cubes testing all ``n`` inputs) are looked up in a dict, so two long lists of fully specified rows
    cost O(len(a) + len(b)); only cubes with free inputs are compared pairwise.
    """
    if not a or not b:
        return None
    full = (1 << n) - 1
    b_points: dict[int, tuple[Cube, int]] = {}
    b_cubes: list[tuple[Cube, int]] = []
    for item in b:
        if item[0].care == full:
            b_points.setdefault(item[0].value, item)
        else:
            b_cubes.append(item)
    best: tuple[tuple[Cube, int], tuple[Cube, int]] | None = None
    for item in a:
        x = item[0]
        cands: list[tuple[Cube, int]] = []
        if x.care == full:
            hit = b_points.get(x.value)
            if hit is not None:
                cands.append(hit)
        else:
            cands.extend(p for p in b_points.values() if x.contains_point(p[0].value))
        cands.extend(y for y in b_cubes if x.intersects(y[0]))
        for y in cands:
            pair = (item, y)
            if best is None or (max(item[1], y[1]), min(item[1], y[1])) < (max(best[0][1], best[1][1]),
                                                                          min(best[0][1], best[1][1])):
                best = pair
    return best
