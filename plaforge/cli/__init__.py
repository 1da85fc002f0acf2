"""Command line: one thin click module per command (parse, call the public API, print).

Every user-caused error is a :class:`plaforge.core.errors.PlaforgeError`, printed in one place (:mod:`.group`) as
one line on stderr with its exit status; see docs/conventions.md for the statuses.
"""

from . import commands as _commands  # noqa: F401  (importing registers every command on the group)
from .group import cli, main

__all__ = ["cli", "main"]
