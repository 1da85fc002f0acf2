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
from .core.errors import CheckFailed, PlaforgeError
from .core.network import LutNetwork
from .core.table import DEFAULT_ENUM_LIMIT, Table
from .verify.equivalence import OutputVerdict, Verdict, check_cover, check_network
from .verify.sat import sat_check_cover, sat_check_network
from .verify.simulate import DEFAULT_SAMPLES, check_component, component_class, load_module

__all__ = ["ARTIFACT_SUFFIXES", "check_artifact", "prove"]

ARTIFACT_SUFFIXES = (".pla", ".json", ".py")


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
        raise PlaforgeError(f"{p}: no such file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise PlaforgeError(f"{p}: cannot read: {exc}") from None
    except json.JSONDecodeError as exc:
        raise PlaforgeError(f"{p}:{exc.lineno}:{exc.colno}: not JSON ({exc.msg}); expected a LUT network") from None
    try:
        return LutNetwork.from_json_obj(obj)
    except (KeyError, ValueError, TypeError, AttributeError) as exc:
        raise PlaforgeError(
            f"{p}: not a LUT network ({type(exc).__name__}: {exc}); expected keys k, inputs, outputs, luts"
        ) from None


def _combine(sim: Verdict, proof: Verdict | None, artifact: str) -> Verdict:
    if proof is None:
        return Verdict(artifact, sim.outputs)
    out = []
    for s, p in zip(sim.outputs, proof.outputs):
        failure = s.failure if s.failure is not None else p.failure
        method = f"{s.method}; embedded {proof.artifact}: {p.method}"
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
    PlaforgeError
        Unknown suffix, unreadable or malformed file (exit status 2).
    CheckFailed
        The artifact's names or ports do not match the spec (exit status 1).
    """
    p = Path(path)
    suffix = p.suffix.lower()
    name = p.name
    if suffix == ".pla":
        from .formats.pla import read_cover

        return prove(table, read_cover(p), enum_limit=enum_limit, name=name)
    if suffix == ".json":
        return prove(table, _read_network(p), enum_limit=enum_limit, name=name)
    if suffix == ".py":
        from .emit.amaranth import embedded_artifact

        mod = load_module(p)
        cls = component_class(mod, str(p))
        try:
            component = cls()
        except Exception as exc:  # noqa: BLE001 - a user's class can raise anything
            raise PlaforgeError(f"{p}: {cls.__name__}() failed: {type(exc).__name__}: {exc}") from None
        sim = check_component(table, component, exhaustive_limit=exhaustive_limit, samples=samples, seed=seed,
                              artifact=name)
        data = getattr(mod, "PLAFORGE_ARTIFACT", None)
        proof = None
        if data is not None:
            embedded = embedded_artifact(data)
            what = "cover" if isinstance(embedded, Cover) else "LUT network"
            try:
                proof = prove(table, embedded, enum_limit=enum_limit, name=what)
            except CheckFailed as exc:
                raise CheckFailed(f"{p}: the PLAFORGE_ARTIFACT data does not fit the spec: {exc}") from None
        return _combine(sim, proof, name)
    raise PlaforgeError(f"{p}: unknown artifact type {p.suffix!r}; expected a .pla cover, a LUT .json or a module .py")
