"""One sanitizer for every generated name, and one JSON form for covers and LUT networks.

Outside references: Python's own rules for identifiers (``str.isidentifier``, ``keyword.iskeyword``), Amaranth's
rule for signature member names (it refuses a bad one when the signature is built), and the standard ``json`` module
for the embedded data.
"""

from __future__ import annotations

import json
import keyword

import pytest
from amaranth.lib import wiring
from hypothesis import given
from hypothesis import strategies as st

from plaforge.core.cube import Cover, Cube
from plaforge.core.errors import ArtifactError
from plaforge.core.names import VERILOG_KEYWORDS, identifier, port_name, unique_names
from plaforge.core.network import Lut, LutNetwork
from plaforge.core.serial import artifact_from_lines, artifact_lines, cover_from_json_obj, cover_to_json_obj


@given(st.text(max_size=12))
def test_identifier_is_a_python_name_and_an_amaranth_port_name(text: str) -> None:
    name = port_name(text)
    assert name.isidentifier() and name.isascii() and not keyword.iskeyword(name)  # Python's rules
    assert name not in VERILOG_KEYWORDS
    # Amaranth's rule for member names: building the signature raises NameError on a bad one.
    assert list(wiring.Signature({name: wiring.In(1)}).members.keys()) == [name]
    assert identifier(identifier(text)) == identifier(text)  # a usable name is left as it is


def test_one_prefix_and_one_suffix() -> None:
    assert [identifier(x) for x in ("3v3", "_x", "", "a-b", "class")] == ["p_3v3", "p__x", "p_", "a_b", "class_"]
    assert identifier("wire", VERILOG_KEYWORDS) == "wire_"
    assert unique_names(["a", "a", "a_2"]) == ("a", "a_2", "a_2_2")


def _cover() -> Cover:
    return Cover(("a", "b", "c"), ("y", "z"), (Cube.parse("1-0", 0b01), Cube.parse("-11", 0b11)), inverted=0b10)


def test_cover_json_round_trip() -> None:
    cover = _cover()
    obj = json.loads(json.dumps(cover_to_json_obj(cover)))  # through the standard json module
    assert obj == {"inputs": ["a", "b", "c"], "outputs": ["y", "z"], "inverted": ["z"], "rows": ["1-0 10", "-11 11"]}
    back = cover_from_json_obj(obj)
    assert (back.cubes, back.inverted, back.input_names, back.output_names) == (
        cover.cubes, cover.inverted, cover.input_names, cover.output_names)


def test_embedded_lines_are_json_and_read_back() -> None:
    net = LutNetwork(2, ("a", "b"), ("y",), (Lut("n0", ("a", "b"), 0x8),), ("n0",))  # AND2 INIT 0x8 (common practice)
    for artifact in (_cover(), net):
        lines = artifact_lines(artifact)
        assert all(json.loads(line) is not None for line in lines)  # every line is one JSON value
        back = artifact_from_lines(lines)
        assert type(back) is type(artifact)
        assert [back.evaluate(p) for p in range(8 if isinstance(back, Cover) else 4)] == [
            artifact.evaluate(p) for p in range(8 if isinstance(artifact, Cover) else 4)]
    with pytest.raises(ArtifactError, match="PLAFORGE_ARTIFACT data is malformed"):
        artifact_from_lines(['{"kind": "cover", "inputs": ["a"], "outputs": ["y"], "inverted": []}', '"11 1"'])


@pytest.mark.parametrize(
    ("luts", "drivers", "message"),
    [
        ([{"name": "n0", "inputs": ["a", "ghost"], "init": "0x8"}], {"y": "n0"}, "reads 'ghost'"),
        ([{"name": "n0", "inputs": ["a", "n1"], "init": "0x8"}, {"name": "n1", "inputs": ["n0"], "init": "0x1"}],
         {"y": "n1"}, "reads 'n1'"),  # a loop: n0 reads n1, which reads n0
        ([{"name": "n0", "inputs": ["a", "b"], "init": "0x8"}], {"y": "n9"}, "driven by 'n9'"),
    ],
)
def test_lut_json_that_is_not_a_network(luts: list, drivers: dict, message: str) -> None:
    obj = {"k": 2, "inputs": ["a", "b"], "outputs": drivers, "luts": luts}
    with pytest.raises(ValueError, match=message):
        LutNetwork.from_json_obj(obj)
