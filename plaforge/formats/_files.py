"""Reading spec files from disk with one-line errors."""

from __future__ import annotations

import os

from ..core.errors import SpecError

__all__ = ["read_text"]


def read_text(path: str | os.PathLike[str]) -> str:
    """The file as UTF-8 text; every failure becomes a :class:`SpecError` naming the file."""
    try:
        with open(path, encoding="utf-8") as fh:
            return fh.read()
    except FileNotFoundError:
        raise SpecError(path, None, "no such file") from None
    except IsADirectoryError:
        raise SpecError(path, None, "is a directory, expected a file") from None
    except UnicodeDecodeError as exc:
        raise SpecError(path, None, f"not UTF-8 text (byte {exc.start}); expected a text file") from None
    except OSError as exc:
        raise SpecError(path, None, f"cannot read: {exc.strerror}") from None
