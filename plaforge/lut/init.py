"""INIT vectors: building, padding, reducing and formatting them.

Vocabulary
----------
INIT (common practice)
    For a LUT with ordered fan-ins ``i0 .. i(m-1)``, bit ``p`` of the INIT integer is the LUT output when the fan-in
    values read as a binary number with ``i0`` as the least significant bit equal ``p``. It holds ``2**m`` bits.
padding
    A LUT that uses ``m`` fan-ins placed in a physical ``k``-input LUT (``k >= m``) whose upper ``k - m`` pins are
    unused: the ``2**m``-bit INIT repeats ``2**(k-m)`` times, so a 2-input AND (``0x8``) in a 4-input LUT is
    ``0x8888``.

Every function here is pure integer arithmetic on INIT values (no tables, no enumeration beyond ``2**m`` bits).
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Literal

__all__ = [
    "INIT_STYLES",
    "InitStyle",
    "depends_on",
    "drop_unused_inputs",
    "format_init",
    "pad_init",
    "select_inputs",
]

InitStyle = Literal["verilog", "python", "bits"]
INIT_STYLES: tuple[str, ...] = ("verilog", "python", "bits")


def _check_width(init: int, n_inputs: int) -> None:
    if not isinstance(init, int) or not isinstance(n_inputs, int):
        raise TypeError(f"INIT and input count must be ints, not {init!r} and {n_inputs!r}")
    if n_inputs < 0:
        raise ValueError(f"input count must be non-negative, not {n_inputs!r}")
    if init < 0 or init >> (1 << n_inputs):
        raise ValueError(f"INIT {init:#x} does not fit a {n_inputs}-input LUT ({1 << n_inputs} bits)")


def format_init(init: int, n_inputs: int, style: InitStyle | str = "verilog") -> str:
    """An INIT as text to paste into a design.

    Parameters
    ----------
    init : int
        The INIT integer (see module docs for the bit order).
    n_inputs : int
        Fan-in count ``m``; the INIT has ``2**m`` bits.
    style : {"verilog", "python", "bits"}
        ``verilog``: sized hex literal ``<2**m>'h<hex>``; ``python``: ``0x<hex>`` integer literal; ``bits``: the
        ``2**m`` bits, most significant (bit ``2**m - 1``) first. Hex has ``ceil(2**m / 4)`` digits, upper case.

    Returns
    -------
    str

    Raises
    ------
    ValueError
        If ``init`` does not fit ``n_inputs`` or ``style`` is unknown.

    Examples
    --------
    >>> format_init(0x8888, 4), format_init(0x8888, 4, "python"), format_init(0x8, 2, "bits")
    ("16'h8888", '0x8888', '1000')
    """
    _check_width(init, n_inputs)
    size = 1 << n_inputs
    digits = max(1, (size + 3) // 4)
    if style == "verilog":
        return f"{size}'h{init:0{digits}X}"
    if style == "python":
        return f"0x{init:0{digits}X}"
    if style == "bits":
        return f"{init:0{size}b}"
    raise ValueError(f"INIT style must be one of {', '.join(INIT_STYLES)}, not {style!r}")


def pad_init(init: int, used: int, k: int) -> int:
    """INIT of a ``used``-input function placed on the low ``used`` pins of a ``k``-input LUT.

    The upper ``k - used`` pins are don't-cares of the function, so the ``2**used`` bits repeat ``2**(k - used)``
    times. Cost: ``k - used`` shifts.

    >>> hex(pad_init(0x8, 2, 4)), hex(pad_init(0x1, 0, 6))
    ('0x8888', '0xffffffffffffffff')
    """
    _check_width(init, used)
    if k < used:
        raise ValueError(f"cannot pad a {used}-input INIT into a {k}-input LUT; k must be at least {used}")
    width = 1 << used
    while width < (1 << k):
        init |= init << width
        width <<= 1
    return init


def select_inputs(init: int, order: Sequence[int]) -> int:
    """INIT over the fan-ins ``order`` (new fan-in ``b`` is old fan-in ``order[b]``; old fan-ins left out are 0)."""
    out = 0
    for q in range(1 << len(order)):
        p = 0
        for b, old in enumerate(order):
            if q >> b & 1:
                p |= 1 << old
        if init >> p & 1:
            out |= 1 << q
    return out


def depends_on(init: int, n_inputs: int, b: int) -> bool:
    """Whether the LUT output changes with fan-in ``b`` for some setting of the others."""
    for p in range(1 << n_inputs):
        if not p >> b & 1 and (init >> p & 1) != (init >> (p | 1 << b) & 1):
            return True
    return False


def drop_unused_inputs(init: int, n_inputs: int) -> tuple[int, tuple[int, ...]]:
    """Remove fan-ins the INIT does not depend on.

    Returns
    -------
    (int, tuple of int)
        The reduced INIT and the kept old fan-in positions in order.
    """
    keep = tuple(b for b in range(n_inputs) if depends_on(init, n_inputs, b))
    return select_inputs(init, keep), keep
