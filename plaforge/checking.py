"""``check_artifact``: verify any artifact file against the source Table, chosen by its extension.

========  ===========================================  ============================================================
suffix    artifact                                      how
========  ===========================================  ============================================================
``.pla``  a cover in PLA format                         bit-parallel, every point, up to ``enum_limit`` inputs;
                                                        a SAT proof beyond
``.json`` a LUT network in JSON (docs/conventions.md)   the same
``.py``   a generated module (one wiring.Component)     Amaranth's simulator: every point up to
                                                        ``exhaustive_limit`` inputs, corners plus a seeded sample
                                                        beyond; and, when the file carries ``PLAFORGE_ARTIFACT``,
                                                        a proof of that cover or network (bit-parallel or SAT)
========  ===========================================  ============================================================

A module passes an output only when both its simulation and the proof of the data it carries pass. Above the
exhaustive limit the simulation covers the vectors it drove and the proof covers the embedded cover or network;
the generated file builds its logic from that same cover or network, and the simulated vectors tie the two together.
"""

from __future__ import annotations

import json
import os
from pathlib import Path

from .core.cube import Cover
from .core.errors import ArtifactError
from .core.network import LutNetwork
from .core.serial import artifact_from_lines
from .core.table import DEFAULT_ENUM_LIMIT, Table
from .formats.pla import read_cover
from .verify.component import instantiate, load_module
from .verify.equivalence import OutputVerdict, Verdict, check_cover, check_network
from .verify.sat import sat_check_cover, sat_check_network
from .verify.simulate import DEFAULT_SAMPLES, check_component

__all__ = ["check_artifact", "prove"]


def prove(table: Table, artifact: Cover | LutNetwork, *, enum_limit: int = DEFAULT_ENUM_LIMIT,
          name: str = "artifact") -> Verdict:
    """Every point of a cover or network against ``table``: bit-parallel up to ``enum_limit`` inputs, SAT beyond."""
    if isinstance(artifact, Cover):
        if table.n_inputs <= enum_limit:
            return check_cover(table, artifact, limit=enum_limit, artifact=name)
        return sat_check_cover(table, artifact, artifact=name)
    if table.n_inputs <= enum_limit:
        return check_network(table, artifact, limit=enum_limit, artifact=name)
    return sat_check_network(table, artifact, artifact=name)


def _read_network(p: Path) -> LutNetwork:
    try:
        obj = json.loads(p.read_text(encoding="utf-8"))
    except FileNotFoundError:
        raise ArtifactError(f"{p}: no such file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ArtifactError(f"{p}: cannot read: {exc}") from None
    except json.JSONDecodeError as exc:
        raise ArtifactError(f"{p}:{exc.lineno}:{exc.colno}: not JSON ({exc.msg}); expected a LUT network") from None
    try:
        return LutNetwork.from_json_obj(obj)
    except (KeyError, ValueError, TypeError, AttributeError) as exc:
        raise ArtifactError(
            f"{p}: not a LUT network ({type(exc).__name__}: {exc}); expected keys k, inputs, outputs, luts"
        ) from None


def _combine(sim: Verdict, proof: Verdict | None, artifact: str, what: str) -> Verdict:
    """Per output, the simulation's verdict and the proof's of the data the module carries (``what``) together."""
    if proof is None:
        return Verdict(artifact, sim.outputs)
    out = []
    for s, p in zip(sim.outputs, proof.outputs):
        failure = s.failure if s.failure is not None else p.failure
        method = f"{s.method}; {what}: {p.method}"
        out.append(OutputVerdict(s.name, s.passed and p.passed, s.vectors, method, failure))
    return Verdict(artifact, tuple(out))


def check_artifact(
    table: Table,
    path: str | os.PathLike[str],
    *,
    exhaustive_limit: int = 16,
    enum_limit: int = DEFAULT_ENUM_LIMIT,
    samples: int = DEFAULT_SAMPLES,
    seed: int = 1,
) -> Verdict:
    """Check the artifact file at ``path`` against ``table`` (see the module docs for the methods).

    Parameters
    ----------
    table : Table
        The spec, the only thing trusted.
    path : path-like
        A ``.pla`` cover, a LUT ``.json`` or a generated module ``.py``.
    exhaustive_limit : int
        Simulate every point of a module up to this many inputs.
    enum_limit : int
        Check covers and networks bit-parallel up to this many inputs (SAT beyond).
    samples, seed : int
        Random vectors (after the corner cases) when simulating beyond ``exhaustive_limit``.

    Returns
    -------
    Verdict
        One :class:`OutputVerdict` per spec output.

    Raises
    ------
    ArtifactError
        Unknown suffix; a file that is unreadable or malformed, or a module that fails to import, build or elaborate;
        an artifact whose names or ports are not the spec's (exit status 2).
    """
    p = Path(path)
    suffix = p.suffix.lower()
    name = p.name
    if suffix == ".pla":
        return prove(table, read_cover(p), enum_limit=enum_limit, name=name)
    if suffix == ".json":
        return prove(table, _read_network(p), enum_limit=enum_limit, name=name)
    if suffix == ".py":
        mod = load_module(p)
        component = instantiate(mod, str(p))
        sim = check_component(table, component, exhaustive_limit=exhaustive_limit, samples=samples, seed=seed,
                              artifact=name)
        data = getattr(mod, "PLAFORGE_ARTIFACT", None)
        if data is None:
            return _combine(sim, None, name, "")
        embedded = artifact_from_lines(data)
        what = "embedded cover" if isinstance(embedded, Cover) else "embedded LUT network"
        proof = prove(table, embedded, enum_limit=enum_limit, name=f"{p}: the {what}")
        return _combine(sim, proof, name, what)
    raise ArtifactError(f"{p}: unknown artifact type {p.suffix!r}; expected a .pla cover, a LUT .json or a module .py")
