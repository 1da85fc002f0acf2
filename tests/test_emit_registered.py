"""``--registered``: modules and Verilog whose outputs come from a clocked stage, and how they are checked.

References outside plaforge, named beside each check:

* the spec's expected values come from tests/oracle_formats.py, an independent reading of the spec formats written
  from docs/formats.md alone (no plaforge code);
* Amaranth's simulator (its ``sync`` domain semantics: a ``m.d.sync`` signal takes its new value at the rising clock
  edge and holds its reset value 0 before the first one) drives the generated Python module directly, through a
  testbench written here;
* iverilog (Icarus Verilog, a separate Verilog compiler and simulator) compiles the generated Verilog with ``-Wall``
  and simulates it through a testbench written here, not plaforge's.

Both testbenches apply a vector, let the clock rise once, apply a different vector and only then read the outputs,
so a registered output shows the spec's value for the vector before the edge, and an output that is not registered
would follow the new vector.
"""

from __future__ import annotations

import importlib.util
import json
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner
from oracle_formats import Spec, read_pla, read_toml

from plaforge.bundled import sample_path
from plaforge.cli import cli
from plaforge.core.caution import CAUTION, REGISTERED_CAUTION

HAVE_IVERILOG = shutil.which("iverilog") is not None and shutil.which("vvp") is not None
needs_iverilog = pytest.mark.skipif(
    not HAVE_IVERILOG, reason="iverilog/vvp not installed (Debian package 'iverilog'; .ci/run installs it)"
)

ARBITER = sample_path("arbiter.pla")  # 6 inputs (req[4], last[2]), 5 outputs (gnt[4], busy)
VENDING = sample_path("vending_controller.toml")  # 8 inputs, 8 outputs, buses and don't-cares


def _oracle(spec: Path) -> Spec:
    text = spec.read_text(encoding="utf-8")
    return read_pla(text) if spec.suffix == ".pla" else read_toml(text)


def _buses(names: list[str]) -> dict[str, list[tuple[int, int]]]:
    """Bus name -> [(bit, index in names)], from names like ``req[2]`` (a name without ``[k]`` is one bit)."""
    out: dict[str, list[tuple[int, int]]] = {}
    for k, name in enumerate(names):
        m = re.fullmatch(r"(.+)\[(\d+)\]", name)
        base, bit = (m.group(1), int(m.group(2))) if m else (name, 0)
        out.setdefault(base, []).append((bit, k))
    return out


def _run(*args: str) -> tuple[int, str]:
    res = CliRunner().invoke(cli, list(args))
    return res.exit_code, res.output


def _module(tmp_path: Path, spec: Path, style: str, *extra: str) -> Path:
    out = tmp_path / f"{spec.stem}_{style}.py"
    code, text = _run("module", str(spec), "-o", str(out), "--style", style, "--registered", *extra)
    assert code == 0, text
    return out


def _load(path: Path) -> object:
    spec = importlib.util.spec_from_file_location("_registered_" + path.stem, path)
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)  # type: ignore[union-attr]
    from amaranth.lib import wiring

    (cls,) = [v for v in vars(mod).values() if isinstance(v, type) and issubclass(v, wiring.Component)
              and v.__module__ == mod.__name__]
    return cls()


def _amaranth_run(dut: object, oracle: Spec, points: list[int]) -> tuple[list[dict[str, int]], dict[str, int]]:
    """Drive ``points`` through Amaranth's simulator: per point, the outputs read one rising edge after it was
    applied (with the next point already applied); and the outputs before the first edge, for the first point."""
    from amaranth.sim import Simulator

    ins, outs = _buses(oracle.input_names), _buses(oracle.output_names)
    n = len(oracle.input_names)
    got: list[dict[str, int]] = []
    before: dict[str, int] = {}

    def drive(ctx: object, p: int) -> None:
        for base, bits in ins.items():
            ctx.set(getattr(dut, base), sum((p >> k & 1) << b for b, k in bits))  # type: ignore[attr-defined]

    async def bench(ctx: object) -> None:
        for i, p in enumerate(points):
            drive(ctx, p)
            if i == 0:
                before.update({base: ctx.get(getattr(dut, base)) for base in outs})  # type: ignore[attr-defined]
            await ctx.tick()  # type: ignore[attr-defined]
            drive(ctx, points[i + 1] if i + 1 < len(points) else ~p & ((1 << n) - 1))
            got.append({base: ctx.get(getattr(dut, base)) for base in outs})  # type: ignore[attr-defined]

    sim = Simulator(dut)
    sim.add_clock(1e-6)
    sim.add_testbench(bench)
    sim.run()
    return got, before


def _mismatches(oracle: Spec, points: list[int], got: list[dict[str, int]]) -> list[tuple[int, str, int, int]]:
    """(point, output, expected, actual) wherever a care value of the oracle differs from what was read."""
    outs = _buses(oracle.output_names)
    bad = []
    for p, values in zip(points, got):
        want = oracle.value(p)
        for base, bits in outs.items():
            for b, j in bits:
                have = values[base] >> b & 1
                if want[j] is not None and want[j] != have:
                    bad.append((p, oracle.output_names[j], want[j], have))
    return bad


@pytest.mark.parametrize("style", ["sop", "lut"])
def test_registered_module_passes_check_and_matches_amaranth(tmp_path: Path, style: str) -> None:
    """A registered module of a bundled sample: check proves it with the one-cycle delay (exit 0), and Amaranth's
    simulator agrees with the independent oracle one clock edge later at every point."""
    path = _module(tmp_path, ARBITER, style)
    text = path.read_text()
    assert "m.d.sync += self." in text and "m.d.comb += self.gnt" not in text  # every output is a register
    assert REGISTERED_CAUTION in " ".join(text.split())  # the one caution, in its registered form
    code, out = _run("check", str(ARBITER), str(path))
    assert code == 0, out
    assert "registered: one clock edge later" in out and "refuted" not in out, out

    oracle = _oracle(ARBITER)
    points = list(range(1 << len(oracle.input_names)))
    got, before = _amaranth_run(_load(path), oracle, points)
    # Amaranth's simulator (outside reference): sync-domain outputs read one edge after each vector
    assert _mismatches(oracle, points, got) == []
    # Amaranth's sync domain: before the first edge the registers hold their reset value 0, whatever the inputs
    assert all(v == 0 for v in before.values()), before


@needs_iverilog
@pytest.mark.parametrize("style", ["sop", "lut"])
def test_registered_verilog_compiles_clean_and_simulates_one_cycle_later(tmp_path: Path, style: str) -> None:
    """The Verilog of a registered module: iverilog -Wall gives no warning, and iverilog's simulation through a
    testbench written here agrees with the oracle one clock edge after each vector, after a reset."""
    out_v = tmp_path / f"vend_{style}.v"
    code, text = _run("module", str(VENDING), "-o", str(tmp_path / f"vend_{style}.py"), "--verilog", str(out_v),
                      "--style", style, "--registered")
    assert code == 0, text
    verilog = out_v.read_text()
    assert "always @(posedge clk)" in verilog and "input  wire" in verilog
    # iverilog -Wall (outside reference): the module alone compiles with no warning and no error
    lint = subprocess.run(["iverilog", "-Wall", "-g2005", "-o", str(tmp_path / "lint.vvp"), str(out_v)],
                          capture_output=True, text=True, check=False)
    assert lint.returncode == 0 and lint.stdout + lint.stderr == "", lint.stdout + lint.stderr

    oracle = _oracle(VENDING)
    n = len(oracle.input_names)
    module = re.search(r"^module (\w+)", verilog, re.MULTILINE).group(1)  # type: ignore[union-attr]
    ins, outs = _buses(oracle.input_names), _buses(oracle.output_names)
    for base in list(ins) + list(outs):  # the vending sample's bus names are port names as they are
        assert re.search(rf"\b{re.escape(base)}[,\n]", verilog), base
    conns = [".clk(clk)", ".rst(rst)"]
    conns += [f".{b}({{{', '.join(f'p[{k}]' for _, k in sorted(bits, reverse=True))}}})" for b, bits in ins.items()]
    conns += [f".{b}(o_{b})" for b in outs]
    decls = [f"  wire [{len(bits) - 1}:0] o_{b};" for b, bits in outs.items()]
    shown = ", ".join(f"o_{b}" for b in outs)
    tb = "\n".join([
        "`timescale 1ns / 1ps", "module tb;", f"  reg [{n - 1}:0] p;", "  reg clk, rst;", *decls, "  integer i;",
        f"  {module} dut({', '.join(conns)});",
        "  initial begin",
        "    clk = 0; rst = 1; p = 0;",
        "    #1 clk = 1; #1 clk = 0;",
        f'    $display("reset {" ".join(["%b"] * len(outs))}", {shown});',
        "    rst = 0;",
        f"    for (i = 0; i < {1 << n}; i = i + 1) begin",
        "      p = i;",
        "      #1 clk = 1;",
        "      #1 p = ~i;",  # a different vector before reading: a registered output must not follow it
        "      #1 clk = 0;",
        f'      $display("%0d {" ".join(["%b"] * len(outs))}", i, {shown});',
        "    end",
        "    $finish;",
        "  end",
        "endmodule",
        "",
    ])
    (tmp_path / "tb.v").write_text(tb)
    build = subprocess.run(["iverilog", "-g2005", "-o", str(tmp_path / "sim.vvp"), str(tmp_path / "tb.v"),
                            str(out_v)], capture_output=True, text=True, check=False)
    assert build.returncode == 0, build.stderr
    run = subprocess.run(["vvp", "-n", str(tmp_path / "sim.vvp")], capture_output=True, text=True, check=False)
    lines = [ln.split() for ln in run.stdout.splitlines() if ln and (ln[0].isdigit() or ln.startswith("reset"))]
    # iverilog (outside reference): synchronous reset clears every output register on the edge while rst is high
    assert lines[0][0] == "reset" and all(set(v) == {"0"} for v in lines[0][1:]), lines[0]
    got = [{b: int(v, 2) for b, v in zip(outs, ln[1:])} for ln in lines[1:]]
    assert [int(ln[0]) for ln in lines[1:]] == list(range(1 << n))
    # iverilog (outside reference) against the oracle: every care value, one clock edge after its vector
    assert _mismatches(oracle, list(range(1 << n)), got) == []


def _wrong_constant(text: str) -> str:
    # gnt[0] is loaded with 0 after its real value: the last assignment wins in Amaranth, so the register is wrong
    return text.rstrip("\n") + "\n        m.d.sync += self.gnt[0].eq(0)\n"


def _wrong_unregistered(text: str) -> str:
    # gnt[0] is driven combinationally: it follows the inputs at once instead of one cycle later
    assert text.count("m.d.sync += self.gnt[0]") == 1
    return text.replace("m.d.sync += self.gnt[0]", "m.d.comb += self.gnt[0]")


def _wrong_two_stages(text: str) -> str:
    # busy passes through a second register: it follows the inputs two cycles later
    doc = '"""Output registers, each loaded with the OR of its terms."""'
    assert text.count(doc) == 1 and text.count("m.d.sync += self.busy.eq(") == 1
    text = text.replace(doc, doc + "\n        early_busy = Signal()")
    text = text.replace("m.d.sync += self.busy.eq(", "m.d.sync += early_busy.eq(")
    return text.rstrip("\n") + "\n        m.d.sync += self.busy.eq(early_busy)\n"


@pytest.mark.parametrize("edit", [_wrong_constant, _wrong_unregistered, _wrong_two_stages],
                         ids=["wrong-logic", "unregistered", "two-stages"])
@pytest.mark.parametrize("limit", ["0", "16"], ids=["proof-only", "proof-and-simulation"])
def test_hand_edited_register_stage_fails_with_a_counterexample(tmp_path: Path, edit: object, limit: str) -> None:
    """A registered module whose register stage is edited wrong fails check: exit 1, the output named, and a
    failing vector in the spec's port names. The edits are wrong by construction (see each one's comment)."""
    good = _module(tmp_path, ARBITER, "sop")
    bad = tmp_path / "edited.py"
    bad.write_text(edit(good.read_text()))  # type: ignore[operator]
    code, out = _run("check", str(ARBITER), str(bad), "--exhaustive-limit", limit)
    assert code == 1, out
    name = "busy" if edit is _wrong_two_stages else "gnt[0]"
    assert re.search(rf"{re.escape(name)}\s+FAIL", out), out
    assert re.search(r"first failure at req\[4\]=0x[0-9a-f] last\[2\]=0x[0-9a-f] \(point \d+\): expected [01], got "
                     r"[01]", out), out
    assert "Traceback" not in out
    if edit is _wrong_constant:
        # Amaranth's simulator (outside reference) confirms the counterexample: one edge after that point, gnt[0]
        # differs from the oracle's value there
        point = int(re.search(r"\(point (\d+)\)", out).group(1))  # type: ignore[union-attr]
        oracle = _oracle(ARBITER)
        got, _ = _amaranth_run(_load(bad), oracle, [point])
        assert [m[1] for m in _mismatches(oracle, [point], got)] == ["gnt[0]"]


def test_harness_of_a_registered_module(tmp_path: Path) -> None:
    """The stand-alone harness of a registered module passes on it and fails on a hand-edited stage (run by pytest
    in a child process, as a user runs it)."""
    out = tmp_path / "arb.py"
    code, text = _run("module", str(ARBITER), "-o", str(out), "--registered", "--harness",
                      str(tmp_path / "test_arb.py"))
    assert code == 0, text
    harness = (tmp_path / "test_arb.py").read_text()
    assert "await ctx.tick()" in harness and "add_clock" in harness

    def pytest_run() -> subprocess.CompletedProcess[str]:
        return subprocess.run([sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider", "test_arb.py"],
                              cwd=tmp_path, capture_output=True, text=True, check=False)

    ok = pytest_run()
    assert ok.returncode == 0, ok.stdout + ok.stderr
    out.write_text(_wrong_unregistered(out.read_text()))
    bad = pytest_run()
    assert bad.returncode == 1 and "gnt[0]: expected" in bad.stdout, bad.stdout + bad.stderr


def test_build_registered_passes_every_check(tmp_path: Path) -> None:
    """build --registered: every module and Verilog file registered, every check passing (with the one-cycle delay
    where registered), the registered caution in the reports."""
    code, out = _run("build", str(ARBITER), "-o", str(tmp_path / "b"), "--registered", "--gates", "nand", "--json")
    assert code == 0, out
    obj = json.loads(out)
    assert obj["passed"] is True
    for key in ("cover", "luts", "module_sop", "module_lut", "verilog", "verilog_lut", "module_nand"):
        assert obj["checks"][key] and all(obj["checks"][key].values()), key
    arts = {k: Path(v) for k, v in obj["artifacts"].items()}
    for key in ("module_sop", "module_lut", "module_nand"):
        assert "m.d.sync += self." in arts[key].read_text(), key
    for key in ("verilog", "verilog_lut", "verilog_nand"):
        assert "always @(posedge clk)" in arts[key].read_text(), key
    assert REGISTERED_CAUTION in " ".join(arts["report_md"].read_text().split())
    code, text = _run("build", str(ARBITER), "-o", str(tmp_path / "c"), "--registered")
    assert code == 0 and "registered: one clock edge later" in text, text
    assert REGISTERED_CAUTION in text


@needs_iverilog
def test_build_registered_verilog_checked_with_iverilog(tmp_path: Path) -> None:
    """check --simulate on the registered Verilog of build: the proof, and iverilog as a second witness."""
    code, out = _run("build", str(ARBITER), "-o", str(tmp_path / "b"), "--registered")
    assert code == 0, out
    code, out = _run("check", str(ARBITER), str(tmp_path / "b" / "arbiter.v"), "--simulate")
    # iverilog (outside reference) drives the same file through plaforge's testbench with a one-cycle delay
    assert code == 0 and "iverilog simulation, registered" in out, out


def test_clock_port_names_taken_by_the_spec_are_refused(tmp_path: Path) -> None:
    """A spec with a port named clk (or rst) cannot take --registered: exit 2, one line, nothing written."""
    spec = tmp_path / "clocked.pla"
    spec.write_text(".i 2\n.o 1\n.ilb clk a\n.ob y\n11 1\n.e\n")
    res = CliRunner().invoke(cli, ["module", str(spec), "-o", str(tmp_path / "m.py"), "--registered"])
    assert res.exit_code == 2 and "'clk'" in res.stderr and len(res.stderr.strip().splitlines()) == 1, res.output
    assert not (tmp_path / "m.py").exists()
    res = CliRunner().invoke(cli, ["build", str(spec), "-o", str(tmp_path / "b"), "--registered"])
    assert res.exit_code == 2 and "rename it" in res.stderr, res.output
    assert not any((tmp_path / "b").glob("*"))


def test_one_caution_text_everywhere(tmp_path: Path) -> None:
    """The caution is worded once (plaforge.core.caution): the same text in a combinational module, its Verilog
    header, the build report and the LUT listing."""
    from plaforge.flow import realize
    from plaforge.formats import read_spec
    from plaforge.lut.export import format_listing

    def flat(s: str) -> str:
        return " ".join(s.replace("//", " ").split())

    code, out = _run("module", str(ARBITER), "-o", str(tmp_path / "m.py"), "--verilog", str(tmp_path / "m.v"))
    assert code == 0, out
    assert CAUTION in flat((tmp_path / "m.py").read_text())
    assert CAUTION in flat((tmp_path / "m.v").read_text())
    code, out = _run("build", str(ARBITER), "-o", str(tmp_path / "b"))
    assert code == 0 and CAUTION in out, out
    assert CAUTION in flat((tmp_path / "b" / "report.md").read_text())
    table = read_spec(ARBITER)
    assert CAUTION in flat(format_listing(realize(table, "lut")))
