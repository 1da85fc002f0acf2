"""SAT equivalence proofs: a cover or LUT network against the Table, at any input count.

For each output ``j`` the prover asks PicoSAT (bundled with pyeda) for a counterexample point in two ways:

* an ON point the artifact drives to 0: ``p in ON_j and artifact_j(p) = 0``;
* an OFF point the artifact drives to 1: ``p not in ON_j, p not in DC_j and artifact_j(p) = 1`` (the OFF set is
  never built as cubes: its complement form is two lists of blocking clauses).

Don't-care points are in neither set, so they are never counterexamples. Both queries unsatisfiable means
ON ⊆ artifact ⊆ ON ∪ DC over all ``2**n`` points: a proof, with no enumeration.

Encoding (one encoder, :class:`plaforge.verify.satcnf.PointCnf`, for covers and networks; variables ``1..n`` are the
inputs; input ``i`` is variable ``i + 1``):

* ``p`` in a union of cubes ``c_1 .. c_r``: selector variables ``s_k`` with ``(s_1 ∨ … ∨ s_r)`` and ``s_k → literal``
  for every literal of ``c_k``;
* ``p`` outside a union of cubes: one clause per cube, the OR of its negated literals;
* a LUT network (Tseitin): one variable per LUT, and for each of its ``2**w`` fan-in patterns the clause
  "pattern ⇒ (LUT = INIT bit)";
* a gate netlist (:class:`plaforge.verify.netlist.Netlist`, the and-inverter graph of a module's or a Verilog
  file's own logic; Tseitin): one variable per AND gate with ``y → a``, ``y → b``, ``a ∧ b → y``; a NOT is the
  negated literal; port bits map to the table's inputs and outputs through :func:`plaforge.core.names.ports_of`;
  an undriven or ``x`` net is a free variable, so a proof holds whatever value it takes.

A registered netlist (a module made with ``--registered``: every output from a flip-flop on the rising edge of
one clock) is proven over one clock edge, by unrolling it into two time frames. Before the edge: the inputs are the
point ``p``, ``rst`` is low, and every flip-flop holds a free variable (any earlier state); the flip-flops' D
inputs are encoded there. After the edge: every flip-flop output is the literal of its D input from before, and
every input (the next vector, ``rst``, the clock) is a fresh free variable; the outputs are encoded there and judged
against the table at ``p`` as above. Both queries unsatisfiable means: whatever the state before, and whatever
comes at the inputs after, every output after one rising edge with ``rst`` low agrees with the table at the inputs
applied before it. That is the behaviour the module promises, so the proof is sound for it; it also proves the
logic feeding the registers, which for a generated module is the D inputs of the output flip-flops. A hand-edited
stage that is wrong fails with a counterexample point: a register fed by the wrong logic, an output left
combinational (it then depends on the next inputs), or a second stage (the output then depends on the free earlier
state), unless the output does not in fact depend on what changed. Flip-flops on more than one clock, on a falling
edge or clocked by a spec input are not one registered stage and are refused (:func:`register_ports`).

Clause count is linear in the cubes and in ``sum(2**w)`` over the LUTs; the solver's work is what it is, but covers
and networks from this project's tables of 20 to 64 inputs prove in well under a second each.
"""

from __future__ import annotations

from ..core.cube import Cover
from ..core.errors import ArtifactError
from ..core.names import check_names, ports_of
from ..core.network import LutNetwork
from ..core.table import Table
from .equivalence import OutputVerdict, Verdict
from .netlist import Bit, Netlist

__all__ = ["NETLIST_METHOD", "REGISTERED_METHOD", "SAT_METHOD", "netlist_outputs", "register_ports", "sat_check_cover",
           "sat_check_netlist", "sat_check_network"]

SAT_METHOD = "proven: SAT, every point"
NETLIST_METHOD = "proven: SAT on the gate netlist of its own logic, every point"
REGISTERED_METHOD = "proven: SAT on the gate netlist of its own logic, every point, registered: one clock edge later"


def sat_check_cover(table: Table, cover: Cover, artifact: str = "cover") -> Verdict:
    """Prove ``cover`` against ``table`` output by output (see the module docs).

    Returns
    -------
    Verdict
        ``vectors`` is 0 (nothing is enumerated); a failure carries a counterexample point with the expected and
        actual values.
    """
    from ..verify.satcnf import PointCnf, region  # lazy: plaforge.lut imports plaforge.verify

    check_names(table, cover.input_names, cover.output_names, artifact)
    res = []
    for j, name in enumerate(table.output_names):
        mine = cover.cubes_for(j)
        failure = None
        for expected, kind in ((1, "on"), (0, "off")):
            # the ON/OFF set as the spec gave it (no complement is ever built; don't-cares are excluded)
            cnf = PointCnf(table.n_inputs)
            cnf.constrain(region(table, j, kind))
            drives_one = (expected == 1) == cover.is_inverted(j)  # the union of its cubes holds the point
            cnf.constrain([("in" if drives_one else "out", mine)])
            p = cnf.solve()
            if p is not None:
                failure = (p, expected, 1 - expected)
                break
        res.append(OutputVerdict(name, failure is None, 0, SAT_METHOD, failure))
    return Verdict(artifact, tuple(res))


def sat_check_network(table: Table, net: LutNetwork, artifact: str = "LUT network") -> Verdict:
    """Prove a LUT network against ``table`` output by output (Tseitin encoding; see the module docs).

    The encoding lives with the LUT mapper (:func:`plaforge.verify.satcnf.check_network_sat`, which also serves
    the mapper's own SAT queries): it encodes only the cone of LUTs feeding each output and the ON/OFF sets as the
    spec gave them, so no set is ever complemented. This wrapper labels the verdict like every other SAT proof.
    """
    from ..verify.satcnf import check_network_sat  # lazy: plaforge.lut imports plaforge.verify

    check_names(table, net.input_names, net.output_names, artifact)
    verdict = check_network_sat(table, net, artifact)
    return Verdict(
        artifact,
        tuple(OutputVerdict(o.name, o.passed, o.vectors, SAT_METHOD, o.failure) for o in verdict.outputs),
    )


def netlist_outputs(table: Table, net: Netlist, where: str) -> tuple[dict[Bit, int], list[Bit]]:
    """The variable of each input bit (input ``i`` is ``i + 1``) and the net driving each table output.

    Raises
    ------
    ArtifactError
        If a port the spec needs is missing or has the wrong direction or width. Other ports are allowed: an input
        the spec lacks is left free, so a proof holds whatever value it takes.
    """
    inputs: dict[Bit, int] = {}
    outputs: list[Bit] = [0] * table.n_outputs
    ports = ports_of(table)
    for p in ports:
        direction = "input" if p.direction == "in" else "output"
        have = net.ports.get(p.name)
        if have is None:
            raise ArtifactError(f"{where}: no port {p.name!r} for spec {p.spec_name!r}; it has {sorted(net.ports)}")
        if have[0] != direction or len(have[1]) != p.width:
            raise ArtifactError(f"{where}: port {p.name!r} is an {have[0]} of {len(have[1])} bits; the spec needs "
                                f"an {direction} of {p.width} for {p.spec_name!r}")
        for b, k in enumerate(p.members):
            if p.direction == "in":
                if isinstance(have[1][b], str) or have[1][b] in inputs:
                    raise ArtifactError(f"{where}: input port {p.name!r} bit {b} is not a net of its own")
                inputs[have[1][b]] = k + 1
            else:
                outputs[k] = have[1][b]
    return inputs, outputs


def _frame(net: Netlist, roots: list[Bit], lit: dict[Bit, int | bool], cnf: object,
           driver: dict[Bit, tuple[str, Bit, tuple[Bit, ...]]]) -> list[int | bool]:
    """Clauses for the gates feeding ``roots`` added to ``cnf`` (a PointCnf), in one time frame whose known nets are
    ``lit`` (net to literal or constant; updated in place, so several calls on one frame share its variables); the
    literal or constant of each root. A net no gate drives and ``lit`` does not know (an undriven net, a flip-flop
    output, a port the spec lacks) gets one free variable per frame; each use of ``"x"`` or ``"z"`` its own."""
    cone: set[Bit] = set()
    stack = list(roots)
    while stack:
        b = stack.pop()
        if b in cone or b in lit:
            continue
        cone.add(b)
        if b in driver:
            stack.extend(driver[b][2])
    for kind, y, fan in net.gates:  # topological order: fan-ins are settled first
        if y not in cone:
            continue
        a = [lit[x] if x in lit else cnf.fresh() if x in ("x", "z") else lit.setdefault(x, cnf.fresh())  # type: ignore[attr-defined]
             for x in fan]
        if kind == "not":
            lit[y] = (not a[0]) if isinstance(a[0], bool) else -a[0]
        elif False in a:
            lit[y] = False
        elif a[0] is True or a[1] is True:
            lit[y] = a[1] if a[0] is True else a[0]
        else:
            v = cnf.fresh()  # type: ignore[attr-defined]
            cnf.clauses += [(-v, a[0]), (-v, a[1]), (v, -a[0], -a[1])]  # type: ignore[attr-defined]
            lit[y] = v
    return [lit[r] if r in lit else lit.setdefault(r, cnf.fresh()) for r in roots]  # type: ignore[attr-defined]


def _leaves(net: Netlist, root: Bit, driver: dict[Bit, tuple[str, Bit, tuple[Bit, ...]]]) -> set[Bit]:
    """The nets no gate drives that feed ``root`` through gates (``root`` itself when no gate drives it)."""
    seen: set[Bit] = set()
    leaves: set[Bit] = set()
    stack = [root]
    while stack:
        b = stack.pop()
        if b in seen:
            continue
        seen.add(b)
        if b in driver:
            stack.extend(driver[b][2])
        else:
            leaves.add(b)
    return leaves


def register_ports(table: Table, net: Netlist, where: str) -> tuple[str, str | None]:
    """The clock port of a registered netlist, and its reset port (``None`` when it has none).

    A registered netlist is one clocked stage: every flip-flop on the rising edge of one clock, an input port the
    spec does not have (Amaranth's ``sync`` domain calls it ``clk``). The reset is the input port ``rst`` the spec
    does not have (Amaranth's default name for the domain's synchronous reset), when there is one.

    Raises
    ------
    ArtifactError
        If the flip-flops use more than one clock or a falling edge, or the clock is not an input port of its own.
    """
    spec_ports = {p.name for p in ports_of(table)}
    clocks = {(edge, clock) for edge, clock, _, _ in net.flops}
    if len(clocks) != 1 or next(iter(clocks))[0] != "rise":
        raise ArtifactError(f"{where}: not combinational logic, and not one registered stage: its flip-flops use "
                            f"{len(clocks)} clock{'s' if len(clocks) != 1 else ''} or a falling edge; expected every "
                            "flip-flop on the rising edge of one clock port")
    clock = next(iter(clocks))[1]
    owner = [name for name, (direction, bits) in net.ports.items() if direction == "input" and clock in bits]
    if len(owner) != 1 or owner[0] in spec_ports or len(net.ports[owner[0]][1]) != 1:
        what = f"spec input {owner[0]!r}" if owner and owner[0] in spec_ports else "a net that is not a clock port"
        raise ArtifactError(f"{where}: not combinational logic, and not one registered stage: its flip-flops are "
                            f"clocked by {what}; expected a clock input port of its own (clk)")
    rst = net.ports.get("rst")
    reset = "rst" if "rst" not in spec_ports and rst is not None and rst[0] == "input" and len(rst[1]) == 1 else None
    return owner[0], reset


def sat_check_netlist(table: Table, net: Netlist, artifact: str = "netlist") -> Verdict:
    """Prove a gate netlist (an artifact's own logic) against ``table`` output by output (see the module docs).

    A netlist with flip-flops is judged as a registered stage (:func:`register_ports`), one clock edge later; see
    the module docs for what that proves.

    Returns
    -------
    Verdict
        ``vectors`` is 0; a failure carries a counterexample point (for a registered netlist, the inputs before the
        clock edge) with the expected and actual values.

    Raises
    ------
    ArtifactError
        If the netlist's ports are not the spec's (:func:`netlist_outputs`), or it has flip-flops but is not one
        registered stage (:func:`register_ports`).
    """
    from ..verify.satcnf import PointCnf, region  # lazy: plaforge.lut imports plaforge.verify

    inputs, outputs = netlist_outputs(table, net, artifact)
    driver = {g[1]: g for g in net.gates}
    held: dict[Bit, int | bool] = {}
    method = NETLIST_METHOD
    if net.flops:
        _, reset = register_ports(table, net, artifact)
        if reset is not None:
            held[net.ports[reset][1][0]] = False
        method = REGISTERED_METHOD + ("" if reset is None else ", rst low")
    d_of = {q: d for _, _, d, q in net.flops}
    res = []
    for j, name in enumerate(table.output_names):
        failure = None
        for expected, kind in ((1, "on"), (0, "off")):
            cnf = PointCnf(table.n_inputs)
            if not net.flops:
                y = _frame(net, [outputs[j]], {"0": False, "1": True, **inputs}, cnf, driver)[0]
            else:
                # before the edge: the point's inputs, rst low, any earlier state; after it: each flip-flop holds
                # its D input from before, every input is whatever comes next
                qs = sorted((b for b in _leaves(net, outputs[j], driver) if b in d_of), key=str)
                before = _frame(net, [d_of[q] for q in qs], {"0": False, "1": True, **inputs, **held}, cnf, driver)
                y = _frame(net, [outputs[j]], {"0": False, "1": True, **dict(zip(qs, before))}, cnf, driver)[0]
            if isinstance(y, bool) and int(y) == expected:
                continue
            cnf.constrain(region(table, j, kind))
            p = cnf.solve([] if isinstance(y, bool) else [(-y,) if expected else (y,)])
            if p is not None:
                failure = (p, expected, 1 - expected)
                break
        res.append(OutputVerdict(name, failure is None, 0, method, failure))
    return Verdict(artifact, tuple(res))
