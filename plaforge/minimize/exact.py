"""Exact two-level minimization: multi-output primes, a reduced covering problem, CP-SAT; optionally over all
output phase assignments at once.

The primes come from :mod:`plaforge.minimize.primes` (generated from cubes: the work follows the function, not
``3**n``, and any number of outputs fits); the covering problem (targets, reductions, greedy cover,
independent-target bound) from :mod:`plaforge.minimize.covering`; this module solves it and turns the answer into a
cover.

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

All phase assignments (``phase``)
---------------------------------
For output ``j`` of a group of ``g`` outputs the problem holds two outputs: ``j`` (``f_j``: ON and DC of the Table)
and ``g + j`` (``¬f_j``: the Table's OFF set as ON, the same DC). Primes are those of this double-phase function
(every prime of every assignment's function is among them). A Boolean ``y_j`` (output ``j`` realized in complement)
guards the targets: a target of output ``j`` must be covered unless ``y_j``, one of output ``g + j`` unless ``¬y_j``;
the objective counts every chosen prime once whichever outputs it feeds. The optimum of this one model is the
minimum over all ``2**g`` assignments, and its CP-SAT bound is a bound over all of them. An output constant in one
phase costs nothing there (its complement has no ON point).

That model proves small groups at once, but its LP relaxation is weak (``y_j = 1/2`` halves every demand): on the
4x4-bit multiplier (8 outputs) it ended at 110 rows, bound 80, after 120 s. So it gets a short slice
(:data:`JOINT_SHARE`), and groups of up to :data:`MAX_BRANCH_OUTPUTS` outputs then go on in two steps:

1. *Branching node by node* (:func:`_branch_phases`, :data:`BRANCH_SHARE` of the time, all of it up to
   :data:`BRANCH_ALONE_OUTPUTS` outputs): depth-first over the outputs' phases; a node's problem holds the targets
   of the outputs fixed so far, so "no cover with fewer primes than the incumbent" (one CP-SAT call, often proven
   in a few hundredths of a second) prunes the whole subtree, and a leaf is solved to its minimum under that
   cutoff. Greedy covers order the outputs and the phases, so good incumbents come early. Small groups finish
   here; when the time ends inside a leaf with every other subtree settled, that leaf's solver bound gives the
   bound over all assignments.
2. *Closing in one model* (:func:`_prove_phases`, the rest of the time): the all-assignments model asked for a
   cover better than the incumbent, with a fixed search that sets the phases first (incumbent's phase first); with
   every phase fixed its LP is the tight one of that assignment, and one model has no start-up per node. Measured
   on the 4x4-bit multiplier: with an incumbent of 110 rows it proves 107 in about 3 s; from 112 it did not finish
   in 60 s, hence step 1 first.

``optimal`` is true only when one of these covered every assignment; otherwise the bound is the best of the
all-assignments model's, the branching's and the cheap phase bound, each valid for every assignment. Literals are then minimized at that row count for
the assignment found (over all assignments when the one model proved it).

Limits
------
Everything runs against one deadline (the whole call's ``--time-limit``) and one memory budget (``--memory-limit``):
the seed (the heuristic in fast effort, in its child process, half the time left), prime generation, the matrix,
the reductions and every solver call check the deadline as they go, and the steps that can blow up estimate memory
before allocating (:class:`~plaforge.core.errors.SizeLimit` with the figure). The search stops
:data:`_RESERVE_SHARE` of the time early (at most :data:`_RESERVE_MAX` seconds) so that the cover's last steps
(irredundant rows, a cheap bound, the verification) end by the deadline. Past it the best cover so far (the
solver's, else the seed's) is returned with ``optimal`` false and a bound valid for it; with no cover at all the call
raises :class:`~plaforge.core.errors.TimeLimit` (exit status 3, one line).
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from ..core.cube import Cover, Cube
from ..core.errors import InternalError, LimitReached, TimeLimit
from ..core.table import FunctionSets, Table
from .covering import (
    CoverProblem,
    bits_of,
    build_problem,
    greedy_cover,
    independent_targets_bound,
    phase_lower_bound,
    quick_lower_bound,
    reduce_problem,
)
from .options import MinimizeOptions
from .primes import Budget, Primes, multi_output_primes, popcount
from .progress import Progress
from .result import checked_cover, term_count

__all__ = ["ExactResult", "SeedCover", "minimize_exact", "solve_exact"]

#: How the exact path obtains the heuristic cover that seeds it: ``seed(sets, options)`` gives the cubes.
SeedCover = Callable[[FunctionSets, MinimizeOptions], Sequence[Cube]]

#: Bytes of memory budget per candidate prime (its bitsets, element lists and solver variable).
_BYTES_PER_PRIME = 8192
#: Share of the time left kept for the steps after the search (at most :data:`_RESERVE_MAX` seconds).
_RESERVE_SHARE = 0.04
_RESERVE_MAX = 2.0
#: Most outputs of a group for which the phase search branches over the assignments (at most ``2**g`` leaves);
#: larger groups keep the one all-assignments model for the whole time.
MAX_BRANCH_OUTPUTS = 10
#: Before branching, the all-assignments model gets this share of the time left (at least :data:`JOINT_SECONDS`):
#: it proves small tables at once, and otherwise hands over its best cover and its bound.
JOINT_SHARE = 0.02
JOINT_SECONDS = 0.5
#: Then branching node by node gets this share (at least :data:`BRANCH_SECONDS`): it completes on small groups and
#: otherwise finds the incumbent that lets :func:`_prove_phases` close the search.
BRANCH_SHARE = 0.1
BRANCH_SECONDS = 2.0
#: Up to this many outputs (16 assignments) branching gets all the time: closing in one model does not help there
#: (a 9-input, 3-output random table: 166 rows, bound 164 by branching alone; 167 rows when closing took over).
BRANCH_ALONE_OUTPUTS = 4


# -- mapping heuristic cubes to primes -----------------------------------------------------------------------------
def _map_to_primes(cubes: Sequence[Cube], primes: Primes) -> list[int]:
    """For each cube, the prime with fewest literals containing it whose tag holds the cube's outputs."""
    lits = popcount(primes.care)
    out = []
    for cube in cubes:
        inside = ((primes.care & ~np.int64(cube.care)) == 0) & ((np.int64(cube.value) & primes.care) == primes.value)
        for j in bits_of(cube.outputs):
            inside &= primes.has(j)
        idx = np.flatnonzero(inside)
        if idx.size:
            out.append(int(idx[np.argmin(lits[idx])]))
    return out


# -- solving -------------------------------------------------------------------------------------------------------
@dataclass(frozen=True)
class ExactResult:
    """Chosen prime indices and the outputs they realize (the chosen phases; -1: all), with whether rows (and
    literals) were proven minimum and the row lower bound."""

    chosen: tuple[int, ...]
    outputs: int
    optimal: bool
    literals_optimal: bool
    lower_bound: int
    stats: tuple[tuple[str, object], ...]


def _solver(deadline: float) -> Any:
    """A CP-SAT solver set up as the module docs say, stopping at ``deadline``."""
    from ortools.sat.python import cp_model

    solver = cp_model.CpSolver()
    # Two workers, one per core: an LP-based search (its bound proves set-cover minima quickly) and a core-based
    # one (MaxSAT-style unsatisfiable cores raise the bound); interleaved deterministically, so the same input gives
    # the same cover.
    solver.parameters.num_workers = 2
    solver.parameters.subsolvers.extend(["max_lp", "core"])
    solver.parameters.interleave_search = True
    solver.parameters.random_seed = 1
    solver.parameters.max_time_in_seconds = max(0.05, deadline - time.monotonic())
    return solver


def _cp_sat(pb: CoverProblem, primes: list[int], targets: list[int], hint: set[int], deadline: float,
            progress: Progress | _Offset, row_count: int | None,
            phases: int) -> tuple[list[int] | None, int, bool, float]:
    """One CP-SAT solve: minimum primes (``row_count`` None) or minimum literals at ``row_count`` primes.

    ``primes`` and ``targets`` are the open ones; ``hint`` is a known cover, and the model asks for one no worse.
    ``phases`` outputs have a phase variable (guards ``j`` and ``phases + j``; with 0 the guards are ignored: the
    caller passes only the targets it needs). Returns (chosen primes or None, outputs realized, proven, bound).
    """
    from ortools.sat.python import cp_model

    model = cp_model.CpModel()
    x = {p: model.NewBoolVar(f"p{p}") for p in primes}
    y = [model.NewBoolVar(f"y{j}") for j in range(phases)]
    for t in targets:
        lits = [x[p] for p in bits_of(pb.covered_by[t])]
        g = pb.guards[t]
        if g >= 0 and phases:
            lits.append(y[g] if g < phases else y[g - phases].Not())
        model.AddBoolOr(lits)
    # The known cover enters as an upper bound, not as a solution hint: on these set-cover models a hint steered
    # the search into long detours (the 9-input symmetric function took 10 s with it, 4 s with the bound).
    if row_count is None:
        model.Add(sum(x.values()) <= len(hint))
        model.Minimize(sum(x.values()))
    else:
        model.Add(sum(x.values()) == row_count)
        lits_sum = sum(pb.literals[p] * x[p] for p in primes)
        model.Add(lits_sum <= sum(pb.literals[p] for p in hint))
        model.Minimize(lits_sum)
    solver = _solver(deadline)
    what = "rows" if row_count is None else "literals"

    class _Seen(cp_model.CpSolverSolutionCallback):
        def on_solution_callback(self) -> None:
            progress.update(**{f"best {what}": round(self.ObjectiveValue())})

    solver.best_bound_callback = lambda b: progress.update(**{f"{what} bound": math.ceil(b - 1e-6)})
    status = solver.Solve(model, _Seen())
    if status in (cp_model.OPTIMAL, cp_model.FEASIBLE):
        picked = [p for p in primes if solver.BooleanValue(x[p])]
        inv = sum(1 << j for j in range(phases) if solver.BooleanValue(y[j]))
        return picked, _selected(phases, inv), status == cp_model.OPTIMAL, solver.BestObjectiveBound()
    if status == cp_model.INFEASIBLE:
        return None, -1, False, float("inf")
    return None, -1, False, solver.BestObjectiveBound()


def _within(pb: CoverProblem, targets: int, most: int, minimum: bool,
            deadline: float) -> tuple[list[int] | None, bool, int]:
    """Primes covering the target bitset ``targets`` with at most ``most`` of them (the fewest with ``minimum``).

    Returns (primes, True, ...) when found (and, with ``minimum``, proven fewest), (None, True, ...) when proven
    impossible, and (primes or None, False, ...) when the deadline came first; last, a lower bound on the fewest
    primes covering ``targets`` (0 when nothing is known).
    """
    if most < 0:
        return None, True, most + 1
    if not targets:
        return [], True, 0
    from ortools.sat.python import cp_model

    model = cp_model.CpModel()
    x: dict[int, Any] = {}
    for t in bits_of(targets):
        lits = []
        for p in bits_of(pb.covered_by[t]):
            if p not in x:
                x[p] = model.NewBoolVar(f"p{p}")
            lits.append(x[p])
        model.AddBoolOr(lits)
    model.Add(sum(x.values()) <= most)
    if minimum:
        model.Minimize(sum(x.values()))
    solver = _solver(deadline)
    status = solver.Solve(model)
    if status == cp_model.INFEASIBLE:
        return None, True, most + 1
    # with the objective, its bound holds for covers of at most `most` primes: the fewest is at least the smaller
    low = min(most + 1, math.ceil(solver.BestObjectiveBound() - 1e-6)) if minimum else 0
    if status in (cp_model.OPTIMAL, cp_model.FEASIBLE):
        picked = sorted(p for p, v in x.items() if solver.BooleanValue(v))
        proven = status == cp_model.OPTIMAL or not minimum
        return picked, proven, len(picked) if proven and minimum else low
    return None, False, low


def _branch_phases(pb: CoverProblem, g: int, picked: list[int], outputs: int, deadline: float,
                   progress: Progress) -> tuple[list[int], int, bool, int, list[int], int]:
    """Minimum cover over all ``2**g`` phase assignments by depth-first branching on one output's phase at a time.

    A node fixes the phases of some outputs; its problem asks for their targets only (and the unguarded ones), so
    its minimum is a lower bound for every assignment below it. Each node asks CP-SAT only whether a cover with at
    most ``best - 1`` primes exists (a greedy cover that small answers yes without it); "no" prunes the subtree.
    A leaf (all phases fixed) is solved to its minimum under that cutoff, and a better one becomes the incumbent.
    Outputs are fixed most expensive first (greedy cover of one output's cheaper phase) and each node tries the
    phase with the smaller greedy cover first, so good incumbents come early and prune most.

    ``picked`` / ``outputs`` (selected problem outputs, :func:`_selected`): the incumbent to beat. Returns the best
    cover, its outputs, whether the search covered every assignment before ``deadline``, the nodes visited, the
    output order, and a lower bound on the primes over all assignments (pruned subtrees count as the incumbent,
    a leaf stopped by the deadline as its solver's bound; 0 when some subtree was never reached).
    """
    base, by_guard = 0, [0] * (2 * g)
    for t in bits_of(pb.open_targets):
        if pb.guards[t] < 0:
            base |= 1 << t
        else:
            by_guard[pb.guards[t]] |= 1 << t
    ess = len(pb.chosen)

    def estimate(targets: int) -> int:
        return len(greedy_cover(pb, (), targets=targets))

    order = sorted(range(g), key=lambda j: (-min(estimate(base | by_guard[j]), estimate(base | by_guard[g + j])), j))
    best: list = [list(picked), outputs]
    nodes = 0

    def visit(k: int, targets: int, sel: int, guess: int) -> tuple[bool, int]:
        """Search below the node with ``k`` outputs fixed (``sel``): whether it finished before the deadline, and a
        lower bound on the primes of every assignment below it (0 when unknown)."""
        nonlocal nodes
        if time.monotonic() >= deadline:
            return False, 0
        nodes += 1
        progress.update(**{"phase nodes": nodes})
        most = len(best[0]) - 1
        if k == g:
            got, done, low = _within(pb, targets, most, True, deadline)
            if got is not None and len(got) <= most:
                best[:] = [got, sel]
                progress.update(**{"best rows": ess + len(got)})
            return done, low
        if guess > most:
            got, done, low = _within(pb, targets, most, False, deadline)
            if got is None:
                return done, low
        j = order[k]
        kids = sorted((estimate(targets | by_guard[ph * g + j]), ph) for ph in (0, 1))
        lows = []
        for est, ph in kids:
            done, low = visit(k + 1, targets | by_guard[ph * g + j], sel | 1 << (ph * g + j), est)
            lows.append(low)
            if not done:
                return False, min(lows) if len(lows) == 2 else 0
        return True, min(lows)

    complete, low = visit(0, base, 0, estimate(base))
    return best[0], best[1], complete, nodes, order, min(low, len(best[0]))


def _prove_phases(pb: CoverProblem, g: int, picked: list[int], outputs: int, order: Sequence[int],
                  deadline: float) -> tuple[list[int], int, bool, float]:
    """The all-assignments model asked for a cover better than ``picked``, searched phase first.

    One CP-SAT worker with a fixed search: it fixes the phase variables in ``order``, each first to the incumbent's
    phase (``outputs``), and its LP relaxation, with all those phases fixed, prunes against the incumbent; the cover
    primes come after. With a good incumbent this closes the search over all ``2**g`` assignments within one model
    (no per-node start-up). Returns (best cover, its outputs, proven minimum over all assignments, row bound of the
    open part over all assignments).
    """
    from ortools.sat.python import cp_model

    model = cp_model.CpModel()
    prime_list = list(bits_of(pb.open_primes))
    x = {p: model.NewBoolVar(f"p{p}") for p in prime_list}
    # w_j: output j's phase differs from the incumbent's (the search tries w_j = 0 first)
    w = [model.NewBoolVar(f"w{j}") for j in range(g)]
    flip = [bool(outputs >> (g + j) & 1) for j in range(g)]

    def complement(j: int) -> Any:
        return w[j].Not() if flip[j] else w[j]

    for t in bits_of(pb.open_targets):
        lits = [x[p] for p in bits_of(pb.covered_by[t])]
        gd = pb.guards[t]
        if gd >= 0:
            lits.append(complement(gd) if gd < g else complement(gd - g).Not())
        model.AddBoolOr(lits)
    model.Add(sum(x.values()) <= len(picked) - 1)
    model.Minimize(sum(x.values()))
    model.AddDecisionStrategy([w[j] for j in order], cp_model.CHOOSE_FIRST, cp_model.SELECT_MIN_VALUE)
    solver = cp_model.CpSolver()
    solver.parameters.num_workers = 1
    solver.parameters.search_branching = cp_model.FIXED_SEARCH
    solver.parameters.linearization_level = 2
    solver.parameters.random_seed = 1
    solver.parameters.max_time_in_seconds = max(0.05, deadline - time.monotonic())
    status = solver.Solve(model)
    if status == cp_model.INFEASIBLE:
        return picked, outputs, True, float(len(picked))
    if status in (cp_model.OPTIMAL, cp_model.FEASIBLE):
        got = [p for p in prime_list if solver.BooleanValue(x[p])]
        inv = sum(1 << j for j in range(g) if solver.BooleanValue(w[j]) != flip[j])
        return got, _selected(g, inv), status == cp_model.OPTIMAL, solver.BestObjectiveBound()
    return picked, outputs, False, min(float(len(picked)), solver.BestObjectiveBound())


def _selected(phases: int, inv: int) -> int:
    """Outputs of a double-phase problem realized under assignment ``inv`` (-1: all, when there is no phase)."""
    if not phases:
        return -1
    return sum(1 << (phases + j if inv >> j & 1 else j) for j in range(phases))


def solve_exact(f: Sequence[Sequence[Cube]], on: Sequence[Sequence[Cube]], n: int, heuristic: Sequence[Cube],
                heuristic_outputs: int, phases: int, budget: Budget, max_primes: int,
                progress: Progress) -> tuple[CoverProblem, ExactResult]:
    """Minimum cover of the function with ``F_j`` covered by ``f[j]`` and ON sets ``on[j]``; see the module docs.

    ``phases``: 0, or the group size ``g`` of a double-phase problem (outputs ``j`` and ``g + j``); the heuristic's
    cubes realize ``heuristic_outputs`` (:func:`_selected` of its assignment).
    """
    progress.stage("generating multi-output primes")
    primes = multi_output_primes(f, on, n, budget, max_primes)
    progress.update(primes=len(primes))
    progress.stage("building the covering problem")
    pb = build_problem(primes, on, n, budget, guarded=phases > 0)
    n_targets0, n_primes0 = pb.open_targets.bit_count(), pb.open_primes.bit_count()
    progress.update(elements=pb.n_elements, targets=n_targets0)
    progress.stage("reducing (essentials, dominance)")
    reduce_problem(pb, budget.deadline)
    if time.monotonic() > budget.deadline:  # no time for a cover of its own; the caller keeps the seed
        stop = TimeLimit("the exact path ran out of time reducing the covering problem", "--time-limit")
        stop.lower_bound = len(pb.chosen) + independent_targets_bound(pb)  # type: ignore[attr-defined]
        raise stop
    targets = list(bits_of(pb.open_targets))
    open_primes = list(bits_of(pb.open_primes))
    ess = len(pb.chosen)
    progress.update(essential=ess, **{"targets left": len(targets), "primes left": len(open_primes)})
    stats: list[tuple[str, object]] = [
        ("primes", len(primes)), ("elements", pb.n_elements), ("targets", n_targets0), ("useful_primes", n_primes0),
        ("essential", ess), ("targets_reduced", len(targets)), ("primes_reduced", len(open_primes)),
    ]
    if not targets:
        return pb, ExactResult(tuple(pb.chosen), _selected(phases, 0), True, True, ess, tuple(stats))
    indep = independent_targets_bound(pb)
    greedy = greedy_cover(pb, (), heuristic_outputs)
    mapped = [p for p in dict.fromkeys(_map_to_primes(heuristic, primes)) if pb.open_primes >> p & 1]
    completed = greedy_cover(pb, mapped, heuristic_outputs)
    hint = completed if len(completed) < len(greedy) else greedy
    outputs = heuristic_outputs
    progress.update(**{"best rows": ess + len(hint), "rows bound": ess + indep})
    picked: list[int] | None = None
    proven, bound = False, 0.0
    branch = 0 < phases <= MAX_BRANCH_OUTPUTS
    now = time.monotonic()
    if now < budget.deadline:
        progress.stage("solving minimum cover (CP-SAT)" + (", all phase assignments in one model" if phases else ""))
        until = budget.deadline
        if branch:
            until = min(until, now + max(JOINT_SECONDS, JOINT_SHARE * (budget.deadline - now)))
        picked, outputs, proven, bound = _cp_sat(pb, open_primes, targets, set(hint), until,
                                                 _Offset(progress, ess), None, phases)
    if picked is None or len(picked) > len(hint):
        picked, outputs, proven = list(hint), heuristic_outputs, False
    branched = branch and not proven and time.monotonic() < budget.deadline
    if branched:
        progress.stage("branching over output phase assignments (CP-SAT per node)")
        now = time.monotonic()
        share = 1.0 if phases <= BRANCH_ALONE_OUTPUTS else BRANCH_SHARE
        until = min(budget.deadline, now + max(BRANCH_SECONDS, share * (budget.deadline - now)))
        picked, outputs, proven, nodes, order, low = _branch_phases(pb, phases, picked, outputs, until, progress)
        stats.append(("phase_nodes", nodes))
        bound = max(bound, low)
        if not proven and time.monotonic() < budget.deadline:
            progress.stage("closing the phase search in one model (CP-SAT, phases first)")
            picked, outputs, proven, closing = _prove_phases(pb, phases, picked, outputs, order, budget.deadline)
            bound = max(bound, closing)
            progress.update(**{"best rows": ess + len(picked)})
    lb = ess + max(indep, math.ceil(bound - 1e-6) if math.isfinite(bound) else 0)
    if proven:
        lb = ess + len(picked)
    lb = min(lb, ess + len(picked))
    # Literals at this row count are at least the sum of the len(picked) smallest literal counts; when the cover
    # already meets that bound (e.g. all primes equally wide) there is nothing for stage 2 to find.
    floor = sum(sorted(pb.literals[p] for p in open_primes)[: len(picked)])
    lit_opt = sum(pb.literals[p] for p in picked) == floor
    if not lit_opt and time.monotonic() < budget.deadline - 0.2:
        progress.stage("minimizing literals at that row count (CP-SAT)")
        if branched:  # the assignment the branching found, fixed
            need = [t for t in targets if pb.guards[t] < 0 or outputs >> pb.guards[t] & 1]
            picked2, _, lit_opt, _ = _cp_sat(pb, open_primes, need, set(picked), budget.deadline, progress,
                                             len(picked), 0)
            outputs2 = outputs
        else:
            picked2, outputs2, lit_opt, _ = _cp_sat(pb, open_primes, targets, set(picked), budget.deadline,
                                                    progress, len(picked), phases)
        if picked2 is not None and sum(pb.literals[p] for p in picked2) <= sum(pb.literals[p] for p in picked):
            picked, outputs = picked2, outputs2
    stats.append(("independent_bound", ess + indep))
    if not proven:  # the solver stops short of a proof only at the deadline
        stats.append(("stopped", "time limit"))
    return pb, ExactResult(tuple(pb.chosen) + tuple(picked), outputs, proven, proven and lit_opt, lb, tuple(stats))


class _Offset:
    """Progress proxy adding the essential primes to the row counts shown."""

    def __init__(self, inner: Progress, offset: int) -> None:
        self.inner, self.offset = inner, offset

    def update(self, **fields: int) -> None:
        self.inner.update(**{k: v + self.offset for k, v in fields.items()})

    def stage(self, text: str) -> None:
        self.inner.stage(text)


def _irredundant(pb: CoverProblem, chosen: Sequence[int], outputs: int) -> list[Cube]:
    """Cubes of the chosen primes feeding only the realized ``outputs``, each only where it is not redundant."""
    count = np.zeros(pb.n_elements, dtype=np.int64)
    mine = {p: [(j, ids) for j, ids in pb.elements[p] if outputs >> j & 1] for p in chosen}
    for p in chosen:
        for _, ids in mine[p]:
            np.add.at(count, ids, 1)
    feeds = {p: sum(1 << j for j, _ in mine[p]) for p in chosen}
    for p in sorted(chosen, key=lambda p: (-pb.literals[p], p)):
        for j, ids in mine[p]:
            if ids.size == 0 or (count[ids] >= 2).all():
                feeds[p] &= ~(1 << j)
                np.add.at(count, ids, -1)
    return [Cube(int(pb.primes.care[p]), int(pb.primes.value[p]), feeds[p]) for p in chosen if feeds[p]]


# -- the public entry ----------------------------------------------------------------------------------------------
@dataclass
class _Group:
    """One covering problem: table outputs ``outputs``; with ``phase`` the double-phase function of them."""

    outputs: list[int]
    phase: bool

    def to_problem(self, cube: Cube, inverted: int) -> Cube:
        """A cube of the table realizing outputs under ``inverted``, as a cube of this problem (or outputs 0)."""
        g = len(self.outputs)
        out = 0
        for k, j in enumerate(self.outputs):
            if cube.outputs >> j & 1:
                out |= 1 << (g + k if self.phase and inverted >> j & 1 else k)
        return Cube(cube.care, cube.value, out)

    def to_table(self, cube: Cube) -> Cube:
        g = len(self.outputs)
        return Cube(cube.care, cube.value, sum(1 << self.outputs[k % g] for k in bits_of(cube.outputs)))

    def inverted(self, realized: int) -> int:
        """Table outputs realized in complement, from the problem outputs realized."""
        g = len(self.outputs)
        if not self.phase:
            return 0
        return sum(1 << j for k, j in enumerate(self.outputs) if realized >> (g + k) & 1)

    def selected(self, inverted: int) -> int:
        return _selected(len(self.outputs) if self.phase else 0,
                         sum(1 << k for k, j in enumerate(self.outputs) if inverted >> j & 1))


def minimize_exact(table: Table, options: MinimizeOptions, inverted: int, seed: SeedCover,
                   deadline: float) -> Cover:
    """Proven-minimum cover of ``table`` (rows, then literals) under ``options.cost``; verified.

    Parameters
    ----------
    table : Table
        The function.
    options : MinimizeOptions
        Cost model, phase (minimum over all assignments), memory limit, progress display.
    inverted : int
        With ``options.phase``: the assignment the seed realizes (a good start, not a constraint); otherwise the
        outputs realized in complement (bit ``j``: output ``j``).
    seed : SeedCover
        Gives the heuristic cover that seeds the solver (and is the fallback); it gets half the time left.
    deadline : float
        ``time.monotonic()`` by which the call returns (the whole call's time limit).

    Raises
    ------
    plaforge.core.errors.TimeLimit
        The deadline passed before any cover was found.
    plaforge.core.errors.SizeLimit
        A step was estimated above ``options.memory_limit``.
    """
    n, m = table.n_inputs, table.n_outputs
    # the work (seed, primes, reduction, solving) stops this much before the deadline, so the cover's last steps
    # (irredundant rows, a cheap bound, the verification) end by it
    end = deadline
    deadline -= min(_RESERVE_MAX, _RESERVE_SHARE * max(0.0, deadline - time.monotonic()))
    budget = Budget(deadline, options.memory_limit << 20)
    max_primes = (options.memory_limit << 20) // _BYTES_PER_PRIME
    fs = table.cover_sets(inverted)
    per_output = options.cost == "per-output"
    left = max(0.05, deadline - time.monotonic())
    try:
        # fast effort: the seed only bounds the solver (and is the fallback); on the 6x6-bit multiplier it gives the
        # same rows as normal effort in 2.7 s instead of 6.6 s, time the primes and the solver need
        effort = "high" if options.effort == "high" else "fast"
        heur: Sequence[Cube] | None = seed(fs, replace(options, time_limit=max(0.05, left / 2), effort=effort))
    except (InternalError, LimitReached):
        heur = None
    sets = (table.cover_sets(0), table.cover_sets((1 << m) - 1)) if options.phase else (fs, fs)
    cubes: list[Cube] = []
    optimal = lits_optimal = True
    bound = 0
    final_inv = 0
    stats: list[tuple[str, object]] = []
    with Progress(options.progress, f"exact minimization of {table.source or 'table'}") as progress:
        groups = [_Group([j], options.phase) for j in range(m)] if per_output else [_Group(list(range(m)),
                                                                                            options.phase)]
        for k, grp in enumerate(groups):
            now = time.monotonic()
            sub_deadline = now + max(0.0, (deadline - now) / (len(groups) - k))  # none past the deadline
            on = [sets[0].on[j] for j in grp.outputs]
            f = [sets[0].on[j] + sets[0].dc[j] for j in grp.outputs]
            if options.phase:
                on += [sets[1].on[j] for j in grp.outputs]
                f += [sets[1].on[j] + sets[1].dc[j] for j in grp.outputs]
            seed_cubes = [c for c in (grp.to_problem(c, inverted) for c in heur or ()) if c.outputs]
            seed_sel = grp.selected(inverted)
            if per_output:
                progress.stage(f"output {table.output_names[grp.outputs[0]]}")
            try:
                pb, res = solve_exact(f, on, n, seed_cubes, seed_sel, len(grp.outputs) if grp.phase else 0,
                                      replace(budget, deadline=sub_deadline), max_primes, progress)
            except TimeLimit as exc:
                if heur is None:
                    raise
                got, sel = seed_cubes, seed_sel
                optimal = lits_optimal = False
                bound += getattr(exc, "lower_bound", 0)
                stats.append((f"{k}:stopped" if per_output else "stopped", "time limit"))
            else:
                got, sel = _irredundant(pb, res.chosen, res.outputs), res.outputs
                if heur is not None and term_count(got, per_output) > term_count(seed_cubes, per_output):
                    got, sel = seed_cubes, seed_sel  # the solver did worse than its seed: keep the seed
                optimal &= res.optimal
                lits_optimal &= res.literals_optimal
                bound += res.lower_bound
                stats += [(f"{k}:{key}" if per_output else key, v) for key, v in res.stats]
            cubes += [grp.to_table(c) for c in got]
            final_inv |= grp.inverted(sel) if grp.phase else inverted & sum(1 << j for j in grp.outputs)
        if not optimal:  # a group stopped without its solver's bound: the cheap bounds, in the time that is left
            left = max(0.05, (end - time.monotonic()) / 2)
            quick = (phase_lower_bound(sets[0], sets[1], per_output, left) if options.phase
                     else quick_lower_bound(fs, per_output, left))
            bound = max(bound, quick)
    return checked_cover(table, cubes, options, final_inv, "exact", optimal, bound,
                         tuple(stats) + (("literals_optimal", lits_optimal),))
