"""Figures of a cover: the ``minimize --json`` contract object and the short human summary."""

from __future__ import annotations

from typing import Any

from ..core.cube import Cover

__all__ = ["cover_summary", "format_summary"]


def cover_summary(cover: Cover) -> dict[str, Any]:
    """The ``minimize --json`` object (docs/conventions.md): exactly the contract keys, in contract order.

    >>> from plaforge.core.cube import Cover, Cube
    >>> s = cover_summary(Cover(("a", "b"), ("y",), (Cube.parse("11"),), method="heuristic"))
    >>> s["rows"], s["terms"], s["literals"], s["terms_total"], s["lower_bound"]
    (1, {'y': 1}, 2, 1, None)
    """
    terms = cover.terms()
    counted = sum(terms.values()) if cover.cost == "per-output" else cover.rows
    return {
        "inputs": cover.n_inputs,
        "outputs": cover.n_outputs,
        "rows": cover.rows,
        "terms": terms,
        "terms_total": sum(terms.values()),
        "literals": cover.literals,
        "method": cover.method,
        "cost": cover.cost,
        "optimal": bool(cover.optimal),
        "lower_bound": int(cover.lower_bound) if cover.lower_bound > 0 or counted == 0 else None,
        "inverted": [name for j, name in enumerate(cover.output_names) if cover.is_inverted(j)],
        "stopped_early": [str(v) for k, v in cover.extra if k.endswith("stopped")],
        "seconds": round(float(cover.seconds), 3),
    }


def format_summary(cover: Cover) -> str:
    """A few lines for people: rows, terms per output, literals, method, optimality or gap, seconds."""
    s = cover_summary(cover)
    if cover.cost == "per-output":
        total = sum(s["terms"].values())
        count = f"{total} product terms counted per output ({s['rows']} distinct rows)"
    else:
        total = s["rows"]
        count = f"{s['rows']} rows (distinct product terms)"
    if s["optimal"]:
        verdict = "proven minimum"
    elif s["lower_bound"] is None:
        verdict = "not proven minimum: no lower bound known"
    else:
        verdict = f"not proven minimum: lower bound {s['lower_bound']}, gap {total - s['lower_bound']}"
    terms = ", ".join(f"{k} {v}" for k, v in s["terms"].items())
    lines = [
        f"{count}, {s['literals']} literals, {s['inputs']} inputs -> {s['outputs']} outputs",
        f"terms per output: {terms}",
    ]
    if s["inverted"]:
        lines.append(f"realized in complement: {', '.join(s['inverted'])}")
    if s["stopped_early"]:
        lines.append(f"stopped early at a limit: {', '.join(s['stopped_early'])}")
    lines.append(f"{s['method']} ({cover.cost} cost): {verdict}; {s['seconds']:.3f} s")
    return "\n".join(lines)
