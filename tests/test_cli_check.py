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


@pytest.mark.parametrize(
    ("text", "message"),
    [
        (_net([{"name": "n0", "inputs": ["a", "ghost"], "init": "0x8"}], "n0"), "reads 'ghost'"),
        (_net([{"name": "n0", "inputs": ["a", "n1"], "init": "0x8"},
               {"name": "n1", "inputs": ["n0", "b"], "init": "0x8"}], "n1"), "reads 'n1'"),
    ],
    ids=["unknown-fan-in", "loop"],
)
def test_lut_json_that_is_not_a_network(tmp_path: Path, text: str, message: str) -> None:
    (tmp_path / "net.json").write_text(text)
    status, out = _check(_spec(tmp_path), tmp_path / "net.json")
    assert status == 2, out
    assert message in out and "not a LUT network" in out
    assert "Traceback" not in out and len(out.strip().splitlines()) == 1  # one line, no traceback


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


@pytest.mark.parametrize(
    ("body", "message"),
    [
        ("\n    def elaborate(self, platform):\n        raise RuntimeError('no logic here')\n",
         "elaborating it failed: RuntimeError: no logic here"),
        ("\n    def __init__(self):\n        raise ValueError('no ports today')\n",
         "Broken() failed: ValueError: no ports today"),
        ("    c: In(1)\n\n    def elaborate(self, platform):\n        return Module()\n", None),
    ],
    ids=["elaborate-raises", "constructor-raises", "fine"],
)
def test_module_that_cannot_be_simulated(tmp_path: Path, body: str, message: str | None) -> None:
    (tmp_path / "broken.py").write_text(_COMPONENT.format(body=body))
    status, out = _check(_spec(tmp_path), tmp_path / "broken.py")
    if message is None:  # an extra input port is allowed; y stays 0, so a = b = 1 fails: exit 1, a failed check
        assert status == 1 and "y  FAIL" in out, out
        return
    assert status == 2, out
    assert message in out and "Traceback" not in out


def test_module_made_for_another_spec(tmp_path: Path) -> None:
    (tmp_path / "other.py").write_text(_COMPONENT.replace("b: In(1)", "c: In(1)").format(body=""))
    status, out = _check(_spec(tmp_path), tmp_path / "other.py")
    assert status == 2, out  # ports that do not match are bad input, not a failed check
    assert "no port 'b'" in out and "Traceback" not in out
