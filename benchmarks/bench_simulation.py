"""Throughput of the checks: Amaranth's simulator on generated modules, the bit-parallel check, the SAT proof.

Run from the repository root::

    python -m benchmarks.bench_simulation            # prints the tables
    python -m benchmarks.bench_simulation --save     # also writes docs/bench_simulation.txt

Part 1 drives generated components (both styles) in Amaranth's simulator, every input point, and reports vectors per
second (simulation only; elaboration and expected-value set-up are timed apart). Part 2 checks a seeded random
20-input, 16-output cover (the aim: under 2 s) bit-parallel, and proves it by SAT, side by side.
"""

from __future__ import annotations

import argparse
import random
import sys
import time
from pathlib import Path

from benchmarks.suite import SUITE, machine
from plaforge.core.cube import Cover, Cube
from plaforge.core.table import Table
from plaforge.emit.amaranth import build_component
from plaforge.flow import realize
from plaforge.verify.equivalence import check_cover
from plaforge.verify.sat import sat_check_cover
from plaforge.verify.simulate import simulate_points

ROOT = Path(__file__).resolve().parent.parent


def machine_line() -> str:
    import amaranth
    import numpy

    return f"machine: {machine()}, amaranth {amaranth.__version__}, numpy {numpy.__version__}"


def bench_simulation(names: list[str]) -> list[str]:
    head = (
        f"{'function':<10} {'in':>3} {'out':>3} {'style':<5} {'nodes':>6} {'setup s':>8} {'vectors':>8} "
        f"{'sim s':>7} {'vectors/s':>10}"
    )
    rows = [head]
    for name in names:
        t = SUITE[name]()
        cover = realize(t, "sop")
        for style in ("sop", "lut"):
            art = realize(t, style, cover=cover, k=6)
            nodes = art.rows if style == "sop" else art.count
            # setup: elaboration, simulator construction and one vector (the component is built beforehand)
            component = build_component(t, art)
            t0 = time.perf_counter()
            simulate_points(t, component, [0])
            setup = time.perf_counter() - t0
            # steady state: every point, cycled to at least 8192 vectors
            count = max(1 << t.n_inputs, 8192)
            pts = [k % (1 << t.n_inputs) for k in range(count)]
            component = build_component(t, art)
            t0 = time.perf_counter()
            simulate_points(t, component, pts)
            dt = time.perf_counter() - t0 - setup
            rows.append(f"{name:<10} {t.n_inputs:>3} {t.n_outputs:>3} {style:<5} {nodes:>6} {setup:>8.2f} "
                        f"{count:>8} {dt:>7.2f} {count / dt:>10,.0f}")
    return rows


def random_cover(n: int = 20, m: int = 16, per_output: int = 40, seed: int = 2024) -> tuple[Table, Cover]:
    """A seeded random-ish cover: ``per_output`` cubes of 6 to 12 literals per output, some shared; its table is the
    same cubes as ON sets with a few don't-care cubes, so the cover is correct and every point is examined."""
    rng = random.Random(seed)
    pool = []
    for _ in range(per_output * m // 2):
        care = 0
        for i in rng.sample(range(n), rng.randint(6, 12)):
            care |= 1 << i
        pool.append((care, rng.getrandbits(n) & care))
    feeds: dict[tuple[int, int], int] = {}
    for j in range(m):
        for cube in rng.sample(pool, per_output):
            feeds[cube] = feeds.get(cube, 0) | 1 << j
    cubes = tuple(Cube(c, v, o) for (c, v), o in sorted(feeds.items()))
    names = tuple(f"x[{i}]" for i in range(n))
    outs = tuple(f"y[{j}]" for j in range(m))
    on = tuple(tuple(Cube(c.care, c.value, 1 << j) for c in cubes if c.outputs >> j & 1) for j in range(m))
    dc = tuple((Cube(0xFFFF0 | 0xF, 0x12345 & (0xFFFF0 | 0xF), 1 << j),) for j in range(m))
    return Table(names, outs, on, dc, (None,) * m), Cover(names, outs, cubes)


def bench_check() -> list[str]:
    rows = [f"{'check of a 20-input, 16-output cover':<44} {'seconds':>8}  result"]
    t, cover = random_cover()
    t0 = time.perf_counter()
    for j in range(t.n_outputs):
        t.truth(j)
    t_truth = time.perf_counter() - t0
    t0 = time.perf_counter()
    v = check_cover(t, cover)
    t_check = time.perf_counter() - t0
    t0 = time.perf_counter()
    s = sat_check_cover(t, cover)
    t_sat = time.perf_counter() - t0
    rows.append(f"  cover: {cover.rows} rows, {cover.literals} literals, seeded random")
    rows.append(f"{'  spec truth tables (2^20 points x 16, once)':<44} {t_truth:>8.2f}")
    rows.append(f"{'  bit-parallel check, every point':<44} {t_check:>8.2f}  {'PASS' if v.passed else 'FAIL'}")
    rows.append(f"{'  bit-parallel, truth tables included':<44} {t_truth + t_check:>8.2f}  (aim: < 2 s)")
    rows.append(f"{'  SAT proof (PicoSAT), all outputs':<44} {t_sat:>8.2f}  {'PASS' if s.passed else 'FAIL'}")
    rate = (1 << 20) * 16 / t_check
    rows.append(f"{'  bit-parallel rate (point-outputs per s)':<44} {rate:>8.2e}")
    return rows


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--save", action="store_true", help="also write docs/bench_simulation.txt")
    args = ap.parse_args()
    lines = [
        "plaforge check throughput (python -m benchmarks.bench_simulation)",
        machine_line(),
        "",
        "Amaranth simulator, one Cat() set and one Cat() get per vector; nodes = product terms (sop) or LUTs (lut);",
        "setup = elaboration + simulator construction + 1 vector; sim s excludes setup:",
        *bench_simulation(["popcount7", "add4", "mul4x4", "rand9x3", "add6", "rand11x6"]),
        "",
        *bench_check(),
    ]
    text = "\n".join(lines) + "\n"
    sys.stdout.write(text)
    if args.save:
        (ROOT / "docs" / "bench_simulation.txt").write_text(text)


if __name__ == "__main__":
    main()
