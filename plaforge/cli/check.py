"""``plaforge check``: verify an artifact against its source table, output by output."""

from __future__ import annotations

import click

from ..core.errors import CheckFailed
from .group import cli


@cli.command("check")
@click.argument("spec", type=click.Path())
@click.argument("artifact", type=click.Path())
@click.option("--exhaustive-limit", type=click.IntRange(0, 24), default=16, show_default=True,
              help="Simulate every input point of a module up to this many inputs.")
@click.option("--simulate", is_flag=True,
              help="Also simulate above the limit (sampled vectors), and Verilog with iverilog where installed.")
@click.option("--samples", type=click.IntRange(0), default=4096, show_default=True,
              help="Random vectors (after the corner cases) when simulating above the limit.")
@click.option("--seed", type=int, default=1, show_default=True, help="Seed of the random vectors.")
def check_cmd(spec: str, artifact: str, exhaustive_limit: int, simulate: bool, samples: int, seed: int) -> None:
    """Check ARTIFACT (.pla cover, LUT .json, generated module .py or Verilog .v) against SPEC, output by output.

    Every verdict is a proof; simulation adds witnesses. Exit status 0 when every output passes, 1 when one fails,
    2 on bad input.
    """
    from ..checking import check_artifact
    from ..formats import read_spec
    from ..verify.report import format_verdict

    table = read_spec(spec)
    verdict = check_artifact(table, artifact, exhaustive_limit=exhaustive_limit, samples=samples, seed=seed,
                             simulate=simulate)
    click.echo(format_verdict(verdict, table))
    if not verdict.passed:
        failed = sum(not o.passed for o in verdict.outputs)
        raise CheckFailed(f"{artifact}: {failed} of {len(verdict.outputs)} outputs do not match {spec}")
