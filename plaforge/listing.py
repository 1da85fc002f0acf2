"""Equations a person can read: each output as a sum of products in the spec's names.

The listing syntax is plaforge's own (docs/report.md):

* a literal is one input bit by its spec name (``page[7]``, ``rd``); ``~`` before it means the bit is 0;
* ``&`` joins the literals of a product term, inputs in the spec's port order, each bus high bit first;
* an output is its terms joined by ``|`` (one term per line after the first); ``0`` when no term feeds it;
* ``~name = ...`` says the cover realizes the output inverted: the terms give its complement;
* a comment line ``# name: N terms; depends on ...`` before each equation names the support as bit ranges.

Bit ranges (:func:`bit_ranges`) write consecutive bits of one bus as ``addr[15:12]``, high bit first.
"""

from __future__ import annotations

import re
from collections.abc import Sequence

from .core.cube import Cover, Cube
from .core.table import Table

__all__ = ["bit_ranges", "equations", "listing_text", "plural", "term_text"]

_BIT = re.compile(r"^(.*)\[(\d+)\]$")


def plural(n: int, word: str, many: str | None = None) -> str:
    """``1 term``, ``2 terms`` (``many`` when the plural is not ``word + "s"``)."""
    return f"{n} {word if n == 1 else many or word + 's'}"


def bit_ranges(names: Sequence[str]) -> list[str]:
    """Names of single bits grouped into ranges: runs of consecutive bits of one bus become ``bus[HI:LO]``.

    Order is kept by the first appearance of each bus; inside a bus the bits go high first.

    >>> bit_ranges(["addr[4]", "addr[5]", "addr[6]", "addr[15]", "rw", "addr[0]"])
    ['addr[15]', 'addr[6:4]', 'addr[0]', 'rw']
    """
    buses: dict[str, list[int]] = {}
    order: list[tuple[str, bool]] = []
    for n in names:
        m = _BIT.match(n)
        if m:
            if m.group(1) not in buses:
                buses[m.group(1)] = []
                order.append((m.group(1), True))
            buses[m.group(1)].append(int(m.group(2)))
        else:
            order.append((n, False))
    out = []
    for name, is_bus in order:
        if not is_bus:
            out.append(name)
            continue
        bits = sorted(set(buses[name]), reverse=True)
        run = [bits[0]]
        for b in bits[1:] + [None]:  # type: ignore[list-item]
            if b is not None and b == run[-1] - 1:
                run.append(b)
                continue
            out.append(f"{name}[{run[0]}]" if len(run) == 1 else f"{name}[{run[0]}:{run[-1]}]")
            if b is not None:
                run = [b]
    return out


def _reading_order(table: Table) -> list[int]:
    """Input indices in the spec's port order, each bus high bit first."""
    return [i for bus in table.input_buses for i in reversed(bus.indices)]


def term_text(table: Table, cube: Cube, order: Sequence[int] | None = None) -> str:
    """One product term: its literals joined by ``&`` (``1`` for the term with no literal)."""
    order = _reading_order(table) if order is None else order
    names = table.input_names
    lits = [names[i] if cube.value >> i & 1 else f"~{names[i]}" for i in order if cube.care >> i & 1]
    return " & ".join(lits) if lits else "1"


def equations(table: Table, cover: Cover) -> list[tuple[str, list[str]]]:
    """Per output, in output order: (output name, its lines: comment, then the equation)."""
    order = _reading_order(table)
    out = []
    for j, name in enumerate(cover.output_names):
        cubes = cover.cubes_for(j)
        used = 0
        for c in cubes:
            used |= c.care
        support = [table.input_names[i] for i in order if used >> i & 1]
        dep = ", ".join(bit_ranges(support)) or "no input"
        inv = cover.is_inverted(j)
        note = "; realized inverted" if inv else ""
        lines = [f"# {name}: {plural(len(cubes), 'term')}; depends on {dep}{note}"]
        lhs = f"{'~' if inv else ''}{name} = "
        if not cubes:
            lines.append(f"{lhs}0")
        else:
            terms = [term_text(table, c, order) for c in cubes]
            lines.append(lhs + terms[0])
            lines += [" " * (len(lhs) - 2) + "| " + t for t in terms[1:]]
        out.append((name, lines))
    return out


def listing_text(table: Table, cover: Cover, title: str = "") -> str:
    """The whole listing: an optional title comment, then every output's equation, a blank line between."""
    parts = [f"# {title}"] if title else []
    for _name, lines in equations(table, cover):
        parts.append("\n".join(lines))
    return "\n\n".join(parts) + "\n"
