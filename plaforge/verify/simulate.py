"""Driving a generated component in Amaranth's simulator and judging every output against the Table.

Vectors
-------
Up to ``exhaustive_limit`` inputs every point is driven (points where every output is a don't-care are skipped:
nothing there can fail): the verdict is then a proof. Beyond it: the corner cases and seeded random points of
:func:`plaforge.verify.vectors.sample_points`, the same vectors the stand-alone harness drives: a sample, and the
verdict's method says so. :func:`check_simulated` judges the vectors of any simulator (Amaranth's here, iverilog's in
:mod:`plaforge.verify.iverilog`).

Speed
-----
One testbench process drives all input ports at once through ``Cat`` of the ports (a single ``ctx.set`` per vector,
so the design settles once per vector) and reads all output ports through one ``ctx.get``. The expected values come
from the Table's packed truth tables (cube look-ups above the enumeration limit) and are compared after the run with
numpy, so the Python work inside the simulation loop is two calls per vector. ``benchmarks/bench_simulation.py``
measures the rate.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from typing import Any

import numpy as np

from ..core.errors import ArtifactError
from ..core.names import Port, ports_of
from ..core.table import DEFAULT_ENUM_LIMIT, Table, unpack_bits
from .equivalence import OutputVerdict, Verdict
from .vectors import sample_points

__all__ = ["DEFAULT_SAMPLES", "REGISTERED_SIMULATION", "check_component", "check_simulated", "component_ports", "simulate_points", "table_cubes"]

DEFAULT_SAMPLES = 4096

REGISTERED_SIMULATION = "Amaranth simulation, registered: outputs read one clock edge after each vector"
"""The method of a registered component's simulation (:func:`simulate_points` with ``registered``)."""


def component_ports(table: Table, component: Any, where: str) -> tuple[list[Port], list[Port], list[Any], list[Any]]:
    """The component's signals for the spec's ports, inputs then outputs.

    Raises
    ------
    ArtifactError
        If a port is missing or has the wrong direction or width: a component made for another spec.
    """
    from amaranth.lib import wiring

    members = component.signature.members
    ins, outs, in_sigs, out_sigs = [], [], [], []
    for p in ports_of(table):
        if p.name not in members:
            have = sorted(members.keys())
            _silence(component)
            raise ArtifactError(f"{where}: no port {p.name!r} for spec {p.spec_name!r}; the component has {have}")
        mem = members[p.name]
        want = wiring.In if p.direction == "in" else wiring.Out
        if not mem.is_port or mem.flow != want or _width(mem.shape) != p.width:
            _silence(component)
            raise ArtifactError(
                f"{where}: port {p.name!r} is {mem!r}; the spec needs {want.name}({p.width}) for {p.spec_name!r}"
            )
        (ins if p.direction == "in" else outs).append(p)
        (in_sigs if p.direction == "in" else out_sigs).append(getattr(component, p.name))
    return ins, outs, in_sigs, out_sigs


def _silence(component: Any) -> None:
    """Mark a component we will not simulate as used, so Amaranth does not warn that it was never elaborated."""
    try:
        component._MustUse__silence = True  # Amaranth's own switch for its unused-elaboratable warning
    except AttributeError:
        pass


def _width(shape: Any) -> int:
    from amaranth.hdl import Shape

    try:
        return Shape.cast(shape).width
    except TypeError:
        return -1


def _expected(table: Table, points: np.ndarray | list[int]) -> tuple[list[np.ndarray], list[np.ndarray]]:
    """Per output, boolean arrays (ON, DC) at ``points``."""
    m, n = table.n_outputs, table.n_inputs
    if n <= DEFAULT_ENUM_LIMIT:
        idx = np.asarray(points, dtype=np.int64)
        on, dc = [], []
        for j in range(m):
            on_b, dc_b = table.truth(j)
            on.append(unpack_bits(on_b, n)[idx])
            dc.append(unpack_bits(dc_b, n)[idx])
        return on, dc
    masks = [table.evaluate(int(p)) for p in points]
    on = [np.array([om >> j & 1 for om, _ in masks], dtype=bool) for j in range(m)]
    dc = [np.array([dm >> j & 1 for _, dm in masks], dtype=bool) for j in range(m)]
    return on, dc


def _permute(values: Sequence[int] | np.ndarray, order: Sequence[int]) -> list[int]:
    """Move bit ``order[q]`` of each value to bit ``q``."""
    if list(order) == list(range(len(order))):
        return [int(v) for v in values]
    if len(order) <= 62:
        arr = np.asarray(values, dtype=np.int64)
        out = np.zeros_like(arr)
        for q, idx in enumerate(order):
            out |= ((arr >> idx) & 1) << q
        return out.tolist()
    return [sum(((int(v) >> idx) & 1) << q for q, idx in enumerate(order)) for v in values]


def simulate_points(table: Table, component: Any, points: Sequence[int], where: str = "module",
                    registered: bool = False) -> list[int]:
    """Drive ``points`` into ``component`` and return each vector's outputs as a mask in table output order.

    With ``registered`` (a component whose outputs are registers in the ``sync`` domain) each vector is applied,
    the clock ticks once (``rst`` stays low), the next vector is applied (the inverse of the last one after the
    last), and only then are the outputs read: a registered output shows the vector before the edge, while an output
    left combinational would follow the new one and fail.

    Raises
    ------
    ArtifactError
        If the component lacks a port the spec needs, a port has the wrong direction or width, or elaborating the
        component raises.
    """
    from amaranth.hdl import Cat
    from amaranth.sim import Simulator

    ins, outs, in_sigs, out_sigs = component_ports(table, component, where)
    in_order = [i for p in ins for i in p.members]
    out_order = [j for p in outs for j in p.members]
    drive = _permute(points, in_order)
    cat_in = Cat(*in_sigs) if in_sigs else None
    cat_out = Cat(*out_sigs)
    raw: list[int] = []

    async def bench(ctx: Any) -> None:
        get, append = ctx.get, raw.append
        if cat_in is None:
            if registered:
                await ctx.tick()
            value = get(cat_out)
            raw.extend([value] * len(drive))
            return
        set_ = ctx.set
        if not registered:
            for v in drive:
                set_(cat_in, v)
                append(get(cat_out))
            return
        full = (1 << len(in_order)) - 1
        for k, v in enumerate(drive):
            set_(cat_in, v)
            await ctx.tick()
            set_(cat_in, drive[k + 1] if k + 1 < len(drive) else v ^ full)
            append(get(cat_out))

    try:
        sim = Simulator(component)  # elaborates the component
    except Exception as exc:  # noqa: BLE001 - a user's elaborate can raise anything
        _silence(component)
        raise ArtifactError(f"{where}: elaborating it failed: {type(exc).__name__}: {exc}") from None
    if registered:
        try:
            sim.add_clock(1e-6)  # the sync domain's clock
        except (ValueError, NameError) as exc:
            raise ArtifactError(f"{where}: its registers are not clocked by the sync domain ({exc}); a registered "
                                "module uses Amaranth's sync domain") from None
    sim.add_testbench(bench)
    sim.run()
    # raw bit q is table output out_order[q]; invert the permutation
    inverse = [0] * len(out_order)
    for q, j in enumerate(out_order):
        inverse[j] = q
    return _permute(raw, inverse)


def _bit_arrays(masks: list[int], m: int) -> list[np.ndarray]:
    """Per output ``j``, bit ``j`` of every mask as a boolean array."""
    if m <= 62:
        arr = np.asarray(masks, dtype=np.int64)
        return [((arr >> j) & 1).astype(bool) for j in range(m)]
    return [np.array([g >> j & 1 for g in masks], dtype=bool) for j in range(m)]


def table_cubes(table: Table) -> dict[str, list[tuple[int, int]]]:
    """The ON, OFF and don't-care cubes of every output, output by output, as :func:`sample_points` takes them."""
    sets = {"on": table.on_cubes, "off": table.off_cubes, "dc": table.dc_cubes}
    return {kind: [(c.care, c.value) for j in range(table.n_outputs) for c in get(j)] for kind, get in sets.items()}


def check_simulated(
    table: Table,
    run: Callable[[list[int]], tuple[list[int], list[int] | None]],
    simulator: str,
    *,
    exhaustive_limit: int = 16,
    samples: int = DEFAULT_SAMPLES,
    seed: int = 1,
    artifact: str = "module",
) -> Verdict:
    """Drive vectors through ``run`` (points in, output masks in table order out) and judge every output.

    Parameters
    ----------
    table : Table
    run : callable
        The simulation: ``run(points)`` gives each point's outputs as a mask, bit ``j`` for table output ``j``, and
        (or ``None``) a mask per point of the outputs whose value was undefined (``x``/``z``): those fail.
    simulator : str
        Its name, for the verdict's method.
    exhaustive_limit : int
        Drive every point when the table has at most this many inputs (the verdict is then a proof).
    samples, seed : int
        Beyond the limit: how many random points, and the seed of their stream (corner points come first). The
        verdict then covers the vectors driven, and its method says it was sampled.
    artifact : str
        Name used in the verdict and in error messages.

    Returns
    -------
    Verdict
        Per output: pass/fail, care vectors driven (don't-cares skipped), and the first failing vector in driving
        order with the expected and actual values.
    """
    n = table.n_inputs
    exhaustive = n <= exhaustive_limit
    if exhaustive:
        pts = np.arange(1 << n, dtype=np.int64)
        corners = 0
    else:
        plist, corners = sample_points(n, table_cubes(table), samples, seed)
        pts = np.array(plist, dtype=object if n > 62 else np.int64)
    on, dc = _expected(table, pts)
    all_dc = np.logical_and.reduce(dc) if dc else np.zeros(len(pts), dtype=bool)
    keep = ~all_dc
    skipped = int(all_dc.sum())
    if exhaustive:
        method = f"proven: {simulator}, exhaustive, {int(keep.sum()):,} vectors driven (every point but {skipped:,} " \
                 f"where every output is don't-care)" if skipped else \
                 f"proven: {simulator}, exhaustive, all {len(pts):,} points driven"
    else:
        corner_kept = int(keep[:corners].sum())
        random_kept = int(keep.sum()) - corner_kept
        method = (f"sampled: {simulator}, {corner_kept:,} corner + {random_kept:,} random = {int(keep.sum()):,} "
                  f"vectors driven (seed {seed}"
                  + (f"; {skipped:,} points where every output is don't-care skipped)" if skipped else ")"))
    pts = pts[keep]
    on = [a[keep] for a in on]
    dc = [a[keep] for a in dc]
    got, unknown = run(pts.tolist())
    actual, undefined = _bit_arrays(got, table.n_outputs), _bit_arrays(unknown or [0] * len(got), table.n_outputs)
    res = []
    for j, name in enumerate(table.output_names):
        care = ~dc[j]
        bad = np.flatnonzero(care & ((actual[j] != on[j]) | undefined[j]))
        failure = None
        if bad.size:
            k = int(bad[0])
            failure = (int(pts[k]), int(on[j][k]), 1 - int(on[j][k]))
        res.append(OutputVerdict(name, failure is None, int(care.sum()), method, failure, int(bad.size)))
    return Verdict(artifact, tuple(res))


def check_component(
    table: Table,
    component: Any,
    *,
    exhaustive_limit: int = 16,
    samples: int = DEFAULT_SAMPLES,
    seed: int = 1,
    artifact: str = "module",
    registered: bool = False,
) -> Verdict:
    """Simulate ``component`` (a wiring.Component with the table's ports) in Amaranth and judge every output
    (:func:`check_simulated`); ``registered``: outputs read one clock edge after each vector
    (:func:`simulate_points`)."""
    return check_simulated(table, lambda pts: (simulate_points(table, component, pts, artifact, registered), None),
                           REGISTERED_SIMULATION if registered else "Amaranth simulation",
                           exhaustive_limit=exhaustive_limit, samples=samples, seed=seed, artifact=artifact)
