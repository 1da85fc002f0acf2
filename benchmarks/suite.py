"""Benchmark suite: multi-output functions built from their arithmetic or combinatorial definitions.

Every entry of :data:`SUITE` is a :class:`SuiteEntry`; calling it builds a fresh :class:`plaforge.core.table.Table`.
Enumerated entries evaluate their definition on every point at once with numpy (``Table.from_function``: the
argument is ``numpy.arange(2**n)``, point bit ``i`` is input ``i``); the ``wide`` entries are specified directly as
cubes (no enumeration, e.g. 40 inputs). Names follow the bus convention ``a[0]`` (LSB) ... so emitters can group
ports. Random entries are seeded, so the suite is the same on every machine.

>>> from benchmarks.suite import SUITE
>>> t = SUITE["popcount7"]()
>>> t.n_inputs, t.n_outputs
(7, 3)
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from plaforge.core.cube import Cube
from plaforge.core.table import Table

__all__ = ["SUITE", "SuiteEntry", "suite_names"]

Arrays = list[np.ndarray]


@dataclass(frozen=True)
class SuiteEntry:
    """One benchmark function.

    Parameters
    ----------
    name : str
        Key in :data:`SUITE`.
    build : callable
        Returns the Table (built afresh on each call).
    inputs, outputs : int
        Shape, known without building.
    wide : bool
        Cube-specified / too wide to enumerate: only cube-based paths apply.
    description : str
        The definition in one line.
    """

    name: str
    build: Callable[[], Table]
    inputs: int
    outputs: int
    wide: bool
    description: str

    def __call__(self) -> Table:
        return self.build()


def _bus(name: str, width: int) -> list[str]:
    return [f"{name}[{i}]" for i in range(width)]


def _field(pts: np.ndarray, lo: int, width: int) -> np.ndarray:
    return (pts >> lo) & ((1 << width) - 1)


def _bits(v: np.ndarray, width: int) -> Arrays:
    return [((v >> k) & 1).astype(bool) for k in range(width)]


def _popcount(pts: np.ndarray, n: int) -> np.ndarray:
    c = np.zeros_like(pts)
    for i in range(n):
        c += (pts >> i) & 1
    return c


def _make(inputs: Sequence[str], outputs: Sequence[str], fn: Callable[[np.ndarray], Arrays],
          dc_fn: Callable[[np.ndarray], Arrays] | None, source: str) -> Table:
    return Table.from_function(list(inputs), list(outputs), fn, dc_fn, source=source)


# -- arithmetic and counting ---------------------------------------------------------------------------------------
def popcount(n: int) -> Table:
    """Number of ones among ``n`` inputs, in binary."""
    w = n.bit_length()
    return _make(_bus("x", n), _bus("c", w), lambda p: _bits(_popcount(p, n), w), None, f"popcount{n}")


def symmetric(n: int, lo: int, hi: int) -> Table:
    """1 when between ``lo`` and ``hi`` (inclusive) of the ``n`` inputs are 1."""
    def fn(p: np.ndarray) -> Arrays:
        c = _popcount(p, n)
        return [(c >= lo) & (c <= hi)]
    return _make(_bus("x", n), ["y"], fn, None, f"sym{n}_{lo}to{hi}")


def adder(n: int) -> Table:
    """``s = a + b`` for n-bit ``a`` (inputs 0..n-1) and ``b`` (inputs n..2n-1); n+1 sum bits."""
    def fn(p: np.ndarray) -> Arrays:
        return _bits(_field(p, 0, n) + _field(p, n, n), n + 1)
    return _make(_bus("a", n) + _bus("b", n), _bus("s", n + 1), fn, None, f"add{n}")


def multiplier(n: int, m: int) -> Table:
    """``p = a * b`` for n-bit ``a`` and m-bit ``b``; n+m product bits."""
    def fn(p: np.ndarray) -> Arrays:
        return _bits(_field(p, 0, n) * _field(p, n, m), n + m)
    return _make(_bus("a", n) + _bus("b", m), _bus("p", n + m), fn, None, f"mul{n}x{m}")


def square(n: int) -> Table:
    """``y = a * a`` for n-bit ``a``; 2n bits."""
    def fn(p: np.ndarray) -> Arrays:
        a = _field(p, 0, n)
        return _bits(a * a, 2 * n)
    return _make(_bus("a", n), _bus("y", 2 * n), fn, None, f"square{n}")


def isqrt(n: int) -> Table:
    """``y = floor(sqrt(a))`` for n-bit ``a``; ceil(n/2) bits."""
    w = (n + 1) // 2

    def fn(p: np.ndarray) -> Arrays:
        r = np.floor(np.sqrt(p.astype(np.float64))).astype(np.int64)
        r -= (r * r > p).astype(np.int64)  # guard against rounding
        r += ((r + 1) * (r + 1) <= p).astype(np.int64)
        return _bits(r, w)
    return _make(_bus("a", n), _bus("y", w), fn, None, f"isqrt{n}")


def comparator(n: int) -> Table:
    """Unsigned comparison of n-bit ``a`` and ``b``: outputs ``lt``, ``eq``, ``gt``."""
    def fn(p: np.ndarray) -> Arrays:
        a, b = _field(p, 0, n), _field(p, n, n)
        return [a < b, a == b, a > b]
    return _make(_bus("a", n) + _bus("b", n), ["lt", "eq", "gt"], fn, None, f"cmp{n}")


# -- code converters and decoders ----------------------------------------------------------------------------------
def bin_to_gray(n: int) -> Table:
    """Reflected binary (Gray) code of n-bit ``b``: ``g = b ^ (b >> 1)``."""
    return _make(_bus("b", n), _bus("g", n), lambda p: _bits(p ^ (p >> 1), n), None, f"bin2gray{n}")


def gray_to_bin(n: int) -> Table:
    """Binary value of n-bit Gray code ``g``: prefix XOR from the top bit down."""
    def fn(p: np.ndarray) -> Arrays:
        b = p.copy()
        shift = 1
        while shift < n:
            b ^= b >> shift
            shift <<= 1
        return _bits(b, n)
    return _make(_bus("g", n), _bus("b", n), fn, None, f"gray2bin{n}")


def _bcd_dc(m: int) -> Callable[[np.ndarray], Arrays]:
    return lambda p: [p >= 10] * m


def bcd_to_excess3() -> Table:
    """Excess-3 code of a BCD digit (``d + 3``); codes 10..15 are don't-cares."""
    return _make(_bus("d", 4), _bus("e", 4), lambda p: _bits(p + 3, 4), _bcd_dc(4), "bcd2xs3")


# Segments a..g lit for digits 0..9 (common practice: 6 with its top bar, 7 without the left bar, 9 with its bottom
# bar).
_SEGMENTS = {
    "a": (0, 2, 3, 5, 6, 7, 8, 9),
    "b": (0, 1, 2, 3, 4, 7, 8, 9),
    "c": (0, 1, 3, 4, 5, 6, 7, 8, 9),
    "d": (0, 2, 3, 5, 6, 8, 9),
    "e": (0, 2, 6, 8),
    "f": (0, 4, 5, 6, 8, 9),
    "g": (2, 3, 4, 5, 6, 8, 9),
}


def bcd_to_7seg() -> Table:
    """BCD digit to segments a..g (active high); codes 10..15 are don't-cares."""
    def fn(p: np.ndarray) -> Arrays:
        return [np.isin(p, digits) for digits in _SEGMENTS.values()]
    return _make(_bus("d", 4), list(_SEGMENTS), fn, _bcd_dc(7), "bcd7seg")


def decoder(n: int) -> Table:
    """One-hot decoder: output ``y[k]`` is 1 when the n-bit input equals k."""
    def fn(p: np.ndarray) -> Arrays:
        return [p == k for k in range(1 << n)]
    return _make(_bus("s", n), _bus("y", 1 << n), fn, None, f"dec{n}")


# -- random incompletely specified ---------------------------------------------------------------------------------
def random_table(n: int, m: int, seed: int, p_on: float = 0.35, p_dc: float = 0.2) -> Table:
    """Each (point, output) independently ON with probability ``p_on``, DC with ``p_dc``, else OFF (seeded)."""
    rng = np.random.default_rng(seed)
    draw = rng.random((m, 1 << n))
    on = [draw[j] < p_on for j in range(m)]
    dc = [(draw[j] >= p_on) & (draw[j] < p_on + p_dc) for j in range(m)]
    return _make(_bus("x", n), _bus("y", m), lambda p: on, lambda p: dc, f"rand{n}x{m}s{seed}")


# -- wide, cube-specified ------------------------------------------------------------------------------------------
def wide_cubes(n: int = 40, m: int = 4, terms: int = 24, seed: int = 7) -> Table:
    """A cube-specified function too wide to enumerate (2**40 points).

    An address-decode-like map: output ``y[j]`` is the union of ``terms`` seeded random cubes testing 6..16 of the
    ``n`` inputs (some shared between outputs, so joint minimization has something to share), plus redundant
    sub-cubes of those (to give the minimizer something to remove); a few more cubes are don't-cares. The OFF set is
    implicit (the rest), so nothing is enumerated.
    """
    rng = np.random.default_rng(seed)
    full = (1 << n) - 1

    def rand_cube() -> tuple[int, int]:
        k = int(rng.integers(6, 17))
        idx = rng.choice(n, size=k, replace=False)
        care = 0
        for i in idx:
            care |= 1 << int(i)
        value = int(rng.integers(0, 1 << 62)) << 2 & care
        return care, value & full

    pool = [rand_cube() for _ in range(terms * m // 2)]
    on: list[tuple[Cube, ...]] = []
    dc: list[tuple[Cube, ...]] = []
    for j in range(m):
        picks = rng.choice(len(pool), size=terms, replace=False)
        cubes = []
        for k in picks:
            care, value = pool[int(k)]
            cubes.append(Cube(care, value, 1 << j))
            # a redundant split of the same cube on one more input
            free = [i for i in range(n) if not care >> i & 1]
            i = free[int(rng.integers(0, len(free)))]
            cubes.append(Cube(care | 1 << i, value | (1 << i) * int(rng.integers(0, 2)), 1 << j))
        on.append(tuple(cubes))
        dcs = [rand_cube() for _ in range(3)]
        dc.append(tuple(Cube(c, v, 1 << j) for c, v in dcs))
    return Table(tuple(_bus("a", n)), tuple(_bus("y", m)), tuple(on), tuple(dc), (None,) * m,
                 source=f"wide{n}")


# -- added for the LUT benchmark (issue 12) --------------------------------------------------------------------------
def sine_table(n: int = 8) -> Table:
    """``y = round(127.5 + 127.5 * sin(2 pi x / 2**n))`` for n-bit ``x``; 8 output bits."""
    import math

    vals = np.array([round(127.5 + 127.5 * math.sin(2 * math.pi * x / (1 << n))) for x in range(1 << n)],
                    dtype=np.int64)
    return _make(_bus("x", n), _bus("y", 8), lambda p: _bits(vals[p], 8), None, f"sine{n}")


def adder_msb_first(n: int) -> Table:
    """``adder(n)`` with each operand's columns given most significant bit first (``a[n-1] .. a[0], b[n-1] ..
    b[0]``): the same function, another column order."""
    def fn(p: np.ndarray) -> Arrays:
        a = sum(((p >> (n - 1 - i)) & 1) << i for i in range(n))
        b = sum(((p >> (2 * n - 1 - i)) & 1) << i for i in range(n))
        return _bits(a + b, n + 1)
    names = [f"a[{i}]" for i in reversed(range(n))] + [f"b[{i}]" for i in reversed(range(n))]
    return _make(names, _bus("s", n + 1), fn, None, f"add{n}msb")


def fd_rows(n: int = 20, m: int = 5, rows: int = 41, seed: int = 12) -> Table:
    """A seeded ON/don't-care row list (OFF implicit), as a hand-written PLA of ``rows`` rows: each row tests about
    60% of the ``n`` inputs and puts each output ON (30%), don't-care (15%) or leaves it."""
    rng = np.random.default_rng(seed)
    on: list[list[Cube]] = [[] for _ in range(m)]
    dc: list[list[Cube]] = [[] for _ in range(m)]
    for _ in range(rows):
        care = value = 0
        for i in range(n):
            if rng.random() < 0.6:
                care |= 1 << i
                value |= int(rng.integers(0, 2)) << i
        marks = rng.random(m)
        if not (marks < 0.45).any():
            marks[int(rng.integers(0, m))] = 0.0
        for j in range(m):
            if marks[j] < 0.3:
                on[j].append(Cube(care, value, 1 << j))
            elif marks[j] < 0.45:
                dc[j].append(Cube(care, value, 1 << j))
    return Table(tuple(_bus("x", n)), tuple(_bus("y", m)), tuple(map(tuple, on)), tuple(map(tuple, dc)),
                 (None,) * m, source=f"fd{n}x{m}")


def onoff_rows(n: int = 20, rows: int = 6000, seed: int = 13) -> Table:
    """``rows`` seeded random points of ``n`` inputs, each with its three outputs given ON or OFF (every other
    point don't-care): ``y[0]`` is the parity of inputs 0-4, ``y[1]`` whether the 4-bit field at inputs 5-8
    exceeds the one at 9-12, ``y[2]`` whether at least 4 of inputs 13-19 are 1."""
    rng = np.random.default_rng(seed)
    pts = np.unique(rng.integers(0, 1 << n, size=rows, dtype=np.int64))
    ys = [_popcount(pts, 5) & 1 == 1, _field(pts, 5, 4) > _field(pts, 9, 4), _popcount(pts >> 13, 7) >= 4]
    full = (1 << n) - 1
    on = tuple(tuple(Cube(full, int(p), 1 << j) for p in pts[y]) for j, y in enumerate(ys))
    off = tuple(tuple(Cube(full, int(p), 1 << j) for p in pts[~y]) for j, y in enumerate(ys))
    return Table(tuple(_bus("x", n)), tuple(_bus("y", 3)), on, (None,) * 3, off, source=f"onoff{n}")


# -- the suite -----------------------------------------------------------------------------------------------------
def _entry(name: str, build: Callable[[], Table], inputs: int, outputs: int, description: str,
           wide: bool = False) -> tuple[str, SuiteEntry]:
    return name, SuiteEntry(name, build, inputs, outputs, wide, description)


SUITE: dict[str, SuiteEntry] = dict([
    _entry("popcount5", lambda: popcount(5), 5, 3, "number of ones among 5 inputs"),
    _entry("popcount7", lambda: popcount(7), 7, 3, "number of ones among 7 inputs"),
    _entry("sym9_3to6", lambda: symmetric(9, 3, 6), 9, 1, "1 when 3 to 6 of 9 inputs are 1"),
    _entry("add2", lambda: adder(2), 4, 3, "2-bit + 2-bit adder"),
    _entry("add3", lambda: adder(3), 6, 4, "3-bit + 3-bit adder"),
    _entry("add4", lambda: adder(4), 8, 5, "4-bit + 4-bit adder"),
    _entry("add6", lambda: adder(6), 12, 7, "6-bit + 6-bit adder"),
    _entry("mul3x3", lambda: multiplier(3, 3), 6, 6, "3-bit x 3-bit multiplier"),
    _entry("mul4x4", lambda: multiplier(4, 4), 8, 8, "4-bit x 4-bit multiplier"),
    _entry("square6", lambda: square(6), 6, 12, "square of a 6-bit number"),
    _entry("isqrt8", lambda: isqrt(8), 8, 4, "integer square root of an 8-bit number"),
    _entry("cmp4", lambda: comparator(4), 8, 3, "4-bit unsigned comparator (lt, eq, gt)"),
    _entry("bin2gray6", lambda: bin_to_gray(6), 6, 6, "6-bit binary to Gray code"),
    _entry("gray2bin6", lambda: gray_to_bin(6), 6, 6, "6-bit Gray code to binary"),
    _entry("bcd2xs3", bcd_to_excess3, 4, 4, "BCD to excess-3, codes 10-15 don't-care"),
    _entry("bcd7seg", bcd_to_7seg, 4, 7, "BCD to 7-segment, codes 10-15 don't-care"),
    _entry("dec4", lambda: decoder(4), 4, 16, "4-to-16 one-hot decoder"),
    _entry("rand7x4", lambda: random_table(7, 4, seed=1), 7, 4, "random, 35% ON / 20% DC, seed 1"),
    _entry("rand9x3", lambda: random_table(9, 3, seed=2), 9, 3, "random, 35% ON / 20% DC, seed 2"),
    _entry("rand11x6", lambda: random_table(11, 6, seed=3), 11, 6, "random, 35% ON / 20% DC, seed 3"),
    _entry("wide40", wide_cubes, 40, 4, "40-input cube-specified decode map (no enumeration)", wide=True),
])


def suite_names(max_inputs: int | None = None, wide: bool | None = None) -> list[str]:
    """Names of suite entries, optionally only those with at most ``max_inputs`` inputs or of one kind."""
    return [
        k for k, e in SUITE.items()
        if (max_inputs is None or e.inputs <= max_inputs) and (wide is None or e.wide == wide)
    ]


def machine() -> str:
    """One line naming the machine for benchmark printouts: architecture, CPU count and model, Python."""
    import os
    import platform

    cpu = "unknown CPU"
    try:
        with open("/proc/cpuinfo", encoding="utf-8") as fh:
            for line in fh:
                if line.startswith("model name"):
                    cpu = line.split(":", 1)[1].strip()
                    break
    except OSError:
        pass
    return f"{platform.machine()}, {os.cpu_count()} CPUs ({cpu}), Python {platform.python_version()}"


def verdict(problems: list[str], kind: str, word: str) -> int:
    """Print each problem as ``WORD problem`` and the closing line (``claims: all hold``), and return the exit
    status a benchmark script gives: 1 when a check or claim failed."""
    for problem in problems:
        print(f"{word} {problem}")
    print(f"{kind}: all {'hold' if kind == 'claims' else 'met'}" if not problems
          else f"{kind}: {len(problems)} {'failed' if kind == 'claims' else 'missed'}")
    return 1 if problems else 0


def print_header(head: str) -> None:
    """A table header line and its rule."""
    print(head)
    print("-" * len(head))

