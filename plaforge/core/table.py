"""The Table: a multi-output, incompletely specified Boolean function exactly as the user gave it.

Vocabulary
----------
ON / DC / OFF set
    For each output, the points where it must be 1, may be anything (don't-care), or must be 0. The three sets
    partition the 2**n points. Each is held as a list of cubes (see :mod:`plaforge.core.cube`); at most one of the three
    may be left implicit ("the rest"), and is computed on demand as the complement of the other two, so a table
    described by a few range cubes over 32 inputs never enumerates anything.
bit-parallel truth table
    For n up to an enumeration limit (default 24), a set of points as a packed ``numpy.uint64`` array of
    ``max(1, 2**n // 64)`` words: point ``p`` is bit ``p % 64`` of word ``p // 64``.
bus
    A group of inputs or outputs written ``name[i]`` that emitters show as one multi-bit port (member 0 is the LSB).
support
    The inputs an output really depends on: input ``i`` can be dropped when no ON point and OFF point differ only
    in inputs already dropped plus ``i``.
"""

from __future__ import annotations

import functools
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

import numpy as np

from .cube import Cube, NamedPorts, SharpTooLarge, complement, cut_by_complement, merge_identical, sharp
from .errors import EnumerationLimit, SizeLimit

__all__ = [
    "DEFAULT_ENUM_LIMIT",
    "Bus",
    "FunctionSets",
    "Table",
    "bool_array_to_cubes",
    "cube_bits",
    "cubes_bits",
    "pack_bool",
    "point_bits",
    "popcount_bits",
    "signature_regions",
    "unpack_bits",
]

DEFAULT_ENUM_LIMIT = 24
#: A set given as the complement of the others is computed bit-parallel (over all ``2**n`` points) up to this many
#: inputs when more than :data:`_BIT_COMPLEMENT_CUBES` cubes are given; by cube complement otherwise.
_BIT_COMPLEMENT_INPUTS = 16
_BIT_COMPLEMENT_CUBES = 512


@dataclass(frozen=True, slots=True)
class Bus:
    """A port as the spec names it: ``indices[b]`` is the table index of bit ``b`` (LSB first).

    ``scalar`` ports are single bits whose table name is the port name itself (no ``[0]``).
    """

    name: str
    indices: tuple[int, ...]
    scalar: bool = False

    @property
    def width(self) -> int:
        return len(self.indices)


def _default_buses(names: Sequence[str]) -> tuple[Bus, ...]:
    """Group ``x[0]``, ``x[1]``, ... into buses; anything else is a scalar port. Order of first appearance."""
    groups: dict[str, dict[int, int]] = {}
    order: list[tuple[str, bool]] = []
    for idx, name in enumerate(names):
        base, sep, rest = name.partition("[")
        if sep and rest.endswith("]") and rest[:-1].isdigit() and base:
            if base not in groups:
                groups[base] = {}
                order.append((base, False))
            groups[base][int(rest[:-1])] = idx
        else:
            order.append((name, True))
    buses = []
    for base, scalar in order:
        if scalar:
            buses.append(Bus(base, (names.index(base),), True))
        else:
            bits = groups[base]
            if sorted(bits) == list(range(len(bits))):
                buses.append(Bus(base, tuple(bits[b] for b in range(len(bits)))))
            else:  # gaps: keep each bit as its own port under its own name
                for b in sorted(bits):
                    buses.append(Bus(f"{base}[{b}]", (bits[b],), True))
    return tuple(buses)


@dataclass(frozen=True, eq=False)
class Table(NamedPorts):
    """A multi-output incompletely specified function.

    Parameters
    ----------
    input_names, output_names : tuple of str
        Ordered names; input ``i`` is bit ``i`` of a point.
    on, dc, off : tuple (one entry per output) of tuple of Cube, or None
        The sets as given. Per output at most one of the three may be ``None``, meaning "every point not in the
        other two". A point given both as ON (or OFF) and DC is a don't-care.
    input_buses, output_buses : tuple of Bus
        Port grouping for emitters; derived from ``name[i]`` names when omitted.
    source : str
        Where the table came from (a file name), for reports.

    Raises
    ------
    ValueError
        If the shapes disagree or an output leaves more than one set implicit.
    """

    input_names: tuple[str, ...]
    output_names: tuple[str, ...]
    on: tuple[tuple[Cube, ...] | None, ...]
    dc: tuple[tuple[Cube, ...] | None, ...]
    off: tuple[tuple[Cube, ...] | None, ...]
    input_buses: tuple[Bus, ...] = ()
    output_buses: tuple[Bus, ...] = ()
    source: str = ""
    _cache: dict = field(default_factory=dict, repr=False, compare=False)

    def __post_init__(self) -> None:
        m = len(self.output_names)
        for label, sets in (("on", self.on), ("dc", self.dc), ("off", self.off)):
            if len(sets) != m:
                raise ValueError(f"Table.{label} has {len(sets)} entries for {m} outputs")
        for j in range(m):
            implicit = sum(s is None for s in (self.on[j], self.dc[j], self.off[j]))
            if implicit > 1:
                raise ValueError(f"output {self.output_names[j]!r} leaves {implicit} sets implicit; at most 1 may be")
        if len(set(self.input_names)) != len(self.input_names):
            raise ValueError(f"duplicate input names in {self.input_names!r}")
        if len(set(self.output_names)) != len(self.output_names):
            raise ValueError(f"duplicate output names in {self.output_names!r}")
        if not self.input_buses:
            object.__setattr__(self, "input_buses", _default_buses(self.input_names))
        if not self.output_buses:
            object.__setattr__(self, "output_buses", _default_buses(self.output_names))

    # -- identity ------------------------------------------------------------------------------------------------
    def _key(self) -> tuple:
        m = self.n_outputs
        return (
            self.input_names,
            self.output_names,
            tuple(frozenset(self.on_cubes(j)) for j in range(m)),
            tuple(frozenset(self.dc_cubes(j)) for j in range(m)),
        )

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, Table):
            return NotImplemented
        return self._key() == other._key()

    def __hash__(self) -> int:
        return hash((self.input_names, self.output_names))

    def __repr__(self) -> str:
        return (
            f"<Table {self.n_inputs} inputs {list(self.input_names)[:8]}{'...' if self.n_inputs > 8 else ''}, "
            f"{self.n_outputs} outputs {list(self.output_names)[:8]}{'...' if self.n_outputs > 8 else ''}"
            f"{' from ' + self.source if self.source else ''}>"
        )

    # -- the three sets as cubes ---------------------------------------------------------------------------------
    def _set(self, j: int, kind: int) -> tuple[Cube, ...]:
        """Set ``kind`` (0 ON, 1 DC, 2 OFF) of output ``j``, computed only when asked for."""
        key = ("set", j, kind)
        if key in self._cache:
            return self._cache[key]
        given = (self.on[j], self.dc[j], self.off[j])
        s = given[kind]
        if s is None and ("truth", j) in self._cache:
            on_b, dc_b = self._cache[("truth", j)]
            n = self.n_inputs
            bits = on_b if kind == 0 else dc_b if kind == 1 else ~(on_b | dc_b) & _valid_mask(n)
            s = tuple(bool_array_to_cubes(unpack_bits(bits, n), n, 1 << j))
        elif s is None:
            others = [c for k in range(3) if k != kind for c in given[k]]  # type: ignore[union-attr]
            n = self.n_inputs
            if n <= _BIT_COMPLEMENT_INPUTS and len(others) > _BIT_COMPLEMENT_CUBES:
                # many rows, few inputs (a listed .type f/fr table): complement bit-parallel. Measured on the 14-input
                # 7x7-bit multiplier as .type fr: 12 s for the DC sets by cube complement, 0.03 s this way.
                rest = cubes_bits(others, n)
                s = tuple(bool_array_to_cubes(unpack_bits(~rest & _valid_mask(n), n), n, 1 << j))
            else:
                s = tuple(complement(others))
        if kind != 1:
            # DC wins over ON/OFF where they overlap: trim to exclude DC points.
            dc = self.dc_cubes(j)
            if dc:
                try:
                    s = sharp(s, dc, limit=SHARP_LIMIT)
                except SharpTooLarge:
                    raise SizeLimit(
                        f"{self.source or 'table'}: output {self.output_names[j]!r}: its "
                        f"{'ON' if kind == 0 else 'OFF'} rows overlap its don't-care rows so much that separating "
                        f"them needs more than {SHARP_LIMIT} cubes; give the don't-cares as rows of their own, "
                        "not overlapping the others"
                    ) from None
        bit = 1 << j
        res = tuple(c if c.outputs == bit else c.with_outputs(bit) for c in s)
        self._cache[key] = res
        return res

    def on_cubes(self, j: int) -> tuple[Cube, ...]:
        """Cubes covering exactly output ``j``'s ON set (each with ``outputs == 1 << j``)."""
        return self._set(j, 0)

    def dc_cubes(self, j: int) -> tuple[Cube, ...]:
        """Cubes covering exactly output ``j``'s don't-care set."""
        return self._set(j, 1)

    def off_cubes(self, j: int) -> tuple[Cube, ...]:
        """Cubes covering exactly output ``j``'s OFF set."""
        return self._set(j, 2)

    def on_pieces(self, j: int, complemented: bool = False) -> tuple[Cube, ...]:
        """Output ``j``'s ON set (its OFF set when ``complemented``) as a minimizer is best fed it.

        Where that set is given together with don't-cares, the given cubes are cut by the complement of the DC set
        (:func:`plaforge.core.cube.cut_by_complement`): measured on the 40-input suite entry, the heuristic
        minimizer runs about ten times faster from those pieces than from the same set trimmed cube by cube
        (:meth:`on_cubes`), or from the untrimmed cubes. When the cut would give too many pieces the given cubes
        come back as they are: they may then overlap the don't-cares, whose points stay don't-care. Otherwise this
        is :meth:`on_cubes` (:meth:`off_cubes`).
        """
        key = ("pieces", j, complemented)
        if key not in self._cache:
            given = self.off[j] if complemented else self.on[j]
            dc = self.dc_cubes(j)
            if given is not None and dc:
                cut = cut_by_complement(given, dc, 1 << j)
                pieces = cut if cut is not None else tuple(c.with_outputs(1 << j) for c in given)
            else:
                pieces = self.off_cubes(j) if complemented else self.on_cubes(j)
            self._cache[key] = pieces
        return self._cache[key]

    def cover_sets(self, inverted: int = 0) -> FunctionSets:
        """The sets a cover of this table must realize, outputs in ``inverted`` complemented (computed once).

        ``on[j]`` is :meth:`on_pieces` (complemented for the outputs in ``inverted``), ``dc[j]`` is :meth:`dc_cubes`.
        """
        key = ("cover sets", inverted)
        if key not in self._cache:
            m = self.n_outputs
            on = tuple(self.on_pieces(j, bool(inverted >> j & 1)) for j in range(m))
            dc = tuple(self.dc_cubes(j) for j in range(m))
            self._cache[key] = FunctionSets(self.n_inputs, m, on, dc, inverted)
        return self._cache[key]

    def evaluate(self, point: int) -> tuple[int, int]:
        """``(on_mask, dc_mask)`` over outputs at one point (cube look-ups; no enumeration)."""
        on_mask = dc_mask = 0
        for j in range(self.n_outputs):
            if any(point & c.care == c.value for c in self.dc_cubes(j)):
                dc_mask |= 1 << j
            elif any(point & c.care == c.value for c in self.on_cubes(j)):
                on_mask |= 1 << j
        return on_mask, dc_mask

    # -- support -------------------------------------------------------------------------------------------------
    def support(self, j: int) -> int:
        """Bitmask of the inputs output ``j`` depends on (greedy; exact when there are no don't-cares)."""
        key = ("support", j)
        if key in self._cache:
            return self._cache[key]
        try:
            if self.dc[j] is None and self.on[j] is not None and self.off[j] is not None:
                on, off = self.on[j], self.off[j]  # as given: DC is the rest, so nothing needs trimming
            else:
                on, off = self.on_cubes(j), self.off_cubes(j)
        except SizeLimit:
            # ON or OFF rows overlap the don't-cares too much to separate: use the rows as given. Points in both
            # then count as ON (or OFF), so the support found may keep an input a don't-care would let go.
            on = self.on[j] if self.on[j] is not None else self.on_cubes(j)
            off = self.off[j] if self.off[j] is not None else self.off_cubes(j)
        used = 0
        for c in on + off:
            used |= c.care
        dropped = 0
        for i in range(self.n_inputs):
            bit = 1 << i
            if not used & bit:
                dropped |= bit
                continue
            trial = dropped | bit
            if not _lists_intersect(on, off, trial):
                dropped = trial
        full = (1 << self.n_inputs) - 1
        res = full & ~dropped
        self._cache[key] = res
        return res

    def support_names(self, j: int) -> list[str]:
        s = self.support(j)
        return [n for i, n in enumerate(self.input_names) if s >> i & 1]

    # -- bit-parallel truth tables -------------------------------------------------------------------------------
    def check_enumerable(self, limit: int = DEFAULT_ENUM_LIMIT, what: str = "this operation") -> None:
        if self.n_inputs > limit:
            raise EnumerationLimit(
                f"{self.source or 'table'}: {what} enumerates 2^{self.n_inputs} points, above the enumeration "
                f"limit of {limit} inputs; raise the limit or use a cube-based path"
            )

    def truth(self, j: int, limit: int = DEFAULT_ENUM_LIMIT) -> tuple[np.ndarray, np.ndarray]:
        """``(on_bits, dc_bits)`` of output ``j`` as packed bit arrays (see module docs)."""
        self.check_enumerable(limit, "a truth table")
        key = ("truth", j)
        if key not in self._cache:
            n = self.n_inputs
            self._cache[key] = (cubes_bits(self.on_cubes(j), n), cubes_bits(self.dc_cubes(j), n))
        return self._cache[key]

    # -- constructors --------------------------------------------------------------------------------------------
    @classmethod
    def from_function(
        cls,
        input_names: Sequence[str],
        output_names: Sequence[str],
        fn: Callable[[np.ndarray], Sequence[np.ndarray]],
        dc_fn: Callable[[np.ndarray], Sequence[np.ndarray]] | None = None,
        source: str = "",
    ) -> Table:
        """Build a table by evaluating ``fn`` on every point at once.

        ``fn(points)`` receives ``numpy.arange(2**n)`` and returns one boolean array per output; ``dc_fn`` likewise
        marks don't-care points. ON/DC sets become merged cubes (not minterm lists).
        """
        n, m = len(input_names), len(output_names)
        pts = np.arange(1 << n, dtype=np.int64)
        vals = fn(pts)
        dcs = dc_fn(pts) if dc_fn is not None else [np.zeros(1 << n, dtype=bool)] * m
        if len(vals) != m or len(dcs) != m:
            raise ValueError(f"fn gave {len(vals)} outputs and dc_fn {len(dcs)}; expected {m}")
        on_sets, dc_sets, truths = [], [], []
        for j in range(m):
            v = np.asarray(vals[j], dtype=bool)
            d = np.asarray(dcs[j], dtype=bool)
            v = v & ~d
            on_sets.append(tuple(bool_array_to_cubes(v, n, 1 << j)))
            dc_sets.append(tuple(bool_array_to_cubes(d, n, 1 << j)))
            truths.append((pack_bool(v), pack_bool(d)))
        t = cls(tuple(input_names), tuple(output_names), tuple(on_sets), tuple(dc_sets), (None,) * m, source=source)
        for j in range(m):
            t._cache[("truth", j)] = truths[j]
        return t


@dataclass(frozen=True, eq=False)
class FunctionSets:
    """ON and DC cubes per output of a function a cover must realize, and the views of them minimizers use.

    ``on[j]`` / ``dc[j]`` hold cubes with ``outputs == 1 << j``; points in both are don't-care. Built by
    :meth:`Table.cover_sets` (where output ``j`` in ``inverted`` has the Table's OFF set as ``on[j]``) or directly
    for a derived function. The views below are computed on first use and kept.
    """

    n: int
    m: int
    on: tuple[tuple[Cube, ...], ...]
    dc: tuple[tuple[Cube, ...], ...]
    inverted: int = 0

    @functools.cached_property
    def joint_on(self) -> tuple[Cube, ...]:
        """The ON cubes of all outputs with identical input parts merged into one multi-output cube."""
        return tuple(merge_identical(c.with_outputs(1 << j) for j in range(self.m) for c in self.on[j]))

    @functools.cached_property
    def joint_dc(self) -> tuple[Cube, ...]:
        """The DC cubes of all outputs with identical input parts merged into one multi-output cube."""
        return tuple(merge_identical(c.with_outputs(1 << j) for j in range(self.m) for c in self.dc[j]))

    @functools.cached_property
    def bits(self) -> tuple[tuple[np.ndarray, np.ndarray], ...]:
        """``(on_bits, dc_bits)`` per output as packed bit arrays (see module docs); ON points exclude DC points.

        Raises :class:`plaforge.core.errors.EnumerationLimit` above :data:`DEFAULT_ENUM_LIMIT` inputs.
        """
        if self.n > DEFAULT_ENUM_LIMIT:
            raise EnumerationLimit(
                f"the point sets of a {self.n}-input function enumerate 2^{self.n} points, above the enumeration "
                f"limit of {DEFAULT_ENUM_LIMIT} inputs"
            )
        out = []
        for j in range(self.m):
            dc = cubes_bits(self.dc[j], self.n)
            out.append((cubes_bits(self.on[j], self.n) & ~dc, dc))
        return tuple(out)

    def point_arrays(self) -> tuple[list[np.ndarray], list[np.ndarray]]:
        """``(on, dc)``: per output a boolean array over the 2**n points (unpacked from :attr:`bits`)."""
        return ([unpack_bits(on, self.n) for on, _ in self.bits], [unpack_bits(dc, self.n) for _, dc in self.bits])

    @functools.cached_property
    def regions(self) -> tuple[tuple[int, int, tuple[Cube, ...]], ...]:
        """The regions where the output signature is constant, as ``(on_mask, dc_mask, cubes)``.

        ``on_mask`` / ``dc_mask`` say which outputs are ON / don't-care on every point of ``cubes`` (cubes feeding
        output 0, to be re-tagged); regions where both masks are 0 are left out. In order of the signature
        ``(on_mask, dc_mask)``. At most 64 outputs.
        """
        on, dc = self.point_arrays()
        return signature_regions(self.n, on, dc)


def signature_regions(n: int, on: Sequence[np.ndarray], dc: Sequence[np.ndarray]) -> tuple[
        tuple[int, int, tuple[Cube, ...]], ...]:
    """The regions where the output signature is constant, as ``(on_mask, dc_mask, cubes)``, from per-output
    boolean point arrays (see :attr:`plaforge.core.table.FunctionSets.regions`). At most 64 outputs."""
    m = len(on)
    if m > 64:
        raise ValueError(f"signature regions need at most 64 outputs, not {m}")
    on_sig = np.zeros(1 << n, dtype=np.uint64)
    dc_sig = np.zeros(1 << n, dtype=np.uint64)
    for j in range(m):
        bit = np.uint64(1 << j)
        on_sig[on[j]] |= bit
        dc_sig[dc[j]] |= bit
    uniq, inverse = np.unique(np.stack([on_sig, dc_sig], axis=1), axis=0, return_inverse=True)
    inverse = inverse.reshape(-1)
    return tuple(
        (on_m, dc_m, tuple(bool_array_to_cubes(inverse == k, n)))
        for k, (on_m, dc_m) in enumerate(uniq.tolist())
        if on_m or dc_m
    )


# ---------------------------------------------------------------------------------------------------------------
def _lists_intersect(a: Sequence[Cube], b: Sequence[Cube], dropped: int = 0) -> bool:
    """Whether a cube of ``a`` meets a cube of ``b`` once the inputs in ``dropped`` are ignored (vectorized in
    blocks up to 63 inputs; single points compared as a set)."""
    keep = ~dropped
    full = max((c.care for c in (*a, *b)), default=0)
    if all(c.care == full for c in a) and all(c.care == full for c in b):
        return not {c.value & keep for c in a}.isdisjoint(c.value & keep for c in b)
    if full.bit_length() > 63:
        return any((x.value ^ y.value) & x.care & y.care & keep == 0 for x in a for y in b)
    bc = np.array([c.care & keep for c in b], dtype=np.uint64)
    bv = np.array([c.value for c in b], dtype=np.uint64)
    for k in range(0, len(a), 256):
        part = a[k:k + 256]
        ac = np.array([c.care & keep for c in part], dtype=np.uint64)[:, None]
        av = np.array([c.value for c in part], dtype=np.uint64)[:, None]
        if (((av ^ bv) & ac & bc) == 0).any():
            return True
    return False


#: Most cubes a set trimmed by its don't-cares may take before the Table refuses (see ``Table._set``).
SHARP_LIMIT = 200_000


def bool_array_to_cubes(v: np.ndarray, n: int, outputs: int = 1) -> list[Cube]:
    """Cubes for the points where ``v`` is true (point order), merged recursively on the top input.

    The recursion works on 64-point words (each distinct word's cubes computed once), so a function of 20 inputs
    costs about 2**14 steps, not 2**20.
    """
    v = np.asarray(v, dtype=bool)
    if n <= 6:
        word = 0
        for p in np.flatnonzero(v):
            word |= 1 << int(p)
        return [Cube(c, val, outputs) for c, val in _word_cubes(word, n)]
    words = pack_bool(v)
    full = np.uint64(0xFFFFFFFFFFFFFFFF)

    def rec(lo: int, var: int) -> list[tuple[int, int]]:
        # words[lo : lo + 2**(var-5)] hold points decided on inputs var..0
        if var == 5:
            return _word_cubes(int(words[lo]), 6)
        seg = words[lo : lo + (1 << (var - 5))]
        if not seg.any():
            return []
        if (seg == full).all():
            return [(0, 0)]
        half = 1 << (var - 6)
        return _merge(rec(lo, var - 1), rec(lo + half, var - 1), 1 << var)

    return [Cube(c, val, outputs) for c, val in rec(0, n - 1)]


def _merge(a: list[tuple[int, int]], b: list[tuple[int, int]], bit: int) -> list[tuple[int, int]]:
    both = set(a) & set(b)
    out = [c for c in a if c in both]
    out += [(c | bit, val) for c, val in a if (c, val) not in both]
    out += [(c | bit, val | bit) for c, val in b if (c, val) not in both]
    return out


@functools.lru_cache(maxsize=1 << 16)
def _word_cubes(word: int, n: int) -> list[tuple[int, int]]:
    """Cubes (care, value) over inputs 0..n-1 for the points set in ``word`` (n <= 6)."""
    size = 1 << n
    word &= (1 << size) - 1
    if word == 0:
        return []
    if word == (1 << size) - 1:
        return [(0, 0)]
    half = size >> 1
    lo = _word_cubes(word & ((1 << half) - 1), n - 1)
    hi = _word_cubes(word >> half, n - 1)
    return _merge(lo, hi, 1 << (n - 1))


def _words(n: int) -> int:
    return max(1, (1 << n) >> 6)


def _valid_mask(n: int) -> np.uint64:
    return np.uint64((1 << (1 << n)) - 1) if n < 6 else np.uint64(0xFFFFFFFFFFFFFFFF)


_LOW_PATTERNS = [
    0xAAAAAAAAAAAAAAAA,
    0xCCCCCCCCCCCCCCCC,
    0xF0F0F0F0F0F0F0F0,
    0xFF00FF00FF00FF00,
    0xFFFF0000FFFF0000,
    0xFFFFFFFF00000000,
]


@functools.lru_cache(maxsize=64)
def _literal_bits(n: int, i: int) -> np.ndarray:
    """Packed set of points with input ``i`` equal to 1, over ``n`` inputs (read-only)."""
    w = _words(n)
    if i < 6:
        arr = np.full(w, np.uint64(_LOW_PATTERNS[i]), dtype=np.uint64) & _valid_mask(n)
    else:
        idx = np.arange(w, dtype=np.uint64)
        arr = np.where((idx >> np.uint64(i - 6)) & np.uint64(1), np.uint64(0xFFFFFFFFFFFFFFFF), np.uint64(0))
        arr = arr.astype(np.uint64)
    arr.setflags(write=False)
    return arr


def cube_bits(cube: Cube, n: int) -> np.ndarray:
    """Packed set of the points of ``cube`` over ``n`` inputs."""
    arr = np.full(_words(n), _valid_mask(n), dtype=np.uint64)
    m = cube.care
    while m:
        low = m & -m
        i = low.bit_length() - 1
        lit = _literal_bits(n, i)
        if cube.value & low:
            arr &= lit
        else:
            arr &= ~lit
        m ^= low
    if n < 6:
        arr &= _valid_mask(n)
    return arr


#: Most words of the (cubes x words) array :func:`cubes_bits` builds at once.
_BLOCK_WORDS = 1 << 21


def cubes_bits(cubes: Sequence[Cube], n: int) -> np.ndarray:
    """Packed union of the points of ``cubes`` over ``n`` inputs.

    From 6 inputs on, in arrays: single points are set directly; a larger cube is the 64-bit pattern of its
    literals on inputs 0-5 in every word whose index its literals on inputs 6 and up select, a block of cubes
    against all words at a time.
    """
    out = np.zeros(_words(n), dtype=np.uint64)
    if n < 6:
        for c in cubes:
            out |= cube_bits(c, n)
        return out
    full = (1 << n) - 1
    points = [c.value for c in cubes if c.care == full]
    if points:
        p = np.fromiter(points, dtype=np.int64, count=len(points))
        np.bitwise_or.at(out, p >> 6, np.left_shift(np.uint64(1), (p & 63).astype(np.uint64)))
        cubes = [c for c in cubes if c.care != full]
    if not cubes:
        return out
    care = np.fromiter((c.care for c in cubes), dtype=np.int64, count=len(cubes))
    value = np.fromiter((c.value for c in cubes), dtype=np.int64, count=len(cubes))
    pattern = np.full(len(cubes), np.uint64(0xFFFFFFFFFFFFFFFF), dtype=np.uint64)
    for i in range(6):
        lit = np.uint64(_LOW_PATTERNS[i])
        tested, one = (care >> i & 1).astype(bool), (value >> i & 1).astype(bool)
        pattern &= np.where(tested, np.where(one, lit, ~lit), np.uint64(0xFFFFFFFFFFFFFFFF))
    hi_care, hi_value = care >> 6, value >> 6
    words = np.arange(out.size, dtype=np.int64)
    step = max(1, _BLOCK_WORDS // out.size)
    for k in range(0, len(cubes), step):
        hit = (words[None, :] & hi_care[k:k + step, None]) == hi_value[k:k + step, None]
        out |= np.bitwise_or.reduce(np.where(hit, pattern[k:k + step, None], np.uint64(0)), axis=0)
    return out


def pack_bool(v: np.ndarray) -> np.ndarray:
    """Pack a boolean array of length 2**n (point order) into the uint64 layout used here."""
    v = np.asarray(v, dtype=bool)
    if v.size < 64:
        word = 0
        for p in np.flatnonzero(v):
            word |= 1 << int(p)
        return np.array([word], dtype=np.uint64)
    return np.packbits(v.reshape(-1, 8), axis=1, bitorder="little").reshape(-1).view(np.uint64).copy()


def unpack_bits(bits: np.ndarray, n: int) -> np.ndarray:
    """Inverse of :func:`pack_bool`: boolean array of length 2**n."""
    raw = np.unpackbits(np.ascontiguousarray(bits).view(np.uint8), bitorder="little")
    return raw[: 1 << n].astype(bool)


def popcount_bits(bits: np.ndarray) -> int:
    """Number of points in a packed set."""
    return int(np.unpackbits(np.ascontiguousarray(bits).view(np.uint8)).sum())


def point_bits(bits: np.ndarray, p: int) -> bool:
    """Whether point ``p`` is in a packed set."""
    return bool(int(bits[p >> 6]) >> (p & 63) & 1)
