"""``map_luts``: a table's outputs as one shared network of k-input LUTs.

Pipeline
--------
0. The first candidate is the mapping in the spec's own column order at ``k`` (the mapper's path before the
   canonical order; every output over all the inputs its sets mention whenever that is decomposable). Unless it
   already meets the count lower bound or its decomposition cost more than ``EXTRA_PASS_WORK`` array elements
   (each further pass would cost about as much), the inputs are also put in a canonical order derived from the
   function (:mod:`plaforge.lut.canon`) and, for tables of at most ``TWO_ORDER_LIMIT`` inputs, its reverse, and
   those are mapped too; the best network is kept. So the count never exceeds the spec-order candidate's, and for
   tables cheap enough to map more than once it never exceeds the canonical order's whatever the column order
   (the spec's order can only make it smaller). Fan-ins are listed in the spec's order at the end.
1. Per output, its support ``S_j`` (:meth:`plaforge.table.Table.support`: don't-cares used greedily to drop
   inputs). Constants and plain inputs need no LUT; a complemented input is one 1-input LUT (an inverter).
2. Outputs that one function can serve (equal, or equal up to their don't-cares) are merged into one.
   Outputs with ``|S_j| <= options.decompose_limit``, in order of growing support, are realized by functional
   decomposition on their truth tables (:mod:`plaforge.lut.decompose`), every output reusing the LUTs built for
   the earlier ones (identical or don't-care-compatible functions share one LUT; a LUT that computes a useful
   sub-function, such as a carry, is reused as a signal). An output with ``|S_j| <= k`` is one LUT.
3. Wider outputs are realized on a multi-level subject graph built from the two-level cover the caller gives
   (each product term a tree of 2-input ANDs, each output an OR tree) and mapped by cuts
   (:mod:`plaforge.lut.cuts`).
4. When ``options.remap`` is set, the whole network is remapped by cuts (depth-optimal labels, then area
   recovery), and the better network by ``options.objective`` is kept.
5. With those extra passes, steps 1-4 also run for ``k - 1``, ``k - 2``, ... down to 3 in every order tried,
   for tables of at most ``SMALLER_K_LIMIT`` inputs, stopping at the first size whose network has more than
   ``SMALLER_K_GIVE_UP`` times the LUTs of the best so far, or whose decomposition builds more than
   ``SMALLER_K_CAP`` times as many (a k'-LUT network is a k-LUT network). Every output mapped from the cover alone is one more candidate (for the area objective only
   when the count is above its bound, some output was decomposed and the cover has at most ``COVER_AREA_LIMIT``
   literals). The best by ``options.objective`` is kept.
   For fully specified tables of at most ``ARITH_LIMIT`` inputs whose output word is a sum of functions of
   fewer inputs (a multiplier, a sum of independent terms), the word-level additive decomposition of
   :mod:`plaforge.lut.arith` in the canonical order and its reverse, at every size tried, gives more candidates.
6. ``objective="depth"``: per output the shallowest realization, with a Shannon multiplexer tree for outputs
   above the Shannon bound, then area recovery that never deepens an output (:mod:`plaforge.lut.depth`).
7. Fan-ins a LUT ignores are dropped, equal LUTs merged (structural hashing), dead LUTs removed, LUTs renamed
   ``n0, n1, ...`` in topological order, and the network is re-checked against the table.

Lower bounds: :mod:`plaforge.lut.bounds`.
"""

from __future__ import annotations

import re
import time
from collections.abc import Sequence

import numpy as np

from ..core.cube import Cover
from ..core.errors import InternalError, TimeLimit
from ..core.network import Lut, LutNetwork
from ..core.table import Table
from .arith import ARITH_LIMIT, additive_network
from .bounds import OutputSets, essential_inputs, lower_bounds
from .decompose import Decomposer, GiveUp, NetworkBuilder, OverBudget, Pending
from .options import LutOptions
from .points import POINT_LIMIT, PointSets, wrong_outputs

__all__ = ["essential_inputs", "lower_bounds", "map_luts", "tidy_network"]  # the first two from .bounds


def _prefix(input_names: Sequence[str], base: str = "n") -> str:
    """``base`` followed by as many ``_`` as needed so that no input is named ``prefix`` plus digits."""
    prefix = base
    while any(re.fullmatch(re.escape(prefix) + r"\d+", name) for name in input_names):
        prefix += "_"
    return prefix


def tidy_network(net: LutNetwork, prefix: str = "n") -> LutNetwork:
    """Drop fan-ins a LUT ignores, merge LUTs that compute the same function of the same fan-ins (structural
    hashing on the sorted fan-ins and the INIT over them), drop LUTs no output needs, and rename LUTs
    ``prefix0, prefix1, ...`` in order.

    The function of every output is unchanged; LUT order stays topological.
    """
    from .init import drop_unused_inputs, select_inputs

    # simplify INITs first (fan-ins ignored), merge equal LUTs, then find what is live
    simple: dict[str, Lut] = {}
    alias: dict[str, str] = {}
    seen: dict[tuple[tuple[str, ...], int], str] = {}
    for lut in net.luts:
        init, keep = drop_unused_inputs(lut.init, len(lut.inputs))
        ins = tuple(alias.get(lut.inputs[b], lut.inputs[b]) for b in keep)
        order = sorted(range(len(ins)), key=lambda b: ins[b])
        key = (tuple(ins[b] for b in order), select_inputs(init, order))
        if key in seen:
            alias[lut.name] = seen[key]
            continue
        seen[key] = lut.name
        simple[lut.name] = Lut(lut.name, ins, init)
    net = LutNetwork(net.k, net.input_names, net.output_names, tuple(simple.values()),
                     tuple(alias.get(d, d) for d in net.drivers), dict(net.lower_bounds), net.method)
    by_name = {lut.name: lut for lut in net.luts}
    live: set[str] = set()
    stack = [d for d in net.drivers if d in by_name]
    while stack:
        x = stack.pop()
        if x in live:
            continue
        live.add(x)
        stack.extend(i for i in simple[x].inputs if i in by_name)
    rename: dict[str, str] = {}
    luts: list[Lut] = []
    for lut in net.luts:
        if lut.name not in live:
            continue
        s = simple[lut.name]
        new = f"{prefix}{len(luts)}"
        rename[lut.name] = new
        luts.append(Lut(new, tuple(rename.get(i, i) for i in s.inputs), s.init))
    drivers = tuple(rename.get(d, d) for d in net.drivers)
    return LutNetwork(net.k, net.input_names, net.output_names, tuple(luts), drivers, dict(net.lower_bounds),
                      net.method)


def _spec_order_fanins(net: LutNetwork, input_names: Sequence[str]) -> tuple[Lut, ...]:
    """Every LUT's fan-ins reordered: table inputs in the spec's order first, then LUTs in network order (the INIT
    permuted to match), so listings read in the spec's order whatever order the mapper worked in."""
    from .init import select_inputs

    rank = {name: i for i, name in enumerate(input_names)}
    rank.update({lut.name: len(input_names) + x for x, lut in enumerate(net.luts)})
    out = []
    for lut in net.luts:
        order = sorted(range(len(lut.inputs)), key=lambda b: rank[lut.inputs[b]])
        out.append(Lut(lut.name, tuple(lut.inputs[b] for b in order), select_inputs(lut.init, order)))
    return tuple(out)


def _resolve_constant_luts(net: LutNetwork) -> LutNetwork:
    """Replace 0-input LUTs by constants and buffers (1-input INIT ``0b10``) by their fan-in."""
    alias: dict[str, str] = {}
    luts = []
    for lut in net.luts:
        ins = tuple(alias.get(i, i) for i in lut.inputs)
        if not ins:
            alias[lut.name] = "1" if lut.init & 1 else "0"
            continue
        if len(ins) == 1 and lut.init == 0b10:
            alias[lut.name] = ins[0]
            continue
        if any(i in ("0", "1") for i in ins):
            # fold constant fan-ins
            init, kept = 0, [b for b, i in enumerate(ins) if i not in ("0", "1")]
            fixed = sum(1 << b for b, i in enumerate(ins) if i == "1")
            for q in range(1 << len(kept)):
                p = fixed
                for nb, b in enumerate(kept):
                    if q >> nb & 1:
                        p |= 1 << b
                if lut.init >> p & 1:
                    init |= 1 << q
            ins = tuple(ins[b] for b in kept)
            if not ins:
                alias[lut.name] = "1" if init & 1 else "0"
                continue
            luts.append(Lut(lut.name, ins, init))
            continue
        luts.append(Lut(lut.name, ins, lut.init))
    drivers = tuple(alias.get(d, d) for d in net.drivers)
    return LutNetwork(net.k, net.input_names, net.output_names, tuple(luts), drivers, dict(net.lower_bounds),
                      net.method)


def _check_cover(table: Table, cover: Cover) -> None:
    """``cover`` is a Cover over the table's input and output names (TypeError / ValueError otherwise)."""
    if not isinstance(cover, Cover):
        raise TypeError(f"map_luts() needs a Cover of the table, not {type(cover).__name__}")
    if cover.input_names != table.input_names or cover.output_names != table.output_names:
        raise ValueError(
            f"the cover has inputs {list(cover.input_names)} and outputs {list(cover.output_names)}; the table has "
            f"inputs {list(table.input_names)} and outputs {list(table.output_names)}"
        )


def _objective_key(objective: str):
    """Sort key of networks: fewer LUTs first (area) or fewer levels first (depth), the other breaking ties."""
    return (lambda n: (n.count, n.depth)) if objective == "area" else (lambda n: (n.depth, n.count))


SMALLER_K_LIMIT = 10
SMALLER_K_GIVE_UP = 1.5
SMALLER_K_CAP = 1.25  # LUTs a smaller size may build, times the best so far, before its pass is abandoned
TWO_ORDER_LIMIT = 12
MENTIONED_SLACK = 4  # inputs beyond the support worth keeping for their don't-cares
EXTRA_PASS_WORK = 1 << 24  # decomposition work (array elements) of the first candidate above which no other
# order or LUT size is tried: each would cost about as much again
COVER_CANDIDATE_LIMIT = 4000  # literals; larger covers are mapped by cuts only for outputs that need it
COVER_AREA_LIMIT = 500  # literals; the same for the area objective
BOUNDED_LIMIT = 10  # support inputs up to which the depth objective tries depth-bounded decomposition


def _sizes_tried(table: Table, k: int, opts: LutOptions) -> list[int]:
    """LUT sizes mapped, ``k`` first: then ``k - 1``, ``k - 2``, ... down to 3 when the table has at most
    SMALLER_K_LIMIT inputs (a k'-LUT network is a k-LUT network, so a larger k never loses to a smaller one); the
    caller stops descending at the first size whose network has more than SMALLER_K_GIVE_UP times the LUTs of the
    best so far."""
    if table.n_inputs <= min(SMALLER_K_LIMIT, opts.enum_limit):
        return list(range(k, min(3, k) - 1, -1))
    return [k]


WORK_PIVOT = 16  # supports below this many inputs get the work budget doubled per missing input


def _work_budget(size: int, opts: LutOptions) -> int:
    """Work budget of one output (group) of ``size`` support inputs: ``opts.work_budget``, doubled for every input
    below WORK_PIVOT (small supports are cheap per LUT, so only wide ones need the bound for time; 0: none)."""
    return opts.work_budget << max(0, WORK_PIVOT - size) if opts.work_budget else 0


def _decomposable(size: int, opts: LutOptions) -> bool:
    """An output of ``size`` support inputs is decomposed on its truth table: within ``decompose_limit``, and one
    pass dropping unneeded signals (``size**2 * 2**size`` elements) fits a sixteenth of the work budget (with the
    default budget: up to 16 inputs)."""
    return size <= opts.decompose_limit and (not opts.work_budget or size * size << size <= opts.work_budget // 16)


def _past(deadline: float | None) -> bool:
    return deadline is not None and time.monotonic() > deadline


def _map_at(sets: OutputSets, cover: Cover, k: int, opts: LutOptions, prefix: str, deadline: float | None = None,
            previous: bool = False, node_cap: int | None = None) -> tuple[LutNetwork, int] | None:
    """Steps 1-4 of the module docs at one LUT size (no bounds, no check), and the decomposition's work (array
    elements). ``previous``: every output is decomposed over all the inputs its sets mention whenever that is
    decomposable (the mapper's choice before the canonical order; otherwise only up to MENTIONED_SLACK inputs
    beyond the support). ``None`` once the decomposition has built ``node_cap`` LUTs (a pass that cannot win)."""
    table = sets.table
    builder = NetworkBuilder(table.input_names, k, prefix=_prefix(table.input_names, "@t"),
                             global_limit=max(opts.decompose_limit, 1), deadline=deadline)
    builder.node_cap = node_cap
    dec = Decomposer(builder, k, budget=opts.bound_set_budget, beam=opts.beam)
    m = table.n_outputs
    if table.n_inputs > opts.enum_limit:
        # beyond the enumeration limit nothing is enumerated, not even a complement: every output goes through
        # the cover (whose supports are those of its cubes) and the cut-based path
        supports = [0] * m
        sizes = [opts.decompose_limit + 1] * m
    else:
        supports = [sets.support(j) for j in range(m)]
        sizes = [s.bit_count() for s in supports]
    narrow = sorted((j for j in range(m) if _decomposable(sizes[j], opts)), key=lambda j: (sizes[j], j))
    wide = [j for j in range(m) if not _decomposable(sizes[j], opts)]
    drivers: list[str] = ["0"] * m
    # outputs that one function can serve (equal, or equal up to don't-cares) are realized once
    groups: list[tuple[list[int], tuple[int, ...], np.ndarray, np.ndarray]] = []
    for j in narrow:
        # the inputs the sets mention keep every don't-care choice open (projection onto them is exact); the
        # greedy support is used when they are too many (or many more than the support: sparse rows)
        mentioned = sets.mentioned(j)
        wider = mentioned.bit_count() - sizes[j]
        use = _decomposable(mentioned.bit_count(), opts) and (previous or wider <= MENTIONED_SLACK)
        mask = mentioned if use else supports[j]
        sup = tuple(i for i in range(table.n_inputs) if mask >> i & 1)
        on, off = sets.local(j, sup)
        for x, (outs, gsup, gon, goff) in enumerate(groups):
            union = tuple(sorted(set(gsup) | set(sup)))
            if len(union) > opts.decompose_limit:
                continue
            uu = builder.universe(union)
            a_on, a_off = uu.expand(gsup, gon), uu.expand(gsup, goff)
            b_on, b_off = uu.expand(sup, on), uu.expand(sup, off)
            if not (a_on & b_off).any() and not (a_off & b_on).any():
                groups[x] = (outs + [j], union, a_on | b_on, a_off | b_off)
                break
        else:
            groups.append(([j], sup, on, off))
    for x, (outs, sup, on, off) in enumerate(groups):
        dec.pending = [Pending(builder.universe(s2), a, b) for _, s2, a, b in groups[x + 1:]]
        u = builder.universe(sup)
        sigs = [table.input_names[i] for i in u.inputs]
        before = len(builder.nodes)
        builder.budget_end = before + opts.lut_budget if opts.lut_budget else None
        budget = _work_budget(len(sup), opts)
        builder.work_end = builder.work + budget if budget else None
        try:
            signal = dec.realize(u, sigs, on, off)
        except OverBudget:
            # too irregular to decompose within the budget: the cover and cuts take these outputs
            builder.rollback(before)
            wide.extend(outs)
            continue
        except GiveUp:
            return None
        finally:
            builder.budget_end = builder.work_end = None
        for j in outs:
            drivers[j] = signal
    wide.sort()
    luts = tuple(Lut(n.name, n.inputs, n.init) for n in builder.nodes)
    method = "decomposition" if narrow else ""
    net = LutNetwork(k, table.input_names, table.output_names, luts, tuple(drivers), {}, method)
    if wide:
        from .cuts import map_cover_outputs

        net = map_cover_outputs(net, cover, wide, opts, deadline)
    if opts.remap and net.luts and not _past(deadline):
        from .cuts import remap_network

        alt = remap_network(net, opts)
        if _objective_key(opts.objective)(alt) < _objective_key(opts.objective)(net):
            net = alt
    return tidy_network(_resolve_constant_luts(net), prefix), builder.work


def _finish(net: LutNetwork, opts: LutOptions, prefix: str) -> LutNetwork:
    """Clean-up of a candidate network, then the better of it and its remapping by cuts (``options.remap``)."""
    net = tidy_network(_resolve_constant_luts(net), prefix)
    if opts.remap and net.luts:
        from .cuts import remap_network

        alt = tidy_network(_resolve_constant_luts(remap_network(net, opts)), prefix)
        if _objective_key(opts.objective)(alt) < _objective_key(opts.objective)(net):
            net = alt
    return net


def _cover_network(table: Table, cover: Cover, k: int, opts: LutOptions, prefix: str,
                   deadline: float | None) -> LutNetwork | None:
    """Every output mapped by cuts from the cover alone (step 3 for all outputs); ``None`` for an empty cover or
    past the deadline."""
    from .cuts import map_cover_outputs

    if not cover.cubes or cover.literals > COVER_CANDIDATE_LIMIT or _past(deadline):
        return None
    m = table.n_outputs
    empty = LutNetwork(k, table.input_names, table.output_names, (), ("0",) * m, {}, "")
    try:
        net = map_cover_outputs(empty, cover, range(m), opts, deadline)
    except TimeLimit:
        return None  # an optional candidate
    return tidy_network(_resolve_constant_luts(net), prefix)


def _depth_pass(sets: OutputSets, net: LutNetwork, cut: LutNetwork | None, opts: LutOptions,
                prefix: str) -> LutNetwork:
    """The depth objective over ``net`` and the cover-only network ``cut`` (:mod:`plaforge.lut.depth`)."""
    from .depth import shallowest

    table = sets.table
    k, m = net.k, table.n_outputs
    candidates = [net] + ([cut] if cut is not None else [])
    enumerable = table.n_inputs <= opts.enum_limit
    supports = [sets.support(j).bit_count() if enumerable else table.n_inputs for j in range(m)]

    def realize_all(todo: list[int], targets: dict[int, int] | None) -> LutNetwork | None:
        # Shannon trees (no reuse: a reused LUT could be deeper), or with ``targets`` depth-bounded decomposition
        # (each output at most its target level) reusing only LUTs no deeper than needed; None past its budget
        bounded = targets is not None
        builder = NetworkBuilder(table.input_names, k, prefix=_prefix(table.input_names, "@s"),
                                 global_limit=max(opts.decompose_limit, 1))
        dec = Decomposer(builder, k, reuse=bounded, depth_aware=bounded)
        if bounded and opts.work_budget:
            builder.work_end = sum(_work_budget(supports[j], opts) for j in todo)
        drivers = ["0"] * m
        for j in todo:
            sup = tuple(i for i in range(table.n_inputs) if sets.support(j) >> i & 1)
            on, off = sets.local(j, sup)
            u = builder.universe(sup)
            names = [table.input_names[i] for i in u.inputs]
            if targets is not None:
                try:
                    drivers[j] = dec.bounded(u, names, on, off, targets[j])
                except OverBudget:
                    return None
            else:
                drivers[j] = dec.shannon(u, names, on, off)
        luts = tuple(Lut(n.name, n.inputs, n.init) for n in builder.nodes)
        raw = LutNetwork(k, table.input_names, table.output_names, luts, tuple(drivers), {},
                         "bounded decomposition" if bounded else "Shannon")
        return tidy_network(_resolve_constant_luts(raw), prefix)

    def fallback(outputs: list[int]) -> tuple[LutNetwork, set[int]] | None:
        todo = [j for j in outputs if enumerable and supports[j] <= opts.decompose_limit]
        if not todo:
            return None
        net = realize_all(todo, None)
        assert net is not None
        return net, set(todo)

    def bounded(targets: dict[int, int]) -> tuple[LutNetwork, set[int]] | None:
        todo = [j for j in sorted(targets, key=lambda j: (supports[j], j))
                if enumerable and supports[j] <= BOUNDED_LIMIT]
        if not todo:
            return None
        net = realize_all(todo, targets)
        return None if net is None else (net, set(todo))

    return shallowest(candidates, supports, fallback, opts, lambda n: tidy_network(_resolve_constant_luts(n), prefix),
                      bounded)


def map_luts(table: Table, cover: Cover, k: int = 6, options: LutOptions | None = None) -> LutNetwork:
    """Map every output of ``table`` onto one shared network of k-input LUTs.

    Parameters
    ----------
    table : Table
        The function; never modified. Don't-cares are used freely; every output satisfies
        ``ON ⊆ network ⊆ ON ∪ DC``.
    cover : Cover
        A two-level cover realizing ``table`` (same input and output names), as a minimizer made it (any cost,
        exact or not, outputs in complement allowed). Outputs too wide to decompose on their truth table are
        mapped from it (module docs, step 3); the others do not use it.
    k : int
        LUT size, 2 to 8.
    options : LutOptions, optional
        Decomposition limits, objective, cut-pass settings, verification.

    Returns
    -------
    LutNetwork
        LUTs named ``n0, n1, ...`` in topological order (another prefix when an input is already so named),
        ``drivers`` per output, ``lower_bounds`` (``count``, ``depth`` and their parts) and ``method``.

    Raises
    ------
    TypeError
        ``table`` is not a Table, ``cover`` not a Cover, ``k`` not an int, ``options`` not LutOptions.
    ValueError
        ``k`` outside 2..8, or the cover's input or output names differ from the table's.
    plaforge.core.errors.InternalError
        When ``options.verify`` is set and the network does not match the table: a bug, unless ``cover`` does not
        realize the table.

    Examples
    --------
    >>> from plaforge.core.cube import Cover, Cube
    >>> from plaforge.core.table import Table
    >>> t = Table.from_function(["a", "b"], ["y"], lambda p: [(p & 1 > 0) & (p & 2 > 0)])
    >>> net = map_luts(t, Cover(("a", "b"), ("y",), (Cube(0b11, 0b11),)), k=4)
    >>> [(lut.name, lut.inputs, hex(lut.init)) for lut in net.luts], net.drivers
    ([('n0', ('a', 'b'), '0x8')], ('n0',))
    """
    if not isinstance(table, Table):
        raise TypeError(f"map_luts() needs a Table, not {type(table).__name__}")
    _check_cover(table, cover)
    if not isinstance(k, int) or isinstance(k, bool):
        raise TypeError(f"k must be an int, not {k!r}")
    if not 2 <= k <= 8:
        raise ValueError(f"k must be between 2 and 8, not {k!r}")
    opts = options if options is not None else LutOptions()
    if not isinstance(opts, LutOptions):
        raise TypeError(f"options must be LutOptions, not {type(opts).__name__}")
    from .canon import canonical_order, permute_cover, permute_table

    prefix = _prefix(table.input_names)
    key = _objective_key(opts.objective)
    deadline = None if opts.time_limit is None else time.monotonic() + opts.time_limit
    points = PointSets(table) if table.n_inputs <= min(POINT_LIMIT, opts.enum_limit) else None
    bounds = lower_bounds(table, k, opts.enum_limit, points)
    # the first candidate is the mapper's path before the canonical order: the spec's order at k
    identity = tuple(range(table.n_inputs))
    sets0 = OutputSets(table, opts.enum_limit)
    first = _map_at(sets0, cover, k, opts, prefix, deadline, previous=True)
    assert first is not None  # no node cap
    best: tuple[LutNetwork, OutputSets, Cover] = (first[0], sets0, cover)

    def in_order(order: tuple[int, ...]) -> tuple[Table, Cover, OutputSets]:
        """The table, cover and output sets with the inputs in ``order`` (the given ones for the identity)."""
        if order == identity:
            return table, cover, sets0
        ctable = permute_table(table, order)
        return ctable, permute_cover(cover, order), OutputSets(ctable, opts.enum_limit)

    at_bound = first[0].count <= bounds["count"] and (opts.objective == "area" or first[0].depth <= bounds["depth"])
    if not at_bound and first[1] <= EXTRA_PASS_WORK and not _past(deadline):
        canon = canonical_order(table) if table.n_inputs <= opts.enum_limit else identity
        orders = [identity, canon]
        if table.n_inputs <= TWO_ORDER_LIMIT:
            orders.append(canon[::-1])
        for order in dict.fromkeys(orders):
            if _past(deadline):
                break
            ctable, ccover, csets = in_order(order)
            here: LutNetwork | None = first[0] if order == identity else None
            for kk in _sizes_tried(ctable, k, opts):
                if order == identity and kk == k:
                    continue  # the first candidate
                if here is not None and _past(deadline):
                    break
                # a smaller size is abandoned once its decomposition builds SMALLER_K_CAP times the best's LUTs
                cap = int(SMALLER_K_CAP * here.count) + 1 if here is not None and kk < k else None
                got = _map_at(csets, ccover, kk, opts, prefix, deadline, node_cap=cap)
                if got is None:
                    break
                cand = got[0]
                cand = LutNetwork(k, cand.input_names, cand.output_names, cand.luts, cand.drivers, {},
                                  cand.method + ("" if kk == k else f" (k={kk})"))
                if here is not None and cand.count > SMALLER_K_GIVE_UP * here.count:
                    break  # smaller LUTs only get worse from here on
                if here is None or key(cand) < key(here):
                    here = cand
            if here is not None and key(here) < key(best[0]):
                best = (here, csets, ccover)
    if not at_bound and points is not None and table.n_inputs <= ARITH_LIMIT and not _past(deadline):
        # word-level additive decomposition (arithmetic tables), in the canonical order and its reverse: more
        # candidates
        canon = canonical_order(table)
        for order in dict.fromkeys((canon, canon[::-1])):
            if _past(deadline):
                break
            ctable, ccover, csets = in_order(order)
            assert csets.points is not None
            alt = additive_network(ctable, csets.points, _sizes_tried(ctable, k, opts),
                                   lambda n: _finish(n, opts, prefix), _prefix(ctable.input_names, "@a"),
                                   _work_budget(ctable.n_inputs, opts), deadline)
            if alt is None:
                break  # not of that form (the same in any order)
            if key(alt) < key(best[0]):
                best = (alt, csets, ccover)
    net, csets, ccover = best
    cut = None
    if opts.objective == "depth" or (not at_bound and "decomposition" in net.method
                                     and ccover.literals <= COVER_AREA_LIMIT):
        # for area a cover-only network has never beaten the decomposition on the suite or the samples, and
        # mapping a large cover costs seconds: only small covers, and only when the count can still improve
        cut = _cover_network(csets.table, ccover, k, opts, prefix, deadline)
    if cut is not None and key(cut) < key(net):
        net = cut
    if opts.objective == "depth" and not _past(deadline):
        net = _depth_pass(csets, net, cut, opts, prefix)
    net = LutNetwork(net.k, table.input_names, net.output_names, _spec_order_fanins(net, table.input_names),
                     net.drivers, bounds, net.method)
    if opts.verify:
        if points is not None:
            bad = wrong_outputs(net, points)
        else:
            from ..verify.satcnf import check_network_any

            verdict = check_network_any(table, net, limit=opts.enum_limit)
            bad = [o.name for o in verdict.outputs if not o.passed]
        if bad:
            raise InternalError(f"LUT mapping produced a wrong network for outputs {bad}: a bug, unless the cover "
                                "given to map_luts does not realize those outputs")
    return net
