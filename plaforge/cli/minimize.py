"""``plaforge minimize``: a jointly minimized two-level cover in PLA format."""

from __future__ import annotations

import json
import sys

import click

from .group import cli


@cli.command("minimize")
@click.argument("spec", type=click.Path())
@click.option("-o", "--output", "out", type=click.Path(), help="Write the PLA cover here.")
@click.option("--exact", is_flag=True, help="Prove a minimum cover (CP-SAT) instead of the fast heuristic.")
@click.option("--time-limit", type=click.FloatRange(min=0.1), default=60.0, show_default=True,
              help="Seconds the whole minimization may spend; past it the exact path reports its best cover and "
              "lower bound. Not given: the heuristic allows at least (inputs + outputs) x rows / 500 s.")
@click.option("--memory-limit", type=click.IntRange(min=1), default=2048, show_default=True,
              help="Megabytes the exact path may plan for its primes and covering problem.")
@click.option("--cost", type=click.Choice(["shared", "per-output"]), default="shared", show_default=True,
              help="shared: count distinct product terms; per-output: count terms per output (no sharing).")
@click.option("--effort", type=click.Choice(["fast", "normal", "high"]), default="normal", show_default=True,
              help="Heuristic: fast = one run; normal = more starts and descents within a budget relative to the "
              "first run; high = all of them, descents repeated while they help.")
@click.option("--phase", is_flag=True, help="Choose each output's polarity to lower the cost (inverted outputs).")
@click.option("--hazard-free", "hazard_free", type=click.Choice(["care", "all"]), is_flag=False, flag_value="care",
              default=None, help="Cover every adjacent pair of ON points by one term (no static hazard for "
              "single-input changes); =all also makes the don't-cares ON.")
@click.option("--changing", help="With --hazard-free: only these inputs or buses change (comma-separated names).")
@click.option("--listing", is_flag=True, help="Also print each output's equation (sum of products in the spec's "
              "names; docs/report.md).")
@click.option("--device", "device", help="Say whether the cover fits a device profile (a built-in name or a .toml "
              "file); exit 1 when it does not.")
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object with the figures and nothing else.")
def minimize_cmd(spec: str, out: str | None, exact: bool, time_limit: float, memory_limit: int, cost: str,
                 effort: str, phase: bool, hazard_free: str | None, changing: str | None, listing: bool, device: str | None,
                 as_json: bool) -> None:
    """Minimize SPEC jointly over all outputs and write the cover in PLA format."""
    from ..core.fileio import refuse_clobbering, write_text_atomic
    from ..formats import read_spec
    from ..formats.pla import write_pla
    from ..minimize import MinimizeOptions, cover_summary, format_summary, minimize

    from ..core.errors import CheckFailed, PlaforgeError
    from ..device import fit, fit_lines, load_profile

    if as_json and (listing or device):
        raise PlaforgeError("--json prints the figures only; leave out --listing and --device with it")
    refuse_clobbering([("SPEC", spec)], [("-o", out)])
    profile = load_profile(device) if device is not None else None
    table = read_spec(spec)
    phase = phase or (profile is not None and profile.polarity)
    given = click.get_current_context().get_parameter_source("time_limit") is not click.core.ParameterSource.DEFAULT
    options = MinimizeOptions(exact=exact, time_limit=time_limit, cost=cost,  # type: ignore[arg-type]
                              phase=phase, progress=not as_json and sys.stderr.isatty(), memory_limit=memory_limit,
                              effort=effort, scale_time_limit=not given)  # type: ignore[arg-type]
    cover = minimize(table, options)
    added = []
    if hazard_free is not None:
        from ..minimize.hazards import added_terms, hazard_free_cover
        from ..verify.hazards import changing_mask

        ordinary = cover
        cover = hazard_free_cover(table, cover, scope=hazard_free, changing=changing_mask(table, changing),
                                  options=options)
        added = added_terms(ordinary, cover)
    if out is not None:
        write_text_atomic(out, write_pla(cover, spec))
    if as_json:
        click.echo(json.dumps(cover_summary(cover)))
    else:
        click.echo(format_summary(cover))
        if hazard_free is not None:
            click.echo(f"hazard-free ({hazard_free}): {len(added)} terms added for static hazards" + (":" if added else ""))
            m = cover.n_outputs
            for c in added:
                click.echo(f"  {c.text(cover.n_inputs)} {''.join('1' if c.outputs >> j & 1 else '0' for j in range(m))}")
        if out is not None:
            click.echo(f"cover written to {out}")
        if listing:
            from ..listing import listing_text

            click.echo("")
            click.echo(listing_text(table, cover), nl=False)
        if profile is not None:
            result = fit(profile, table, cover, None)
            click.echo("")
            click.echo("\n".join(fit_lines(result)))
            if not result["fits"]:
                raise CheckFailed(f"the cover does not fit device {profile.name} (see above)")
