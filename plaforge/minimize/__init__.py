"""Two-level minimization: a Table in, a verified multi-output Cover out.

Paths
-----
heuristic (default)
    The Espresso-II heuristic (pyeda's compiled minimizer) fed the Table's cubes, all outputs jointly; any width,
    never enumerating. See :mod:`plaforge.minimize.heuristic` (and :mod:`plaforge.minimize.child`, which runs it in
    a child process).
exact
    Multi-output prime implicants, a reduced covering problem (:mod:`plaforge.minimize.covering`) and a CP-SAT
    model, seeded with the heuristic's cover; proven minimum rows (then literals) or, at the time limit, the best
    cover with a lower bound. See :mod:`plaforge.minimize.exact`.
phase
    Output phase assignment: realize some outputs in complement when that lowers the cost. See
    :mod:`plaforge.minimize.phase`.

Every cover returned has been re-verified against the Table (ON ⊆ cover ⊆ ON ∪ DC per output) by
:mod:`plaforge.minimize.result`. The sets each path works on come from the Table itself
(:meth:`plaforge.core.table.Table.cover_sets`), computed once per phase choice.
"""

from __future__ import annotations

import time

from ..core.cube import Cover
from ..core.table import Table
from .options import CostModel, MinimizeOptions
from .summary import cover_summary, format_summary

__all__ = ["CostModel", "MinimizeOptions", "cover_summary", "format_summary", "minimize"]


def minimize(table: Table, options: MinimizeOptions | None = None) -> Cover:
    """Minimize ``table`` into a two-level cover.

    Parameters
    ----------
    table : Table
        The function; never modified.
    options : MinimizeOptions, optional
        Path, cost model, phase assignment, time limit; defaults to the heuristic with shared cost.

    Returns
    -------
    Cover
        With ``method`` (``"heuristic"``/``"exact"``), ``optimal`` (proven only), ``lower_bound``, ``seconds``
        (whole call), ``cost`` and ``inverted`` (outputs realized in complement) filled in.

    Raises
    ------
    plaforge.core.errors.InternalError
        The compiled minimizer crashed, or a path returned a wrong cover.
    plaforge.core.errors.TimeLimit
        The compiled minimizer did not finish within ``options.time_limit``.
    plaforge.core.errors.SizeLimit
        ``exact`` on a table wider than ``options.exact_limit`` inputs, or the compiled minimizer ran out of memory.
    """
    if not isinstance(table, Table):
        raise TypeError(f"minimize() needs a Table, not {type(table).__name__}")
    opts = options if options is not None else MinimizeOptions()
    if not isinstance(opts, MinimizeOptions):
        raise TypeError(f"options must be MinimizeOptions, not {type(opts).__name__}")
    t0 = time.perf_counter()
    inverted = 0
    if opts.phase:
        from .phase import assign_phases

        inverted = assign_phases(table, opts)
    from .heuristic import heuristic_cubes, minimize_heuristic

    if opts.exact:
        from .exact import minimize_exact

        cover = minimize_exact(table, opts, inverted, seed=heuristic_cubes)
    else:
        cover = minimize_heuristic(table, opts, inverted)
    return cover.with_(seconds=time.perf_counter() - t0)
