"""LUT networks: k-input lookup tables with INIT vectors.

Vocabulary
----------
LUT
    A node with an ordered fan-in list ``inputs`` (names of table inputs or of other LUTs) and an ``init`` integer.
INIT (common practice)
    Bit ``j`` of ``init`` is the LUT's output when its fan-in values, read as a binary number with ``inputs[0]`` as
    the least significant bit, equal ``j``. Printed as hex of ``2**len(inputs)`` bits, most significant digit first:
    a 2-input AND on ``i0, i1`` is ``0x8``; inside a 4-input LUT (``i2``, ``i3`` unused) it is ``0x8888``.
network
    LUTs in topological order; each output is driven by a LUT name, a table input name, or the constant ``"0"`` or
    ``"1"``. Depth is the longest count of LUTs on a path from an input to an output.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field

__all__ = ["Lut", "LutNetwork", "init_hex"]


def init_hex(init: int, n_inputs: int) -> str:
    """INIT as ``0x`` hex of ``2**n_inputs`` bits (at least one digit), most significant digit first."""
    digits = max(1, (1 << n_inputs) // 4)
    return f"0x{init:0{digits}X}"


@dataclass(frozen=True, slots=True)
class Lut:
    """One LUT: its name, ordered fan-ins and INIT (see module docs for the bit order)."""

    name: str
    inputs: tuple[str, ...]
    init: int

    def __post_init__(self) -> None:
        if self.init < 0 or self.init >> (1 << len(self.inputs)):
            raise ValueError(f"LUT {self.name!r}: INIT {self.init:#x} does not fit {len(self.inputs)} inputs")

    def eval(self, values: dict[str, int]) -> int:
        idx = 0
        for b, name in enumerate(self.inputs):
            idx |= (values[name] & 1) << b
        return self.init >> idx & 1


@dataclass(frozen=True)
class LutNetwork:
    """A k-LUT network realizing a table's outputs.

    Parameters
    ----------
    k : int
        LUT size (every LUT has at most k fan-ins).
    input_names, output_names : tuple of str
        The table's names, in order.
    luts : tuple of Lut
        Topological order: every fan-in is a table input or an earlier LUT.
    drivers : tuple of str
        Per output (same order as ``output_names``): a LUT name, an input name, ``"0"`` or ``"1"``.
    lower_bounds : dict
        Optional proven bounds, e.g. ``{"count": 3, "depth": 2}``.
    """

    k: int
    input_names: tuple[str, ...]
    output_names: tuple[str, ...]
    luts: tuple[Lut, ...]
    drivers: tuple[str, ...]
    lower_bounds: dict = field(default_factory=dict, compare=False)
    method: str = ""

    @property
    def count(self) -> int:
        return len(self.luts)

    @property
    def depth(self) -> int:
        level = {name: 0 for name in self.input_names}
        level["0"] = level["1"] = 0
        for lut in self.luts:
            level[lut.name] = 1 + max((level[i] for i in lut.inputs), default=0)
        return max((level.get(d, 0) for d in self.drivers), default=0)

    def evaluate(self, point: int) -> int:
        """Output bitmask at ``point`` (bit ``i`` of the point is input ``i``)."""
        values = {name: point >> i & 1 for i, name in enumerate(self.input_names)}
        values["0"], values["1"] = 0, 1
        for lut in self.luts:
            values[lut.name] = lut.eval(values)
        out = 0
        for j, d in enumerate(self.drivers):
            out |= values[d] << j
        return out

    def to_json_obj(self) -> dict:
        """The LUT JSON contract (docs/conventions.md)."""
        return {
            "k": self.k,
            "inputs": list(self.input_names),
            "outputs": {o: d for o, d in zip(self.output_names, self.drivers)},
            "luts": [{"name": lut.name, "inputs": list(lut.inputs), "init": init_hex(lut.init, len(lut.inputs))}
                     for lut in self.luts],
            "depth": self.depth,
            "count": self.count,
        }

    def to_json(self) -> str:
        return json.dumps(self.to_json_obj(), indent=1) + "\n"

    @classmethod
    def from_json_obj(cls, obj: dict) -> LutNetwork:
        """Inverse of :meth:`to_json_obj`, checking that the network is one.

        Raises
        ------
        KeyError, ValueError, TypeError
            On a malformed object: a missing key, an INIT that is not hex or does not fit its fan-ins, a LUT wider
            than ``k``, a name used twice, or a fan-in or driver that is neither an input, a constant nor an
            earlier LUT (which also rules out loops).
        """
        luts = tuple(Lut(d["name"], tuple(d["inputs"]), int(d["init"], 16)) for d in obj["luts"])
        outs = obj["outputs"]
        net = cls(int(obj["k"]), tuple(obj["inputs"]), tuple(outs), luts, tuple(outs[o] for o in outs))
        net.check_structure()
        return net

    def check_structure(self) -> None:
        """Check that every LUT fits ``k`` and reads only inputs, constants and earlier LUTs.

        Raises
        ------
        ValueError
            Naming the first LUT or output that breaks the rule and what it refers to.
        """
        known = {"0", "1", *self.input_names}
        if len(known) != len(self.input_names) + 2:
            raise ValueError(f"input names {list(self.input_names)} repeat a name or use the constant '0' or '1'")
        for lut in self.luts:
            if len(lut.inputs) > self.k:
                raise ValueError(f"LUT {lut.name!r} has {len(lut.inputs)} fan-ins; k is {self.k}")
            for x in lut.inputs:
                if x not in known:
                    raise ValueError(
                        f"LUT {lut.name!r} reads {x!r}, which is neither an input, '0', '1' nor an earlier LUT "
                        "(a loop, or a missing LUT)"
                    )
            if lut.name in known:
                raise ValueError(f"LUT name {lut.name!r} is used twice (or is an input's name)")
            known.add(lut.name)
        for o, d in zip(self.output_names, self.drivers):
            if d not in known:
                raise ValueError(f"output {o!r} is driven by {d!r}, which is neither an input, '0', '1' nor a LUT")
