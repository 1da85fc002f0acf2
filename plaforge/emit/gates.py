"""Gate-level realizations of a two-level cover: NAND-NAND and NOR-NOR networks of explicit gates.

Styles
------
``nand``
    From a cover: each product term is a NAND of its literals, each output the NAND of its terms' NANDs (the
    textbook NAND-NAND form of a sum of products). An output the cover realizes in complement is the AND of those
    NANDs instead (see below for how an AND is built).
``nor``
    From a cover of the *complement* (the caller minimizes the table with ON and OFF swapped and marks every output
    inverted): each product term of the complement is a NOR of its opposite literals (``NOR(x, ~y) = ~x & y``), each
    output the NOR of those terms (the textbook NOR-NOR form of a product of sums).

Any cover and any inversion mask give a correct network in either style; the two above are the natural pairings.

Gates
-----
Gates are ``nand``, ``nor`` and ``not`` of up to ``max_fanin`` inputs. A wider AND (or OR) becomes a balanced tree
whose levels alternate: ``AND(a, b, c, d) = NOR(NAND(a, b), NAND(c, d))``; a lone member of a split is inverted. A
complemented input literal is one shared inverter. Equal gates are made once (structural hashing), and a double
inversion is removed, so a single-literal output is a wire (or the input's inverter) and a constant output a tie:
neither gets a gate of its own.

Static hazards: for a change of one input every product term changes at most once and in one direction, so the
network keeps the hazard behaviour of its cover (see docs/hazards.md).
"""

from __future__ import annotations

import textwrap
from collections import Counter
from collections.abc import Callable
from dataclasses import dataclass

from ..core.caution import caution
from ..core.cube import Cover
from ..core.names import GENERATED_FILE_NAMES, Port, check_names, class_name_for, identifier, ports_of
from ..core.serial import artifact_lines
from ..core.table import Table
from .layout import LINE_LENGTH, Call, Chain, Node, layout, py_string, seq_lines
from .plan import REGISTERED_NOTE, check_clock_ports

__all__ = ["FANINS", "PACKAGES", "STYLES", "Gate", "GateNetwork", "Ref", "gate_network", "gates_module_source"]

STYLES = ("nand", "nor")
FANINS = (2, 3, 4, 8)
"""Fan-in limits offered on the command line."""

PACKAGES = ((2, 4, "quad"), (3, 3, "triple"), (4, 2, "dual"), (8, 1, "single"))
"""Standard packages of two-level gates: (most inputs, gates per package, word). Gates of 5 to 8 inputs take an
8-input gate with spare inputs tied; inverters come six to a package (hex)."""

INVERTERS_PER_PACKAGE = 6

Ref = tuple[str, int]
"""A signal: ``("in", i)`` table input ``i``, ``("gate", k)`` gate ``k``, ``("const", v)`` a tie to 0 or 1."""


@dataclass(frozen=True, slots=True)
class Gate:
    """One gate: ``kind`` is ``"nand"``, ``"nor"`` or ``"not"``; ``inputs`` are :data:`Ref`."""

    kind: str
    inputs: tuple[Ref, ...]


@dataclass(frozen=True)
class GateNetwork:
    """Gates in topological order, what drives each output, and the cover the network realizes."""

    style: str
    cover: Cover
    gates: tuple[Gate, ...]
    outputs: tuple[Ref, ...]
    max_fanin: int

    def counts(self) -> dict[tuple[str, int], int]:
        """(kind, fan-in) -> number of gates, sorted by kind then fan-in."""
        return dict(sorted(Counter((g.kind, len(g.inputs)) for g in self.gates).items()))

    def levels(self) -> list[int]:
        """Per gate, its level: 1 + the highest level among its gate inputs (inputs and ties are level 0)."""
        lv: list[int] = []
        for g in self.gates:
            lv.append(1 + max((lv[v] for kind, v in g.inputs if kind == "gate"), default=0))
        return lv

    @property
    def depth(self) -> int:
        """Gates on the longest path from an input to an output (0 when every output is a wire or a tie)."""
        lv = self.levels()
        return max((lv[v] for kind, v in self.outputs if kind == "gate"), default=0)

    def packages(self) -> list[tuple[str, int, int]]:
        """Per kind of gate: (description, gates, packages), e.g. ``("2-input NAND gates", 37, 10)``."""
        rows = []
        for (kind, fanin), count in self.counts().items():
            if kind == "not":
                rows.append(("inverters", count, -(-count // INVERTERS_PER_PACKAGE)))
                continue
            per = next((p for most, p, _ in PACKAGES if fanin <= most), 0)
            rows.append((f"{fanin}-input {kind.upper()} gates", count, -(-count // per) if per else 0))
        return rows

    def summary_lines(self) -> list[str]:
        """Plain figures: gates per kind and fan-in with the packages they fill, then the depth."""
        lines = []
        for (kind, fanin), (what, count, packs) in zip(self.counts(), self.packages()):
            if kind == "not":
                lines.append(f"{what}: {count}, packages of six: {packs}")
            elif packs:
                per = next(p for most, p, _ in PACKAGES if fanin <= most)
                word = {4: "four", 3: "three", 2: "two", 1: "one"}[per]
                lines.append(f"{what}: {count}, packages of {word}: {packs}"
                             + (" (8-input gates with spare inputs tied)" if 4 < fanin < 8 else ""))
            else:
                lines.append(f"{what}: {count}, wider than any package")
        lines.append(f"gates: {len(self.gates)}, logic depth: {self.depth}")
        return lines

    def check_table(self, table: Table) -> None:
        """Raise :class:`~plaforge.core.errors.ArtifactError` unless the network's names are the table's."""
        check_names(table, self.cover.input_names, self.cover.output_names, "the gate network")


class _Builder:
    def __init__(self, max_fanin: int) -> None:
        self.k = max_fanin
        self.gates: list[Gate] = []
        self.index: dict[tuple[str, tuple[Ref, ...]], int] = {}

    def gate(self, kind: str, inputs: tuple[Ref, ...]) -> Ref:
        if kind == "not":
            (x,) = inputs
            if x[0] == "const":
                return ("const", 1 - x[1])
            if x[0] == "gate" and self.gates[x[1]].kind == "not":
                return self.gates[x[1]].inputs[0]
        key = (kind, tuple(sorted(set(inputs))))
        if key not in self.index:
            self.index[key] = len(self.gates)
            self.gates.append(Gate(*key))
        return ("gate", self.index[key])

    def literal(self, i: int, positive: bool) -> Ref:
        return ("in", i) if positive else self.gate("not", (("in", i),))

    def tree(self, op: str, signals: list[Ref], negate: bool) -> Ref:
        """``op`` ("and"/"or") of ``signals``, complemented when ``negate``, from gates of at most ``k`` inputs."""
        signals = list(dict.fromkeys(signals))
        if len(signals) == 1:
            return self.gate("not", (signals[0],)) if negate else signals[0]
        if len(signals) <= self.k:
            g = self.gate("nand" if op == "and" else "nor", tuple(signals))
            return g if negate else self.gate("not", (g,))
        parts = -(-len(signals) // self.k)
        size, extra = divmod(len(signals), parts)
        groups, at = [], 0
        for p in range(parts):
            step = size + (1 if p < extra else 0)
            groups.append(signals[at:at + step])
            at += step
        # op(all) = dual(op)(~op(group) for each group), complemented
        children = [self.tree(op, g, True) for g in groups]
        return self.tree("or" if op == "and" else "and", children, not negate)


def gate_network(cover: Cover, style: str, max_fanin: int = 8) -> GateNetwork:
    """The ``style`` network of gates realizing ``cover`` (see the module docs).

    Raises
    ------
    ValueError
        Unknown style, or a fan-in limit below 2.
    """
    if style not in STYLES:
        raise ValueError(f"style must be one of {STYLES}, not {style!r}")
    if max_fanin < 2:
        raise ValueError(f"max_fanin must be at least 2, not {max_fanin!r}")
    b = _Builder(max_fanin)
    outputs: list[Ref] = []
    for j in range(cover.n_outputs):
        inv = cover.is_inverted(j)
        terms = cover.cubes_for(j)
        if any(c.care == 0 for c in terms) or not terms:
            outputs.append(("const", int(bool(terms)) ^ inv))
            continue
        made = []
        for c in terms:
            lits = [(i, bool(c.value >> i & 1)) for i in range(cover.n_inputs) if c.care >> i & 1]
            if style == "nand":
                made.append(b.tree("and", [b.literal(i, pos) for i, pos in lits], True))  # ~term
            else:
                made.append(b.tree("or", [b.literal(i, not pos) for i, pos in lits], True))  # term
        if style == "nand":  # OR(terms) = NAND(~terms)
            outputs.append(b.tree("and", made, not inv))
        else:
            outputs.append(b.tree("or", made, inv))
    # a double inversion removed may leave an inverter nothing reads: keep only the gates the outputs reach
    used: set[int] = set()
    stack = [v for kind, v in outputs if kind == "gate"]
    while stack:
        k = stack.pop()
        if k not in used:
            used.add(k)
            stack += [v for kind, v in b.gates[k].inputs if kind == "gate"]
    new = {k: pos for pos, k in enumerate(sorted(used))}

    def moved(r: Ref) -> Ref:
        return ("gate", new[r[1]]) if r[0] == "gate" else r

    gates = tuple(Gate(b.gates[k].kind, tuple(moved(r) for r in b.gates[k].inputs)) for k in sorted(used))
    return GateNetwork(style, cover, gates, tuple(moved(r) for r in outputs), max_fanin)


# -- the Amaranth module ------------------------------------------------------------------------------------------
def _bit(port: Port, b: int) -> str:
    return f"self.{port.name}" if port.scalar else f"self.{port.name}[{b}]"


def port_refs(table: Table, bit: Callable[[Port, int], str]) -> tuple[list[str], list[str]]:
    """Text of each table input and output: ``bit(port, b)`` for the port and bit that carry it."""
    ins, outs = [""] * table.n_inputs, [""] * table.n_outputs
    for p in ports_of(table):
        for b, idx in enumerate(p.members):
            (ins if p.direction == "in" else outs)[idx] = bit(p, b)
    return ins, outs


def gates_module_source(table: Table, network: GateNetwork, *, source_name: str = "", source_digest: str = "",
                        class_name: str | None = None, registered: bool = False) -> str:
    """A stand-alone Python file: one Amaranth component whose logic is the network's gates, one assignment each.

    The file carries the cover the network realizes as ``PLAFORGE_ARTIFACT`` (as the ``sop`` modules do), for
    readers; ``plaforge check`` proves the gates themselves. With ``registered`` every output is a register in the
    ``sync`` domain loaded from its gate (:data:`plaforge.emit.plan.REGISTERED_NOTE`).

    Raises
    ------
    ArtifactError
        If the network's names are not the table's.
    PlaforgeError
        If ``registered`` and the spec has a port named ``clk`` or ``rst``.
    """
    network.check_table(table)
    if registered:
        check_clock_ports(ports_of(table))
    cover = network.cover
    name = class_name if class_name is not None else class_name_for(source_name or table.source)
    if identifier(name, GENERATED_FILE_NAMES) != name:
        raise ValueError(f"class name {name!r} is not usable; give a Python identifier such as 'AddressDecoder'")
    src = (source_name or table.source or "an unnamed table").replace("\\", "/").replace('"', "'")
    form = "NAND-NAND" if network.style == "nand" else "NOR-NOR"
    doc = [f"Source: {src}", f"SHA-256: {source_digest or 'not recorded'}",
           f"Gates of at most {network.max_fanin} inputs:"]
    doc += ["    " + ln for ln in network.summary_lines()]
    doc += ["Check it against the spec, output by output, with: plaforge check SPEC THIS_FILE.py", "",
            "Ports (spec name -> port; bit i of a bus port is spec bit name[i]):"]
    for p in ports_of(table):
        kind = f"{'In' if p.direction == 'in' else 'Out'}({p.width})"
        doc.append(f"    {p.spec_name if p.scalar else f'{p.spec_name}[0..{p.width - 1}]'} -> {p.name}: {kind}")
    if registered:
        doc += ["", *textwrap.wrap(REGISTERED_NOTE, LINE_LENGTH)]
    doc += ["", *textwrap.wrap(caution(registered), LINE_LENGTH)]
    quotes = '"' * 3
    lines = [f"{quotes}{name}: {form} gates generated by plaforge from {src}.", ""]
    lines += [ln.replace(quotes, "'''") for ln in doc] + [quotes]
    lines += ["", "from amaranth.hdl import Module, Signal", "from amaranth.lib import wiring",
              "from amaranth.lib.wiring import In, Out", "", f'__all__ = ["{name}"]', "",
              "# The cover these gates realize, as data, so a checker can prove it against the spec: a JSON",
              "# header, then one line per cover row (inputs, outputs as in PLA)."]
    lines += seq_lines("PLAFORGE_ARTIFACT = ", [py_string(x) for x in artifact_lines(cover)])
    lines += ["", "", f"class {name}(wiring.Component):", f"    {quotes}{form} gates realizing {src}.{quotes}", ""]
    for p in ports_of(table):
        lines.append(f"    {p.name}: {'In' if p.direction == 'in' else 'Out'}({p.width})")
    lines += ["", "    def elaborate(self, platform):", "        m = Module()"]
    ins, outs = port_refs(table, _bit)  # source text inside ``elaborate``

    def ref(r: Ref) -> str:
        return ins[r[1]] if r[0] == "in" else f"g{r[1]}" if r[0] == "gate" else str(r[1])

    if network.gates:
        lines.append("        # One gate per signal: ~(a & b) is a NAND, ~(a | b) a NOR, ~a an inverter.")
    for k, g in enumerate(network.gates):
        lines.append(f"        g{k} = Signal()")
        args = tuple(ref(r) for r in g.inputs)
        op = "&" if g.kind == "nand" else "|"
        expr: Node = "~" + args[0] if g.kind == "not" else Call("~", (Chain(op, args),))
        lines += layout(Call(f"g{k}.eq", (expr,)), 8, "m.d.comb += ", "")
    if registered:
        lines.append("        # Outputs: registers (sync domain) loaded from gates, inputs or ties at every rising")
        lines.append("        # clock edge: they follow the inputs one clock cycle later.")
    else:
        lines.append("        # Outputs: wires from gates, inputs or ties.")
    for j, r in enumerate(network.outputs):
        lines += layout(Call(f"{outs[j]}.eq", (ref(r),)), 8, f"m.d.{'sync' if registered else 'comb'} += ", "")
    lines.append("        return m")
    return "\n".join(lines) + "\n"
