"""``plaforge module``: a generated Amaranth component (and Verilog, and a stand-alone pytest harness)."""

from __future__ import annotations

from pathlib import Path

import click

from ..core.errors import PlaforgeError
from ..flow import STYLES
from .group import cli


@cli.command("module")
@click.argument("spec", type=click.Path())
@click.option("-o", "--output", "out", type=click.Path(),
              help="Write the Amaranth module here (default: print it).")
@click.option("--verilog", "verilog", type=click.Path(), help="Also write Verilog here.")
@click.option("--style", type=click.Choice(STYLES), default="sop", show_default=True,
              help="sop: shared product terms; lut: one constant per LUT; nand: NAND-NAND gates from the cover; "
              "nor: NOR-NOR gates from a cover of the complement.")
@click.option("-k", "k", type=click.IntRange(2, 8), default=6, show_default=True, help="LUT size for --style lut.")
@click.option("--max-fanin", type=click.Choice(["2", "3", "4", "8"]), default="8", show_default=True,
              help="Most inputs of a gate for --style nand|nor (wider ones become balanced trees).")
@click.option("--harness", "harness", type=click.Path(),
              help="Also write a stand-alone pytest file that simulates the module against SPEC (needs -o; keep "
                   "both files in one directory).")
@click.option("--name", "name", help="Design name for the component class and the Verilog module [default: the "
              "spec's [design] name, else its file name without the extension].")
@click.option("--phase", is_flag=True, help="Choose each output's polarity to lower the cost (inverted outputs).")
@click.option("--from", "made", type=click.Path(),
              help="Use this cover (.pla) or LUT network (.json) made earlier instead of computing one; it is "
                   "checked against SPEC first (exit 1 when it does not match).")
@click.option("--registered", is_flag=True,
              help="Register every output in a clocked stage (Amaranth's sync domain: ports clk and rst), so the "
                   "outputs follow the inputs one clock cycle later; check proves it with that delay.")
def module_cmd(spec: str, out: str | None, verilog: str | None, style: str, k: int, max_fanin: str,
               harness: str | None, name: str | None, phase: bool, made: str | None, registered: bool) -> None:
    """Generate an Amaranth component implementing SPEC."""
    from ..core.fileio import refuse_clobbering, write_text_atomic
    from ..emit.amaranth import module_source
    from ..emit.gates import GateNetwork, gates_module_source
    from ..flow import realize, spec_digest
    from ..formats import read_spec

    if harness is not None and out is None:
        raise PlaforgeError("--harness imports the module from its own directory; give the module file with -o")
    if out is not None and not out.endswith(".py"):
        raise PlaforgeError(f"module file {out!r} must end in .py so it can be imported")
    refuse_clobbering([("SPEC", spec)], [("-o", out), ("--verilog", verilog), ("--harness", harness)])
    from ..flow import design_names, made_artifact
    from ..minimize import MinimizeOptions

    table = read_spec(spec)
    names = design_names(table, spec, name)
    if made is not None:
        artifact = made_artifact(table, made, style, max_fanin=int(max_fanin))
    else:
        artifact = realize(table, style, k=k, max_fanin=int(max_fanin), minimize_options=MinimizeOptions(phase=phase))
    if isinstance(artifact, GateNetwork):
        source = gates_module_source(table, artifact, source_name=Path(spec).name, source_digest=spec_digest(spec),
                                     class_name=names.class_name, registered=registered)
    else:
        source = module_source(table, artifact, source_name=Path(spec).name, source_digest=spec_digest(spec),
                               class_name=names.class_name, registered=registered)
    if out is None:
        click.echo(source, nl=False)
    else:
        write_text_atomic(out, source)
        click.echo(f"module:  {out}")
    if verilog is not None:
        from ..emit.gates_verilog import gates_verilog_source
        from ..emit.verilog import readable_verilog
        from ..flow import verilog_header

        if isinstance(artifact, GateNetwork):
            text = gates_verilog_source(table, artifact, names.module, registered=registered)
        else:
            what = f"{names.module}: {style} realization"
            text = readable_verilog(table, artifact, names.module,
                                    verilog_header(table, what, Path(spec).name, spec_digest(spec), registered),
                                    registered=registered)
        write_text_atomic(verilog, text)
        if out is not None:
            click.echo(f"verilog: {verilog}")
    if harness is not None and out is not None:
        from ..emit.harness import harness_source

        write_text_atomic(harness, harness_source(table, Path(out).stem, source_name=Path(spec).name,
                                                  registered=registered))
        click.echo(f"harness: {harness}")
