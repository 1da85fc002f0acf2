"""What a generated component computes, apart from how its source is written out.

A :class:`LogicPlan` holds the ports (:func:`plaforge.core.names.ports_of`), the internal nodes and what drives each
output. Style ``sop`` (from a :class:`plaforge.core.cube.Cover`): each distinct product term once, each output the OR
of its terms, complemented where the cover realizes the output inverted. Style ``lut`` (from a
:class:`plaforge.core.network.LutNetwork`): each LUT a node with its fan-ins and INIT.

A constant is a constant: an output whose terms cover every point (``a | ~a``, or the term with no literals) is
planned as the constant 1, a LUT whose INIT is all ones or all zeros as that constant, so no generated file builds a
constant from gates that could glitch.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from ..core.cube import Cover
from ..core.errors import ArtifactError, PlaforgeError
from ..core.names import GENERATED_FILE_NAMES, Port, check_names, identifier, ports_of, unique_names
from ..core.network import LutNetwork
from ..core.table import Table

__all__ = ["CLOCK_PORTS", "REGISTERED_NOTE", "LogicPlan", "Ref", "check_clock_ports", "plan_for"]

CLOCK_PORTS = ("clk", "rst")
"""The ports a registered module adds: Amaranth's ``sync`` domain's clock and synchronous reset, by its names."""

REGISTERED_NOTE = (
    "Registered: every output is a register in the sync domain (clock clk, synchronous reset rst, reset value 0), "
    "loaded at every rising clock edge from the combinational logic, so the outputs follow the inputs one clock "
    "cycle later. plaforge check proves that logic with that delay: after one rising edge with rst low, every "
    "output agrees with the spec at the inputs applied before the edge."
)
"""What a registered module (or Verilog module) says about its register stage."""


def check_clock_ports(ports: tuple[Port, ...]) -> None:
    """Refuse a registered module whose spec already has a port named ``clk`` or ``rst`` (the ports it adds).

    Raises
    ------
    PlaforgeError
        Naming the port (exit status 2).
    """
    for p in ports:
        if p.name in CLOCK_PORTS:
            raise PlaforgeError(f"--registered adds the ports {' and '.join(CLOCK_PORTS)}, but the spec's "
                                f"{'input' if p.direction == 'in' else 'output'} {p.spec_name!r} is already named "
                                f"{p.name!r}; rename it in the spec")

Ref = tuple[str, int]
"""A signal reference in a plan: ``("in", i)`` table input ``i``, ``("node", k)`` node ``k``, ``("const", v)``."""


@dataclass(frozen=True, slots=True)
class LogicPlan:
    """What the component computes.

    Parameters
    ----------
    style : str
        ``"sop"`` or ``"lut"``.
    ports : tuple of Port
    nodes : tuple
        ``sop``: product terms as ``(care, value)`` input masks. ``lut``: ``(local_name, fanin_refs, init)``.
    outputs : tuple
        Per table output. ``sop``: ``(term_indices, inverted)``; no terms means the constant ``inverted`` (0 or 1).
        ``lut``: the driving :data:`Ref`.
    summary : str
        One line of figures for docstrings.
    """

    style: str
    ports: tuple[Port, ...]
    nodes: tuple[Any, ...]
    outputs: tuple[Any, ...]
    summary: str


def _tautology(cubes: list[tuple[int, int]]) -> bool:
    """Whether the cubes (``(care, value)``) cover every point: split on a binate input until each part is unate,
    where only the cube with no literals covers everything."""
    if any(care == 0 for care, _ in cubes):
        return True
    pos = neg = 0
    for care, value in cubes:
        pos |= care & value
        neg |= care & ~value
    binate = pos & neg
    if not binate:
        return False
    bit = binate & -binate
    return all(_tautology([(care & ~bit, value & ~bit) for care, value in cubes if not care & bit or value & bit == v])
               for v in (0, bit))


def _sop_plan(table: Table, cover: Cover) -> LogicPlan:
    constant = [_tautology([(c.care, c.value) for c in cover.cubes_for(j)]) for j in range(cover.n_outputs)]
    index: dict[tuple[int, int], int] = {}
    feeds: list[int] = []
    for c in cover.cubes:
        if not c.outputs & ~sum(1 << j for j, k in enumerate(constant) if k):
            continue
        key = (c.care, c.value)
        if key not in index:
            index[key] = len(index)
            feeds.append(0)
        feeds[index[key]] |= c.outputs
    terms = tuple(index)
    outs = tuple(
        ((), not cover.is_inverted(j)) if constant[j]
        else (tuple(t for t in range(len(terms)) if feeds[t] >> j & 1), cover.is_inverted(j))
        for j in range(cover.n_outputs)
    )
    literals = sum(care.bit_count() for care, _ in terms)
    proven = "proven minimum" if cover.optimal else "not proven minimum"
    summary = (
        f"sum of products: {len(terms)} shared product terms, {literals} literals, "
        f"{cover.n_outputs} outputs ({cover.method or 'unknown'} cover, {proven})"
    )
    return LogicPlan("sop", ports_of(table), terms, outs, summary)


def _lut_plan(table: Table, net: LutNetwork) -> LogicPlan:
    try:
        net.check_structure()
    except ValueError as exc:
        raise ArtifactError(f"LUT network: {exc}") from None
    refs: dict[str, Ref] = {name: ("in", i) for i, name in enumerate(net.input_names)}
    refs |= {"0": ("const", 0), "1": ("const", 1)}
    locals_ = unique_names((identifier(lut.name, GENERATED_FILE_NAMES) for lut in net.luts), GENERATED_FILE_NAMES)
    nodes = []
    for lut, local in zip(net.luts, locals_):
        full = (1 << (1 << len(lut.inputs))) - 1
        if lut.init & full in (0, full):  # a constant LUT is its constant
            refs[lut.name] = ("const", int(lut.init & full == full))
            continue
        nodes.append((local, tuple(refs[x] for x in lut.inputs), lut.init))
        refs[lut.name] = ("node", len(nodes) - 1)
    summary = (
        f"{net.k}-input LUT network: {net.count} LUTs, depth {net.depth}, {len(net.output_names)} outputs"
        f"{' (' + net.method + ')' if net.method else ''}"
    )
    return LogicPlan("lut", ports_of(table), tuple(nodes), tuple(refs[d] for d in net.drivers), summary)


def plan_for(table: Table, artifact: Cover | LutNetwork) -> LogicPlan:
    """The plan realizing ``artifact`` (a Cover for style ``sop``, a LutNetwork for ``lut``) with ``table``'s ports.

    Raises
    ------
    ArtifactError
        If the artifact's input or output names differ from the table's, or a LUT network is not well formed.
    TypeError
        If ``artifact`` is neither.
    """
    if isinstance(artifact, Cover):
        check_names(table, artifact.input_names, artifact.output_names, "the cover")
        return _sop_plan(table, artifact)
    if isinstance(artifact, LutNetwork):
        check_names(table, artifact.input_names, artifact.output_names, "the LUT network")
        return _lut_plan(table, artifact)
    raise TypeError(f"artifact must be a Cover or a LutNetwork, not {type(artifact).__name__}")
