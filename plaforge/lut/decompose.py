"""Functional decomposition of outputs into k-LUTs (Ashenhurst-Curtis / Roth-Karp), sharing LUTs between outputs.

Vocabulary
----------
universe
    The inputs an output depends on (its support ``S``, at most a few tens of inputs); every function met while
    decomposing that output is held as a boolean array over the ``2**|S|`` points of ``S`` ("global" arrays).
signal
    A table input, a LUT already built, or a constant ``"0"``/``"1"``. Every signal whose support is small enough
    carries its global function, so signals built for one output are recognised and reused by the next.
local function
    An output seen through an ordered list of signals ``V``: point ``q`` of ``2**|V|`` stands for the signal
    values ``V[b] = q >> b & 1``. It is ON (OFF) at ``q`` when some point of the universe with those signal values
    is ON (OFF); combinations no point reaches, or only don't-care points, are don't-cares. ``V`` *determines* the
    output when no ``q`` is both ON and OFF. This is the one invariant of the module: every step replaces ``V`` by
    another list that still determines the output, so the final LUT over ``V`` is correct by construction.
bound set, column multiplicity
    For ``B`` ⊂ ``V`` (the bound set) and the rest ``F`` (the free set), the local function is a ``2**|F|`` by
    ``2**|B|`` chart; column ``c`` is the output's pattern over ``F`` when ``B`` takes value ``c``. Columns that are
    compatible (no row ON in one, OFF in the other) may share a code; the number ``mu`` of classes after greedy
    merging is the column multiplicity. With ``t = ceil(log2 mu)`` encoding LUTs over ``B`` the output becomes a
    function of ``F`` plus ``t`` codes: ``|V|`` falls by ``|B| - t`` (``mu <= 2``, ``t = 1``: a simple disjoint
    decomposition).

Steps for one output (``realize``), repeated until ``|V| <= k``
    1. drop signals that ``V`` does not need (don't-cares used greedily);
    2. reuse: try each LUT already built (largest support first): add it to ``V`` and drop what it makes
       redundant; keep it when at least two signals go (no LUT is spent);
    3. decompose: score bound sets of 2..k signals (all of them within a budget, else a beam search), by an
       estimate of the LUTs left (``t + ceil((|V'| - 1) / (k - 1))``), then by how many pending outputs could
       reuse the encoder, then fewer codes, then a larger bound set; build the encoders (each itself a LUT over
       ``B``, shared when an equal or compatible LUT exists);
    4. when no bound set shrinks ``V``, Shannon-expand on one signal: realize both cofactors (each with the other
       half as don't-care) and continue with ``V = [x, f0, f1]``.
Cost per step: ``O(candidates * 2**|S|)`` numpy element operations.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from itertools import combinations

import numpy as np

__all__ = ["Decomposer", "GiveUp", "NetworkBuilder", "Universe", "shannon_depth", "shannon_selects"]


REUSE_SCAN = 40  # LUTs tried per reuse step (largest support first, newest first)


class Universe:
    """The points over a sorted tuple of table-input indices, with helpers to move arrays between supports."""

    def __init__(self, inputs: tuple[int, ...]) -> None:
        self.inputs = inputs
        self.pos = {i: p for p, i in enumerate(inputs)}
        self.size = 1 << len(inputs)
        ar = np.arange(self.size, dtype=np.int64)
        self.lits = [((ar >> p) & 1).astype(np.int64) for p in range(len(inputs))]
        self.cache: dict[str, np.ndarray] = {}
        self.by_function: dict[bytes, str] = {}
        self.indexed = 0

    def literal(self, i: int) -> np.ndarray:
        """Global array of table input ``i`` (must be in the universe)."""
        return self.lits[self.pos[i]].astype(bool)

    def expand(self, support: Sequence[int], arr: np.ndarray) -> np.ndarray:
        """``arr`` over ``support`` (a subset of the universe) as an array over the universe."""
        idx = np.zeros(self.size, dtype=np.int64)
        for b, i in enumerate(support):
            idx |= self.lits[self.pos[i]] << b
        return arr[idx]

    def restrict(self, arr: np.ndarray, support: Sequence[int]) -> np.ndarray:
        """An array over the universe that depends only on ``support``, as an array over ``support``."""
        q = np.arange(1 << len(support), dtype=np.int64)
        p = np.zeros_like(q)
        for b, i in enumerate(support):
            p |= ((q >> b) & 1) << self.pos[i]
        return arr[p]


def signal_index(arrays: Sequence[np.ndarray], size: int) -> np.ndarray:
    """Per universe point, the local point ``q`` (signal ``b`` is bit ``b``)."""
    idx = np.zeros(size, dtype=np.int64)
    for b, a in enumerate(arrays):
        idx |= a.astype(np.int64) << b
    return idx


def local_function(arrays: Sequence[np.ndarray], on: np.ndarray,
                   off: np.ndarray) -> tuple[np.ndarray, np.ndarray] | None:
    """``(on_l, off_l)`` of the output seen through ``arrays``, or ``None`` when they do not determine it."""
    m = len(arrays)
    idx = signal_index(arrays, on.size)
    on_l = np.zeros(1 << m, dtype=bool)
    off_l = np.zeros(1 << m, dtype=bool)
    on_l[idx[on]] = True
    off_l[idx[off]] = True
    if (on_l & off_l).any():
        return None
    return on_l, off_l


class OverBudget(Exception):
    """Decomposing one output needed more LUTs than allowed (the caller falls back to another method)."""


class GiveUp(Exception):
    """The whole network has reached ``NetworkBuilder.node_cap`` LUTs: an optional pass that cannot win stops."""


@dataclass
class Node:
    """A LUT under construction: fan-ins, INIT and (when small enough) its global function."""

    name: str
    inputs: tuple[str, ...]
    init: int
    support: tuple[int, ...]
    truth: np.ndarray | None


@dataclass
class NetworkBuilder:
    """LUTs built so far, shared by every output; structurally hashed (same fan-ins and INIT: one LUT).

    Parameters
    ----------
    input_names : tuple of str
        Table inputs, in order.
    k : int
        LUT size.
    prefix : str
        LUT names are ``prefix + number`` in creation order (creation order is topological).
    global_limit : int
        Signals whose support has more inputs than this carry no global function (never reused by function).
    """

    input_names: tuple[str, ...]
    k: int
    prefix: str = "n"
    global_limit: int = 20
    nodes: list[Node] = field(default_factory=list)
    by_name: dict[str, Node] = field(default_factory=dict)
    by_struct: dict[tuple[tuple[str, ...], int], str] = field(default_factory=dict)
    index: dict[str, int] = field(default_factory=dict)
    budget_end: int | None = None
    node_cap: int | None = None
    work: int = 0
    work_end: int | None = None
    deadline: float | None = None
    _universes: dict[tuple[int, ...], Universe] = field(default_factory=dict)

    def __post_init__(self) -> None:
        self.index = {name: i for i, name in enumerate(self.input_names)}

    def charge(self, elements: int) -> None:
        """Count ``elements`` array elements of work; raise OverBudget past ``work_end`` or the wall-clock
        ``deadline`` (``time.monotonic()``)."""
        self.work += elements
        if self.work_end is not None and self.work > self.work_end:
            raise OverBudget("more than the work budget for one output")
        if self.deadline is not None and time.monotonic() > self.deadline:
            raise OverBudget("past the time limit")

    def universe(self, inputs: tuple[int, ...]) -> Universe:
        u = self._universes.get(inputs)
        if u is None:
            if len(self._universes) > 64:
                self._universes.clear()
            u = self._universes[inputs] = Universe(inputs)
        return u

    def support(self, sig: str) -> tuple[int, ...] | None:
        """Inputs a signal may depend on (``None``: not known / too wide)."""
        if sig in ("0", "1"):
            return ()
        if sig in self.index:
            return (self.index[sig],)
        node = self.by_name[sig]
        return node.support if node.truth is not None else None

    def over(self, sig: str, u: Universe) -> np.ndarray | None:
        """Global array of ``sig`` over universe ``u``, or ``None`` when its support is not inside ``u``."""
        if sig == "0":
            return np.zeros(u.size, dtype=bool)
        if sig == "1":
            return np.ones(u.size, dtype=bool)
        if sig in self.index:
            i = self.index[sig]
            return u.literal(i) if i in u.pos else None
        got = u.cache.get(sig)
        if got is not None:
            return got
        node = self.by_name[sig]
        if node.truth is None or any(i not in u.pos for i in node.support):
            return None
        arr = u.expand(node.support, node.truth)
        arr.setflags(write=False)
        u.cache[sig] = arr
        return arr

    def function_index(self, u: Universe) -> dict[bytes, str]:
        """Packed global function over ``u`` -> first signal computing it (inputs and LUTs inside ``u``)."""
        if not u.by_function:
            for i in u.inputs:
                u.by_function.setdefault(np.packbits(u.literal(i)).tobytes(), self.input_names[i])
        while u.indexed < len(self.nodes):
            node = self.nodes[u.indexed]
            u.indexed += 1
            arr = self.over(node.name, u)
            if arr is not None:
                u.by_function.setdefault(np.packbits(arr).tobytes(), node.name)
        return u.by_function

    def rollback(self, count: int) -> None:
        """Forget every LUT built after the first ``count`` (and every cached array of them)."""
        for node in self.nodes[count:]:
            del self.by_name[node.name]
            del self.by_struct[(node.inputs, node.init)]
            for u in self._universes.values():
                u.cache.pop(node.name, None)
        del self.nodes[count:]
        for u in self._universes.values():
            u.by_function.clear()
            u.indexed = 0

    def add_lut(self, inputs: tuple[str, ...], init: int) -> str:
        """The LUT with these fan-ins and INIT (an existing one when structurally equal)."""
        key = (inputs, init)
        if key in self.by_struct:
            return self.by_struct[key]
        if self.budget_end is not None and len(self.nodes) >= self.budget_end:
            raise OverBudget("more than the LUT budget for one output")
        if self.node_cap is not None and len(self.nodes) >= self.node_cap:
            raise GiveUp(f"{self.node_cap} LUTs built")
        name = f"{self.prefix}{len(self.nodes)}"
        supports = [self.support(s) for s in inputs]
        truth: np.ndarray | None = None
        support: tuple[int, ...] = ()
        if all(s is not None for s in supports):
            support = tuple(sorted({i for s in supports for i in s}))  # type: ignore[union-attr]
            if len(support) <= self.global_limit:
                u = self.universe(support)
                arrays = [self.over(s, u) for s in inputs]
                idx = signal_index(arrays, u.size)  # type: ignore[arg-type]
                bits = np.array([init >> p & 1 for p in range(1 << len(inputs))], dtype=bool)
                truth = bits[idx]
        node = Node(name, inputs, init, support, truth)
        self.nodes.append(node)
        self.by_name[name] = node
        self.by_struct[key] = name
        return name


@dataclass
class Pending:
    """An output not yet realized, kept so encoders that suit it can be preferred."""

    universe: Universe
    on: np.ndarray
    off: np.ndarray


@dataclass
class Decomposer:
    """Realizes outputs one after the other into a shared :class:`NetworkBuilder` (see module docs)."""

    builder: NetworkBuilder
    k: int
    budget: int = 1500
    beam: int = 8
    pending: list[Pending] = field(default_factory=list)
    reuse: bool = True
    depth_aware: bool = False  # reuse only signals no deeper than the LUT they replace (:meth:`bounded`)
    _levels: dict[str, int] = field(default_factory=dict)

    def level(self, sig: str) -> int:
        """LUT levels between the table inputs and ``sig`` (0 for inputs and constants)."""
        if sig in ("0", "1") or sig in self.builder.index:
            return 0
        got = self._levels.get(sig)
        if got is None:
            node = self.builder.by_name[sig]
            got = self._levels[sig] = 1 + max((self.level(i) for i in node.inputs), default=0)
        return got

    # -- small helpers ---------------------------------------------------------------------------------------
    def _arrays(self, sigs: Sequence[str], u: Universe) -> list[np.ndarray]:
        out = []
        for s in sigs:
            a = self.builder.over(s, u)
            if a is None:
                raise AssertionError(f"signal {s!r} is not a function of the universe")
            out.append(a)
        return out

    def _reduce(self, sigs: list[str], arrays: list[np.ndarray], on: np.ndarray, off: np.ndarray,
                order: Sequence[int] | None = None) -> tuple[list[str], list[np.ndarray]]:
        """Greedily drop signals the output does not need (don't-cares used as they come)."""
        keep = list(range(len(sigs)))
        for b in (order if order is not None else range(len(sigs))):
            trial = [x for x in keep if x != b]
            self.builder.charge(len(trial) * on.size)
            if local_function([arrays[x] for x in trial], on, off) is not None:
                keep = trial
        return [sigs[x] for x in keep], [arrays[x] for x in keep]

    def _reduced(self, u: Universe, sigs: list[str], on: np.ndarray, off: np.ndarray
                 ) -> tuple[list[str], list[np.ndarray]]:
        """:meth:`_reduce` on the signals' arrays over ``u``."""
        return self._reduce(sigs, self._arrays(sigs, u), on, off)

    # -- making one LUT --------------------------------------------------------------------------------------
    def make_lut(self, u: Universe, sigs: list[str], on: np.ndarray, off: np.ndarray) -> str:
        """A signal compatible with ``(on, off)`` over ``sigs`` (at most k after reduction)."""
        sigs, arrays = self._reduced(u, sigs, on, off)
        const = _constant(on, off)
        if const is not None:
            return const
        # an existing signal that fits (identical function, or equal up to don't-cares); when depth-aware, only one
        # no deeper than the LUT it replaces
        cap = 1 + max((self.level(x) for x in sigs), default=0) if self.depth_aware else None
        if not self.reuse:
            pass
        elif (on | off).all():
            hit = self.builder.function_index(u).get(np.packbits(on).tobytes())
            if hit is not None and (cap is None or self.level(hit) <= cap):
                return hit
        else:
            for cand in self._compatible_candidates(u, sigs):
                g = self.builder.over(cand, u)
                if g is not None and not (on & ~g).any() and not (off & g).any() and (
                        cap is None or self.level(cand) <= cap):
                    return cand
        if len(sigs) > self.k:
            raise AssertionError(f"make_lut called with {len(sigs)} > k signals")
        loc = local_function(arrays, on, off)
        assert loc is not None
        on_l, _ = loc
        init = 0
        for q in np.flatnonzero(on_l):
            init |= 1 << int(q)
        return self.builder.add_lut(tuple(sigs), init)

    def _compatible_candidates(self, u: Universe, sigs: Sequence[str]) -> list[str]:
        """Signals worth testing for don't-care compatibility: inputs and LUTs whose support lies within the
        inputs that ``sigs`` depend on."""
        within: set[int] = set()
        for s in sigs:
            sp = self.builder.support(s)
            within.update(u.inputs if sp is None else sp)
        names = [self.builder.input_names[i] for i in sorted(within)]
        names += [n.name for n in self.builder.nodes
                  if n.truth is not None and all(i in within for i in n.support)]
        return names

    # -- realizing one output --------------------------------------------------------------------------------
    def realize(self, u: Universe, sigs: list[str], on: np.ndarray, off: np.ndarray) -> str:
        """A signal realizing the output ``(on, off)`` (global arrays over ``u``) from signals ``sigs``."""
        const = _constant(on, off)
        if const is not None:
            return const
        sigs, arrays = self._reduced(u, sigs, on, off)
        while len(sigs) > self.k:
            step = self._reuse(u, sigs, arrays, on, off)
            if step is not None:
                sigs, arrays = step
                continue
            step = self._decompose(u, sigs, arrays, on, off)
            if step is not None:
                sigs, arrays = step
                continue
            # Shannon expansion on the first signal
            x, xa = sigs[0], arrays[0]
            rest = sigs[1:]
            f0 = self.realize(u, rest, on & ~xa, off & ~xa)
            f1 = self.realize(u, rest, on & xa, off & xa)
            if self.k == 2:
                # a 2:1 mux does not fit a 2-LUT: f = (~x & f0) | (x & f1), each half one 2-LUT
                h0 = self.make_lut(u, [x, f0], on & ~xa, (off & ~xa) | xa)
                h1 = self.make_lut(u, [x, f1], on & xa, (off & xa) | ~xa)
                sigs = [s for s in dict.fromkeys((h0, h1)) if s not in ("0", "1")]
            else:
                sigs = [x] + [s for s in dict.fromkeys((f0, f1)) if s not in ("0", "1")]
            sigs, arrays = self._reduced(u, sigs, on, off)
        return self.make_lut(u, sigs, on, off)

    def shannon(self, u: Universe, sigs: list[str], on: np.ndarray, off: np.ndarray) -> str:
        """A multiplexer tree for the output ``(on, off)``: ``s`` select signals (the largest ``s`` with
        ``2**s + s <= k``) choose among the ``2**s`` cofactors, each realized the same way, until at most ``k``
        signals are left (one LUT). Depth is at most ``1 + ceil((n - k) / s)`` for ``n`` signals (``k >= 3``)."""
        s = shannon_selects(self.k)
        const = _constant(on, off)
        if const is not None:
            return const
        sigs, arrays = self._reduced(u, sigs, on, off)
        if len(sigs) <= self.k:
            return self.make_lut(u, sigs, on, off)
        sel, rest = sigs[:s], sigs[s:]
        idx = signal_index(arrays[:s], u.size)
        data = []
        for v in range(1 << s):
            here = idx == v
            data.append(self.shannon(u, rest, on & here, off & here))
        mux = list(sel) + [d for d in dict.fromkeys(data) if d not in ("0", "1")]
        return self.make_lut(u, mux, on, off)

    def _within(self, sigs: Sequence[str], target: int) -> bool:
        """A Shannon tree over ``sigs`` would end at level ``target`` or below (latest signal + tree height)."""
        depth = shannon_depth(len(sigs), self.k)
        return depth is not None and max((self.level(x) for x in sigs), default=0) + depth <= target

    def bounded(self, u: Universe, sigs: list[str], on: np.ndarray, off: np.ndarray, target: int) -> str:
        """A signal for the output ``(on, off)`` at level ``target`` or below, with fewer LUTs than a Shannon tree
        where decomposition allows (area recovery under a depth bound; needs ``k >= 3`` and ``depth_aware``).

        Invariant: ``max level(V) + shannon_depth(|V|, k) <= target`` for the signals ``V`` in hand (the caller's
        guarantee at entry). Each step keeps it: a reuse or a decomposition step (:meth:`_decompose`) is taken only
        when the signals it leaves satisfy it; otherwise one Shannon step on the ``s`` shallowest signals, whose
        cofactors are realized the same way one level lower (``shannon_depth(n - s) <= shannon_depth(n) - 1``).
        So the result is never deeper than the Shannon tree's guarantee, whatever the steps.
        """
        const = _constant(on, off)
        if const is not None:
            return const
        sigs, arrays = self._reduced(u, sigs, on, off)
        if not self._within(sigs, target):
            raise AssertionError("bounded() called without a feasible depth target")
        while len(sigs) > self.k:
            step = self._reuse(u, sigs, arrays, on, off)
            if step is not None and self._within(step[0], target):
                sigs, arrays = step
                continue
            levels = [self.level(x) for x in sigs]
            m = len(sigs)

            def admit(b: tuple[int, ...], t: int, levels: list[int] = levels, m: int = m) -> bool:
                enc = 1 + max(levels[x] for x in b)
                top = max([enc] + [levels[x] for x in range(m) if x not in b])
                depth = shannon_depth(m - len(b) + t, self.k)
                return depth is not None and top + depth <= target

            step = self._decompose(u, sigs, arrays, on, off, admit)
            if step is not None and self._within(step[0], target):
                sigs, arrays = step
                continue
            # one Shannon step on the shallowest signals (ties: list order)
            s = shannon_selects(self.k)
            order = sorted(range(m), key=lambda x: (levels[x], x))
            sel, rest = [sigs[x] for x in order[:s]], [sigs[x] for x in order[s:]]
            idx = signal_index([arrays[x] for x in order[:s]], u.size)
            data = []
            for v in range(1 << s):
                here = idx == v
                data.append(self.bounded(u, rest, on & here, off & here, target - 1))
            sigs = sel + [d for d in dict.fromkeys(data) if d not in ("0", "1")]
            sigs, arrays = self._reduced(u, sigs, on, off)
        return self.make_lut(u, sigs, on, off)

    def _reuse(self, u: Universe, sigs: list[str], arrays: list[np.ndarray], on: np.ndarray,
               off: np.ndarray) -> tuple[list[str], list[np.ndarray]] | None:
        present = set(sigs)
        cands = [n for n in self.builder.nodes
                 if n.truth is not None and len(n.support) >= 2 and n.name not in present
                 and all(i in u.pos for i in n.support)]
        order = {n.name: x for x, n in enumerate(self.builder.nodes)}
        cands.sort(key=lambda n: (-len(n.support), -order[n.name]))
        for node in cands[:REUSE_SCAN]:
            g = self.builder.over(node.name, u)
            assert g is not None
            sup = set(node.support)
            # drop first the signals whose inputs lie inside the candidate's support
            inside = [b for b, s in enumerate(sigs)
                      if (sp := self.builder.support(s)) is not None and set(sp) <= sup]
            if len(inside) < 2:
                continue
            trial_sigs, trial_arr = sigs + [node.name], arrays + [g]
            new_sigs, new_arr = self._reduce(trial_sigs, trial_arr, on, off, order=inside)
            if len(new_sigs) <= len(sigs) - 1:
                return self._reduce(new_sigs, new_arr, on, off)
        return None

    def _decompose(self, u: Universe, sigs: list[str], arrays: list[np.ndarray], on: np.ndarray,
                   off: np.ndarray, admit: Callable[[tuple[int, ...], int], bool] | None = None
                   ) -> tuple[list[str], list[np.ndarray]] | None:
        loc = local_function(arrays, on, off)
        assert loc is not None
        on_l, off_l = loc
        m = len(sigs)
        full_care = bool((on_l | off_l).all())
        k = self.k
        top = min(k, m - 1)
        evaluated: dict[tuple[int, ...], tuple[int, list[int]]] = {}

        def score(b: tuple[int, ...]) -> tuple[int, list[int]]:
            if b not in evaluated:
                self.builder.charge(1 << m)
                evaluated[b] = _column_classes(on_l, off_l, m, b, full_care)
            return evaluated[b]

        total = sum(math.comb(m, s) for s in range(2, top + 1))
        if total <= self.budget:
            for s in range(2, top + 1):
                for b in combinations(range(m), s):
                    score(b)
        else:
            level = list(combinations(range(m), 2))
            for s in range(2, top + 1):
                for b in level:
                    score(b)
                ranked = sorted(level, key=lambda b: (_codes(evaluated[b][0]) - len(b), evaluated[b][0], b))
                best = ranked[: self.beam]
                if s == top:
                    break
                level = sorted({tuple(sorted(b + (v,))) for b in best for v in range(m) if v not in b})
        options = []
        for b, (mu, _) in evaluated.items():
            t = _codes(mu)
            if t >= len(b) or (admit is not None and not admit(b, t)):
                continue
            rest = m - len(b) + t
            est = t + math.ceil((rest - 1) / (k - 1))
            options.append((est, t, -len(b), b))
        if not options:
            return None
        options.sort()
        best_est = options[0][0]
        tied = [o for o in options if o[0] == best_est][:6]
        chosen = tied[0][3]
        if len(tied) > 1 and self.pending:
            keyed = []
            for est, t, negb, b in tied:
                share = self._share(u, [sigs[x] for x in b], [arrays[x] for x in b], evaluated[b][1]) if t == 1 else 0
                keyed.append((est, -share, t, negb, b))
            keyed.sort()
            chosen = keyed[0][4]
        mu, cls = evaluated[chosen]
        t = _codes(mu)
        bsigs = [sigs[x] for x in chosen]
        barr = [arrays[x] for x in chosen]
        idx = signal_index(barr, u.size)
        cls_arr = np.array(cls, dtype=np.int64)
        assigned = (cls_arr >= 0)[idx]
        codes = cls_arr[idx]
        encoders = []
        for bit in range(t):
            one = ((codes >> bit) & 1).astype(bool)
            encoders.append(self.make_lut(u, list(bsigs), assigned & one, assigned & ~one))
        free = [s for x, s in enumerate(sigs) if x not in chosen]
        new_sigs = free + [e for e in dict.fromkeys(encoders) if e not in ("0", "1") and e not in free]
        new_arr = self._arrays(new_sigs, u)
        if local_function(new_arr, on, off) is None:
            raise AssertionError("decomposition lost the function")
        return self._reduce(new_sigs, new_arr, on, off)

    def _share(self, u: Universe, bsigs: list[str], barr: list[np.ndarray], cls: list[int]) -> int:
        """How many pending outputs could reuse the single encoder of this bound set."""
        supports = [self.builder.support(s) for s in bsigs]
        if any(s is None for s in supports):
            return 0
        esup = tuple(sorted({i for s in supports for i in s}))  # type: ignore[union-attr]
        idx = signal_index(barr, u.size)
        e = (np.array(cls, dtype=np.int64) == 1)[idx]
        e_r = u.restrict(e, esup)
        count = 0
        for p in self.pending[:8]:
            self.builder.charge(p.on.size)
            if any(i not in p.universe.pos for i in esup):
                continue
            g = p.universe.expand(esup, e_r)
            base = [p.universe.literal(i) for i in p.universe.inputs]
            inside = [b for b, i in enumerate(p.universe.inputs) if i in esup]
            keep = list(range(len(base)))
            dropped = 0
            for b in inside:
                trial = [x for x in keep if x != b]
                if local_function([base[x] for x in trial] + [g], p.on, p.off) is not None:
                    keep = trial
                    dropped += 1
            if dropped >= 2:
                count += 1
        return count


def _constant(on: np.ndarray, off: np.ndarray) -> str | None:
    """``"0"`` for an output on nowhere, ``"1"`` for one off nowhere, else None."""
    return "0" if not on.any() else "1" if not off.any() else None


def shannon_selects(k: int) -> int:
    """Most select inputs a k-LUT multiplexer can take: the largest ``s`` with ``2**s + s <= k`` (0 for k < 3)."""
    s = 0
    while (1 << (s + 1)) + s + 1 <= k:
        s += 1
    return s


def shannon_depth(n: int, k: int) -> int | None:
    """Depth the Shannon multiplexer tree guarantees for ``n`` inputs: 1 when ``n <= k``, else
    ``1 + ceil((n - k) / s)`` (``None`` for k < 3, where no multiplexer fits one LUT)."""
    if n <= k:
        return 1 if n > 0 else 0
    s = shannon_selects(k)
    return 1 + math.ceil((n - k) / s) if s else None


def _codes(mu: int) -> int:
    """Encoding bits for ``mu`` classes."""
    return max(1, (mu - 1).bit_length()) if mu > 1 else 0


def _column_classes(on_l: np.ndarray, off_l: np.ndarray, m: int, bound: tuple[int, ...],
                    full_care: bool) -> tuple[int, list[int]]:
    """Column multiplicity of bound set ``bound`` and the class of each column (-1: column all don't-care).

    Columns are merged greedily in column order into the first compatible class (exact when there are no
    don't-cares: classes are then the distinct columns).
    """
    free = [v for v in range(m) if v not in bound]
    axes = [m - 1 - f for f in reversed(free)] + [m - 1 - b for b in reversed(bound)]
    rows, cols = 1 << len(free), 1 << len(bound)
    shape = (2,) * m
    onc = np.packbits(on_l.reshape(shape).transpose(axes).reshape(rows, cols), axis=0).T
    if full_care:
        seen: dict[bytes, int] = {}
        cls = []
        for c in range(cols):
            key = onc[c].tobytes()
            if key not in seen:
                seen[key] = len(seen)
            cls.append(seen[key])
        return len(seen), cls
    offc = np.packbits(off_l.reshape(shape).transpose(axes).reshape(rows, cols), axis=0).T
    classes: list[list[int]] = []  # [on, off] as ints
    cls = []
    memo: dict[tuple[bytes, bytes], int] = {}
    for c in range(cols):
        key = (onc[c].tobytes(), offc[c].tobytes())
        if key in memo:
            cls.append(memo[key])
            continue
        a, b = int.from_bytes(key[0], "little"), int.from_bytes(key[1], "little")
        if a == 0 and b == 0:
            memo[key] = -1
            cls.append(-1)
            continue
        for x, (ca, cb) in enumerate(classes):
            if not (a & cb) and not (b & ca):
                classes[x] = [ca | a, cb | b]
                break
        else:
            x = len(classes)
            classes.append([a, b])
        memo[key] = x
        cls.append(x)
    return len(classes), cls
