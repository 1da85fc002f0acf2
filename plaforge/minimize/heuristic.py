"""Heuristic two-level minimization: the Espresso-II heuristic (pyeda's compiled minimizer) driven by cubes.

Positional cube notation
------------------------
pyeda's low-level ``espresso(ninputs, noutputs, cover, intype)`` takes a set of rows ``(inpart, outpart)``. The
input part holds one integer per input: ``1`` = the literal ``x'`` (input must be 0), ``2`` = ``x`` (must be 1),
``3`` = no literal. The output part holds one entry per output: ``1`` = ON, ``2`` = don't-care when don't-care rows
are given (``intype`` F|D), ``0`` = OFF when OFF rows are given (F|R); otherwise ``0`` under F|D and ``2`` under F|R
say nothing. A plaforge :class:`~plaforge.core.cube.Cube` maps to it bit by bit, so nothing is ever enumerated.

What the minimizer is fed
-------------------------
The sets as the rows gave them (:func:`plaforge.core.sets.given_sets`): ON with don't-cares (``.type f``/``fd``:
intype F|D, the minimizer works out OFF) or ON with OFF (``fr``/``fdr``: F|R, it works out the don't-cares), rows
with identical input parts merged into one row over all outputs. Nothing is complemented or subtracted in Python on
the way in, except that ON rows that overlap don't-care rows are also cut by the complement of those (bounded, see
:meth:`plaforge.core.table.Table.on_pieces`), which the minimizer handles faster on some tables and slower on
others (see :func:`minimize_heuristic`). Tables whose outputs leave different sets implicit, or the ON set, are fed
the separated sets of :meth:`plaforge.core.table.Table.cover_sets` instead (F|D). Under the ``per-output`` cost each output is minimized
alone and identical terms are merged only afterwards.

Column order
------------
The minimizer's work (and memory) can depend on the order of the columns, badly so on wide tables. Above
``ORDER_FROM`` inputs its columns are therefore sorted by a key computed from the rows alone (inputs tested by more
rows first, then inputs more often tested at 1, then spec order) and the result mapped back, so permuting a spec's
columns does not change the work beyond such ties. At or below it the spec's order is kept: there the cost does not
blow up, and the starts below were measured in that order (sorting cost a row on some suite tables). Start B, the
signature regions, always runs in the spec's order, so the path before the sorting is always among the candidates;
above ``ORDER_FROM`` inputs the spec's order runs beside the sorted one when nothing else takes the second core.

Effort
------
The minimizer is a local descent, so where it starts matters. ``fast``: one run from the rows above (start A).
``normal``: A in one child process and a second start in a second child: up to :data:`SIGNATURE_LIMIT` inputs and
64 outputs start B, the regions of constant output signature written as cubes, each carrying the whole signature;
above ``ORDER_FROM`` inputs, when ON rows overlap don't-care rows, the other feed of those rows (as given or cut, see
above), and otherwise the same rows in the spec's column order. The first of the two to answer is "the first
answer"; everything else is dropped when it already meets the lower bound. Unfinished work is stopped and the best
finished result kept (fewer rows, then fewer literals).

* On a small table (:func:`is_small`, decided by size so that results do not depend on the machine's load) both
  starts begin at once, and the other start and one more descent from each result (fed back with the same
  don't-care or OFF rows) get :data:`EXTRA_FLOOR` seconds after the first answer.
* On a large table B begins only once A has run :data:`SECOND_AFTER` seconds without answering, only when a core is
  idle (:func:`spare_core`), and at low priority (:data:`SECOND_NICE`). On this kind of machine any parallel work
  slows the minimizer down (measured: about a tenth for a second minimizer, a fifth for the bound, through the
  shared memory system), so a quick A runs alone and B is kept for the tables where A is slow, which is where a
  different start can gain most (a factor up to 80 in time on wide tables). After the first answer B gets
  :func:`extra_window` more, :data:`EXTRA_SHARE` of that answer's time beyond :data:`SECOND_AFTER` seconds; no
  descent runs. So ``normal`` costs about what ``fast`` costs on a table answered within two seconds and, above
  that, the slowdown a second minimizer causes (about a tenth) plus 5 % of the time beyond the first two seconds.

``high``: both starts at once on every table, with descents repeated while they help, bounded only by the time
limit.

Time limit
----------
Unless ``scale_time_limit`` is cleared (the CLI clears it when ``--time-limit`` is given), the limit is the larger
of ``time_limit`` and ``(inputs + outputs) * rows / SCALE_DIVISOR`` seconds (rows: the cubes given), and a
``TimeLimit`` message says which rule set it.

Lower bound
-----------
Computed in this process while the starts run (:func:`plaforge.minimize.covering.quick_lower_bound`, or
:func:`plaforge.minimize.off_bound.off_lower_bound` for ON/OFF tables), for at most :data:`BOUND_SECONDS` on a small
table. On a large one it gets :data:`BOUND_EARLY` seconds beside A, stopping sooner once a start has answered and
it has had :data:`BOUND_SHARE` of that answer's time (so it does not delay the answer), and within B's window
after the first answer (A done) up to :data:`BOUND_SECONDS` more. A greedy bound stopped early is still a bound,
only a weaker one.

Isolation and trust
-------------------
The compiled minimizer keeps global configuration (``set_config``), reset to its defaults before every call, and
may end the whole process on some internal errors. It therefore runs in child processes
(:class:`plaforge.minimize.child.Isolated`: a timeout is a ``TimeLimit``, growing past ``memory_limit`` megabytes a
``SizeLimit`` naming ``--memory-limit``, a crash an ``InternalError``). Its answer is re-verified against the Table
(:func:`plaforge.minimize.result.verify_given`); one that fails is an ``InternalError``.
"""

from __future__ import annotations

import os
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace
from types import MappingProxyType
from typing import Any

import numpy as np

from ..core.cube import Cover, Cube, lists_intersect, merge_identical
from ..core.errors import InternalError, SizeLimit, TimeLimit
from ..core.sets import GivenSets, given_sets
from ..core.table import FunctionSets, Table, signature_regions
from .child import Isolated
from .covering import quick_lower_bound
from .off_bound import off_lower_bound
from .options import MinimizeOptions
from .progress import Progress
from .result import checked_cover, sort_cubes, term_count

__all__ = ["MINIMIZER_DEFAULTS", "decode_row", "encode_cube", "heuristic_cubes", "minimize_heuristic"]

#: Most inputs for which start B (signature regions) is tried (it enumerates the points).
SIGNATURE_LIMIT = 16
#: Above this many inputs the columns are sorted by a key from the rows (the cost of wide tables depends on the
#: order); at or below it the spec's own order is kept, which the starts were tuned on.
ORDER_FROM = 16
#: ``normal`` effort: after the first answer, other starts may run this share of its time more (on a large table
#: only of the time beyond ``SECOND_AFTER`` seconds, less the time spent preparing the starts) ...
EXTRA_SHARE = 0.05
#: ... or, on a small table (:func:`is_small`), this many seconds, descents included.
EXTRA_FLOOR = 1.0
#: On a large table the second start begins only once the first has run this many seconds without answering.
SECOND_AFTER = 2.0
#: A small table has at most this many inputs ...
SMALL_INPUTS = 12
#: ... and at most this many (inputs + outputs) x rows given.
SMALL_SIZE = 16384
#: Idle cores (cores minus load average) needed before a large table gets a second start.
SPARE = 0.5
#: Seconds between two looks at the starts while waiting for the first answer.
POLL = 0.02
#: Niceness added to the second start on a large table: it gets only the CPU time the first start and the lower
#: bound leave idle (it still shares the memory system with them).
SECOND_NICE = 19

#: Seconds the lower bound may take (computed while the starts run) ...
BOUND_SECONDS = 0.5
#: ... on a large table, beside start A ...
BOUND_EARLY = 0.1
#: ... stopping sooner once a start has answered and the bound has had this share of the answer's time, at least
#: ``BOUND_FLOOR`` seconds (with the starts in child processes it has had that by the time the answer comes, so it
#: adds nothing to the wall time).
BOUND_SHARE = 0.2
BOUND_FLOOR = 0.05
#: Default time limit: at least ``(inputs + outputs) * rows / SCALE_DIVISOR`` seconds.
SCALE_DIVISOR = 500

#: pyeda's own defaults for the compiled minimizer's global switches (restored before every call).
MINIMIZER_DEFAULTS: MappingProxyType[str, bool] = MappingProxyType({
    "single_expand": False,
    "remove_essential": True,
    "force_irredundant": True,
    "unwrap_onset": True,
    "recompute_onset": False,
    "use_super_gasp": False,
    "skip_make_sparse": False,
})

#: A row of the compiled minimizer: input part, output part (positional cube notation, see the module docs).
Row = tuple[tuple[int, ...], tuple[int, ...]]
#: ``bound_of(seconds, stop)``: a lower bound computed within ``seconds`` or until ``stop()`` is true.
BoundOf = Callable[[float, "Callable[[], bool] | None"], int]


@dataclass(frozen=True)
class Job:
    """One problem for the compiled minimizer: ``kind`` ``"fd"`` (F|D) or ``"fr"`` (F|R), columns permuted by
    ``order`` (column ``k`` is input ``order[k]``)."""

    n: int
    m: int
    kind: str
    rows: frozenset[Row]
    order: tuple[int, ...]


#: ``second_of()``: the second start's job and a name for it, or ``None`` when there is none.
SecondOf = Callable[[], "tuple[Job, str] | None"]


def encode_cube(cube: Cube, n: int, order: Sequence[int] | None = None) -> tuple[int, ...]:
    """Input part of ``cube`` in positional cube notation (1 = ``x'``, 2 = ``x``, 3 = no literal), column ``k``
    holding input ``order[k]`` (identity by default)."""
    care, value = cube.care, cube.value
    cols = range(n) if order is None else order
    return tuple((2 if value >> i & 1 else 1) if care >> i & 1 else 3 for i in cols)


def decode_row(inpart: Sequence[int], outpart: Sequence[int], order: Sequence[int] | None = None) -> Cube:
    """A Cube from a positional-notation row (column ``k`` is input ``order[k]``); outputs are those marked 1."""
    care = value = 0
    for k, v in enumerate(inpart):
        i = k if order is None else order[k]
        if v == 1:
            care |= 1 << i
        elif v == 2:
            care |= 1 << i
            value |= 1 << i
        elif v != 3:
            raise InternalError(f"minimizer returned input entry {v!r} at column {k}; expected 1, 2 or 3")
    outputs = 0
    for j, v in enumerate(outpart):
        if v == 1:
            outputs |= 1 << j
    return Cube(care, value, outputs)


def bit_matrix(masks: Sequence[int], width: int) -> np.ndarray:
    """``(len(masks), width)`` booleans: bit ``i`` of each (non-negative) mask, any width."""
    if width <= 62:
        arr = np.fromiter(masks, dtype=np.int64, count=len(masks))
        return (arr[:, None] >> np.arange(width, dtype=np.int64)) & 1 == 1
    nbytes = max(1, (width + 7) // 8)
    raw = np.frombuffer(b"".join(x.to_bytes(nbytes, "little") for x in masks), dtype=np.uint8)
    bits = np.unpackbits(raw.reshape(len(masks), nbytes), axis=1, bitorder="little")
    return bits[:, :width].astype(bool)


def _sorted_columns(care: np.ndarray, value: np.ndarray) -> tuple[int, ...]:
    """Column order from the rows' bit matrices: inputs tested by more rows first, then inputs more often tested
    at 1, then spec order."""
    cares, ones = care.sum(axis=0).tolist(), value.sum(axis=0).tolist()
    return tuple(sorted(range(care.shape[1]), key=lambda i: (-cares[i], -ones[i], i)))


def _job(n: int, m: int, kind: str, marked: Sequence[tuple[Sequence[Cube], int]], spec_order: bool = False
         ) -> Job:
    """A job from cube lists each with the mark its outputs get (1 ON, 2 DC, 0 OFF); identical input parts merged
    into one row, a later list's mark winning except that ON never overrides a don't-care under F|D. Columns sorted
    above ``ORDER_FROM`` inputs unless ``spec_order``. Built in arrays (one pass over the cubes in Python)."""
    index: dict[tuple[int, int], int] = {}
    groups = []
    for cubes, mark in marked:
        where = np.fromiter((index.setdefault((c.care, c.value), len(index)) for c in cubes), dtype=np.int64,
                            count=len(cubes))
        groups.append((where, bit_matrix([c.outputs for c in cubes], m), mark))
    parts = list(index)
    care = bit_matrix([cv[0] for cv in parts], n)
    value = bit_matrix([cv[1] for cv in parts], n)
    entry = np.full((len(parts), m), 2 if kind == "fr" else 0, dtype=np.int8)
    for where, outs, mark in groups:
        if not where.size:
            continue
        hit = np.zeros((len(parts), m), dtype=bool)
        order = np.argsort(where, kind="stable")
        first = np.flatnonzero(np.r_[True, np.diff(where[order]) != 0])
        hit[where[order][first]] = np.logical_or.reduceat(outs[order], first, axis=0)
        if mark == 1 and kind == "fd":
            hit &= entry != 2
        entry[hit] = mark
    order_cols = _sorted_columns(care, value) if n > ORDER_FROM and not spec_order else tuple(range(n))
    inpart = np.where(care, value.astype(np.int8) + 1, 3).astype(np.int8)[:, list(order_cols)]
    rows = frozenset(zip(map(tuple, inpart.tolist()), map(tuple, entry.tolist())))
    return Job(n, m, kind, rows, order_cols)


def given_job(gs: GivenSets, spec_order: bool = False) -> Job:
    """Start A for sets as given: ON rows with DC rows (F|D) or with OFF rows (F|R)."""
    other = 2 if gs.kind == "fd" else 0
    return _job(gs.n, gs.m, gs.kind, [(_flat(gs.on), 1), (_flat(gs.other), other)], spec_order)


def _flat(lists: Sequence[Sequence[Cube]]) -> list[Cube]:
    return [c for cubes in lists for c in cubes]


def sets_job(fs: FunctionSets) -> Job:
    """Start A for separated sets (F|D)."""
    return _job(fs.n, fs.m, "fd", [(fs.joint_on, 1), (fs.joint_dc, 2)])


def signature_job(n: int, m: int, regions: Sequence[tuple[int, int, tuple[Cube, ...]]], order: tuple[int, ...]
                  ) -> Job:
    """Start B: each region of constant signature as rows carrying the whole signature (``1`` ON, ``2`` DC), with
    the don't-cares also as rows of their own (F|D)."""
    rows: set[Row] = set()
    for on_m, dc_m, cubes in regions:
        parts = [tuple(1 if on_m >> j & 1 else 2 if dc_m >> j & 1 else 0 for j in range(m))] if on_m else []
        if dc_m:
            parts.append(tuple(2 if dc_m >> j & 1 else 0 for j in range(m)))
        for c in cubes:
            inp = encode_cube(c, n, order)
            rows.update((inp, part) for part in parts)
    return Job(n, m, "fd", frozenset(rows), order)


def _cost(rows: Sequence[Row]) -> tuple[int, int]:
    return len(rows), sum(1 for inp, _ in rows for v in inp if v != 3)


def _espresso(job: Job, start: Sequence[Row] | None) -> list[Row]:
    """One run of the compiled minimizer on ``job``, or a descent from ``start`` (a cover of the job) fed with the
    job's don't-care (F|D) or OFF (F|R) rows."""
    from pyeda.boolalg.espresso import DTYPE, FTYPE, RTYPE, espresso, set_config

    if not any(1 in out for _, out in job.rows):
        return []
    rows: set[Row] | frozenset[Row] = job.rows
    if start is not None:
        if job.kind == "fd":
            keep = {(i, tuple(2 if v == 2 else 0 for v in o)) for i, o in job.rows if 2 in o}
            rows = keep | set(start)
        else:
            keep = {(i, tuple(0 if v == 0 else 2 for v in o)) for i, o in job.rows if 0 in o}
            rows = keep | {(i, tuple(1 if v == 1 else 2 for v in o)) for i, o in start}
    set_config(**MINIMIZER_DEFAULTS)
    return sorted(espresso(job.n, job.m, rows, intype=FTYPE | (DTYPE if job.kind == "fd" else RTYPE)))


def _descend(job: Job, start: Sequence[Row] | None, repeat: int) -> list[Row]:
    """Run (or descend from ``start``), then up to ``repeat`` more descents while each one lowers the cost."""
    best = _espresso(job, start)
    for _ in range(repeat):
        nxt = _espresso(job, best)
        if _cost(nxt) >= _cost(best):
            break
        best = nxt
    return best


def _per_output(jobs: Sequence[Job], repeat: int) -> list[list[Row]]:
    return [_descend(job, None, repeat) for job in jobs]


def _call(fn: Callable[..., Any], args: tuple, options: MinimizeOptions, nice: int = 0) -> Isolated | _Done:
    """Start ``fn(*args)`` in a child process (``nice`` added to its niceness), or run it here when
    ``options.isolate`` is off."""
    if options.isolate:
        return Isolated(fn, args, "the heuristic minimizer", options.memory_limit, nice)
    return _Done(fn(*args))


class _Done:
    """A result computed in this process, with :class:`Isolated`'s waiting interface."""

    def __init__(self, value: Any) -> None:
        self.value = value

    def wait(self, timeout: float) -> bool:
        return True

    def ready(self) -> bool:
        return True

    def result(self, timeout: float, limit_note: str = "") -> Any:
        return self.value

    def stop(self) -> None:
        pass


def time_limit(options: MinimizeOptions, n: int, m: int, given: int) -> tuple[float, str]:
    """The heuristic's time limit and, when the table set it, the note a ``TimeLimit`` message adds."""
    if not options.scale_time_limit:
        return options.time_limit, ""
    scaled = (n + m) * given / SCALE_DIVISOR
    if scaled <= options.time_limit:
        return options.time_limit, ""
    return scaled, (f" (the default limit for {given} rows of {n} inputs and {m} outputs: (inputs + outputs) x rows "
                    f"/ {SCALE_DIVISOR} s)")


def _first_answer(starts: Sequence[tuple[Job, Isolated | _Done]], deadline: float, limit: float, note: str
                  ) -> tuple[int, list[Row]]:
    """Index and rows of whichever start answers first. The first start is the one that must answer: its errors
    (and its time limit) are raised; a later start that fails is dropped."""
    alive = list(range(len(starts)))
    while _wait_any([starts[k] for k in alive], deadline):
        for k in list(alive):
            pending = starts[k][1]
            if pending.wait(0):
                if k == 0:
                    return 0, pending.result(0, note)
                try:
                    return k, pending.result(0)
                except (InternalError, SizeLimit, TimeLimit):
                    alive.remove(k)
    raise TimeLimit(f"the heuristic minimizer did not finish within {limit:g} s{note}", "--time-limit")


def is_small(n: int, m: int, given: int) -> bool:
    """Whether a table is small enough for the ``normal`` effort's floor and descents (:data:`SMALL_INPUTS`,
    :data:`SMALL_SIZE`): decided by its size, not by a clock, so the result does not depend on the machine's load."""
    return n <= SMALL_INPUTS and (n + m) * given <= SMALL_SIZE


def _running_now(enough: int) -> int | None:
    """Processes runnable on the machine right now (``/proc/loadavg``'s fourth field, least of up to three looks
    5 ms apart, the looks ending once one is at most ``enough``), or ``None`` where that file is missing."""
    seen: list[int] = []
    for k in range(3):
        try:
            with open("/proc/loadavg", encoding="ascii") as fh:
                seen.append(int(fh.read().split()[3].split("/")[0]))
        except (OSError, ValueError, IndexError):
            return None
        if seen[-1] <= enough:
            break
        if k < 2:
            time.sleep(0.005)
    return min(seen)


def spare_core() -> bool:
    """Whether a core is idle for a second start, called just after the first start began: the processes runnable
    now (this one and the first start among them; this one only waits from here on) are at most the cores this
    process may use. Where that count is missing, the 1-minute load average stands in for it. On a machine already
    busy a second start would only slow the first one down."""
    try:
        cores = len(os.sched_getaffinity(0))
    except AttributeError:  # platforms without affinity
        cores = os.cpu_count() or 1
    running = _running_now(cores)
    if running is not None:
        return running <= cores
    try:
        load = os.getloadavg()[0]
    except OSError:
        return cores > 1
    return cores - load >= SPARE


def _wait_any(starts: Sequence[tuple[Job, Isolated | _Done]], until: float) -> bool:
    """Wait until some start has answered (or ended), at most until ``until``; whether one has."""
    while True:
        if any(pending.wait(0) for _, pending in starts):
            return True
        left = until - time.monotonic()
        if left <= 0:
            return False
        starts[0][1].wait(min(POLL, left))


def _bound_stop(starts: Sequence[tuple[Job, Isolated | _Done]], t0: float) -> Callable[[], bool]:
    """``stop()`` for a lower bound computed while the starts (begun at ``t0``) run on a large table: true once a
    start has answered and the bound has had :data:`BOUND_SHARE` of that answer's time (at least
    :data:`BOUND_FLOOR` seconds)."""
    began = time.monotonic()
    answered: list[float] = []

    def stop() -> bool:
        if not answered:
            if not any(pending.ready() for _, pending in starts):
                return False
            answered.append(time.monotonic())
        return time.monotonic() - began >= max(BOUND_FLOOR, BOUND_SHARE * (answered[0] - t0))
    return stop


def extra_window(t_first: float, small: bool, before: float = 0.0) -> float:
    """Seconds the ``normal`` effort gives other starts after the first answer, which took ``t_first`` after
    ``before`` seconds of preparing the starts. On a large table preparing and window together take at most
    :data:`EXTRA_SHARE` of the time beyond :data:`SECOND_AFTER` seconds, when the other start began."""
    if small:
        return max(EXTRA_FLOOR, EXTRA_SHARE * t_first)
    return max(0.0, EXTRA_SHARE * (t_first - SECOND_AFTER) - before)


def _run_shared(job: Job, second_of: SecondOf, bound_of: BoundOf, options: MinimizeOptions, limit: float,
                note: str, progress: Progress, began: float) -> tuple[Job, list[Row], int]:
    """Start A (and a second start, ``second_of()`` built while A runs), then descents, as ``options.effort``
    allows (module docs); the best result with the job it answers (their column orders differ) and the lower bound
    ``bound_of(seconds, stop)``, computed here while the starts run."""
    t0 = time.monotonic()
    deadline = t0 + limit
    effort = options.effort
    repeat = 1 << 20 if effort == "high" else 0
    starts: list[tuple[Job, Isolated | _Done]] = [(job, _call(_descend, (job, None, 0), options))]
    try:
        small = is_small(job.n, job.m, len(job.rows))
        # a small table (or ``high``) gets both starts and a full bound at once; a large one a short bound beside
        # start A (parallel work slows A down on a shared memory system) and a second start only once A has run
        # SECOND_AFTER seconds without answering
        at_once = effort == "high" or (effort == "normal" and small)
        second = second_of() if at_once else None
        if second is not None:
            starts.append((second[0], _call(_descend, (second[0], None, 0), options)))
        progress.stage("start A: the rows as given" + (f", start B: {second[1]}" if second else ""))
        if at_once or small:
            bound = bound_of(BOUND_SECONDS, None)
        else:
            bound = bound_of(BOUND_EARLY, _bound_stop(starts, t0))
            if effort == "normal" and not _wait_any(starts, min(deadline, t0 + SECOND_AFTER)) and spare_core():
                second = second_of()
                if second is not None:
                    starts.append((second[0], _call(_descend, (second[0], None, 0), options, SECOND_NICE)))
                    progress.stage(f"start A has run {SECOND_AFTER:g} s: start B, {second[1]}")
        first, rows = _first_answer(starts, deadline, limit, note)
        results: list[tuple[Job, list[Row]]] = [(starts[first][0], rows)]
        if effort == "fast" or len(rows) <= bound:
            return starts[first][0], rows, bound
        t_a = time.monotonic() - t0
        window = extra_window(t_a, small, max(0.0, t0 - began))
        extra_end = deadline if effort == "high" else min(deadline, time.monotonic() + window)
        progress.update(rows_a=len(rows))
        others = [(j, pending) for k, (j, pending) in enumerate(starts) if k != first]
        if not (at_once or small) and others and window > 0:
            # the other start's window: the bound may use this core meanwhile (A is done, nothing to slow down)
            bound = max(bound, bound_of(min(BOUND_SECONDS, window), None))
        for j, pending in others:
            if pending.wait(extra_end - time.monotonic()):
                try:
                    results.append((j, pending.result(0)))
                    progress.update(rows_b=len(results[-1][1]))
                except (InternalError, SizeLimit, TimeLimit):
                    pass
        # a descent is worth starting only when it can finish in the time left: on a table whose first start
        # was quick (``normal``), or under ``high``
        if effort == "high" or small:
            descents = [(j, _call(_descend, (j, r, repeat), options)) for j, r in results
                        if time.monotonic() < extra_end]
            progress.stage("one more descent from each result" if effort == "normal" else "descents while they help")
            for j, d in descents:
                if d.wait(extra_end - time.monotonic()):
                    results.append((j, d.result(0)))
                    progress.update(rows_descent=len(results[-1][1]))
                else:
                    d.stop()
    finally:
        for _, pending in starts:
            pending.stop()
    best_job, best = min(results, key=lambda jr: _cost(jr[1]))
    return best_job, best, bound


def _decode(job: Job, rows: Sequence[Row], output: int | None = None) -> list[Cube]:
    cubes = []
    for inpart, outpart in rows:
        c = decode_row(inpart, outpart, job.order)
        if output is not None:
            c = c.with_outputs((1 << output) if c.outputs else 0)
        if c.outputs:
            cubes.append(c)
    return cubes


def _minimized(n: int, m: int, first: Job, per_output: list[Job] | None, second_of: SecondOf,
               bound_of: BoundOf, given: int, options: MinimizeOptions, began: float) -> tuple[list[Cube], int]:
    """The best cover found and the lower bound (``bound_of()``, computed while the first start runs);
    ``second_of()`` gives the second start's job and its name, or ``None``."""
    limit, note = time_limit(options, n, m, given)
    with Progress(options.progress, "heuristic") as progress:
        progress.stage(f"{given} rows, {n} inputs, {m} outputs; time limit {limit:.0f} s")
        if per_output is not None:
            repeat = 0 if options.effort == "fast" else 1 if options.effort == "normal" else 1 << 20
            run = _call(_per_output, (per_output, repeat), options)
            bound = bound_of(BOUND_SECONDS, None)
            res = run.result(limit, note)
            return sort_cubes(merge_identical(c for k, (job, rows) in enumerate(zip(per_output, res))
                                              for c in _decode(job, rows, k))), bound
        job, rows, bound = _run_shared(first, second_of, bound_of, options, limit, note, progress, began)
    return sort_cubes(merge_identical(_decode(job, rows))), bound


def _signature_start(n: int, m: int, regions_of: Callable[[], Sequence[tuple[int, int, tuple[Cube, ...]]]]
                     ) -> SecondOf:
    """``second_of`` for start B, the signature regions (small tables only, see :data:`SIGNATURE_LIMIT`)."""
    def second_of() -> tuple[Job, str] | None:
        if n > SIGNATURE_LIMIT or m > 64:
            return None
        return signature_job(n, m, regions_of(), tuple(range(n))), "signature regions"
    return second_of


def heuristic_cubes(fs: FunctionSets, options: MinimizeOptions) -> list[Cube]:
    """Minimized cubes for separated sets ``fs`` under ``options`` (cost, effort; ``time_limit`` as given, never
    scaled: callers pass their share of a deadline), identical terms merged, in
    :func:`plaforge.minimize.result.sort_cubes` order (not yet verified)."""
    began = time.monotonic()
    options = replace(options, scale_time_limit=False)
    per = _per_output_jobs(fs.n, "fd", fs.on, fs.dc) if options.cost == "per-output" else None
    given = sum(map(len, fs.on)) + sum(map(len, fs.dc))
    cubes, _ = _minimized(fs.n, fs.m, sets_job(fs), per, _signature_start(fs.n, fs.m, lambda: fs.regions),
                          lambda seconds, stop: 0, given, options, began)
    return cubes


def _per_output_jobs(n: int, kind: str, ons: Sequence[Sequence[Cube]], others: Sequence[Sequence[Cube]]
                     ) -> list[Job]:
    """One single-output job per output (the ``per-output`` cost)."""
    mark = 2 if kind == "fd" else 0
    return [_job(n, 1, kind, [([c.with_outputs(1) for c in on], 1), ([c.with_outputs(1) for c in other], mark)])
            for on, other in zip(ons, others)]


def minimize_heuristic(table: Table, options: MinimizeOptions, inverted: int = 0) -> Cover:
    """Heuristic cover of ``table`` (outputs in ``inverted`` realized in complement), verified.

    ``lower_bound`` is :func:`plaforge.minimize.covering.quick_lower_bound` where the don't-cares are known as cubes
    and :func:`plaforge.minimize.off_bound.off_lower_bound` where they are implicit (``fr``: ON points pairwise
    separated by the OFF rows); ``optimal`` is true only when the cover meets it.
    """
    began = time.monotonic()
    per_output = options.cost == "per-output"
    gs = given_sets(table, inverted)
    if gs is None:
        fs = table.cover_sets(inverted)
        n, m, first, given = fs.n, fs.m, sets_job(fs), sum(map(len, fs.on)) + sum(map(len, fs.dc))
        ons, others, kind = fs.on, fs.dc, "fd"
        second_of = _signature_start(n, m, lambda: fs.regions)
    else:
        n, m, given = gs.n, gs.m, gs.given
        ons, others, kind = gs.on, gs.other, gs.kind
        second_of = _signature_start(n, m, lambda: signature_regions(n, *gs.point_arrays()))
        first = given_job(gs)
        if gs.kind == "fd" and any(lists_intersect(on, dc) for on, dc in zip(gs.on, gs.other)):
            # ON rows that may overlap DC rows: fed as given, or cut by the complement of the DC rows
            # (Table.on_pieces, bounded). Which one the minimizer finishes sooner depends on the table, by a
            # factor up to 80 either way (measured: the suite's wide40 3.3 s cut against 15.6 s as given; the
            # scale benchmark's wide40x6 41 s cut against 0.5 s as given). Up to ORDER_FROM inputs the cut rows
            # are start A (the starts were tuned on them); above it both run at once and the first answer wins.
            def cut_rows() -> tuple[Job, str]:
                return sets_job(table.cover_sets(inverted)), "ON rows cut by the don't-cares"
            if n <= ORDER_FROM:
                first = sets_job(table.cover_sets(inverted))
            else:
                second_of = cut_rows
        elif n > ORDER_FROM:
            # the minimizer's time on wide tables depends on the column order, either way and by up to twice
            # (measured on the scale benchmark's ON/OFF tables): the spec's own order runs beside the sorted one
            def spec_columns() -> tuple[Job, str] | None:
                job = given_job(gs, spec_order=True)
                return None if job.order == first.order else (job, "the rows in the spec's column order")
            second_of = spec_columns

    def bound_of(seconds: float, stop: Callable[[], bool] | None) -> int:
        if kind == "fd":
            return quick_lower_bound(FunctionSets(n, m, ons, others), per_output, seconds, stop)
        # implicit don't-cares: ON points pairwise separated by the OFF rows (nothing complemented)
        return off_lower_bound(ons, others, n, per_output, seconds, stop)

    per = _per_output_jobs(n, kind, ons, others) if per_output else None
    cubes, bound = _minimized(n, m, first, per, second_of, bound_of, given, options, began)
    count = term_count(cubes, per_output)
    return checked_cover(table, cubes, options, inverted, "heuristic", count <= bound, bound, given=gs)
