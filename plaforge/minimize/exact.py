"""Exact two-level minimization: multi-output primes, a reduced covering problem, CP-SAT.

The primes and the covering problem (targets, reductions, greedy cover, independent-target bound) are built by
:mod:`plaforge.minimize.covering`; this module solves the reduced problem and turns the answer into a cover.

Solver
------
The reduced problem is a unicost set cover, solved with OR-Tools CP-SAT: it takes a wall-clock limit natively,
reports the best objective bound while it runs (so a stopped run still yields a proven lower bound), and proves
optimality with its LP relaxation, unsatisfiable cores and clause learning. It runs 2 workers (one per core of the
target machine): the LP-heavy and the core-based full-problem searches, in deterministic interleaved mode.
Stage 1 minimizes the number of primes (rows of the cover); stage 2 fixes that number and minimizes literals. The
better of a greedy cover and the heuristic's cover mapped onto primes (and completed greedily) bounds each stage from
above. The heuristic's cover comes from a function the caller passes in (:func:`minimize_exact`'s ``seed``). The
reported lower bound on rows is ``essentials + max(CP-SAT bound, independent-target bound)``, where the
independent-target bound is the size of a set of targets no two of which share a prime (each needs its own prime).

Cost: that of :mod:`plaforge.minimize.covering`, then the solver's time.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace

import numpy as np

from ..core.cube import Cover, Cube
from ..core.errors import InternalError, LimitReached, SizeLimit
from ..core.table import FunctionSets, Table
from .covering import (
    CoverProblem,
    Primes,
    bits_of,
    build_problem,
    greedy_cover,
    independent_targets_bound,
    multi_output_primes,
    reduce_problem,
)
from .options import MinimizeOptions
from .progress import Progress
from .result import checked_cover

__all__ = ["ExactResult", "SeedCover", "minimize_exact", "solve_exact"]

#: How the exact path obtains the heuristic cover that seeds it: ``seed(sets, options)`` gives the cubes.
SeedCover = Callable[[FunctionSets, MinimizeOptions], Sequence[Cube]]


# -- mapping heuristic cubes to primes -----------------------------------------------------------------------------
def _ternary_index(care: int, value: int, n: int) -> tuple[int, ...]:
    return tuple((1 if value >> i & 1 else 0) if care >> i & 1 else 2 for i in range(n - 1, -1, -1))


def _map_to_primes(cubes: Sequence[Cube], primes: Primes, n: int) -> list[int]:
    """Expand each cube to a prime keeping its outputs in the tag; indices into ``primes`` where found."""
    tags = primes.cube_tags
    index = {(int(c), int(v)): i for i, (c, v) in enumerate(zip(primes.care.tolist(), primes.value.tolist()))}
    out = []
    for cube in cubes:
        care, value = cube.care, cube.value
        need = np.uint64(cube.outputs)
        if tags[_ternary_index(care, value, n)] & need != need:
            continue
        for i in range(n):
            bit = 1 << i
            if care & bit:
                c2, v2 = care & ~bit, value & ~bit
                if tags[_ternary_index(c2, v2, n)] & need == need:
                    care, value = c2, v2
        i = index.get((care, value))
        if i is not None:
            out.append(i)
    return out


# -- solving -------------------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class ExactResult:
    """Chosen prime indices, with whether rows (and literals) were proven minimum and the row lower bound."""

    chosen: tuple[int, ...]
    optimal: bool
    literals_optimal: bool
    lower_bound: int
    stats: tuple[tuple[str, object], ...]


def _cp_sat(pb: CoverProblem, primes: list[int], targets: list[int], hint: set[int], deadline: float,
            progress: Progress | _Offset, row_count: int | None) -> tuple[list[int] | None, bool, float]:
    """One CP-SAT solve: minimum primes (``row_count`` None) or minimum literals at ``row_count`` primes.

    ``primes`` and ``targets`` are the open ones; ``hint`` is a known cover, and the model asks for one no worse.
    Returns (chosen primes or None, proven, bound).
    """
    from ortools.sat.python import cp_model

    model = cp_model.CpModel()
    x = {p: model.NewBoolVar(f"p{p}") for p in primes}
    for t in targets:
        model.AddBoolOr([x[p] for p in bits_of(pb.covered_by[t])])
    # The known cover enters as an upper bound, not as a solution hint: on these set-cover models a hint steered
    # the search into long detours (the 9-input symmetric function took 10 s with it, 4 s with the bound).
    if row_count is None:
        model.Add(sum(x.values()) <= len(hint))
        model.Minimize(sum(x.values()))
    else:
        model.Add(sum(x.values()) == row_count)
        lits = sum(pb.literals[p] * x[p] for p in primes)
        model.Add(lits <= sum(pb.literals[p] for p in hint))
        model.Minimize(lits)
    solver = cp_model.CpSolver()
    # Two workers, one per core: an LP-based search (its bound proves set-cover minima quickly) and a core-based
    # one (MaxSAT-style unsatisfiable cores raise the bound); interleaved deterministically, so the same input gives
    # the same cover.
    solver.parameters.num_workers = 2
    solver.parameters.subsolvers.extend(["max_lp", "core"])
    solver.parameters.interleave_search = True
    solver.parameters.random_seed = 1
    solver.parameters.max_time_in_seconds = max(0.05, deadline - time.monotonic())
    what = "rows" if row_count is None else "literals"

    class _Seen(cp_model.CpSolverSolutionCallback):
        def on_solution_callback(self) -> None:
            progress.update(**{f"best {what}": round(self.ObjectiveValue())})

    solver.best_bound_callback = lambda b: progress.update(**{f"{what} bound": math.ceil(b - 1e-6)})
    status = solver.Solve(model, _Seen())
    if status in (cp_model.OPTIMAL, cp_model.FEASIBLE):
        picked = [p for p in primes if solver.BooleanValue(x[p])]
        return picked, status == cp_model.OPTIMAL, solver.BestObjectiveBound()
    if status == cp_model.INFEASIBLE:
        return None, False, float("inf")
    return None, False, solver.BestObjectiveBound()


def solve_exact(on: Sequence[np.ndarray], dc: Sequence[np.ndarray], n: int, heuristic: Sequence[Cube],
                deadline: float, progress: Progress) -> tuple[CoverProblem, ExactResult]:
    """Minimum cover of the function with point sets ``on``/``dc``; see the module docs for the method."""
    progress.stage("generating multi-output primes")
    primes = multi_output_primes(on, dc, n)
    progress.update(primes=len(primes))
    progress.stage("building the covering problem")
    pb = build_problem(primes, on, n)
    n_targets0, n_primes0 = pb.open_targets.bit_count(), pb.open_primes.bit_count()
    progress.update(elements=pb.n_elements, targets=n_targets0)
    progress.stage("reducing (essentials, dominance)")
    reduce_problem(pb, deadline)
    targets = list(bits_of(pb.open_targets))
    open_primes = list(bits_of(pb.open_primes))
    ess = len(pb.chosen)
    progress.update(essential=ess, **{"targets left": len(targets), "primes left": len(open_primes)})
    stats: list[tuple[str, object]] = [
        ("primes", len(primes)), ("elements", pb.n_elements), ("targets", n_targets0), ("useful_primes", n_primes0),
        ("essential", ess), ("targets_reduced", len(targets)), ("primes_reduced", len(open_primes)),
    ]
    if not targets:
        return pb, ExactResult(tuple(pb.chosen), True, True, ess, tuple(stats))
    indep = independent_targets_bound(pb)
    greedy = greedy_cover(pb)
    mapped = [p for p in dict.fromkeys(_map_to_primes(heuristic, primes, n)) if pb.open_primes >> p & 1]
    completed = greedy_cover(pb, mapped)
    hint = completed if len(completed) < len(greedy) else greedy
    progress.update(**{"best rows": ess + len(hint), "rows bound": ess + indep})
    if time.monotonic() < deadline:
        progress.stage("solving minimum cover (CP-SAT)")
        picked, proven, bound = _cp_sat(pb, open_primes, targets, set(hint), deadline, _Offset(progress, ess), None)
    else:
        picked, proven, bound = None, False, 0.0
    if picked is None or len(picked) > len(hint):
        picked, proven = list(hint), False
    lb = ess + max(indep, math.ceil(bound - 1e-6) if math.isfinite(bound) else 0)
    if proven:
        lb = ess + len(picked)
    lb = min(lb, ess + len(picked))
    # Literals at this row count are at least the sum of the len(picked) smallest literal counts; when the cover
    # already meets that bound (e.g. all primes equally wide) there is nothing for stage 2 to find.
    floor = sum(sorted(pb.literals[p] for p in open_primes)[: len(picked)])
    lit_opt = sum(pb.literals[p] for p in picked) == floor
    if not lit_opt and time.monotonic() < deadline - 0.2:
        progress.stage("minimizing literals at that row count (CP-SAT)")
        picked2, lit_opt, _ = _cp_sat(pb, open_primes, targets, set(picked), deadline, progress, len(picked))
        if picked2 is not None:
            lits = sum(pb.literals[p] for p in picked)
            if sum(pb.literals[p] for p in picked2) <= lits:
                picked = picked2
    stats.append(("independent_bound", ess + indep))
    return pb, ExactResult(tuple(pb.chosen) + tuple(picked), proven, proven and lit_opt, lb, tuple(stats))


class _Offset:
    """Progress proxy adding the essential primes to the row counts shown."""

    def __init__(self, inner: Progress, offset: int) -> None:
        self.inner, self.offset = inner, offset

    def update(self, **fields: int) -> None:
        self.inner.update(**{k: v + self.offset for k, v in fields.items()})

    def stage(self, text: str) -> None:
        self.inner.stage(text)


def _irredundant(pb: CoverProblem, chosen: Sequence[int]) -> list[Cube]:
    """Cubes of the chosen primes, each feeding only outputs where it is not redundant."""
    count = np.zeros(pb.n_elements, dtype=np.int64)
    for p in chosen:
        for _, ids in pb.elements[p]:
            np.add.at(count, ids, 1)
    outputs = {p: int(pb.primes.useful[p]) for p in chosen}
    for p in sorted(chosen, key=lambda p: (-pb.literals[p], p)):
        for j, ids in pb.elements[p]:
            if ids.size == 0 or (count[ids] >= 2).all():
                outputs[p] &= ~(1 << j)
                np.add.at(count, ids, -1)
    return [Cube(int(pb.primes.care[p]), int(pb.primes.value[p]), outputs[p]) for p in chosen if outputs[p]]


# -- the public entry ----------------------------------------------------------------------------------------------
def minimize_exact(table: Table, options: MinimizeOptions, inverted: int, seed: SeedCover) -> Cover:
    """Proven-minimum cover of ``table`` (rows, then literals) under ``options.cost``; verified.

    Parameters
    ----------
    table : Table
        The function.
    options : MinimizeOptions
        Cost model, time limit, exact-path width limit, progress display.
    inverted : int
        Outputs realized in complement (bit ``j``: output ``j``).
    seed : SeedCover
        Gives the heuristic cover that seeds the solver (and is the fallback); it gets a third of the time limit,
        and when it fails the solver starts from its greedy cover alone.

    Raises
    ------
    plaforge.core.errors.SizeLimit
        ``table`` has more than ``options.exact_limit`` inputs.
    """
    deadline = time.monotonic() + options.time_limit
    n, m = table.n_inputs, table.n_outputs
    if n > options.exact_limit:
        raise SizeLimit(
            f"{table.source or 'table'}: the exact path enumerates 3^{n} cubes, above its limit of "
            f"{options.exact_limit} inputs; use the heuristic (drop --exact)"
        )
    fs = table.cover_sets(inverted)
    on, dc = fs.point_arrays()
    per_output = options.cost == "per-output"
    try:
        heur: Sequence[Cube] | None = seed(fs, replace(options, time_limit=max(0.5, options.time_limit / 3)))
    except (InternalError, LimitReached):
        heur = None
    with Progress(options.progress, f"exact minimization of {table.source or 'table'}") as progress:
        groups = [[j] for j in range(m)] if per_output else [list(range(m))]
        cubes: list[Cube] = []
        optimal = lits_optimal = True
        bound = 0
        stats: list[tuple[str, object]] = []
        for k, group in enumerate(groups):
            left = len(groups) - k
            sub_deadline = time.monotonic() + max(0.1, (deadline - time.monotonic()) / left)
            sub_on = [on[j] for j in group]
            sub_dc = [dc[j] for j in group]
            mask = sum(1 << j for j in group)
            sub_heur = [
                Cube(c.care, c.value, _squeeze(c.outputs & mask, group)) for c in heur or () if c.outputs & mask
            ]
            if per_output:
                progress.stage(f"output {table.output_names[group[0]]}")
            pb, res = solve_exact(sub_on, sub_dc, n, sub_heur, sub_deadline, progress)
            got = [Cube(c.care, c.value, _spread(c.outputs, group)) for c in _irredundant(pb, res.chosen)]
            if heur is not None and len(got) > len(sub_heur):  # the solver did worse than its seed: keep the seed
                got = [Cube(c.care, c.value, _spread(c.outputs, group)) for c in sub_heur]
            cubes += got
            optimal &= res.optimal
            lits_optimal &= res.literals_optimal
            bound += res.lower_bound
            stats += [(f"{k}:{key}" if per_output else key, v) for key, v in res.stats]
    return checked_cover(table, cubes, options, inverted, "exact", optimal, bound,
                         tuple(stats) + (("literals_optimal", lits_optimal),))


def _squeeze(outputs: int, group: Sequence[int]) -> int:
    return sum(1 << k for k, j in enumerate(group) if outputs >> j & 1)


def _spread(outputs: int, group: Sequence[int]) -> int:
    return sum(1 << j for k, j in enumerate(group) if outputs >> k & 1)
