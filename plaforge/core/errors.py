"""User-facing errors and the exit statuses they carry.

Two tiers, as in click: everything a *user* can cause (a malformed spec file, a bad option, a result that does not
fit, work that outgrows a limit) is a :class:`PlaforgeError` carrying ``exit_code`` and printed in one place by the
CLI as a single line. Programmer errors stay ``TypeError``/``ValueError``; anything else that escapes is reported by
the CLI as an internal error.

Exit statuses (docs/conventions.md):

===  ==========================================================================================
0    success
1    a check failed, or a result does not fit a stated budget (:class:`CheckFailed`)
2    bad input or usage (:class:`PlaforgeError`, :class:`SpecError`, :class:`ArtifactError`)
3    the work could not finish within its time or size limit; the message names the option that
     raises the limit (:class:`LimitReached` and its subclasses)
4    internal error, please report (:class:`InternalError`, and any unexpected exception)
===  ==========================================================================================
"""

from __future__ import annotations

import os

__all__ = [
    "EXIT_BAD_INPUT",
    "EXIT_CHECK_FAILED",
    "EXIT_INTERNAL",
    "EXIT_LIMIT",
    "EXIT_OK",
    "ArtifactError",
    "CheckFailed",
    "EnumerationLimit",
    "InternalError",
    "LimitReached",
    "PlaforgeError",
    "SizeLimit",
    "SpecError",
    "TimeLimit",
]

EXIT_OK = 0
EXIT_CHECK_FAILED = 1
EXIT_BAD_INPUT = 2
EXIT_LIMIT = 3
EXIT_INTERNAL = 4


class PlaforgeError(Exception):
    """Base of every error a user can cause; ``exit_code`` is what the CLI exits with (2: bad input or usage)."""

    exit_code: int = EXIT_BAD_INPUT

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

    exit_code = EXIT_BAD_INPUT

    def __init__(
        self, path: str | os.PathLike[str] | None, line: int | None, message: str, col: int | None = None
    ) -> None:
        self.path = None if path is None else os.fspath(path)
        self.line = line
        self.col = col
        where = self.path if self.path is not None else "<input>"
        if line is not None:
            where += f":{line}"
            if col is not None:
                where += f":{col}"
        super().__init__(f"{where}: {message}")


class ArtifactError(PlaforgeError):
    """An artifact given to a check cannot be judged: unreadable, malformed, or its ports do not match the spec.

    This is bad input (exit 2), not a failed check: a failed check means the artifact was evaluated and computes a
    different function.
    """

    exit_code = EXIT_BAD_INPUT


class CheckFailed(PlaforgeError):
    """An artifact does not match its Table, or a result does not fit a budget (exit 1)."""

    exit_code = EXIT_CHECK_FAILED


class LimitReached(PlaforgeError):
    """The work could not finish within a time or size limit (exit 3).

    Parameters
    ----------
    message : str
        What could not finish and why.
    option : str or None
        The command-line option that raises the limit (``"--time-limit"``); appended to the message as
        ``"; raise it with --time-limit"`` unless the message already names it.
    """

    exit_code = EXIT_LIMIT

    def __init__(self, message: str, option: str | None = None) -> None:
        self.option = option
        if option is not None and option not in message:
            message = f"{message}; raise it with {option}"
        super().__init__(message)


class TimeLimit(LimitReached):
    """A time limit ran out before the work finished."""


class EnumerationLimit(LimitReached):
    """An operation needs to enumerate 2^n points and n is above the enumeration limit."""


class SizeLimit(LimitReached):
    """An intermediate result (cubes, pieces, outputs, memory) outgrew a size limit."""


class InternalError(PlaforgeError):
    """A bug in plaforge or in a library it calls (a crashed or wrong minimizer, a wrong mapping): exit 4.

    The CLI prints ``internal error, please report: ...``; nothing here is the user's fault.
    """

    exit_code = EXIT_INTERNAL
