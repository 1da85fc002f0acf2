"""Checking artifacts against the source Table, output by output.

The rule: for every output, ON ⊆ artifact ⊆ ON ∪ DC. A check trusts nothing but the Table.

Bit-parallel path: both sides as packed truth tables (see :mod:`plaforge.table`); cost O(2**n / 64) word operations
per cube or LUT, so a 20-input, 16-output cover checks in well under a second.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from ..core.cube import Cover
from ..core.names import check_names
from ..core.table import DEFAULT_ENUM_LIMIT, Table, _literal_bits, _valid_mask, cubes_bits

if TYPE_CHECKING:  # annotations only: importing plaforge.lut here closes an import cycle through lut.verify_sat
    from ..core.network import LutNetwork

__all__ = ["EXHAUSTIVE_METHOD", "OutputVerdict", "Verdict", "check_cover", "check_network", "cover_bits", "first_point",
           "network_bits"]


EXHAUSTIVE_METHOD = "proven: exhaustive, every point (bit-parallel)"


@dataclass(frozen=True)
class OutputVerdict:
    """Result for one output: ``failure`` is ``(point, expected, actual)`` for the first failing point, if any;
    ``failures`` how many of the ``vectors`` judged fail, where the method counts them (``None``: a proof that
    stops at its first counterexample)."""

    name: str
    passed: bool
    vectors: int
    method: str
    failure: tuple[int, int, int] | None = None
    failures: int | None = None


@dataclass(frozen=True)
class Verdict:
    artifact: str
    outputs: tuple[OutputVerdict, ...]

    @property
    def passed(self) -> bool:
        return all(o.passed for o in self.outputs)


def first_point(bits: np.ndarray) -> int | None:
    """Lowest point in a packed set, or ``None`` if it is empty."""
    nz = np.flatnonzero(bits)
    if nz.size == 0:
        return None
    w = int(nz[0])
    word = int(bits[w])
    return w * 64 + ((word & -word).bit_length() - 1)


def cover_bits(cover: Cover, j: int, n: int) -> np.ndarray:
    """Packed truth table of output ``j`` of ``cover`` (inversion applied)."""
    bits = cubes_bits(cover.cubes_for(j), n)
    if cover.is_inverted(j):
        bits = ~bits & _valid_mask(n)
    return bits


def network_bits(net: LutNetwork, n: int) -> list[np.ndarray]:
    """Packed truth tables of every output of ``net``."""
    words = max(1, (1 << n) >> 6)
    full = np.full(words, _valid_mask(n), dtype=np.uint64)
    vals: dict[str, np.ndarray] = {"0": np.zeros(words, dtype=np.uint64), "1": full}
    for i, name in enumerate(net.input_names):
        vals[name] = _literal_bits(n, i)
    for lut in net.luts:
        fan = [vals[x] for x in lut.inputs]

        def shannon(init: int, width: int, fan: list[np.ndarray] = fan) -> np.ndarray:
            if width == 0:
                return full if init & 1 else vals["0"]
            half = 1 << (width - 1)
            lo = shannon(init & ((1 << half) - 1), width - 1, fan)
            hi = shannon(init >> half, width - 1, fan)
            if lo is hi:
                return lo
            x = fan[width - 1]
            return (x & hi) | (~x & lo)

        vals[lut.name] = shannon(lut.init, len(fan))
    return [vals[d] for d in net.drivers]


def _judge(table: Table, j: int, got: np.ndarray, method: str) -> OutputVerdict:
    n = table.n_inputs
    on, dc = table.truth(j, limit=max(n, DEFAULT_ENUM_LIMIT))
    missing = on & ~got
    extra = got & ~(on | dc)
    p_miss, p_extra = first_point(missing), first_point(extra)
    bad = [p for p in (p_miss, p_extra) if p is not None]
    care = (1 << n) - int(np.unpackbits(np.ascontiguousarray(dc).view(np.uint8)).sum())
    if not bad:
        return OutputVerdict(table.output_names[j], True, care, method, failures=0)
    p = min(bad)
    expected = 1 if p == p_miss else 0
    wrong = int(np.unpackbits(np.ascontiguousarray(missing | extra).view(np.uint8)).sum())
    return OutputVerdict(table.output_names[j], False, care, method, (p, expected, 1 - expected), wrong)


def _admit(table: Table, thing: Cover | LutNetwork, limit: int, artifact: str) -> None:
    """Raise unless ``thing`` has the table's names and the table is small enough to check exhaustively."""
    check_names(table, thing.input_names, thing.output_names, artifact)
    table.check_enumerable(limit, "an exhaustive check")


def _verdict(table: Table, artifact: str, got: Callable[[int], np.ndarray]) -> Verdict:
    """Every output judged point by point: ``got(j)`` is what the artifact gives for output ``j``."""
    return Verdict(artifact, tuple(_judge(table, j, got(j), EXHAUSTIVE_METHOD) for j in range(table.n_outputs)))


def check_cover(table: Table, cover: Cover, limit: int = DEFAULT_ENUM_LIMIT, artifact: str = "cover") -> Verdict:
    """Exhaustive bit-parallel check of a cover against a table (n up to ``limit``).

    Raises
    ------
    ArtifactError
        If the cover's names are not the table's (:func:`plaforge.core.names.check_names`).
    """
    _admit(table, cover, limit, artifact)
    return _verdict(table, artifact, lambda j: cover_bits(cover, j, table.n_inputs))


def check_network(table: Table, net: LutNetwork, limit: int = DEFAULT_ENUM_LIMIT,
                  artifact: str = "LUT network") -> Verdict:
    """Exhaustive bit-parallel check of a LUT network against a table (n up to ``limit``).

    Raises
    ------
    ArtifactError
        If the network's names are not the table's (:func:`plaforge.core.names.check_names`).
    """
    _admit(table, net, limit, artifact)
    return _verdict(table, artifact, network_bits(net, table.n_inputs).__getitem__)
