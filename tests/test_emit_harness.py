"""The stand-alone pytest harness: run alone, in a fresh directory, with only the generated files.

The harness is run by a separate ``python -m pytest`` process whose working directory holds nothing but the module
and the harness, with plaforge kept off its import path, so it can only pass on amaranth, pytest and the data it
carries. It must also fail when the module is wrong.
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from plaforge.core.cube import Cover, Cube
from plaforge.core.table import Table
from plaforge.emit.amaranth import module_source
from plaforge.emit.harness import harness_source


def _table() -> Table:
    ins = [f"a[{i}]" for i in range(3)] + [f"b[{i}]" for i in range(3)] + ["sub"]
    # a + b, or a - b when sub (4-bit two's complement result; common practice), and a don't-care: b == 7 with sub.
    return Table.from_function(
        ins, [f"r[{i}]" for i in range(4)],
        lambda p: [(((p & 7) + ((p >> 3 & 7) * (1 - 2 * (p >> 6 & 1)))) >> i) & 1 for i in range(4)],
        dc_fn=lambda p: [((p >> 6 & 1) == 1) & ((p >> 3 & 7) == 7)] * 4,
        source="addsub.toml",
    )


def _cover(t: Table, corrupt: bool = False) -> Cover:
    cubes = [c for j in range(t.n_outputs) for c in t.on_cubes(j)]
    if corrupt:  # flip one literal of the largest cube (fewest literals), which leaves a care point uncovered
        c = min((x for x in cubes if x.care), key=lambda x: x.literals)
        low = c.care & -c.care
        cubes[cubes.index(c)] = Cube(c.care, c.value ^ low, c.outputs)
    return Cover(t.input_names, t.output_names, tuple(cubes))


def _run_alone(directory: Path) -> subprocess.CompletedProcess[str]:
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "PYTEST_ADDOPTS")}
    return subprocess.run(
        [sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider", "--rootdir", str(directory), str(directory)],
        cwd=directory, env=env, capture_output=True, text=True, timeout=300, check=False,
    )


@pytest.mark.parametrize("limit", [16, 4])  # 16: whole truth table carried; 4: cubes carried, sampled vectors
def test_harness_passes_alone_in_a_fresh_directory(tmp_path, limit: int) -> None:
    t = _table()
    (tmp_path / "addsub_sop.py").write_text(module_source(t, _cover(t), source_name="addsub.toml"))
    (tmp_path / "test_addsub.py").write_text(harness_source(t, "addsub_sop", source_name="addsub.toml", limit=limit))
    res = _run_alone(tmp_path)
    assert res.returncode == 0, res.stdout + res.stderr
    assert "4 passed" in res.stdout  # one test per spec output
    assert sorted(p.name for p in tmp_path.iterdir() if p.suffix == ".py") == ["addsub_sop.py", "test_addsub.py"]


def test_harness_fails_on_a_corrupted_module(tmp_path) -> None:
    t = _table()
    (tmp_path / "addsub_sop.py").write_text(module_source(t, _cover(t, corrupt=True), source_name="addsub.toml"))
    (tmp_path / "test_addsub.py").write_text(harness_source(t, "addsub_sop", source_name="addsub.toml"))
    res = _run_alone(tmp_path)
    assert res.returncode == 1, res.stdout + res.stderr
    # The count each failing output reports, worked out here by matching the corrupted cubes point by point.
    bad = _cover(t, corrupt=True)
    for j, name in enumerate(t.output_names):
        care = wrong = 0
        for p in range(1 << t.n_inputs):
            on, dc = t.evaluate(p)
            if dc >> j & 1:
                continue
            care += 1
            got = any(p & c.care == c.value and c.outputs >> j & 1 for c in bad.cubes)
            wrong += got != bool(on >> j & 1)
        if wrong:
            assert f"{name}: expected " in res.stdout and f"; {wrong} of {care} care vectors fail" in res.stdout
    # the failing vector named port by port, buses in hex with their width
    assert re.search(r"at a\[3\]=0x[0-7] b\[3\]=0x[0-7] sub=[01] \(point \d+\)", res.stdout), res.stdout


@pytest.mark.skipif(shutil.which("ruff") is None, reason="ruff is not installed")
@pytest.mark.parametrize("limit", [16, 4])
def test_harness_source_is_ruff_clean(tmp_path, limit: int) -> None:
    t = _table()
    f = tmp_path / "test_h.py"
    f.write_text(harness_source(t, "m", limit=limit))
    # Outside judge: ruff's linter and formatter at their defaults.
    for cmd in (["ruff", "check", "--isolated", str(f)], ["ruff", "format", "--isolated", "--diff", str(f)]):
        res = subprocess.run(cmd, capture_output=True, text=True, check=False)
        assert res.returncode == 0, res.stdout + res.stderr


def test_harness_is_deterministic() -> None:
    assert harness_source(_table(), "m") == harness_source(_table(), "m")
