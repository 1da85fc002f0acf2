"""Hazard-free covers: what covering every adjacent ON pair costs, on the bundled samples and the suite.

Run from the repository root::

    python -m benchmarks.bench_hazards            # every sample and suite entry up to 12 inputs
    python -m benchmarks.bench_hazards add4 bcd7seg  # only those suite entries

Per row: the ordinary heuristic cover (rows, literals, hazardous adjacent care pairs), the heuristic hazard-free
cover (rows, literals, seconds) and, up to 9 inputs, the exact hazard-free cover (rows, proven or not, seconds).
Every hazard-free cover is checked against its table and against the hazard finder (inside
:func:`plaforge.minimize.hazards.hazard_free_cover`) before its figures are printed.
"""

from __future__ import annotations

import sys
import time

from plaforge.bundled import sample_path
from plaforge.core.table import Table
from plaforge.formats import read_spec
from plaforge.minimize import MinimizeOptions, minimize
from plaforge.minimize.hazards import hazard_free_cover
from plaforge.verify.hazards import find_hazards

from .suite import SUITE, machine

SAMPLES = ("arbiter.pla", "gamma.toml", "memory_map.toml", "segment_display.csv", "wide_address_map.toml")
EXACT_INPUTS = 9


def row(name: str, table: Table) -> str:
    cover = minimize(table)
    pairs = sum(h.pairs for h in find_hazards(table, cover))
    t0 = time.perf_counter()
    free = hazard_free_cover(table, cover)
    t1 = time.perf_counter()
    exact = "-"
    if table.n_inputs <= EXACT_INPUTS:
        best = hazard_free_cover(table, cover, options=MinimizeOptions(exact=True, time_limit=30))
        exact = f"{best.rows} {'proven' if best.optimal else 'bound ' + str(best.lower_bound)} " \
                f"{time.perf_counter() - t1:.2f}s"
    return (f"{name:<22} {table.n_inputs:>3} {table.n_outputs:>3} | {cover.rows:>5} {cover.literals:>6} {pairs:>10} | "
            f"{free.rows:>5} {free.literals:>6} {t1 - t0:>7.2f}s | {exact}")


def main(argv: list[str]) -> None:
    print(f"hazard-free covers; {machine()}")
    print(f"{'table':<22} {'in':>3} {'out':>3} | {'rows':>5} {'lits':>6} {'hazard prs':>10} | "
          f"{'rows':>5} {'lits':>6} {'time':>8} | exact hazard-free (rows, status, time)")
    print(f"{'':<30} | {'ordinary cover':<23} | {'heuristic hazard-free':<22} |")
    if not argv:
        for s in SAMPLES:
            print(row(s, read_spec(sample_path(s))), flush=True)
    for name, entry in SUITE.items():
        if (argv and name not in argv) or (not argv and (entry.wide or entry.inputs > 12)):
            continue
        print(row(name, entry.build()), flush=True)


if __name__ == "__main__":
    main(sys.argv[1:])
