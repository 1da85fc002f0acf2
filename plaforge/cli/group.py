"""The command group: thin click commands that parse, call the public API and print.

Every user-caused error is a :class:`plaforge.errors.PlaforgeError`; it is printed here, in one place, as one line
on stderr, and the process exits with its status (2 bad input or usage, 1 a failed check). No traceback reaches a
user for bad input.
"""

from __future__ import annotations

from typing import Any

import click

from ..core.errors import PlaforgeError

__all__ = ["cli", "main"]


class _Group(click.Group):
    def invoke(self, ctx: click.Context) -> Any:
        try:
            return super().invoke(ctx)
        except PlaforgeError as exc:
            click.echo(f"plaforge: {exc}", err=True)
            ctx.exit(exc.exit_code)
        except KeyboardInterrupt:
            click.echo("plaforge: interrupted", err=True)
            ctx.exit(130)


@click.group(cls=_Group, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(package_name="plaforge")
def cli() -> None:
    """Turn truth tables into minimized PLA covers, k-LUT INIT vectors and Amaranth modules, each checked
    against the source table.

    SPEC is a .pla, .csv or .toml file, chosen by its extension. Exit status: 0 success, 1 a check failed or a
    result does not fit a budget, 2 bad input or usage.
    """


def main(argv: list[str] | None = None) -> None:
    cli.main(args=argv, prog_name="plaforge")

