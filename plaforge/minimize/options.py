"""Options of the two-level minimizers, grouped in one frozen dataclass."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

__all__ = ["CostModel", "Effort", "MinimizeOptions"]

CostModel = Literal["shared", "per-output"]
Effort = Literal["fast", "normal", "high"]


@dataclass(frozen=True)
class MinimizeOptions:
    """How :func:`plaforge.minimize.minimize` works.

    Parameters
    ----------
    exact : bool
        Prove a minimum cover (multi-output primes + CP-SAT) instead of the heuristic.
    time_limit : float
        Wall-clock seconds the exact solver may spend (past it: best cover and best lower bound). Also the limit
        after which a heuristic run is abandoned with :class:`plaforge.core.errors.TimeLimit`.
    cost : {"shared", "per-output"}
        ``shared`` counts distinct product terms (PLA AND-plane rows), outputs share terms; ``per-output`` counts
        product terms output by output (no sharing: every output is minimized alone). Literals break ties.
    phase : bool
        Choose per output whether to realize it or its complement (output phase assignment) to lower the cost.
    progress : bool
        Show a progress display on stderr during exact runs (primes generated, bound closing).
    isolate : bool
        Run the compiled heuristic in a child process, so a crash inside it becomes a clear error (see
        :mod:`plaforge.minimize.child`).
    exact_limit : int
        Most inputs the exact path accepts (it enumerates the 3**n cubes).
    memory_limit : int
        Megabytes the exact path may plan to use for its primes and covering problem; a step estimated above it is
        refused with :class:`plaforge.core.errors.SizeLimit` naming ``--memory-limit``. Also what the heuristic's
        child process may grow by (its address-space limit), past which it fails with that ``SizeLimit``.
    effort : {"fast", "normal", "high"}
        Heuristic path: ``fast`` one minimization; ``normal`` also a second starting cover and one more descent
        from each result, as far as they fit a budget relative to the first run; ``high`` all of them, descents
        repeated while they help, no budget but the time limit (see :mod:`plaforge.minimize.heuristic`).
    scale_time_limit : bool
        Heuristic path: raise ``time_limit`` for large tables (the rule is in :mod:`plaforge.minimize.heuristic`);
        the CLI clears it when ``--time-limit`` is given.
    """

    exact: bool = False
    time_limit: float = 60.0
    cost: CostModel = "shared"
    phase: bool = False
    progress: bool = False
    isolate: bool = True
    exact_limit: int = 14
    memory_limit: int = 2048
    effort: Effort = "normal"
    scale_time_limit: bool = True

    def __post_init__(self) -> None:
        if self.cost not in ("shared", "per-output"):
            raise ValueError(f"cost must be 'shared' or 'per-output', not {self.cost!r}")
        if not self.time_limit > 0:
            raise ValueError(f"time_limit must be positive seconds, not {self.time_limit!r}")
        if self.effort not in ("fast", "normal", "high"):
            raise ValueError(f"effort must be 'fast', 'normal' or 'high', not {self.effort!r}")
        if not self.memory_limit > 0:
            raise ValueError(f"memory_limit must be positive megabytes, not {self.memory_limit!r}")
        if not 1 <= self.exact_limit <= 20:
            raise ValueError(f"exact_limit must be between 1 and 20 inputs, not {self.exact_limit!r}")
