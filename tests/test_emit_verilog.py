"""Verilog from Amaranth's backend, simulated by an independent Verilog simulator (iverilog + vvp).

The testbench drives every input point and prints the outputs; the printout is compared with the Table (whose
expected values come from each function's definition). iverilog is a separate program with its own Verilog front
end, so agreement here does not rest on Amaranth's simulator or on plaforge's own checks.
"""

from __future__ import annotations

import shutil
import subprocess
from pathlib import Path

import numpy as np
import pytest

from plaforge.core.cube import Cover, Cube
from plaforge.core.names import ports_of
from plaforge.core.network import Lut, LutNetwork
from plaforge.core.table import Table, unpack_bits
from plaforge.emit.amaranth import build_component, module_source
from plaforge.emit.verilog import verilog_name, verilog_source

HAVE_IVERILOG = shutil.which("iverilog") is not None and shutil.which("vvp") is not None
needs_iverilog = pytest.mark.skipif(
    not HAVE_IVERILOG, reason="iverilog/vvp not installed (Debian package 'iverilog'; .ci/run installs it)"
)


def verilog_testbench(table: Table, module: str) -> str:
    """A Verilog testbench that drives all 2**n points into ``module`` and prints ``point outputs`` per line.

    Outputs are printed as m binary digits, the last digit being table output 0.
    """
    n, m = table.n_inputs, table.n_outputs
    ports = ports_of(table)
    conns, decls = [], []
    out_bits: dict[int, str] = {}
    for p in ports:
        if p.direction == "in":
            bits = ", ".join(f"p[{i}]" for i in reversed(p.members))
            conns.append(f".{p.name}({{{bits}}})")
        else:
            decls.append(f"  wire [{p.width - 1}:0] o_{p.name};")
            conns.append(f".{p.name}(o_{p.name})")
            for b, j in enumerate(p.members):
                out_bits[j] = f"o_{p.name}[{b}]"
    cat = ", ".join(out_bits[j] for j in reversed(range(m)))
    return "\n".join([
        "`timescale 1ns/1ps",
        "module tb;",
        f"  reg [{max(n, 1) - 1}:0] p;",
        *decls,
        "  integer i;",
        f"  {module} dut({', '.join(conns)});",
        "  initial begin",
        f"    for (i = 0; i < {1 << n}; i = i + 1) begin",
        "      p = i;",
        "      #1;",
        f'      $display("%0d %b", i, {{{cat}}});',
        "    end",
        "    $finish;",
        "  end",
        "endmodule",
        "",
    ])


def run_iverilog(table: Table, verilog: str, module: str, workdir: Path) -> list[int]:
    """Compile ``verilog`` with a testbench, run it in vvp, and return each point's output mask."""
    (workdir / "dut.v").write_text(verilog)
    (workdir / "tb.v").write_text(verilog_testbench(table, module))
    build = subprocess.run(["iverilog", "-g2005", "-o", str(workdir / "sim.vvp"), str(workdir / "tb.v"),
                            str(workdir / "dut.v")], capture_output=True, text=True, check=False)
    assert build.returncode == 0, build.stderr
    run = subprocess.run(["vvp", "-n", str(workdir / "sim.vvp")], capture_output=True, text=True, check=False)
    assert run.returncode == 0, run.stderr
    got = [0] * (1 << table.n_inputs)
    seen = 0
    for line in run.stdout.splitlines():
        parts = line.split()
        if len(parts) != 2 or not parts[0].isdigit():
            continue
        digits = parts[1]
        assert set(digits) <= {"0", "1"}, f"undriven or unknown output at point {parts[0]}: {digits}"
        got[int(parts[0])] = int(digits, 2)
        seen += 1
    assert seen == 1 << table.n_inputs
    return got


def compare_with_table(table: Table, got: list[int]) -> list[tuple[str, int, int, int]]:
    """Every (output, point, expected, actual) where a care point disagrees."""
    n = table.n_inputs
    arr = np.asarray(got, dtype=np.int64)
    bad = []
    for j, name in enumerate(table.output_names):
        on_b, dc_b = table.truth(j)
        on, dc = unpack_bits(on_b, n), unpack_bits(dc_b, n)
        actual = ((arr >> j) & 1).astype(bool)
        for p in np.flatnonzero(~dc & (actual != on))[:3]:
            bad.append((name, int(p), int(on[p]), int(actual[p])))
    return bad


def _table() -> Table:
    ins = [f"x[{i}]" for i in range(4)] + ["mode", "wire"]
    # x + 3 when mode else x - 1, 4-bit wrap-around (common practice: modular arithmetic); flag = wire xor mode.
    return Table.from_function(
        ins, [f"y[{i}]" for i in range(4)] + ["flag"],
        lambda p: [(np.where(p >> 4 & 1, (p & 15) + 3, (p & 15) - 1) >> i) & 1 for i in range(4)]
        + [(p >> 4 ^ p >> 5) & 1],
        source="wrap.toml",
    )


def test_verilog_is_deterministic_and_names_ports() -> None:
    t = _table()
    cover = Cover(t.input_names, t.output_names, tuple(c for j in range(t.n_outputs) for c in t.on_cubes(j)))
    src = module_source(t, cover, source_name="wrap.toml")
    a, b = verilog_source(src, "wrap"), verilog_source(src, "wrap")
    assert a == b
    assert "module wrap(" in a
    for port in ("x", "mode", "wire_", "y", "flag"):
        assert port in a
    assert "src =" not in a  # no file locations: bytes do not depend on where files live
    assert verilog_name("7-seg") == "p_7_seg"  # the one prefix before a leading digit
    assert verilog_name("module") == "module_"  # a Verilog keyword (IEEE 1364 reserved word; from memory)


@needs_iverilog
@pytest.mark.parametrize("style", ["sop", "sop-inverted", "lut"])
def test_iverilog_agrees_with_table(tmp_path, style: str) -> None:
    t = _table()
    if style == "sop":
        art: Cover | LutNetwork = Cover(t.input_names, t.output_names,
                                        tuple(c for j in range(t.n_outputs) for c in t.on_cubes(j)))
    elif style == "sop-inverted":
        art = Cover(t.input_names, t.output_names, tuple(c for j in range(t.n_outputs) for c in t.off_cubes(j)),
                    inverted=0b11111)
    else:
        art = _network(t)
    v = verilog_source(module_source(t, art, source_name="wrap.toml"), "wrap")
    got = run_iverilog(t, v, "wrap", tmp_path)
    assert compare_with_table(t, got) == []


def _network(t: Table) -> LutNetwork:
    """One 6-input LUT per output, its INIT read off the table's definition (ON points set)."""
    luts = []
    for j in range(t.n_outputs):
        on_b, _ = t.truth(j)
        bits = unpack_bits(on_b, t.n_inputs)
        init = sum(1 << p for p in range(64) if bits[p])
        luts.append(Lut(f"l{j}", t.input_names, init))
    return LutNetwork(6, t.input_names, t.output_names, tuple(luts), tuple(f"l{j}" for j in range(t.n_outputs)))


@needs_iverilog
def test_iverilog_catches_a_wrong_module(tmp_path) -> None:
    t = _table()
    cubes = [c for j in range(t.n_outputs) for c in t.on_cubes(j)]
    c = next(x for x in cubes if x.care)
    low = c.care & -c.care
    cubes[cubes.index(c)] = Cube(c.care, c.value ^ low, c.outputs)  # one literal flipped
    bad = build_component(t, Cover(t.input_names, t.output_names, tuple(cubes)))
    got = run_iverilog(t, verilog_source(bad, "wrap"), "wrap", tmp_path)
    assert compare_with_table(t, got) != []
