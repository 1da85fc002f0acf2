"""Spec readers (chosen by file extension) and the PLA writer.

``read_spec(path)`` returns a :class:`plaforge.table.Table`; every malformed file raises
:class:`plaforge.core.errors.SpecError` with ``FILE:LINE[:COL]: what is wrong, what was expected``.

The readers ``parse_pla``, ``parse_csv`` and ``parse_design`` (and ``parse_cover`` for a PLA cover) all take
``(text, path)``: ``text`` is the file contents and ``path`` the file name, used in every message and, as its base
name, for the table's ``source``. ``read_pla``, ``read_csv`` and ``read_cover`` take a path and read the file first;
a file that cannot be read (missing, a directory, not UTF-8) is a :class:`SpecError` too.
"""

from __future__ import annotations

import os
from pathlib import Path

from ..core.errors import SpecError
from ..core.table import Table
from ._files import read_text

__all__ = ["READERS", "read_spec"]

READERS = {".pla": "pla", ".csv": "csv", ".toml": "design"}


def read_spec(path: str | os.PathLike[str]) -> Table:
    """Read a ``.pla``, ``.csv`` or ``.toml`` spec file into a Table."""
    p = Path(path)
    if p.is_dir():
        raise SpecError(p, None, "is a directory; expected a spec file (.pla, .csv or .toml)")
    kind = READERS.get(p.suffix.lower())
    if kind is None:
        raise SpecError(p, None, f"unknown spec extension {p.suffix!r}; expected one of .pla, .csv, .toml")
    text = read_text(p)
    if kind == "pla":
        from .pla import parse_pla

        return parse_pla(text, str(path))
    if kind == "csv":
        from .csv import parse_csv

        return parse_csv(text, str(path))
    from .design import parse_design

    return parse_design(text, str(path))
