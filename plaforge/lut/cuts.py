"""Cut-based LUT mapping: depth-optimal labels (FlowMap-style) with area recovery, on a subject graph.

Vocabulary
----------
subject graph
    A DAG of small nodes, each with ordered fan-ins and an INIT over them (2-input gates from a two-level cover, or
    the LUTs of a network being remapped). Nodes ``0 .. n_pis-1`` are the table inputs.
cut
    A set ``C`` of nodes such that every path from an input to node ``v`` passes through ``C``; it is
    *k-feasible* when ``|C| <= k``. A k-feasible cut of ``v`` is one k-LUT computing ``v`` from ``C``: its INIT is
    the cone between ``C`` and ``v`` simulated over the ``2**|C|`` values of ``C``.
cut enumeration
    ``cuts(v) = { {v} } ∪ { c_1 ∪ ... ∪ c_r : c_i ∈ cuts(fanin_i), |∪| <= k }`` over the fan-ins of ``v``, with
    dominated cuts (supersets of another cut of ``v``) removed. Without a limit this is every k-feasible cut of
    ``v`` that is minimal, so the labels below equal FlowMap's: for each node the minimum depth of any k-LUT
    mapping of its cone over all cut choices. With ``cut_limit > 0`` only that many cuts are kept per node (the
    shallowest, then the smallest area flow): "priority cuts", no longer guaranteed optimal; the mapping records
    whether the limit was ever reached.

Algorithm
---------
1. labels: ``depth(input) = 0``, ``depth(v) = min over cuts C of v of 1 + max_{u in C} depth(u)``; the target
   depth is the largest label of an output (or unbounded when relaxing for area);
2. cover: from the outputs, take each node's chosen cut, recursively over its leaves;
3. area recovery, twice: required times flow back from the outputs (``req(leaf) <= req(v) - 1``); in topological
   order each node picks, among cuts whose arrival fits its required time, the one of least *area flow*
   ``(1 + sum of leaf area flows) / fan-out estimate``; then one pass of exact local area (the cut whose
   dereferenced cone is smallest). Arrival never exceeds the required time, so the depth stays at the target.
Cost: ``O(nodes * cuts^fanin)`` for enumeration; fine for the few thousand nodes met here.
"""

from __future__ import annotations

import time
from collections.abc import Sequence
from dataclasses import dataclass, field

from ..core.cube import Cover
from ..core.errors import TimeLimit
from ..core.network import Lut, LutNetwork
from .options import LutOptions

__all__ = [
    "CutMapping",
    "SubjectGraph",
    "graph_from_cover",
    "graph_from_network",
    "map_cover_outputs",
    "map_subject",
    "remap_network",
]

INF = 1 << 30


@dataclass
class SubjectGraph:
    """Nodes ``0 .. n_pis-1`` are inputs; every other node has fan-ins (smaller ids) and an INIT over them."""

    pi_names: tuple[str, ...]
    fanins: list[tuple[int, ...]] = field(default_factory=list)
    funcs: list[int] = field(default_factory=list)
    names: list[str] = field(default_factory=list)
    outputs: list[int | str] = field(default_factory=list)  # node id, or "0"/"1"
    _hash: dict[tuple[tuple[int, ...], int], int] = field(default_factory=dict)

    def __post_init__(self) -> None:
        if not self.fanins:
            self.fanins = [() for _ in self.pi_names]
            self.funcs = [0 for _ in self.pi_names]
            self.names = list(self.pi_names)

    @property
    def n_pis(self) -> int:
        return len(self.pi_names)

    def __len__(self) -> int:
        return len(self.fanins)

    def add(self, fanins: Sequence[int], func: int, name: str | None = None) -> int:
        """Add a node (structurally hashed: same fan-ins and INIT give the same node)."""
        key = (tuple(fanins), func)
        if key in self._hash:
            return self._hash[key]
        for f in fanins:
            if not 0 <= f < len(self.fanins):
                raise ValueError(f"fan-in {f} of a new node is not an existing node")
        v = len(self.fanins)
        self.fanins.append(tuple(fanins))
        self.funcs.append(func)
        self.names.append(name if name is not None else f"@g{v}")
        self._hash[key] = v
        return v


@dataclass
class CutMapping:
    """Result of :func:`map_subject`: chosen cut per mapped node, with its INIT, and the figures."""

    graph: SubjectGraph
    chosen: dict[int, tuple[tuple[int, ...], int]]  # node -> (leaves in order, INIT)
    depth: int
    exhaustive: bool

    @property
    def count(self) -> int:
        return len(self.chosen)


def _prune(sets: set[frozenset[int]]) -> list[frozenset[int]]:
    """Remove sets that contain another set of the collection (deterministic order: size, then members)."""
    ordered = sorted(sets, key=lambda c: (len(c), sorted(c)))
    kept: list[frozenset[int]] = []
    for c in ordered:
        if not any(x <= c for x in kept):
            kept.append(c)
    return kept


HARD_CUT_CAP = 400


def _enumerate_cuts(g: SubjectGraph, k: int, limit: int,
                    deadline: float | None = None) -> tuple[list[list[tuple[int, ...]]], bool]:
    """Non-trivial cuts per node (sorted tuples), trivial cut excluded; and whether no list was truncated.

    Fan-in cut lists are merged one fan-in at a time, dropping unions above k and dominated unions at every
    step (safe: if ``a ⊆ b`` then ``a ∪ x ⊆ b ∪ x``). ``limit`` 0 keeps everything up to a safety cap of
    ``HARD_CUT_CAP`` cuts per node. Past ``deadline`` (``time.monotonic()``) it raises
    :class:`plaforge.core.errors.TimeLimit`.
    """
    cuts: list[list[tuple[int, ...]]] = []
    exhaustive = True
    cap = limit if limit else HARD_CUT_CAP
    depth = [0] * len(g)
    for v in range(len(g)):
        fan = g.fanins[v]
        if deadline is not None and v % 64 == 0 and time.monotonic() > deadline:
            raise TimeLimit(f"LUT mapping did not finish within the time limit (cut enumeration at node {v} of "
                            f"{len(g)})", option="--time-limit")
        if v < g.n_pis or not fan:
            cuts.append([])
            continue
        acc: list[frozenset[int]] = [frozenset()]
        for u in fan:
            options = [frozenset(c) for c in cuts[u]] + [frozenset((u,))]
            merged = {a | c for a in acc for c in options if len(a | c) <= k}
            acc = _prune(merged)
        lst = [tuple(sorted(c)) for c in acc]
        if len(lst) > cap:
            exhaustive = False
            lst.sort(key=lambda c: (1 + max(depth[u] for u in c), len(c), c))
            lst = lst[:cap]
        depth[v] = min(1 + max(depth[u] for u in c) for c in lst)
        cuts.append(lst)
    return cuts, exhaustive


def _apply(func: int, pats: Sequence[int], full: int) -> int:
    """Apply an INIT to fan-in patterns (bitsets over the cut's points)."""
    res = 0
    for p in range(1 << len(pats)):
        if not func >> p & 1:
            continue
        term = full
        for b, x in enumerate(pats):
            term &= x if p >> b & 1 else ~x & full
            if not term:
                break
        res |= term
    return res


def cut_function(g: SubjectGraph, v: int, leaves: Sequence[int]) -> int:
    """INIT of node ``v`` over the cut ``leaves`` (leaf ``b`` is INIT index bit ``b``)."""
    m = len(leaves)
    size = 1 << m
    full = (1 << size) - 1
    vals: dict[int, int] = {}
    for b, leaf in enumerate(leaves):
        pat = 0
        for p in range(size):
            if p >> b & 1:
                pat |= 1 << p
        vals[leaf] = pat

    def val(x: int) -> int:
        if x in vals:
            return vals[x]
        if x < g.n_pis:
            raise ValueError(f"node {v} does not have {list(leaves)} as a cut")
        r = _apply(g.funcs[x], [val(u) for u in g.fanins[x]], full)
        vals[x] = r
        return r

    stack_safe = val(v)
    return stack_safe


def map_subject(g: SubjectGraph, k: int, cut_limit: int = 0, relax: bool = False,
                area_passes: int = 2, per_output: bool = False, deadline: float | None = None) -> CutMapping:
    """Map a subject graph onto k-LUTs (see module docs).

    Parameters
    ----------
    g : SubjectGraph
    k : int
        LUT size.
    cut_limit : int
        Cuts kept per node (0: all).
    relax : bool
        Recover area without a depth target (depth may exceed the optimum).
    per_output : bool
        Hold every output at its own optimal label (instead of the deepest output's): no output gets deeper than
        its labelling allows, at some cost in area.
    deadline : float or None
        ``time.monotonic()`` after which cut enumeration raises :class:`plaforge.core.errors.TimeLimit`.
    area_passes : int
        Area-flow passes before the exact-area pass.
    """
    cuts, exhaustive = _enumerate_cuts(g, k, cut_limit, deadline)
    n = len(g)
    outs = [o for o in g.outputs if isinstance(o, int) and o >= g.n_pis]
    fanout = [0] * n
    for v in range(n):
        for u in g.fanins[v]:
            fanout[u] += 1
    for o in outs:
        fanout[o] += 1
    arr = [0] * n
    af = [0.0] * n
    best: list[tuple[int, ...] | None] = [None] * n

    def arrival(c: tuple[int, ...]) -> int:
        return 1 + max(arr[u] for u in c)

    def flow(c: tuple[int, ...], refs: list[int]) -> float:
        return 1.0 + sum(af[u] / max(1, refs[u]) for u in c)

    for v in range(g.n_pis, n):
        if not cuts[v]:
            continue
        c = min(cuts[v], key=lambda c: (arrival(c), flow(c, fanout), len(c), c))
        best[v] = c
        arr[v] = arrival(c)
        af[v] = flow(c, fanout)
    target = max((arr[o] for o in outs), default=0)
    if relax:
        target = INF

    def cover() -> tuple[set[int], list[int]]:
        mapped: set[int] = set()
        refs = [0] * n
        stack = list(outs)
        for o in outs:
            refs[o] += 1
        while stack:
            v = stack.pop()
            if v in mapped:
                continue
            mapped.add(v)
            for u in best[v]:  # type: ignore[union-attr]
                if u >= g.n_pis:
                    refs[u] += 1
                    stack.append(u)
        return mapped, refs

    own = {o: arr[o] for o in outs}

    def required(mapped: set[int]) -> list[int]:
        req = [INF] * n
        for o in outs:
            req[o] = min(req[o], own[o] if per_output and not relax else target)
        for v in sorted(mapped, reverse=True):
            for u in best[v]:  # type: ignore[union-attr]
                req[u] = min(req[u], req[v] - 1)
        return req

    for _ in range(area_passes):
        mapped, refs = cover()
        req = required(mapped)
        est = [max(1, (refs[v] + fanout[v]) // 2) if v in mapped else max(1, fanout[v]) for v in range(n)]
        for v in range(g.n_pis, n):
            if not cuts[v]:
                continue
            ok = [c for c in cuts[v] if arrival(c) <= req[v]]
            if not ok:
                ok = [best[v]]  # type: ignore[list-item]
            c = min(ok, key=lambda c: (flow(c, est), arrival(c), len(c), c))
            best[v] = c
            arr[v] = arrival(c)
            af[v] = flow(c, est)

    # exact local area: reference counting on the current cover
    mapped, refs = cover()
    req = required(mapped)

    def deref(v: int) -> int:
        size = 1
        for u in best[v]:  # type: ignore[union-attr]
            if u >= g.n_pis:
                refs[u] -= 1
                if refs[u] == 0:
                    size += deref(u)
        return size

    def ref(v: int) -> int:
        size = 1
        for u in best[v]:  # type: ignore[union-attr]
            if u >= g.n_pis:
                if refs[u] == 0:
                    size += ref(u)
                refs[u] += 1
        return size

    for v in range(g.n_pis, n):
        if not cuts[v] or refs[v] == 0:
            continue
        deref(v)
        old = best[v]
        choice, choice_key = old, None
        for c in cuts[v]:
            if arrival(c) > req[v]:
                continue
            best[v] = c
            area = ref(v)
            deref(v)
            key = (area, arrival(c), len(c), c)
            if choice_key is None or key < choice_key:
                choice, choice_key = c, key
        best[v] = choice
        ref(v)
        arr[v] = arrival(choice)  # type: ignore[arg-type]
        # required times of the new leaves
        for u in choice:  # type: ignore[union-attr]
            req[u] = min(req[u], req[v] - 1)

    mapped, _ = cover()
    chosen = {v: (best[v], cut_function(g, v, best[v])) for v in sorted(mapped)}  # type: ignore[arg-type]
    level = [0] * n
    for v in sorted(mapped):
        level[v] = 1 + max(level[u] for u in chosen[v][0])
    depth = max((level[o] for o in outs), default=0)
    return CutMapping(g, chosen, depth, exhaustive)


def mapping_to_luts(m: CutMapping) -> tuple[list[Lut], list[str]]:
    """LUTs (topological, named by the subject nodes) and a driver per subject output."""
    g = m.graph
    luts = [Lut(g.names[v], tuple(g.names[u] for u in leaves), init) for v, (leaves, init) in m.chosen.items()]
    drivers = [o if isinstance(o, str) else g.names[o] for o in g.outputs]
    return luts, drivers


def graph_from_network(net: LutNetwork) -> SubjectGraph:
    """The LUTs of a network as a subject graph (fan-ins ``"0"``/``"1"`` must have been folded away)."""
    g = SubjectGraph(net.input_names)
    ids = {name: i for i, name in enumerate(net.input_names)}
    for lut in net.luts:
        v = len(g)
        g.fanins.append(tuple(ids[i] for i in lut.inputs))
        g.funcs.append(lut.init)
        g.names.append(lut.name)
        ids[lut.name] = v
    g.outputs = [ids.get(d, d) for d in net.drivers]
    return g


def remap_network(net: LutNetwork, options: LutOptions, per_output: bool = False) -> LutNetwork:
    """Remap a LUT network by cuts over its own LUTs; the better of the depth-targeted and relaxed mappings.

    The better is chosen by ``options.objective``; ``method`` records ``+cuts`` and whether cut lists were
    complete. With ``per_output`` only the depth-targeted mapping is made, every output held at its own optimal
    label, so no output ends deeper than it is in ``net`` (a LUT's own fan-ins are one of its cuts).
    """
    g = graph_from_network(net)
    best: LutNetwork | None = None
    keyf = (lambda n: (n.count, n.depth)) if options.objective == "area" else (lambda n: (n.depth, n.count))
    for relax in ((False,) if per_output else (False, True)):
        m = map_subject(g, net.k, options.cut_limit, relax=relax, per_output=per_output)
        luts, drivers = mapping_to_luts(m)
        cand = LutNetwork(net.k, net.input_names, net.output_names, tuple(luts), tuple(drivers), {},
                          f"{net.method}+remap cuts" + ("" if m.exhaustive else " (priority cuts)"))
        if best is None or keyf(cand) < keyf(best):
            best = cand
    assert best is not None
    return best


def graph_from_cover(cover: Cover, outputs: Sequence[int]) -> SubjectGraph:
    """Subject graph of a two-level cover: each product term a balanced tree of 2-input ANDs (literal polarity
    in the first level), each output a balanced OR tree over its terms (an inverter on top when the cover
    realizes it in complement). Only ``outputs`` are built."""
    g = SubjectGraph(cover.input_names)
    term_node: dict[tuple[int, int], int | str] = {}

    def balanced(items: list[tuple[int, int]], op: str) -> int | str:
        # items: (node, polarity); op "and"/"or"; returns a node id
        if not items:
            return "1" if op == "and" else "0"
        if len(items) == 1:
            node, pol = items[0]
            return node if pol else g.add((node,), 0b01)
        level = items
        while len(level) > 1:
            nxt: list[tuple[int, int]] = []
            for x in range(0, len(level) - 1, 2):
                (a, pa), (b, pb) = level[x], level[x + 1]
                if op == "and":
                    func = 1 << (pa | pb << 1)
                else:  # OR of literals: 0 only where both literals are 0
                    func = 0b1111 & ~(1 << ((1 - pa) | (1 - pb) << 1))
                nxt.append((g.add((a, b), func), 1))
            if len(level) % 2:
                nxt.append(level[-1])
            level = nxt
        node, pol = level[0]
        return node if pol else g.add((node,), 0b01)

    outs: list[int | str] = []
    for j in outputs:
        terms: list[tuple[int, int]] = []
        const_one = False
        for c in cover.cubes_for(j):
            key = (c.care, c.value)
            if key not in term_node:
                lits = [(i, c.value >> i & 1) for i in range(cover.n_inputs) if c.care >> i & 1]
                term_node[key] = balanced(lits, "and")
            t = term_node[key]
            if t == "1":
                const_one = True
            elif isinstance(t, int):
                terms.append((t, 1))
        if const_one:
            root: int | str = "1"
        else:
            root = balanced(sorted(set(terms)), "or")
        if cover.is_inverted(j):
            if isinstance(root, str):
                root = "0" if root == "1" else "1"
            else:
                root = g.add((root,), 0b01)
        outs.append(root)
    g.outputs = outs
    return g


def map_cover_outputs(net: LutNetwork, cover: Cover, outputs: Sequence[int], options: LutOptions,
                      deadline: float | None = None) -> LutNetwork:
    """Add the cut-mapped LUTs of ``outputs`` (from ``cover``) to ``net`` and drive those outputs with them
    (:class:`plaforge.core.errors.TimeLimit` past ``deadline``)."""
    g = graph_from_cover(cover, outputs)
    used = {lut.name for lut in net.luts}
    for v in range(g.n_pis, len(g)):
        name = f"@c{v}"
        while name in used or name in net.input_names:
            name = "@" + name
        g.names[v] = name
    m = map_subject(g, net.k, options.cut_limit, deadline=deadline)
    luts, drivers = mapping_to_luts(m)
    new_drivers = list(net.drivers)
    for j, d in zip(outputs, drivers):
        new_drivers[j] = d
    suffix = ("+" if net.method else "") + "cover cuts" + ("" if m.exhaustive else " (priority cuts)")
    return LutNetwork(net.k, net.input_names, net.output_names, net.luts + tuple(luts), tuple(new_drivers), {},
                      net.method + suffix)
