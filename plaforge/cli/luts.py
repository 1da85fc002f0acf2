"""``plaforge luts``: k-input LUT INIT vectors and LUT networks."""

from __future__ import annotations

import json
import os
import re

import click

from .group import cli


@cli.command("luts")
@click.argument("spec", type=click.Path())
@click.option("-k", "k", type=click.IntRange(2, 8), default=6, show_default=True, help="LUT input count.")
@click.option("-o", "--output", "out", type=click.Path(), help="Write the LUT network JSON here.")
@click.option("--json", "as_json", is_flag=True, help="Print the LUT network JSON object and nothing else.")
@click.option("--init-format", "init_format", type=click.Choice(["verilog", "python", "bits"]), default="python",
              show_default=True, help="How the listing writes INITs: sized hex literal, 0x integer, or bit string.")
@click.option("--pad", is_flag=True,
              help="In the listing and C header, give every INIT for a full k-input LUT (unused upper pins).")
@click.option("--c-header", "c_header_path", type=click.Path(),
              help="Also write a C header with every INIT as a constant.")
@click.option("--verilog", "verilog_path", type=click.Path(),
              help="Also write the network as a Verilog module of generic LUT cell instances.")
@click.option("--name", "design", default=None,
              help="Design name for the Verilog module and the C header's prefix and guard [default: SPEC's file "
                   "name without its extension].")
@click.option("--objective", type=click.Choice(["area", "depth"]), default="area", show_default=True,
              help="Prefer fewer LUTs or fewer levels when the mapper has a choice.")
@click.option("--time-limit", "time_limit", type=click.FloatRange(min=0, min_open=True), default=None,
              help="Seconds for the mapping; past them the rest is mapped the quick way (exit 3 only if even that "
                   "cannot finish).")
def luts_cmd(spec: str, k: int, out: str | None, as_json: bool, init_format: str, pad: bool,
             c_header_path: str | None, verilog_path: str | None, design: str | None, objective: str,
             time_limit: float | None) -> None:
    """Map SPEC onto k-input LUTs and list each LUT's fan-ins and INIT.

    Every output is re-checked against SPEC (exhaustively, or with a SAT proof for wide tables) before anything
    is written.
    """
    from ..core.fileio import refuse_clobbering, write_text_atomic
    from ..core.names import ports_of
    from ..formats import read_spec
    from ..lut import LutOptions, c_header, format_listing, map_luts
    from ..lut.export import padded_network
    from ..lut.netlist import verilog_netlist
    from ..minimize import minimize

    refuse_clobbering([("SPEC", spec)], [("-o", out), ("--c-header", c_header_path), ("--verilog", verilog_path)])
    if design is None:
        design = re.sub(r"\.[^.]*$", "", os.path.basename(spec)) or "luts"
    table = read_spec(spec)
    opts = LutOptions(objective=objective, time_limit=time_limit)  # type: ignore[arg-type]
    net = map_luts(table, minimize(table), k, opts)
    if out is not None:
        write_text_atomic(out, net.to_json())
    shown = padded_network(net) if pad else net
    if c_header_path is not None:
        write_text_atomic(c_header_path, c_header(shown, design))
    if verilog_path is not None:
        write_text_atomic(verilog_path, verilog_netlist(shown, ports_of(table), design))
    if as_json:
        click.echo(json.dumps(net.to_json_obj()))
        return
    click.echo(format_listing(shown, init_format), nl=False)
    if out is not None:
        click.echo(f"LUT network JSON written to {out}")
    if c_header_path is not None:
        click.echo(f"C header written to {c_header_path}")
    if verilog_path is not None:
        click.echo(f"Verilog module written to {verilog_path}")
