"""Word-level additive decomposition: outputs read as one integer that is a sum of functions of fewer inputs.

Idea
----
Read the outputs of a fully specified table as the bits of one integer ``W(x) = sum_j 2**j f_j(x)`` (output ``j`` of
weight ``2**j``, or the reverse when the outputs are listed most significant first). ``W`` has a unique multilinear
form over the integers, ``W = sum_S c_S prod_{i in S} x_i`` (its coefficients are the Moebius transform of the
value table, ``O(n 2**n)``). Two inputs *interact* when some monomial with ``c_S != 0`` contains both. If removing
a set ``C`` of inputs leaves the interaction graph in several components, the monomials split by the component they
touch and

    ``W(x) = W_0(x_C) + sum_g U_g(x_C, x_g)``,

each ``U_g`` a function of ``C`` and the inputs of its group only (``U_g = W`` with the other groups' inputs at 0,
minus ``W_0 = W`` with every input outside ``C`` at 0). This is a bi-decomposition (Mishchenko, Steinbach and
Perkowski, 2001) whose operator is integer addition of the output word rather than a gate on one bit; the multiplier
``a * b = a * b_lo + a * b_hi`` (``C`` = the bits of ``a``) and every sum of independent terms are of this form,
although the middle bits of a product have no gate bi-decomposition at all (measured: bits 4 to 6 of the 4x4-bit
product have no OR, AND or XOR bi-decomposition for any partition of the inputs). The separator ``C`` is the
smallest (then the one whose two groups are the most balanced, then the first in input order) found by enumerating
subsets, cheap for the tables it is used on (at most :data:`ARITH_LIMIT` inputs).

Network
-------
The components are dealt into two groups in the ways whose input counts are the most even (at most
:data:`GROUPINGS` of them), and also left one term each; for each grouping, each term ``U_g`` (and ``W_0``) has its
bits realized by functional decomposition (:class:`plaforge.lut.decompose.Decomposer`, LUTs shared between all of
them); then every output bit is realized by the same decomposer from the terms' bit signals: the adder of the terms,
whose local functions have don't-cares wherever the terms cannot take those values together. Terms with a negative
value are not used. Every grouping is built at each LUT size the caller asks for, and the smallest network wins.

Measured on the 4x4-bit multiplier (8 inputs, 8 outputs; ``C`` = one operand, the best terms e.g. ``a * (b_0 + 2 b_1)``
and ``4 a * (b_2 + 2 b_3)``): 26 LUTs at k = 4 and 15 at k = 6, against 63 and 20 by decomposing each output bit.

The result is one more candidate network for the mapper: the best one wins, so this can only lower a count.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from itertools import combinations

import numpy as np

from ..core.network import Lut, LutNetwork
from ..core.table import Table
from .decompose import Decomposer, NetworkBuilder, OverBudget
from .points import PointSets

__all__ = ["ARITH_LIMIT", "additive_network", "additive_split", "moebius"]

ARITH_LIMIT = 12  # inputs; the separator search enumerates subsets of them
GROUPINGS = 4  # two-group deals of the components tried per table and LUT size
WORD_LIMIT = 40  # outputs read as one integer (int64 holds the coefficients: 2**(n + m) stays below 2**62)


def moebius(values: np.ndarray, n: int) -> np.ndarray:
    """Coefficients ``c_S`` (index: the bitmask of ``S``) of the multilinear form of ``values`` over ``2**n``
    points (integer arithmetic)."""
    c = values.astype(np.int64).copy()
    for i in range(n):
        c = c.reshape(-1, 2, 1 << i)
        c[:, 1, :] -= c[:, 0, :]
        c = c.reshape(-1)
    return c


def _components(adj: Sequence[int], rest: int) -> list[int]:
    """Connected components (bitmasks) of the graph ``adj`` restricted to the vertex set ``rest``."""
    comps = []
    left = rest
    while left:
        seed = left & -left
        comp, frontier = seed, seed
        while frontier:
            v = frontier & -frontier
            frontier ^= v
            new = adj[v.bit_length() - 1] & rest & ~comp
            comp |= new
            frontier |= new
        comps.append(comp)
        left &= ~comp
    return comps


def interaction_graph(word: np.ndarray, n: int) -> list[int]:
    """Per input, the bitmask of the inputs it shares a monomial with (module docs)."""
    monos = np.flatnonzero(moebius(word, n))
    adj = []
    for i in range(n):
        having = monos[(monos >> i) & 1 == 1]
        adj.append(int(np.bitwise_or.reduce(having)) & ~(1 << i) if having.size else 0)
    return adj


def additive_split(word: np.ndarray, n: int) -> tuple[int, list[int]] | None:
    """The smallest separator ``C`` of the interaction graph of the integer function ``word`` (the first in input
    order among those of that size whose components are the most even) and the components left (bitmasks, in
    order of their lowest input), or ``None`` when no set of at most ``n - 2`` inputs separates it."""
    adj = interaction_graph(word, n)
    full = (1 << n) - 1
    if all(adj[i] == full & ~(1 << i) for i in range(n)):
        return None  # every pair interacts: no separator
    for size in range(n - 1):
        best: tuple[int, int, list[int]] | None = None
        for xc in combinations(range(n), size):
            cmask = sum(1 << i for i in xc)
            comps = _components(adj, full & ~cmask)
            if len(comps) < 2:
                continue
            even = _even_groupings(comps)[0]
            balance = min(g.bit_count() for g in even)
            if best is None or balance > best[0]:
                best = (balance, cmask, comps)
        if best is not None:
            return best[1], best[2]
    return None


def _even_groupings(comps: Sequence[int], limit: int = GROUPINGS) -> list[list[int]]:
    """Ways to deal the components into two groups whose input counts differ the least (at most ``limit``, the
    first component always in the first group, in combination order)."""
    sizes = [c.bit_count() for c in comps]
    total = sum(sizes)
    found: list[tuple[int, list[int]]] = []
    rest = list(range(1, len(comps)))
    for r in range(len(rest)):
        for sel in combinations(rest, r):
            first = (0,) + sel
            a = sum(sizes[x] for x in first)
            found.append((abs(total - 2 * a), [sum(comps[x] for x in first),
                                                sum(comps[x] for x in range(len(comps)) if x not in first)]))
    gap = min(f[0] for f in found)
    return [g for d, g in found if d == gap][:limit]


def groupings(comps: Sequence[int]) -> list[list[int]]:
    """Term groupings tried: the most even two-group deals (:func:`_even_groupings`), then every component a term
    of its own (when there are more than two)."""
    out = _even_groupings(comps)
    if len(comps) > 2:
        out.append(list(comps))
    return out


def _terms(word: np.ndarray, n: int, cmask: int, groups: Sequence[int]) -> list[np.ndarray]:
    """``W_0`` and one ``U_g`` per group (module docs); their sum is ``word``."""
    pts = np.arange(1 << n, dtype=np.int64)
    outside = ((1 << n) - 1) & ~cmask
    w0 = word[pts & ~outside]
    terms = [w0]
    for g in groups:
        terms.append(word[pts & ~(outside & ~g)] - w0)
    return terms


def additive_network(table: Table, points: PointSets, sizes: Sequence[int],
                     finish: Callable[[LutNetwork], LutNetwork], prefix: str = "@a",
                     work_budget: int = 0, deadline: float | None = None) -> LutNetwork | None:
    """The best additive candidate (module docs) over the LUT sizes ``sizes`` (the first is the network's ``k``;
    a smaller LUT size gives a network valid for it too) and the groupings of :func:`groupings`, each network
    passed through ``finish`` (clean-up, remapping) before the counts are compared; ``None`` when the table is
    not of that form (or too wide, not fully specified, or every try went past ``work_budget`` array elements or
    the ``deadline``). Not checked against the table."""
    n, m = table.n_inputs, table.n_outputs
    if n > ARITH_LIMIT or n < 3 or not 2 <= m <= WORD_LIMIT or not sizes:
        return None
    ons = []
    for j in range(m):
        on, off = points(j)
        if not (on | off).all():
            return None
        ons.append(on)
    k = sizes[0]
    best: LutNetwork | None = None
    for msb_first in (False, True):
        weights = [m - 1 - j if msb_first else j for j in range(m)]
        word = np.zeros(1 << n, dtype=np.int64)
        for j in range(m):
            word |= ons[j].astype(np.int64) << weights[j]
        split = additive_split(word, n)
        if split is None:
            continue
        cmask, comps = split
        for groups in groupings(comps):
            terms = _terms(word, n, cmask, groups)
            if any((t < 0).any() for t in terms):
                continue
            for kk in sizes:
                net = _build(table, ons, weights, terms, kk, prefix, work_budget, deadline)
                if net is None:
                    continue
                net = finish(LutNetwork(k, net.input_names, net.output_names, net.luts, net.drivers, {},
                                        net.method + ("" if kk == k else f" (k={kk})")))
                if best is None or (net.count, net.depth) < (best.count, best.depth):
                    best = net
    return best


def _build(table: Table, ons: Sequence[np.ndarray], weights: Sequence[int], terms: Sequence[np.ndarray], k: int,
           prefix: str, work_budget: int, deadline: float | None) -> LutNetwork | None:
    """Terms' bits, then every output from them in order of weight (``weights[j]``: output ``j``'s bit of the
    word), by one shared decomposer."""
    n = table.n_inputs
    builder = NetworkBuilder(table.input_names, k, prefix=prefix, global_limit=max(n, 1), deadline=deadline)
    if work_budget:
        builder.work_end = work_budget
    dec = Decomposer(builder, k)
    u = builder.universe(tuple(range(n)))
    names = list(table.input_names)
    try:
        bits: list[tuple[int, str]] = []
        for term in terms:
            for w in range(int(term.max()).bit_length()):
                on = ((term >> w) & 1).astype(bool)
                bits.append((w, dec.realize(u, names, on, ~on)))
        sigs = list(dict.fromkeys(s for _, s in sorted(bits, key=lambda b: b[0]) if s not in ("0", "1")))
        got = {j: dec.realize(u, sigs, ons[j], ~ons[j]) for j in sorted(range(len(ons)), key=lambda j: weights[j])}
        drivers = tuple(got[j] for j in range(len(ons)))
    except OverBudget:
        return None
    luts = tuple(Lut(x.name, x.inputs, x.init) for x in builder.nodes)
    return LutNetwork(k, table.input_names, table.output_names, luts, drivers, {}, "additive decomposition")
