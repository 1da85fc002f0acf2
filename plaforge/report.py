"""Human-readable summaries of tables and results (plain text; no layout borrowed from elsewhere)."""

from __future__ import annotations

from .core.caution import CAUTION, caution
from .core.table import Table
from .verify.report import format_vector

__all__ = ["CAUTION", "table_summary"]

#: Most inputs for which ``table_summary`` counts points (it enumerates them).
POINTS_LIMIT = 20


def _fmt_sets(table: Table, j: int) -> str:
    """The sets of output ``j`` as its rows gave them (cube counts; the implicit set is "the rest")."""
    from .listing import plural

    sets = zip(("ON", "DC", "OFF"), (table.on[j], table.dc[j], table.off[j]))
    return ", ".join(f"{label} {'the rest' if s is None else plural(len(s), 'cube')}" for label, s in sets)


def table_summary(table: Table) -> str:
    """Ports, per-output support and ON/DC/OFF sizes as given (cube counts; point counts up to
    :data:`POINTS_LIMIT` inputs), computed from the rows as given without complementing them."""
    from .core.sets import given_point_counts
    from .listing import bit_ranges

    lines = [f"spec {table.source or '(in memory)'}: {table.n_inputs} inputs, {table.n_outputs} outputs"]
    lines.append("  inputs:  " + ", ".join(f"{b.name}" + ("" if b.scalar else f"[{b.width}]")
                                         for b in table.input_buses))
    lines.append("  outputs: " + ", ".join(f"{b.name}" + ("" if b.scalar else f"[{b.width}]")
                                         for b in table.output_buses))
    width = max((len(n) for n in table.output_names), default=4)
    order = [table.input_names[i] for bus in table.input_buses for i in reversed(bus.indices)]
    for j, name in enumerate(table.output_names):
        sup = set(table.support_names(j))
        extra = ""
        if table.n_inputs <= POINTS_LIMIT:
            n_on, n_dc, n_off = given_point_counts(table, j)
            extra = f"; points ON {n_on}, DC {n_dc}, OFF {n_off}"
        shown = ", ".join(bit_ranges([x for x in order if x in sup]))
        lines.append(f"  {name:<{width}}  depends on {len(sup)}: {shown or '(constant)'}")
        lines.append(f"  {'':<{width}}  {_fmt_sets(table, j) if table.n_inputs else ''}{extra}")
    return "\n".join(lines)


def build_report(result: object) -> str:
    """Plain-text account of a build: figures, where each artifact is, and each output's verdict."""
    from .minimize.summary import cover_summary

    r = result  # BuildResult; typed loosely to keep report free of flow imports
    t = r.table  # type: ignore[attr-defined]
    cov = cover_summary(r.cover)  # type: ignore[attr-defined]
    lines = [f"{t.source or 'design'}: {t.n_inputs} inputs, {t.n_outputs} outputs"]
    status = "proven minimum" if cov["optimal"] else f"lower bound {cov['lower_bound']}"
    lines.append(
        f"  cover: {cov['rows']} product terms, {cov['literals']} literals ({cov['method']}, {status}, "
        f"{cov['seconds']:.2f} s)"
    )
    hazards = [h for h in r.hazards if h.transitions]  # type: ignore[attr-defined]
    free = dict(r.cover.extra).get("hazard_free")  # type: ignore[attr-defined]
    if free is not None:
        scope = "care points" if free == "care" else "don't-cares made ON"
        lines.append(f"  hazard-free cover ({scope})")
    if hazards:
        lines.append("  static hazards for single-input changes (plaforge hazards SPEC COVER lists them):")
        for h in hazards:
            lines.append(f"    {h.name}: {h.kind}, {h.pairs} adjacent pairs in {len(h.transitions)} transition cubes")
    else:
        lines.append("  no static hazard for single-input changes between care points")
    for style, g in r.gates.items():  # type: ignore[attr-defined]
        lines.append(f"  {'NAND-NAND' if style == 'nand' else 'NOR-NOR'} gates, at most {g.max_fanin} inputs each:")
        lines += [f"    {ln}" for ln in g.summary_lines()]
    net = r.network  # type: ignore[attr-defined]
    if net is not None:
        lb = net.lower_bounds
        lines.append(
            f"  {net.k}-input LUT network: {net.count} LUTs (lower bound {lb.get('count', '?')}), depth {net.depth} "
            f"(lower bound {lb.get('depth', '?')})"
        )
    for name, f in r.fit.items():  # type: ignore[attr-defined]
        how = f"{f['budget'] - f['used']} spare" if f["fits"] else f"{f['used'] - f['budget']} over"
        lines.append(f"  budget {name}: needs {f['used']}, {f['budget']} available: {how}")
    if getattr(r, "device", None) is not None:
        from .device import fit_lines

        lines += [f"  {ln}" for ln in fit_lines(r.device)]  # type: ignore[attr-defined]
    lines.append("  artifacts:")
    for key, path in r.artifacts.items():  # type: ignore[attr-defined]
        lines.append(f"    {key:<11} {path}")
    lines.append("  checks against the source table:")
    for key, v in r.verdicts.items():  # type: ignore[attr-defined]
        outs = v.outputs
        bad = [o for o in outs if not o.passed]
        methods = sorted({o.method for o in outs})
        if not bad:
            lines.append(f"    {key:<11} all {len(outs)} outputs pass ({', '.join(methods)})")
        else:
            for o in bad:
                p, exp, got = o.failure if o.failure else (0, None, None)
                lines.append(f"    {key:<11} {o.name}: FAIL at {format_vector(t, p)}: expected {exp}, got {got}")
    for note in r.notes:  # type: ignore[attr-defined]
        lines.append(f"  note: {note}")
    lines.append(caution(bool(getattr(r, "registered", False))))
    return "\n".join(lines)
