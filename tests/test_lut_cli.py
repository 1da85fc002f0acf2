"""``plaforge luts`` through click's CliRunner: the LUT JSON contract, listing, export options, errors."""

from __future__ import annotations

import json

from click.testing import CliRunner

from plaforge.cli import cli
from plaforge.core.network import LutNetwork

# a 3-input spec: y = a AND b, z = 2:1 mux (c selects b over a), w = NOT a, v = b
PLA = """\
.i 3
.o 4
.ilb a b c
.ob y z w v
.type fr
000 0010
100 0100
010 0011
110 1101
001 0010
101 0000
011 0111
111 1101
.e
"""


def _spec(tmp_path):
    p = tmp_path / "glue.pla"
    p.write_text(PLA)
    return p


def test_json_is_one_object_with_the_contract_keys(tmp_path):
    res = CliRunner().invoke(cli, ["luts", str(_spec(tmp_path)), "-k", "4", "--json"])
    assert res.exit_code == 0, res.output
    obj = json.loads(res.stdout)  # exactly one JSON document, nothing else
    assert set(obj) == {"k", "inputs", "outputs", "luts", "depth", "count"}
    assert obj["k"] == 4 and obj["inputs"] == ["a", "b", "c"]
    assert obj["outputs"]["v"] == "b"  # a plain input needs no LUT
    luts = {d["name"]: d for d in obj["luts"]}
    y = luts[obj["outputs"]["y"]]
    assert y["inputs"] == ["a", "b"] and y["init"] == "0x8"  # common practice: 2-input AND is 0x8
    z = luts[obj["outputs"]["z"]]
    assert z["inputs"] == ["a", "b", "c"] and z["init"] == "0xCA"  # common practice: mux INIT 0xCA(CA)
    w = luts[obj["outputs"]["w"]]
    assert w["inputs"] == ["a"] and w["init"] == "0x1"  # inverter
    # the object is a network that reads back
    net = LutNetwork.from_json_obj(obj)
    assert net.count == obj["count"] == 3


def test_output_file_listing_and_exports(tmp_path):
    out = tmp_path / "glue.json"
    hdr = tmp_path / "glue.h"
    res = CliRunner().invoke(cli, ["luts", str(_spec(tmp_path)), "-k", "4", "-o", str(out), "--pad",
                                   "--init-format", "verilog", "--c-header", str(hdr)])
    assert res.exit_code == 0, res.output
    written = json.loads(out.read_text())
    again = CliRunner().invoke(cli, ["luts", str(_spec(tmp_path)), "-k", "4", "--json"])
    assert written == json.loads(again.stdout)  # --json prints the same object as the file
    assert "16'h8888" in res.output and "16'hCACA" in res.output  # padded to 4 inputs, Verilog literal
    assert "bits 1000100010001000" in res.output  # k <= 4: binary too
    assert "inverter of a" in res.output and "input b (no LUT)" in res.output
    assert "lower bound" in res.output and "glitch" in res.output
    text = hdr.read_text()
    assert "UINT64_C(0x8888)" in text and "UINT64_C(0xCACA)" in text
    assert not list(tmp_path.glob(".*.tmp"))  # nothing half-written left behind


def test_bad_input_is_one_line_exit_2(tmp_path):
    bad = tmp_path / "bad.pla"
    bad.write_text(".i 2\n.o 1\n1x2 1\n.e\n")
    res = CliRunner().invoke(cli, ["luts", str(bad)])
    assert res.exit_code == 2
    assert "Traceback" not in res.output + res.stderr
    assert res.stderr.strip().count("\n") == 0 and "bad.pla" in res.stderr
    res = CliRunner().invoke(cli, ["luts", str(_spec(tmp_path)), "-k", "9"])
    assert res.exit_code == 2 and "9" in res.stderr
