"""``plaforge demo``: a bundled sample through every stage that exists."""

from __future__ import annotations

import click

from ..formats import read_spec
from ..report import table_summary
from ..samples import sample_path
from . import cli


@cli.command("demo")
@click.option("-o", "--output", "out", type=click.Path(file_okay=False), default="plaforge-demo", show_default=True,
              help="Directory for the artifacts.")
def demo_cmd(out: str) -> None:
    """Run the bundled memory-map sample through plaforge and show each result."""
    path = sample_path("memory_map.toml")
    table = read_spec(path)
    click.echo(table_summary(table))
