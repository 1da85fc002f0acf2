"""``plaforge luts``: k-input LUT INIT vectors and LUT networks."""

from __future__ import annotations

import json
import os

import click

from .group import cli, jobs_option


@cli.command("luts")
@click.argument("spec", nargs=-1, required=True, type=click.Path())
@click.option("-k", "k", type=click.IntRange(2, 8), default=6, show_default=True, help="LUT input count.")
@click.option("-o", "--output", "out", type=click.Path(), help="Write the LUT network JSON here (with several "
              "specs: a directory, one DESIGN.luts.json per spec).")
@click.option("--json", "as_json", is_flag=True, help="Print the LUT network JSON object and nothing else (a list "
              "of them for several specs).")
@click.option("--init-format", "init_format", type=click.Choice(["verilog", "python", "bits"]), default="python",
              show_default=True, help="How the listing writes INITs: sized hex literal, 0x integer, or bit string. "
              "One spec only.")
@click.option("--pad", is_flag=True,
              help="In the listing and C header, give every INIT for a full k-input LUT (unused upper pins).")
@click.option("--c-header", "c_header_path", type=click.Path(),
              help="Also write a C header with every INIT as a constant (with several specs: a directory, one "
                   "DESIGN.h per spec).")
@click.option("--verilog", "verilog_path", type=click.Path(),
              help="Also write the network as a Verilog module of generic LUT cell instances (with several specs: "
                   "a directory, one DESIGN.v per spec).")
@click.option("--name", "design", default=None,
              help="Design name for the Verilog module and the C header's prefix and guard [default: the spec's "
                   "[design] name, else its file name without the extension]. One spec only.")
@click.option("--objective", type=click.Choice(["area", "depth"]), default="area", show_default=True,
              help="Prefer fewer LUTs or fewer levels when the mapper has a choice.")
@click.option("--time-limit", "time_limit", type=click.FloatRange(min=0, min_open=True), default=None,
              help="Seconds for the mapping; past them the rest is mapped the quick way (exit 3 only if even that "
                   "cannot finish).")
@jobs_option("maps")
def luts_cmd(spec: tuple[str, ...], k: int, out: str | None, as_json: bool, init_format: str, pad: bool,
             c_header_path: str | None, verilog_path: str | None, design: str | None, objective: str,
             time_limit: float | None, jobs: int | None) -> None:
    """Map SPEC onto k-input LUTs and list each LUT's fan-ins and INIT.

    Every output is re-checked against SPEC (exhaustively, or with a SAT proof for wide tables) before anything
    is written. Several specs (a directory: every .pla, .csv and .toml in it, sorted by name) are mapped in
    parallel, one line per spec in the order given, then a summary; -o, --c-header and --verilog then name
    directories with one file per spec, named after its design. The exit status is the worst of them.
    """
    from ..batch import LutsJob, expand_specs, luts_many, luts_spec
    from ..core.errors import PlaforgeError
    from ..core.fileio import refuse_clobbering
    from ..lut import LutOptions, format_listing
    from ..lut.export import padded_network
    from .outcomes import echo_outcomes

    specs = expand_specs(spec)
    several = len(spec) > 1 or any(os.path.isdir(s) for s in spec)
    opts = LutOptions(objective=objective, time_limit=time_limit)  # type: ignore[arg-type]
    if several:
        ctx = click.get_current_context()
        if design is not None:
            raise PlaforgeError("--name names one design; with several specs each is named by its [design] name "
                                "or file name")
        if ctx.get_parameter_source("init_format") is not click.core.ParameterSource.DEFAULT:
            raise PlaforgeError("--init-format shapes the listing of one spec; several specs print one line each")
        outcomes = luts_many(specs, out, LutsJob(k, opts, pad), c_header_dir=c_header_path,
                             verilog_dir=verilog_path, jobs=jobs or os.cpu_count() or 1)
        echo_outcomes(outcomes, as_json, lambda ok, bad: f"{ok + bad} specs: {ok} mapped, {bad} failed")
        return
    refuse_clobbering([("SPEC", specs[0])], [("-o", out), ("--c-header", c_header_path), ("--verilog", verilog_path)])
    _table, net, _name = luts_spec(specs[0], LutsJob(k, opts, pad, design), out, c_header_path, verilog_path)
    if as_json:
        click.echo(json.dumps(net.to_json_obj()))
        return
    shown = padded_network(net) if pad else net
    click.echo(format_listing(shown, init_format), nl=False)
    if out is not None:
        click.echo(f"LUT network JSON written to {out}")
    if c_header_path is not None:
        click.echo(f"C header written to {c_header_path}")
    if verilog_path is not None:
        click.echo(f"Verilog module written to {verilog_path}")
