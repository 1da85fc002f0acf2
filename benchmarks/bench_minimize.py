"""Side-by-side two-level minimization figures: plaforge (heuristic and exact) against pyeda's own minimizer.

Run from the repository root::

    python -m benchmarks.bench_minimize [--time-limit 30] [--exact-max-inputs 12] [NAME ...]

For every suite function (see :mod:`benchmarks.suite`) it prints rows (distinct product terms), literals and
seconds for

* the reference: pyeda's high-level ``espresso_tts`` (truth tables, up to 16 inputs) or ``espresso_exprs`` (the
  ON cubes as DNF expressions, for the wide cube-specified entries; it has no don't-care input, so it treats
  don't-cares as OFF, which still gives a valid cover);
* plaforge's heuristic (``minimize(table)``);
* plaforge's exact path (``minimize(table, MinimizeOptions(exact=True, time_limit=...))``) where the function has at
  most ``--exact-max-inputs`` inputs, with ``optimal`` or the gap to the proven lower bound;

and the ratios of plaforge's rows to the reference's. Every cover, the reference's included, is re-checked against
its Table (ON ⊆ cover ⊆ ON ∪ DC per output): exhaustively up to 24 inputs, by cube containment above. The figures
quoted in ``docs/bench_minimize.txt`` come from this script. Exit status 1 if a check fails or a claim below fails.
"""

from __future__ import annotations

import argparse
import sys
import time
from dataclasses import dataclass

from benchmarks.suite import SUITE, machine, print_header, verdict
from plaforge.core.cube import Cover, Cube
from plaforge.core.errors import InternalError
from plaforge.core.table import Table, unpack_bits
from plaforge.minimize import MinimizeOptions, minimize
from plaforge.minimize.result import verify_cover

ENUM_REFERENCE_LIMIT = 16


@dataclass
class Figure:
    rows: int
    literals: int
    seconds: float
    status: str = ""
    checked: bool = False


def _checked(table: Table, cover: Cover) -> bool:
    try:
        verify_cover(table, cover, "benchmark")
    except InternalError:
        return False
    return True


def _expr_cover(table: Table, exprs: tuple, var_index: dict[str, int]) -> Cover:
    """A plaforge Cover from pyeda expressions (one per output), identical terms merged into one row."""
    rows: dict[tuple[int, int], int] = {}
    for j, f in enumerate(exprs):
        if f.is_zero():
            continue
        terms = [frozenset()] if f.is_one() else list(f.cover)
        for term in terms:
            care = value = 0
            for lit in term:
                name = str(lit).lstrip("~")
                bit = 1 << var_index[name]
                care |= bit
                if not str(lit).startswith("~"):
                    value |= bit
            rows[(care, value)] = rows.get((care, value), 0) | 1 << j
    cubes = tuple(Cube(c, v, o) for (c, v), o in sorted(rows.items()))
    return Cover(table.input_names, table.output_names, cubes, method="reference")


def reference(table: Table) -> Figure:
    """pyeda's high-level minimizer on ``table``."""
    from pyeda.boolalg.bfarray import exprvars
    from pyeda.boolalg.expr import And, Or
    from pyeda.boolalg.minimization import espresso_exprs, espresso_tts
    from pyeda.boolalg.table import truthtable

    n, m = table.n_inputs, table.n_outputs
    xs = exprvars("x", n)
    index = {str(xs[i]): i for i in range(n)}
    t0 = time.perf_counter()
    if n <= ENUM_REFERENCE_LIMIT:
        tts = []
        for j in range(m):
            on, dc = (unpack_bits(b, n) for b in table.truth(j))
            text = "".join("-" if d else "1" if o else "0" for o, d in zip(on.tolist(), dc.tolist()))
            tts.append(truthtable(xs, text))
        exprs = espresso_tts(*tts)
    else:
        given = []
        for j in range(m):
            cubes = table.on[j] if table.on[j] is not None else table.on_cubes(j)
            terms = []
            for c in cubes:
                lits = [xs[i] if c.value >> i & 1 else ~xs[i] for i in range(n) if c.care >> i & 1]
                terms.append(And(*lits))
            given.append(Or(*terms))
        exprs = espresso_exprs(*given)
    secs = time.perf_counter() - t0
    cover = _expr_cover(table, exprs, index)
    return Figure(cover.rows, cover.literals, secs, "", _checked(table, cover))


def plaforge_figure(table: Table, options: MinimizeOptions) -> Figure:
    cover = minimize(table, options)
    if cover.method == "exact":
        gap = cover.rows - cover.lower_bound
        status = "optimal" if cover.optimal else f"gap {gap} (lb {cover.lower_bound})"
    else:
        status = ""
    return Figure(cover.rows, cover.literals, cover.seconds, status, _checked(table, cover))


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("names", nargs="*", help="suite entries (default: all)")
    ap.add_argument("--time-limit", type=float, default=30.0, help="exact solver limit per function (s)")
    ap.add_argument("--exact-max-inputs", type=int, default=12, help="run the exact path up to this many inputs")
    args = ap.parse_args(argv)
    names = args.names or list(SUITE)
    print(f"machine: {machine()}")
    print(f"exact path: CP-SAT, time limit {args.time_limit:g} s per function, up to {args.exact_max_inputs} inputs")
    head = (f"{'function':<11}{'in':>3}{'out':>4} | {'ref rows':>8}{'lits':>7}{'s':>7} | {'heur rows':>9}{'lits':>7}"
            f"{'s':>7} | {'exact rows':>10}{'lits':>7}{'s':>7}  {'status':<18} | {'heur/ref':>8}{'exact/ref':>10}")
    print_header(head)
    failures: list[str] = []
    results: dict[str, tuple[Figure, Figure, Figure | None]] = {}
    for name in names:
        entry = SUITE[name]
        table = entry()
        ref = reference(table)
        heur = plaforge_figure(table, MinimizeOptions())
        exact = None
        if entry.inputs <= args.exact_max_inputs and not entry.wide:
            exact = plaforge_figure(table, MinimizeOptions(exact=True, time_limit=args.time_limit))
        results[name] = (ref, heur, exact)
        ex = (f"{exact.rows:>10}{exact.literals:>7}{exact.seconds:>7.2f}  {exact.status:<18}" if exact
              else f"{'-':>10}{'-':>7}{'-':>7}  {'(not run)':<18}")
        ratio_e = f"{exact.rows / ref.rows:>10.3f}" if exact and ref.rows else f"{'-':>10}"
        ratio_h = f"{heur.rows / ref.rows:>8.3f}" if ref.rows else f"{'-':>8}"
        print(f"{name:<11}{entry.inputs:>3}{entry.outputs:>4} | {ref.rows:>8}{ref.literals:>7}{ref.seconds:>7.2f} | "
              f"{heur.rows:>9}{heur.literals:>7}{heur.seconds:>7.2f} | {ex} | {ratio_h}{ratio_e}", flush=True)
        for label, fig in (("reference", ref), ("heuristic", heur), ("exact", exact)):
            if fig is not None and not fig.checked:
                failures.append(f"{name}: {label} cover fails the check against its Table")
        if heur.rows > ref.rows:
            failures.append(f"{name}: heuristic rows {heur.rows} > reference rows {ref.rows}")
        if exact is not None and entry.inputs <= 9 and (exact.status != "optimal" or exact.seconds >= 30):
            failures.append(f"{name}: exact not proven optimal within 30 s ({exact.status}, {exact.seconds:.1f} s)")
    print()
    print("every cover re-checked against its Table (ON ⊆ cover ⊆ ON ∪ DC):",
          "all pass" if not any("check" in f for f in failures) else "FAILURES")
    for name in ("sym9_3to6", "mul4x4", "square6"):
        if name in results and results[name][2] is not None:
            ref, heur, exact = results[name]
            ok = exact.rows < heur.rows and exact.rows < ref.rows
            print(f"{name}: exact {exact.rows} rows vs heuristic {heur.rows}, reference {ref.rows}: "
                  f"{'strictly fewer' if ok else 'NOT fewer'}")
            if not ok:
                failures.append(f"{name}: exact not strictly below heuristic and reference")
    return verdict(failures, "claims", "FAIL")


if __name__ == "__main__":
    sys.exit(main())
