"""User-facing errors.

Two tiers, as in click: everything a *user* can cause (a malformed spec file, a bad option, a result that does not
fit) is a :class:`PlaforgeError` carrying an exit status and printed in one place by the CLI as a single line.
Programmer errors stay ``TypeError``/``ValueError`` and are bugs.

Exit statuses (DESIGN.md contract): 0 success, 1 a check failed or a result does not fit a budget, 2 bad input or
usage.
"""

from __future__ import annotations

import os

__all__ = ["CheckFailed", "PlaforgeError", "SolverFailure", "SpecError", "TooWide"]


class PlaforgeError(Exception):
    """Base of every error a user can cause; ``exit_code`` is what the CLI exits with."""

    exit_code: int = 2

    def __init__(self, message: str) -> None:
        super().__init__(message)
        self.message = message

    def __str__(self) -> str:
        return self.message


class SpecError(PlaforgeError):
    """A malformed input file: formatted ``FILE:LINE[:COL]: what is wrong, what was expected``.

    Parameters
    ----------
    path : str or os.PathLike or None
        The file; only its given path is shown.
    line : int or None
        1-based line number, when known.
    message : str
        What is wrong and what was expected.
    col : int or None
        1-based column, when known.
    """

    exit_code = 2

    def __init__(
        self, path: str | os.PathLike[str] | None, line: int | None, message: str, col: int | None = None
    ) -> None:
        self.path = None if path is None else os.fspath(path)
        self.line = line
        self.col = col
        self.detail = message
        where = self.path if self.path is not None else "<input>"
        if line is not None:
            where += f":{line}"
            if col is not None:
                where += f":{col}"
        super().__init__(f"{where}: {message}")


class TooWide(PlaforgeError):
    """An operation needs to enumerate 2^n points and n is above the enumeration limit."""

    exit_code = 2


class SolverFailure(PlaforgeError):
    """An external solver or minimizer crashed or gave an unusable answer."""

    exit_code = 2


class CheckFailed(PlaforgeError):
    """An artifact does not match its Table, or a result does not fit a budget."""

    exit_code = 1
