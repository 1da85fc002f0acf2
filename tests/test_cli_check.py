"""``plaforge check`` on artifacts that cannot be judged: one line on stderr and exit status 2, never a traceback.

Reference: the exit statuses of docs/conventions.md (2 is bad input, 1 a failed check); the two LUT JSON files are
hand-written so that their faults (a fan-in that names nothing, a loop) are known by construction.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from click.testing import CliRunner

from plaforge.cli import cli
from plaforge.core.table import Table
from plaforge.formats.pla import write_table_pla


def _spec(tmp_path: Path) -> Path:
    # y = a AND b (common practice)
    t = Table.from_function(["a", "b"], ["y"], lambda p: [p == 3], source="and2.pla")
    spec = tmp_path / "and2.pla"
    spec.write_text(write_table_pla(t))
    return spec


def _check(spec: Path, artifact: Path) -> tuple[int, str]:
    """Exit status, and the output (stdout and stderr as the user sees them)."""
    res = CliRunner().invoke(cli, ["check", str(spec), str(artifact)])
    return res.exit_code, res.output


def _net(luts: list[dict], driver: str) -> str:
    return json.dumps({"k": 2, "inputs": ["a", "b"], "outputs": {"y": driver}, "luts": luts})


_COMPONENT = """\
from amaranth.hdl import Module
from amaranth.lib import wiring
from amaranth.lib.wiring import In, Out


class Broken(wiring.Component):
    a: In(1)
    b: In(1)
    y: Out(1)
{body}
"""


_GOOD_V = "module and2(input a, input b, output y);\n  assign y = a & b;\nendmodule\n"

# Every artifact that cannot be judged, as (file name, text, a phrase of the one-line message).
_BAD = [
    ("net.json", _net([{"name": "n0", "inputs": ["a", "ghost"], "init": "0x8"}], "n0"), "reads 'ghost'"),
    ("net.json", _net([{"name": "n0", "inputs": ["a", "n1"], "init": "0x8"},
                       {"name": "n1", "inputs": ["n0", "b"], "init": "0x8"}], "n1"), "reads 'n1'"),
    ("net.json", _net([{"name": "n0", "inputs": ["a", "b"], "init": "0x1F"}], "n0"), "does not fit 2 inputs"),
    ("none.py", "X = 1\n", "found 0"),
    ("two.py", _COMPONENT.format(body="") + "\n\nclass Again(Broken):\n    pass\n", "found 2"),
    ("other.py", _COMPONENT.replace("b: In(1)", "c: In(1)").format(body=""), "no port 'b'"),
    ("wide.py", _COMPONENT.replace("b: In(1)", "b: In(2)").format(body=""), "port 'b'"),
    ("raises.py", _COMPONENT.format(body="\n    def elaborate(self, platform):\n        raise RuntimeError('no logic')\n"),
     "elaborating it failed: RuntimeError: no logic"),
    ("ctor.py", _COMPONENT.format(body="\n    def __init__(self):\n        raise ValueError('no ports')\n"),
     "Broken() failed: ValueError: no ports"),
    ("parse.v", "module and2(input a, input b, output y);\n  assign y = a &;\nendmodule\n", "Yosys cannot read it"),
    ("ports.v", _GOOD_V.replace("input b", "input c").replace("a & b", "a & c"), "no port 'b'"),
    ("empty.v", "// nothing here\n", "one top module"),
    ("loop.v", ("module and2(input a, input b, output y);\n  wire w;\n  assign w = ~(w & a);\n"
                "  assign y = w & b;\nendmodule\n"), "loop"),
    ("latch.v", "module and2(input a, input b, output reg y);\n  always @(posedge a) y <= b;\nendmodule\n",
     "not combinational"),
    ("x.txt", "", "unknown artifact type"),
]


@pytest.mark.parametrize(("name", "text", "message"), _BAD, ids=[f"{n}:{m}" for n, _, m in _BAD])
def test_bad_artifacts_exit_2_with_one_line(tmp_path: Path, name: str, text: str, message: str) -> None:
    """docs/conventions.md: an artifact that cannot be judged is bad input (2), one line on stderr, no traceback."""
    (tmp_path / name).write_text(text)
    res = CliRunner().invoke(cli, ["check", str(_spec(tmp_path)), str(tmp_path / name)])
    assert res.exit_code == 2, res.output
    assert message in res.stderr and len(res.stderr.strip().splitlines()) == 1, res.stderr
    assert "Traceback" not in res.output and isinstance(res.exception, SystemExit)


def test_extra_input_port_is_left_free(tmp_path: Path) -> None:
    """An extra input port is allowed and left free; y stays 0, so a = b = 1 fails: exit 1, a failed check."""
    body = "    c: In(1)\n\n    def elaborate(self, platform):\n        return Module()\n"
    (tmp_path / "extra.py").write_text(_COMPONENT.format(body=body))
    status, out = _check(_spec(tmp_path), tmp_path / "extra.py")
    assert status == 1 and "y  FAIL" in out and "a=1 b=1" in out, out


def test_verilog_checked_and_simulated(tmp_path: Path) -> None:
    """A right .v passes the proof (and iverilog's simulation where installed); y = a | b fails at a=1 b=0."""
    (tmp_path / "and2.v").write_text(_GOOD_V)
    res = CliRunner().invoke(cli, ["check", str(_spec(tmp_path)), str(tmp_path / "and2.v"), "--simulate"])
    assert res.exit_code == 0 and "proven: SAT on the gate netlist" in res.output, res.output
    (tmp_path / "or2.v").write_text(_GOOD_V.replace("a & b", "a | b"))
    status, out = _check(_spec(tmp_path), tmp_path / "or2.v")
    assert status == 1 and "refuted" in out and "expected 0, got 1" in out, out
