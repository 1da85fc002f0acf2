"""Static-1 hazards of two-level covers and hazard-free covers.

Every check here is held against something outside the hazard code: the textbook example f = x·y + x̄·z, whose
static-1 hazard when x changes with y = z = 1 is removed by the consensus term y·z (common practice; Eichelberger's
condition), and an exhaustive adjacency check written in this file (every pair of adjacent ON points, one input
apart, shares one product term of the output), which does not call the hazard finder.
"""

from __future__ import annotations

import random
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner

from plaforge.cli import cli
from plaforge.core.cube import Cover, Cube
from plaforge.core.errors import PlaforgeError
from plaforge.core.table import Table
from plaforge.formats import read_spec
from plaforge.minimize import MinimizeOptions, minimize
from plaforge.minimize.hazards import added_terms, hazard_free_cover
from plaforge.verify.hazards import changing_mask, find_hazards

SAMPLES = sorted(p for p in (Path(__file__).resolve().parent.parent / "samples").iterdir()
                 if p.suffix in (".toml", ".pla", ".csv"))


def _care_on(table: Table, j: int) -> set[int]:
    out = set()
    for p in range(1 << table.n_inputs):
        on, dc = table.evaluate(p)
        if on >> j & 1 and not dc >> j & 1:
            out.add(p)
    return out


def _unheld_pairs(table: Table, cover: Cover, changing: int | None = None) -> list[tuple[int, int, int]]:
    """Exhaustive adjacency check, independent of the finder: (output, point, input) for every pair of adjacent
    care ON points (the lower one given) that no single product term of the output holds."""
    n = table.n_inputs
    bad = []
    for j in range(table.n_outputs):
        assert not cover.is_inverted(j)
        on = _care_on(table, j)
        terms = cover.cubes_for(j)
        for p in sorted(on):
            for i in range(n):
                q = p | 1 << i
                if p >> i & 1 or q not in on or (changing is not None and not changing >> i & 1):
                    continue
                if not any(t.contains_point(p) and t.contains_point(q) for t in terms):
                    bad.append((j, p, i))
    return bad


def _classic() -> tuple[Table, Cover]:
    # inputs x=0, y=1, z=2; f = x·y + x̄·z
    on = (Cube.parse("11-"), Cube.parse("0-1"))
    table = Table(("x", "y", "z"), ("f",), (on,), ((),), (None,))
    return table, Cover(("x", "y", "z"), ("f",), on)


def test_classic_example_hazard_when_x_changes_with_y_and_z_high():
    # common practice: x·y + x̄·z glitches when x changes while y = z = 1
    table, cover = _classic()
    (h,) = find_hazards(table, cover)
    assert [(t.input, t.cube.text(3)) for t in h.transitions] == [(0, "-11")]
    assert h.pairs == 1
    assert _unheld_pairs(table, cover) == [(0, 0b110, 0)]


def test_classic_example_consensus_term_removes_it():
    # common practice: adding the consensus term y·z makes the cover hazard-free
    table, cover = _classic()
    fixed = hazard_free_cover(table, cover)
    assert [c.text(3) for c in added_terms(cover, fixed)] == ["-11"]
    assert _unheld_pairs(table, fixed) == []
    assert all(not h.transitions for h in find_hazards(table, fixed))


def test_changing_restricts_the_inputs_judged():
    table, cover = _classic()
    only_yz = changing_mask(table, "y,z")
    assert all(not h.transitions for h in find_hazards(table, cover, only_yz))
    with pytest.raises(PlaforgeError, match="no input or bus named w"):
        changing_mask(table, "w")


@pytest.mark.parametrize("path", [p for p in SAMPLES if read_spec(p).n_inputs <= 12], ids=lambda p: p.name)
def test_finder_counts_agree_with_exhaustive_check_on_samples(path):
    table = read_spec(path)
    cover = minimize(table)
    found = find_hazards(table, cover)
    bad = _unheld_pairs(table, cover)
    for j in range(table.n_outputs):
        assert found[j].pairs == sum(1 for b in bad if b[0] == j)


@pytest.mark.parametrize("path", [p for p in SAMPLES if read_spec(p).n_inputs <= 12], ids=lambda p: p.name)
@pytest.mark.parametrize("exact", [False, True])
def test_hazard_free_cover_on_samples(path, exact):
    table = read_spec(path)
    cover = minimize(table)
    fixed = hazard_free_cover(table, cover, options=MinimizeOptions(exact=exact, time_limit=30))
    assert _unheld_pairs(table, fixed) == []
    for p in range(1 << table.n_inputs):  # still the table's function at every care point
        on, dc = table.evaluate(p)
        assert (fixed.evaluate(p) ^ on) & ~dc == 0


def _random_table(n: int, m: int, seed: int) -> Table:
    rng = np.random.default_rng(seed)
    on = rng.random((m, 1 << n)) < 0.45
    dc = rng.random((m, 1 << n)) < 0.15
    return Table.from_function([f"i{k}" for k in range(n)], [f"o{k}" for k in range(m)], lambda p: list(on),
                               lambda p: list(dc), source=f"random{n}_{seed}")


@pytest.mark.parametrize("seed", range(8))
def test_hazard_free_cover_on_random_tables(seed):
    n = random.Random(seed).randint(3, 10)
    table = _random_table(n, 2, seed)
    cover = minimize(table)
    fixed = hazard_free_cover(table, cover)
    assert _unheld_pairs(table, fixed) == []
    if n <= 7:
        best = hazard_free_cover(table, cover, options=MinimizeOptions(exact=True, time_limit=30))
        assert _unheld_pairs(table, best) == []
        assert best.rows <= fixed.rows
        mask = changing_mask(table, "i0,i1")
        part = hazard_free_cover(table, cover, changing=mask)
        assert _unheld_pairs(table, part, mask) == []


def test_scope_all_makes_dont_cares_on_and_holds_their_pairs():
    table = _random_table(6, 1, 99)
    fixed = hazard_free_cover(table, minimize(table), scope="all")
    dc = {p for p in range(64) if table.evaluate(p)[1] & 1}
    on = _care_on(table, 0) | dc
    assert all(fixed.evaluate(p) & 1 for p in on)
    terms = fixed.cubes_for(0)
    for p in on:
        for i in range(6):
            q = p ^ 1 << i
            if q in on:
                assert any(t.contains_point(p) and t.contains_point(q) for t in terms)


def test_cli_hazards_and_minimize_hazard_free(tmp_path):
    pla = tmp_path / "f.pla"
    pla.write_text(".i 3\n.o 1\n.ilb x y z\n.ob f\n11- 1\n0-1 1\n.e\n")
    res = CliRunner().invoke(cli, ["hazards", str(pla), str(pla), "--fail"])
    assert res.exit_code == 1 and "x changes, others ~11" in res.stdout
    res = CliRunner().invoke(cli, ["minimize", str(pla), "--hazard-free"])
    assert res.exit_code == 0 and "-11 1" in res.stdout
    res = CliRunner().invoke(cli, ["hazards", str(pla), "--changing", "nope"])
    assert res.exit_code == 2 and "nope" in res.stderr
