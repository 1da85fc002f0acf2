"""``plaforge inspect``: what a spec file says, before any synthesis."""

from __future__ import annotations

import click

from ..formats import read_spec
from ..report import table_summary
from .group import cli


@cli.command("inspect")
@click.argument("spec", type=click.Path())
def inspect_cmd(spec: str) -> None:
    """Read SPEC and print its ports, each output's support and its ON/DC/OFF sizes."""
    click.echo(table_summary(read_spec(spec)))
