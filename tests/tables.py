"""Tables several test files build (tests only)."""

from __future__ import annotations

from plaforge.core.table import Table


def adder(w: int) -> Table:
    """``s = a + b`` for w-bit ``a`` (inputs ``a[0..w-1]``, input 0 its lowest bit) and ``b`` (the next w inputs),
    w+1 sum bits ``s[0..w]``: evaluate point ``p`` and compare with ``(p & (2**w - 1)) + (p >> w)``."""
    names = [f"a[{i}]" for i in range(w)] + [f"b[{i}]" for i in range(w)]

    def fn(p):
        s = (p & ((1 << w) - 1)) + (p >> w)
        return [(s >> i & 1).astype(bool) for i in range(w + 1)]

    return Table.from_function(names, [f"s[{i}]" for i in range(w + 1)], fn)
