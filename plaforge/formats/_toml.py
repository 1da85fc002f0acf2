"""Finding where a TOML key sits in its source text, so design-file errors can name a line and column.

:mod:`tomllib` returns plain dicts without positions. This module scans the text once, notes which lines belong to
which table (``[name]``) or array-of-tables element (``[[name]]``, counted from 0), and then finds a key by a light
textual search inside those lines. It is a locator for messages only; :mod:`tomllib` does the parsing.
"""

from __future__ import annotations

import re
import tomllib
from dataclasses import dataclass, field
from typing import Any

from ..core.errors import SpecError

__all__ = ["Locator", "load_toml"]

_HEADER = re.compile(r"^\s*(\[\[?)\s*([^\]]+?)\s*\]\]?\s*(#.*)?$")
_TOML_POS = re.compile(r"\s*\(at line (\d+), column (\d+)\)\s*$")


def load_toml(text: str, path: str) -> dict[str, Any]:
    """Parse TOML, turning :class:`tomllib.TOMLDecodeError` into a :class:`SpecError` with its line and column."""
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        msg = str(exc)
        m = _TOML_POS.search(msg)
        line = col = None
        if m:
            line, col = int(m.group(1)), int(m.group(2))
            msg = msg[: m.start()]
        elif "end of document" in msg:
            line = max(1, text.count("\n") + (0 if text.endswith("\n") else 1))
            msg = msg.replace("(at end of document)", "").strip() + " at the end of the file"
        raise SpecError(path, line, f"not valid TOML: {msg}; check quotes, brackets and '=' signs", col) from None


@dataclass
class Locator:
    """Line lookup for keys of a TOML text (1-based lines and columns)."""

    text: str
    sections: dict[tuple[str, int], list[int]] = field(default_factory=dict)
    headers: dict[tuple[str, int], int] = field(default_factory=dict)

    def __post_init__(self) -> None:
        self.lines = self.text.splitlines()
        counts: dict[str, int] = {}
        current = ("", 0)
        self.sections[current] = []
        for no, line in enumerate(self.lines, 1):
            m = _HEADER.match(line)
            if m and not line.lstrip().startswith("#"):
                name = m.group(2).strip().strip('"')
                if m.group(1) == "[[":
                    idx = counts.get(name, -1) + 1
                    counts[name] = idx
                else:
                    idx = 0
                current = (name, idx)
                self.headers[current] = no
                self.sections.setdefault(current, [])
                continue
            self.sections[current].append(no)

    def header(self, section: str, index: int = 0) -> int | None:
        """Line of the ``[section]`` / ``[[section]]`` header (the ``index``-th one for arrays)."""
        return self.headers.get((section, index))

    def key(self, section: str, index: int, key: str, after: str | None = None) -> tuple[int | None, int | None]:
        """Line and column of ``key =`` inside a section, optionally at or after the line of key ``after``.

        Falls back to the section header (column ``None``), then to ``(None, None)``.
        """
        lines = self.sections.get((section, index), [])
        pat = re.compile(r"(^|[\s{,])(\"?)" + re.escape(key) + r"\2\s*=")
        start_line, start_col = None, 0
        if after is not None:
            ln, col = self.key(section, index, after)
            if ln is not None and col is not None:
                start_line, start_col = ln, col
        for no in lines:
            if start_line is not None and no < start_line:
                continue
            text = self.lines[no - 1]
            code = text.split("#", 1)[0] if '"' not in text and "'" not in text else text
            m = pat.search(code, start_col if no == start_line else 0)
            if m:
                return no, m.start(2) + 1
        if start_line is not None:
            return start_line, start_col or None
        return self.header(section, index), None

    def find_text(self, needle: str) -> tuple[int | None, int | None]:
        """First line and column where ``needle`` occurs verbatim."""
        if not needle:
            return None, None
        pos = self.text.find(needle)
        if pos < 0:
            return None, None
        line = self.text.count("\n", 0, pos) + 1
        col = pos - (self.text.rfind("\n", 0, pos) + 1) + 1
        return line, col
