"""Seconds to prove a generated module from its own gate netlist, for address decoders of 18 to 40 inputs.

Run from the repository root::

    python -m benchmarks.bench_proof

Each decoder has seven chip selects, select ``k`` on when the top three address bits read ``k``. For each width the
sop module is generated, written to a file and checked with :func:`plaforge.checking.check_artifact` (load, RTLIL,
Yosys netlist, SAT proof of every output): the wall time of the whole check is printed, then the same for the
Verilog file made from the module. The aim is under 10 s at 40 inputs.
"""

from __future__ import annotations

import tempfile
import time
from pathlib import Path

from plaforge.checking import check_artifact
from plaforge.core.cube import Cube
from plaforge.core.table import Table
from plaforge.emit.amaranth import module_source
from plaforge.emit.verilog import verilog_source
from plaforge.flow import realize

WIDTHS = (18, 24, 32, 40)


def decoder(n: int) -> Table:
    names = tuple(f"addr[{i}]" for i in range(n))
    top = 0b111 << (n - 3)
    on = tuple((Cube(top, k << (n - 3), 1 << k),) for k in range(7))
    return Table(names, tuple(f"cs{k}" for k in range(7)), on, ((),) * 7, (None,) * 7, source=f"decoder{n}.pla")


def main() -> None:
    check_artifact(decoder(4), _write(Path(tempfile.mkdtemp()), decoder(4), "warm"))  # compile/load the reader once
    print(f"{'inputs':>6}  {'module .py s':>12}  {'Verilog .v s':>12}  verdict")
    with tempfile.TemporaryDirectory() as tmp:
        for n in WIDTHS:
            t = decoder(n)
            py = _write(Path(tmp), t, f"dec{n}")
            v = Path(tmp) / f"dec{n}.v"
            v.write_text(verilog_source(py.read_text(), f"dec{n}"))
            start = time.perf_counter()
            a = check_artifact(t, py)
            mid = time.perf_counter()
            b = check_artifact(t, v)
            end = time.perf_counter()
            verdict = "proven" if a.passed and b.passed else "FAILED"
            print(f"{n:>6}  {mid - start:>12.2f}  {end - mid:>12.2f}  {verdict}")


def _write(d: Path, t: Table, stem: str) -> Path:
    p = d / f"{stem}.py"
    p.write_text(module_source(t, realize(t, "sop")))
    return p


if __name__ == "__main__":
    main()
