"""Amaranth components from a Table and the Cover or LutNetwork that realizes it.

Vocabulary
----------
port
    A signature member of the generated :class:`amaranth.lib.wiring.Component`. Each :class:`plaforge.table.Bus`
    of the table becomes one port: a bus ``addr[0]`` .. ``addr[15]`` becomes ``addr: In(16)`` with bit ``i`` of
    the port carrying ``addr[i]``; a single-bit name becomes a 1-bit port.
port name mapping (deterministic)
    Spec names are turned into port names by :func:`port_name`: every character outside ``A-Z a-z 0-9 _`` becomes
    ``_``; a name that is empty or starts with a digit or ``_`` gets the prefix ``p_``; a Python or Verilog keyword,
    or a name the component already uses (``signature``, ``metadata``, ``elaborate``), gets the suffix ``_``; when two
    ports still collide, the later one (inputs first, then outputs, in table order) gets ``_2``, ``_3``, ...
    The mapping is listed in the generated file's docstring.
styles
    ``sop`` (from a :class:`plaforge.cube.Cover`): each distinct product term once, as a named internal signal, each
    output the OR of its terms, complemented where the cover realizes the output inverted. ``lut`` (from a
    :class:`plaforge.core.network.LutNetwork`): each LUT a constant of ``2**k`` bits (its INIT) indexed by the
    concatenation of its fan-ins, the first fan-in as the least significant bit (the INIT convention).

Two ways to the same logic: :func:`module_source` writes a stand-alone, human-readable Python file (formatted as
the ruff formatter would, line length 88, and clean under ``ruff check``), and :func:`build_component` returns the
component in-process for designs that generate their logic at elaboration time. Both interpret one plan
(:class:`LogicPlan`), so they cannot drift apart.

The generated file also carries what it realizes as data (``PLAFORGE_ARTIFACT``: a JSON header line, then one line
per cover row or per LUT) so a checker can prove the cover or network equivalent to the spec beyond the vectors it
simulates; :func:`embedded_artifact` reads it back.
"""

from __future__ import annotations

import json
import keyword
import re
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from ..core.cube import Cover, Cube
from ..core.errors import PlaforgeError
from ..core.network import Lut, LutNetwork, init_hex
from ..core.table import Table

__all__ = [
    "LINE_LENGTH",
    "LogicPlan",
    "Port",
    "build_component",
    "class_name_for",
    "embedded_artifact",
    "module_source",
    "plan_for",
    "port_name",
    "ports_of",
]

LINE_LENGTH = 88
"""Width the generated source is laid out for (the ruff formatter's default)."""

_VERILOG_WORDS = (
    "always and assign automatic begin buf bufif0 bufif1 case casex casez cell cmos config deassign default defparam "
    "design disable edge else end endcase endconfig endfunction endgenerate endmodule endprimitive endspecify "
    "endtable endtask event for force forever fork function generate genvar highz0 highz1 if ifnone incdir include "
    "initial inout input instance integer join large liblist library localparam macromodule medium module nand "
    "negedge nmos nor noshowcancelled not notif0 notif1 or output parameter pmos posedge primitive pull0 pull1 "
    "pulldown pullup pulsestyle_onevent pulsestyle_ondetect rcmos real realtime reg release repeat rnmos rpmos "
    "rtran rtranif0 rtranif1 scalared showcancelled signed small specify specparam strong0 strong1 supply0 "
    "supply1 table task time tran tranif0 tranif1 tri tri0 tri1 triand trior trireg unsigned use uwire vectored "
    "wait wand weak0 weak1 while wire wor xnor xor logic bit byte int"
)
_VERILOG_KEYWORDS = frozenset(_VERILOG_WORDS.split())
_COMPONENT_NAMES = frozenset({"signature", "metadata", "elaborate"})
# Names the generated file itself binds at module level or in ``elaborate``.
_FILE_NAMES = frozenset(
    {"Cat", "Const", "Module", "Signal", "In", "Out", "wiring", "lut", "m", "terms", "self", "platform"}
)


@dataclass(frozen=True, slots=True)
class Port:
    """One port of the generated component.

    Parameters
    ----------
    name : str
        The Python identifier used as the signature member (see the module docs for the mapping).
    spec_name : str
        The bus or single-bit name as the spec gives it.
    direction : str
        ``"in"`` or ``"out"``.
    members : tuple of int
        Table input (or output) index carried by each bit, LSB first.
    scalar : bool
        The spec names a single bit (no ``[i]`` suffix), so expressions use the port itself, not ``port[0]``.
    """

    name: str
    spec_name: str
    direction: str
    members: tuple[int, ...]
    scalar: bool

    @property
    def width(self) -> int:
        return len(self.members)

    def bit_ref(self, b: int) -> str:
        """Source text reaching bit ``b`` of this port inside ``elaborate``."""
        return f"self.{self.name}" if self.scalar else f"self.{self.name}[{b}]"


def port_name(spec_name: str) -> str:
    """A valid port identifier for ``spec_name`` (before collision suffixes; see the module docs).

    >>> port_name("addr"), port_name("data-ready"), port_name("3v3"), port_name("wire"), port_name("signature")
    ('addr', 'data_ready', 'p_3v3', 'wire_', 'signature_')
    """
    s = re.sub(r"[^A-Za-z0-9_]", "_", spec_name)
    if not s or s[0].isdigit() or s[0] == "_":
        s = "p_" + s
    if keyword.iskeyword(s) or s in _VERILOG_KEYWORDS or s in _COMPONENT_NAMES or s in _FILE_NAMES:
        s += "_"
    return s


def ports_of(table: Table) -> tuple[Port, ...]:
    """Ports of the component for ``table``: inputs then outputs, in bus order, names made unique."""
    used: set[str] = set()
    out: list[Port] = []
    for direction, buses in (("in", table.input_buses), ("out", table.output_buses)):
        for bus in buses:
            base = port_name(bus.name)
            name, k = base, 1
            while name in used:
                k += 1
                name = f"{base}_{k}"
            used.add(name)
            out.append(Port(name, bus.name, direction, tuple(bus.indices), bus.scalar and bus.width == 1))
    return tuple(out)


def class_name_for(source_name: str) -> str:
    """CamelCase class name from a spec file name (``memory_map.toml`` -> ``MemoryMap``); ``Logic`` by default."""
    stem = re.sub(r"\.[^.]*$", "", source_name.replace("\\", "/").rsplit("/", 1)[-1])
    parts = [p for p in re.split(r"[^A-Za-z0-9]+", stem) if p]
    name = "".join(p[:1].upper() + p[1:] for p in parts)
    if not name:
        return "Logic"
    if name[0].isdigit():
        name = "Logic" + name
    if keyword.iskeyword(name) or name in _FILE_NAMES or name in _VERILOG_KEYWORDS:
        name += "Logic"
    return name


# -- the plan both emitters interpret ----------------------------------------------------------------------------
Ref = tuple[str, int]
"""A signal reference in a plan: ``("in", i)`` table input ``i``, ``("node", k)`` node ``k``, ``("const", v)``."""


@dataclass(frozen=True, slots=True)
class LogicPlan:
    """What the component computes, independent of how it is written out.

    Parameters
    ----------
    style : str
        ``"sop"`` or ``"lut"``.
    ports : tuple of Port
    nodes : tuple
        ``sop``: product terms as ``(care, value)`` input masks. ``lut``: ``(local_name, fanin_refs, init)``.
    outputs : tuple
        Per table output. ``sop``: ``(term_indices, inverted)``. ``lut``: the driving :data:`Ref`.
    summary : str
        One line of figures for docstrings.
    artifact_lines : tuple of str
        The data lines of ``PLAFORGE_ARTIFACT`` (see :func:`embedded_artifact`).
    """

    style: str
    ports: tuple[Port, ...]
    nodes: tuple[Any, ...]
    outputs: tuple[Any, ...]
    summary: str
    artifact_lines: tuple[str, ...]


def _check_names(table: Table, inputs: Sequence[str], outputs: Sequence[str], what: str) -> None:
    if tuple(inputs) != table.input_names or tuple(outputs) != table.output_names:
        raise PlaforgeError(
            f"the {what} has inputs {list(inputs)} and outputs {list(outputs)}, but the spec has inputs "
            f"{list(table.input_names)} and outputs {list(table.output_names)}; generate it from this spec"
        )


def _sop_plan(table: Table, cover: Cover) -> LogicPlan:
    _check_names(table, cover.input_names, cover.output_names, "cover")
    index: dict[tuple[int, int], int] = {}
    feeds: list[int] = []
    for c in cover.cubes:
        if not c.outputs:
            continue
        key = (c.care, c.value)
        if key not in index:
            index[key] = len(index)
            feeds.append(0)
        feeds[index[key]] |= c.outputs
    terms = tuple(index)
    outs = tuple(
        (tuple(t for t in range(len(terms)) if feeds[t] >> j & 1), cover.is_inverted(j))
        for j in range(cover.n_outputs)
    )
    n = cover.n_inputs
    literals = sum(care.bit_count() for care, _ in terms)
    inverted = [cover.output_names[j] for j in range(cover.n_outputs) if cover.is_inverted(j)]
    proven = "proven minimum" if cover.optimal else "not proven minimum"
    summary = (
        f"sum of products: {len(terms)} shared product terms, {literals} literals, "
        f"{cover.n_outputs} outputs ({cover.method or 'unknown'} cover, {proven})"
    )
    head = {"kind": "cover", "inputs": list(cover.input_names), "outputs": list(cover.output_names),
            "inverted": inverted}
    rows = [
        Cube(care, value).text(n) + " " + "".join("1" if feeds[t] >> j & 1 else "0" for j in range(cover.n_outputs))
        for t, (care, value) in enumerate(terms)
    ]
    return LogicPlan("sop", ports_of(table), terms, outs, summary, (json.dumps(head), *rows))


def _lut_plan(table: Table, net: LutNetwork) -> LogicPlan:
    _check_names(table, net.input_names, net.output_names, "LUT network")
    input_index = {name: i for i, name in enumerate(net.input_names)}
    node_index: dict[str, int] = {}
    used = set(_FILE_NAMES)
    nodes = []

    def ref(name: str, where: str) -> Ref:
        if name in node_index:
            return ("node", node_index[name])
        if name in input_index:
            return ("in", input_index[name])
        if name in ("0", "1"):
            return ("const", int(name))
        raise PlaforgeError(f"{where} refers to {name!r}, which is neither an input nor an earlier LUT")

    for lut in net.luts:
        fanins = tuple(ref(x, f"LUT {lut.name!r}") for x in lut.inputs)
        local = re.sub(r"[^A-Za-z0-9_]", "_", lut.name)
        if not local or local[0].isdigit() or local[0] == "_":
            local = "n_" + local
        if keyword.iskeyword(local) or local.startswith("t") and local[1:].isdigit():
            local += "_"
        base, k = local, 1
        while local in used:
            k += 1
            local = f"{base}_{k}"
        used.add(local)
        node_index[lut.name] = len(nodes)
        nodes.append((local, fanins, lut.init))
    drivers = tuple(ref(d, f"output {o!r}") for o, d in zip(net.output_names, net.drivers))
    summary = (
        f"{net.k}-input LUT network: {net.count} LUTs, depth {net.depth}, {len(net.output_names)} outputs"
        f"{' (' + net.method + ')' if net.method else ''}"
    )
    head = {
        "kind": "luts",
        "k": net.k,
        "inputs": list(net.input_names),
        "outputs": dict(zip(net.output_names, net.drivers)),
    }
    rows = [
        json.dumps({"name": lut.name, "inputs": list(lut.inputs), "init": init_hex(lut.init, len(lut.inputs))})
        for lut in net.luts
    ]
    return LogicPlan("lut", ports_of(table), tuple(nodes), drivers, summary, (json.dumps(head), *rows))


def plan_for(table: Table, artifact: Cover | LutNetwork) -> LogicPlan:
    """The plan realizing ``artifact`` (a Cover for style ``sop``, a LutNetwork for ``lut``) with ``table``'s ports.

    Raises
    ------
    PlaforgeError
        If the artifact's input or output names differ from the table's.
    TypeError
        If ``artifact`` is neither.
    """
    if isinstance(artifact, Cover):
        return _sop_plan(table, artifact)
    if isinstance(artifact, LutNetwork):
        return _lut_plan(table, artifact)
    raise TypeError(f"artifact must be a Cover or a LutNetwork, not {type(artifact).__name__}")


# -- source layout (mimics the ruff formatter for the few statement shapes emitted) -------------------------------
@dataclass(frozen=True, slots=True)
class _Call:
    func: str
    args: tuple[_Node, ...]
    tail: str = ""  # a trailer after the closing bracket, such as ".any()"


@dataclass(frozen=True, slots=True)
class _Chain:
    op: str
    operands: tuple[_Node, ...]


_Node = str | _Call | _Chain


def _flat(node: _Node) -> str:
    if isinstance(node, str):
        return node
    if isinstance(node, _Call):
        return f"{node.func}({', '.join(_flat(a) for a in node.args)}){node.tail}"
    return f" {node.op} ".join(_flat(a) for a in node.operands)


def _layout(node: _Node, indent: int, prefix: str, suffix: str) -> list[str]:
    """Lines for ``prefix + node + suffix`` at ``indent``, split the way the ruff formatter splits them."""
    pad = " " * indent
    one = pad + prefix + _flat(node) + suffix
    if len(one) <= LINE_LENGTH or isinstance(node, str):
        return [one]
    if isinstance(node, _Chain):  # only reached inside brackets: one operand per line, operator first
        lines = []
        for i, a in enumerate(node.operands):
            lines += _layout(a, indent, prefix if i == 0 else f"{node.op} ", suffix if i == len(node.operands) - 1
                             else "")
        return lines
    inner = indent + 4
    lines = [pad + prefix + node.func + "("]
    body = ", ".join(_flat(a) for a in node.args)
    if len(" " * inner + body) <= LINE_LENGTH:
        lines.append(" " * inner + body)
    elif len(node.args) == 1:
        lines += _layout(node.args[0], inner, "", "")
    else:
        for a in node.args:
            lines += _layout(a, inner, "", ",")
    lines.append(pad + ")" + node.tail + suffix)
    return lines


def _pystr(s: str) -> str:
    """A string literal with the quotes the formatter prefers (double, unless that needs more escapes)."""
    body = s.replace("\\", "\\\\").replace("\n", "\\n").replace("\r", "\\r").replace("\t", "\\t")
    if s.count('"') > s.count("'"):
        return "'" + body.replace("'", "\\'") + "'"
    return '"' + body.replace('"', '\\"') + '"'


def _seq_lines(prefix: str, items: Sequence[str], indent: int = 0) -> list[str]:
    """``prefix + (items...)`` on one line when it fits, else one item per line with a trailing comma."""
    pad = " " * indent
    flat = "(" + ", ".join(items) + ("," if len(items) == 1 else "") + ")"
    if len(pad + prefix + flat) <= LINE_LENGTH:
        return [pad + prefix + flat]
    return [pad + prefix + "(", *(pad + "    " + i + "," for i in items), pad + ")"]


def _in_ref(plan: LogicPlan, i: int) -> str:
    for p in plan.ports:
        if p.direction == "in" and i in p.members:
            return p.bit_ref(p.members.index(i))
    raise AssertionError(f"input {i} has no port")  # pragma: no cover - ports_of covers every input


def _out_ref(plan: LogicPlan, j: int) -> str:
    for p in plan.ports:
        if p.direction == "out" and j in p.members:
            return p.bit_ref(p.members.index(j))
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


def _comb(target: str, expr: _Node, module: str = "m") -> list[str]:
    return _layout(_Call(f"{target}.eq", (expr,)), 8, f"{module}.d.comb += ", "")


OR_CHAIN_LIMIT = 16
"""Outputs of more terms are written ``Cat(t0, t1, ...).any()``: an ``|`` chain nests one operator per term, and
Amaranth's tools recurse through that nesting (hundreds of terms would exceed Python's recursion limit)."""


def _or(terms: Sequence[str]) -> _Node:
    if len(terms) > OR_CHAIN_LIMIT:
        return _Call("Cat", tuple(terms), ".any()")
    return terms[0] if len(terms) == 1 else _Chain("|", tuple(terms))


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
            expr: _Node = "1" if not lits else lits[0] if len(lits) == 1 else _Chain("&", tuple(lits))
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
            lines += _comb(local, _Call("lut", args))
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
        The component's class name; derived from ``source_name`` when omitted (see :func:`class_name_for`).

    Returns
    -------
    str
        The file text: deterministic (no dates), laid out as the ruff formatter would at line length 88.

    Raises
    ------
    PlaforgeError
        If ``class_name`` is not a usable identifier, or the artifact's names differ from the table's.
    """
    plan = plan_for(table, artifact)
    name = class_name if class_name is not None else class_name_for(source_name or table.source)
    if not name.isidentifier() or keyword.iskeyword(name) or name in _FILE_NAMES or not name.isascii():
        raise PlaforgeError(f"class name {name!r} is not usable; give a Python identifier such as 'AddressDecoder'")
    many = plan.style == "sop" and any(len(ts) > OR_CHAIN_LIMIT for ts, _ in plan.outputs)
    names = ["Module", "Signal"] + (["Cat", "Const"] if plan.style == "lut" else ["Cat"] if many else [])
    lines = _docstring(plan, table, name, source_name, source_digest)
    lines += ["", f"from amaranth.hdl import {', '.join(sorted(names))}", "from amaranth.lib import wiring",
              "from amaranth.lib.wiring import In, Out", "", f'__all__ = ["{name}"]', ""]
    lines.append("# What this module realizes, as data, so a checker can prove it against the spec: a JSON")
    lines.append("# header, then one line per " + ("cover row (inputs, outputs as in PLA)." if plan.style == "sop"
                                                   else "LUT (INIT as hex, first fan-in least significant)."))
    lines += _seq_lines("PLAFORGE_ARTIFACT = ", [_pystr(x) for x in plan.artifact_lines])
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


# -- in-process component ----------------------------------------------------------------------------------------
def build_component(table: Table, artifact: Cover | LutNetwork | None = None, *, style: str = "sop",
                    k: int = 6) -> Any:
    """The same component :func:`module_source` writes, built in-process (no file, no import).

    Parameters
    ----------
    table : Table
    artifact : Cover or LutNetwork, optional
        What to realize. When omitted it is made from ``table``: ``minimize(table)`` for ``style="sop"``,
        ``map_luts(table, k)`` for ``style="lut"``.
    style : str
        ``"sop"`` or ``"lut"``; only used when ``artifact`` is omitted.
    k : int
        LUT size for ``style="lut"``.

    Returns
    -------
    amaranth.lib.wiring.Component
        With the ports of :func:`ports_of` (same names, widths and directions as the generated file).

    Examples
    --------
    Inside your own ``elaborate``::

        decoder = build_component(table)            # minimized sum of products
        decoder = build_component(table, style="lut", k=4)
        m.submodules.decoder = decoder
        m.d.comb += decoder.addr.eq(self.bus.addr)
    """
    from amaranth.hdl import Cat, Const, Module, Signal
    from amaranth.lib import wiring
    from amaranth.lib.wiring import In, Out

    if artifact is None:
        if style == "sop":
            from ..minimize import minimize

            artifact = minimize(table)
        elif style == "lut":
            from ..lut import map_luts

            artifact = map_luts(table, k)
        else:
            raise ValueError(f"style must be 'sop' or 'lut', not {style!r}")
    plan = plan_for(table, artifact)

    class PlaforgeLogic(wiring.Component):
        """Combinational logic built by plaforge.build_component from a Table."""

        def __init__(self, plan: LogicPlan) -> None:
            self._plan = plan
            super().__init__({p.name: (In if p.direction == "in" else Out)(p.width) for p in plan.ports})

        def elaborate(self, platform: object) -> Module:
            plan = self._plan
            m = Module()
            in_bits: dict[int, Any] = {}
            out_bits: dict[int, Any] = {}
            for p in plan.ports:
                port = getattr(self, p.name)
                for b, idx in enumerate(p.members):
                    (in_bits if p.direction == "in" else out_bits)[idx] = port if p.scalar else port[b]
            if plan.style == "sop":
                terms = []
                if plan.nodes:  # terms in their own module: a simulator settles them before the outputs
                    m.submodules.terms = inner = Module()
                for t, (care, value) in enumerate(plan.nodes):
                    sig = Signal(name=f"t{t}")
                    expr: Any = Const(1, 1)
                    lits = []
                    mask = care
                    while mask:
                        low = mask & -mask
                        i = low.bit_length() - 1
                        lits.append(in_bits[i] if value & low else ~in_bits[i])
                        mask ^= low
                    if lits:
                        expr = lits[0]
                        for lit in lits[1:]:
                            expr = expr & lit
                    inner.d.comb += sig.eq(expr)
                    terms.append(sig)
                for j, (ts, inverted) in enumerate(plan.outputs):
                    if not ts:
                        m.d.comb += out_bits[j].eq(1 if inverted else 0)
                        continue
                    acc: Any = terms[ts[0]]
                    if len(ts) > OR_CHAIN_LIMIT:
                        acc = Cat(*(terms[t] for t in ts)).any()
                    else:
                        for t in ts[1:]:
                            acc = acc | terms[t]
                    if inverted:
                        inv = Signal(name=f"inv{j}")
                        m.d.comb += inv.eq(acc)
                        acc = ~inv
                    m.d.comb += out_bits[j].eq(acc)
            else:
                nodes: list[Any] = []

                def val(r: Ref) -> Any:
                    kind, v = r
                    if kind == "in":
                        return in_bits[v]
                    if kind == "node":
                        return nodes[v]
                    return Const(v, 1)

                for local, fanins, init in plan.nodes:
                    sig = Signal(name=local)
                    m.d.comb += sig.eq(Const(init, 1 << len(fanins)).bit_select(Cat(*(val(r) for r in fanins)), 1))
                    nodes.append(sig)
                for j, r in enumerate(plan.outputs):
                    m.d.comb += out_bits[j].eq(val(r))
            return m

    return PlaforgeLogic(plan)


# -- reading the embedded data back ------------------------------------------------------------------------------
def embedded_artifact(lines: Sequence[str]) -> Cover | LutNetwork:
    """The Cover or LutNetwork a generated file carries in ``PLAFORGE_ARTIFACT``.

    Raises
    ------
    PlaforgeError
        If the data is malformed (a hand-edited file, say).
    """
    try:
        head = json.loads(lines[0])
        if head["kind"] == "cover":
            ins, outs = tuple(head["inputs"]), tuple(head["outputs"])
            inverted = 0
            for name in head["inverted"]:
                inverted |= 1 << outs.index(name)
            cubes = []
            for row in lines[1:]:
                ipart, opart = row.split(" ")
                if len(ipart) != len(ins) or len(opart) != len(outs) or set(opart) - {"0", "1"}:
                    raise ValueError(f"row {row!r} does not fit {len(ins)} inputs and {len(outs)} outputs")
                mask = sum(1 << j for j, ch in enumerate(opart) if ch == "1")
                cubes.append(Cube.parse(ipart, mask))
            return Cover(ins, outs, tuple(cubes), inverted=inverted, method="embedded")
        if head["kind"] == "luts":
            luts = []
            for row in lines[1:]:
                d = json.loads(row)
                luts.append(Lut(d["name"], tuple(d["inputs"]), int(d["init"], 16)))
            outs = head["outputs"]
            return LutNetwork(int(head["k"]), tuple(head["inputs"]), tuple(outs), tuple(luts),
                              tuple(outs[o] for o in outs))
        raise ValueError(f"unknown kind {head['kind']!r}")
    except (ValueError, KeyError, TypeError, IndexError) as exc:
        raise PlaforgeError(f"PLAFORGE_ARTIFACT data is malformed ({exc}); regenerate the module") from None
