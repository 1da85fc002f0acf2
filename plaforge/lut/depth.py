"""The depth objective: per output, the shallowest of several realizations, then area recovery at those depths.

Candidates per output
---------------------
* the area-oriented network (decomposition, cover cuts, remap), so the result is never deeper than it;
* the two-level cover as balanced AND/OR trees mapped by cuts with depth-optimal labels (FlowMap-style);
* for outputs still deeper than the Shannon bound ``1 + ceil((n - k) / s)`` (:func:`shannon_depth`), a Shannon
  multiplexer tree, which meets that bound by construction.

The chosen realizations are merged into one network (equal LUTs shared), and the merged network is remapped by
cuts with every output held at its own optimal label: area is recovered without making any output deeper.
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
               tidy: Callable[[LutNetwork], LutNetwork]) -> LutNetwork:
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
    """
    k = candidates[0].k
    nets = list(candidates)
    levels = [output_levels(n) for n in nets]
    cones = [cone_sizes(n) for n in nets]
    m = len(supports)

    def pick_best() -> list[int]:
        return [min(range(len(nets)), key=lambda x: (levels[x][j], cones[x][j], x)) for j in range(m)]

    pick = pick_best()
    over = [j for j in range(m) if (b := shannon_depth(supports[j], k)) is not None and levels[pick[j]][j] > b]
    if over:
        got = fallback(over)
        if got is not None:
            extra, realized = got
            nets.append(extra)
            # the other outputs of the fallback network are placeholders, never to be picked
            levels.append([lv if j in realized else 1 << 30 for j, lv in enumerate(output_levels(extra))])
            cones.append(cone_sizes(extra))
            pick = pick_best()
    merged = tidy(merge_networks(nets, pick, "+".join(dict.fromkeys(nets[x].method for x in pick)) + "+depth"))
    if not merged.luts:
        return merged
    remapped = tidy(remap_network(merged, options, per_output=True))
    before, after = output_levels(merged), output_levels(remapped)
    if all(a <= b for a, b in zip(after, before)) and remapped.count <= merged.count:
        return remapped
    return merged
