"""The exact path over all output phase assignments, checked against a brute force over the assignments."""

from __future__ import annotations

import json
import math
import time
from collections.abc import Callable

import numpy as np
import pytest
from click.testing import CliRunner

from plaforge.cli import cli
from plaforge.core.table import Table
from plaforge.minimize import MinimizeOptions, cover_summary, exact, minimize
from plaforge.minimize.covering import CoverProblem, build_problem, reduce_problem
from plaforge.minimize.primes import Budget, multi_output_primes
from plaforge.minimize.progress import Progress
from plaforge.verify.equivalence import check_cover

EXACT = MinimizeOptions(exact=True, time_limit=60)
EXACT_PHASE = MinimizeOptions(exact=True, phase=True, time_limit=60)

Fn = Callable[[np.ndarray], list[np.ndarray]]


def _table(n: int, m: int, on: Fn, dc: Fn | None = None) -> Table:
    return Table.from_function([f"x[{i}]" for i in range(n)], [f"y[{j}]" for j in range(m)], on, dc)


def _brute_force_phase_minimum(n: int, m: int, on: Fn, dc: Fn | None, per_output: bool = False) -> int:
    """Minimum over all 2^m phase assignments, each one a separate exact run on the complemented table."""
    opts = MinimizeOptions(exact=True, time_limit=60, cost="per-output" if per_output else "shared")
    best = None
    for inv in range(1 << m):
        def flipped(p: np.ndarray, inv: int = inv) -> list[np.ndarray]:
            return [~v if inv >> j & 1 else v for j, v in enumerate(on(p))]
        cover = minimize(_table(n, m, flipped, dc), opts)
        assert cover.optimal
        count = sum(cover.terms().values()) if per_output else cover.rows
        best = count if best is None else min(best, count)
    assert best is not None
    return best


def _popcount5(p: np.ndarray) -> list[np.ndarray]:
    c = sum((p >> i) & 1 for i in range(5))
    return [(c >> k & 1).astype(bool) for k in range(3)]


def test_popcount5_phase_minimum_is_22() -> None:
    t = _table(5, 3, _popcount5)
    cover = minimize(t, EXACT_PHASE)
    assert check_cover(t, cover).passed
    # brute force in the test: all 8 assignments minimized exactly one by one
    assert _brute_force_phase_minimum(5, 3, _popcount5, None) == 22
    # measured by an independent exact solver over all phase assignments: 22
    assert cover.optimal and cover.rows == 22 and cover.lower_bound == 22


@pytest.mark.parametrize("seed", range(4))
def test_random_tables_phase_minimum_matches_brute_force(seed: int) -> None:
    rng = np.random.default_rng(100 + seed)
    n, m = 4 + seed % 3, 2 + seed % 3
    draw = rng.random((m, 1 << n))

    def on(p: np.ndarray) -> list[np.ndarray]:
        return [draw[j][p] < 0.45 for j in range(m)]

    def dc(p: np.ndarray) -> list[np.ndarray]:
        return [(draw[j][p] >= 0.45) & (draw[j][p] < 0.6) for j in range(m)]

    t = _table(n, m, on, dc)
    cover = minimize(t, EXACT_PHASE)
    assert check_cover(t, cover).passed
    assert cover.optimal and cover.rows == _brute_force_phase_minimum(n, m, on, dc)
    per = minimize(t, MinimizeOptions(exact=True, phase=True, time_limit=60, cost="per-output"))
    assert check_cover(t, per).passed
    assert per.optimal and sum(per.terms().values()) == _brute_force_phase_minimum(n, m, on, dc, per_output=True)


def test_constant_output_in_complement_needs_no_row() -> None:
    def on(p: np.ndarray) -> list[np.ndarray]:
        return [(p & 3) == 3, np.ones(p.shape, dtype=bool)]

    t = _table(3, 2, on)
    cover = minimize(t, EXACT_PHASE)
    # common practice: a constant-1 output realized in complement is the inverse of an empty OR, no product term
    assert cover.optimal and cover.rows == 1 and cover_summary(cover)["inverted"] == ["y[1]"]
    assert cover.terms() == {"y[0]": 1, "y[1]": 0}
    assert check_cover(t, cover).passed


def test_phase_cli_json_names_inverted_outputs(tmp_path) -> None:
    spec = tmp_path / "nand4.pla"
    rows = "\n".join(f"{p:04b} {0 if p == 15 else 1}" for p in range(16))
    spec.write_text(f".i 4\n.o 1\n.ilb a b c d\n.ob y\n.type fr\n{rows}\n.e\n")
    res = CliRunner().invoke(cli, ["minimize", str(spec), "--exact", "--phase", "--json"])
    assert res.exit_code == 0, res.output
    data = json.loads(res.output)
    # De Morgan (common practice): NOT(a b c d) is one 4-literal term realized in complement
    assert data["inverted"] == ["y"] and data["rows"] == 1 and data["optimal"] is True and data["lower_bound"] == 1


def test_per_output_json_counts_terms_total(tmp_path) -> None:
    spec = tmp_path / "adder.pla"
    spec.write_text(".i 3\n.o 2\n.ilb a b cin\n.ob sum cout\n.type fr\n001 10\n010 10\n100 10\n111 11\n011 01\n"
                    "101 01\n110 01\n000 00\n.e\n")
    res = CliRunner().invoke(cli, ["minimize", str(spec), "--exact", "--cost", "per-output", "--json"])
    data = json.loads(res.output)
    # common practice: sum needs its 4 minterms, carry ab + a cin + b cin: 7 terms counted per output
    assert data["terms_total"] == sum(data["terms"].values()) == 7 and data["cost"] == "per-output"
    assert data["optimal"] is True and data["lower_bound"] == data["terms_total"]


def _double_phase_problem(t: Table) -> CoverProblem:
    """The reduced covering problem the exact path builds for ``--phase`` (outputs j and m + j, guarded)."""
    m, n = t.n_outputs, t.n_inputs
    true_sets, comp_sets = t.cover_sets(0), t.cover_sets((1 << m) - 1)
    on = [true_sets.on[j] for j in range(m)] + [comp_sets.on[j] for j in range(m)]
    f = [true_sets.on[j] + true_sets.dc[j] for j in range(m)] + [comp_sets.on[j] + comp_sets.dc[j] for j in range(m)]
    budget = Budget(time.monotonic() + 3600, 1 << 30)
    pb = build_problem(multi_output_primes(f, on, n, budget, 10**6), on, n, budget, guarded=True)
    reduce_problem(pb, budget.deadline)
    return pb


def _covers_needed(pb: CoverProblem, chosen: list[int], selected: int) -> bool:
    covered = 0
    for p in chosen:
        covered |= pb.covers[p]
    return pb.needed(selected) & ~covered == 0


@pytest.mark.parametrize("seed", range(3))
def test_branching_and_closing_reach_the_brute_force_minimum(seed: int) -> None:
    # both phase searches run to their end from a poor incumbent (greedy, all outputs in true phase) on their own,
    # without the all-assignments model that proves small tables first, and must meet the brute force
    rng = np.random.default_rng(200 + seed)
    n, m = 5, 3 + seed % 2
    draw = rng.random((m, 1 << n))

    def on(p: np.ndarray) -> list[np.ndarray]:
        return [draw[j][p] < 0.5 for j in range(m)]

    t = _table(n, m, on)
    want = _brute_force_phase_minimum(n, m, on, None)
    pb = _double_phase_problem(t)
    ess = len(pb.chosen)
    start_sel = exact._selected(m, 0)
    start = exact.greedy_cover(pb, (), start_sel)
    far = time.monotonic() + 3600
    chosen, sel, complete, nodes, order, low = exact._branch_phases(pb, m, start, start_sel, far,
                                                                    Progress(False, ""))
    assert complete and nodes >= 1 and sorted(order) == list(range(m)) and low == len(chosen)
    assert ess + len(chosen) == want and _covers_needed(pb, chosen, sel)
    chosen, sel, proven, bound = exact._prove_phases(pb, m, start, start_sel, range(m), far)
    assert proven and ess + len(chosen) == want and _covers_needed(pb, chosen, sel)
    assert math.isclose(bound, len(chosen))


def _mul4x4(p: np.ndarray) -> list[np.ndarray]:
    # integer multiplication of two 4-bit numbers, product bit k (common practice)
    prod = (p & 15) * (p >> 4)
    return [(prod >> k & 1).astype(bool) for k in range(8)]


@pytest.mark.slow
def test_mul4x4_phase_minimum_is_107() -> None:
    t = _table(8, 8, _mul4x4)
    # a generous limit so a loaded machine still finishes (60 s suffice on an idle one: benchmarks.bench_phase)
    cover = minimize(t, MinimizeOptions(exact=True, phase=True, time_limit=300))
    assert check_cover(t, cover).passed
    # 107 rows over all 256 phase assignments: measured by an independent exact solver (quoted in issue 9) and by
    # `python -m benchmarks.bench_phase`, which minimizes every assignment exactly on its own (run on 2 Dec 2026:
    # 256 proven runs, minimum 107, reached only with p[1], p[3] and p[6] inverted)
    assert cover.optimal and cover.rows == 107 and cover.lower_bound == 107
    # A cheaper confirmation than the 256 runs: the winning assignment minimized exactly without --phase gives
    # the same 107 rows, and its neighbours (one output flipped) plus all-true and all-complement give no fewer.
    inv = cover.inverted

    def minimum(assignment: int) -> int:
        def flipped(p: np.ndarray) -> list[np.ndarray]:
            return [~v if assignment >> j & 1 else v for j, v in enumerate(_mul4x4(p))]

        res = minimize(_table(8, 8, flipped), EXACT)
        assert res.optimal
        return res.rows

    assert minimum(inv) == 107
    for other in [0, 255] + [inv ^ (1 << j) for j in range(8)]:
        assert minimum(other) >= 107
