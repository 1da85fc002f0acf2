"""``plaforge build``: every artifact for a spec in one directory."""

from __future__ import annotations

import click

from . import cli, not_built


@cli.command("build")
@click.argument("spec", type=click.Path(dir_okay=False))
@click.option("-o", "--output", "out", type=click.Path(file_okay=False), default="build", show_default=True,
              help="Directory for the artifacts.")
@click.option("-k", "k", type=click.IntRange(2, 8), default=6, show_default=True, help="LUT input count.")
@click.option("--exact", is_flag=True, help="Prove a minimum cover instead of the fast heuristic.")
@click.option("--cost", type=click.Choice(["shared", "per-output"]), default="shared", show_default=True)
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object and nothing else.")
def build_cmd(spec: str, out: str, k: int, exact: bool, cost: str, as_json: bool) -> None:
    """Minimize SPEC, map it to LUTs, generate the module and check everything."""
    not_built("the build flow")
