"""``report.md`` and ``report.html`` of a build: one account, two renderings.

Both hold the table's figures, the cover (rows, literals, proven minimum or the gap to the lower bound), each
output's terms and LUTs, the fit to a device or budget, every check with ``proven`` or ``sampled``, the equations,
and the cautions. ``report.html`` is one self-contained file: inline CSS, two inline SVG pictures
(:mod:`plaforge.pictures`), no script and nothing fetched from the network. ``report.md`` names the same facts in
Markdown (the pictures are HTML-only). The same build gives the same bytes (no dates, no absolute paths).
"""

from __future__ import annotations

from html import escape
from pathlib import Path

from .core.caution import caution
from .core.fileio import write_text_atomic
from .device import fit_lines
from .listing import equations, plural
from .pictures import lut_graph_svg, term_matrix_svg

__all__ = ["report_sections", "write_reports"]


def _kind(method: str) -> str:
    return method.split(":", 1)[0] if ":" in method else method


def report_sections(res: object) -> list[tuple[str, list[str], list[list[str]]]]:
    """The account as (heading, plain-text lines, table rows with a header row first) per section."""
    r = res  # BuildResult, typed loosely: flow imports this module
    t = r.table  # type: ignore[attr-defined]
    cover = r.cover  # type: ignore[attr-defined]
    net = r.network  # type: ignore[attr-defined]
    sections: list[tuple[str, list[str], list[list[str]]]] = []
    ports_in = ", ".join(b.name + ("" if b.scalar else f"[{b.width - 1}:0]") for b in t.input_buses)
    ports_out = ", ".join(b.name + ("" if b.scalar else f"[{b.width - 1}:0]") for b in t.output_buses)
    sections.append(("The table", [f"source: {t.source or '(in memory)'}",
                                   f"{plural(t.n_inputs, 'input')}: {ports_in}",
                                   f"{plural(t.n_outputs, 'output')}: {ports_out}"], []))
    if cover.optimal:
        status = "proven minimum"
    elif cover.lower_bound:
        status = f"not proven minimum: lower bound {cover.lower_bound}, gap {cover.rows - cover.lower_bound}"
    else:
        status = "not proven minimum (no lower bound known)"
    lines = [f"{plural(cover.rows, 'product term')}, {plural(cover.literals, 'literal')} ({cover.method}; {status})"]
    if net is not None:
        lb = net.lower_bounds
        lines.append(f"LUT network: {plural(net.count, 'LUT')} of at most {net.k} inputs (lower bound "
                     f"{lb.get('count', '?')}), depth {net.depth} (lower bound {lb.get('depth', '?')})")
    rows = [["output", "terms", "LUTs in its cone", "polarity"]]
    for name, o in r.per_output().items():  # type: ignore[attr-defined]
        rows.append([name, str(o["terms"]), str(o["luts"]), "inverted" if o["inverted"] else "as written"])
    sections.append(("The cover and the LUT network", lines, rows))
    fit_text: list[str] = []
    for name, f in r.fit.items():  # type: ignore[attr-defined]
        how = (f"{f['budget'] - f['used']} spare" if f["fits"] else f"{f['used'] - f['budget']} over")
        fit_text.append(f"budget {name}: needs {f['used']}, {f['budget']} available: {how}")
    if r.device is not None:  # type: ignore[attr-defined]
        fit_text += fit_lines(r.device)  # type: ignore[attr-defined]
    sections.append(("Fit", fit_text or ["no device or budget given"], []))
    checks = [["artifact", "output", "verdict", "how"]]
    for key, v in r.verdicts.items():  # type: ignore[attr-defined]
        for o in v.outputs:
            word = _kind(o.method) if o.passed else "FAILED"
            checks.append([key, o.name, word, o.method.split(":", 1)[-1].strip()])
    sections.append(("Checks against the source table", [], checks))
    eq: list[str] = []
    for _name, lines_ in equations(t, cover):
        eq += lines_ + [""]
    sections.append(("Equations", eq[:-1], []))
    arts = [["artifact", "file"]] + [[k, Path(p).name] for k, p in r.artifacts.items()]  # type: ignore[attr-defined]
    sections.append(("Files", [], arts))
    sections.append(("Cautions", [caution(bool(getattr(r, "registered", False)))], []))
    return sections


def _markdown(title: str, sections: list[tuple[str, list[str], list[list[str]]]]) -> str:
    out = [f"# {title}", ""]
    for head, lines, rows in sections:
        out += [f"## {head}", ""]
        if head == "Equations":
            out += ["```"] + lines + ["```", ""]
        elif lines:
            out += [f"- {ln}" if head not in ("Cautions",) else ln for ln in lines] + [""]
        if rows:
            out.append("| " + " | ".join(rows[0]) + " |")
            out.append("|" + "---|" * len(rows[0]))
            out += ["| " + " | ".join(c.replace("|", "\\|") for c in row) + " |" for row in rows[1:]]
            out.append("")
    return "\n".join(out)


_CSS = """body{font-family:sans-serif;max-width:70em;margin:1em auto;padding:0 1em;color:#1d2430}
table{border-collapse:collapse;margin:.5em 0}td,th{border:1px solid #c8ced6;padding:2px 8px;text-align:left}
th{background:#eef1f5}pre{background:#f6f7f9;padding:.6em;overflow-x:auto}.FAILED{color:#a00;font-weight:bold}
figure{margin:1em 0;overflow-x:auto}figcaption{font-size:90%;color:#444}.caution{border-left:4px solid #b5651d;
padding-left:.8em}"""


def _html(title: str, sections: list[tuple[str, list[str], list[list[str]]]], pictures: list[tuple[str, str]]) -> str:
    out = ["<!DOCTYPE html>", '<html lang="en">', "<head>", '<meta charset="utf-8">',
           f"<title>{escape(title)}</title>", f"<style>{_CSS}</style>", "</head>", "<body>",
           f"<h1>{escape(title)}</h1>"]
    for head, lines, rows in sections:
        out.append(f"<h2>{escape(head)}</h2>")
        if head == "Equations":
            out.append("<pre>" + escape("\n".join(lines)) + "</pre>")
        elif head == "Cautions":
            out += [f'<p class="caution">{escape(ln)}</p>' for ln in lines]
        elif lines:
            out.append("<ul>" + "".join(f"<li>{escape(ln)}</li>" for ln in lines) + "</ul>")
        if rows:
            out.append("<table>")
            out.append("<tr>" + "".join(f"<th>{escape(c)}</th>" for c in rows[0]) + "</tr>")
            for row in rows[1:]:
                out.append("<tr>" + "".join(f'<td class="{escape(c)}">{escape(c)}</td>' if c == "FAILED" else
                                            f"<td>{escape(c)}</td>" for c in row) + "</tr>")
            out.append("</table>")
        if head == "The cover and the LUT network":
            for caption, svg in pictures:
                out.append(f"<figure>{svg}<figcaption>{escape(caption)}</figcaption></figure>")
    out += ["</body>", "</html>", ""]
    return "\n".join(out)


def write_reports(res: object, md_path: str | Path, html_path: str | Path) -> dict[str, Path]:
    """Write both reports of a build; returns ``{"report_md": path, "report_html": path}``."""
    names = res.names  # type: ignore[attr-defined]
    title = f"{names.design if names is not None else 'design'}: build report"
    sections = report_sections(res)
    pictures = [("The product-term matrix: one row per term; inputs, then the outputs each term feeds.",
                 term_matrix_svg(res.table, res.cover))]  # type: ignore[attr-defined]
    if res.network is not None:  # type: ignore[attr-defined]
        pictures.append(("The LUT network by level: inputs on the left, outputs on the right.",
                         lut_graph_svg(res.table, res.network)))  # type: ignore[attr-defined]
    return {"report_md": write_text_atomic(md_path, _markdown(title, sections)),
            "report_html": write_text_atomic(html_path, _html(title, sections, pictures))}
