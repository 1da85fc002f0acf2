"""Numbers and bit patterns as the CSV and design readers write them: one reading for both formats."""

from __future__ import annotations

__all__ = ["parse_int", "pattern"]


def parse_int(s: str) -> int | None:
    """A number written in decimal, ``0x`` hex or ``0b`` binary (underscores allowed), else ``None``."""
    t = s.strip().lower().replace("_", "")
    try:
        if t.startswith(("0x", "0b")):
            return int(t, 0)
        if t.isdigit():
            return int(t, 10)
    except ValueError:
        return None
    return None


def pattern(s: str, width: int) -> tuple[int, int] | None:
    """``(care, value)`` over ``width`` bits for ``0b..``/``0x..`` text with don't-care digits, else ``None``.

    Bits to the left of the written digits are 0, as for a number: ``"0b1x"`` over 3 bits is ``01x``, not ``x1x``.
    Free digits beyond ``width`` are dropped; fixed ones stay in ``value`` so the caller can say it does not fit.
    """
    t = s.strip().lower().replace("_", "")
    if t.startswith("0b"):
        digits, per = t[2:], 1
        ok = set("01x-")
    elif t.startswith("0x"):
        digits, per = t[2:], 4
        ok = set("0123456789abcdefx-")
    else:
        return None
    if not digits or set(digits) - ok or not set(digits) & set("x-"):
        return None
    care = value = 0
    for ch in digits:
        care <<= per
        value <<= per
        if ch not in "x-":
            care |= (1 << per) - 1
            value |= int(ch, 16)
    top = (1 << width) - 1
    written = (1 << len(digits) * per) - 1
    return (care | ~written) & top, value
