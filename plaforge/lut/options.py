"""Options of the LUT mapper, grouped in one immutable value."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from ..core.table import DEFAULT_ENUM_LIMIT

__all__ = ["LutOptions"]


@dataclass(frozen=True, slots=True)
class LutOptions:
    """How :func:`plaforge.lut.map_luts` works.

    Parameters
    ----------
    decompose_limit : int
        Outputs whose support has at most this many inputs are decomposed functionally on their truth table
        (2**support points); wider outputs are mapped by cuts on a multi-level subject graph built from
        the two-level cover given to the mapper.
    lut_budget : int
        Most LUTs the decomposition may build for one output (group); past it that output is rolled back and
        mapped by cuts on the cover instead (0: no budget). Keeps irregular wide functions from running long.
    work_budget : int
        Most array elements the decomposition may process for one output (group), a machine-independent measure
        of its time; past it that output is rolled back and mapped by cuts on the cover (0: no budget). Roughly
        25 to 50 ns per element. It is doubled for every support input below 16 (an 11-input output gets 32
        times as much), so only wide outputs are bounded by it. Outputs whose support ``s`` gives
        ``s**2 * 2**s`` above a sixteenth of it are not decomposed at all.
    time_limit : float or None
        Wall-clock seconds for the whole mapping (None: no limit). Once it has passed, outputs not yet decomposed
        are mapped by cuts on the cover and the optional passes (other orders, smaller sizes, remapping, depth)
        are skipped; :class:`plaforge.core.errors.TimeLimit` only when even that cannot finish in time. Results
        then depend on the machine's speed; without a limit they do not.
    bound_set_budget : int
        Bound sets scored per decomposition step when every subset of up to k variables is tried; above it a beam
        search grows bound sets one variable at a time.
    beam : int
        Beam width of that search.
    objective : {"area", "depth"}
        ``area``: keep the network with fewer LUTs (depth breaks ties); ``depth``: keep the shallower one (LUT
        count breaks ties). The cut-based pass always labels for minimum depth first.
    remap : bool
        Run the cut-based pass (depth-optimal labelling plus area recovery) over the decomposed network too, and
        keep the better of the two by ``objective``.
    cut_limit : int
        Cuts kept per node in the cut-based pass (priority cuts). 0 keeps every cut; only then, or when the limit
        is never reached (``LutNetwork.method`` says which), is the depth the minimum over all k-feasible cut
        covers of the subject graph.
    verify : bool
        Re-check the finished network against the table (on point arrays up to 20 inputs, exhaustive within
        ``enum_limit`` by :mod:`plaforge.verify` beyond that, SAT wider still) and raise
        :class:`plaforge.core.errors.InternalError` on a mismatch (a wrong mapping is a bug, not a failed check).
    enum_limit : int
        Enumeration limit for that check.
    """

    decompose_limit: int = 20
    lut_budget: int = 2000
    work_budget: int = 1 << 28
    time_limit: float | None = None
    bound_set_budget: int = 1500
    beam: int = 8
    objective: Literal["area", "depth"] = "area"
    remap: bool = True
    cut_limit: int = 0
    verify: bool = True
    enum_limit: int = DEFAULT_ENUM_LIMIT

    def __post_init__(self) -> None:
        for name in ("decompose_limit", "lut_budget", "work_budget", "bound_set_budget", "beam", "cut_limit",
                     "enum_limit"):
            value = getattr(self, name)
            if not isinstance(value, int) or isinstance(value, bool) or value < 0:
                raise ValueError(f"LutOptions.{name} must be a non-negative int, not {value!r}")
        if self.decompose_limit > 22:
            raise ValueError(f"LutOptions.decompose_limit must be at most 22, not {self.decompose_limit!r}")
        if self.time_limit is not None and (isinstance(self.time_limit, bool) or
                                            not isinstance(self.time_limit, (int, float)) or self.time_limit <= 0):
            raise ValueError(f"LutOptions.time_limit must be a positive number of seconds, not {self.time_limit!r}")
        if self.objective not in ("area", "depth"):
            raise ValueError(f"LutOptions.objective must be 'area' or 'depth', not {self.objective!r}")
