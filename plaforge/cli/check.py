"""``plaforge check``: verify an artifact against its source table."""

from __future__ import annotations

import click

from . import cli, not_built


@cli.command("check")
@click.argument("spec", type=click.Path(dir_okay=False))
@click.argument("artifact", type=click.Path(dir_okay=False))
def check_cmd(spec: str, artifact: str) -> None:
    """Check ARTIFACT (.pla cover, LUT .json or generated module .py) against SPEC, output by output."""
    not_built("artifact checking")
