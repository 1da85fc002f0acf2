"""``plaforge module``: a generated Amaranth component (and Verilog)."""

from __future__ import annotations

import click

from . import cli, not_built


@cli.command("module")
@click.argument("spec", type=click.Path(dir_okay=False))
@click.option("-o", "--output", "out", type=click.Path(dir_okay=False), help="Write the Amaranth module here.")
@click.option("--verilog", "verilog", type=click.Path(dir_okay=False), help="Also write Verilog here.")
@click.option("--style", type=click.Choice(["sop", "lut"]), default="sop", show_default=True,
              help="sop: shared product terms; lut: one constant per LUT.")
@click.option("-k", "k", type=click.IntRange(2, 8), default=6, show_default=True, help="LUT size for --style lut.")
def module_cmd(spec: str, out: str | None, verilog: str | None, style: str, k: int) -> None:
    """Generate an Amaranth component implementing SPEC."""
    not_built("module generation")
