"""The whole path for one spec: minimize, map to LUTs, emit, and check every artifact against the Table.

``realize(table, style)`` is the one place where a style becomes a producer: ``sop`` is the minimized cover, ``lut``
that cover mapped onto k-input LUTs. ``build(table, out_dir, options)`` is what ``plaforge build`` and ``plaforge
demo`` run; ``plaforge module`` realizes one style. Every artifact is written atomically, then checked by the
verifier, which trusts nothing but the Table: covers and networks point by point or by SAT, modules and the Verilog
by a SAT proof on the gate netlist of their own logic (:func:`plaforge.checking.check_artifact`). A budget (rows of
a PLA device, LUTs of a fabric region) turns into a fit verdict; a result that does not fit is reported, not hidden.
"""

from __future__ import annotations

import hashlib
import os
from dataclasses import dataclass, field
from pathlib import Path

from .checking import check_artifact
from .core.cube import Cover
from .core.fileio import make_directory, refuse_clobbering, write_text_atomic
from .core.names import identifier
from .core.network import LutNetwork
from .core.table import Table
from .emit.amaranth import module_source
from .emit.gates import GateNetwork, gate_network, gates_module_source
from .emit.gates_verilog import gates_verilog_source
from .emit.harness import harness_source
from .emit.verilog import verilog_source
from .formats.pla import write_pla
from .lut import LutOptions, map_luts
from .minimize import MinimizeOptions, minimize
from .minimize.hazards import hazard_free_cover
from .verify.hazards import OutputHazards, find_hazards

__all__ = ["STYLES", "BuildOptions", "BuildResult", "build", "complement_table", "realize", "spec_digest"]

STYLES = ("sop", "lut", "nand", "nor")
"""What :func:`realize` can make: ``sop`` a minimized cover, ``lut`` a k-input LUT network, ``nand`` NAND-NAND
gates from the cover, ``nor`` NOR-NOR gates from a minimized cover of the complement."""


def complement_table(table: Table) -> Table:
    """``table`` with ON and OFF swapped (don't-cares kept): the function a NOR-NOR realization minimizes."""
    return Table(table.input_names, table.output_names, table.off, table.dc, table.on, table.input_buses,
                 table.output_buses, table.source)


def realize(
    table: Table,
    style: str,
    *,
    cover: Cover | None = None,
    k: int = 6,
    max_fanin: int = 8,
    minimize_options: MinimizeOptions | None = None,
    lut_options: LutOptions | None = None,
) -> Cover | LutNetwork | GateNetwork:
    """The artifact realizing ``table`` in ``style``.

    Parameters
    ----------
    table : Table
    style : str
        ``"sop"``: the cover, minimized with ``minimize_options``. ``"lut"``: that cover mapped onto ``k``-input
        LUTs with ``lut_options``.
    cover : Cover, optional
        A cover of ``table`` already made (by an earlier call, say); used instead of minimizing again.
    k : int
        LUT size for ``"lut"``.

    Returns
    -------
    Cover or LutNetwork

    Raises
    ------
    ValueError
        If ``style`` is not one of :data:`STYLES`.
    """
    if style not in STYLES:
        raise ValueError(f"style must be one of {STYLES}, not {style!r}")
    if style == "nor":  # the complement minimized, every output realized inverted
        comp = minimize(complement_table(table), minimize_options)
        return gate_network(comp.with_(inverted=comp.inverted ^ ((1 << table.n_outputs) - 1)), "nor", max_fanin)
    if cover is None:
        cover = minimize(table, minimize_options)
    if style == "sop":
        return cover
    if style == "nand":
        return gate_network(cover, "nand", max_fanin)
    return map_luts(table, cover, k, lut_options)


def spec_digest(path: str | os.PathLike[str]) -> str:
    """SHA-256 hex digest of the spec file's bytes, as generated modules quote it."""
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


@dataclass(frozen=True)
class BuildOptions:
    """What to build and against which budgets.

    Parameters
    ----------
    k : int
        LUT size for the LUT network and the ``lut``-style module.
    exact : bool
        Prove a minimum cover (bounded by ``time_limit``) instead of the heuristic.
    cost : str
        ``"shared"`` or ``"per-output"``.
    time_limit : float
        Seconds for the exact solver.
    budget_rows, budget_luts : int or None
        Device budgets: product-term rows (AND-plane rows) and LUTs. ``None``: no budget.
    verilog : bool
        Also write Verilog through Amaranth's backend.
    hazard_free : {None, "care", "all"}
        Make the cover free of static hazards for single-input changes (:mod:`plaforge.minimize.hazards`).
    changing : int or None
        Bitmask of the inputs that may change, for hazards (None: all).
    gates : tuple of str
        Gate-level styles to write as modules and structural Verilog: ``"nand"``, ``"nor"``.
    max_fanin : int
        Most inputs of a gate in those.
    """

    k: int = 6
    exact: bool = False
    cost: str = "shared"
    time_limit: float = 60.0
    budget_rows: int | None = None
    budget_luts: int | None = None
    verilog: bool = True
    hazard_free: str | None = None
    changing: int | None = None
    gates: tuple[str, ...] = ()
    max_fanin: int = 8


@dataclass
class BuildResult:
    """Artifacts written, figures, and each artifact's verdict per output."""

    table: Table
    cover: Cover
    network: LutNetwork | None
    artifacts: dict[str, Path] = field(default_factory=dict)
    verdicts: dict[str, object] = field(default_factory=dict)
    fit: dict[str, dict] = field(default_factory=dict)
    notes: list[str] = field(default_factory=list)
    hazards: list[OutputHazards] = field(default_factory=list)
    gates: dict[str, GateNetwork] = field(default_factory=dict)

    @property
    def passed(self) -> bool:
        return all(getattr(v, "passed", False) for v in self.verdicts.values())

    @property
    def fits(self) -> bool:
        return all(f["fits"] for f in self.fit.values())

    def to_json_obj(self) -> dict:
        from .minimize.summary import cover_summary

        obj: dict = {
            "spec": self.table.source,
            "inputs": self.table.n_inputs,
            "outputs": self.table.n_outputs,
            "cover": cover_summary(self.cover),
            "artifacts": {k: str(v) for k, v in self.artifacts.items()},
            "checks": {
                name: {o.name: o.passed for o in v.outputs}  # type: ignore[attr-defined]
                for name, v in self.verdicts.items()
            },
            "passed": self.passed,
            "fit": self.fit,
            "notes": self.notes,
            "hazards": {h.name: h.pairs for h in self.hazards},
            "gates": {s: {"gates": len(g.gates), "depth": g.depth, "max_fanin": g.max_fanin}
                      for s, g in self.gates.items()},
        }
        if self.network is not None:
            obj["luts"] = {
                "k": self.network.k,
                "count": self.network.count,
                "depth": self.network.depth,
                "lower_bounds": dict(self.network.lower_bounds),
            }
        return obj


def _stem(table: Table) -> str:
    return identifier(Path(table.source).stem if table.source else "design")


def build(
    table: Table, out_dir: str | Path, options: BuildOptions | None = None, spec_path: str | Path | None = None
) -> BuildResult:
    """Run every stage on ``table`` and write the artifacts into ``out_dir`` (created if missing).

    ``spec_path``, when given, is the spec file whose SHA-256 the generated modules quote.
    """
    opts = options or BuildOptions()
    out = make_directory(out_dir)
    stem = _stem(table)
    paths = {"cover": out / f"{stem}.pla", "luts": out / f"{stem}.luts.json", "module_sop": out / f"{stem}_sop.py",
             "module_lut": out / f"{stem}_lut.py", "harness": out / f"test_{stem}.py", "verilog": out / f"{stem}.v"}
    for style in opts.gates:
        paths[f"module_{style}"] = out / f"{stem}_{style}.py"
        paths[f"verilog_{style}"] = out / f"{stem}_{style}.v"
    if spec_path is not None:  # before any work: no artifact may land on the spec
        refuse_clobbering([("SPEC", spec_path)], [(f"the {key} artifact", p) for key, p in paths.items()])
    source_name = Path(table.source).name if table.source else ""
    digest = spec_digest(spec_path) if spec_path is not None and Path(spec_path).is_file() else ""

    minimize_options = MinimizeOptions(exact=opts.exact, cost=opts.cost, time_limit=opts.time_limit)
    cover = realize(table, "sop", minimize_options=minimize_options)
    if opts.hazard_free is not None:
        cover = hazard_free_cover(table, cover, scope=opts.hazard_free, changing=opts.changing,
                                  options=minimize_options)
    res = BuildResult(table, cover, None)
    res.hazards = find_hazards(table, cover, opts.changing)
    for style in opts.gates:
        gates = realize(table, style, cover=cover, max_fanin=opts.max_fanin, minimize_options=minimize_options)
        res.gates[style] = gates  # type: ignore[assignment]
        text = gates_module_source(table, gates, source_name=source_name, source_digest=digest)  # type: ignore[arg-type]
        res.artifacts[f"module_{style}"] = write_text_atomic(paths[f"module_{style}"], text)
        res.artifacts[f"verilog_{style}"] = write_text_atomic(
            paths[f"verilog_{style}"], gates_verilog_source(table, gates, f"{stem}_{style}"))  # type: ignore[arg-type]
        res.verdicts[f"module_{style}"] = check_artifact(table, res.artifacts[f"module_{style}"])
    res.artifacts["cover"] = write_text_atomic(paths["cover"], write_pla(cover, source_name or None))

    net = realize(table, "lut", cover=cover, k=opts.k)
    res.network = net
    res.artifacts["luts"] = write_text_atomic(paths["luts"], net.to_json())

    sop_src = module_source(table, cover, source_name=source_name, source_digest=digest)
    res.artifacts["module_sop"] = write_text_atomic(paths["module_sop"], sop_src)
    lut_src = module_source(table, net, source_name=source_name, source_digest=digest)
    res.artifacts["module_lut"] = write_text_atomic(paths["module_lut"], lut_src)
    res.artifacts["harness"] = write_text_atomic(
        paths["harness"], harness_source(table, f"{stem}_sop", source_name=source_name)
    )
    if opts.verilog:
        res.artifacts["verilog"] = write_text_atomic(paths["verilog"], verilog_source(sop_src, stem))

    for key in ("cover", "luts", "module_sop", "module_lut", "verilog"):
        if key in res.artifacts:
            res.verdicts[key] = check_artifact(table, res.artifacts[key])

    res.notes.append(
        f"keep the standalone harness in your own tests; it runs with: python -m pytest {res.artifacts['harness']}"
    )
    if opts.budget_rows is not None:
        res.fit["rows"] = {"budget": opts.budget_rows, "used": cover.rows, "fits": cover.rows <= opts.budget_rows}
    if opts.budget_luts is not None:
        res.fit["luts"] = {"budget": opts.budget_luts, "used": net.count, "fits": net.count <= opts.budget_luts}
    return res
