"""Is ``--exact --phase`` right? A brute force over all output phase assignments with the exact minimizer.

Run from the repository root::

    python -m benchmarks.bench_phase [mul4x4 popcount5 ...] [--time-limit 60]

For each function: ``minimize --exact --phase`` (rows, optimal, lower bound, outputs inverted, seconds), then every
one of the ``2**m`` assignments minimized exactly on its own (the table with those outputs complemented, no
``--phase``; every run must prove its optimum), and the minimum of those runs beside the ``--phase`` figure. Exit
status 1 when they disagree, when a ``--phase`` run claims an optimum the brute force beats, or when a brute-force
run is not proven. The 4x4-bit multiplier takes some minutes (256 exact runs).
"""

from __future__ import annotations

import argparse
import sys
import time
from collections import Counter

from plaforge.core.table import Table
from plaforge.minimize import MinimizeOptions, cover_summary, minimize

from .suite import SUITE, machine, multiplier

BUILDERS = {"mul4x4": lambda: multiplier(4, 4), **{k: v.build for k, v in SUITE.items()}}


def flipped(table: Table, inverted: int) -> Table:
    """``table`` with the outputs in ``inverted`` complemented (their ON and OFF sets swapped)."""
    m = table.n_outputs
    on = tuple(table.off_cubes(j) if inverted >> j & 1 else table.on_cubes(j) for j in range(m))
    off = tuple(table.on_cubes(j) if inverted >> j & 1 else table.off_cubes(j) for j in range(m))
    dc = tuple(table.dc_cubes(j) for j in range(m))
    return Table(table.input_names, table.output_names, on, dc, off)


def bench(name: str, time_limit: float) -> int:
    table = BUILDERS[name]()
    m = table.n_outputs
    t0 = time.perf_counter()
    cover = minimize(table, MinimizeOptions(exact=True, phase=True, time_limit=time_limit))
    s = cover_summary(cover)
    print(f"{name} ({table.n_inputs} in, {m} out) --exact --phase: rows {s['rows']}, optimal {s['optimal']}, "
          f"lower bound {s['lower_bound']}, inverted {s['inverted'] or 'none'}, {time.perf_counter() - t0:.1f} s",
          flush=True)
    rows: dict[int, int] = {}
    unproven = 0
    t0 = time.perf_counter()
    for inv in range(1 << m):
        res = minimize(flipped(table, inv), MinimizeOptions(exact=True, time_limit=time_limit))
        rows[inv] = res.rows
        unproven += not res.optimal
    best = min(rows.values())
    winners = [inv for inv, r in rows.items() if r == best]
    names = [[table.output_names[j] for j in range(m) if inv >> j & 1] for inv in winners]
    spread = ", ".join(f"{r}: {c}" for r, c in sorted(Counter(rows.values()).items()))
    print(f"  brute force, {1 << m} exact runs in {time.perf_counter() - t0:.1f} s: minimum {best} rows "
          f"(assignments reaching it: {names}); unproven runs: {unproven}", flush=True)
    print(f"  rows per assignment (rows: assignments): {spread}", flush=True)
    bad = unproven > 0 or cover.rows < best or (cover.optimal and cover.rows != best) or cover.lower_bound > best
    print(f"  {'DISAGREES' if bad else 'agrees'}", flush=True)
    return int(bad)


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("names", nargs="*", default=["popcount5", "mul4x4"])
    parser.add_argument("--time-limit", type=float, default=60.0)
    args = parser.parse_args()
    print(machine())
    return 1 if sum(bench(name, args.time_limit) for name in args.names) else 0


if __name__ == "__main__":
    sys.exit(main())
