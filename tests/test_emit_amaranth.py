"""Generated Amaranth modules: ports from the spec, both styles, lint/format cleanliness, in-process build.

Outside references: Amaranth's own simulator runs the logic; the expected values come from Python arithmetic on the
definition of each function (not from plaforge's cover code); ruff judges the source text.
"""

from __future__ import annotations

import re
import shutil
import subprocess
import sys

import numpy as np
import pytest

from plaforge.core.caution import CAUTION
from plaforge.core.cube import Cover, Cube
from plaforge.core.errors import ArtifactError
from plaforge.core.names import class_name_for, port_name, ports_of
from plaforge.core.network import Lut, LutNetwork
from plaforge.core.table import Table
from plaforge.emit.amaranth import build_component, module_source
from plaforge.flow import realize
from plaforge.verify.component import component_class, load_module
from plaforge.verify.simulate import check_component, simulate_points, table_cubes
from plaforge.verify.vectors import sample_points


def _adder3() -> Table:
    names = [f"a[{i}]" for i in range(3)] + [f"b[{i}]" for i in range(3)]
    # Sum of two 3-bit numbers (common practice: binary addition), 4-bit result.
    return Table.from_function(names, [f"s[{i}]" for i in range(4)],
                               lambda p: [(((p & 7) + (p >> 3 & 7)) >> i) & 1 for i in range(4)], source="add3.pla")


def _odd_names() -> Table:
    ins = ["data-ready", "3v3_ok", "wire", "signature", "x[0]", "x[2]", "en"]
    # y = parity of all inputs; z = majority of the first three (common practice definitions).
    return Table.from_function(
        ins, ["y", "z z", "if"],
        lambda p: [np.array([int(v).bit_count() & 1 for v in p]),
                   np.array([(int(v) & 7).bit_count() >= 2 for v in p]),
                   (p >> 6) & 1 == 1],
        source="odd names.csv",
    )


def _on_cover(t: Table) -> Cover:
    return Cover(t.input_names, t.output_names, tuple(c for j in range(t.n_outputs) for c in t.on_cubes(j)))


def _off_cover_inverted(t: Table) -> Cover:
    """Each output as the complement of the OR of its OFF cubes (output polarity inverted)."""
    cubes = tuple(c for j in range(t.n_outputs) for c in t.off_cubes(j))
    return Cover(t.input_names, t.output_names, cubes, inverted=(1 << t.n_outputs) - 1)


def _simulate_all(t: Table, component: object) -> list[int]:
    return simulate_points(t, component, list(range(1 << t.n_inputs)))


def test_port_name_mapping_is_documented_and_deterministic() -> None:
    assert port_name("addr") == "addr"
    assert port_name("data-ready") == "data_ready"
    assert port_name("3v3_ok") == "p_3v3_ok"
    assert port_name("wire") == "wire_"  # a Verilog keyword
    assert port_name("if") == "if_"  # a Python keyword
    assert port_name("signature") == "signature_"  # taken by wiring.Component
    t = _odd_names()
    ports = ports_of(t)
    assert [p.name for p in ports] == [
        "data_ready", "p_3v3_ok", "wire_", "signature_", "x_0_", "x_2_", "en", "y", "z_z", "if_",
    ]
    assert all(p.width == 1 for p in ports)
    assert ports_of(t) == ports


def test_buses_become_multi_bit_ports() -> None:
    t = _adder3()
    ports = {p.name: p for p in ports_of(t)}
    assert (ports["a"].width, ports["b"].width, ports["s"].width) == (3, 3, 4)
    assert ports["s"].direction == "out" and ports["a"].direction == "in"
    src = module_source(t, _on_cover(t), source_name="add3.pla")
    assert "    a: In(3)\n    b: In(3)\n    s: Out(4)\n" in src


def test_class_names() -> None:
    assert class_name_for("memory_map.toml") == "MemoryMap"
    assert class_name_for("dir/7seg.pla") == "p_7seg"  # the one prefix before a leading digit
    assert class_name_for("module.toml") == "Module_"  # the file binds Module
    assert class_name_for("") == "Logic"


@pytest.mark.parametrize("style", ["sop", "sop-inverted", "lut"])
def test_generated_file_simulates_to_the_definition(tmp_path, style: str) -> None:
    t = _adder3()
    if style == "sop":
        art: Cover | LutNetwork = _on_cover(t)
    elif style == "sop-inverted":
        art = _off_cover_inverted(t)
    else:
        art = _adder_network(t)
    path = tmp_path / "add3_mod.py"
    path.write_text(module_source(t, art, source_name="add3.pla", source_digest="0" * 64))
    component = component_class(load_module(path))()
    got = _simulate_all(t, component)
    for p, mask in enumerate(got):
        # Reference: Python integer addition of the two 3-bit fields (Amaranth's simulator gives `mask`).
        assert mask == (p & 7) + (p >> 3 & 7), p
    if style == "sop-inverted":
        assert "inv0 = Signal()" in path.read_text() and "~inv0" in path.read_text()


def _adder_network(t: Table) -> LutNetwork:
    """A hand-made ripple-carry network of 3-input LUTs (INITs from the full-adder truth table)."""
    xor3, maj3, xor2, and2 = 0x96, 0xE8, 0x6, 0x8  # common practice: INIT of XOR3, MAJ3, XOR2, AND2
    luts = (
        Lut("s0", ("a[0]", "b[0]"), xor2),
        Lut("c0", ("a[0]", "b[0]"), and2),
        Lut("s1", ("a[1]", "b[1]", "c0"), xor3),
        Lut("c1", ("a[1]", "b[1]", "c0"), maj3),
        Lut("s2", ("a[2]", "b[2]", "c1"), xor3),
        Lut("c2", ("a[2]", "b[2]", "c1"), maj3),
    )
    return LutNetwork(3, t.input_names, t.output_names, luts, ("s0", "s1", "s2", "c2"))


def test_in_process_component_matches_generated_file(tmp_path) -> None:
    t = _odd_names()
    cover = _on_cover(t)
    path = tmp_path / "odd.py"
    path.write_text(module_source(t, cover, source_name="odd names.csv"))
    from_file = _simulate_all(t, component_class(load_module(path))())
    in_process = _simulate_all(t, build_component(t, cover))
    assert from_file == in_process
    for p, mask in enumerate(in_process):
        parity = p.bit_count() & 1  # reference: parity by counting ones
        majority = int((p & 7).bit_count() >= 2)
        assert mask == parity | majority << 1 | (p >> 6 & 1) << 2, p


def test_constant_outputs_and_empty_cover(tmp_path) -> None:
    names = ["a", "b"]
    t = Table.from_function(names, ["zero", "one"], lambda p: [p < 0, p >= 0])
    cover = Cover(t.input_names, t.output_names, (Cube(0, 0, 0b10),))
    path = tmp_path / "const.py"
    path.write_text(module_source(t, cover, source_name="const.csv"))
    got = _simulate_all(t, component_class(load_module(path))())
    assert got == [0b10] * 4  # zero is 0 and one is 1 everywhere, by definition
    net = LutNetwork(2, t.input_names, t.output_names, (), ("0", "1"))
    assert _simulate_all(t, build_component(t, net)) == [0b10] * 4


def test_deterministic_and_date_free() -> None:
    t = _adder3()
    a = module_source(t, _on_cover(t), source_name="add3.pla", source_digest="ab" * 32)
    b = module_source(_adder3(), _on_cover(_adder3()), source_name="add3.pla", source_digest="ab" * 32)
    assert a == b
    assert "SHA-256: " + "ab" * 32 in a
    assert "20" + "26" not in a  # no year, no date
    assert CAUTION in " ".join(a.split())  # the one caution (plaforge.core.caution) is in the docstring, wrapped


def test_names_must_match_the_spec() -> None:
    t = _adder3()
    other = Cover(("x",), ("y",), ())
    with pytest.raises(ArtifactError, match="spec has inputs"):
        module_source(t, other)
    with pytest.raises(ValueError, match="class name '1x'"):
        module_source(t, _on_cover(t), class_name="1x")


def _wide_table() -> Table:
    """18 inputs, products over most of them: long lines that must be split like the formatter does."""
    ins = [f"address_bus[{i}]" for i in range(16)] + ["write-enable", "chip_select"]
    on = (
        (Cube(0x3FFFF, 0x2ABCD, 1), Cube(0x0FFFF, 0x01234, 1)),
        (Cube(0x30000, 0x30000, 2),),
        (),
    )
    return Table(tuple(ins), ("hit", "wr", "never"), on, ((), (), ()), (None, None, None), source="wide.toml")


@pytest.mark.skipif(shutil.which("ruff") is None, reason="ruff is not installed")
@pytest.mark.parametrize("which", ["wide", "odd", "add3-lut", "many-terms"])
def test_generated_source_passes_ruff(tmp_path, which: str) -> None:
    if which == "wide":
        t = _wide_table()
        src = module_source(t, _on_cover(t), source_name="wide.toml")
    elif which == "odd":
        t = _odd_names()
        src = module_source(t, _off_cover_inverted(t), source_name="odd names.csv")
    elif which == "add3-lut":
        t = _adder3()
        wide = LutNetwork(6, t.input_names, t.output_names,
                          (Lut("big_lut_with_a_long_name", t.input_names, 0x123456789ABCDEF0),),
                          ("big_lut_with_a_long_name",) * 4)
        src = module_source(t, wide, source_name="add3.pla")
    else:
        t = Table.from_function([f"i{k}" for k in range(7)], ["f"], lambda p: [p % 3 == 0])
        src = module_source(t, _on_cover(t), source_name="mod3.csv")
    f = tmp_path / "generated.py"
    f.write_text(src)
    # Outside judge: ruff's linter and formatter with their default settings (line length 88).
    lint = subprocess.run(["ruff", "check", "--isolated", str(f)], capture_output=True, text=True, check=False)
    assert lint.returncode == 0, lint.stdout + lint.stderr
    fmt = subprocess.run(["ruff", "format", "--isolated", "--diff", str(f)], capture_output=True, text=True, check=False)
    assert fmt.returncode == 0, fmt.stdout + fmt.stderr
    compile(src, str(f), "exec")
    assert sys.version_info >= (3, 11)


def test_wide_module_checks_by_sampling_and_proof(tmp_path) -> None:
    """Above the exhaustive limit: corners and samples in the simulator, and each vector judged by the table."""
    t = _wide_table()
    component = build_component(t, _on_cover(t))
    verdict = check_component(t, component, exhaustive_limit=16, samples=300, seed=5)
    assert verdict.passed
    assert all(o.vectors > 100 for o in verdict.outputs)  # corners plus samples (duplicates dropped)
    assert "corner" in verdict.outputs[0].method
    # a wrong component is caught on a corner of an ON cube (the cube's own value point)
    broken = Cover(t.input_names, t.output_names, (Cube(0x3FFFF, 0x2ABCD, 1), Cube(0x30000, 0x30000, 2)))
    bad = check_component(t, build_component(t, broken), exhaustive_limit=16, samples=10, seed=5)
    assert not bad.passed and bad.outputs[0].failure is not None
    p, expected, actual = bad.outputs[0].failure
    # reference: the definition above, evaluated directly on the reported point
    assert (p & 0x0FFFF == 0x01234 or p & 0x3FFFF == 0x2ABCD) == bool(expected) and actual == 1 - expected
    # how many of the driven vectors fail, counted here from the definitions on the vectors the check drives
    driven, _corners = sample_points(t.n_inputs, table_cubes(t), 10, 5)
    want_hit = [p & 0x0FFFF == 0x01234 or p & 0x3FFFF == 0x2ABCD for p in driven]
    got_hit = [p & 0x3FFFF == 0x2ABCD for p in driven]
    assert bad.outputs[0].failures == sum(w != g for w, g in zip(want_hit, got_hit)) > 0
    assert bad.outputs[1].failures == 0 and bad.outputs[0].vectors == len(driven)


def test_sampled_vector_counts_add_up() -> None:
    """corner + random = vectors driven, and the points where every output is a don't-care are counted apart."""
    # 17 inputs; where input 16 is 1 both outputs are don't-care (half the points)
    t = Table.from_function([f"x{i}" for i in range(17)], ["odd", "low"], lambda p: [p & 1, p & 0xFF < 8],
                            dc_fn=lambda p: [p >> 16 & 1] * 2)
    verdict = check_component(t, build_component(t, _on_cover(t)), exhaustive_limit=16, samples=200, seed=3)
    assert verdict.passed
    m = re.search(r"(\d+) corner \+ (\d+) random = (\d+) vectors driven \(seed 3; (\d+) points where every output is "
                  r"don't-care skipped\)", verdict.outputs[0].method)
    assert m is not None, verdict.outputs[0].method
    corner, rand, total, skipped = map(int, m.groups())
    points, corners = sample_points(17, table_cubes(t), 200, 3)
    all_dc = [p >> 16 & 1 for p in points]  # the definition above
    assert corner + rand == total == len(points) - sum(all_dc) and skipped == sum(all_dc) > 0
    assert corner == corners - sum(all_dc[:corners])
    assert all(o.vectors == total and o.failures == 0 for o in verdict.outputs)


def test_in_process_component_from_the_table_alone() -> None:
    t = _adder3()
    for style, k in (("sop", 6), ("lut", 4)):
        got = _simulate_all(t, build_component(t, realize(t, style, k=k)))
        assert got == [(p & 7) + (p >> 3 & 7) for p in range(64)]  # reference: Python integer addition
    with pytest.raises(ValueError, match="style must be one of"):
        realize(t, "pla")
