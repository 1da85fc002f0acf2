"""The import graph of ``plaforge/``, read from the source, and the layer rules it must obey.

Run ``python tests/layering.py`` from the repository root to print the layer of every module and the edges
between layers; ``tests/test_layers.py`` fails on any cycle or any import against the layer order. Every
``import`` counts, including those inside functions and under ``if TYPE_CHECKING``: a lazy import still couples
the two modules. The layers (bottom to top) are drawn in DEVELOPERS.md.
"""

from __future__ import annotations

import ast
import sys
from collections.abc import Iterator
from pathlib import Path

PACKAGE_DIR = Path(__file__).resolve().parent.parent / "plaforge"

#: Bottom to top. A module may import modules of its own layer or of lower layers only; inside the producers'
#: layer a package may not import another producer package (they meet only through core types).
LAYERS: tuple[tuple[str, tuple[str, ...]], ...] = (
    ("core", ("plaforge.core",)),
    ("formats", ("plaforge.formats",)),
    ("verify", ("plaforge.verify",)),
    ("producers", ("plaforge.minimize", "plaforge.lut", "plaforge.emit")),
    ("pipeline", ("plaforge.flow", "plaforge.report", "plaforge.checking", "plaforge.bundled", "plaforge.device",
                  "plaforge.listing", "plaforge.pictures", "plaforge.report_html", "plaforge.batch")),
    ("cli", ("plaforge.cli", "plaforge.__main__")),
    ("api", ("plaforge",)),
)
SEALED_LAYERS = frozenset({"producers"})


def modules() -> dict[str, Path]:
    """Every module of the package by dotted name (a package by its own name, for its ``__init__``)."""
    found = {}
    for f in sorted(PACKAGE_DIR.rglob("*.py")):
        parts = list(f.relative_to(PACKAGE_DIR.parent).with_suffix("").parts)
        if parts[-1] == "__init__":
            parts.pop()
        found[".".join(parts)] = f
    return found


def group_of(mod: str) -> tuple[int, str]:
    """(layer index, top-level group) of a module: the longest matching prefix in :data:`LAYERS`."""
    best: tuple[int, int, str] | None = None
    for idx, (_name, prefixes) in enumerate(LAYERS):
        for prefix in prefixes:
            if mod == prefix or mod.startswith(prefix + "."):
                if best is None or len(prefix) > best[0]:
                    best = (len(prefix), idx, prefix)
    if best is None:
        raise LookupError(f"module {mod!r} is in no layer; add it to LAYERS in tests/layering.py")
    return best[1], best[2]


def _imports(mod: str, path: Path, known: dict[str, Path]) -> Iterator[str]:
    tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
    package = mod if path.name == "__init__.py" else mod.rpartition(".")[0]
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.split(".")[0] == "plaforge":
                    yield alias.name
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package.split(".")
                if node.level > 1:
                    base = base[: len(base) - (node.level - 1)]
                target = ".".join(base + ([node.module] if node.module else []))
            else:
                target = node.module or ""
            if target.split(".")[0] != "plaforge":
                continue
            subs = [f"{target}.{alias.name}" for alias in node.names if f"{target}.{alias.name}" in known]
            yield from subs if subs else [target]


def edges() -> dict[str, set[str]]:
    """Module -> set of plaforge modules it imports (anywhere in its source)."""
    known = modules()
    graph: dict[str, set[str]] = {}
    for mod, path in known.items():
        graph[mod] = set()
        for target in _imports(mod, path, known):
            while target not in known and "." in target:
                target = target.rpartition(".")[0]
            if target != mod:
                graph[mod].add(target)
    return graph


def violations(graph: dict[str, set[str]]) -> list[str]:
    """Every import against the layer order, as ``'a -> b: why'``."""
    out = []
    for src, targets in sorted(graph.items()):
        s_layer, s_group = group_of(src)
        for dst in sorted(targets):
            d_layer, d_group = group_of(dst)
            if d_layer > s_layer:
                out.append(f"{src} -> {dst}: {LAYERS[s_layer][0]} imports the higher layer {LAYERS[d_layer][0]}")
            elif d_layer == s_layer and s_group != d_group and LAYERS[s_layer][0] in SEALED_LAYERS:
                out.append(f"{src} -> {dst}: producers {s_group} and {d_group} may not import each other")
    return out


def cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """Strongly connected components with more than one module (Tarjan's algorithm)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on: set[str] = set()
    found: list[list[str]] = []
    counter = [0]
    sys.setrecursionlimit(max(10_000, sys.getrecursionlimit()))

    def visit(v: str) -> None:
        index[v] = low[v] = counter[0]
        counter[0] += 1
        stack.append(v)
        on.add(v)
        for w in graph.get(v, ()):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            comp = []
            while True:
                w = stack.pop()
                on.discard(w)
                comp.append(w)
                if w == v:
                    break
            if len(comp) > 1:
                found.append(sorted(comp))

    for v in sorted(graph):
        if v not in index:
            visit(v)
    return found


def main() -> int:
    graph = edges()
    print("layer of each module (bottom to top):")
    for idx, (name, _prefixes) in enumerate(LAYERS):
        members = sorted(m for m in graph if group_of(m)[0] == idx)
        print(f"  {idx} {name:9s} {' '.join(members)}")
    between: dict[tuple[str, str], int] = {}
    for src, targets in graph.items():
        for dst in targets:
            a, b = group_of(src)[1], group_of(dst)[1]
            if a != b:
                between[(a, b)] = between.get((a, b), 0) + 1
    print("edges between groups (importer -> imported: number of module imports):")
    for (a, b), count in sorted(between.items()):
        print(f"  {a} -> {b}: {count}")
    bad = violations(graph)
    loops = cycles(graph)
    for line in bad:
        print("VIOLATION", line)
    for loop in loops:
        print("CYCLE", " <-> ".join(loop))
    print("ok: no cycle, no upward import" if not bad and not loops else f"{len(bad)} violations, {len(loops)} cycles")
    return 1 if bad or loops else 0


if __name__ == "__main__":
    raise SystemExit(main())
