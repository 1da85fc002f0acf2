"""Exports of ``plaforge luts`` that paste into other projects: the Verilog module simulated by iverilog against
Python integer arithmetic, its INITs equal to the listing's, and two designs' C headers compiled together by a C
compiler."""

from __future__ import annotations

import json
import re
import shutil
import subprocess

import pytest
from click.testing import CliRunner

from plaforge.cli import cli


def _adder_pla(path, w: int) -> None:
    names = [f"a[{i}]" for i in range(w)] + [f"b[{i}]" for i in range(w)]
    rows = [f".i {2 * w}", f".o {w + 1}", ".ilb " + " ".join(names),
            ".ob " + " ".join(f"s[{i}]" for i in range(w + 1)), ".type fr"]
    for p in range(1 << 2 * w):
        s = (p & ((1 << w) - 1)) + (p >> w)  # reference: Python integer addition
        bits_in = "".join(str(p >> i & 1) for i in range(2 * w))
        rows.append(bits_in + " " + "".join(str(s >> i & 1) for i in range(w + 1)))
    path.write_text("\n".join(rows + [".e"]) + "\n")


def _luts(tmp_path, spec, *args):
    res = CliRunner().invoke(cli, ["luts", str(spec), *args])
    assert res.exit_code == 0, res.output
    return res.output


@pytest.mark.parametrize("k, pad", [(4, False), (3, True)])
def test_verilog_module_simulates_to_integer_addition(tmp_path, k, pad):
    if shutil.which("iverilog") is None or shutil.which("vvp") is None:
        pytest.skip("iverilog is not installed")
    spec = tmp_path / "adder3.pla"
    _adder_pla(spec, 3)
    _luts(tmp_path, spec, "-k", str(k), "--verilog", str(tmp_path / "adder3.v"), *(["--pad"] if pad else []))
    tb = tmp_path / "tb.v"
    tb.write_text("""
module tb;
    reg [2:0] a, b;
    wire [3:0] s;
    integer p;
    adder3 dut (.a(a), .b(b), .s(s));
    initial begin
        for (p = 0; p < 64; p = p + 1) begin
            {b, a} = p;
            #1 $display("%0d %0d", p, s);
        end
    end
endmodule
""")
    subprocess.run(["iverilog", "-o", str(tmp_path / "sim"), str(tmp_path / "adder3.v"), str(tb)], check=True)
    out = subprocess.run(["vvp", str(tmp_path / "sim")], check=True, capture_output=True, text=True).stdout
    got = dict(tuple(map(int, line.split())) for line in out.splitlines() if line.strip())
    assert got == {p: (p & 7) + (p >> 3) for p in range(64)}  # reference: Python integer addition


def test_verilog_inits_are_the_listing_hex_in_full_width(tmp_path):
    spec = tmp_path / "adder3.pla"
    _adder_pla(spec, 3)
    listing = _luts(tmp_path, spec, "-k", "6", "--pad", "--verilog", str(tmp_path / "a.v"))
    listed = re.findall(r"INIT 0x([0-9A-F]+)", listing)
    text = (tmp_path / "a.v").read_text()
    written = re.findall(r"\.INIT\((\d+)'h([0-9A-F]+)\)", text)
    assert listed and [h for _, h in written] == listed
    # common practice: a 6-input LUT's INIT has 64 bits, 16 hex digits
    assert all(width == "64" and len(h) == 16 for width, h in written)
    assert re.search(r"input\s+wire \[2:0\] a,\s+input\s+wire \[2:0\] b,\s+output wire \[3:0\] s", text)


def test_two_designs_c_headers_compile_together(tmp_path):
    cc = shutil.which("gcc") or shutil.which("cc")
    if cc is None:
        pytest.skip("no C compiler")
    inits = {}
    for name, w in (("adder2", 2), ("adder3", 3)):
        spec = tmp_path / f"{name}.pla"
        _adder_pla(spec, w)
        _luts(tmp_path, spec, "-k", "4", "--c-header", str(tmp_path / f"{name}.h"),
              "-o", str(tmp_path / f"{name}.json"))
        obj = json.loads((tmp_path / f"{name}.json").read_text())
        inits[name] = [int(lut["init"], 16) for lut in obj["luts"]]
    src = tmp_path / "both.c"
    src.write_text('#include <stdio.h>\n#include <inttypes.h>\n#include "adder2.h"\n#include "adder3.h"\n'
                   '#include "adder2.h"\n'
                   'int main(void) {\n'
                   '    printf("%" PRIu64 " %" PRIu64 "\\n",\n'
                   '           (uint64_t)ADDER2_LUT_N0_INIT, (uint64_t)ADDER3_LUT_N0_INIT);\n'
                   '    return 0;\n}\n')
    exe = tmp_path / "both"
    subprocess.run([cc, "-Wall", "-Werror", "-o", str(exe), str(src)], check=True, cwd=tmp_path)
    out = subprocess.run([str(exe)], check=True, capture_output=True, text=True).stdout.split()
    assert [int(x) for x in out] == [inits["adder2"][0], inits["adder3"][0]]
