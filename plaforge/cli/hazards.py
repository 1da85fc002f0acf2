"""``plaforge hazards``: static hazards of a cover for single-input changes, output by output."""

from __future__ import annotations

import click

from .group import cli


@cli.command("hazards")
@click.argument("spec", type=click.Path())
@click.argument("cover", type=click.Path(), required=False)
@click.option("--changing", help="Only these inputs or buses change (comma-separated names); default: all inputs.")
@click.option("--dc", is_flag=True, help="Also judge pairs at don't-care points the cover sets to 1.")
@click.option("--fail", is_flag=True, help="Exit with status 1 when any output has a hazard.")
def hazards_cmd(spec: str, cover: str | None, changing: str | None, dc: bool, fail: bool) -> None:
    """List the static hazards of COVER (a .pla; default: the cover plaforge minimize makes) realizing SPEC.

    A hazard is a pair of adjacent points (one input changes) where the output stays 1 but no single product term
    holds both; each line is a cube of such pairs: the changing input marked ~, the others as in PLA.
    """
    from ..checking import prove
    from ..core.errors import CheckFailed
    from ..formats import read_spec
    from ..formats.pla import read_cover
    from ..minimize import minimize
    from ..verify.hazards import changing_mask, find_hazards, format_hazards

    table = read_spec(spec)
    mask = changing_mask(table, changing)
    if cover is None:
        cov = minimize(table)
        where = "the minimized cover"
    else:
        cov = read_cover(cover)
        verdict = prove(table, cov, name=cover)
        if not verdict.passed:
            raise CheckFailed(f"{cover} does not realize {spec}; check it with: plaforge check {spec} {cover}")
        where = cover
    found = find_hazards(table, cov, mask, dc=dc)
    scope = "points the cover sets" if dc else "care points"
    click.echo(f"{where}: static hazards for single-input changes between {scope}")
    for line in format_hazards(table, found):
        click.echo(line)
    if fail and any(h.transitions for h in found):
        raise CheckFailed(f"{sum(1 for h in found if h.transitions)} outputs have static hazards")
