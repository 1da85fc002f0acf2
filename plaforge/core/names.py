"""Spec names turned into identifiers: ports of generated components, class, module and file names.

One sanitizer, :func:`identifier`, serves every generated name (port, LUT signal, class, Verilog module, file
stem): every character outside ``A-Z a-z 0-9 _`` becomes ``_``; a name that is empty or starts with a digit or
``_`` gets the prefix :data:`PREFIX`; a Python keyword, or a word the caller reserves, gets the suffix ``_``.
:func:`unique_names` then appends ``_2``, ``_3``, ... to later names that still collide.

Ports (as docs/modules.md documents them): each :class:`plaforge.core.table.Bus` of a table becomes one port; a bus
``addr[0]`` .. ``addr[15]`` becomes a 16-bit port ``addr`` whose bit ``i`` carries ``addr[i]``; a single-bit name
becomes a 1-bit port. Port names also avoid Verilog keywords, the members every component has (``signature``,
``metadata``, ``elaborate``) and the names a generated module binds (:data:`GENERATED_FILE_NAMES`); collisions are
resolved inputs first, then outputs, in table order.
"""

from __future__ import annotations

import keyword
import re
from collections.abc import Collection, Iterable
from dataclasses import dataclass

from .errors import ArtifactError
from .table import Table

__all__ = [
    "DEFAULT_CLASS_NAME",
    "GENERATED_FILE_NAMES",
    "PREFIX",
    "VERILOG_KEYWORDS",
    "Port",
    "check_names",
    "class_name_for",
    "identifier",
    "port_name",
    "ports_of",
    "unique_names",
]

PREFIX = "p_"
"""Put before a name that would otherwise be empty or start with a digit or ``_``."""

DEFAULT_CLASS_NAME = "Logic"
"""The component class name when the spec has no file name to derive one from."""

VERILOG_KEYWORDS = frozenset(
    {
        "always", "and", "assign", "automatic", "begin", "buf", "bufif0", "bufif1", "case", "casex", "casez", "cell",
        "cmos", "config", "deassign", "default", "defparam", "design", "disable", "edge", "else", "end", "endcase",
        "endconfig", "endfunction", "endgenerate", "endmodule", "endprimitive", "endspecify", "endtable", "endtask",
        "event", "for", "force", "forever", "fork", "function", "generate", "genvar", "highz0", "highz1", "if",
        "ifnone", "incdir", "include", "initial", "inout", "input", "instance", "integer", "join", "large", "liblist",
        "library", "localparam", "macromodule", "medium", "module", "nand", "negedge", "nmos", "nor", "noshowcancelled",
        "not", "notif0", "notif1", "or", "output", "parameter", "pmos", "posedge", "primitive", "pull0", "pull1",
        "pulldown", "pullup", "pulsestyle_onevent", "pulsestyle_ondetect", "rcmos", "real", "realtime", "reg",
        "release", "repeat", "rnmos", "rpmos", "rtran", "rtranif0", "rtranif1", "scalared", "showcancelled", "signed",
        "small", "specify", "specparam", "strong0", "strong1", "supply0", "supply1", "table", "task", "time", "tran",
        "tranif0", "tranif1", "tri", "tri0", "tri1", "triand", "trior", "trireg", "unsigned", "use", "uwire",
        "vectored", "wait", "wand", "weak0", "weak1", "while", "wire", "wor", "xnor", "xor", "logic", "bit", "byte",
        "int",
    }
)
"""Reserved words of Verilog (and the common SystemVerilog types), avoided by port and module names."""

GENERATED_FILE_NAMES = frozenset(
    {"Cat", "Const", "Module", "Signal", "In", "Out", "wiring", "lut", "m", "terms", "self", "platform"}
)
"""Names a generated module binds at module level or in ``elaborate``."""

_COMPONENT_MEMBERS = frozenset({"signature", "metadata", "elaborate"})
_PORT_RESERVED = VERILOG_KEYWORDS | _COMPONENT_MEMBERS | GENERATED_FILE_NAMES


def identifier(text: str, reserved: Collection[str] = frozenset()) -> str:
    """``text`` as a Python (and Verilog) identifier, by the rules in the module docs.

    Parameters
    ----------
    text : str
        Any name, as a spec or a file gives it.
    reserved : collection of str
        Further words the result may not equal (a ``_`` is appended to them, as to Python keywords).

    Examples
    --------
    >>> identifier("data-ready"), identifier("3v3"), identifier("_x"), identifier("class"), identifier("")
    ('data_ready', 'p_3v3', 'p__x', 'class_', 'p_')
    >>> identifier("wire", {"wire"})
    'wire_'
    """
    s = re.sub(r"[^A-Za-z0-9_]", "_", text)
    if not s or s[0].isdigit() or s[0] == "_":
        s = PREFIX + s
    if keyword.iskeyword(s) or s in reserved:
        s += "_"
    return s


def unique_names(bases: Iterable[str], taken: Iterable[str] = ()) -> tuple[str, ...]:
    """``bases`` made distinct from each other and from ``taken``: a later repeat gets ``_2``, ``_3``, ...

    >>> unique_names(["a_b", "a_b", "c"], taken=["c"])
    ('a_b', 'a_b_2', 'c_2')
    """
    used = set(taken)
    out = []
    for base in bases:
        name, k = base, 1
        while name in used:
            k += 1
            name = f"{base}_{k}"
        used.add(name)
        out.append(name)
    return tuple(out)


@dataclass(frozen=True, slots=True)
class Port:
    """One port of a generated component.

    Parameters
    ----------
    name : str
        The identifier used as the signature member (see the module docs for the mapping).
    spec_name : str
        The bus or single-bit name as the spec gives it.
    direction : str
        ``"in"`` or ``"out"``.
    members : tuple of int
        Table input (or output) index carried by each bit, LSB first.
    scalar : bool
        The spec names a single bit (no ``[i]`` suffix): the port itself is the bit, not ``port[0]``.
    """

    name: str
    spec_name: str
    direction: str
    members: tuple[int, ...]
    scalar: bool

    @property
    def width(self) -> int:
        return len(self.members)


def port_name(spec_name: str) -> str:
    """The port identifier for ``spec_name`` before collision suffixes (see the module docs).

    >>> port_name("addr"), port_name("data-ready"), port_name("3v3"), port_name("wire"), port_name("signature")
    ('addr', 'data_ready', 'p_3v3', 'wire_', 'signature_')
    """
    return identifier(spec_name, _PORT_RESERVED)


def ports_of(table: Table) -> tuple[Port, ...]:
    """Ports of the component for ``table``: inputs then outputs, in bus order, names made unique."""
    buses = [("in", bus) for bus in table.input_buses] + [("out", bus) for bus in table.output_buses]
    names = unique_names(port_name(bus.name) for _, bus in buses)
    return tuple(
        Port(name, bus.name, direction, tuple(bus.indices), bus.scalar and bus.width == 1)
        for name, (direction, bus) in zip(names, buses)
    )


def class_name_for(source_name: str) -> str:
    """CamelCase class name from a spec file name: ``memory_map.toml`` gives ``MemoryMap``.

    The name is then made an identifier (:func:`identifier`, avoiding the names a generated module binds);
    :data:`DEFAULT_CLASS_NAME` when the file name has no letters or digits.

    >>> class_name_for("dir/memory_map.toml"), class_name_for("7seg.pla"), class_name_for("module.toml")
    ('MemoryMap', 'p_7seg', 'Module_')
    """
    stem = re.sub(r"\.[^.]*$", "", source_name.replace("\\", "/").rsplit("/", 1)[-1])
    parts = [p for p in re.split(r"[^A-Za-z0-9]+", stem) if p]
    if not parts:
        return DEFAULT_CLASS_NAME
    return identifier("".join(p[:1].upper() + p[1:] for p in parts), GENERATED_FILE_NAMES | VERILOG_KEYWORDS)


def check_names(table: Table, inputs: Iterable[str], outputs: Iterable[str], what: str) -> None:
    """Require an artifact's input and output names to be the table's, in the same order.

    Raises
    ------
    ArtifactError
        Naming ``what`` and both name lists: an artifact made for another spec cannot be judged against this one.
    """
    inputs, outputs = tuple(inputs), tuple(outputs)
    if inputs != table.input_names or outputs != table.output_names:
        raise ArtifactError(
            f"{what} has inputs {list(inputs)} and outputs {list(outputs)}, but the spec has inputs "
            f"{list(table.input_names)} and outputs {list(table.output_names)}; generate it from this spec"
        )
