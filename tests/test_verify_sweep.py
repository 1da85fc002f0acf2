"""The sweep the module issue asks for: every bundled sample and every benchmark-suite function with at most 16
inputs, in both module styles, through Amaranth's simulator (every input point) and through an independent Verilog
simulator (iverilog + vvp, every input point); and a corrupted cover of each caught with its failing vector.

Expected values come from the Table: the suite builds each function from its arithmetic or combinatorial definition,
and the samples are read from their spec files. Marked slow; it runs by default (about a minute or two on 2 cores).
"""

from __future__ import annotations

import functools
from pathlib import Path

import pytest
from test_emit_verilog import HAVE_IVERILOG, compare_with_table, run_iverilog

from benchmarks.suite import SUITE
from plaforge.checking import check_artifact
from plaforge.core.cube import Cover, Cube
from plaforge.core.table import Table
from plaforge.emit.amaranth import module_source
from plaforge.emit.verilog import verilog_source
from plaforge.formats import read_spec
from plaforge.formats.pla import write_pla
from plaforge.lut import map_luts
from plaforge.minimize import minimize

SAMPLES = Path(__file__).resolve().parent.parent / "samples"
LIMIT = 16


def _cases() -> list[str]:
    names = [f"suite:{k}" for k, e in SUITE.items() if not e.wide and e.inputs <= LIMIT]
    names += [f"sample:{p.name}" for p in sorted(SAMPLES.glob("*")) if p.suffix in (".toml", ".csv", ".pla")]
    return names


@functools.cache
def _table(case: str) -> Table:
    kind, name = case.split(":", 1)
    return SUITE[name]() if kind == "suite" else read_spec(SAMPLES / name)


@functools.cache
def _cover(case: str) -> Cover:
    return minimize(_table(case))


@pytest.mark.slow
@pytest.mark.parametrize("case", _cases())
def test_both_styles_pass_amaranth_and_iverilog(tmp_path, case: str) -> None:
    t = _table(case)
    if t.n_inputs > LIMIT:
        pytest.skip(f"{case} has {t.n_inputs} inputs; the sweep covers specs of at most {LIMIT}")
    for style, art in (("sop", _cover(case)), ("lut", map_luts(t, _cover(case), 6))):
        src = module_source(t, art, source_name=case.split(":", 1)[1])
        path = tmp_path / f"m_{style}.py"
        path.write_text(src)
        verdict = check_artifact(t, path, exhaustive_limit=LIMIT)
        assert verdict.passed, (style, [o for o in verdict.outputs if not o.passed])
        assert all("exhaustive" in o.method for o in verdict.outputs)
        if HAVE_IVERILOG:
            # Independent simulator: iverilog runs the Verilog Amaranth's backend wrote, every input point.
            got = run_iverilog(t, verilog_source(src, f"m_{style}"), f"m_{style}", tmp_path)
            assert compare_with_table(t, got) == [], style
    if not HAVE_IVERILOG:
        pytest.skip("Amaranth part passed; iverilog/vvp not installed (Debian package 'iverilog'), Verilog not run")


def _flip_one_literal(t: Table, cover: Cover) -> tuple[Cover, int] | None:
    """The first single-literal flip that really changes a care value, checked point by point by the test itself."""
    n = t.n_inputs
    for k, c in enumerate(cover.cubes):
        m = c.care
        while m:
            low = m & -m
            m ^= low
            cubes = list(cover.cubes)
            cubes[k] = Cube(c.care, c.value ^ low, c.outputs)
            bad = cover.with_(cubes=tuple(cubes))
            for p in range(1 << n):
                on, dc = t.evaluate(p)
                got = 0
                for x in bad.cubes:  # the test's own evaluation of the corrupted cover
                    if p & x.care == x.value:
                        got |= x.outputs
                got ^= bad.inverted
                if (got ^ on) & ~dc & ((1 << t.n_outputs) - 1):
                    return bad, p
    return None


@pytest.mark.slow
@pytest.mark.parametrize("case", _cases())
def test_corrupted_cover_is_caught_with_its_vector(tmp_path, case: str) -> None:
    t = _table(case)
    if t.n_inputs > 12:
        pytest.skip(f"{case}: the brute-force search for a harmful flip is kept to 12 inputs")
    found = _flip_one_literal(t, _cover(case))
    assert found is not None
    bad, _ = found
    (tmp_path / "bad.pla").write_text(write_pla(bad))
    paths = [tmp_path / "bad.pla"]
    if bad.rows <= 400:  # simulating the module of a very large cover costs tens of seconds; the .pla check is exact
        (tmp_path / "bad.py").write_text(module_source(t, bad, source_name="bad"))
        paths.append(tmp_path / "bad.py")
    for path in paths:
        verdict = check_artifact(t, path)
        failing = [o for o in verdict.outputs if not o.passed]
        assert failing, path.name
        for o in failing:
            assert o.failure is not None
            p, expected, actual = o.failure
            on, dc = t.evaluate(p)
            j = t.output_names.index(o.name)
            assert not dc >> j & 1 and expected == on >> j & 1 and actual == 1 - expected, (path.name, o)
