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
from .core.names import class_name_for, identifier
from .core.network import LutNetwork
from .core.table import Table
from .device import Profile, fit, lut_cones
from .emit.amaranth import module_source
from .emit.gates import GateNetwork, gate_network, gates_module_source
from .emit.gates_verilog import gates_verilog_source
from .emit.harness import harness_source
from .emit.verilog import readable_verilog, renamed_ports, verilog_name
from .formats._files import read_text
from .formats.design import declared_name
from .formats.pla import write_pla
from .lut import LutOptions, map_luts
from .minimize import MinimizeOptions, minimize
from .minimize.hazards import hazard_free_cover
from .verify.hazards import OutputHazards, find_hazards

__all__ = ["STYLES", "BuildOptions", "BuildResult", "DesignNames", "build", "complement_table", "design_names",
           "made_artifact", "realize", "spec_digest", "verilog_header"]

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


def made_artifact(table: Table, path: str | Path, style: str = "sop", *, max_fanin: int = 8,
                  k: int = 6) -> Cover | LutNetwork | GateNetwork:
    """A cover (``.pla``) or LUT network (``.json``) made earlier, checked against ``table``, then realized in
    ``style``: a cover as itself (``sop``), mapped to LUTs (``lut``) or as NAND-NAND gates (``nand``); a LUT network
    as itself (whatever ``style`` says, except the gate styles).

    Raises
    ------
    PlaforgeError
        For another suffix, or a style the artifact cannot give.
    ArtifactError
        If the file cannot be read or is made for other names.
    CheckFailed
        If the artifact does not realize ``table`` (exit status 1), naming the first failing output.
    """
    from .checking import prove, read_network
    from .core.errors import CheckFailed, PlaforgeError
    from .core.names import check_names
    from .formats.pla import read_cover

    p = Path(path)
    suffix = p.suffix.lower()
    if suffix == ".pla":
        artifact: Cover | LutNetwork = read_cover(p)
    elif suffix == ".json":
        artifact = read_network(p)
        if style in ("nand", "nor"):
            raise PlaforgeError(f"--from {p.name}: a LUT network gives a lut module, not --style {style}")
    else:
        raise PlaforgeError(f"--from {p.name}: expected a cover (.pla) or a LUT network (.json)")
    check_names(table, artifact.input_names, artifact.output_names, f"--from {p.name}")
    verdict = prove(table, artifact, name=p.name)
    bad = [o.name for o in verdict.outputs if not o.passed]
    if bad:
        raise CheckFailed(f"--from {p.name} does not realize the spec: {', '.join(bad)} differ; "
                          "plaforge check names a point")
    if isinstance(artifact, LutNetwork) or style == "sop":
        return artifact
    if style == "nor":
        raise PlaforgeError("--style nor minimizes the complement of the spec; a cover of the spec cannot give it")
    return realize(table, style, cover=artifact, k=k, max_fanin=max_fanin)


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
    effort : str
        Heuristic effort: ``"fast"``, ``"normal"`` or ``"high"`` (:class:`plaforge.minimize.MinimizeOptions`).
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
    name : str or None
        Design name (component class, Verilog modules, file stems); None: ``[design] name`` or the spec's stem.
    phase : bool
        Choose each output's polarity to lower the cost (outputs realized inverted).
    device : Profile or None
        Fit the result to this device (:mod:`plaforge.device`); its LUT size replaces ``k``, and when its outputs
        have programmable polarity a phase-assigned cover is tried too.
    reports : bool
        Also write ``report.md`` and ``report.html``.
    registered : bool
        Register every output of the generated modules and Verilog (Amaranth's ``sync`` domain: ports ``clk`` and
        ``rst``); their checks then prove the logic with a one-cycle delay (:mod:`plaforge.checking`).
    """

    k: int = 6
    exact: bool = False
    cost: str = "shared"
    time_limit: float = 60.0
    effort: str = "normal"
    budget_rows: int | None = None
    budget_luts: int | None = None
    verilog: bool = True
    hazard_free: str | None = None
    changing: int | None = None
    gates: tuple[str, ...] = ()
    max_fanin: int = 8
    name: str | None = None
    phase: bool = False
    device: Profile | None = None
    reports: bool = True
    registered: bool = False


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
    device: dict | None = None
    names: DesignNames | None = None
    registered: bool = False

    @property
    def passed(self) -> bool:
        return all(getattr(v, "passed", False) for v in self.verdicts.values())

    @property
    def fits(self) -> bool:
        return all(f["fits"] for f in self.fit.values()) and (self.device is None or self.device["fits"])

    def per_output(self) -> dict[str, dict]:
        """Output name -> product terms feeding it, LUTs in its cone, whether realized inverted."""
        terms = self.cover.terms()
        cones = lut_cones(self.network) if self.network is not None else {}
        return {n: {"terms": terms[n], "luts": cones.get(n, 0), "inverted": self.cover.is_inverted(j)}
                for j, n in enumerate(self.cover.output_names)}

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
            "per_output": self.per_output(),
            "device": self.device,
            "name": self.names.design if self.names is not None else "",
        }
        if self.network is not None:
            obj["luts"] = {
                "k": self.network.k,
                "count": self.network.count,
                "depth": self.network.depth,
                "lower_bounds": dict(self.network.lower_bounds),
            }
        return obj


@dataclass(frozen=True)
class DesignNames:
    """Every name derived from a design's name: file stem, component class, Verilog module, C prefix."""

    design: str
    stem: str
    class_name: str
    module: str


def design_names(table: Table, spec_path: str | Path | None = None, name: str | None = None) -> DesignNames:
    """The names for a design: ``name`` when given, else the TOML spec's ``[design] name``, else the spec's stem.

    All come from the one sanitizer, :func:`plaforge.core.names.identifier` (the class name in CamelCase).
    """
    design = name
    if design is None and spec_path is not None and Path(spec_path).suffix.lower() == ".toml":
        design = declared_name(read_text(Path(spec_path)))
    if design is None:
        design = Path(table.source).stem if table.source else "design"
    stem = identifier(design)
    return DesignNames(design, stem, class_name_for(design), verilog_name(stem))


def verilog_header(table: Table, what: str, source_name: str, digest: str, registered: bool = False) -> list[str]:
    """Header comment lines of a readable Verilog module: source, digest, figures, renamed ports, the caution (its
    registered form for a registered module)."""
    import textwrap

    from .core.caution import caution
    from .emit.plan import REGISTERED_NOTE

    lines = [f"{what}, generated by plaforge from {source_name or 'a table'}."]
    if digest:
        lines.append(f"spec SHA-256 {digest}")
    lines.append(f"{table.n_inputs} inputs, {table.n_outputs} outputs.")
    renamed = renamed_ports(table)
    if renamed:
        lines.append("ports renamed where Verilog or the generated component needs it: "
                     + ", ".join(f"{a} -> {b}" for a, b in renamed))
    if registered:
        lines += textwrap.wrap(REGISTERED_NOTE, 100)
    lines += textwrap.wrap(caution(registered), 100)
    return [ln.replace("\n", " ") for ln in lines]


def _choose_cover(table: Table, options: MinimizeOptions, device: Profile | None, net_k: int) -> Cover:
    """The cover to build on: with a polarity-capable device, the phase-assigned one when only it fits (or misses
    by less)."""
    cover = minimize(table, options)
    if device is None or not device.polarity or options.phase:
        return cover
    plain = fit(device, table, cover, None)
    if plain["fits"]:
        return cover
    from dataclasses import replace

    phased = minimize(table, replace(options, phase=True))
    other = fit(device, table, phased, None)

    def overflow(f: dict) -> int:
        return sum(x["over"] for x in f["limits"]) + sum(o["terms"] - o["available"] for o in f["outputs"].values()
                                                         if not o["fits"])

    return phased if other["fits"] or overflow(other) < overflow(plain) else cover


def _device_fit(table: Table, cover: Cover, net: LutNetwork, device: Profile,
                minimize_options: MinimizeOptions) -> dict:
    first = fit(device, table, cover, net)
    if first["fits"]:
        return first
    comp = None
    if any(not o["fits"] for o in first["outputs"].values()):
        comp = minimize(complement_table(table), minimize_options).terms()
    larger = None
    if any(x["what"] in ("luts", "depth") and not x["fits"] for x in first["limits"]) and net.k < 8:
        larger = map_luts(table, cover, net.k + 1)
    return fit(device, table, cover, net, complement_terms=comp, larger_k=larger)


def build(
    table: Table, out_dir: str | Path, options: BuildOptions | None = None, spec_path: str | Path | None = None
) -> BuildResult:
    """Run every stage on ``table`` and write the artifacts into ``out_dir`` (created if missing).

    ``spec_path``, when given, is the spec file whose SHA-256 the generated modules quote.
    """
    opts = options or BuildOptions()
    out = make_directory(out_dir)
    names = design_names(table, spec_path, opts.name)
    stem = names.stem
    paths = {"cover": out / f"{stem}.pla", "luts": out / f"{stem}.luts.json", "module_sop": out / f"{stem}_sop.py",
             "module_lut": out / f"{stem}_lut.py", "harness": out / f"test_{stem}.py", "verilog": out / f"{stem}.v",
             "verilog_lut": out / f"{stem}_lut.v", "listing": out / f"{stem}.eqn.txt"}
    if opts.reports:
        paths["report_md"] = out / "report.md"
        paths["report_html"] = out / "report.html"
    for style in opts.gates:
        paths[f"module_{style}"] = out / f"{stem}_{style}.py"
        paths[f"verilog_{style}"] = out / f"{stem}_{style}.v"
    if spec_path is not None:  # before any work: no artifact may land on the spec
        refuse_clobbering([("SPEC", spec_path)], [(f"the {key} artifact", p) for key, p in paths.items()])
    if opts.registered:  # before any work: the ports a register stage adds must be free
        from .core.names import ports_of
        from .emit.plan import check_clock_ports

        check_clock_ports(ports_of(table))
    source_name = Path(table.source).name if table.source else ""
    digest = spec_digest(spec_path) if spec_path is not None and Path(spec_path).is_file() else ""
    k = opts.device.lut_size if opts.device is not None and opts.device.lut_size else opts.k

    minimize_options = MinimizeOptions(exact=opts.exact, cost=opts.cost, time_limit=opts.time_limit,
                                       phase=opts.phase, effort=opts.effort)  # type: ignore[arg-type]
    cover = _choose_cover(table, minimize_options, opts.device, k)
    if opts.hazard_free is not None:
        cover = hazard_free_cover(table, cover, scope=opts.hazard_free, changing=opts.changing,
                                  options=minimize_options)
    reg = opts.registered
    res = BuildResult(table, cover, None, names=names, registered=reg)
    res.hazards = find_hazards(table, cover, opts.changing)
    for style in opts.gates:
        gates = realize(table, style, cover=cover, max_fanin=opts.max_fanin, minimize_options=minimize_options)
        res.gates[style] = gates  # type: ignore[assignment]
        text = gates_module_source(table, gates, source_name=source_name, source_digest=digest,  # type: ignore[arg-type]
                                   registered=reg)
        res.artifacts[f"module_{style}"] = write_text_atomic(paths[f"module_{style}"], text)
        res.artifacts[f"verilog_{style}"] = write_text_atomic(
            paths[f"verilog_{style}"], gates_verilog_source(table, gates, f"{stem}_{style}",  # type: ignore[arg-type]
                                                            registered=reg))
        res.verdicts[f"module_{style}"] = check_artifact(table, res.artifacts[f"module_{style}"])
    res.artifacts["cover"] = write_text_atomic(paths["cover"], write_pla(cover, source_name or None))
    from .listing import listing_text

    res.artifacts["listing"] = write_text_atomic(
        paths["listing"], listing_text(table, cover, f"{names.design}: equations of the cover in {stem}.pla"))

    net = realize(table, "lut", cover=cover, k=k)
    res.network = net
    res.artifacts["luts"] = write_text_atomic(paths["luts"], net.to_json())

    sop_src = module_source(table, cover, source_name=source_name, source_digest=digest,
                            class_name=names.class_name, registered=reg)
    res.artifacts["module_sop"] = write_text_atomic(paths["module_sop"], sop_src)
    lut_src = module_source(table, net, source_name=source_name, source_digest=digest,
                            class_name=names.class_name + "Lut", registered=reg)
    res.artifacts["module_lut"] = write_text_atomic(paths["module_lut"], lut_src)
    res.artifacts["harness"] = write_text_atomic(
        paths["harness"], harness_source(table, f"{stem}_sop", source_name=source_name, registered=reg)
    )
    if opts.verilog:
        what = f"{names.module}: {cover.rows} product terms, {cover.literals} literals"
        res.artifacts["verilog"] = write_text_atomic(paths["verilog"], readable_verilog(
            table, cover, names.module, verilog_header(table, what, source_name, digest, reg), registered=reg))
        what = f"{names.module}_lut: {net.count} LUTs of at most {net.k} inputs, depth {net.depth}"
        res.artifacts["verilog_lut"] = write_text_atomic(paths["verilog_lut"], readable_verilog(
            table, net, f"{names.module}_lut", verilog_header(table, what, source_name, digest, reg), registered=reg))

    for key in ("cover", "luts", "module_sop", "module_lut", "verilog", "verilog_lut"):
        if key in res.artifacts:
            res.verdicts[key] = check_artifact(table, res.artifacts[key])

    res.notes.append(
        f"keep the standalone harness in your own tests; it runs with: python -m pytest {res.artifacts['harness']}"
    )
    if reg:
        res.notes.append("the modules and Verilog have registered outputs (clock clk, reset rst): they follow the "
                         "inputs one clock cycle later, and their checks prove the logic with that delay")
    if opts.budget_rows is not None:
        res.fit["rows"] = {"budget": opts.budget_rows, "used": cover.rows, "fits": cover.rows <= opts.budget_rows}
    if opts.budget_luts is not None:
        res.fit["luts"] = {"budget": opts.budget_luts, "used": net.count, "fits": net.count <= opts.budget_luts}
    if opts.device is not None:
        res.device = _device_fit(table, cover, net, opts.device, minimize_options)
    if opts.reports:
        from .report_html import write_reports

        res.artifacts.update(write_reports(res, paths["report_md"], paths["report_html"]))
    return res
