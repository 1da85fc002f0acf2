"""``plaforge demo``: a bundled sample through every stage."""

from __future__ import annotations

import click

from ..bundled import sample_path
from ..core.errors import CheckFailed
from ..flow import BuildOptions, build
from ..formats import read_spec
from ..report import build_report, table_summary
from .group import cli

DEMO_SAMPLE = "memory_map.toml"


@cli.command("demo")
@click.option("-o", "--output", "out", type=click.Path(), default="plaforge-demo", show_default=True,
              help="Directory for the artifacts.")
def demo_cmd(out: str) -> None:
    """Take the bundled memory-map sample through minimization, LUT mapping, module and Verilog generation, and
    the checks, printing where each artifact is and whether each output passed."""
    path = sample_path(DEMO_SAMPLE)
    table = read_spec(path)
    click.echo(table_summary(table))
    click.echo("")
    result = build(table, out, BuildOptions(exact=True, time_limit=30.0), spec_path=path)
    click.echo(build_report(result))
    if not result.passed:
        raise CheckFailed("an artifact does not match the spec (see above)")
