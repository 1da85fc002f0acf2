"""Cubes and covers: the vocabulary every part of plaforge shares.

Vocabulary
----------
point
    An assignment of 0/1 to the n inputs, encoded as an integer whose bit ``i`` is the value of input ``i``.
cube (product term)
    A set of points given by two integer bitmasks over the inputs: ``care`` (bit ``i`` set: the cube tests input
    ``i``) and ``value`` (for tested inputs, the value required; ``value & ~care == 0``). Point ``p`` lies in the cube
    when ``p & care == value``. A cube testing ``k`` inputs holds ``2**(n-k)`` points and costs ``k`` literals.
    It also carries ``outputs``, a bitmask of the outputs it feeds (bit ``j``: output ``j``), so a list of cubes is a
    multi-output cover with product terms shared between outputs.
cover
    A list of cubes whose union, per output, realizes that output: output ``j`` is the OR of the cubes whose
    ``outputs`` has bit ``j`` (inverted when the cover records ``j`` as realized in complement, see ``inverted``).

In PLA text a cube is written with the leftmost column as input 0::

    care=0b101, value=0b001 over 3 inputs  ->  "1-0"

Everything is an int operation, so width is unbounded (64, 128 or more inputs cost the same code path).
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator, Sequence
from dataclasses import dataclass, field, replace

__all__ = [
    "Cover",
    "Cube",
    "SharpTooLarge",
    "complement",
    "cube_list_contains",
    "cut_by_complement",
    "drop_inputs",
    "lists_intersect",
    "merge_identical",
    "sharp",
]


@dataclass(frozen=True, slots=True, order=True)
class Cube:
    """One product term: ``care``/``value`` input masks and the ``outputs`` it feeds.

    >>> c = Cube.parse("1-0")
    >>> c
    Cube(care=0b101, value=0b1, outputs=0b1)
    >>> c.contains_point(0b001), c.contains_point(0b011), c.contains_point(0b100)
    (True, True, False)
    """

    care: int
    value: int
    outputs: int = 1

    def __post_init__(self) -> None:
        if not isinstance(self.care, int) or not isinstance(self.value, int) or not isinstance(self.outputs, int):
            raise TypeError(f"Cube masks must be ints, not {self.care!r}, {self.value!r}, {self.outputs!r}")
        if self.care < 0 or self.value < 0 or self.outputs < 0:
            raise ValueError(f"Cube masks must be non-negative: {self.care!r}, {self.value!r}, {self.outputs!r}")
        if self.value & ~self.care:
            raise ValueError(f"Cube value {self.value:#b} sets bits outside care {self.care:#b}")

    def __repr__(self) -> str:
        return f"Cube(care={self.care:#b}, value={self.value:#b}, outputs={self.outputs:#b})"

    # -- construction -------------------------------------------------------------------------------------------
    @classmethod
    def universe(cls, outputs: int = 1) -> Cube:
        """The cube holding every point (no literals)."""
        return cls(0, 0, outputs)

    @classmethod
    def point(cls, p: int, n: int, outputs: int = 1) -> Cube:
        """The cube holding exactly point ``p`` of ``n`` inputs (a minterm)."""
        full = (1 << n) - 1
        return cls(full, p & full, outputs)

    @classmethod
    def parse(cls, text: str, outputs: int = 1) -> Cube:
        """Read an input part written as in PLA (``0``, ``1``, ``-``/``x``/``X``; leftmost is input 0)."""
        care = value = 0
        for i, ch in enumerate(text):
            if ch == "1":
                care |= 1 << i
                value |= 1 << i
            elif ch == "0":
                care |= 1 << i
            elif ch not in "-xX":
                raise ValueError(f"Cube text {text!r} has {ch!r} at column {i + 1}; expected 0, 1, - or x")
        return cls(care, value, outputs)

    # -- queries ------------------------------------------------------------------------------------------------
    @property
    def literals(self) -> int:
        """Number of inputs tested."""
        return self.care.bit_count()

    def contains_point(self, p: int) -> bool:
        return p & self.care == self.value

    def contains(self, other: Cube) -> bool:
        """Input-part containment: every point of ``other`` is in ``self`` (outputs ignored)."""
        return other.care & self.care == self.care and other.value & self.care == self.value

    def intersects(self, other: Cube) -> bool:
        """Input parts share a point (outputs ignored)."""
        return (self.value ^ other.value) & self.care & other.care == 0

    def intersect(self, other: Cube) -> Cube | None:
        """Input-part intersection, feeding the outputs both feed; ``None`` when the input parts are disjoint."""
        if not self.intersects(other):
            return None
        return Cube(self.care | other.care, self.value | other.value, self.outputs & other.outputs)

    def distance(self, other: Cube) -> int:
        """Number of inputs on which the two cubes require opposite values."""
        return ((self.value ^ other.value) & self.care & other.care).bit_count()

    def supercube(self, other: Cube) -> Cube:
        """Smallest cube containing both input parts."""
        care = self.care & other.care & ~(self.value ^ other.value)
        return Cube(care, self.value & care, self.outputs | other.outputs)

    def cofactor(self, var: int, val: int) -> Cube | None:
        """Cofactor with respect to input ``var`` = ``val``: ``None`` if the cube excludes that half."""
        bit = 1 << var
        if self.care & bit:
            if bool(self.value & bit) != bool(val):
                return None
            return Cube(self.care & ~bit, self.value & ~bit, self.outputs)
        return self

    def with_outputs(self, outputs: int) -> Cube:
        return Cube(self.care, self.value, outputs)

    def text(self, n: int) -> str:
        """Input part as PLA text over ``n`` inputs (leftmost is input 0)."""
        out = []
        for i in range(n):
            bit = 1 << i
            out.append(("1" if self.value & bit else "0") if self.care & bit else "-")
        return "".join(out)

    def points(self, n: int) -> Iterator[int]:
        """Every point of the cube over ``n`` inputs (2**(n - literals) of them: use with care)."""
        free = [i for i in range(n) if not self.care >> i & 1]
        for k in range(1 << len(free)):
            p = self.value
            for b, i in enumerate(free):
                if k >> b & 1:
                    p |= 1 << i
            yield p


def drop_inputs(cubes: Iterable[Cube], mask: int) -> list[Cube]:
    """Existentially quantify the inputs in ``mask`` away (remove their literals)."""
    return [Cube(c.care & ~mask, c.value & ~mask, c.outputs) for c in cubes]


def _most_binate(cubes: Sequence[Cube]) -> int:
    counts: dict[int, int] = {}
    for c in cubes:
        m = c.care
        while m:
            low = m & -m
            i = low.bit_length() - 1
            counts[i] = counts.get(i, 0) + 1
            m ^= low
    # prefer variables appearing in both phases, then most often
    best, best_key = -1, (-1, -1)
    for i, cnt in counts.items():
        bit = 1 << i
        pos = sum(1 for c in cubes if c.care & bit and c.value & bit)
        key = (1 if 0 < pos < cnt else 0, cnt)
        if key > best_key:
            best, best_key = i, key
    return best


def _absorb(cubes: list[Cube]) -> list[Cube]:
    """Remove cubes contained in another (single-cube containment)."""
    cubes = sorted(set(cubes), key=lambda c: c.literals)
    kept: list[Cube] = []
    for c in cubes:
        if not any(k.contains(c) for k in kept):
            kept.append(c)
    return kept


def complement(cubes: Sequence[Cube], outputs: int = 1) -> list[Cube]:
    """Cubes covering exactly the points no cube in ``cubes`` covers (input parts only).

    Recursive Shannon expansion on the most binate input (the unate recursive paradigm), with single-cube
    containment at each merge. Cost grows with the structure of the list, never with 2**n: a list of range cubes
    over 32 inputs complements in milliseconds.
    """
    return [c.with_outputs(outputs) for c in _complement(list(cubes))]


def _complement(cubes: list[Cube]) -> list[Cube]:
    if not cubes:
        return [Cube(0, 0)]
    for c in cubes:
        if c.care == 0:
            return []
    if len(cubes) == 1:
        c = cubes[0]
        out = []
        m = c.care
        while m:
            low = m & -m
            out.append(Cube(low, low & ~c.value))
            m ^= low
        return out
    var = _most_binate(cubes)
    bit = 1 << var
    halves = []
    for val in (0, 1):
        cof = [x for x in (c.cofactor(var, val) for c in cubes) if x is not None]
        halves.append(_complement(cof))
    lo, hi = halves
    lo_set, hi_set = set(lo), set(hi)
    both = lo_set & hi_set
    out = list(both)
    out += [Cube(c.care | bit, c.value, 1) for c in lo if c not in both]
    out += [Cube(c.care | bit, c.value | bit, 1) for c in hi if c not in both]
    return _absorb(out)


class SharpTooLarge(Exception):
    """Raised by :func:`sharp` when the result would exceed its ``limit`` of cubes."""


def sharp(a: Iterable[Cube], b: Sequence[Cube], *, limit: int | None = None) -> list[Cube]:
    """Points of ``a`` not in any cube of ``b``, as cubes; each piece feeds the outputs of the ``a`` cube it came from.

    Works cube by cube: only the cubes of ``b`` that touch ``x`` are cofactored by ``x`` and complemented, so the
    cost follows local overlap, never the size of all of ``b`` or 2**n. Heavily overlapping random cubes over many
    inputs can still need very many pieces: with a ``limit`` (none by default), more pieces than that raise
    :class:`SharpTooLarge`.
    """
    out: list[Cube] = []
    for x in a:
        touching = [y for y in b if y.intersects(x)]
        if not touching:
            out.append(x)
            continue
        cof = [Cube(y.care & ~x.care, y.value & ~x.care) for y in touching]
        for z in _complement(cof):
            out.append(Cube(z.care | x.care, z.value | x.value, x.outputs))
        if limit is not None and len(out) > limit:
            raise SharpTooLarge(f"more than {limit} cubes")
    return list(dict.fromkeys(out))


#: Most pieces :func:`cut_by_complement` may produce before it gives up.
CUT_LIMIT = 20000
#: Most cubes of ``b`` :func:`cut_by_complement` complements as a whole.
CUT_DC_LIMIT = 64


def cut_by_complement(a: Sequence[Cube], b: Sequence[Cube], outputs: int) -> tuple[Cube, ...] | None:
    """The same points as :func:`sharp` (``a`` minus ``b``), cut differently: each cube of ``a`` intersected with
    each cube of the complement of all of ``b``; the pieces feed ``outputs``.

    The pieces follow the cubes of ``¬b`` rather than each cube's local overlap, which suits a minimizer better
    (see :meth:`plaforge.core.table.Table.on_pieces`). ``None`` when ``b`` has more than :data:`CUT_DC_LIMIT` cubes
    or the pieces could exceed :data:`CUT_LIMIT` (the product of the two list sizes bounds them).
    """
    if not lists_intersect(a, b):
        return tuple(c.with_outputs(outputs) for c in a)
    if len(b) > CUT_DC_LIMIT:  # the complement of many scattered cubes over many inputs can itself explode
        return None
    comp = complement(list(b))
    if len(comp) * len(a) > CUT_LIMIT:
        return None
    out = []
    for x in a:
        for y in comp:
            z = x.intersect(y)
            if z is not None:
                out.append(Cube(z.care, z.value, outputs))
    return tuple(dict.fromkeys(out))


#: Pairs tested at once by :func:`lists_intersect` (bounds its memory: 8 bytes a pair, a few arrays).
_PAIRS_AT_ONCE = 1 << 20


def lists_intersect(a: Sequence[Cube], b: Sequence[Cube]) -> bool:
    """Whether some cube of ``a`` shares a point with some cube of ``b`` (input parts only).

    Up to 64 inputs the pairs are tested in 64-bit arrays, a block of ``a`` against all of ``b`` at a time;
    wider cubes are tested one pair at a time.
    """
    if not a or not b:
        return False
    import numpy as np

    try:
        bc = np.array([c.care for c in b], dtype=np.uint64)
        bv = np.array([c.value for c in b], dtype=np.uint64)
        ac = np.array([c.care for c in a], dtype=np.uint64)
        av = np.array([c.value for c in a], dtype=np.uint64)
    except OverflowError:
        return any(x.intersects(y) for x in a for y in b)
    step = max(1, _PAIRS_AT_ONCE // len(b))
    for k in range(0, len(a), step):
        clash = (av[k:k + step, None] ^ bv[None, :]) & ac[k:k + step, None] & bc[None, :]
        if (clash == 0).any():
            return True
    return False


def merge_identical(cubes: Iterable[Cube]) -> list[Cube]:
    """One cube per distinct input part, feeding the union of the outputs (first-seen order; no-output cubes go)."""
    merged: dict[tuple[int, int], int] = {}
    for c in cubes:
        key = (c.care, c.value)
        merged[key] = merged.get(key, 0) | c.outputs
    return [Cube(care, value, out) for (care, value), out in merged.items() if out]


def cube_list_contains(cubes: Sequence[Cube], cube: Cube) -> bool:
    """Whether the union of ``cubes`` contains every point of ``cube`` (tautology of the cofactor)."""
    cof = []
    for c in cubes:
        if c.intersects(cube):
            cof.append(Cube(c.care & ~cube.care, c.value & ~cube.care))
    return _tautology(cof)


def _tautology(cubes: list[Cube]) -> bool:
    """Whether the union of ``cubes`` holds every point (the unate recursive paradigm, stopping at the first
    cofactor that is not a tautology).

    A cube without literals decides at once; cubes whose point counts cannot add up to the whole space cannot
    cover it; an input tested in one polarity only is set to the value that drops every cube testing it (the list
    is a tautology exactly when the rest is); otherwise both cofactors on the most binate input must be.
    """
    while True:
        if not cubes:
            return False
        pos = neg = 0
        most = 0
        for c in cubes:
            if c.care == 0:
                return True
            pos |= c.value
            neg |= c.care & ~c.value
            most = max(most, c.care.bit_count())
        if sum(1 << (most - c.care.bit_count()) for c in cubes) < 1 << most:
            return False
        unate = pos ^ neg
        if not unate:
            break
        cubes = [c for c in cubes if not c.care & unate]
    var = _most_binate(cubes)
    return all(_tautology([x for x in (c.cofactor(var, val) for c in cubes) if x is not None]) for val in (0, 1))


class NamedPorts:
    """Shape of a value with ``input_names`` and ``output_names`` (a Cover, a Table)."""

    __slots__ = ()
    input_names: tuple[str, ...]
    output_names: tuple[str, ...]

    @property
    def n_inputs(self) -> int:
        return len(self.input_names)

    @property
    def n_outputs(self) -> int:
        return len(self.output_names)


@dataclass(frozen=True, slots=True)
class Cover(NamedPorts):
    """A multi-output two-level cover: shared product terms plus how it was obtained.

    Parameters
    ----------
    input_names, output_names : tuple of str
        Names in order; input ``i`` is bit ``i`` of a point.
    cubes : tuple of Cube
        The product terms; ``cube.outputs`` says which outputs each feeds.
    inverted : int
        Bit ``j`` set: output ``j`` is realized in complement (the OR of its cubes is the complement of the output,
        for devices with programmable output polarity).
    method : str
        ``"exact"``, ``"heuristic"`` or what produced it (``"file"`` for a cover read back from PLA).
    optimal : bool
        True only when the method proved no cover has fewer rows under its cost model.
    lower_bound : int
        Best proven lower bound on the number of rows.
    seconds : float
        Wall time spent producing it.
    cost : str
        ``"shared"`` or ``"per-output"``.
    """

    input_names: tuple[str, ...]
    output_names: tuple[str, ...]
    cubes: tuple[Cube, ...]
    inverted: int = 0
    method: str = "file"
    optimal: bool = False
    lower_bound: int = 0
    seconds: float = 0.0
    cost: str = "shared"
    extra: tuple[tuple[str, object], ...] = field(default=(), compare=False)

    @property
    def rows(self) -> int:
        """Distinct product terms (AND-plane rows)."""
        return len(self.cubes)

    @property
    def literals(self) -> int:
        """Literals summed over the distinct product terms."""
        return sum(c.literals for c in self.cubes)

    def terms(self) -> dict[str, int]:
        """Output name -> number of product terms feeding it."""
        return {
            name: sum(1 for c in self.cubes if c.outputs >> j & 1) for j, name in enumerate(self.output_names)
        }

    def cubes_for(self, j: int) -> list[Cube]:
        """The cubes feeding output ``j`` (before any inversion)."""
        return [c for c in self.cubes if c.outputs >> j & 1]

    def is_inverted(self, j: int) -> bool:
        return bool(self.inverted >> j & 1)

    def evaluate(self, point: int) -> int:
        """Output bitmask the cover gives at ``point`` (inversion applied)."""
        raw = 0
        for c in self.cubes:
            if point & c.care == c.value:
                raw |= c.outputs
        return raw ^ self.inverted

    def with_(self, **changes: object) -> Cover:
        return replace(self, **changes)  # type: ignore[arg-type]
