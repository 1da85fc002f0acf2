"""The generated logic itself is proven, at any width: a module or a Verilog file edited by hand fails ``check``.

Reference for every expected value: the address decoder's definition below (chip select ``k`` is on exactly when
the top three address bits read ``k``: common practice for a memory map cut into equal blocks), and the edits made
by hand to the generated text. No enumeration limit is raised: 18 inputs is above the exhaustive simulation limit.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from click.testing import CliRunner

from plaforge import flow
from plaforge.cli import cli
from plaforge.core.cube import Cube
from plaforge.core.table import Table
from plaforge.emit.amaranth import module_source
from plaforge.emit.verilog import verilog_source
from plaforge.flow import realize
from plaforge.formats.pla import write_table_pla

N = 18
EXTRA = 0x1234  # top bits 0: in chip select 1's OFF region


def _decoder(n: int = N) -> Table:
    names = tuple(f"addr[{i}]" for i in range(n))
    top = 0b111 << (n - 3)
    on = tuple((Cube(top, k << (n - 3), 1 << k),) for k in range(7))
    return Table(names, tuple(f"cs{k}" for k in range(7)), on, ((),) * 7, (None,) * 7, source="decoder.pla")


def _spec(tmp_path: Path) -> Path:
    spec = tmp_path / "decoder.pla"
    spec.write_text(write_table_pla(_decoder()))
    return spec


def _edit(text: str) -> str:
    """Chip select 1 also fires at one address outside its block."""
    old = "m.d.comb += self.cs1.eq(t[1])"
    assert old in text
    return text.replace(old, f"m.d.comb += self.cs1.eq(t[1] | (self.addr == {EXTRA:#x}))")


def _expect_counterexample(out: str) -> None:
    assert "cs1" in out and "FAIL" in out, out
    assert f"addr[18]=0x{EXTRA:05x}" in out and "expected 0, got 1" in out, out


def test_hand_edited_wide_module_fails_check(tmp_path: Path) -> None:
    t = _decoder()
    text = module_source(t, realize(t, "sop"), source_name="decoder.pla")
    (tmp_path / "good.py").write_text(text)
    (tmp_path / "bad.py").write_text(_edit(text))
    runner = CliRunner()
    good = runner.invoke(cli, ["check", str(_spec(tmp_path)), str(tmp_path / "good.py")])
    assert good.exit_code == 0 and "7 of 7 outputs pass" in good.output and "sampled" not in good.output
    bad = runner.invoke(cli, ["check", str(_spec(tmp_path)), str(tmp_path / "bad.py")])
    assert bad.exit_code == 1
    _expect_counterexample(bad.output)


def test_builds_check_catches_the_edited_module(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    """build checks what it wrote: the edited sop module fails; the Verilog, written from the cover, passes."""
    real = flow.module_source

    def edited(table: Table, artifact: object, **kw: str) -> str:
        text = real(table, artifact, **kw)
        return _edit(text) if "t[1]" in text else text

    monkeypatch.setattr(flow, "module_source", edited)
    res = CliRunner().invoke(cli, ["build", str(_spec(tmp_path)), "-o", str(tmp_path / "out")])
    assert res.exit_code == 1
    failing = [line for line in res.output.splitlines() if "FAIL" in line]
    assert [line.split()[0] for line in failing] == ["module_sop"], res.output
    for line in failing:
        _expect_counterexample(line)


def test_verilog_with_one_gate_flipped_fails_check(tmp_path: Path) -> None:
    t = _decoder()
    text = verilog_source(module_source(t, realize(t, "sop")), "decoder")
    (tmp_path / "good.v").write_text(text)
    lines = text.splitlines()
    k = next(i for i, line in enumerate(lines) if line.lstrip().startswith("assign") and " & " in line)
    lines[k] = lines[k].replace(" & ", " | ", 1)  # one AND gate becomes an OR
    (tmp_path / "bad.v").write_text("\n".join(lines) + "\n")
    runner = CliRunner()
    good = runner.invoke(cli, ["check", str(_spec(tmp_path)), str(tmp_path / "good.v")])
    assert good.exit_code == 0 and "7 of 7 outputs pass" in good.output, good.output
    bad = runner.invoke(cli, ["check", str(_spec(tmp_path)), str(tmp_path / "bad.v")])
    assert bad.exit_code == 1 and "FAIL" in bad.output and "refuted" in bad.output, bad.output


def test_forty_input_module_is_proven(tmp_path: Path) -> None:
    t = _decoder(40)
    (tmp_path / "wide.py").write_text(module_source(t, realize(t, "sop")))
    spec = tmp_path / "decoder.pla"
    spec.write_text(write_table_pla(t))
    res = CliRunner().invoke(cli, ["check", str(spec), str(tmp_path / "wide.py")])
    assert res.exit_code == 0 and res.output.count("proven: SAT on the gate netlist") == 7, res.output


@pytest.mark.parametrize("style", ["sop", "lut"])
def test_constant_outputs_are_constants(style: str) -> None:
    """A constant-1 and a constant-0 output are written as constants, in the module and in its Verilog."""
    # y = 1 and z = 0 everywhere (by definition); w = a AND b keeps the module non-trivial
    t = Table.from_function(["a", "b", "c"], ["y", "z", "w"], lambda p: [1, 0, p & 3 == 3])
    text = module_source(t, realize(t, style))
    assert "self.y.eq(1)" in text and "self.z.eq(0)" in text
    verilog = verilog_source(text, "consts")
    assert "assign y = 1'h1;" in verilog and "assign z = 1'h0;" in verilog
