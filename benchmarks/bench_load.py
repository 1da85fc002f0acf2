"""Load-time figures for the spec readers: a 32-bit range-rule design file and generated 40-input PLA files.

Run from the repository root::

    python benchmarks/bench_load.py

The last rows read *and minimize* one 40-bit range function (56 range cubes) written three ways: a PLA whose
leftmost column is the least significant bit, the same PLA with its columns reversed, and a TOML range rule. Each
runs in a fresh process, which prints its wall time and its peak resident memory (its own and its children's:
the minimizer runs in a child process).

Prints, per case, the wall time of reading (``time.perf_counter``, best of 3) and the cube counts of the resulting
Table. Nothing is enumerated: every set stays a list of cubes. The generated PLA files are invented random data
(seeded, so the figures are repeatable); type ``fr`` also exercises the ON/OFF contradiction check.
"""

from __future__ import annotations

import random
import resource
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))  # run from a checkout without installing

from plaforge.core.table import Table
from plaforge.formats import read_spec
from plaforge.formats._cubes import range_cubes
from plaforge.formats.design import parse_design
from plaforge.formats.pla import parse_pla
from plaforge.minimize import minimize

RANGE = (0x2043A2E02, 0xD6BDFBF936)  # a 40-bit range whose decomposition is 56 cubes (invented, for the figures)


def random_pla(n: int, m: int, rows: int, typ: str, seed: int = 1) -> str:
    """A PLA text with ``rows`` random cubes (about a third of the inputs tested per cube)."""
    rng = random.Random(seed)
    lines = [f".i {n}", f".o {m}", f".type {typ}", f".p {rows}"]
    for r in range(rows):
        inp = [rng.choice("01") if rng.random() < 0.33 else "-" for _ in range(n)]
        if typ == "fr":  # keep ON rows (last input 1) and OFF rows (last input 0) apart: no contradictions
            on_row = r % 2 == 0
            inp[-1] = "1" if on_row else "0"
            out = "".join(rng.choice("1~") if on_row else rng.choice("0~") for _ in range(m))
        else:
            out = "".join(rng.choice("10-") for _ in range(m))
        lines.append("".join(inp) + " " + out)
    lines.append(".e")
    return "\n".join(lines) + "\n"


def given_counts(t: Table) -> str:
    """Cubes the reader produced, per set over all outputs ("rest" counts outputs whose set is implicit)."""
    parts = []
    for label, sets in (("ON", t.on), ("DC", t.dc), ("OFF", t.off)):
        cubes = sum(len(s) for s in sets if s is not None)
        rest = sum(1 for s in sets if s is None)
        parts.append(f"{label} {cubes}" + (f" (+rest on {rest})" if rest else ""))
    return ", ".join(parts)


def computed_counts(t: Table) -> str:
    """ON, DC and OFF cubes after the Table derives the implicit sets by cube complement (never by enumeration)."""
    t0 = time.perf_counter()
    on = sum(len(t.on_cubes(j)) for j in range(t.n_outputs))
    dc = sum(len(t.dc_cubes(j)) for j in range(t.n_outputs))
    off = sum(len(t.off_cubes(j)) for j in range(t.n_outputs))
    return f"all three sets as cubes: ON {on}, DC {dc}, OFF {off} ({time.perf_counter() - t0:.3f} s)"


def timed(label: str, load, derive: bool) -> None:
    times = []
    table = None
    for _ in range(3):
        t0 = time.perf_counter()
        table = load()
        times.append(time.perf_counter() - t0)
    assert table is not None
    print(f"{label}: {table.n_inputs} inputs, {table.n_outputs} outputs; read first {times[0]:.3f} s, "
          f"best of 3 {min(times):.3f} s")
    print(f"    given cubes: {given_counts(table)}")
    if derive:
        print(f"    {computed_counts(table)}")


def main() -> None:
    timed("samples/wide_address_map.toml", lambda: read_spec(ROOT / "samples" / "wide_address_map.toml"), True)
    timed("samples/memory_map.toml", lambda: read_spec(ROOT / "samples" / "memory_map.toml"), True)
    for rows, typ in ((500, "fd"), (2000, "fd"), (2000, "fr")):
        text = random_pla(40, 8, rows, typ)
        # random overlapping cubes make the derived complement sets huge; only reading is timed here
        timed(f"generated 40-input PLA, {rows} rows, type {typ}", lambda text=text: parse_pla(text, "gen.pla"),
              False)


def range_spec(kind: str) -> tuple[str, str]:
    """The 40-bit range function as ``(text, file name)``: ``pla`` (input i is bit i), ``pla-reversed`` (input i
    is bit 39 - i) or ``toml`` (one range rule)."""
    lo, hi = RANGE
    if kind == "toml":
        return (f'[inputs]\na = 40\n[outputs]\ny = 1\n[[rule]]\nwhen = {{ a = {{ from = {lo:#x}, to = {hi:#x} }} }}\n'
                f'set = {{ y = 1 }}\n'), "range.toml"
    cubes = range_cubes(lo, hi, range(40))
    rows = [c.text(40) for c in cubes]
    if kind == "pla-reversed":
        rows = [r[::-1] for r in rows]
    return f".i 40\n.o 1\n.p {len(rows)}\n" + "".join(f"{r} 1\n" for r in rows) + ".e\n", "range.pla"


def one_range_case(kind: str) -> None:
    """Read and minimize one form of the range function, in this process; print one line of figures."""
    text, name = range_spec(kind)
    t0 = time.perf_counter()
    table = parse_design(text, name) if kind == "toml" else parse_pla(text, name)
    t1 = time.perf_counter()
    cover = minimize(table)
    t2 = time.perf_counter()
    own = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    child = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024
    print(f"40-bit range, {kind}: {sum(len(s) for s in table.on if s is not None)} ON cubes read in {t1 - t0:.3f} s; "
          f"minimized to {cover.rows} rows in {t2 - t1:.3f} s; total {t2 - t0:.3f} s; "
          f"peak memory {own:.0f} MB (minimizer child {child:.0f} MB)")


if __name__ == "__main__":
    if len(sys.argv) == 3 and sys.argv[1] == "--range":
        one_range_case(sys.argv[2])
    else:
        main()
        for form in ("pla", "pla-reversed", "toml"):
            subprocess.run([sys.executable, __file__, "--range", form], check=True)
