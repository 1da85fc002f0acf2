"""Plain-text reports of verdicts (what ``plaforge check`` prints).

A failing vector is shown port by port as the spec names them: a bus as ``name[W]=0x...`` (its width ``W``, the value
in hex, bit ``i`` being spec bit ``name[i]``), a single bit as ``name=1``, followed by the point number (bit ``i`` of
the point is input ``i`` of the table).

Each output's line gives the care vectors judged for it (points where it is not a don't-care; a simulation's
method adds up the vectors driven: corner + random = total) and says how it was judged: ``proven`` (every point, by
enumeration or by a SAT proof), ``sampled`` (the vectors driven, and no more), or ``refuted`` when a proof found a
counterexample. Under a failing output: its first failing vector and, where the method counts them (enumeration,
simulation), how many of its care vectors fail.
"""

from __future__ import annotations

from ..core.table import Table
from .equivalence import Verdict

__all__ = ["describe_point", "format_vector", "format_verdict", "input_buses"]


def describe_point(
    buses: list[tuple[str, tuple[int, ...], bool]],
    point: int,
) -> str:
    """``point`` as ``port=value`` pairs: a bus as ``name[W]=0x..``, a bit as ``name=1``.

    ``buses`` lists ``(name, indices, scalar)`` per input port, ``indices`` its table
    inputs from its bit 0 up; bit ``i`` of ``point`` is input ``i``. The stand-alone
    harness carries this source, so it uses nothing but the language.
    """
    parts = []
    for name, indices, scalar in buses:
        value = sum((point >> i & 1) << k for k, i in enumerate(indices))
        if scalar and len(indices) == 1:
            parts.append(f"{name}={value}")
        else:
            digits = (len(indices) + 3) // 4
            parts.append(f"{name}[{len(indices)}]=0x{value:0{digits}x}")
    return " ".join(parts) + f" (point {point})"


def input_buses(table: Table) -> list[tuple[str, tuple[int, ...], bool]]:
    """The table's input ports as :func:`describe_point` takes them."""
    return [(bus.name, tuple(bus.indices), bool(bus.scalar)) for bus in table.input_buses]


def format_vector(table: Table, point: int) -> str:
    """The input assignment ``point`` as ``port=value`` pairs, by the spec's buses (:func:`describe_point`).

    >>> from plaforge.core.table import Table
    >>> t = Table.from_function(["a[0]", "a[1]", "en"], ["y"], lambda p: [p == 7])
    >>> format_vector(t, 0b110)
    'a[2]=0x2 en=1 (point 6)'
    """
    return describe_point(input_buses(table), point)


def format_verdict(verdict: Verdict, table: Table) -> str:
    """A per-output report: name, PASS/FAIL, care vectors driven, method, and the first failing vector.

    The first line names the artifact and how many outputs passed; one line per output follows, and under a failing
    output the vector where it fails with the expected and actual values.
    """
    n_pass = sum(o.passed for o in verdict.outputs)
    total = len(verdict.outputs)
    lines = [
        f"{verdict.artifact}: {n_pass} of {total} outputs pass" + ("" if n_pass == total else " - CHECK FAILED")
    ]
    width = max((len(o.name) for o in verdict.outputs), default=4)
    vec_w = max((len(f"{o.vectors:,}") for o in verdict.outputs), default=1)
    for o in verdict.outputs:
        status = "PASS" if o.passed else "FAIL"
        vectors = f"{o.vectors:,}".rjust(vec_w) + " care vectors" if o.vectors else "proof".rjust(vec_w + 13)
        method = o.method if o.passed else o.method.replace("proven:", "refuted:")
        lines.append(f"  {o.name:<{width}}  {status}  {vectors}  {method}")
        if o.failure is not None:
            point, expected, actual = o.failure
            count = "" if o.failures is None else f"; {o.failures:,} of {o.vectors:,} care vectors fail"
            lines.append(
                f"  {'':<{width}}        first failure at {format_vector(table, point)}: "
                f"expected {expected}, got {actual}{count}"
            )
    return "\n".join(lines)
