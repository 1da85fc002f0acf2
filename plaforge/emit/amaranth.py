"""Amaranth components from a Table and the Cover or LutNetwork that realizes it.

Ports come from the table's buses, named by :func:`plaforge.core.names.ports_of` (the mapping is listed in each
generated file's docstring). Style ``sop`` (from a :class:`plaforge.core.cube.Cover`) writes each distinct product
term once, as a named internal signal, and each output as the OR of its terms, complemented where the cover realizes
the output inverted. Style ``lut`` (from a :class:`plaforge.core.network.LutNetwork`) writes each LUT as a constant of
``2**k`` bits (its INIT) indexed by the concatenation of its fan-ins, the first fan-in as the least significant bit
(the INIT convention of docs/conventions.md).

:func:`module_source` writes a stand-alone, human-readable Python file (laid out as the ruff formatter would at line
length 88, and clean under ``ruff check``) from the artifact's :class:`plaforge.emit.plan.LogicPlan`.
:func:`build_component` returns the component in-process by running that same text, so the two cannot differ.

The file also carries what it realizes as data (``PLAFORGE_ARTIFACT``, :func:`plaforge.core.serial.artifact_lines`)
so a checker can prove the cover or network equivalent to the spec beyond the vectors it simulates.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from ..core.cube import Cover
from ..core.names import GENERATED_FILE_NAMES, Port, class_name_for, identifier
from ..core.network import LutNetwork, init_hex
from ..core.serial import artifact_lines
from ..core.table import Table
from ..verify.component import instantiate, load_source
from .layout import LINE_LENGTH, Call, Chain, Node, layout, py_string, seq_lines
from .plan import LogicPlan, Ref, plan_for

__all__ = ["OR_CHAIN_LIMIT", "build_component", "module_source"]


def _bit_ref(port: Port, b: int) -> str:
    """Source text reaching bit ``b`` of ``port`` inside ``elaborate``."""
    return f"self.{port.name}" if port.scalar else f"self.{port.name}[{b}]"


def _in_ref(plan: LogicPlan, i: int) -> str:
    for p in plan.ports:
        if p.direction == "in" and i in p.members:
            return _bit_ref(p, p.members.index(i))
    raise AssertionError(f"input {i} has no port")  # pragma: no cover - ports_of covers every input


def _out_ref(plan: LogicPlan, j: int) -> str:
    for p in plan.ports:
        if p.direction == "out" and j in p.members:
            return _bit_ref(p, p.members.index(j))
    raise AssertionError(f"output {j} has no port")  # pragma: no cover


def _literals(plan: LogicPlan, care: int, value: int) -> list[str]:
    lits = []
    m = care
    while m:
        low = m & -m
        i = low.bit_length() - 1
        lits.append(_in_ref(plan, i) if value & low else "~" + _in_ref(plan, i))
        m ^= low
    return lits


def _comb(target: str, expr: Node, module: str = "m") -> list[str]:
    return layout(Call(f"{target}.eq", (expr,)), 8, f"{module}.d.comb += ", "")


OR_CHAIN_LIMIT = 16
"""Outputs of more terms are written ``Cat(t0, t1, ...).any()``: an ``|`` chain nests one operator per term, and
Amaranth's tools recurse through that nesting (hundreds of terms would exceed Python's recursion limit)."""


def _or(terms: Sequence[str]) -> Node:
    if len(terms) > OR_CHAIN_LIMIT:
        return Call("Cat", tuple(terms), ".any()")
    return terms[0] if len(terms) == 1 else Chain("|", tuple(terms))


def _elaborate_body(plan: LogicPlan, table: Table) -> list[str]:
    lines = ["        m = Module()"]
    if plan.style == "sop":
        if plan.nodes:
            lines.append("")
            lines.append("        # Product terms, each shared by every output listed beside it. They sit in a")
            lines.append("        # submodule of their own so that a simulator settles them in one pass before")
            lines.append("        # the outputs (in one module it would evaluate everything twice per change).")
            lines.append("        m.submodules.terms = terms = Module()")
        for t, (care, value) in enumerate(plan.nodes):
            feeds = [table.output_names[j] for j, (ts, _) in enumerate(plan.outputs) if t in ts]
            lines.append(f"        t{t} = Signal()  # feeds {', '.join(feeds)}"[:LINE_LENGTH].rstrip())
            lits = _literals(plan, care, value)
            expr: Node = "1" if not lits else lits[0] if len(lits) == 1 else Chain("&", tuple(lits))
            lines += _comb(f"t{t}", expr, "terms")
        lines.append("")
        lines.append("        # Outputs: the OR of their product terms (Cat(...).any() when there are many).")
        for j, (ts, inverted) in enumerate(plan.outputs):
            target = _out_ref(plan, j)
            names = [f"t{t}" for t in ts]
            if inverted:
                if not names:
                    lines += _comb(target, "1")
                    continue
                lines.append(f"        inv{j} = Signal()  # {table.output_names[j]} is realized in complement"[
                    :LINE_LENGTH].rstrip())
                lines += _comb(f"inv{j}", _or(names))
                lines += _comb(target, f"~inv{j}")
            else:
                lines += _comb(target, _or(names) if names else "0")
    else:
        if plan.nodes:
            lines.append("")
            lines.append("        # LUTs: INIT indexed by the fan-ins, the first fan-in as the least significant bit.")

        def ref_text(r: Ref) -> str:
            kind, v = r
            if kind == "in":
                return _in_ref(plan, v)
            if kind == "node":
                return plan.nodes[v][0]
            return f"Const({v}, 1)"

        for local, fanins, init in plan.nodes:
            lines.append(f"        {local} = Signal()")
            args = (init_hex(init, len(fanins)), *(ref_text(r) for r in fanins))
            lines += _comb(local, Call("lut", args))
        lines.append("")
        lines.append("        # Outputs.")
        for j, r in enumerate(plan.outputs):
            kind, v = r
            lines += _comb(_out_ref(plan, j), str(v) if kind == "const" else ref_text(r))
    lines.append("        return m")
    return lines


def _docstring(plan: LogicPlan, table: Table, class_name: str, source_name: str, source_digest: str) -> list[str]:
    src = source_name or table.source or "an unnamed table"
    lines = [
        f'"""{class_name}: combinational logic generated by plaforge from {src}.',
        "",
        f"Source: {src}",
        f"SHA-256: {source_digest or 'not recorded'}",
        f"Realizes: {plan.summary}.",
        "Check it against the spec, output by output, with: plaforge check SPEC THIS_FILE.py",
        "(it simulates this component and proves the PLAFORGE_ARTIFACT data below).",
        "",
        "Ports (spec name -> port; bit i of a bus port is spec bit name[i]):",
    ]
    for p in plan.ports:
        kind = f"{'In' if p.direction == 'in' else 'Out'}({p.width})"
        spec = p.spec_name if p.scalar else f"{p.spec_name}[0..{p.width - 1}]"
        lines.append(f"    {spec} -> {p.name}: {kind}")
    lines += [
        "",
        "Caution: this is raw combinational logic. Its outputs can glitch while inputs change",
        "(register them if that matters), its timing is whatever your toolchain makes of it,",
        "and don't-care points take whatever value the realization gives them. Review it and",
        "time it in your own flow before relying on it.",
        '"""',
    ]
    return [ln.replace("\\", "/").replace('"""', "'''") if 0 < k < len(lines) - 1 else ln
            for k, ln in enumerate(lines)]


def module_source(
    table: Table,
    artifact: Cover | LutNetwork,
    *,
    source_name: str = "",
    source_digest: str = "",
    class_name: str | None = None,
) -> str:
    """A stand-alone Python file defining one Amaranth component that realizes ``artifact``.

    Parameters
    ----------
    table : Table
        The spec; gives the ports (its buses) and their names.
    artifact : Cover or LutNetwork
        A Cover gives style ``sop``, a LutNetwork style ``lut``. Its names must equal the table's.
    source_name, source_digest : str
        Spec file name and SHA-256 hex digest, quoted in the docstring.
    class_name : str, optional
        The component's class name; derived from ``source_name`` when omitted (see
        :func:`plaforge.core.names.class_name_for`).

    Returns
    -------
    str
        The file text: deterministic (no dates), laid out as the ruff formatter would at line length 88.

    Raises
    ------
    ArtifactError
        If the artifact's names differ from the table's, or a LUT network is not well formed.
    ValueError
        If ``class_name`` is not an identifier the file can use (one :func:`plaforge.core.names.identifier` leaves
        as it is).
    """
    plan = plan_for(table, artifact)
    name = class_name if class_name is not None else class_name_for(source_name or table.source)
    if identifier(name, GENERATED_FILE_NAMES) != name:
        raise ValueError(f"class name {name!r} is not usable; give a Python identifier such as 'AddressDecoder'")
    many = plan.style == "sop" and any(len(ts) > OR_CHAIN_LIMIT for ts, _ in plan.outputs)
    names = ["Module", "Signal"] + (["Cat", "Const"] if plan.style == "lut" else ["Cat"] if many else [])
    lines = _docstring(plan, table, name, source_name, source_digest)
    lines += ["", f"from amaranth.hdl import {', '.join(sorted(names))}", "from amaranth.lib import wiring",
              "from amaranth.lib.wiring import In, Out", "", f'__all__ = ["{name}"]', ""]
    lines.append("# What this module realizes, as data, so a checker can prove it against the spec: a JSON")
    lines.append("# header, then one line per " + ("cover row (inputs, outputs as in PLA)." if plan.style == "sop"
                                                   else "LUT (INIT as hex, first fan-in least significant)."))
    lines += seq_lines("PLAFORGE_ARTIFACT = ", [py_string(x) for x in artifact_lines(artifact)])
    if plan.style == "lut":
        lines += [
            "",
            "",
            "def lut(init, *fanins):",
            '    """A LUT: bit j of ``init`` is the output when the fan-ins, first one as bit 0, read j."""',
            "    return Const(init, 1 << len(fanins)).bit_select(Cat(*fanins), 1)",
        ]
    lines += ["", "", f"class {name}(wiring.Component):",
              f'    """Realizes {_doc_src(source_name or table.source)} (see the module docstring)."""', ""]
    for p in plan.ports:
        lines.append(f"    {p.name}: {'In' if p.direction == 'in' else 'Out'}({p.width})")
    lines += ["", "    def elaborate(self, platform):"]
    lines += _elaborate_body(plan, table)
    return "\n".join(lines) + "\n"


def _doc_src(s: str) -> str:
    s = (s or "an unnamed table").replace("\\", "/").replace('"', "'")
    return s


def build_component(table: Table, artifact: Cover | LutNetwork, *, class_name: str | None = None) -> Any:
    """The component :func:`module_source` writes, built in-process (the same text, run without a file).

    Parameters
    ----------
    table : Table
    artifact : Cover or LutNetwork
        What to realize; :func:`plaforge.flow.realize` makes one from a table and a style.
    class_name : str, optional
        As for :func:`module_source`.

    Returns
    -------
    amaranth.lib.wiring.Component
        With the ports of :func:`plaforge.core.names.ports_of`.

    Examples
    --------
    Inside your own ``elaborate``::

        decoder = build_component(table, realize(table, "sop"))
        m.submodules.decoder = decoder
        m.d.comb += decoder.addr.eq(self.bus.addr)
    """
    source = module_source(table, artifact, class_name=class_name)
    where = f"<component for {table.source or 'a table'}>"
    return instantiate(load_source(source, where), where)
