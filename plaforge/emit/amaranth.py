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
for readers and tools; ``plaforge check`` does not trust it: it proves the component's own logic.

With ``registered``, every output is instead a register in Amaranth's ``sync`` domain loaded from that same logic
(``m.d.sync``), so the outputs follow the inputs one clock cycle later; see :data:`plaforge.emit.plan.REGISTERED_NOTE`
for what the file says about it and :mod:`plaforge.verify.sat` for how ``plaforge check`` proves such a module.

``elaborate`` calls helper methods of at most :data:`STATEMENTS_PER_METHOD` statements each, which keeps
elaboration fast (see there); the signals they share are lists (``t[k]`` named ``tk``, ``n[k]`` named as the LUT).
"""

from __future__ import annotations

import textwrap
from collections.abc import Sequence
from typing import Any

from ..core.caution import caution
from ..core.cube import Cover
from ..core.names import GENERATED_FILE_NAMES, Port, class_name_for, identifier
from ..core.network import LutNetwork, init_hex
from ..core.serial import artifact_lines
from ..core.table import Table
from ..verify.component import instantiate, load_source
from .layout import LINE_LENGTH, Call, Chain, Node, layout, py_string, seq_lines
from .plan import REGISTERED_NOTE, LogicPlan, Ref, check_clock_ports, plan_for

__all__ = ["OR_CHAIN_LIMIT", "STATEMENTS_PER_METHOD", "build_component", "module_source"]


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


def _comb(target: str, expr: Node, module: str = "m", domain: str = "comb") -> list[str]:
    return layout(Call(f"{target}.eq", (expr,)), 8, f"{module}.d.{domain} += ", "")


OR_CHAIN_LIMIT = 16
"""Outputs of more terms are written ``Cat(t0, t1, ...).any()``: an ``|`` chain nests one operator per term, and
Amaranth's tools recurse through that nesting (hundreds of terms would exceed Python's recursion limit)."""


def _or(terms: Sequence[str]) -> Node:
    if len(terms) > OR_CHAIN_LIMIT:
        return Call("Cat", tuple(terms), ".any()")
    return terms[0] if len(terms) == 1 else Chain("|", tuple(terms))


STATEMENTS_PER_METHOD = 200
"""Statements per helper method of ``elaborate``. Amaranth records the source line of every statement it is given,
and on Python 3.11 finding a line costs time in proportion to the size of the function it is in; one method for a
cover of a thousand terms took ten times longer to elaborate than the same statements in methods of this size."""


def _sop_groups(plan: LogicPlan, table: Table, out: str = "comb") -> tuple[list[list[str]], list[list[str]]]:
    """Statements (as lines, each a group of one statement) of the product terms and of the outputs (driven in
    domain ``out``)."""
    terms: list[list[str]] = []
    for k, (care, value) in enumerate(plan.nodes):
        feeds = [table.output_names[j] for j, (ts, _) in enumerate(plan.outputs) if k in ts]
        lits = _literals(plan, care, value)
        expr: Node = lits[0] if len(lits) == 1 else Chain("&", tuple(lits))
        terms.append([f"        # t{k} feeds {', '.join(feeds)}"[:LINE_LENGTH].rstrip(), *_comb(f"t[{k}]", expr, "terms")])
    outs: list[list[str]] = []
    for j, (ts, inverted) in enumerate(plan.outputs):
        target = _out_ref(plan, j)
        names = [f"t[{k}]" for k in ts]
        if not names:  # a constant output (see LogicPlan)
            outs.append(_comb(target, "1" if inverted else "0", domain=out))
        elif inverted:
            outs.append([f"        inv{j} = Signal()  # {table.output_names[j]} is realized in complement"[
                :LINE_LENGTH].rstrip(), *_comb(f"inv{j}", _or(names)), *_comb(target, f"~inv{j}", domain=out)])
        else:
            outs.append(_comb(target, _or(names), domain=out))
    return terms, outs


def _lut_groups(plan: LogicPlan, out: str = "comb") -> tuple[list[list[str]], list[list[str]]]:
    """Statements of the LUTs and of the outputs (LUT ``k`` is ``n[k]``; outputs driven in domain ``out``)."""

    def ref_text(r: Ref) -> str:
        kind, v = r
        if kind == "in":
            return _in_ref(plan, v)
        if kind == "node":
            return f"n[{v}]"
        return f"Const({v}, 1)"

    nodes = [_comb(f"n[{k}]", Call("lut", (init_hex(init, len(fanins)), *(ref_text(r) for r in fanins))), "m")
             for k, (_, fanins, init) in enumerate(plan.nodes)]
    outs = [_comb(_out_ref(plan, j), str(r[1]) if r[0] == "const" else ref_text(r), domain=out)
            for j, r in enumerate(plan.outputs)]
    return nodes, outs


def _methods(name: str, groups: list[list[str]], params: str, doc: str) -> tuple[list[str], list[str]]:
    """Helper methods holding ``groups`` (at most :data:`STATEMENTS_PER_METHOD` each), and the lines calling them."""
    chunks = [groups[k : k + STATEMENTS_PER_METHOD] for k in range(0, len(groups), STATEMENTS_PER_METHOD)]
    calls: list[str] = []
    defs: list[str] = []
    for c, chunk in enumerate(chunks):
        method = name if len(chunks) == 1 else f"{name}_{c + 1}"
        calls.append(f"        self.{method}({params})")
        defs += ["", f"    def {method}(self, {params}):", f'        """{doc}"""'[:LINE_LENGTH]]
        defs += [line for group in chunk for line in group]
    return calls, defs


def _class_body(plan: LogicPlan, table: Table, registered: bool = False) -> list[str]:
    """``elaborate`` and its helper methods."""
    lines = ["    def elaborate(self, platform):", "        m = Module()"]
    domain = "sync" if registered else "comb"
    if plan.style == "sop":
        terms, outs = _sop_groups(plan, table, domain)
        calls, defs = [], []
        if terms:
            lines += [
                "        # Product terms, t[k] named tk, each shared by the outputs listed with it. They sit",
                "        # in a submodule of their own so that a simulator settles them in one pass before",
                "        # the outputs (in one module it would evaluate everything twice per change).",
                "        m.submodules.terms = terms = Module()",
                f'        t = [Signal(name=f"t{{k}}") for k in range({len(terms)})]',
            ]
            calls, defs = _methods("_product_terms", terms, "terms, t", "Product terms: each the AND of its literals.")
        o_calls, o_defs = _methods("_outputs", outs, "m, t" if terms else "m",
                                   "Outputs: the OR of their product terms (Cat(...).any() when many)."
                                   if not registered else "Output registers, each loaded with the OR of its terms.")
    else:
        nodes, outs = _lut_groups(plan, domain)
        calls, defs = [], []
        if nodes:
            names = [py_string(local) for local, _, _ in plan.nodes]
            lines.append("        # LUTs: n[k] is LUT k (its name below); INIT indexed by the fan-ins, the first")
            lines.append("        # fan-in as the least significant bit.")
            lines += seq_lines("names = ", names, 8)
            lines.append("        n = [Signal(name=name) for name in names]")
            calls, defs = _methods("_luts", nodes, "m, n", "LUTs, each a constant INIT indexed by its fan-ins.")
        o_calls, o_defs = _methods("_outputs", outs, "m, n" if nodes else "m",
                                   "Output registers, each loaded from its driver." if registered else "Outputs.")
    if registered:
        o_calls = ["        # Outputs: registers in the sync domain (clock clk, reset rst), loaded at every",
                   "        # rising clock edge: they follow the inputs one clock cycle later.", *o_calls]
    return lines + calls + o_calls + ["        return m"] + defs + o_defs


def _docstring(plan: LogicPlan, table: Table, class_name: str, source_name: str, source_digest: str,
               registered: bool = False) -> list[str]:
    src = source_name or table.source or "an unnamed table"
    lines = [
        f'"""{class_name}: {"registered" if registered else "combinational"} logic generated by plaforge from {src}.',
        "",
        f"Source: {src}",
        f"SHA-256: {source_digest or 'not recorded'}",
        f"Realizes: {plan.summary}.",
        "Check it against the spec, output by output, with: plaforge check SPEC THIS_FILE.py",
        "(it proves the logic of this component on every point, from its gate netlist).",
        "",
        "Ports (spec name -> port; bit i of a bus port is spec bit name[i]):",
    ]
    for p in plan.ports:
        kind = f"{'In' if p.direction == 'in' else 'Out'}({p.width})"
        spec = p.spec_name if p.scalar else f"{p.spec_name}[0..{p.width - 1}]"
        lines.append(f"    {spec} -> {p.name}: {kind}")
    if registered:
        lines += ["", *textwrap.wrap(REGISTERED_NOTE, LINE_LENGTH)]
    lines += ["", *textwrap.wrap(caution(registered), LINE_LENGTH),
              "Don't-care points take whatever value the realization gives them.", '"""']
    return [ln.replace("\\", "/").replace('"""', "'''") if 0 < k < len(lines) - 1 else ln
            for k, ln in enumerate(lines)]


def module_source(
    table: Table,
    artifact: Cover | LutNetwork,
    *,
    source_name: str = "",
    source_digest: str = "",
    class_name: str | None = None,
    registered: bool = False,
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
    registered : bool
        Drive every output from a register in Amaranth's ``sync`` domain, loaded from the combinational logic at
        every rising clock edge (:data:`REGISTERED_NOTE`); the component then has the domain's ``clk`` and ``rst``.

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
    PlaforgeError
        If ``registered`` and the spec has a port named ``clk`` or ``rst`` (:func:`plaforge.emit.plan.check_clock_ports`).
    """
    plan = plan_for(table, artifact)
    if registered:
        check_clock_ports(plan.ports)
    name = class_name if class_name is not None else class_name_for(source_name or table.source)
    if identifier(name, GENERATED_FILE_NAMES) != name:
        raise ValueError(f"class name {name!r} is not usable; give a Python identifier such as 'AddressDecoder'")
    many = plan.style == "sop" and any(len(ts) > OR_CHAIN_LIMIT for ts, _ in plan.outputs)
    names = ["Module", "Signal"] + (["Cat", "Const"] if plan.style == "lut" else ["Cat"] if many else [])
    lines = _docstring(plan, table, name, source_name, source_digest, registered)
    lines += ["", f"from amaranth.hdl import {', '.join(sorted(names))}", "from amaranth.lib import wiring",
              "from amaranth.lib.wiring import In, Out", "", f'__all__ = ["{name}"]', ""]
    lines.append("# What this module realizes, as data for readers and tools (a check proves the logic itself): JSON")
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
    lines.append("")
    lines += _class_body(plan, table, registered)
    return "\n".join(lines) + "\n"


def _doc_src(s: str) -> str:
    s = (s or "an unnamed table").replace("\\", "/").replace('"', "'")
    return s


def build_component(table: Table, artifact: Cover | LutNetwork, *, class_name: str | None = None,
                    registered: bool = False) -> Any:
    """The component :func:`module_source` writes, built in-process (the same text, run without a file).

    Parameters
    ----------
    table : Table
    artifact : Cover or LutNetwork
        What to realize; :func:`plaforge.flow.realize` makes one from a table and a style.
    class_name : str, optional
        As for :func:`module_source`.
    registered : bool
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
    source = module_source(table, artifact, class_name=class_name, registered=registered)
    where = f"<component for {table.source or 'a table'}>"
    return instantiate(load_source(source, where), where)
