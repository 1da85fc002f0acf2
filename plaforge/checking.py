"""``check_artifact``: verify any artifact file against the source Table, chosen by its extension.

========  ===========================================  ============================================================
suffix    artifact                                      how
========  ===========================================  ============================================================
``.pla``  a cover in PLA format                         every point, bit-parallel, up to ``enum_limit`` inputs;
                                                        a SAT proof beyond
``.json`` a LUT network in JSON (docs/conventions.md)   the same
``.py``   a generated module (one wiring.Component)     a SAT proof on the gate netlist of the component's own logic
                                                        (its RTLIL read back by Yosys), at any width; up to
                                                        ``exhaustive_limit`` inputs also every point in Amaranth's
                                                        simulator, a second witness
``.v``    Verilog (one top module with the spec's       a SAT proof on its gate netlist (read by Yosys); with
          ports)                                        ``simulate`` also iverilog, where it is installed
========  ===========================================  ============================================================

A module or Verilog file whose netlist has flip-flops is a registered stage (``--registered``): every output a
register on the rising edge of one clock port of its own (``clk``), with the synchronous reset ``rst``. It is checked
with a one-cycle delay. The proof unrolls the netlist over one clock edge (:mod:`plaforge.verify.sat`): before the
edge the inputs are the point and ``rst`` is low, the registers hold anything; after it each register holds its D
input from before and the inputs are anything. Every output after the edge must then agree with the table at the
point. That is exactly what the module promises its user, so the proof is sound, and it proves the logic feeding
the registers (their D inputs) against the table. The simulations apply a vector, tick the clock, apply the next
vector and only then read the outputs, so an output that is not registered is caught by them too.

Every verdict is a proof; nothing the artifact embeds about itself (a generated module's ``PLAFORGE_ARTIFACT``
lines) is trusted or needed. Simulation only adds witnesses: every point up to ``exhaustive_limit`` inputs, and with
``simulate`` the sampled vectors of :func:`plaforge.verify.vectors.sample_points` beyond, labelled as a sample.
"""

from __future__ import annotations

import json
import os
from pathlib import Path

from .core.cube import Cover
from .core.errors import ArtifactError
from .core.network import LutNetwork
from .core.table import DEFAULT_ENUM_LIMIT, Table
from .formats.pla import read_cover
from .verify.component import instantiate, load_module
from .verify.equivalence import OutputVerdict, Verdict, check_cover, check_network
from .verify.iverilog import have_iverilog, iverilog_points
from .verify.netlist import netlist_of_component, netlist_of_verilog
from .verify.sat import register_ports, sat_check_cover, sat_check_netlist, sat_check_network
from .verify.simulate import DEFAULT_SAMPLES, check_component, check_simulated, component_ports

__all__ = ["check_artifact", "prove", "read_network"]


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


def read_network(p: Path) -> LutNetwork:
    """Read a LUT network JSON file (docs/conventions.md); ArtifactError naming the file when it is not one."""
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



def _combine(proof: Verdict, witness: Verdict | None) -> Verdict:
    """Per output, the proof's verdict and a simulation's (``witness``) together: both must pass."""
    if witness is None:
        return proof
    out = []
    for p, w in zip(proof.outputs, witness.outputs):
        failure = p.failure if p.failure is not None else w.failure
        out.append(OutputVerdict(p.name, p.passed and w.passed, w.vectors, f"{p.method}; witness: {w.method}", failure,
                                 w.failures if w.failures or p.passed else None))
    return Verdict(proof.artifact, tuple(out))


def _read_text(p: Path) -> str:
    try:
        return p.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise ArtifactError(f"{p}: no such file") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ArtifactError(f"{p}: cannot read: {exc}") from None


def _check_module(table: Table, p: Path, exhaustive_limit: int, samples: int, seed: int, simulate: bool) -> Verdict:
    component = instantiate(load_module(p), str(p))
    component_ports(table, component, str(p))  # a component for another spec is named as such, before elaborating
    net = netlist_of_component(component, str(p))
    proof = sat_check_netlist(table, net, p.name)
    if table.n_inputs > exhaustive_limit and not simulate:
        return proof
    witness = check_component(table, component, exhaustive_limit=exhaustive_limit,
                              samples=samples, seed=seed, artifact=p.name, registered=bool(net.flops))
    return _combine(proof, witness)


def _check_verilog(table: Table, p: Path, exhaustive_limit: int, samples: int, seed: int, simulate: bool) -> Verdict:
    text = _read_text(p)
    net = netlist_of_verilog(text, str(p))
    proof = sat_check_netlist(table, net, p.name)
    if not simulate:
        return proof
    if not have_iverilog():
        out = tuple(OutputVerdict(o.name, o.passed, o.vectors, f"{o.method}; iverilog not installed, not simulated",
                                  o.failure, o.failures) for o in proof.outputs)
        return Verdict(proof.artifact, out)
    clock = register_ports(table, net, p.name) if net.flops else None
    witness = check_simulated(table, lambda pts: iverilog_points(table, text, net.top, pts, str(p), clock),
                              "iverilog simulation" + (", registered: outputs read one clock edge after each vector"
                                                       if clock else ""), exhaustive_limit=exhaustive_limit, samples=samples, seed=seed,
                              artifact=p.name)
    return _combine(proof, witness)


def check_artifact(
    table: Table,
    path: str | os.PathLike[str],
    *,
    exhaustive_limit: int = 16,
    enum_limit: int = DEFAULT_ENUM_LIMIT,
    samples: int = DEFAULT_SAMPLES,
    seed: int = 1,
    simulate: bool = False,
) -> Verdict:
    """Check the artifact file at ``path`` against ``table`` (see the module docs for the methods).

    Parameters
    ----------
    table : Table
        The spec, the only thing trusted.
    path : path-like
        A ``.pla`` cover, a LUT ``.json``, a generated module ``.py`` or Verilog ``.v``.
    exhaustive_limit : int
        Simulate every point of a module up to this many inputs (and of Verilog, with ``simulate``).
    enum_limit : int
        Check covers and networks bit-parallel up to this many inputs (SAT beyond).
    samples, seed : int
        Random vectors (after the corner cases) when simulating beyond ``exhaustive_limit``.
    simulate : bool
        Also simulate beyond ``exhaustive_limit`` (a module) and simulate Verilog with iverilog (where installed).

    Returns
    -------
    Verdict
        One :class:`OutputVerdict` per spec output.

    Raises
    ------
    ArtifactError
        Unknown suffix; a file that is unreadable or malformed, a module that fails to import, build or elaborate,
        Verilog that does not parse or is not combinational; an artifact whose names or ports are not the spec's
        (exit status 2).
    """
    p = Path(path)
    suffix = p.suffix.lower()
    name = p.name
    if suffix == ".pla":
        return prove(table, read_cover(p), enum_limit=enum_limit, name=name)
    if suffix == ".json":
        return prove(table, read_network(p), enum_limit=enum_limit, name=name)
    if suffix == ".py":
        return _check_module(table, p, exhaustive_limit, samples, seed, simulate)
    if suffix == ".v":
        return _check_verilog(table, p, exhaustive_limit, samples, seed, simulate)
    raise ArtifactError(
        f"{p}: unknown artifact type {p.suffix!r}; expected a .pla cover, a LUT .json, a module .py or Verilog .v"
    )
