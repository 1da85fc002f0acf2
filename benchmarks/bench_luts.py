"""LUT mapping benchmark: plaforge's mapper against a straightforward mapping of the minimized two-level cover and
against the proven lower bounds, for k = 4 and k = 6, on the suite of :mod:`benchmarks.suite`.

Run from the repository root::

    python -m benchmarks.bench_luts            # prints the table and the issue-12 aims; docs/bench_luts.txt
    python -m benchmarks.bench_luts add6 mul4x4  # only those suite entries (no aims)

Baseline ("two-level"): the cover from :func:`plaforge.minimize.minimize`, each product term as a tree of k-input
AND LUTs (literal polarities folded into the first level), each output as a tree of k-input OR LUTs over its terms
(an inverter on top for an output realized in complement). Every network, baseline included, is re-checked against
its table (exhaustive, or SAT for the wide entry) before its figures are printed.
"""

from __future__ import annotations

import sys
import time
from collections.abc import Sequence

from plaforge.core.cube import Cover
from plaforge.core.network import Lut
from plaforge.lut import LutNetwork, LutOptions, map_luts
from plaforge.lut.mapper import tidy_network
from plaforge.minimize import minimize
from plaforge.verify.satcnf import check_network_any

from .suite import SUITE, adder, adder_msb_first, fd_rows, machine, multiplier, onoff_rows, print_header, sine_table


def two_level_luts(cover: Cover, k: int) -> LutNetwork:
    """The straightforward k-LUT mapping of a two-level cover (see module docs)."""
    luts: list[Lut] = []

    def new(inputs: Sequence[tuple[str, int]], op: str) -> str:
        # op "and": output 1 when every input equals its polarity; "or": when any does
        m = len(inputs)
        init = 0
        for p in range(1 << m):
            hits = [(p >> b & 1) == pol for b, (_, pol) in enumerate(inputs)]
            if (all(hits) if op == "and" else any(hits)):
                init |= 1 << p
        name = f"@b{len(luts)}"
        luts.append(Lut(name, tuple(s for s, _ in inputs), init))
        return name

    def tree(items: list[tuple[str, int]], op: str) -> tuple[str, int]:
        while len(items) > 1:
            items = [(new(items[x:x + k], op), 1) if len(items[x:x + k]) > 1 else items[x]
                     for x in range(0, len(items), k)]
        return items[0]

    names = cover.input_names
    terms: dict[tuple[int, int], tuple[str, int] | str] = {}
    drivers = []
    for j in range(cover.n_outputs):
        items: list[tuple[str, int]] = []
        one = False
        for c in cover.cubes_for(j):
            key = (c.care, c.value)
            if key not in terms:
                lits = [(names[i], c.value >> i & 1) for i in range(cover.n_inputs) if c.care >> i & 1]
                terms[key] = tree(lits, "and") if lits else "1"
            t = terms[key]
            if t == "1":
                one = True
            else:
                items.append(t)  # type: ignore[arg-type]
        if one:
            sig, pol = "1", 1
        elif not items:
            sig, pol = "0", 1
        else:
            sig, pol = tree(list(dict.fromkeys(items)), "or")
        if cover.is_inverted(j):
            pol = 1 - pol
        if not pol:
            sig = ("1" if sig == "0" else "0") if sig in ("0", "1") else new([(sig, 0)], "and")
        drivers.append(sig)
    net = LutNetwork(k, cover.input_names, cover.output_names, tuple(luts), tuple(drivers), {}, "two-level")
    return tidy_network(net, "b")


# figures of the mapper before the additive decomposition and the depth objective's area recovery (commit 769cb91,
# its own benchmark run): (suite entry, k) -> (count, depth); the aim rows carry theirs
PREVIOUS = {
    ("popcount5", 4): (5, 3), ("popcount5", 6): (3, 1), ("popcount7", 4): (8, 3), ("popcount7", 6): (5, 3),
    ("sym9_3to6", 4): (9, 3), ("sym9_3to6", 6): (6, 3), ("add2", 4): (3, 1), ("add2", 6): (3, 1), ("add3", 4): (5, 2),
    ("add3", 6): (4, 1), ("add4", 4): (7, 3), ("add4", 6): (5, 2), ("add6", 4): (11, 5), ("add6", 6): (7, 4),
    ("mul3x3", 4): (13, 3), ("mul3x3", 6): (6, 1), ("mul4x4", 4): (63, 9), ("mul4x4", 6): (20, 4),
    ("square6", 4): (26, 3), ("square6", 6): (10, 1), ("isqrt8", 4): (12, 3), ("isqrt8", 6): (6, 2),
    ("cmp4", 4): (9, 3), ("cmp4", 6): (6, 2), ("bin2gray6", 4): (5, 1), ("bin2gray6", 6): (5, 1),
    ("gray2bin6", 4): (5, 2), ("gray2bin6", 6): (5, 1), ("bcd2xs3", 4): (4, 1), ("bcd2xs3", 6): (4, 1),
    ("bcd7seg", 4): (7, 1), ("bcd7seg", 6): (7, 1), ("dec4", 4): (16, 1), ("dec4", 6): (16, 1),
    ("rand7x4", 4): (52, 4), ("rand7x4", 6): (12, 2), ("rand9x3", 4): (160, 6), ("rand9x3", 6): (32, 3),
    ("rand11x6", 4): (1281, 8), ("rand11x6", 6): (255, 4), ("wide40", 4): (201, 5), ("wide40", 6): (162, 4),
}


def _prev(key) -> str:
    got = PREVIOUS.get(key)
    return f"{got[0]:>5}/{got[1]:<3}" if got else f"{'-':>5} {'':<3}"


def main(argv: Sequence[str] | None = None) -> int:
    names = list(argv) if argv else list(SUITE)
    print("plaforge LUT mapping benchmark (python -m benchmarks.bench_luts)")
    print(f"machine: {machine()}")
    print("count/depth: LUTs and levels; previous: the mapper at commit 769cb91; lb: proven lower bounds;")
    print("2-level: straightforward mapping of the minimized cover; ratio: plaforge count / lower bound; every network")
    print("re-checked against its table.")
    print()
    head = (f"{'function':<10} {'in':>3} {'out':>3} {'k':>2} | {'plaforge':>9} {'previous':>9} {'2-level':>9} {'lb':>7} | "
            f"{'ratio':>5} {'seconds':>7}  method")
    print_header(head)
    results = {}
    for name in names:
        entry = SUITE[name]
        table = entry()
        cover = minimize(table)
        for k in (4, 6):
            t0 = time.perf_counter()
            net = map_luts(table, cover, k)
            secs = time.perf_counter() - t0
            base = two_level_luts(cover, k)
            for n_ in (net, base):
                verdict = check_network_any(table, n_)
                if not verdict.passed:
                    print(f"{name}: {n_.method} network FAILED its check", file=sys.stderr)
                    return 1
            lb = net.lower_bounds
            ratio = net.count / lb["count"] if lb["count"] else float("nan")
            results[(name, k)] = (net.count, lb["count"])
            print(f"{name:<10} {table.n_inputs:>3} {table.n_outputs:>3} {k:>2} | "
                  f"{net.count:>5}/{net.depth:<3} {_prev((name, k))} {base.count:>5}/{base.depth:<3} "
                  f"{lb['count']:>3}/{lb['depth']:<3} | "
                  f"{ratio:>5.2f} {secs:>7.2f}  {net.method}", flush=True)
    if ("add6", 6) in results:
        c, b = results[("add6", 6)]
        print()
        print(f"aim: 6-bit adder, k = 6: {c} LUTs against a lower bound of {b} = {c / b:.2f}x "
              f"({'meets' if c <= 1.5 * b else 'misses'} the 1.5x aim)")
    if not argv:
        return aims()
    return 0


# (label, table builder, k, objective, cover source, aim text, test of the aim on (count, depth, seconds),
# previous printout's count/depth)
AIMS = [
    ("add6 (a, b LSB first)", lambda: adder(6), 6, "area", "minimized", "7 LUTs", lambda c, d, s: c <= 7, (7, 4)),
    ("add6 (a, b MSB first)", lambda: adder_msb_first(6), 6, "area", "minimized", "7 LUTs", lambda c, d, s: c <= 7,
     (7, 4)),
    ("mul4x4", lambda: multiplier(4, 4), 4, "area", "minimized", "<= 45 LUTs", lambda c, d, s: c <= 45, (63, 9)),
    ("mul4x4", lambda: multiplier(4, 4), 4, "depth", "minimized", "-", lambda c, d, s: True,
     (187, 5)),
    ("sine8", sine_table, 4, "area", "minimized", "-", lambda c, d, s: True, (81, 7)),
    ("sine8", sine_table, 4, "depth", "minimized", "depth <= 5", lambda c, d, s: d <= 5, (379, 5)),
    *[("fd20x5 (41 rows)", fd_rows, k, "area", "minimized", "<= 10 s", lambda c, d, s: s <= 10, old)
      for k, old in ((3, (236, 7)), (4, (159, 5)), (5, (144, 4)), (6, (123, 4)))],
    ("onoff20 (~6000 rows)", onoff_rows, 4, "area", "ON rows", "<= 30 s", lambda c, d, s: s <= 30, (10, 3)),
]


def aims() -> int:
    """The issue-12 aims: each mapped once, re-checked, with its figures and whether the aim is met."""
    print()
    print("issue 12 aims (seconds: map_luts alone; the cover is minimized beforehand, or for the ON/OFF row list")
    print("the ON rows themselves, since minimizing that table is not what is measured here)")
    head = (f"{'function':<22} {'k':>2} {'objective':<9} | {'count/depth':>11} {'previous':>9} {'lb':>7} "
            f"{'seconds':>8} | aim")
    print_header(head)
    for label, build, k, objective, source, aim, met, old in AIMS:
        table = build()
        if source == "ON rows":
            cubes = tuple(c for j in range(table.n_outputs) for c in table.on[j])  # type: ignore[union-attr]
            cover = Cover(table.input_names, table.output_names, cubes)
        else:
            cover = minimize(table)
        t0 = time.perf_counter()
        net = map_luts(table, cover, k, LutOptions(objective=objective))  # type: ignore[arg-type]
        secs = time.perf_counter() - t0
        lb = net.lower_bounds
        ok = met(net.count, net.depth, secs)
        print(f"{label:<22} {k:>2} {objective:<9} | {net.count:>6}/{net.depth:<4} {old[0]:>5}/{old[1]:<3} "
              f"{lb['count']:>3}/{lb['depth']:<3} {secs:>8.2f} | {aim if aim == '-' else aim + (': met' if ok else ': NOT met')}",
              flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
