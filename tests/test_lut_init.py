"""INIT vectors: bit order, padding, export styles, C header, and single-LUT outputs from a Table."""

from __future__ import annotations

import numpy as np
import pytest

from plaforge.core.table import Table
from plaforge.lut import LutNetwork, c_header, format_init, map_luts, pad_init
from plaforge.lut.export import c_identifier, format_listing, padded_network
from plaforge.lut.init import drop_unused_inputs
from plaforge.minimize import minimize


def _bit(p: np.ndarray, i: int) -> np.ndarray:
    return (p >> i & 1).astype(bool)


def _single(fn, n: int, k: int = 4) -> LutNetwork:
    names = [f"i{b}" for b in range(n)]
    t = Table.from_function(names, ["y"], lambda p: [fn(p)])
    return map_luts(t, minimize(t), k=k)


# -- facts of the trade -------------------------------------------------------------------------------------------
# common practice: a 2-input AND/OR/XOR on i0, i1 in a 4-input LUT (i2, i3 unused) has INIT 0x8888/0xEEEE/0x6666
@pytest.mark.parametrize("fn, expected", [
    (lambda p: _bit(p, 0) & _bit(p, 1), 0x8888),
    (lambda p: _bit(p, 0) | _bit(p, 1), 0xEEEE),
    (lambda p: _bit(p, 0) ^ _bit(p, 1), 0x6666),
])
def test_two_input_gates_in_a_4_input_lut(fn, expected):
    net = _single(fn, 2)
    assert net.count == 1 and net.drivers == ("n0",)
    lut = net.luts[0]
    assert lut.inputs == ("i0", "i1")
    assert pad_init(lut.init, len(lut.inputs), 4) == expected
    assert format_init(pad_init(lut.init, 2, 4), 4, "python") == f"0x{expected:04X}"


def test_mux_selecting_i1_over_i0_on_i2():
    # common practice: 2:1 mux, i2 = 1 selects i1, i2 = 0 selects i0, in a 4-input LUT: INIT 0xCACA
    net = _single(lambda p: np.where(_bit(p, 2), _bit(p, 1), _bit(p, 0)), 3)
    lut = net.luts[0]
    assert lut.inputs == ("i0", "i1", "i2")
    assert pad_init(lut.init, 3, 4) == 0xCACA
    assert format_init(pad_init(lut.init, 3, 4), 4, "verilog") == "16'hCACA"


def test_constant_one_in_a_6_input_lut():
    # common practice: a 6-input LUT holding constant 1 has INIT 0xFFFFFFFFFFFFFFFF
    assert pad_init(0b1, 0, 6) == 0xFFFFFFFFFFFFFFFF
    assert format_init(pad_init(1, 0, 6), 6, "verilog") == "64'hFFFFFFFFFFFFFFFF"
    assert format_init(pad_init(1, 0, 6), 6, "bits") == "1" * 64
    # and the mapper needs no LUT at all for a constant output
    net = _single(lambda p: np.ones(p.size, dtype=bool), 3, k=6)
    assert net.count == 0 and net.drivers == ("1",)


def test_export_styles_of_an_and_gate():
    # common practice: Verilog sized literal <width>'h<hex>; bit string MSB (highest index) first
    assert format_init(0x8, 2, "verilog") == "4'h8"
    assert format_init(0x8, 2, "python") == "0x8"
    assert format_init(0x8, 2, "bits") == "1000"
    assert format_init(0b10, 1, "bits") == "10"
    with pytest.raises(ValueError, match="INIT style must be one of"):
        format_init(0x8, 2, "hex")
    with pytest.raises(ValueError, match="does not fit a 2-input LUT"):
        format_init(0x18, 2)


def test_pad_rejects_a_smaller_lut():
    with pytest.raises(ValueError, match="k must be at least 3"):
        pad_init(0xCA, 3, 2)


def test_drop_unused_inputs_undoes_padding():
    # common practice: 0x8888 is an AND of i0, i1 in a 4-input LUT (i2, i3 unused), 0xCACA the 2:1 mux of i0, i1
    # selected by i2 (i3 unused); reduced, they are the 2-input AND 0x8 and the 3-input mux 0xCA
    assert drop_unused_inputs(0x8888, 4) == (0x8, (0, 1))
    assert drop_unused_inputs(0xCACA, 4) == (0xCA, (0, 1, 2))
    # an XOR of i2, i3 with i0, i1 unused, built from the INIT bit order (bit p: fan-in b is bit b of p, common
    # practice); reduced, it is the 2-input XOR 0x6 on the old fan-ins 2 and 3
    xor_hi = sum(((p >> 2 ^ p >> 3) & 1) << p for p in range(16))
    assert drop_unused_inputs(xor_hi, 4) == (0x6, (2, 3))


# -- single-LUT outputs from a Table ------------------------------------------------------------------------------
def test_plain_and_complemented_inputs_and_sharing():
    names = ["a", "b", "c"]

    def fn(p):
        a, b, c = _bit(p, 0), _bit(p, 1), _bit(p, 2)
        return [b, ~a, a & c, a & c, np.zeros(p.size, dtype=bool)]

    t = Table.from_function(names, ["z", "na", "x", "x2", "zero"], fn)
    net = map_luts(t, minimize(t), k=4)
    d = dict(zip(net.output_names, net.drivers))
    assert d["z"] == "b" and d["zero"] == "0"
    inv = next(lut for lut in net.luts if lut.name == d["na"])
    assert inv.inputs == ("a",) and inv.init == 0b01  # an inverter: output 1 when a = 0
    assert d["x"] == d["x2"]  # identical functions share one LUT
    assert net.count == 2
    listing = format_listing(net)
    assert "inverter of a" in listing and "input b (no LUT)" in listing and "constant 0 (no LUT)" in listing


def test_dont_cares_drop_support():
    # y must be 1 at a=b=1 and 0 at a=b=0, anything else: a plain input (a) satisfies it, so no LUT
    def fn(p):
        return [_bit(p, 0) & _bit(p, 1)]

    def dc(p):
        return [_bit(p, 0) ^ _bit(p, 1)]

    t = Table.from_function(["a", "b"], ["y"], fn, dc)
    net = map_luts(t, minimize(t), k=4)
    assert net.count == 0 and net.drivers[0] in ("a", "b")


def test_dont_cares_allow_sharing():
    # y2 = (a AND b) XOR c, free where a XOR b; there it may equal y1 = (a OR b) XOR c: one LUT serves both
    def fn(p):
        a, b, c = _bit(p, 0), _bit(p, 1), _bit(p, 2)
        return [(a | b) ^ c, (a & b) ^ c]

    def dc(p):
        a, b = _bit(p, 0), _bit(p, 1)
        return [np.zeros(p.size, dtype=bool), a ^ b]

    t = Table.from_function(["a", "b", "c"], ["y1", "y2"], fn, dc)
    net = map_luts(t, minimize(t), k=4)
    assert net.drivers[0] == net.drivers[1] and net.count == 1


# -- C header -----------------------------------------------------------------------------------------------------
def test_c_header_names_and_values():
    net = _single(lambda p: _bit(p, 0) & _bit(p, 1), 2)
    hdr = c_header(padded_network(net), "glue-logic")
    assert "#define GLUE_LOGIC_LUT_N0_INIT UINT64_C(0x8888)" in hdr
    assert "#define GLUE_LOGIC_LUT_N0_FANINS 4" in hdr
    assert hdr.startswith("/*") and hdr.rstrip().endswith("#endif /* GLUE_LOGIC_LUTS_H */")
    assert c_identifier("addr[3].x-y") == "ADDR_3_X_Y"
    assert c_identifier("3rd") == "_3RD"


def test_c_header_wide_init_words():
    # a 7-input LUT of constant 1 pattern split in 64-bit words, least significant word first
    from plaforge.core.network import Lut

    lut = Lut("w", tuple(f"i{b}" for b in range(7)), (1 << 128) - 2)
    net = LutNetwork(7, tuple(f"i{b}" for b in range(7)), ("y",), (lut,), ("w",))
    hdr = c_header(net, "wide")
    assert ("static const uint64_t WIDE_LUT_W_INIT[2] = {UINT64_C(0xFFFFFFFFFFFFFFFE), UINT64_C(0xFFFFFFFFFFFFFFFF)};"
            in hdr)
