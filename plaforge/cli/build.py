"""``plaforge build``: every artifact for a spec in one directory, each checked against the spec."""

from __future__ import annotations

import json
import os

import click

from ..batch import build_many, expand_specs
from ..core.errors import CheckFailed
from ..flow import BuildOptions, build
from ..formats import read_spec
from ..report import build_report
from .group import cli, jobs_option
from .outcomes import echo_outcomes


@cli.command("build")
@click.argument("spec", nargs=-1, required=True, type=click.Path())
@click.option("-o", "--output", "out", type=click.Path(), default="build", show_default=True,
              help="Directory for the artifacts.")
@click.option("-k", "k", type=click.IntRange(2, 8), default=6, show_default=True, help="LUT input count.")
@click.option("--exact", is_flag=True, help="Prove a minimum cover instead of the fast heuristic.")
@click.option("--cost", type=click.Choice(["shared", "per-output"]), default="shared", show_default=True,
              help="shared: count distinct product terms; per-output: count terms per output.")
@click.option("--time-limit", type=click.FloatRange(min=0.1), default=60.0, show_default=True,
              help="Seconds the exact solver may spend.")
@click.option("--effort", type=click.Choice(["fast", "normal", "high"]), default="normal", show_default=True,
              help="Heuristic effort, as in plaforge minimize.")
@click.option("--budget-rows", type=click.IntRange(min=0), help="Product-term rows the target device offers.")
@click.option("--budget-luts", type=click.IntRange(min=0), help="LUTs the target region offers.")
@click.option("--hazard-free", "hazard_free", type=click.Choice(["care", "all"]), is_flag=False, flag_value="care",
              default=None, help="Make the cover free of static hazards for single-input changes (=all: don't-cares "
              "made ON).")
@click.option("--changing", help="Only these inputs or buses change (comma-separated), for hazards.")
@click.option("--gates", help="Also write gate-level modules and structural Verilog: nand, nor or nand,nor.")
@click.option("--max-fanin", type=click.Choice(["2", "3", "4", "8"]), default="8", show_default=True,
              help="Most inputs of a gate in --gates (wider ones become balanced trees).")
@click.option("--name", "name", help="Design name for the component class, Verilog modules and file names "
              "[default: the spec's [design] name, else its file name without the extension].")
@click.option("--phase", is_flag=True, help="Choose each output's polarity to lower the cost (inverted outputs).")
@click.option("--device", "device", help="Fit to a device profile: a built-in name or a profile .toml file "
              "(see docs/devices.md).")
@click.option("--registered", is_flag=True,
              help="Register every output of the modules and Verilog in a clocked stage (ports clk and rst); their "
                   "checks prove the logic with a one-cycle delay.")
@jobs_option("builds")
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object and nothing else (a list of them for "
              "several specs).")
def build_cmd(spec: tuple[str, ...], jobs: int | None, out: str, k: int, exact: bool, cost: str, time_limit: float, effort: str,
              budget_rows: int | None,
              budget_luts: int | None, hazard_free: str | None, changing: str | None, gates: str | None,
              max_fanin: str, name: str | None, phase: bool, device: str | None, registered: bool,
              as_json: bool) -> None:
    """Minimize SPEC, map it to LUTs, generate modules and Verilog, and check every artifact against SPEC.

    Several specs (a directory: every .pla, .csv and .toml in it, sorted by name) build in parallel, each into its
    own subfolder of DIR named after its design; one line per spec, then a summary. Exit status 1 when a check
    fails or a result does not fit a budget; with several specs the worst status of them (4 > 3 > 2 > 1).
    """
    from ..core.errors import PlaforgeError
    from ..verify.hazards import changing_mask

    styles = tuple(dict.fromkeys(s.strip() for s in (gates or "").split(",") if s.strip()))
    if set(styles) - {"nand", "nor"}:
        raise PlaforgeError(f"--gates {gates!r}: give nand, nor or nand,nor")
    from ..device import load_profile

    profile = load_profile(device) if device is not None else None
    specs = expand_specs(spec)
    if len(specs) > 1:
        opts = BuildOptions(name=name, phase=phase, device=profile, k=k, exact=exact, cost=cost,
                            time_limit=time_limit, effort=effort, budget_rows=budget_rows, budget_luts=budget_luts,
                            hazard_free=hazard_free, gates=styles, max_fanin=int(max_fanin), registered=registered)
        outcomes = build_many(specs, out, opts, changing=changing, jobs=jobs or os.cpu_count() or 1)
        echo_outcomes(outcomes, as_json, lambda ok, bad: f"{ok + bad} specs into {out}/: {ok} built and checked, "
                      f"{bad} failed", sort_keys=True)
        return
    spec_path = specs[0]
    table = read_spec(spec_path)
    opts = BuildOptions(name=name, phase=phase, device=profile, k=k, exact=exact, cost=cost, time_limit=time_limit, effort=effort,
                        budget_rows=budget_rows,
                        budget_luts=budget_luts, hazard_free=hazard_free,
                        changing=None if changing is None else changing_mask(table, changing), gates=styles,
                        max_fanin=int(max_fanin), registered=registered)
    result = build(table, out, opts, spec_path=spec_path)
    if as_json:
        click.echo(json.dumps(result.to_json_obj(), sort_keys=True))
    else:
        click.echo(build_report(result))
    if not result.passed:
        raise CheckFailed("an artifact does not match the spec (see above)")
    if not result.fits:
        raise CheckFailed("the result does not fit the stated device or budget (see above)")
