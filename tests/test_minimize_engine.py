"""Minimizer plumbing: isolation of the compiled minimizer, options, summaries, determinism, the CLI."""

from __future__ import annotations

import json
import os
import signal
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner

from plaforge.cli import cli
from plaforge.core.cube import Cover, Cube
from plaforge.core.errors import InternalError, SizeLimit, TimeLimit
from plaforge.core.table import Table
from plaforge.minimize import MinimizeOptions, cover_summary, minimize
from plaforge.minimize.child import run_isolated
from plaforge.minimize.heuristic import decode_row, encode_cube
from plaforge.minimize.result import verify_cover

CONTRACT_KEYS = ["inputs", "outputs", "rows", "terms", "terms_total", "literals", "method", "cost", "optimal",
                 "lower_bound", "inverted", "stopped_early", "seconds"]

ADDER_PLA = """\
.i 3
.o 2
.ilb a b cin
.ob sum cout
.type fr
001 10
010 10
100 10
111 11
011 01
101 01
110 01
000 00
.e
"""


def _crash() -> None:
    os._exit(3)


def _sleep() -> None:
    import time

    time.sleep(30)


def _raise() -> None:
    raise RuntimeError("boom")


def _exhaust_memory() -> None:
    raise MemoryError("cannot allocate")


def _killed() -> None:
    os.kill(os.getpid(), signal.SIGKILL)


def test_positional_notation_round_trip() -> None:
    # pyeda's positional cube notation: 1 = complemented literal, 2 = true literal, 3 = absent (pyeda docs)
    c = Cube.parse("1-0")
    assert encode_cube(c, 3) == (2, 3, 1)
    assert decode_row((2, 3, 1), (1, 0)) == Cube(c.care, c.value, 1)


def test_child_crash_is_internal_error() -> None:
    # exit status 4 for a crash of the compiled minimizer (docs/conventions.md)
    with pytest.raises(InternalError, match="crashed") as info:
        run_isolated(_crash, (), 10, "the test minimizer")
    assert info.value.exit_code == 4


def test_child_timeout_is_time_limit_naming_the_option() -> None:
    # exit status 3, naming the option that raises the limit (docs/conventions.md)
    with pytest.raises(TimeLimit, match="did not finish within 0.5 s; raise it with --time-limit") as info:
        run_isolated(_sleep, (), 0.5, "the test minimizer")
    assert info.value.exit_code == 3


def test_child_error_is_internal_error() -> None:
    with pytest.raises(InternalError, match="failed: RuntimeError: boom"):
        run_isolated(_raise, (), 10, "the test minimizer")


def test_child_out_of_memory_is_size_limit_without_option() -> None:
    # exit status 3 (docs/conventions.md); no option raises the memory of the machine, and the message says so
    with pytest.raises(SizeLimit, match="ran out of memory .*no option raises this limit") as info:
        run_isolated(_exhaust_memory, (), 10, "the test minimizer")
    assert info.value.exit_code == 3 and info.value.option is None


@pytest.mark.skipif(not hasattr(signal, "SIGKILL"), reason="no SIGKILL on this platform")
def test_child_killed_by_the_kernel_is_size_limit() -> None:
    # common practice: the Linux out-of-memory killer ends the process it picks with SIGKILL
    with pytest.raises(SizeLimit, match="killed it with SIGKILL"):
        run_isolated(_killed, (), 10, "the test minimizer")


def test_wrong_cover_is_rejected() -> None:
    t = Table.from_function(["a", "b"], ["y"], lambda p: [p == 3])
    bad = Cover(("a", "b"), ("y",), (Cube.parse("1-"),))
    with pytest.raises(InternalError, match="wrong cover"):
        verify_cover(t, bad, "a test")


def test_options_validate() -> None:
    with pytest.raises(ValueError, match="cost must be"):
        MinimizeOptions(cost="cheap")  # type: ignore[arg-type]
    with pytest.raises(ValueError, match="time_limit"):
        MinimizeOptions(time_limit=0)
    with pytest.raises(TypeError, match="needs a Table"):
        minimize("table.pla")  # type: ignore[arg-type]


def test_exact_refuses_hopeless_sizes() -> None:
    # 40 inputs, y = a0 xor a1 (two ON cubes of 2^38 points each): the point-based covering matrix cannot fit
    names = tuple(f"a[{i}]" for i in range(40))
    t = Table(names, ("y",), ((Cube.parse("10" + "-" * 38), Cube.parse("01" + "-" * 38)),), ((),), (None,))
    with pytest.raises(SizeLimit, match="--memory-limit"):
        minimize(t, MinimizeOptions(exact=True))


def test_same_input_same_cover() -> None:
    rng = np.random.default_rng(5)
    draw = rng.random((3, 64))
    t = Table.from_function([f"x[{i}]" for i in range(6)], ["p", "q", "r"], lambda p: [draw[j] < 0.5 for j in range(3)])
    for opts in (MinimizeOptions(), MinimizeOptions(exact=True, time_limit=20)):
        assert minimize(t, opts).cubes == minimize(t, opts).cubes


def test_in_process_and_isolated_agree() -> None:
    t = Table.from_function([f"x[{i}]" for i in range(5)], ["y"], lambda p: [(p * 7) % 11 < 5])
    assert minimize(t, MinimizeOptions(isolate=False)).cubes == minimize(t).cubes


def test_summary_has_contract_keys() -> None:
    t = Table.from_function(["a", "b"], ["y"], lambda p: [p == 3])
    s = cover_summary(minimize(t))
    assert list(s) == CONTRACT_KEYS
    assert s["rows"] == 1 and s["literals"] == 2 and s["terms"] == {"y": 1}


def test_cli_json_contract(tmp_path: Path) -> None:
    spec = tmp_path / "adder.pla"
    spec.write_text(ADDER_PLA)
    out = tmp_path / "cover.pla"
    res = CliRunner().invoke(cli, ["minimize", str(spec), "--exact", "--cost", "per-output", "--json", "-o", str(out)])
    assert res.exit_code == 0, res.output
    data = json.loads(res.stdout)
    assert list(data) == [*CONTRACT_KEYS, "name"]  # the command adds the design name (docs/conventions.md)
    assert data["name"] == "adder"  # the spec's file name without its extension
    # common practice: full-adder sum needs 4 product terms, carry 3
    assert data["terms"] == {"sum": 4, "cout": 3}
    assert data["method"] == "exact" and data["optimal"] is True and data["lower_bound"] == 7
    from plaforge.formats import read_spec
    from plaforge.formats.pla import read_cover
    from plaforge.verify.equivalence import check_cover

    assert check_cover(read_spec(spec), read_cover(out)).passed


def test_cli_human_summary(tmp_path: Path) -> None:
    spec = tmp_path / "adder.pla"
    spec.write_text(ADDER_PLA)
    res = CliRunner().invoke(cli, ["minimize", str(spec)])
    assert res.exit_code == 0
    assert "rows" in res.output and "sum 4" in res.output and "heuristic" in res.output


def test_cli_bad_input_exits_2(tmp_path: Path) -> None:
    res = CliRunner().invoke(cli, ["minimize", str(tmp_path / "missing.pla")])
    assert res.exit_code == 2
    assert "no such file" in res.output
    res = CliRunner().invoke(cli, ["minimize", str(tmp_path / "x.pla"), "--cost", "cheap"])
    assert res.exit_code == 2
