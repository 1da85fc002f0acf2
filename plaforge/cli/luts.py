"""``plaforge luts``: k-input LUT INIT vectors and LUT networks."""

from __future__ import annotations

import click

from . import cli, not_built


@cli.command("luts")
@click.argument("spec", type=click.Path(dir_okay=False))
@click.option("-k", "k", type=click.IntRange(2, 8), default=6, show_default=True, help="LUT input count.")
@click.option("-o", "--output", "out", type=click.Path(dir_okay=False), help="Write the LUT network JSON here.")
@click.option("--json", "as_json", is_flag=True, help="Print the LUT network JSON object and nothing else.")
def luts_cmd(spec: str, k: int, out: str | None, as_json: bool) -> None:
    """Map SPEC onto k-input LUTs and list each LUT's fan-ins and INIT."""
    not_built("LUT mapping")
