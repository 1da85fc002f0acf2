"""The exact path over all output phase assignments, checked against a brute force over the assignments."""

from __future__ import annotations

import json
from collections.abc import Callable

import numpy as np
import pytest
from click.testing import CliRunner

from plaforge.cli import cli
from plaforge.core.table import Table
from plaforge.minimize import MinimizeOptions, cover_summary, minimize
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


def _mul4x4(p: np.ndarray) -> list[np.ndarray]:
    prod = (p & 15) * (p >> 4)
    return [(prod >> k & 1).astype(bool) for k in range(8)]


@pytest.mark.slow
def test_mul4x4_phase_minimum_is_107() -> None:
    t = _table(8, 8, _mul4x4)
    cover = minimize(t, MinimizeOptions(exact=True, phase=True, time_limit=120))
    assert check_cover(t, cover).passed
    # measured by an independent exact solver over all 256 phase assignments: 107 rows
    assert cover.rows >= 107
    assert cover.lower_bound <= 107
    if cover.optimal:
        assert cover.rows == 107
