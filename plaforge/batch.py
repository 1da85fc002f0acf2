"""Several specs at once: a process pool, one outcome per spec, the worst status wins.

``expand_specs`` turns the command line's paths into specs (a directory: every ``.pla``/``.csv``/``.toml`` in it,
sorted by name). ``run_many`` runs one task per spec with ``jobs`` worker processes (``jobs == 1``: in this process,
one after another) and returns one :class:`SpecOutcome` per spec in the order given; a spec whose task raises a
:class:`PlaforgeError` records its exit status and one-line message, and the others still run. Three tasks use it:
``build_many`` (each spec into its own subfolder), ``minimize_many`` and ``luts_many`` (one file per spec in an
output directory, named by :func:`batch_paths`). ``worst_error`` is the error the whole batch exits with: the worst
status by severity (4 > 3 > 2 > 1).

``minimize_spec`` and ``luts_spec`` are the work on one spec, shared by the single-spec commands and the batches.
"""

from __future__ import annotations

from collections.abc import Callable
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field, replace
from functools import partial
from pathlib import Path
from typing import Any

from .core.errors import (
    EXIT_BAD_INPUT,
    EXIT_CHECK_FAILED,
    EXIT_INTERNAL,
    EXIT_LIMIT,
    EXIT_OK,
    CheckFailed,
    InternalError,
    LimitReached,
    PlaforgeError,
)
from .core.fileio import make_directory, refuse_clobbering, write_text_atomic
from .core.names import identifier
from .flow import BuildOptions, build, design_names
from .formats._files import read_text
from .formats.design import declared_name

__all__ = ["SPEC_SUFFIXES", "LutsJob", "MinimizeJob", "SpecOutcome", "batch_paths", "build_many", "cover_text",
           "expand_specs", "luts_many", "luts_spec", "minimize_many", "minimize_spec", "run_many", "spec_stem",
           "worst_error"]

SPEC_SUFFIXES = (".pla", ".csv", ".toml")


@dataclass(frozen=True)
class SpecOutcome:
    """What became of one spec: its exit status, where its output went, and a one-line account.

    ``folder`` is the folder built into (``build``) or the main file written (``minimize``, ``luts``; ``None`` when
    nothing is written), printed in JSON under ``key``. ``obj`` is the command's JSON object for the spec (``None``
    when the spec failed before a result existed). ``sort_keys``: the JSON object's keys sorted (``build``) or in
    the order of ``obj`` followed by ``spec``, ``key``, ``status``, ``error``.
    """

    spec: str
    folder: str | None
    status: int
    line: str
    obj: dict | None = None
    error: str | None = None
    key: str = "folder"
    sort_keys: bool = True

    def to_json_obj(self) -> dict:
        base = dict(self.obj) if self.obj is not None else {}
        base.setdefault("spec", self.spec)
        base.update({self.key: self.folder, "status": self.status, "error": self.error})
        return dict(sorted(base.items())) if self.sort_keys else base


def expand_specs(paths: list[str] | tuple[str, ...]) -> list[str]:
    """The specs named by ``paths`` in the order given; a directory stands for its spec files sorted by name.

    Raises
    ------
    PlaforgeError
        If a directory holds no spec file.
    """
    specs: list[str] = []
    for p in paths:
        path = Path(p)
        if path.is_dir():
            found = sorted((f for f in path.iterdir() if f.is_file() and f.suffix.lower() in SPEC_SUFFIXES),
                           key=lambda f: f.name)
            if not found:
                raise PlaforgeError(f"{p}: a directory with no .pla, .csv or .toml file")
            specs += [str(f) for f in found]
        else:
            specs.append(p)
    return specs


def spec_stem(spec: str, name: str | None = None) -> str:
    """The file stem a build of ``spec`` names its artifacts by (as :func:`plaforge.flow.design_names`), without
    reading the whole spec. An unreadable TOML file falls back to its file stem; building it reports the error."""
    design = name
    if design is None and Path(spec).suffix.lower() == ".toml":
        try:
            design = declared_name(read_text(Path(spec)))
        except (PlaforgeError, OSError):
            design = None
    return identifier(design if design is not None else Path(spec).stem)


def _folders(specs: list[str], out: Path, name: str | None) -> list[Path]:
    stems = [spec_stem(s, name) for s in specs]
    _refuse_same_stem(specs, stems, lambda first, spec, stem: f"{first} and {spec} both build into {out / stem}; "
                      "build them separately or give one a [design] name")
    return [out / s for s in stems]


def _refuse_same_stem(specs: list[str], stems: list[str], message: Callable[[str, str, str], str]) -> None:
    """Raise ``PlaforgeError(message(first spec, second spec, stem))`` when two specs share a design stem."""
    seen: dict[str, str] = {}
    for spec, stem in zip(specs, stems):
        if stem in seen:
            raise PlaforgeError(message(seen[stem], spec, stem))
        seen[stem] = spec


# --- the pool ------------------------------------------------------------------------------------------------------

Task = Callable[[str, Any], SpecOutcome]


def _failed(spec: str, target: Any, status: int, msg: str, key: str, sort_keys: bool) -> SpecOutcome:
    folder = target if isinstance(target, str) or target is None else target[0]
    return SpecOutcome(spec, folder, status, f"{spec}: {msg}", None, msg, key, sort_keys)


def _guarded(task: Task, key: str, sort_keys: bool, spec: str, target: Any) -> SpecOutcome:
    """``task(spec, target)``; a user error or a bug becomes the outcome's status and message instead of raising."""
    try:
        return task(spec, target)
    except InternalError as exc:
        return _failed(spec, target, EXIT_INTERNAL, f"internal error, please report: {exc}", key, sort_keys)
    except PlaforgeError as exc:
        return _failed(spec, target, exc.exit_code, str(exc), key, sort_keys)
    except Exception as exc:  # noqa: BLE001 -- a bug: reported for this spec, the others go on
        msg = f"internal error, please report: {type(exc).__name__}: {exc}"
        return _failed(spec, target, EXIT_INTERNAL, msg, key, sort_keys)


def run_many(specs: list[str], targets: list[Any], task: Task, *, jobs: int = 1, key: str = "folder",
             sort_keys: bool = True) -> list[SpecOutcome]:
    """``task(spec, target)`` for every spec with ``jobs`` processes; outcomes in the order of ``specs``.

    ``task`` must be picklable (a module-level function or a :func:`functools.partial` of one) when ``jobs > 1``;
    ``key`` and ``sort_keys`` shape the outcome of a spec whose task raised (see :class:`SpecOutcome`). Never raises
    for a spec's error: a spec that fails, or whose worker process dies, becomes an outcome with its status.
    """
    run = partial(_guarded, task, key, sort_keys)
    if jobs <= 1 or len(specs) <= 1:
        return [run(s, t) for s, t in zip(specs, targets)]
    outcomes: list[SpecOutcome] = []
    with ProcessPoolExecutor(max_workers=min(jobs, len(specs))) as pool:
        futures = [pool.submit(run, s, t) for s, t in zip(specs, targets)]
        for spec, target, fut in zip(specs, targets, futures):
            try:
                outcomes.append(fut.result())
            except Exception as exc:  # noqa: BLE001 -- the worker died: this spec's result is lost
                msg = f"internal error, please report: {type(exc).__name__}: {exc}"
                outcomes.append(_failed(spec, target, EXIT_INTERNAL, msg, key, sort_keys))
    return outcomes


# --- build ------------------------------------------------------------------------------------------------------

def _build_one(options: BuildOptions, changing: str | None, spec: str, folder: str) -> SpecOutcome:
    """Build one spec into ``folder``."""
    from .formats import read_spec
    from .verify.hazards import changing_mask

    table = read_spec(spec)
    opts = options if changing is None else replace(options, changing=changing_mask(table, changing))
    res = build(table, folder, opts, spec_path=spec)
    checks = len(res.verdicts)
    net = res.network
    luts = f", {net.count} {net.k}-input LUTs in depth {net.depth}" if net is not None else ""
    text = f"{spec}: {folder}: {res.cover.rows} product terms{luts}; {checks} checks "
    if not res.passed:
        status, error = EXIT_CHECK_FAILED, "an artifact does not match the spec"
        text += "FAIL"
    elif not res.fits:
        status, error = EXIT_CHECK_FAILED, "the result does not fit the stated device or budget"
        text += "pass; does not fit"
    else:
        status, error = EXIT_OK, None
        text += "pass"
    return SpecOutcome(spec, folder, status, text, res.to_json_obj(), error)


def build_many(specs: list[str], out: str | Path, options: BuildOptions, *, changing: str | None = None,
               jobs: int = 1) -> list[SpecOutcome]:
    """Build every spec into ``out/<stem>`` with ``jobs`` processes; outcomes in the order of ``specs``.

    ``changing`` is the ``--changing`` text, resolved against each spec's own inputs.

    Raises
    ------
    PlaforgeError
        Before any work, when two specs would build into the same subfolder.
    """
    folders = [str(f) for f in _folders(specs, Path(out), options.name)]
    return run_many(specs, folders, partial(_build_one, options, changing), jobs=jobs)


# --- minimize and luts: one file per spec -----------------------------------------------------------------------

def batch_paths(specs: list[str], dirs: dict[str, tuple[str | None, str]]) -> dict[str, list[str | None]]:
    """The file each spec writes for each output option given a directory, named after the spec's design.

    ``dirs`` maps an option (``"-o"``, ``"--c-header"``, ...) to ``(directory or None, suffix)``; the file is
    ``directory/<stem><suffix>`` with ``<stem>`` the design's file stem (:func:`spec_stem`). An option given no
    directory writes nothing (``None`` for every spec).

    Raises
    ------
    PlaforgeError
        Before any work: two specs with one stem while some file is written, a file that would land on a spec (any
        of them) or on another output, or a directory that cannot be created.
    """
    stems = [spec_stem(s) for s in specs]
    paths: dict[str, list[str | None]] = {}
    for opt, (directory, suffix) in dirs.items():
        paths[opt] = [None if directory is None else str(Path(directory) / f"{stem}{suffix}") for stem in stems]
    if any(directory is not None for directory, _ in dirs.values()):
        _refuse_same_stem(specs, stems, lambda first, spec, stem: f"{first} and {spec} both have the design name "
                          f"{stem!r}, so their files would have one name; run them separately or give one a "
                          "[design] name")
        refuse_clobbering([("SPEC", s) for s in specs],
                          [(opt, p) for opt, ps in paths.items() for p in ps if p is not None])
        for directory, _ in dirs.values():
            if directory is not None:
                make_directory(directory)
    return paths


def cover_text(cover: Any, spec: str | None, name: str) -> str:
    """The PLA text ``minimize`` writes: :func:`plaforge.formats.pla.write_pla` with the design name as a third
    comment line after the first two (``# design NAME``)."""
    from .formats.pla import write_pla

    lines = write_pla(cover, spec).split("\n")
    lines.insert(2, f"# design {name}")
    return "\n".join(lines)


@dataclass(frozen=True)
class MinimizeJob:
    """What ``minimize`` does with each spec: the options, ``--hazard-free`` and ``--changing`` (text, resolved
    against each spec's inputs), ``--name`` (``None``: ``[design] name``, else the file stem) and ``--device``."""

    options: Any  # MinimizeOptions
    hazard_free: str | None = None
    changing: str | None = None
    name: str | None = None
    profile: Any = None  # device.Profile


@dataclass
class MinimizeResult:
    table: Any
    cover: Any
    name: str
    added: list = field(default_factory=list)
    fit: dict | None = None

    def to_json_obj(self) -> dict:
        """The ``minimize --json`` object: the cover's figures, then ``name``."""
        from .minimize import cover_summary

        obj = cover_summary(self.cover)
        obj["name"] = self.name
        return obj


def minimize_spec(spec: str, job: MinimizeJob, out: str | None = None) -> MinimizeResult:
    """Read ``spec``, minimize it as ``job`` says, write the cover to ``out`` (when given) and fit the device."""
    from .device import fit
    from .formats import read_spec
    from .minimize import minimize

    table = read_spec(spec)
    name = design_names(table, spec, job.name).design
    cover = minimize(table, job.options)
    added: list = []
    if job.hazard_free is not None:
        from .minimize.hazards import added_terms, hazard_free_cover
        from .verify.hazards import changing_mask

        ordinary = cover
        cover = hazard_free_cover(table, cover, scope=job.hazard_free, changing=changing_mask(table, job.changing),
                                  options=job.options)
        added = added_terms(ordinary, cover)
    if out is not None:
        write_text_atomic(out, cover_text(cover, spec, name))
    result = fit(job.profile, table, cover, None) if job.profile is not None else None
    return MinimizeResult(table, cover, name, added, result)


def _minimize_one(job: MinimizeJob, spec: str, out: str | None) -> SpecOutcome:
    res = minimize_spec(spec, job, out)
    c = res.cover
    text = f"{spec}: {c.rows} rows, {c.literals} literals, {c.method}" + (", proven minimum" if c.optimal else "")
    if job.hazard_free is not None:
        text += f", {len(res.added)} terms added for static hazards"
    if out is not None:
        text += f"; written to {out}"
    status, error = EXIT_OK, None
    if res.fit is not None:
        if res.fit["fits"]:
            text += f"; fits device {job.profile.name}"
        else:
            status, error = EXIT_CHECK_FAILED, f"the cover does not fit device {job.profile.name}"
            text += f"; does not fit device {job.profile.name}"
    return SpecOutcome(spec, out, status, text, res.to_json_obj(), error, "output", False)


def minimize_many(specs: list[str], out_dir: str | None, job: MinimizeJob, *, jobs: int = 1) -> list[SpecOutcome]:
    """Minimize every spec with ``jobs`` processes, each cover written to ``out_dir/<stem>.pla`` when ``out_dir``
    is given; outcomes in the order of ``specs`` (the JSON object of each: the ``minimize --json`` object, then
    ``spec``, ``output``, ``status``, ``error``).

    Raises
    ------
    PlaforgeError
        Before any work, as :func:`batch_paths`.
    """
    outs = batch_paths(specs, {"-o": (out_dir, ".pla")})["-o"]
    return run_many(specs, outs, partial(_minimize_one, job), jobs=jobs, key="output", sort_keys=False)


@dataclass(frozen=True)
class LutsJob:
    """What ``luts`` does with each spec: LUT size, mapper options, ``--pad`` (for the exports), ``--name``."""

    k: int = 6
    options: Any = None  # LutOptions
    pad: bool = False
    name: str | None = None


def luts_spec(spec: str, job: LutsJob, out: str | None = None, c_header_path: str | None = None,
              verilog_path: str | None = None) -> tuple[Any, Any, str]:
    """Read ``spec``, map it onto ``job.k``-input LUTs and write the files given.

    Returns ``(table, network, design name)``; the C header and the Verilog module carry the padded network with
    ``job.pad``.
    """
    from .core.names import ports_of
    from .formats import read_spec
    from .lut import c_header, map_luts
    from .lut.export import padded_network
    from .lut.netlist import verilog_netlist
    from .minimize import minimize

    table = read_spec(spec)
    name = design_names(table, spec, job.name).design
    net = map_luts(table, minimize(table), job.k, job.options)
    if out is not None:
        write_text_atomic(out, net.to_json())
    shown = padded_network(net) if job.pad else net
    if c_header_path is not None:
        write_text_atomic(c_header_path, c_header(shown, name))
    if verilog_path is not None:
        write_text_atomic(verilog_path, verilog_netlist(shown, ports_of(table), name))
    return table, net, name


def _luts_one(job: LutsJob, spec: str, target: tuple[str | None, str | None, str | None]) -> SpecOutcome:
    out, hdr, vlog = target
    _table, net, name = luts_spec(spec, job, out, hdr, vlog)
    text = f"{spec}: {net.count} {net.k}-input LUTs in depth {net.depth}"
    written = [p for p in target if p is not None]
    if written:
        text += f"; written to {', '.join(written)}"
    obj = {**net.to_json_obj(), "name": name, "c_header": hdr, "verilog": vlog}
    return SpecOutcome(spec, out, EXIT_OK, text, obj, None, "output", False)


def luts_many(specs: list[str], out_dir: str | None, job: LutsJob, *, c_header_dir: str | None = None,
              verilog_dir: str | None = None, jobs: int = 1) -> list[SpecOutcome]:
    """Map every spec with ``jobs`` processes, writing ``out_dir/<stem>.luts.json``, ``c_header_dir/<stem>.h`` and
    ``verilog_dir/<stem>.v`` for the directories given; outcomes in the order of ``specs`` (the JSON object of
    each: the LUT JSON object, then ``name``, ``c_header``, ``verilog``, ``spec``, ``output``, ``status``,
    ``error``).

    Raises
    ------
    PlaforgeError
        Before any work, as :func:`batch_paths`.
    """
    paths = batch_paths(specs, {"-o": (out_dir, ".luts.json"), "--c-header": (c_header_dir, ".h"),
                                "--verilog": (verilog_dir, ".v")})
    targets = list(zip(paths["-o"], paths["--c-header"], paths["--verilog"]))
    return run_many(specs, targets, partial(_luts_one, job), jobs=jobs, key="output", sort_keys=False)


_SEVERITY = (EXIT_OK, EXIT_CHECK_FAILED, EXIT_BAD_INPUT, EXIT_LIMIT, EXIT_INTERNAL)


def worst_error(outcomes: list[SpecOutcome]) -> PlaforgeError | None:
    """The error the batch exits with: the worst status among the outcomes (4 > 3 > 2 > 1), or None when all
    passed."""
    worst = max((o.status for o in outcomes), key=_SEVERITY.index, default=EXIT_OK)
    if worst == EXIT_OK:
        return None
    failed = [o.spec for o in outcomes if o.status != EXIT_OK]
    msg = f"{len(failed)} of {len(outcomes)} specs failed: {', '.join(failed)} (see above)"
    cls = {EXIT_CHECK_FAILED: CheckFailed, EXIT_BAD_INPUT: PlaforgeError, EXIT_LIMIT: LimitReached,
           EXIT_INTERNAL: InternalError}[worst]
    return cls(msg)
