"""Pictures of a result, drawn as self-contained SVG text (no fonts, scripts or files fetched from anywhere).

:func:`term_matrix_svg` draws the cover's product-term matrix: one row per product term, one column per input
(spec order, each bus high bit first) and then one per output. An input cell shows ``1`` (dark), ``0`` (white,
outlined) or nothing tested (pale, a dash); an output cell holds a dot when the term feeds that output, and an
output realized inverted is marked ``~`` in its heading.

:func:`lut_graph_svg` draws the LUT network as a layered graph: the inputs it reads on the left, each LUT in the
column of its level (longest path from an input), the outputs on the right, an edge from each fan-in.
"""

from __future__ import annotations

from html import escape

from .core.cube import Cover
from .core.network import LutNetwork
from .core.table import Table

__all__ = ["lut_graph_svg", "term_matrix_svg"]

_FONT = 'font-family="sans-serif" font-size="11"'


def _svg(width: int, height: int, body: list[str], title: str) -> str:
    return (f'<svg xmlns="http://www.w3.org/2000/svg" width="{width}" height="{height}" '
            f'viewBox="0 0 {width} {height}" role="img" aria-label="{escape(title)}">\n'
            f"<title>{escape(title)}</title>\n" + "\n".join(body) + "\n</svg>\n")


def term_matrix_svg(table: Table, cover: Cover) -> str:
    """The product-term matrix (see the module docs) as SVG text."""
    order = [i for bus in table.input_buses for i in reversed(bus.indices)]
    cell, left = 16, 44
    names = [table.input_names[i] for i in order]
    outs = list(cover.output_names)
    label_h = 8 + 7 * max((len(n) for n in names + outs), default=1)
    gap = 10
    width = left + cell * len(names) + gap + cell * len(outs) + 10
    height = label_h + cell * max(1, cover.rows) + 24
    body = [f'<rect x="0" y="0" width="{width}" height="{height}" fill="#ffffff"/>']
    for c, name in enumerate(names):
        x = left + c * cell + cell // 2 + 4
        body.append(f'<text x="{x}" y="{label_h - 4}" {_FONT} transform="rotate(-90 {x} {label_h - 4})">'
                    f"{escape(name)}</text>")
    ox = left + cell * len(names) + gap
    for j, name in enumerate(outs):
        x = ox + j * cell + cell // 2 + 4
        mark = "~" if cover.is_inverted(j) else ""
        body.append(f'<text x="{x}" y="{label_h - 4}" {_FONT} font-weight="bold" '
                    f'transform="rotate(-90 {x} {label_h - 4})">{escape(mark + name)}</text>')
    for r, cube in enumerate(cover.cubes):
        y = label_h + r * cell
        body.append(f'<text x="4" y="{y + 12}" {_FONT}>t{r}</text>')
        for c, i in enumerate(order):
            x = left + c * cell
            if not cube.care >> i & 1:
                body.append(f'<rect class="dc" x="{x + 1}" y="{y + 1}" width="{cell - 2}" height="{cell - 2}" '
                            'fill="#eeeeee"/>')
                body.append(f'<line x1="{x + 5}" y1="{y + 8}" x2="{x + 11}" y2="{y + 8}" stroke="#aaaaaa"/>')
            elif cube.value >> i & 1:
                body.append(f'<rect class="one" x="{x + 1}" y="{y + 1}" width="{cell - 2}" height="{cell - 2}" '
                            'fill="#22446e"/>')
                body.append(f'<text x="{x + 5}" y="{y + 12}" {_FONT} fill="#ffffff">1</text>')
            else:
                body.append(f'<rect class="zero" x="{x + 1}" y="{y + 1}" width="{cell - 2}" height="{cell - 2}" '
                            'fill="#ffffff" stroke="#22446e"/>')
                body.append(f'<text x="{x + 5}" y="{y + 12}" {_FONT} fill="#22446e">0</text>')
        for j in range(len(outs)):
            x = ox + j * cell
            body.append(f'<rect x="{x + 1}" y="{y + 1}" width="{cell - 2}" height="{cell - 2}" fill="#f7f3e8"/>')
            if cube.outputs >> j & 1:
                body.append(f'<circle class="feeds" cx="{x + cell / 2}" cy="{y + cell / 2}" r="4.5" '
                            'fill="#b5651d"/>')
    body.append(f'<text x="4" y="{height - 8}" {_FONT}>{cover.rows} terms x {len(names)} inputs; dark 1, outlined 0, '
                "pale: not tested; dots: the outputs a term feeds</text>")
    return _svg(max(width, 520), height, body, f"product-term matrix, {cover.rows} terms")


def lut_graph_svg(table: Table, net: LutNetwork) -> str:
    """The LUT network as a layered graph (see the module docs) as SVG text."""
    level: dict[str, int] = {n: 0 for n in net.input_names}
    level["0"] = level["1"] = 0
    for lut in net.luts:
        level[lut.name] = 1 + max((level[i] for i in lut.inputs), default=0)
    used_inputs = [n for n in net.input_names
                   if any(n in lut.inputs for lut in net.luts) or n in net.drivers]
    depth = max((level[lut.name] for lut in net.luts), default=0)
    columns: list[list[str]] = [used_inputs] + [[lut.name for lut in net.luts if level[lut.name] == d]
                                                for d in range(1, depth + 1)]
    col_w, row_h, node_w, node_h = 150, 34, 110, 24
    out_col = len(columns)
    tallest = max([len(c) for c in columns] + [len(net.output_names), 1])
    width = col_w * (out_col + 1) + 20
    height = row_h * tallest + 60
    pos: dict[str, tuple[float, float]] = {}
    for c, names in enumerate(columns):
        for r, name in enumerate(names):
            pos[name] = (10 + c * col_w, 30 + r * row_h)
    inits = {lut.name: lut for lut in net.luts}
    body = [f'<rect x="0" y="0" width="{width}" height="{height}" fill="#ffffff"/>']
    heads = ["inputs"] + [f"level {d}" for d in range(1, depth + 1)] + ["outputs"]
    for c, h in enumerate(heads):
        body.append(f'<text x="{10 + c * col_w}" y="16" {_FONT} font-weight="bold">{h}</text>')
    edges: list[str] = []
    for lut in net.luts:
        x2, y2 = pos[lut.name]
        for f in lut.inputs:
            if f in pos:
                x1, y1 = pos[f]
                edges.append(f'<line class="edge" x1="{x1 + node_w}" y1="{y1 + node_h / 2}" x2="{x2}" '
                             f'y2="{y2 + node_h / 2}" stroke="#8899aa"/>')
    for j, (name, d) in enumerate(zip(net.output_names, net.drivers)):
        x, y = 10 + out_col * col_w, 30 + j * row_h
        if d in pos:
            x1, y1 = pos[d]
            edges.append(f'<line class="edge" x1="{x1 + node_w}" y1="{y1 + node_h / 2}" x2="{x}" '
                         f'y2="{y + node_h / 2}" stroke="#b5651d"/>')
        shown = name if d in pos else f"{name} = {d}"
        body.append(f'<rect class="output" x="{x}" y="{y}" width="{node_w}" height="{node_h}" rx="12" '
                    'fill="#f7f3e8" stroke="#b5651d"/>')
        body.append(f'<text x="{x + 8}" y="{y + 16}" {_FONT}>{escape(shown)}</text>')
    body[1:1] = edges
    for name, (x, y) in pos.items():
        if name in inits:
            lut = inits[name]
            body.append(f'<rect class="lut" x="{x}" y="{y}" width="{node_w}" height="{node_h}" fill="#22446e"/>')
            body.append(f'<text x="{x + 6}" y="{y + 16}" {_FONT} fill="#ffffff">{escape(name)} '
                        f"({len(lut.inputs)} in)</text>")
        else:
            body.append(f'<rect class="input" x="{x}" y="{y}" width="{node_w}" height="{node_h}" fill="#eeeeee" '
                        'stroke="#888888"/>')
            body.append(f'<text x="{x + 6}" y="{y + 16}" {_FONT}>{escape(name)}</text>')
    return _svg(width, height, body, f"LUT network, {net.count} LUTs, depth {net.depth}")
