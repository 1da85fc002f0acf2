"""Gate-level realizations (NAND-NAND, NOR-NOR) simulated against the table: the Amaranth module in Amaranth's
simulator and the structural Verilog in iverilog, every input point; gate counts of the textbook two-level forms
(common practice: a sum of k products of 2 literals is k 2-input NANDs feeding one k-input NAND)."""

from __future__ import annotations

import shutil
import subprocess
from pathlib import Path

import pytest

from plaforge.core.cube import Cover, Cube
from plaforge.core.names import ports_of
from plaforge.core.table import Table
from plaforge.emit.gates import gate_network, gates_module_source
from plaforge.emit.gates_verilog import gates_verilog_source
from plaforge.flow import realize
from plaforge.formats import read_spec
from plaforge.verify.component import instantiate, load_source

SAMPLES = Path(__file__).resolve().parent.parent / "samples"
SMALL = ["segment_display.csv", "arbiter.pla", "gamma.toml"]


def _expected(table: Table, p: int) -> tuple[int, int]:
    on, dc = table.evaluate(p)
    return on, dc


def _simulate(table: Table, source: str) -> dict[int, int]:
    from amaranth.sim import Simulator

    comp = instantiate(load_source(source, "<gates>"), "<gates>")
    ports = ports_of(table)
    got: dict[int, int] = {}

    async def bench(ctx):
        for p in range(1 << table.n_inputs):
            for port in ports:
                if port.direction == "in":
                    ctx.set(getattr(comp, port.name), sum((p >> i & 1) << b for b, i in enumerate(port.members)))
            await ctx.delay(1e-9)
            out = 0
            for port in ports:
                if port.direction == "out":
                    v = ctx.get(getattr(comp, port.name))
                    out |= sum((v >> b & 1) << j for b, j in enumerate(port.members))
            got[p] = out

    sim = Simulator(comp)
    sim.add_testbench(bench)
    sim.run()
    return got


@pytest.mark.parametrize("name", SMALL)
@pytest.mark.parametrize("style", ["nand", "nor"])
@pytest.mark.parametrize("fanin", [2, 8])
def test_amaranth_gate_module_matches_table(name, style, fanin):
    table = read_spec(SAMPLES / name)
    net = realize(table, style, max_fanin=fanin)
    assert all(len(g.inputs) <= fanin for g in net.gates)
    got = _simulate(table, gates_module_source(table, net, source_name=name))
    for p, out in got.items():
        on, dc = _expected(table, p)
        assert (out ^ on) & ~dc == 0, (p, out, on, dc)


@pytest.mark.skipif(shutil.which("iverilog") is None, reason="iverilog not installed")
@pytest.mark.parametrize("name", SMALL)
@pytest.mark.parametrize("style", ["nand", "nor"])
def test_structural_verilog_matches_table_in_iverilog(tmp_path, name, style):
    table = read_spec(SAMPLES / name)
    net = realize(table, style, max_fanin=3)
    text = gates_verilog_source(table, net, "dut")
    assert "assign" in text and "always" not in text
    ports = ports_of(table)
    n = table.n_inputs
    decl = [f"  reg [{p.width - 1}:0] {p.name};" if p.direction == "in" else f"  wire [{p.width - 1}:0] {p.name};"
            for p in ports]
    drive = [f"      {p.name} = {{{', '.join(f'v[{i}]' for i in reversed(p.members))}}};"
             for p in ports if p.direction == "in"]
    outs = [f"{p.name}[{b}]" for p in ports if p.direction == "out" for b in range(p.width)]
    order = [j for p in ports if p.direction == "out" for j in p.members]
    tb = "\n".join([
        "module tb;", f"  reg [{n}:0] k;", f"  reg [{n - 1}:0] v;", *decl,
        f"  dut u ({', '.join(f'.{p.name}({p.name})' for p in ports)});",
        "  initial begin",
        f"    for (k = 0; k < {1 << n}; k = k + 1) begin",
        f"      v = k[{n - 1}:0];", *drive, "      #1;",
        f"      $display(\"%0d {' '.join(['%b'] * len(outs))}\", k, {', '.join(outs)});",
        "    end", "  end", "endmodule", ""])
    (tmp_path / "dut.v").write_text(text)
    (tmp_path / "tb.v").write_text(tb)
    subprocess.run(["iverilog", "-o", str(tmp_path / "sim"), str(tmp_path / "dut.v"), str(tmp_path / "tb.v")],
                   check=True)
    lines = subprocess.run(["vvp", "-n", str(tmp_path / "sim")], check=True, capture_output=True,
                           text=True).stdout.split("\n")
    rows = [ln.split() for ln in lines if ln and ln[0].isdigit()]
    assert len(rows) == 1 << n
    for row in rows:
        p = int(row[0])
        out = sum(int(bit) << j for bit, j in zip(row[1:], order))
        on, dc = _expected(table, p)
        assert (out ^ on) & ~dc == 0, (p, out, on)


def test_textbook_nand_nand_counts():
    # common practice: x·y + x̄·z in NAND-NAND is three 2-input NANDs and one inverter, three levels deep
    cover = Cover(("x", "y", "z"), ("f",), (Cube.parse("11-"), Cube.parse("0-1")))
    net = gate_network(cover, "nand")
    assert net.counts() == {("nand", 2): 3, ("not", 1): 1}
    assert net.depth == 3
    assert net.packages() == [("2-input NAND gates", 3, 1), ("inverters", 1, 1)]
    assert net.summary_lines()[0] == "2-input NAND gates: 3, packages of four: 1"


def test_constant_and_single_literal_outputs_get_no_gate():
    cover = Cover(("a", "b"), ("one", "zero", "wire", "inv"),
                  (Cube.parse("--", 0b0001), Cube.parse("1-", 0b0100), Cube.parse("-0", 0b1000)))
    for style in ("nand", "nor"):
        net = gate_network(cover, style)
        assert net.outputs[0] == ("const", 1) and net.outputs[1] == ("const", 0) and net.outputs[2] == ("in", 0)
        assert [g.kind for g in net.gates] == ["not"]  # the one input inverter, for ~b


def test_balanced_tree_depth_under_fanin_limit():
    # eight literals under fan-in 2: a balanced tree of three levels (log2 8, common practice)
    cover = Cover(tuple(f"i{k}" for k in range(8)), ("f",), (Cube.parse("11111111"),))
    net = gate_network(cover, "nand", 2)
    assert all(len(g.inputs) == 2 for g in net.gates if g.kind != "not")
    assert net.depth == 4  # NAND, NOR, NAND levels, then the inverter that makes the AND
    with pytest.raises(ValueError, match="max_fanin must be at least 2"):
        gate_network(cover, "nand", 1)
