"""``plaforge minimize``: a jointly minimized two-level cover in PLA format."""

from __future__ import annotations

import json
import os
import sys

import click

from .group import cli, jobs_option


@cli.command("minimize")
@click.argument("spec", nargs=-1, required=True, type=click.Path())
@click.option("-o", "--output", "out", type=click.Path(), help="Write the PLA cover here (with several specs: a "
              "directory, one DESIGN.pla per spec).")
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
              "names; docs/report.md). One spec only.")
@click.option("--device", "device", help="Say whether the cover fits a device profile (a built-in name or a .toml "
              "file); exit 1 when it does not.")
@click.option("--name", "name", help="Design name written in the cover's header and the JSON [default: the spec's "
              "[design] name, else its file name without the extension]. One spec only.")
@jobs_option("minimizes")
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object with the figures and nothing else (a "
              "list of them for several specs).")
def minimize_cmd(spec: tuple[str, ...], out: str | None, exact: bool, time_limit: float, memory_limit: int,
                 cost: str, effort: str, phase: bool, hazard_free: str | None, changing: str | None, listing: bool,
                 device: str | None, name: str | None, jobs: int | None, as_json: bool) -> None:
    """Minimize SPEC jointly over all outputs and write the cover in PLA format.

    Several specs (a directory: every .pla, .csv and .toml in it, sorted by name) are minimized in parallel, one
    line per spec in the order given, then a summary; -o then names a directory that gets one DESIGN.pla per spec.
    The exit status is the worst of them (4 > 3 > 2 > 1).
    """
    from ..batch import MinimizeJob, expand_specs, minimize_many, minimize_spec
    from ..core.errors import CheckFailed, PlaforgeError
    from ..core.fileio import refuse_clobbering
    from ..device import fit_lines, load_profile
    from ..minimize import MinimizeOptions, format_summary
    from .outcomes import echo_outcomes

    if as_json and (listing or device):
        raise PlaforgeError("--json prints the figures only; leave out --listing and --device with it")
    specs = expand_specs(spec)
    several = len(spec) > 1 or any(os.path.isdir(s) for s in spec)
    if several and name is not None:
        raise PlaforgeError("--name names one design; with several specs each is named by its [design] name or "
                            "file name")
    if several and listing:
        raise PlaforgeError("--listing prints one spec's equations; give one spec")
    if not several:
        refuse_clobbering([("SPEC", specs[0])], [("-o", out)])
    profile = load_profile(device) if device is not None else None
    phase = phase or (profile is not None and profile.polarity)
    given = click.get_current_context().get_parameter_source("time_limit") is not click.core.ParameterSource.DEFAULT
    options = MinimizeOptions(exact=exact, time_limit=time_limit, cost=cost,  # type: ignore[arg-type]
                              phase=phase, progress=not as_json and not several and sys.stderr.isatty(),
                              memory_limit=memory_limit, effort=effort,  # type: ignore[arg-type]
                              scale_time_limit=not given)
    job = MinimizeJob(options, hazard_free, changing, name, profile)
    if several:
        outcomes = minimize_many(specs, out, job, jobs=jobs or os.cpu_count() or 1)
        into = f" into {out}/" if out is not None else ""
        echo_outcomes(outcomes, as_json, lambda ok, bad: f"{ok + bad} specs{into}: {ok} minimized, {bad} failed")
        return
    res = minimize_spec(specs[0], job, out)
    cover = res.cover
    if as_json:
        click.echo(json.dumps(res.to_json_obj()))
        return
    click.echo(format_summary(cover))
    if hazard_free is not None:
        added = res.added
        click.echo(f"hazard-free ({hazard_free}): {len(added)} terms added for static hazards" + (":" if added else ""))
        m = cover.n_outputs
        for c in added:
            click.echo(f"  {c.text(cover.n_inputs)} {''.join('1' if c.outputs >> j & 1 else '0' for j in range(m))}")
    if out is not None:
        click.echo(f"cover written to {out}")
    if listing:
        from ..listing import listing_text

        click.echo("")
        click.echo(listing_text(res.table, cover), nl=False)
    if res.fit is not None:
        click.echo("")
        click.echo("\n".join(fit_lines(res.fit)))
        if not res.fit["fits"]:
            raise CheckFailed(f"the cover does not fit device {profile.name} (see above)")
