"""Two-level minimization: a Table in, a verified multi-output Cover out.

Paths
-----
heuristic (default)
    The Espresso-II heuristic (pyeda's compiled minimizer) fed the Table's cubes, all outputs jointly; any width,
    never enumerating. See :mod:`plaforge.minimize.heuristic` (and :mod:`plaforge.minimize.child`, which runs it in
    a child process).
exact
    Multi-output prime implicants generated from cubes (:mod:`plaforge.minimize.primes`), a reduced covering
    problem (:mod:`plaforge.minimize.covering`) and a CP-SAT model, seeded with the heuristic's cover; proven
    minimum rows (then literals) or, at the time limit, the best cover with a lower bound. With ``phase`` the search
    covers all output phase assignments (one model over the double-phase primes, then branching over the
    assignments), so ``optimal`` means minimum over all of them and the bound holds for all of them. See
    :mod:`plaforge.minimize.exact`.
phase
    Output phase assignment: realize some outputs in complement when that lowers the cost; a budgeted search (a
    few heuristic minimizations) for the heuristic path and as the exact path's seed. See
    :mod:`plaforge.minimize.phase`.

Every cover returned has been re-verified against the Table (ON ⊆ cover ⊆ ON ∪ DC per output) by
:mod:`plaforge.minimize.result`. The sets each path works on come from the Table itself
(:meth:`plaforge.core.table.Table.cover_sets`), computed once per phase choice.
"""

from __future__ import annotations

import time
from dataclasses import replace

from ..core.cube import Cover
from ..core.errors import TimeLimit
from ..core.table import Table
from .options import CostModel, MinimizeOptions
from .result import term_count
from .summary import cover_summary, format_summary

__all__ = ["CostModel", "MinimizeOptions", "cover_summary", "format_summary", "minimize"]


def minimize(table: Table, options: MinimizeOptions | None = None) -> Cover:
    """Minimize ``table`` into a two-level cover.

    Parameters
    ----------
    table : Table
        The function; never modified.
    options : MinimizeOptions
        Path, cost model, phase assignment, time and memory limits; defaults to the heuristic with shared cost.
        ``time_limit`` bounds the whole call.

    Returns
    -------
    Cover
        With ``method`` (``"heuristic"``/``"exact"``), ``optimal`` (proven only; with ``phase``, over all phase
        assignments), ``lower_bound`` (on the counted cost; with ``phase``, valid for every assignment; 0 when none
        is known), ``seconds`` (whole call), ``cost``, ``inverted`` (outputs realized in complement) and, in
        ``extra``, ``("stopped", what)`` for each search cut short by a limit.

    Raises
    ------
    plaforge.core.errors.InternalError
        The compiled minimizer crashed, or a path returned a wrong cover.
    plaforge.core.errors.TimeLimit
        No cover could be found within ``options.time_limit``.
    plaforge.core.errors.SizeLimit
        The exact path estimated a step above ``options.memory_limit``, or the compiled minimizer ran out of memory.
    """
    if not isinstance(table, Table):
        raise TypeError(f"minimize() needs a Table, not {type(table).__name__}")
    opts = options if options is not None else MinimizeOptions()
    if not isinstance(opts, MinimizeOptions):
        raise TypeError(f"options must be MinimizeOptions, not {type(opts).__name__}")
    t0 = time.perf_counter()
    deadline = time.monotonic() + opts.time_limit
    inverted = 0
    notes: tuple[tuple[str, object], ...] = ()
    if opts.phase:
        from .phase import assign_phases

        # the exact path only takes the assignment as its seed: half as much time for the search there
        inverted, complete = assign_phases(table, opts, deadline - opts.time_limit / 2 if opts.exact else deadline)
        notes = () if complete else (("stopped", "phase search"),)
    from .heuristic import heuristic_cubes, minimize_heuristic

    if opts.exact:
        from .exact import minimize_exact

        cover = minimize_exact(table, opts, inverted, heuristic_cubes, deadline)
    else:
        left = deadline - time.monotonic()
        if left <= 0:
            raise TimeLimit(f"no cover of {table.source or 'the table'} within {opts.time_limit:g} s", "--time-limit")
        cover = minimize_heuristic(table, replace(opts, time_limit=left), inverted)
        if opts.phase:
            from .covering import phase_lower_bound

            bound = phase_lower_bound(table.cover_sets(0), table.cover_sets((1 << table.n_outputs) - 1),
                                      opts.cost == "per-output")
            count = term_count(cover.cubes, opts.cost == "per-output")
            cover = cover.with_(lower_bound=min(bound, count), optimal=count <= bound)
    return cover.with_(seconds=time.perf_counter() - t0, extra=cover.extra + notes)
