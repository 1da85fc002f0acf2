"""Output phase assignment: realize some outputs in complement when that lowers the cover's cost.

On a PLA with programmable output polarity (an XOR, or a choice of true/inverted buffer, after each OR line) an
output ``f`` may be built as the OR of the products of ``¬f`` and inverted. The complement's ON set is ``f``'s OFF
set and its don't-cares are unchanged, so each of the ``2**m`` phase assignments is a different minimization
problem with a different cost. The method follows output phase assignment for PLAs (T. Sasao, 1984):

1. *Double-phase cover.* Minimize jointly the ``2m``-output function ``(f_0 … f_{m-1}, ¬f_0 … ¬f_{m-1})``. Any
   assignment can take, for output ``j``, either the products feeding ``f_j`` or those feeding ``¬f_j``; its cost
   is estimated as the number of distinct products so selected.
2. *Choice on the double-phase cover.* Starting from all outputs in true phase, flip the output whose flip lowers
   the estimate most, while some flip does (each estimate is a set union: cheap).
3. *Local search with real costs.* Re-minimize the chosen assignment, then try single-output flips, each
   re-minimized, keeping any that lowers the true cost (rows then literals; per-output terms then literals under
   the per-output cost), until none does.

The whole search is budgeted: at most :data:`BUDGET_FACTOR` times the all-true-phase minimization (plus a second)
and :data:`BUDGET_SHARE` of the time left; when the budget ends it returns the best assignment so far and says it
stopped early. The exact path does not depend on it for optimality: it only seeds the all-assignment model of
:mod:`plaforge.minimize.exact`.

Under the ``per-output`` cost the outputs do not interact, so each output simply takes the cheaper of ``f_j`` and
``¬f_j`` minimized alone. The result is never worse than all-true phase, which is always evaluated.
Cost: ``1 + O(m)`` heuristic minimizations per pass of step 3, within the budget.
"""

from __future__ import annotations

import time
from dataclasses import replace

from ..core.cube import Cube
from ..core.errors import TimeLimit
from ..core.table import FunctionSets, Table
from .heuristic import heuristic_cubes
from .options import MinimizeOptions
from .result import term_count

__all__ = ["BUDGET_FACTOR", "BUDGET_SHARE", "assign_phases", "phase_cost"]

#: The search may spend this many times the all-true-phase minimization (plus a second).
BUDGET_FACTOR = 4
#: ... and at most this share of the time left in the call.
BUDGET_SHARE = 0.5


def phase_cost(cubes: list[Cube], per_output: bool) -> tuple[int, int]:
    """(rows or per-output terms, literals) of a cover given as cubes."""
    return term_count(cubes, per_output), sum(c.literals for c in cubes)


def _double_phase(table: Table) -> FunctionSets:
    m = table.n_outputs
    on = [tuple(table.on_cubes(j)) for j in range(m)]
    on += [tuple(c.with_outputs(1 << (m + j)) for c in table.off_cubes(j)) for j in range(m)]
    dc = [tuple(table.dc_cubes(j)) for j in range(m)]
    dc += [tuple(c.with_outputs(1 << (m + j)) for c in table.dc_cubes(j)) for j in range(m)]
    return FunctionSets(table.n_inputs, 2 * m, tuple(on), tuple(dc))


def _estimate(cubes: list[Cube], m: int, inverted: int) -> int:
    """Distinct products of the double-phase cover needed by assignment ``inverted``."""
    want = 0
    for j in range(m):
        want |= 1 << (m + j) if inverted >> j & 1 else 1 << j
    return sum(1 for c in cubes if c.outputs & want)


def assign_phases(table: Table, options: MinimizeOptions, deadline: float) -> tuple[int, bool]:
    """Bitmask of outputs to realize in complement (bit ``j``: output ``j``; 0 when true phase is best), and whether
    the search ran to its end (false when its budget cut it short).

    Budget: at most :data:`BUDGET_FACTOR` times the all-true-phase minimization (plus a second), and never past
    :data:`BUDGET_SHARE` of the time left before ``deadline`` (``time.monotonic()``).
    """
    m = table.n_outputs
    per_output = options.cost == "per-output"
    start = time.monotonic()
    share_end = start + (deadline - start) * BUDGET_SHARE
    try:
        first = heuristic_cubes(table.cover_sets(0), replace(options, time_limit=max(0.05, share_end - start)))
    except TimeLimit:  # no cover in the search's share: true phase, search stopped (the caller has time left)
        return 0, False
    best_inv, best = 0, phase_cost(first, per_output)
    end = min(share_end, time.monotonic() + BUDGET_FACTOR * (time.monotonic() - start) + 1.0)

    def run(fs: FunctionSets) -> list[Cube] | None:
        left = end - time.monotonic()
        if left <= 0:
            return None
        try:
            return heuristic_cubes(fs, replace(options, time_limit=left))
        except TimeLimit:
            return None

    if m == 0:
        return 0, True
    if per_output:
        comp_cubes = run(table.cover_sets((1 << m) - 1))
        if comp_cubes is None:
            return 0, False
        inverted = 0
        for j in range(m):
            a = phase_cost([c for c in first if c.outputs >> j & 1], True)
            b = phase_cost([c for c in comp_cubes if c.outputs >> j & 1], True)
            if b < a:
                inverted |= 1 << j
        return inverted, True
    # steps 1-2: choose on the double-phase cover
    double = run(_double_phase(table))
    if double is None:
        return 0, False
    inv, est = 0, _estimate(double, m, 0)
    while True:
        e, j = min((_estimate(double, m, inv ^ (1 << j)), j) for j in range(m))
        if e >= est:
            break
        inv, est = inv ^ (1 << j), e
    if inv != 0:
        cubes = run(table.cover_sets(inv))
        if cubes is None:
            return best_inv, False
        if phase_cost(cubes, per_output) < best:
            best_inv, best = inv, phase_cost(cubes, per_output)
    # step 3: single flips with real costs
    improved = True
    while improved:
        improved = False
        for j in range(m):
            trial = best_inv ^ (1 << j)
            cubes = run(table.cover_sets(trial))
            if cubes is None:
                return best_inv, False
            if phase_cost(cubes, per_output) < best:
                best_inv, best, improved = trial, phase_cost(cubes, per_output), True
    return best_inv, True
