"""Source text laid out as the ruff formatter lays it out (line length 88), for the few shapes plaforge emits.

An expression is a :data:`Node`: a plain string, a :class:`Call` (``func(args...)`` with an optional trailer such as
``.any()``) or a :class:`Chain` (operands joined by one binary operator). :func:`layout` writes
``prefix + node + suffix`` on one line when it fits, and otherwise splits it the way the formatter does: a call's
arguments on their own indented line, or one per line with trailing commas; a chain inside brackets one operand per
line, operator first. Generated modules and harnesses are checked with ruff's formatter in the tests.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

__all__ = ["LINE_LENGTH", "Call", "Chain", "Node", "flat", "layout", "py_string", "seq_lines"]

LINE_LENGTH = 88
"""Width the generated source is laid out for (the ruff formatter's default)."""


@dataclass(frozen=True, slots=True)
class Call:
    """``func(args...)`` followed by ``tail``."""

    func: str
    args: tuple[Node, ...]
    tail: str = ""  # a trailer after the closing bracket, such as ".any()"


@dataclass(frozen=True, slots=True)
class Chain:
    """``operands`` joined by the binary operator ``op``."""

    op: str
    operands: tuple[Node, ...]


Node = str | Call | Chain


def flat(node: Node) -> str:
    """``node`` written on one line."""
    if isinstance(node, str):
        return node
    if isinstance(node, Call):
        return f"{node.func}({', '.join(flat(a) for a in node.args)}){node.tail}"
    return f" {node.op} ".join(flat(a) for a in node.operands)


def layout(node: Node, indent: int, prefix: str, suffix: str) -> list[str]:
    """Lines for ``prefix + node + suffix`` at ``indent``, split the way the ruff formatter splits them."""
    pad = " " * indent
    one = pad + prefix + flat(node) + suffix
    if len(one) <= LINE_LENGTH or isinstance(node, str):
        return [one]
    if isinstance(node, Chain):  # only reached inside brackets: one operand per line, operator first
        lines = []
        for i, a in enumerate(node.operands):
            last = i == len(node.operands) - 1
            lines += layout(a, indent, prefix if i == 0 else f"{node.op} ", suffix if last else "")
        return lines
    inner = indent + 4
    lines = [pad + prefix + node.func + "("]
    body = ", ".join(flat(a) for a in node.args)
    if len(" " * inner + body) <= LINE_LENGTH:
        lines.append(" " * inner + body)
    elif len(node.args) == 1:
        lines += layout(node.args[0], inner, "", "")
    else:
        for a in node.args:
            lines += layout(a, inner, "", ",")
    lines.append(pad + ")" + node.tail + suffix)
    return lines


def py_string(s: str) -> str:
    """A string literal with the quotes the formatter prefers (double, unless that needs more escapes)."""
    body = s.replace("\\", "\\\\").replace("\n", "\\n").replace("\r", "\\r").replace("\t", "\\t")
    if s.count('"') > s.count("'"):
        return "'" + body.replace("'", "\\'") + "'"
    return '"' + body.replace('"', '\\"') + '"'


def seq_lines(prefix: str, items: Sequence[str], indent: int = 0) -> list[str]:
    """``prefix + (items...)`` on one line when it fits, else one item per line with a trailing comma."""
    pad = " " * indent
    one_line = "(" + ", ".join(items) + ("," if len(items) == 1 else "") + ")"
    if len(pad + prefix + one_line) <= LINE_LENGTH:
        return [pad + prefix + one_line]
    return [pad + prefix + "(", *(pad + "    " + i + "," for i in items), pad + ")"]
