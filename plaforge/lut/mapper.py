"""``map_luts``: a table's outputs as one shared network of k-input LUTs.

Pipeline
--------
0. The inputs are put in a canonical order derived from the function (:mod:`plaforge.lut.canon`), so the result
   does not depend on the spec's column order; for tables of at most ``TWO_ORDER_LIMIT`` inputs the reverse of
   that order is mapped too and the better network kept. Fan-ins are listed in the spec's order at the end.
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
5. Steps 1-4 run for ``k`` and, for tables of at most ``SMALLER_K_LIMIT`` inputs, for ``k - 1``, ``k - 2``, ...
   down to 3, stopping at the first size whose network has more than ``SMALLER_K_GIVE_UP`` times the LUTs of the
   best so far (a k'-LUT network is a k-LUT network, so a larger k does not give a larger network than the sizes
   tried); every output mapped from the cover alone is one more candidate. The best by ``options.objective`` is
   kept.
6. ``objective="depth"``: per output the shallowest realization, with a Shannon multiplexer tree for outputs
   above the Shannon bound, then area recovery that never deepens an output (:mod:`plaforge.lut.depth`).
7. Fan-ins a LUT ignores are dropped, equal LUTs merged (structural hashing), dead LUTs removed, LUTs renamed
   ``n0, n1, ...`` in topological order, and the network is re-checked against the table.

Lower bounds (``LutNetwork.lower_bounds``)
------------------------------------------
``e_j`` is the number of *essential* inputs of output ``j``: inputs ``i`` with an ON point and an OFF point that
differ in input ``i`` alone; every realization depends on them, whatever the don't-cares become (without
don't-cares ``e_j = |S_j|``).

* ``count >= max_j ceil((e_j - 1) / (k - 1))``: a tree of ``c`` k-LUTs has at most ``c (k - 1) + 1`` leaves;
* ``count >= D``: ``D`` outputs that pairwise no single function can serve (an ON point of one is an OFF point of
  the other), none realizable without a LUT (a constant or a plain input), need ``D`` distinct LUTs driving
  them (a greedy pairwise-incompatible set is used);
* ``depth >= max_j ceil(log_k e_j)``: ``d`` levels of k-LUTs reach at most ``k**d`` inputs.
The reported count bound is the larger of the first two.
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence

import numpy as np

from ..core.cube import Cover, Cube
from ..core.errors import InternalError
from ..core.network import Lut, LutNetwork
from ..core.table import DEFAULT_ENUM_LIMIT, Table, cubes_bits, unpack_bits
from .decompose import Decomposer, NetworkBuilder, OverBudget, Pending
from .options import LutOptions

__all__ = ["essential_inputs", "lower_bounds", "map_luts", "tidy_network"]


def _project(cubes: Sequence[Cube], support: Sequence[int]) -> list[Cube]:
    """Cubes restricted to ``support`` and renumbered so that ``support[b]`` becomes input ``b``."""
    out = []
    for c in cubes:
        care = value = 0
        for b, i in enumerate(support):
            if c.care >> i & 1:
                care |= 1 << b
                value |= (c.value >> i & 1) << b
        out.append(Cube(care, value))
    return out


def _local_sets(table: Table, j: int, support: Sequence[int]) -> tuple[np.ndarray, np.ndarray]:
    """ON and OFF of output ``j`` over its support as boolean arrays (inputs outside the support projected away)."""
    s = len(support)
    on = unpack_bits(cubes_bits(_project(table.on_cubes(j), support), s), s)
    off = unpack_bits(cubes_bits(_project(table.off_cubes(j), support), s), s)
    if (on & off).any():
        raise AssertionError(f"support of output {table.output_names[j]!r} drops a needed input")
    return on, off


def essential_inputs(table: Table, j: int) -> int:
    """Bitmask of inputs every realization of output ``j`` depends on (see module docs). Cube operations only."""
    on, off = table.on_cubes(j), table.off_cubes(j)
    mask = 0
    for i in range(table.n_inputs):
        bit = 1 << i
        for c in on:
            if c.care & bit:
                flipped = Cube(c.care, c.value ^ bit)
                if any(flipped.intersects(o) for o in off):
                    mask |= bit
                    break
    return mask


def _trivial(table: Table, j: int) -> bool:
    """Output ``j`` can be a constant or a plain input (no LUT at all)."""
    on, off = table.on_cubes(j), table.off_cubes(j)
    if not on or not off:
        return True
    for i in range(table.n_inputs):
        bit = 1 << i
        if all(c.care & bit and c.value & bit for c in on) and all(c.care & bit and not c.value & bit for c in off):
            return True
    return False


def _incompatible(table: Table, a: int, b: int) -> bool:
    return any(x.intersects(y) for x in table.on_cubes(a) for y in table.off_cubes(b)) or any(
        x.intersects(y) for x in table.off_cubes(a) for y in table.on_cubes(b))


def _essential_sat(table: Table, j: int) -> int:
    from ..verify.satcnf import sat_point

    mentioned = 0
    for sets in (table.on[j], table.dc[j], table.off[j]):
        for c in sets or ():
            mentioned |= c.care
    mask = 0
    for i in range(table.n_inputs):
        if mentioned >> i & 1 and sat_point(table, [(j, "on", 0), (j, "off", 1 << i)]) is not None:
            mask |= 1 << i
    return mask


def _trivial_sat(table: Table, j: int) -> bool:
    from ..verify.satcnf import sat_point

    if sat_point(table, [(j, "on", 0)]) is None or sat_point(table, [(j, "off", 0)]) is None:
        return True
    for i in range(table.n_inputs):
        if (sat_point(table, [(j, "on", 0)], [(-(i + 1),)]) is None
                and sat_point(table, [(j, "off", 0)], [(i + 1,)]) is None):
            return True
    return False


def _incompatible_sat(table: Table, a: int, b: int) -> bool:
    from ..verify.satcnf import sat_point

    return (sat_point(table, [(a, "on", 0), (b, "off", 0)]) is not None
            or sat_point(table, [(a, "off", 0), (b, "on", 0)]) is not None)


def lower_bounds(table: Table, k: int, enum_limit: int = DEFAULT_ENUM_LIMIT) -> dict[str, int]:
    """Proven lower bounds on LUT count and depth for ``table`` with k-LUTs (see module docs).

    Tables wider than ``enum_limit`` are examined with SAT queries on the sets as given (no complement);
    narrower ones with cube operations.

    Returns
    -------
    dict
        ``{"count": c, "depth": d, "count_cone": ..., "count_outputs": ...}``; ``count`` is the larger of the two
        count bounds.
    """
    sat = table.n_inputs > enum_limit
    essential = _essential_sat if sat else essential_inputs
    trivial = _trivial_sat if sat else _trivial
    incompatible = _incompatible_sat if sat else _incompatible
    cone = depth = 0
    chosen: list[int] = []
    triv = [trivial(table, j) for j in range(table.n_outputs)]
    for j in range(table.n_outputs):
        e = essential(table, j).bit_count()
        if e >= 2:
            cone = max(cone, math.ceil((e - 1) / (k - 1)))
            depth = max(depth, math.ceil(math.log(e, k) - 1e-9))
        if e >= 1 and not triv[j] and all(incompatible(table, j, c) for c in chosen):
            chosen.append(j)
    if not all(triv):
        depth = max(depth, 1)
    return {"count": max(cone, len(chosen)), "depth": depth, "count_cone": cone, "count_outputs": len(chosen)}


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
TWO_ORDER_LIMIT = 12


def _sizes_tried(table: Table, k: int, opts: LutOptions) -> list[int]:
    """LUT sizes mapped, ``k`` first: then ``k - 1``, ``k - 2``, ... down to 3 when the table has at most
    SMALLER_K_LIMIT inputs (a k'-LUT network is a k-LUT network, so a larger k never loses to a smaller one); the
    caller stops descending at the first size whose network has more than SMALLER_K_GIVE_UP times the LUTs of the
    best so far."""
    if table.n_inputs <= min(SMALLER_K_LIMIT, opts.enum_limit):
        return list(range(k, min(3, k) - 1, -1))
    return [k]


def _map_at(table: Table, cover: Cover, k: int, opts: LutOptions, prefix: str) -> LutNetwork:
    """Steps 1-5 of the module docs at one LUT size (no bounds, no check)."""
    builder = NetworkBuilder(table.input_names, k, prefix=_prefix(table.input_names, "@t"), global_limit=max(opts.decompose_limit, 1))
    dec = Decomposer(builder, k, budget=opts.bound_set_budget, beam=opts.beam)
    m = table.n_outputs
    if table.n_inputs > opts.enum_limit:
        # beyond the enumeration limit nothing is enumerated, not even a complement: every output goes through
        # the cover (whose supports are those of its cubes) and the cut-based path
        supports = [0] * m
        sizes = [opts.decompose_limit + 1] * m
    else:
        supports = [table.support(j) for j in range(m)]
        sizes = [s.bit_count() for s in supports]
    narrow = sorted((j for j in range(m) if sizes[j] <= opts.decompose_limit), key=lambda j: (sizes[j], j))
    wide = [j for j in range(m) if sizes[j] > opts.decompose_limit]
    drivers: list[str] = ["0"] * m
    # outputs that one function can serve (equal, or equal up to don't-cares) are realized once
    groups: list[tuple[list[int], tuple[int, ...], np.ndarray, np.ndarray]] = []
    for j in narrow:
        # the inputs the sets mention keep every don't-care choice open (projection onto them is exact); the
        # greedy support is used only when that is too wide
        mentioned = 0
        for c in table.on_cubes(j) + table.off_cubes(j):
            mentioned |= c.care
        mask = mentioned if mentioned.bit_count() <= opts.decompose_limit else supports[j]
        sup = tuple(i for i in range(table.n_inputs) if mask >> i & 1)
        on, off = _local_sets(table, j, sup)
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
        try:
            signal = dec.realize(u, sigs, on, off)
        except OverBudget:
            # too irregular to decompose within the budget: the cover and cuts take these outputs
            builder.rollback(before)
            wide.extend(outs)
            continue
        finally:
            builder.budget_end = None
        for j in outs:
            drivers[j] = signal
    wide.sort()
    luts = tuple(Lut(n.name, n.inputs, n.init) for n in builder.nodes)
    method = "decomposition" if narrow else ""
    net = LutNetwork(k, table.input_names, table.output_names, luts, tuple(drivers), {}, method)
    if wide:
        from .cuts import map_cover_outputs

        net = map_cover_outputs(net, cover, wide, opts)
    if opts.remap and net.luts:
        from .cuts import remap_network

        alt = remap_network(net, opts)
        if _objective_key(opts.objective)(alt) < _objective_key(opts.objective)(net):
            net = alt
    return tidy_network(_resolve_constant_luts(net), prefix)


def _cover_network(table: Table, cover: Cover, k: int, opts: LutOptions, prefix: str) -> LutNetwork | None:
    """Every output mapped by cuts from the cover alone (step 3 for all outputs); ``None`` for an empty cover."""
    from .cuts import map_cover_outputs

    if not cover.cubes:
        return None
    m = table.n_outputs
    empty = LutNetwork(k, table.input_names, table.output_names, (), ("0",) * m, {}, "")
    return tidy_network(_resolve_constant_luts(map_cover_outputs(empty, cover, range(m), opts)), prefix)


def _depth_pass(table: Table, net: LutNetwork, cut: LutNetwork | None, opts: LutOptions,
                prefix: str) -> LutNetwork:
    """The depth objective over ``net`` and the cover-only network ``cut`` (:mod:`plaforge.lut.depth`)."""
    from .depth import shallowest

    k, m = net.k, table.n_outputs
    candidates = [net] + ([cut] if cut is not None else [])
    enumerable = table.n_inputs <= opts.enum_limit
    supports = [table.support(j).bit_count() if enumerable else table.n_inputs for j in range(m)]

    def fallback(outputs: list[int]) -> LutNetwork | None:
        todo = [j for j in outputs if enumerable and supports[j] <= opts.decompose_limit]
        if not todo:
            return None
        builder = NetworkBuilder(table.input_names, k, prefix=_prefix(table.input_names, "@s"),
                                 global_limit=max(opts.decompose_limit, 1))
        dec = Decomposer(builder, k, reuse=False)
        drivers = ["0"] * m
        for j in todo:
            sup = tuple(i for i in range(table.n_inputs) if table.support(j) >> i & 1)
            on, off = _local_sets(table, j, sup)
            u = builder.universe(sup)
            drivers[j] = dec.shannon(u, [table.input_names[i] for i in u.inputs], on, off)
        luts = tuple(Lut(n.name, n.inputs, n.init) for n in builder.nodes)
        raw = LutNetwork(k, table.input_names, table.output_names, luts, tuple(drivers), {}, "Shannon")
        return tidy_network(_resolve_constant_luts(raw), prefix)

    return shallowest(candidates, supports, fallback, opts, lambda n: tidy_network(_resolve_constant_luts(n), prefix))


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
    canon = canonical_order(table) if table.n_inputs <= opts.enum_limit else tuple(range(table.n_inputs))
    orders = [canon]
    if table.n_inputs <= TWO_ORDER_LIMIT and canon[::-1] != canon:
        orders.append(canon[::-1])
    key = _objective_key(opts.objective)
    best: tuple[LutNetwork, Table, Cover] | None = None
    for order in orders:
        ctable, ccover = permute_table(table, order), permute_cover(cover, order)
        here: LutNetwork | None = None
        for kk in _sizes_tried(ctable, k, opts):
            cand = _map_at(ctable, ccover, kk, opts, prefix)
            cand = LutNetwork(k, cand.input_names, cand.output_names, cand.luts, cand.drivers, {},
                              cand.method + ("" if kk == k else f" (k={kk})"))
            if here is not None and cand.count > SMALLER_K_GIVE_UP * here.count:
                break  # smaller LUTs only get worse from here on
            if here is None or key(cand) < key(here):
                here = cand
        assert here is not None
        if best is None or key(here) < key(best[0]):
            best = (here, ctable, ccover)
    assert best is not None
    net, ctable, ccover = best
    cut = _cover_network(ctable, ccover, k, opts, prefix)
    if cut is not None and key(cut) < key(net):
        net = cut
    if opts.objective == "depth":
        net = _depth_pass(ctable, net, cut, opts, prefix)
    bounds = lower_bounds(table, k, opts.enum_limit)
    net = LutNetwork(net.k, table.input_names, net.output_names, _spec_order_fanins(net, table.input_names),
                     net.drivers, bounds, net.method)
    if opts.verify:
        from ..verify.satcnf import check_network_any

        verdict = check_network_any(table, net, limit=opts.enum_limit)
        if not verdict.passed:
            bad = [o.name for o in verdict.outputs if not o.passed]
            raise InternalError(f"LUT mapping produced a wrong network for outputs {bad}: a bug, unless the cover "
                                "given to map_luts does not realize those outputs")
    return net
