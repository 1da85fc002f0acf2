"""The whole path for one spec: minimize, map to LUTs, emit, and check every artifact against the Table.

``build(table, out_dir, options)`` is what ``plaforge build`` and ``plaforge demo`` run. Every artifact is written
atomically, then checked by the verifier, which trusts nothing but the Table. A budget (rows of a PLA device, LUTs of
a fabric region) turns into a fit verdict; a result that does not fit is reported, not hidden.
"""

from __future__ import annotations

import hashlib
import re
from dataclasses import dataclass, field
from pathlib import Path

from .core.cube import Cover
from .core.fileio import write_text_atomic
from .core.network import LutNetwork
from .core.table import Table

__all__ = ["BuildOptions", "BuildResult", "build"]


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
    """

    k: int = 6
    exact: bool = False
    cost: str = "shared"
    time_limit: float = 60.0
    budget_rows: int | None = None
    budget_luts: int | None = None
    verilog: bool = True


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
    base = Path(table.source).stem if table.source else "design"
    s = re.sub(r"[^0-9A-Za-z_]", "_", base)
    return s if s and not s[0].isdigit() else f"d_{s}"


def build(
    table: Table, out_dir: str | Path, options: BuildOptions | None = None, spec_path: str | Path | None = None
) -> BuildResult:
    """Run every stage on ``table`` and write the artifacts into ``out_dir`` (created if missing).

    ``spec_path``, when given, is the spec file whose SHA-256 the generated modules quote.
    """
    from .emit.amaranth import module_source
    from .emit.harness import harness_source
    from .formats.pla import write_pla
    from .lut import map_luts
    from .minimize import MinimizeOptions, minimize
    from .checking import check_artifact

    opts = options or BuildOptions()
    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    stem = _stem(table)
    source_name = Path(table.source).name if table.source else ""
    digest = ""
    if spec_path is not None and Path(spec_path).is_file():
        digest = hashlib.sha256(Path(spec_path).read_bytes()).hexdigest()

    cover = minimize(table, MinimizeOptions(exact=opts.exact, cost=opts.cost, time_limit=opts.time_limit))
    res = BuildResult(table, cover, None)
    res.artifacts["cover"] = write_text_atomic(out / f"{stem}.pla", write_pla(cover, source_name or None))

    net = map_luts(table, opts.k)
    res.network = net
    res.artifacts["luts"] = write_text_atomic(out / f"{stem}.luts.json", net.to_json())

    sop_src = module_source(table, cover, source_name=source_name, source_digest=digest)
    res.artifacts["module_sop"] = write_text_atomic(out / f"{stem}_sop.py", sop_src)
    lut_src = module_source(table, net, source_name=source_name, source_digest=digest)
    res.artifacts["module_lut"] = write_text_atomic(out / f"{stem}_lut.py", lut_src)
    res.artifacts["harness"] = write_text_atomic(
        out / f"test_{stem}.py", harness_source(table, f"{stem}_sop", source_name=source_name)
    )
    if opts.verilog:
        from .emit.verilog import verilog_source

        res.artifacts["verilog"] = write_text_atomic(out / f"{stem}.v", verilog_source(sop_src, stem))

    for key in ("cover", "luts", "module_sop", "module_lut"):
        res.verdicts[key] = check_artifact(table, res.artifacts[key])

    res.notes.append(f"keep the standalone harness in your own tests; it runs with: python -m pytest {res.artifacts['harness']}")
    if opts.budget_rows is not None:
        res.fit["rows"] = {"budget": opts.budget_rows, "used": cover.rows, "fits": cover.rows <= opts.budget_rows}
    if opts.budget_luts is not None:
        res.fit["luts"] = {"budget": opts.budget_luts, "used": net.count, "fits": net.count <= opts.budget_luts}
    return res
