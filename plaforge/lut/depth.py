"""The depth objective: per output, the shallowest of several realizations, then area recovery at those depths.

Candidates per output
---------------------
* the area-oriented network (decomposition, cover cuts, remap), so the result is never deeper than it;
* the two-level cover as balanced AND/OR trees mapped by cuts with depth-optimal labels (FlowMap-style);
* for outputs still deeper than the Shannon bound ``1 + ceil((n - k) / s)`` (:func:`shannon_depth`), a Shannon
  multiplexer tree, which meets that bound by construction.

Picks
-----
* shallowest: per output the candidate of least level, then smallest cone;
* area recovery: the network depth ``D`` is that of the shallowest pick, and every output may end at level
  ``min(D, its Shannon bound)`` (or its own best level, when higher). A depth-bounded decomposition of every output
  within that level (:meth:`plaforge.lut.decompose.Decomposer.bounded`: Ashenhurst-Curtis and reuse steps taken
  only while a Shannon tree over what is left would still fit, a Shannon step otherwise) is one more candidate,
  and per output the smallest cone within the slack is picked.
Each pick is merged into one network (equal LUTs shared) and remapped by cuts with every output held at its own
label in it; the smaller of the two networks is kept. Neither is deeper than ``D``, and no output ends above its
Shannon bound.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

from ..core.network import Lut, LutNetwork
from .cuts import remap_network
from .decompose import shannon_depth
from .options import LutOptions

__all__ = ["cone_sizes", "merge_networks", "output_levels", "shallowest"]


def output_levels(net: LutNetwork) -> list[int]:
    """Depth of each output's driver (0 for inputs and constants)."""
    level: dict[str, int] = {}
    for lut in net.luts:
        level[lut.name] = 1 + max((level.get(i, 0) for i in lut.inputs), default=0)
    return [level.get(d, 0) for d in net.drivers]


def cone_sizes(net: LutNetwork) -> list[int]:
    """Number of LUTs in each output's fan-in cone."""
    by_name = {lut.name: lut for lut in net.luts}
    sizes = []
    for d in net.drivers:
        seen: set[str] = set()
        stack = [d]
        while stack:
            x = stack.pop()
            if x in by_name and x not in seen:
                seen.add(x)
                stack.extend(by_name[x].inputs)
        sizes.append(len(seen))
    return sizes


def merge_networks(nets: Sequence[LutNetwork], pick: Sequence[int], method: str) -> LutNetwork:
    """One network whose output ``j`` is driven as in ``nets[pick[j]]``; LUTs renamed apart (``@m<x>_<name>``)."""
    first = nets[0]
    luts: list[Lut] = []
    drivers = []
    for x, net in enumerate(nets):
        if x not in pick:
            continue
        ren = {lut.name: f"@m{x}_{lut.name}" for lut in net.luts}
        luts += [Lut(ren[lut.name], tuple(ren.get(i, i) for i in lut.inputs), lut.init) for lut in net.luts]
    for j, x in enumerate(pick):
        d = nets[x].drivers[j]
        drivers.append(f"@m{x}_{d}" if any(lut.name == d for lut in nets[x].luts) else d)
    return LutNetwork(first.k, first.input_names, first.output_names, tuple(luts), tuple(drivers), {}, method)


def shallowest(candidates: Sequence[LutNetwork], supports: Sequence[int],
               fallback: Callable[[list[int]], tuple[LutNetwork, set[int]] | None], options: LutOptions,
               tidy: Callable[[LutNetwork], LutNetwork],
               bounded: Callable[[dict[int, int]], tuple[LutNetwork, set[int]] | None] | None = None) -> LutNetwork:
    """The depth-objective network (module docs).

    Parameters
    ----------
    candidates : sequence of LutNetwork
        Realizations of every output (the first is the area-oriented one); no LUT reads a constant.
    supports : sequence of int
        Per output, the number of inputs it depends on (for the Shannon bound).
    fallback : callable
        Given the outputs above their Shannon bound, a network realizing some of them by Shannon trees and the set
        of those it realizes (the drivers of all other outputs are placeholders), or ``None`` when it cannot.
    tidy : callable
        Drops dead LUTs and merges equal ones.
    bounded : callable, optional
        Given a target level per output, a network realizing some of them within their targets with few LUTs
        and the set of those it realizes (or ``None``); used for area recovery (module docs).
    """
    k = candidates[0].k
    nets = list(candidates)
    levels = [output_levels(n) for n in nets]
    cones = [cone_sizes(n) for n in nets]
    m = len(supports)
    never = 1 << 30

    def add(extra: LutNetwork, realized: set[int]) -> None:
        # the other outputs of an extra network are placeholders, never to be picked
        nets.append(extra)
        levels.append([lv if j in realized else never for j, lv in enumerate(output_levels(extra))])
        cones.append(cone_sizes(extra))

    def pick_best() -> list[int]:
        return [min(range(len(nets)), key=lambda x: (levels[x][j], cones[x][j], x)) for j in range(m)]

    pick = pick_best()
    over = [j for j in range(m) if (b := shannon_depth(supports[j], k)) is not None and levels[pick[j]][j] > b]
    if over:
        got = fallback(over)
        if got is not None:
            add(*got)
            pick = pick_best()
    picks = [pick]
    if bounded is not None:
        # area recovery: every output may end at the network's depth (never above its Shannon bound nor its own
        # best level's floor), so a depth-bounded decomposition and the smallest cones within that slack compete
        best = [levels[pick[j]][j] for j in range(m)]
        top = max(best, default=0)
        slack = []
        for j in range(m):
            b = shannon_depth(supports[j], k)
            slack.append(max(best[j], top if b is None else min(top, b)))
        got = bounded({j: slack[j] for j in range(m) if (b := shannon_depth(supports[j], k)) is not None
                       and b <= slack[j] and supports[j] > 0})
        if got is not None:
            add(*got)
        picks.append([min(range(len(nets)), key=lambda x: (levels[x][j] > slack[j], cones[x][j], levels[x][j], x))
                      for j in range(m)])
    result: LutNetwork | None = None
    for pk in dict.fromkeys(tuple(p) for p in picks):
        merged = tidy(merge_networks(nets, pk, "+".join(dict.fromkeys(nets[x].method for x in pk)) + "+depth"))
        if merged.luts:
            remapped = tidy(remap_network(merged, options, per_output=True))
            before, after = output_levels(merged), output_levels(remapped)
            if all(a <= b for a, b in zip(after, before)) and remapped.count <= merged.count:
                merged = remapped
        if result is None or (merged.depth, merged.count) < (result.depth, result.count):
            result = merged
    assert result is not None
    return result
