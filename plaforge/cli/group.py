"""The command group: thin click commands that parse, call the public API and print.

Every user-caused error is a :class:`plaforge.core.errors.PlaforgeError`; it is printed here, in one place, as one
line on stderr, and the process exits with its status (docs/conventions.md). Any other exception is a bug: it is
printed as one ``internal error, please report`` line with status 4 (set ``PLAFORGE_TRACEBACK=1`` to see the
traceback instead). No traceback reaches a user for bad input.
"""

from __future__ import annotations

import os
from typing import Any

import click

from ..core.errors import EXIT_INTERNAL, InternalError, PlaforgeError

__all__ = ["cli", "main"]


class _Group(click.Group):
    def invoke(self, ctx: click.Context) -> Any:
        try:
            return super().invoke(ctx)
        except click.exceptions.Exit:
            raise
        except click.ClickException:
            raise
        except click.exceptions.Abort:
            raise
        except InternalError as exc:
            click.echo(f"plaforge: internal error, please report: {exc}", err=True)
            ctx.exit(EXIT_INTERNAL)
        except PlaforgeError as exc:
            click.echo(f"plaforge: {exc}", err=True)
            ctx.exit(exc.exit_code)
        except KeyboardInterrupt:
            click.echo("plaforge: interrupted", err=True)
            ctx.exit(130)
        except Exception as exc:  # a bug: one line, its own status, never a failed check
            if os.environ.get("PLAFORGE_TRACEBACK"):
                raise
            click.echo(f"plaforge: internal error, please report: {type(exc).__name__}: {exc}", err=True)
            ctx.exit(EXIT_INTERNAL)


@click.group(cls=_Group, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(package_name="plaforge")
def cli() -> None:
    """Turn truth tables into minimized PLA covers, k-LUT INIT vectors and Amaranth modules, each checked
    against the source table.

    SPEC is a .pla, .csv or .toml file, chosen by its extension. Exit status: 0 success, 1 a check failed or a
    result does not fit a budget, 2 bad input or usage, 3 a time or size limit was reached (the message names
    the option that raises it), 4 internal error.
    """


def jobs_option(verb: str) -> Any:
    """The ``-j/--jobs`` option of every command that takes several specs; ``verb`` says what a worker does to a
    spec ("builds", "minimizes", "maps")."""
    return click.option("-j", "--jobs", "jobs", type=click.IntRange(min=1), default=None,
                        help=f"Worker processes for several specs [default: the machine's core count]; 1 {verb} them "
                        "one after another in this process.")


def main(argv: list[str] | None = None) -> None:
    cli.main(args=argv, prog_name="plaforge")

