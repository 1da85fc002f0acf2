"""Verilog: written directly for people (:func:`readable_verilog`), or through Amaranth's own backend.

:func:`readable_verilog` writes a cover or a LUT network as one module a person can read: a header comment the
caller supplies (source, digest, figures, cautions), `` `timescale 1ns / 1ps``, the ports in the spec's order with
the component's port names (:func:`plaforge.core.names.ports_of`), one named wire per product term (``pt0``, ...)
or per LUT (named after the LUT), and one ``assign`` per output. A LUT is a sized constant indexed by the
concatenation of its fan-ins, fan-in 0 the least significant index bit (the INIT order of docs/conventions.md).
With ``registered`` the ports ``clk`` and ``rst`` come first and the outputs are registers loaded in one ``always``
block at the rising edge of ``clk`` (cleared while ``rst`` is high), the stage a registered Amaranth module has.

:func:`verilog_source` converts a generated Amaranth component with the backend
(``amaranth.back.verilog.convert``, with the Yosys it bundles).

The generated component is converted as the top module; its ports keep the component's port names (see
:mod:`plaforge.core.names` for how spec names map to them). Source-location attributes are left out, so the text
depends only on the logic and on the backend version, not on where files live: the same input gives the same bytes.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from ..core.cube import Cover
from ..core.errors import ArtifactError
from ..core.names import VERILOG_KEYWORDS, Port, check_names, identifier, ports_of, unique_names
from ..core.network import LutNetwork
from ..core.table import Table
from ..verify.component import instantiate, load_source
from .plan import CLOCK_PORTS, check_clock_ports

__all__ = ["TIMESCALE", "readable_verilog", "renamed_ports", "verilog_name", "verilog_source"]

TIMESCALE = "`timescale 1ns / 1ps"
"""The time unit line every readable module starts with (simulators warn about modules without one)."""


def verilog_name(name: str) -> str:
    """A plain Verilog module identifier for ``name`` (:func:`plaforge.core.names.identifier`, avoiding keywords).

    >>> verilog_name("memory-map"), verilog_name("7seg"), verilog_name("wire")
    ('memory_map', 'p_7seg', 'wire_')
    """
    return identifier(name, VERILOG_KEYWORDS)


def verilog_source(component_or_source: Any, name: str) -> str:
    """Verilog text for a component, or for the source text of a generated module file.

    Parameters
    ----------
    component_or_source : amaranth.lib.wiring.Component or str
        A component instance (from :func:`plaforge.emit.amaranth.build_component`, say) or the text
        :func:`plaforge.emit.amaranth.module_source` returned.
    name : str
        The Verilog module name (made a plain identifier by :func:`verilog_name`).

    Returns
    -------
    str
        The Verilog text, ending in a newline.

    Raises
    ------
    ArtifactError
        If the source does not run or does not define exactly one component, or the backend cannot convert the
        component (its ``elaborate`` raises, say).
    """
    from amaranth.back import verilog

    if isinstance(component_or_source, str):
        where = "<module source>"
        component = instantiate(load_source(component_or_source, where), where)
    else:
        component = component_or_source
    try:
        text = verilog.convert(component, name=verilog_name(name), emit_src=False)
    except Exception as exc:  # noqa: BLE001 - the backend reports problems as assorted exceptions
        raise ArtifactError(f"Verilog conversion failed: {type(exc).__name__}: {exc}") from None
    return text if text.endswith("\n") else text + "\n"


def renamed_ports(table: Table) -> list[tuple[str, str]]:
    """``(spec name, port name)`` for every port whose name differs from the spec's bus name, in port order."""
    return [(p.spec_name, p.name) for p in ports_of(table) if p.name != p.spec_name]


def _bit_names(ports: Sequence[Port], direction: str, count: int) -> list[str]:
    names = [""] * count
    for p in ports:
        if p.direction == direction:
            for b, idx in enumerate(p.members):
                names[idx] = p.name if p.scalar else f"{p.name}[{b}]"
    return names


def _declarations(ports: Sequence[Port], registered: bool = False) -> list[str]:
    width = max((len(f"[{p.width - 1}:0]") for p in ports if not p.scalar), default=0)
    lines = []
    decls = [("input ", "wire", name, "") for name in CLOCK_PORTS] if registered else []
    decls += [("input " if p.direction == "in" else "output", "reg " if registered and p.direction == "out" else "wire",
               p.name, "" if p.scalar else f"[{p.width - 1}:0]") for p in ports]
    for k, (kind, net, name, rng) in enumerate(decls):
        comma = "," if k < len(decls) - 1 else ""
        lines.append(f"    {kind} {net} {rng:<{width}} {name}{comma}" if width else f"    {kind} {net} {name}{comma}")
    return lines


def _outputs(drives: Sequence[tuple[str, str]], ports: Sequence[Port], registered: bool) -> list[str]:
    """``assign`` per output bit; registered: one ``always`` block loading every output at the rising clock edge,
    all outputs 0 while ``rst`` is high (the reset of Amaranth's ``sync`` domain)."""
    if not registered:
        return [f"    assign {target} = {expr};" for target, expr in drives]
    lines = ["    // registered: at each rising edge of clk every output loads its value below (0 while rst is high),",
             "    // so the outputs follow the inputs one clock cycle later",
             "    always @(posedge clk) begin", "        if (rst) begin"]
    lines += [f"            {p.name} <= {p.width}'d0;" for p in ports if p.direction == "out"]
    lines.append("        end else begin")
    lines += [f"            {target} <= {expr};" for target, expr in drives]
    lines += ["        end", "    end"]
    return lines


def _sop_body(table: Table, cover: Cover, ports: Sequence[Port]) -> tuple[list[str], list[tuple[str, str]]]:
    ins = _bit_names(ports, "in", table.n_inputs)
    outs = _bit_names(ports, "out", table.n_outputs)
    wires = unique_names((f"pt{k}" for k in range(cover.rows)), [p.name for p in ports])
    order = _input_order(ports)
    lines = [f"    // {cover.rows} product term{'s' if cover.rows != 1 else ''}, each ANDing input bits (~: complemented)"]
    for w, c in zip(wires, cover.cubes):
        lits = [ins[i] if c.value >> i & 1 else f"~{ins[i]}" for i in order if c.care >> i & 1]
        body = " & ".join(lits) if lits else "1'b1"
        lines.append(f"    wire {w} = {body};")
    lines.append("    // each output is the OR of its terms; ~( ... ): realized inverted")
    drives = []
    for j in range(table.n_outputs):
        feeding = [w for w, c in zip(wires, cover.cubes) if c.outputs >> j & 1]
        expr = " | ".join(feeding) if feeding else "1'b0"
        if cover.is_inverted(j):
            expr = f"~({expr})" if feeding else "1'b1"
        drives.append((outs[j], expr))
    return lines, drives


def _input_order(ports: Sequence[Port]) -> list[int]:
    """Input indices as a reader scans them: ports in spec order, each bus high bit first."""
    return [i for p in ports if p.direction == "in" for i in reversed(p.members)]


def _lut_body(table: Table, net: LutNetwork, ports: Sequence[Port]) -> tuple[list[str], list[tuple[str, str]]]:
    ref = dict(zip(table.input_names, _bit_names(ports, "in", table.n_inputs)))
    outs = _bit_names(ports, "out", table.n_outputs)
    taken = [p.name for p in ports]
    wires = unique_names((identifier(lut.name, VERILOG_KEYWORDS) for lut in net.luts), taken)
    inits = unique_names((f"{w.upper()}_INIT" for w in wires), taken + list(wires))
    ref.update(zip((lut.name for lut in net.luts), wires))
    ref["0"], ref["1"] = "1'b0", "1'b1"
    lines = [(f"    // {net.count} LUT{'s' if net.count != 1 else ''} of at most {net.k} inputs; a LUT's output is "
              "bit {fan-ins} of its INIT, fan-in 0 the least significant index bit")]
    for lut, w, init in zip(net.luts, wires, inits):
        m = len(lut.inputs)
        bits = 1 << m
        digits = max(1, bits // 4)
        lines.append(f"    localparam [{bits - 1}:0] {init} = {bits}'h{lut.init:0{digits}X};")
        if m == 0:
            lines.append(f"    wire {w} = {init}[0];")
        else:
            fanins = ", ".join(ref[x] for x in reversed(lut.inputs))
            lines.append(f"    wire {w} = {init}[{{{fanins}}}];")
    return lines, [(outs[j], ref[d]) for j, d in enumerate(net.drivers)]


def readable_verilog(table: Table, artifact: Cover | LutNetwork, name: str, header: Sequence[str] = (), *,
                     registered: bool = False) -> str:
    """One Verilog module ``name`` realizing ``table`` by ``artifact``, written to be read (see the module docs).

    Parameters
    ----------
    table : Table
    artifact : Cover or LutNetwork
        Its input and output names must be the table's.
    name : str
        The module name (made a plain identifier by :func:`verilog_name`).
    header : sequence of str
        Comment lines put first (without the ``//``).
    registered : bool
        Register every output: ports ``clk`` and ``rst`` first, then as above; each output a ``reg`` loaded at the
        rising edge of ``clk`` and cleared while ``rst`` is high (the same stage as a registered Amaranth module).

    Raises
    ------
    ArtifactError
        If the artifact's names are not the table's.
    PlaforgeError
        If ``registered`` and the spec has a port named ``clk`` or ``rst``.
    """
    what = "the cover" if isinstance(artifact, Cover) else "the LUT network"
    check_names(table, artifact.input_names, artifact.output_names, what)
    ports = ports_of(table)
    if registered:
        check_clock_ports(ports)
    lines = [f"// {h}".rstrip() for h in header]
    lines += [TIMESCALE, "", f"module {verilog_name(name)} ("]
    lines += _declarations(ports, registered)
    lines.append(");")
    body, drives = (_sop_body if isinstance(artifact, Cover) else _lut_body)(table, artifact, ports)  # type: ignore[operator]
    lines += body + _outputs(drives, ports, registered)
    lines.append("endmodule")
    return "\n".join(lines) + "\n"
