"""Simulating a Verilog artifact with iverilog (an independent Verilog front end and simulator), when installed.

A testbench reads the vectors from a file (``$readmemh``), drives them into the module through its ports (named as
:func:`plaforge.core.names.ports_of` names them), and prints each vector's outputs twice over: which bits are 1 and
which are 0, so an undefined (``x``/``z``) output is seen as such and fails. A registered module's outputs are read
one clock edge after each vector, with the next vector already applied. :func:`plaforge.verify.simulate.
check_simulated` chooses the vectors and judges them.
"""

from __future__ import annotations

import shutil
import subprocess
import tempfile
from pathlib import Path

from ..core.errors import ArtifactError
from ..core.names import ports_of
from ..core.table import Table

__all__ = ["have_iverilog", "iverilog_points"]


def have_iverilog() -> bool:
    """Whether ``iverilog`` and ``vvp`` are on the PATH."""
    return shutil.which("iverilog") is not None and shutil.which("vvp") is not None


def _testbench(table: Table, top: str, count: int, clock: tuple[str, str | None] | None = None) -> str:
    n, m = max(table.n_inputs, 1), table.n_outputs
    conns, decls = [], []
    if clock is not None:
        decls.append("  reg clk = 1'b0;")
        conns.append(f".{clock[0]}(clk)")
        if clock[1] is not None:
            decls.append("  reg rst = 1'b0;")
            conns.append(f".{clock[1]}(rst)")
    out_bits = [""] * m
    for p in ports_of(table):
        if p.direction == "in":
            conns.append(f".{p.name}({{{', '.join(f'p[{i}]' for i in reversed(p.members))}}})")
        else:
            decls.append(f"  wire [{p.width - 1}:0] o_{p.name};")
            conns.append(f".{p.name}(o_{p.name})")
            for b, j in enumerate(p.members):
                out_bits[j] = f"o_{p.name}[{b}]"
    ones = ", ".join(f"{b} === 1'b1" for b in reversed(out_bits))
    zeros = ", ".join(f"{b} === 1'b0" for b in reversed(out_bits))
    step = ["      p = vec[i];", "      #1;"]
    if clock is not None:  # tick, apply the next vector (the inverse after the last), then read
        step = ["      p = vec[i];", "      #1 clk = 1'b1;",
                f"      #1 p = (i + 1 < {count}) ? vec[i + 1] : ~vec[i];", "      #1 clk = 1'b0;"]
    return "\n".join([
        "module plaforge_tb;",
        f"  reg [{n - 1}:0] vec [0:{count - 1}];",
        f"  reg [{n - 1}:0] p;",
        *decls,
        "  integer i;",
        f"  {top} dut({', '.join(conns)});",
        "  initial begin",
        '    $readmemh("vectors.hex", vec);',
        f"    for (i = 0; i < {count}; i = i + 1) begin",
        *step,
        f'      $display("%b %b", {{{ones}}}, {{{zeros}}});',
        "    end",
        "    $finish;",
        "  end",
        "endmodule",
        "",
    ])


def iverilog_points(table: Table, verilog: str, top: str, points: list[int], where: str,
                    clock: tuple[str, str | None] | None = None) -> tuple[list[int], list[int]]:
    """Each point's outputs (bit ``j`` table output ``j``) and which of them were undefined, as iverilog sees them.

    ``clock`` is ``(clock port, reset port or None)`` of a registered module (see
    :func:`plaforge.verify.sat.register_ports`): each vector is applied, the clock rises (the reset held low), the
    next vector is applied, and only then are the outputs read.

    Raises
    ------
    ArtifactError
        If iverilog cannot compile the file with the testbench (a port that is not there, a syntax error).
    """
    m = table.n_outputs
    if not points:
        return [], []
    with tempfile.TemporaryDirectory(prefix="plaforge_iverilog_") as tmp:
        d = Path(tmp)
        (d / "dut.v").write_text(verilog, encoding="utf-8")
        (d / "tb.v").write_text(_testbench(table, top, len(points), clock), encoding="utf-8")
        (d / "vectors.hex").write_text("".join(f"{p:x}\n" for p in points), encoding="ascii")
        build = subprocess.run(["iverilog", "-g2005", "-o", "sim.vvp", "tb.v", "dut.v"], cwd=d,
                               capture_output=True, text=True, check=False)
        if build.returncode != 0:
            first = (build.stderr.strip().splitlines() or ["(no message)"])[0]
            raise ArtifactError(f"{where}: iverilog cannot compile it with a testbench: {first}")
        run = subprocess.run(["vvp", "-n", "sim.vvp"], cwd=d, capture_output=True, text=True, check=False)
    lines = [ln.split() for ln in run.stdout.splitlines()]
    rows = [ln for ln in lines if len(ln) == 2 and len(ln[0]) == m and set(ln[0] + ln[1]) <= {"0", "1"}]
    if run.returncode != 0 or len(rows) != len(points):
        raise ArtifactError(f"{where}: iverilog's simulation did not run to the end: {run.stderr.strip()[:200]}")
    values = [int(a, 2) for a, _ in rows]
    full = (1 << m) - 1
    unknown = [full & ~(int(a, 2) | int(b, 2)) for a, b in rows]
    return values, unknown
