"""Static hazards of a two-level cover for single-input changes, found with cube algebra (no enumeration).

A two-level AND-OR realization of output ``j`` has a *static-1 hazard* for a change of input ``i`` between two
adjacent points ``p`` and ``p ^ (1 << i)`` when the output is 1 at both and no single product term of the output
holds both: while ``i`` travels, the term that held ``p`` may fall before the one that holds the other point rises,
and the output may drop for a moment. This is Eichelberger's condition (1965): a two-level sum of products is free
of static-1 hazards for single-input changes exactly when every pair of adjacent ON points lies inside one of its
product terms. Static-0 and dynamic hazards cannot occur in that form for single-input changes (docs/hazards.md
gives the reasoning).

Only *care* points are judged by default: a pair counts when both points are in the output's ON set. With
``dc=True`` every pair at which the cover itself gives 1 counts (don't-care points the cover sets to 1 included).
An output the cover realizes in complement (``Cover.inverted``) is the complement of the OR of its terms: its terms
hold its OFF set, and the same condition finds the *static-0* hazards of the output.

The result is a list of :class:`Transition` cubes per output: input ``i`` together with a cube of the other inputs
(input ``i`` left free in it), meaning every point of that cube is a hazardous pair for a change of ``i``. For each
changing input ``i`` the hazardous set is ``(R|x_i=0 ∩ R|x_i=1) minus (terms not testing x_i)`` where ``R`` is the
set that must stay at 1, computed as ``((R|x_i=0) minus those terms) ∩ R|x_i=1`` with cofactors, the sharp product and
intersections of
:mod:`plaforge.core.cube`, so the cost follows the cube lists, not 2**n.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from ..core.cube import Cover, Cube, sharp
from ..core.errors import PlaforgeError
from ..core.table import Table

__all__ = ["OutputHazards", "Transition", "changing_mask", "find_hazards", "format_hazards", "output_hazards"]


@dataclass(frozen=True, slots=True)
class Transition:
    """Hazardous changes of input ``input`` at every point of ``cube`` (which leaves ``input`` free) over ``n``
    inputs."""

    input: int
    cube: Cube
    n: int

    def pairs(self) -> int:
        """How many adjacent point pairs this transition cube stands for."""
        return 1 << (self.n - self.cube.literals - 1)


@dataclass(frozen=True, slots=True)
class OutputHazards:
    """The hazards of one output: ``kind`` is ``"static-1"``, or ``"static-0"`` for an output realized in
    complement."""

    output: int
    name: str
    kind: str
    transitions: tuple[Transition, ...]

    @property
    def pairs(self) -> int:
        """Adjacent point pairs with a hazard (the transition cubes of one input are disjoint)."""
        return sum(t.pairs() for t in self.transitions)


def changing_mask(table: Table, text: str | None) -> int:
    """Input bitmask from a comma-separated list of input names or bus names (``None``: every input).

    Raises
    ------
    PlaforgeError
        Naming the unknown names and what the spec offers (exit status 2).
    """
    if text is None:
        return (1 << table.n_inputs) - 1
    mask = 0
    unknown = []
    buses = {b.name: b.indices for b in table.input_buses}
    for word in (w.strip() for w in text.split(",")):
        if not word:
            continue
        if word in table.input_names:
            mask |= 1 << table.input_names.index(word)
        elif word in buses:
            for i in buses[word]:
                mask |= 1 << i
        else:
            unknown.append(word)
    if unknown or not mask:
        offered = ", ".join(b.name for b in table.input_buses)
        raise PlaforgeError(f"--changing: no input or bus named {', '.join(unknown) or '(none given)'}; "
                            f"the spec has {offered}")
    return mask


def _merge_adjacent(cubes: list[Cube]) -> list[Cube]:
    """The same point set in fewer cubes: contained cubes dropped, pairs with the same inputs tested and one opposite
    value joined; repeated until nothing changes. Deterministic (sorted)."""
    cur = set(cubes)
    changed = True
    while changed:
        changed = False
        by_care: dict[int, set[int]] = {}
        for c in cur:
            by_care.setdefault(c.care, set()).add(c.value)
        for care, values in sorted(by_care.items()):
            for v in sorted(values):
                if v not in values:
                    continue
                m = care
                while m:
                    low = m & -m
                    m ^= low
                    if v ^ low in values:
                        values.discard(v)
                        values.discard(v ^ low)
                        cur.discard(Cube(care, v, 1))
                        cur.discard(Cube(care, v ^ low, 1))
                        cur.add(Cube(care & ~low, v & ~low, 1))
                        changed = True
                        break
        kept = sorted(cur, key=lambda c: (c.literals, c.care, c.value))
        out: list[Cube] = []
        for c in kept:
            if not any(k.contains(c) for k in out):
                out.append(c)
        if len(out) != len(cur):
            changed = True
        cur = set(out)
    return sorted(cur, key=lambda c: (c.literals, c.care, c.value))


def output_hazards(must: Sequence[Cube], terms: Sequence[Cube], n: int, changing: int) -> list[Transition]:
    """Transition cubes of the adjacent pairs inside ``must`` (the points that stay 1) no cube of ``terms`` holds.

    ``must`` and ``terms`` are input parts only (outputs ignored).
    """
    must = [Cube(c.care, c.value, 1) for c in must]
    found: list[Transition] = []
    for i in range(n):
        bit = 1 << i
        if not changing & bit:
            continue
        low = [Cube(c.care & ~bit, c.value & ~bit, 1) for c in must if not c.value & bit]
        high = [Cube(c.care & ~bit, c.value & ~bit, 1) for c in must if not c.care & bit or c.value & bit]
        if not low or not high:
            continue
        # (low ∩ high) minus the holding terms, computed as (low minus holding) ∩ high: the sharp then works on
        # the few pieces no term holds rather than on every intersection
        holding = [Cube(t.care, t.value, 1) for t in terms if not t.care & bit]
        loose = sharp(sorted(set(low), key=lambda c: (c.care, c.value)), holding)
        left: set[Cube] = set()
        for a in loose:
            for b in high:
                x = a.intersect(b)
                if x is not None:
                    left.add(x)
        disjoint: list[Cube] = []
        for c in _merge_adjacent(list(left)):
            disjoint += sharp([c], disjoint)
        for c in _merge_adjacent(disjoint):
            found.append(Transition(i, c, n))
    return found


def find_hazards(table: Table, cover: Cover, changing: int | None = None, dc: bool = False) -> list[OutputHazards]:
    """Per output, the hazardous single-input changes of ``cover`` realizing ``table`` (see the module docs).

    Parameters
    ----------
    table : Table
        The function; its ON (OFF, for outputs realized in complement) set says which pairs must stay steady.
    cover : Cover
        A cover of ``table`` (checked elsewhere; a wrong cover gives meaningless hazards).
    changing : int, optional
        Bitmask of the inputs that may change (default: all).
    dc : bool
        Also judge pairs at don't-care points the cover sets (see the module docs).
    """
    n = table.n_inputs
    mask = (1 << n) - 1 if changing is None else changing
    out = []
    for j, name in enumerate(table.output_names):
        terms = cover.cubes_for(j)
        inverted = cover.is_inverted(j)
        must: Sequence[Cube] = terms if dc else (table.off_cubes(j) if inverted else table.on_cubes(j))
        trans = output_hazards(must, terms, n, mask)
        out.append(OutputHazards(j, name, "static-0" if inverted else "static-1", tuple(trans)))
    return out


def format_hazards(table: Table, hazards: Sequence[OutputHazards]) -> list[str]:
    """Plain-text lines: per output the hazard count, then one line per transition cube."""
    n = table.n_inputs
    lines = []
    for h in hazards:
        if not h.transitions:
            lines.append(f"  {h.name}: no {h.kind} hazard")
            continue
        lines.append(f"  {h.name}: {h.kind} hazards on {h.pairs} adjacent pairs, {len(h.transitions)} transition "
                     "cubes")
        for t in h.transitions:
            text = t.cube.text(n)
            text = text[:t.input] + "~" + text[t.input + 1:]
            lines.append(f"    {table.input_names[t.input]} changes, others {text}")
    return lines
