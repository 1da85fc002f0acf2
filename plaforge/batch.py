"""Several specs built at once: each into its own subfolder, in a process pool, one outcome per spec.

``expand_specs`` turns the command line's paths into specs (a directory: every ``.pla``/``.csv``/``.toml`` in it,
sorted by name); ``build_many`` builds them with ``jobs`` worker processes (``jobs == 1``: in this process, one after
another) and returns one :class:`SpecOutcome` per spec in the order given. A spec that fails with a
:class:`PlaforgeError` records its exit status and one-line message; the others still run. ``worst_error`` is the
error the whole batch exits with: the worst status by severity (4 > 3 > 2 > 1).
"""

from __future__ import annotations

from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, replace
from pathlib import Path

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
from .core.names import identifier
from .flow import BuildOptions, build
from .formats._files import read_text
from .formats.design import declared_name

__all__ = ["SPEC_SUFFIXES", "SpecOutcome", "build_many", "expand_specs", "spec_stem", "worst_error"]

SPEC_SUFFIXES = (".pla", ".csv", ".toml")


@dataclass(frozen=True)
class SpecOutcome:
    """What became of one spec: its exit status, the folder built into, and a one-line account.

    ``obj`` is the ``build --json`` object (``None`` when the spec failed before a result existed).
    """

    spec: str
    folder: str
    status: int
    line: str
    obj: dict | None = None
    error: str | None = None

    def to_json_obj(self) -> dict:
        base = dict(self.obj) if self.obj is not None else {"spec": self.spec}
        base.update({"folder": self.folder, "status": self.status, "error": self.error})
        return dict(sorted(base.items()))


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
    seen: dict[str, str] = {}
    for spec, stem in zip(specs, stems):
        if stem in seen:
            raise PlaforgeError(f"{seen[stem]} and {spec} both build into {out / stem}; build them separately "
                                "or give one a [design] name")
        seen[stem] = spec
    return [out / s for s in stems]


def _build_one(spec: str, folder: str, options: BuildOptions, changing: str | None) -> SpecOutcome:
    """Build one spec into ``folder``; never raises for a user error (it becomes the outcome's status)."""
    from .formats import read_spec
    from .verify.hazards import changing_mask

    try:
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
    except InternalError as exc:
        msg = f"internal error, please report: {exc}"
        return SpecOutcome(spec, folder, EXIT_INTERNAL, f"{spec}: {msg}", None, msg)
    except PlaforgeError as exc:
        return SpecOutcome(spec, folder, exc.exit_code, f"{spec}: {exc}", None, str(exc))
    except Exception as exc:  # noqa: BLE001 -- a bug: reported for this spec, the others go on
        msg = f"internal error, please report: {type(exc).__name__}: {exc}"
        return SpecOutcome(spec, folder, EXIT_INTERNAL, f"{spec}: {msg}", None, msg)


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
    if jobs <= 1 or len(specs) == 1:
        return [_build_one(s, f, options, changing) for s, f in zip(specs, folders)]
    outcomes: list[SpecOutcome] = []
    with ProcessPoolExecutor(max_workers=min(jobs, len(specs))) as pool:
        futures = [pool.submit(_build_one, s, f, options, changing) for s, f in zip(specs, folders)]
        for spec, folder, fut in zip(specs, folders, futures):
            try:
                outcomes.append(fut.result())
            except Exception as exc:  # noqa: BLE001 -- the worker died: this spec's result is lost
                msg = f"internal error, please report: {type(exc).__name__}: {exc}"
                outcomes.append(SpecOutcome(spec, folder, EXIT_INTERNAL, f"{spec}: {msg}", None, msg))
    return outcomes


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
