"""What every minimizer path does with its cubes: one row per input part, a fixed order, a re-verified Cover.

Re-verification trusts only the Table: exhaustive and bit-parallel up to the enumeration limit, cube-based above it
(every cover cube inside ON ∪ DC, every ON cube inside the cover, both as tautology checks of cofactors). A cover
that fails it is a bug in plaforge or in the library it called: :class:`plaforge.core.errors.InternalError`.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from ..core.cube import Cover, Cube, cube_list_contains, merge_identical
from ..core.errors import InternalError
from ..core.sets import GivenSets
from ..core.table import DEFAULT_ENUM_LIMIT, FunctionSets, Table, cubes_bits
from ..verify.equivalence import check_cover
from .options import MinimizeOptions

__all__ = ["checked_cover", "sort_cubes", "term_count", "verify_cover", "verify_given"]


def sort_cubes(cubes: Sequence[Cube]) -> list[Cube]:
    """Deterministic order: by the outputs fed (output 0 first), then fewer literals, then the masks."""
    def key(c: Cube) -> tuple[int, int, int, int]:
        low = (c.outputs & -c.outputs).bit_length()
        return (low, c.literals, c.care, c.value)
    return sorted(cubes, key=key)


def term_count(cubes: Sequence[Cube], per_output: bool) -> int:
    """What the cost model counts: product terms summed over outputs (``per_output``) or distinct rows."""
    return sum(c.outputs.bit_count() for c in cubes) if per_output else len(cubes)


def _cube_check(fs: FunctionSets, cubes: Sequence[Cube]) -> str | None:
    """Cube-based check of ON ⊆ cover ⊆ ON ∪ DC per output (tautology checks; no enumeration)."""
    for j in range(fs.m):
        mine = [c for c in cubes if c.outputs >> j & 1]
        allowed = list(fs.on[j]) + list(fs.dc[j])
        for c in mine:
            if not cube_list_contains(allowed, c):
                return f"output {j}: cover cube {c!r} reaches the OFF set"
        for c in fs.on[j]:
            if not cube_list_contains(mine + list(fs.dc[j]), c):
                return f"output {j}: ON cube {c!r} is not covered"
    return None


def verify_cover(table: Table, cover: Cover, what: str) -> None:
    """Raise :class:`InternalError` unless ``cover`` realizes ``table`` (ON ⊆ cover ⊆ ON ∪ DC, inversion honoured).

    Exhaustive bit-parallel check up to :data:`plaforge.core.table.DEFAULT_ENUM_LIMIT` inputs, cube-based above.
    """
    if table.n_inputs <= DEFAULT_ENUM_LIMIT:
        verdict = check_cover(table, cover)
        bad = [o for o in verdict.outputs if not o.passed]
        if bad:
            o = bad[0]
            raise InternalError(f"{what} returned a wrong cover: output {o.name!r} fails at point {o.failure}")
        return
    problem = _cube_check(table.cover_sets(cover.inverted), cover.cubes)
    if problem:
        raise InternalError(f"{what} returned a wrong cover: {problem}")


def _given_points_check(gs: GivenSets, cubes: Sequence[Cube]) -> str | None:
    """Bit-parallel check of a cover against sets as given, over all 2**n points (packed 64 to a word)."""
    n = gs.n
    feeding: list[list[Cube]] = [[] for _ in range(gs.m)]
    for c in cubes:
        outs = c.outputs
        while outs:
            low = outs & -outs
            feeding[low.bit_length() - 1].append(c)
            outs ^= low
    valid = cubes_bits([Cube(0, 0)], n)  # every point
    for j in range(gs.m):
        on, other, got = cubes_bits(gs.on[j], n), cubes_bits(gs.other[j], n), cubes_bits(feeding[j], n)
        dc = other if gs.kind == "fd" else valid & ~(on | other)
        missed = on & ~dc & ~got
        if missed.any():
            return f"output {j}: ON point {_first_point(missed)} is not covered"
        off = valid & ~(on | dc) if gs.kind == "fd" else other
        wrong = got & off
        if wrong.any():
            return f"output {j}: the cover reaches OFF point {_first_point(wrong)}"
    return None


def _first_point(bits: np.ndarray) -> int:
    """The lowest point of a non-empty packed set."""
    w = int(np.flatnonzero(bits)[0])
    word = int(bits[w])
    return 64 * w + (word & -word).bit_length() - 1


def _given_cube_check(gs: GivenSets, cubes: Sequence[Cube]) -> str | None:
    """Cube-based check of a cover against sets as given (tautology checks and pairwise intersections)."""
    if gs.kind == "fd":
        return _cube_check(FunctionSets(gs.n, gs.m, gs.on, gs.other), cubes)
    for j in range(gs.m):
        mine = [c for c in cubes if c.outputs >> j & 1]
        for c in mine:
            for off in gs.other[j]:
                if c.intersects(off):
                    return f"output {j}: cover cube {c!r} reaches OFF cube {off!r}"
        for c in gs.on[j]:
            if not cube_list_contains(mine, c):
                return f"output {j}: ON cube {c!r} is not covered"
    return None


def verify_given(cover: Cover, gs: GivenSets, what: str) -> None:
    """Raise :class:`InternalError` unless ``cover`` realizes the sets ``gs`` as given (ON ⊆ cover, cover ∩ OFF
    empty, DC free), without complementing them: bit-parallel up to
    :data:`plaforge.core.table.DEFAULT_ENUM_LIMIT` inputs, cube-based above."""
    check = _given_points_check if gs.n <= DEFAULT_ENUM_LIMIT else _given_cube_check
    problem = check(gs, cover.cubes)
    if problem:
        raise InternalError(f"{what} returned a wrong cover: {problem}")


def checked_cover(table: Table, cubes: Sequence[Cube], options: MinimizeOptions, inverted: int, method: str,
                  optimal: bool, lower_bound: int, extra: tuple[tuple[str, object], ...] = (),
                  given: GivenSets | None = None) -> Cover:
    """The Cover of ``cubes`` (identical input parts merged, :func:`sort_cubes` order), verified against ``table``.

    ``lower_bound`` is capped at the cover's own count under ``options.cost``; ``seconds`` is left 0.
    """
    rows = sort_cubes(merge_identical(cubes))
    cover = Cover(
        table.input_names, table.output_names, tuple(rows), inverted=inverted, method=method, optimal=optimal,
        lower_bound=min(lower_bound, term_count(rows, options.cost == "per-output")), seconds=0.0,
        cost=options.cost, extra=extra,
    )
    if given is not None:
        verify_given(cover, given, f"the {method} minimizer")
    else:
        verify_cover(table, cover, f"the {method} minimizer")
    return cover
