"""Text exports of a LUT network: a readable listing and a C-style header of INIT constants (the Verilog netlist is
in :mod:`plaforge.lut.netlist`).

Both are deterministic functions of the network (same network, byte-identical text).
"""

from __future__ import annotations

import re

from ..core.caution import CAUTION
from ..core.network import Lut, LutNetwork
from .init import INIT_STYLES, drop_unused_inputs, format_init, pad_init

__all__ = [
    "GLITCH_NOTE",
    "c_header",
    "c_identifier",
    "describe_lut",
    "format_listing",
    "net_init_constants",
    "padded_network",
]

GLITCH_NOTE = CAUTION
"""The caution at the end of a listing: the one wording of :mod:`plaforge.core.caution`."""


def padded_network(net: LutNetwork) -> LutNetwork:
    """The same network with every LUT given ``k`` fan-ins: unused upper pins are written ``"0"`` (tie low)
    and the INIT is repeated (:func:`plaforge.lut.init.pad_init`), as a physical k-input LUT needs it.

    The function is unchanged (a fan-in tied to ``"0"`` selects the low half, which equals the original INIT).
    """
    luts = tuple(
        Lut(lut.name, lut.inputs + ("0",) * (net.k - len(lut.inputs)), pad_init(lut.init, len(lut.inputs), net.k))
        for lut in net.luts
    )
    return LutNetwork(net.k, net.input_names, net.output_names, luts, net.drivers, dict(net.lower_bounds),
                      net.method)


def describe_lut(lut: Lut) -> str:
    """A few words for LUTs that are simple gates (inverter, buffer; padding ignored), else an empty string."""
    init, keep = drop_unused_inputs(lut.init, len(lut.inputs))
    if len(keep) == 1:
        name = lut.inputs[keep[0]]
        if init == 0b01:
            return f"inverter of {name}"
        if init == 0b10:
            return f"buffer of {name}"
    return ""


def _driver_text(net: LutNetwork, driver: str, by_name: dict[str, Lut]) -> str:
    if driver in ("0", "1"):
        return f"constant {driver} (no LUT)"
    if driver in by_name:
        what = describe_lut(by_name[driver])
        return f"{driver}" + (f" ({what})" if what else "")
    return f"input {driver} (no LUT)"


def format_listing(net: LutNetwork, style: str = "python") -> str:
    """The network as plain text: each LUT (fan-ins in order, INIT), each output's driver, figures vs bounds.

    Parameters
    ----------
    net : LutNetwork
    style : {"verilog", "python", "bits"}
        How INITs are written (see :func:`plaforge.lut.init.format_init`); for k <= 4 the bits are shown too.
    """
    if style not in INIT_STYLES:
        raise ValueError(f"INIT style must be one of {', '.join(INIT_STYLES)}, not {style!r}")
    by_name = {lut.name: lut for lut in net.luts}
    lines = [f"{net.k}-input LUT network: {len(net.input_names)} inputs, {len(net.output_names)} outputs"
             + (f", built by {net.method}" if net.method else "")]
    if net.luts:
        lines.append("LUTs (fan-in 0 is the least significant INIT index bit):")
    wname = max((len(lut.name) for lut in net.luts), default=1)
    for lut in net.luts:
        m = len(lut.inputs)
        init = format_init(lut.init, m, style)
        extra = ""
        if net.k <= 4 and style != "bits":
            extra = f"  bits {format_init(lut.init, m, 'bits')}"
        what = describe_lut(lut)
        fans = ", ".join(lut.inputs) if lut.inputs else "(none)"
        lines.append(f"  {lut.name:<{wname}}  fan-ins [{fans}]  INIT {init}{extra}" + (f"  {what}" if what else ""))
    lines.append("Outputs:")
    wout = max((len(o) for o in net.output_names), default=1)
    for name, d in zip(net.output_names, net.drivers):
        lines.append(f"  {name:<{wout}} <- {_driver_text(net, d, by_name)}")
    lb = net.lower_bounds
    count_lb = f" (lower bound {lb['count']})" if "count" in lb else ""
    depth_lb = f" (lower bound {lb['depth']})" if "depth" in lb else ""
    lines.append(f"LUT count {net.count}{count_lb}, depth {net.depth}{depth_lb}")
    lines.append(GLITCH_NOTE)
    return "\n".join(lines) + "\n"


def c_identifier(name: str) -> str:
    """``name`` as an upper-case C identifier: other characters become ``_``, a leading digit gets ``_``."""
    ident = re.sub(r"[^0-9A-Za-z_]", "_", name).upper()
    ident = re.sub(r"_+", "_", ident).strip("_") or "X"
    if ident[0].isdigit():
        ident = "_" + ident
    return ident


def net_init_constants(net: LutNetwork, design: str = "") -> list[tuple[str, Lut]]:
    """Unique C names (``<DESIGN>_LUT_<NAME>``, or ``LUT_<NAME>`` without a design) for the LUTs, in network
    order; clashes get ``_2``, ``_3``, ..."""
    used: set[str] = set()
    out = []
    lead = f"{c_identifier(design)}_LUT_" if design else "LUT_"
    for lut in net.luts:
        base = lead + c_identifier(lut.name)
        ident, n = base, 2
        while ident in used:
            ident, n = f"{base}_{n}", n + 1
        used.add(ident)
        out.append((ident, lut))
    return out


def c_header(net: LutNetwork, design: str) -> str:
    """A C header with every LUT's INIT as a constant, every name prefixed by the design's.

    ``design`` (the spec's name, or ``--name``) gives the include guard ``<DESIGN>_LUTS_H`` and the constant names
    ``<DESIGN>_LUT_<NAME>_INIT``, so the headers of two designs can be included together.

    INITs of up to 64 bits are ``#define <NAME>_INIT UINT64_C(0x...)``; wider ones (7 and 8 inputs) are
    ``static const uint64_t <NAME>_INIT[words]``, least significant word first. Each constant has
    ``<NAME>_FANINS`` (count) and a comment with the fan-ins in order; names are sanitized C identifiers.
    """
    guard = f"{c_identifier(design)}_LUTS_H"
    lines = [
        f"/* {net.k}-input LUT INIT constants: {net.count} LUTs, depth {net.depth}.",
        " * Bit p of an INIT is the LUT output when its fan-ins, read as a binary number with fan-in 0 as the",
        " * least significant bit, equal p. */",
        f"#ifndef {guard}",
        f"#define {guard}",
        "",
        "#include <stdint.h>",
        "",
    ]
    for ident, lut in net_init_constants(net, design):
        m = len(lut.inputs)
        fans = ", ".join(lut.inputs) if lut.inputs else "none"
        lines.append(f"/* {lut.name}: fan-ins {fans} */".replace("*/", "* /")[:-3] + "*/")
        lines.append(f"#define {ident}_FANINS {m}")
        if m <= 6:
            digits = max(1, (1 << m) // 4)
            lines.append(f"#define {ident}_INIT UINT64_C(0x{lut.init:0{digits}X})")
        else:
            words = (1 << m) // 64
            vals = ", ".join(f"UINT64_C(0x{lut.init >> (64 * w) & (2**64 - 1):016X})" for w in range(words))
            lines.append(f"static const uint64_t {ident}_INIT[{words}] = {{{vals}}};")
    lines.append("")
    outs = "; ".join(f"{o} <- {d}" for o, d in zip(net.output_names, net.drivers)).replace("*/", "* /")
    lines.append(f"/* outputs: {outs} */")
    lines.append("")
    lines.append(f"#endif /* {guard} */")
    return "\n".join(lines) + "\n"
