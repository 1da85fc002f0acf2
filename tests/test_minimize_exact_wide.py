"""The exact path sized by the problem: wide inputs with few cubes, more than 64 outputs, real lower bounds."""

from __future__ import annotations

import time

import numpy as np
import pytest

from plaforge.core.cube import Cube
from plaforge.core.errors import TimeLimit
from plaforge.core.table import Table
from plaforge.minimize import MinimizeOptions, cover_summary, minimize
from plaforge.minimize.exact import minimize_exact
from plaforge.minimize.result import verify_cover
from plaforge.verify.equivalence import check_cover

EXACT = MinimizeOptions(exact=True, time_limit=120)


def one_hot_encoder(lines: int = 16) -> Table:
    """16 one-hot input lines to the 4-bit index of the line that is high; rows for lines 1..15, rest don't-care."""
    width = (lines - 1).bit_length()
    on: list[list[Cube]] = [[] for _ in range(width)]
    off: list[list[Cube]] = [[] for _ in range(width)]
    for i in range(1, lines):
        point = Cube.point(1 << i, lines)
        for b in range(width):
            (on if i >> b & 1 else off)[b].append(point)
    names = tuple(f"line[{i}]" for i in range(lines))
    outs = tuple(f"index[{b}]" for b in range(width))
    dc = tuple(None for _ in range(width))
    return Table(names, outs, tuple(tuple(c) for c in on), dc, tuple(tuple(c) for c in off))


def test_one_hot_encoder_16_inputs_one_term_per_output() -> None:
    t = one_hot_encoder()
    cover = minimize(t, EXACT)
    verify_cover(t, cover, "test")
    # common practice: with every non-one-hot pattern don't-care, index[b] is the single product of the negated
    # lines whose index has bit b clear (it holds every line that sets b and no line that clears it): one term each
    assert cover.optimal and cover.terms() == {f"index[{b}]": 1 for b in range(4)} and cover.rows == 4


def comparator_bank() -> Table:
    """A 9-bit number a against 36 constants: outputs a<c, a==c, a>c for each constant (108 outputs)."""
    consts = [7 + 14 * k for k in range(36)]

    def fn(p: np.ndarray) -> list[np.ndarray]:
        out = []
        for c in consts:
            out += [p < c, p == c, p > c]
        return out

    outs = [f"{rel}{c}" for c in consts for rel in ("lt", "eq", "gt")]
    return Table.from_function([f"a[{i}]" for i in range(9)], outs, fn)


def test_comparator_bank_108_outputs() -> None:
    t = comparator_bank()
    cover = minimize(t, EXACT)
    assert check_cover(t, cover).passed and cover.optimal
    terms = cover.terms()
    # common practice: an equality with a constant is a single minterm, its only implicant
    assert all(terms[name] == 1 for name in terms if name.startswith("eq"))
    heur = minimize(t)
    assert cover.rows <= heur.rows
    per = minimize(t, MinimizeOptions(exact=True, time_limit=120, cost="per-output"))
    assert check_cover(t, per).passed and per.optimal
    # common practice: alone, a < c is one product per 1 bit of c (higher bits equal, that bit 0), all essential
    assert all(per.terms()[f"lt{c}"] == c.bit_count() for c in (7 + 14 * k for k in range(36)))


def test_heuristic_bound_above_ten_inputs() -> None:
    # y = parity of x0..x4 on a 12-input table (x5..x11 unused)
    def fn(p: np.ndarray) -> list[np.ndarray]:
        return [(sum((p >> i) & 1 for i in range(5)) % 2).astype(bool)]

    t = Table.from_function([f"x[{i}]" for i in range(12)], ["y"], fn)
    cover = minimize(t)
    # textbook fact: parity of 5 variables needs 2^4 = 16 terms, no two ON cells adjacent
    assert cover.rows == 16 and cover.lower_bound == 16 and cover.optimal
    assert cover_summary(cover)["lower_bound"] == 16


def _popcount7() -> Table:
    def fn(p: np.ndarray) -> list[np.ndarray]:
        c = sum((p >> i) & 1 for i in range(7))
        return [(c >> k & 1).astype(bool) for k in range(3)]

    return Table.from_function([f"x[{i}]" for i in range(7)], ["c[0]", "c[1]", "c[2]"], fn)


def test_past_the_deadline_the_seed_comes_back_unproven() -> None:
    # the deadline has already passed when the exact path starts: it must not search, only hand back the cover it
    # was seeded with, verified, not optimal, with a bound it can stand by (no clock is read by the test)
    t = _popcount7()
    seed_cover = minimize(t)

    def seed(fs: object, options: MinimizeOptions) -> list[Cube]:
        return list(seed_cover.cubes)

    cover = minimize_exact(t, EXACT, 0, seed, time.monotonic() - 1.0)
    verify_cover(t, cover, "test")
    assert not cover.optimal and cover.rows == seed_cover.rows
    assert ("stopped", "time limit") in cover.extra
    assert 1 <= cover.lower_bound <= cover.rows


def test_past_the_deadline_without_any_cover_is_a_time_limit() -> None:
    def seed(fs: object, options: MinimizeOptions) -> list[Cube]:
        raise TimeLimit("the heuristic minimizer did not finish", "--time-limit")

    with pytest.raises(TimeLimit) as info:
        minimize_exact(_popcount7(), EXACT, 0, seed, time.monotonic() - 1.0)
    assert "\n" not in str(info.value)
