"""Plain-text reports of verdicts (what ``plaforge check`` prints).

A failing vector is shown port by port as the spec names them: a bus as ``name[W]=0x...`` (its width ``W``, the value
in hex, bit ``i`` being spec bit ``name[i]``), a single bit as ``name=1``, followed by the point number (bit ``i`` of
the point is input ``i`` of the table).

Each output's line says how it was judged: ``proven`` (every point, by enumeration or by a SAT proof), ``sampled``
(the vectors driven, and no more), or ``refuted`` when a proof found a counterexample.
"""

from __future__ import annotations

from ..core.table import Table
from .equivalence import Verdict

__all__ = ["format_vector", "format_verdict"]


def format_vector(table: Table, point: int) -> str:
    """The input assignment ``point`` as ``port=value`` pairs, by the spec's buses.

    >>> from plaforge.table import Table
    >>> t = Table.from_function(["a[0]", "a[1]", "en"], ["y"], lambda p: [p == 7])
    >>> format_vector(t, 0b110)
    'a[2]=0x2 en=1 (point 6)'
    """
    parts = []
    for bus in table.input_buses:
        bits = [point >> i & 1 for i in bus.indices]
        if bus.scalar and bus.width == 1:
            parts.append(f"{bus.name}={bits[0]}")
        else:
            value = sum(b << k for k, b in enumerate(bits))
            parts.append(f"{bus.name}[{bus.width}]=0x{value:0{(bus.width + 3) // 4}x}")
    return " ".join(parts) + f" (point {point})"


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
        vectors = f"{o.vectors:,}".rjust(vec_w) + " vectors" if o.vectors else "proof".rjust(vec_w + 8)
        method = o.method if o.passed else o.method.replace("proven:", "refuted:")
        lines.append(f"  {o.name:<{width}}  {status}  {vectors}  {method}")
        if o.failure is not None:
            point, expected, actual = o.failure
            lines.append(
                f"  {'':<{width}}        first failure at {format_vector(table, point)}: "
                f"expected {expected}, got {actual}"
            )
    return "\n".join(lines)
