"""The array and early-exit fast paths under the minimizer: each checked against an independent evaluation.

* ``cube_list_contains`` now decides tautology by the unate recursive paradigm, stopping at the first failing
  cofactor: checked against pyeda's SAT solver (``satisfy_one`` of the complement is ``None`` exactly for a
  tautology) and against brute-force enumeration of the points (common practice).
* ``cubes_bits`` builds packed point sets in arrays: checked against the definition of a cube's points
  (``p & care == value``, common practice) evaluated with numpy over every point.
* the heuristic's job rows are built in arrays: each row is decoded back and checked against the cubes it came
  from, with the merge rule of the positional cube notation written out in the test (a don't-care mark wins over
  ON under F|D, an OFF mark wins over ON under F|R).
"""

from __future__ import annotations

import itertools
import random

import numpy as np
import pytest

from plaforge.core.cube import Cube, cube_list_contains
from plaforge.core.table import FunctionSets, cubes_bits, unpack_bits
from plaforge.minimize.covering import quick_lower_bound
from plaforge.minimize.heuristic import _job, decode_row


def _random_cubes(rng: random.Random, n: int, count: int, dense: bool = False) -> list[Cube]:
    out = []
    for _ in range(count):
        care = rng.getrandbits(n)
        if not dense:
            care &= rng.getrandbits(n)
        out.append(Cube(care, rng.getrandbits(n) & care))
    return out


def _contains_by_points(cubes: list[Cube], cube: Cube, n: int) -> bool:
    return all(any(c.contains_point(p) for c in cubes) for p in range(1 << n) if cube.contains_point(p))


@pytest.mark.parametrize("seed", range(6))
def test_containment_matches_enumeration(seed: int) -> None:
    rng = random.Random(seed)
    for _ in range(400):
        n = rng.choice([2, 3, 4, 5, 6])
        cubes = _random_cubes(rng, n, rng.randint(0, 12))
        target = _random_cubes(rng, n, 1)[0]
        assert cube_list_contains(cubes, target) == _contains_by_points(cubes, target, n)


def test_tautology_agrees_with_pyeda_sat_on_wide_lists() -> None:
    # reference: pyeda's expression layer and its SAT solver; a list of cubes covers everything exactly when its
    # complement has no satisfying point
    from pyeda.boolalg.expr import And, Or, exprvar

    rng = random.Random(11)
    n = 24
    xs = [exprvar("x", i) for i in range(n)]

    def expr_of(cubes: list[Cube]):
        terms = [And(*[xs[i] if c.value >> i & 1 else ~xs[i] for i in range(n) if c.care >> i & 1])
                 for c in cubes]
        return Or(*terms)

    seen = {True: 0, False: 0}
    for trial in range(60):
        # a few literals per cube over 24 inputs: tautologies are rare unless built in, so half the lists get a
        # Shannon split of a random cube added (x c + x' c covers c)
        cubes = []
        for _ in range(rng.randint(4, 14)):
            idx = rng.sample(range(n), rng.randint(1, 3))
            care = sum(1 << i for i in idx)
            cubes.append(Cube(care, rng.getrandbits(n) & care))
        if trial % 2:
            v = rng.randrange(n)
            cubes += [Cube(1 << v, 0), Cube(1 << v, 1 << v)]
        want = (~expr_of(cubes)).satisfy_one() is None
        assert cube_list_contains(cubes, Cube(0, 0)) == want
        seen[want] += 1
    assert seen[True] and seen[False]


@pytest.mark.parametrize("n", [1, 4, 5, 6, 7, 10, 13])
def test_packed_point_sets_match_the_definition(n: int) -> None:
    rng = random.Random(n)
    full = (1 << n) - 1
    points = np.arange(1 << n, dtype=np.int64)
    for _ in range(30):
        cubes = _random_cubes(rng, n, rng.randint(0, 40))
        cubes += [Cube(full, rng.getrandbits(n)) for _ in range(rng.randint(0, 80))]  # single points
        want = np.zeros(1 << n, dtype=bool)
        for c in cubes:
            want |= (points & c.care) == c.value
        assert (unpack_bits(cubes_bits(cubes, n), n) == want).all()


@pytest.mark.parametrize("kind,n,m", [("fd", 5, 3), ("fr", 7, 2), ("fd", 20, 70), ("fr", 70, 4)])
def test_job_rows_follow_the_merge_rule(kind: str, n: int, m: int) -> None:
    rng = random.Random(n * m)
    on = [c.with_outputs(rng.getrandbits(m) or 1) for c in _random_cubes(rng, n, 25)]
    other = on[:5] + [c.with_outputs(rng.getrandbits(m) or 1) for c in _random_cubes(rng, n, 25)]
    other_mark = 2 if kind == "fd" else 0
    job = _job(n, m, kind, [(on, 1), (other, other_mark)], spec_order=True)
    # the rule written out: start from "nothing said" (0 under F|D, 2 under F|R), then ON, then the other set
    want: dict[tuple[int, int], list[int]] = {}
    for cubes, mark in ((on, 1), (other, other_mark)):
        for c in cubes:
            entry = want.setdefault((c.care, c.value), [2 if kind == "fr" else 0] * m)
            for j in range(m):
                if c.outputs >> j & 1 and not (mark == 1 and entry[j] == 2 and kind == "fd"):
                    entry[j] = mark
    got = {}
    for inpart, outpart in job.rows:
        c = decode_row(inpart, outpart, job.order)
        got[(c.care, c.value)] = list(outpart)
    assert got == want


def test_a_stopped_bound_is_still_a_bound() -> None:
    # reference: pyeda's minimizer gives a cover; no lower bound may exceed its rows, however early it stops
    from pyeda.boolalg.espresso import DTYPE, FTYPE, espresso, set_config

    from plaforge.minimize.heuristic import MINIMIZER_DEFAULTS

    rng = random.Random(5)
    n, m = 9, 3
    on = [[c.with_outputs(1) for c in _random_cubes(rng, n, 30, dense=True)] for _ in range(m)]
    # don't-cares kept apart from the ON cubes, so both sides read the same function
    dc = [[c.with_outputs(1) for c in _random_cubes(rng, n, 12, dense=True) if not any(c.intersects(o) for o in on[j])]
          for j in range(m)]
    rows = set()
    for j in range(m):
        for cubes, mark in ((on[j], 1), (dc[j], 2)):
            for c in cubes:
                inp = tuple((2 if c.value >> i & 1 else 1) if c.care >> i & 1 else 3 for i in range(n))
                rows.add((inp, tuple(mark if k == j else 0 for k in range(m))))
    set_config(**MINIMIZER_DEFAULTS)
    ref_rows = len(espresso(n, m, rows, FTYPE | DTYPE))
    fs = FunctionSets(n, m, tuple(map(tuple, on)), tuple(map(tuple, dc)))
    for stop_after in (0, 3, 30, None):
        calls = itertools.count()

        def stop() -> bool:
            return stop_after is not None and next(calls) >= stop_after  # noqa: B023 - used before the next loop
        bound = quick_lower_bound(fs, False, 5.0, stop)
        assert 1 <= bound <= ref_rows
