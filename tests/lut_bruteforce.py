"""Brute-force reference for the cut-based mapper's depth (tests only; exponential, for graphs of a dozen nodes)."""

from __future__ import annotations

import math
from itertools import combinations

from plaforge.lut.cuts import SubjectGraph


def min_depth_bruteforce(g: SubjectGraph, k: int) -> int:
    """Minimum depth of any k-LUT cover of ``g``'s outputs, by brute force.

    Independent of the cut enumeration in :mod:`plaforge.lut.cuts`: a node's k-feasible cuts are found by trying every set of at most k
    nodes and checking by search that every input-to-node path meets it; then every combination of cut choices
    for the nodes that the choices reach is tried, and the deepest output of each complete choice is measured.
    Exponential: only for graphs of a dozen nodes.
    """
    n = len(g)

    def is_cut(v: int, c: frozenset[int]) -> bool:
        if v in c:
            return False
        stack, seen = [v], set()
        while stack:
            x = stack.pop()
            if x in c or x in seen:
                continue
            seen.add(x)
            if x < g.n_pis:
                return False  # reached an input without crossing the cut
            stack.extend(g.fanins[x])
        # every leaf must be reachable from v (a minimal-ish cut; unreachable leaves only add pins)
        return all(_reaches(g, v, u) for u in c)

    cuts: dict[int, list[frozenset[int]]] = {}
    for v in range(g.n_pis, n):
        cand = [u for u in range(n) if u != v and _reaches(g, v, u)]
        cuts[v] = [frozenset(c) for s in range(1, k + 1) for c in combinations(cand, s) if is_cut(v, frozenset(c))]

    outs = [o for o in g.outputs if isinstance(o, int) and o >= g.n_pis]
    best = math.inf

    def search(todo: list[int], choice: dict[int, frozenset[int]]) -> None:
        nonlocal best
        if not todo:
            level: dict[int, int] = {}

            def lv(x: int) -> int:
                if x < g.n_pis:
                    return 0
                if x not in level:
                    level[x] = 1 + max(lv(u) for u in choice[x])
                return level[x]

            best = min(best, max((lv(o) for o in outs), default=0))
            return
        v, rest = todo[0], todo[1:]
        if v in choice:
            search(rest, choice)
            return
        for c in cuts[v]:
            choice[v] = c
            search(rest + [u for u in sorted(c) if u >= g.n_pis and u not in choice], choice)
            del choice[v]

    search(list(dict.fromkeys(outs)), {})
    return int(best)


def _reaches(g: SubjectGraph, v: int, u: int) -> bool:
    """Whether ``u`` is in the transitive fan-in of ``v``."""
    stack, seen = [v], set()
    while stack:
        x = stack.pop()
        if x == u:
            return True
        if x in seen:
            continue
        seen.add(x)
        stack.extend(g.fanins[x])
    return False
