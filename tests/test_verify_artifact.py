"""check_artifact, the SAT prover, the report and the two commands (module, check).

References: SAT verdicts are compared with a brute-force evaluation written here (every point, each cube tested
with ``p & care == value``, LUTs read bit by bit from their INIT), with pyeda's own expression satisfiability for a
cover equivalence, and with Python arithmetic for the functions' definitions.
"""

from __future__ import annotations

import random
from pathlib import Path

import pytest
from click.testing import CliRunner
from pyeda.inter import And, Or, exprvar

from plaforge.checking import check_artifact, prove
from plaforge.cli import cli
from plaforge.core.cube import Cover, Cube
from plaforge.core.errors import ArtifactError, PlaforgeError
from plaforge.core.network import Lut, LutNetwork
from plaforge.core.table import Table
from plaforge.emit.amaranth import module_source
from plaforge.formats.pla import write_pla, write_table_pla
from plaforge.verify.report import format_vector, format_verdict
from plaforge.verify.sat import sat_check_cover, sat_check_network


def _random_table(rng: random.Random, n: int, m: int) -> tuple[Table, list[list[int]]]:
    """Random ON/DC/OFF labels per point (0 off, 1 on, 2 don't-care), and the table built from them."""
    labels = [[rng.choice((0, 0, 1, 1, 2)) for _ in range(1 << n)] for _ in range(m)]
    t = Table.from_function(
        [f"i{k}" for k in range(n)], [f"o{j}" for j in range(m)],
        lambda p: [[labels[j][int(x)] == 1 for x in p] for j in range(m)],
        dc_fn=lambda p: [[labels[j][int(x)] == 2 for x in p] for j in range(m)],
    )
    return t, labels


def _brute_cover(labels: list[list[int]], cover: Cover, n: int) -> list[bool]:
    ok = []
    for j, lab in enumerate(labels):
        good = True
        for p in range(1 << n):
            v = any(p & c.care == c.value for c in cover.cubes if c.outputs >> j & 1) ^ cover.is_inverted(j)
            if lab[p] != 2 and int(v) != lab[p]:
                good = False
                break
        ok.append(good)
    return ok


@pytest.mark.parametrize("seed", range(12))
def test_sat_cover_agrees_with_brute_force(seed: int) -> None:
    rng = random.Random(seed)
    n, m = rng.randint(3, 7), rng.randint(1, 3)
    t, labels = _random_table(rng, n, m)
    cubes = [c for j in range(m) for c in t.on_cubes(j)]
    if seed % 2:  # disturb: drop a cube or flip a literal, sometimes harmless (don't-cares), sometimes not
        k = rng.randrange(len(cubes)) if cubes else None
        if k is not None and cubes[k].care:
            c = cubes[k]
            low = c.care & -c.care
            cubes[k] = Cube(c.care, c.value ^ low, c.outputs)
        elif k is not None:
            cubes.pop(k)
    inverted = rng.randrange(1 << m) if seed % 3 == 0 else 0
    if inverted:  # realize inverted outputs from their OFF cubes instead
        cubes = [c for c in cubes if not inverted & c.outputs] + [
            c for j in range(m) if inverted >> j & 1 for c in t.off_cubes(j)
        ]
    cover = Cover(t.input_names, t.output_names, tuple(cubes), inverted=inverted)
    expected = _brute_cover(labels, cover, n)
    sat = sat_check_cover(t, cover)
    assert [o.passed for o in sat.outputs] == expected
    assert [o.passed for o in prove(t, cover).outputs] == expected  # bit-parallel path agrees too
    for j, o in enumerate(sat.outputs):
        if not o.passed:
            p, want, got = o.failure
            assert labels[j][p] == want and got == 1 - want  # the counterexample really is one


@pytest.mark.parametrize("seed", range(8))
def test_sat_network_agrees_with_brute_force(seed: int) -> None:
    rng = random.Random(100 + seed)
    n, m = rng.randint(3, 6), rng.randint(1, 3)
    t, labels = _random_table(rng, n, m)
    luts = []
    names = list(t.input_names)
    for k in range(rng.randint(1, 4)):
        fan = tuple(rng.sample(names, min(len(names), rng.randint(1, 3))))
        luts.append(Lut(f"n{k}", fan, rng.getrandbits(1 << len(fan))))
        names.append(f"n{k}")
    drivers = tuple(rng.choice(names + ["0", "1"]) for _ in range(m))
    net = LutNetwork(3, t.input_names, t.output_names, tuple(luts), drivers)
    sat = sat_check_network(t, net)
    for j, o in enumerate(sat.outputs):
        # brute force: evaluate the network point by point (INIT bit order: first fan-in least significant)
        bad = []
        for p in range(1 << n):
            vals = {name: p >> i & 1 for i, name in enumerate(t.input_names)} | {"0": 0, "1": 1}
            for lut in luts:
                idx = sum(vals[x] << b for b, x in enumerate(lut.inputs))
                vals[lut.name] = lut.init >> idx & 1
            if labels[j][p] != 2 and vals[drivers[j]] != labels[j][p]:
                bad.append(p)
        assert o.passed == (not bad)
        if bad:
            assert o.failure[0] in bad


def test_sat_agrees_with_pyeda_on_a_wide_cover() -> None:
    """40 inputs: no enumeration. pyeda's expression satisfiability is the outside reference."""
    rng = random.Random(7)
    n = 40
    cubes = []
    for _ in range(6):
        care = 0
        for i in rng.sample(range(n), 5):
            care |= 1 << i
        cubes.append(Cube(care, rng.getrandbits(n) & care, 1))
    names = tuple(f"x{i}" for i in range(n))
    t = Table(names, ("f",), (tuple(cubes),), ((),), (None,))
    good = Cover(names, ("f",), tuple(cubes))
    assert sat_check_cover(t, good).passed
    c = cubes[0]
    low = c.care & -c.care
    flipped = Cube(c.care, c.value ^ low, 1)
    bad = Cover(names, ("f",), (flipped, *cubes[1:]))
    verdict = sat_check_cover(t, bad)
    xs = [exprvar("x", i) for i in range(n)]

    def sop(cs: list[Cube]):
        return Or(*(And(*(xs[i] if cu.value >> i & 1 else ~xs[i] for i in range(n) if cu.care >> i & 1)) for cu in cs))

    differ = (sop(cubes) ^ sop([flipped, *cubes[1:]])).satisfy_one()
    assert (differ is not None) == (not verdict.passed)  # pyeda: the two covers differ somewhere
    p, expected, actual = verdict.outputs[0].failure
    in_spec = any(p & x.care == x.value for x in cubes)
    in_bad = any(p & x.care == x.value for x in bad.cubes)
    assert (expected, actual) == (int(in_spec), int(in_bad)) and in_spec != in_bad


def _add2() -> Table:
    ins = ["a[0]", "a[1]", "b[0]", "b[1]"]
    # 2-bit addition (common practice), 3-bit result
    return Table.from_function(ins, ["s[0]", "s[1]", "s[2]"],
                               lambda p: [(((p & 3) + (p >> 2 & 3)) >> i) & 1 for i in range(3)], source="add2.pla")


def _cover(t: Table) -> Cover:
    return Cover(t.input_names, t.output_names, tuple(c for j in range(t.n_outputs) for c in t.on_cubes(j)))


def _corrupt(cover: Cover) -> Cover:
    cubes = list(cover.cubes)
    c = cubes[0]
    low = c.care & -c.care
    cubes[0] = Cube(c.care, c.value ^ low, c.outputs)
    return cover.with_(cubes=tuple(cubes))


def test_check_artifact_dispatches_by_suffix(tmp_path: Path) -> None:
    t = _add2()
    cov = _cover(t)
    (tmp_path / "good.pla").write_text(write_pla(cov))
    (tmp_path / "bad.pla").write_text(write_pla(_corrupt(cov)))
    net = LutNetwork(4, t.input_names, t.output_names, (
        Lut("s0", ("a[0]", "b[0]"), 0x6), Lut("c0", ("a[0]", "b[0]"), 0x8),
        Lut("s1", ("a[1]", "b[1]", "c0"), 0x96), Lut("c1", ("a[1]", "b[1]", "c0"), 0xE8),
    ), ("s0", "s1", "c1"))  # common practice: XOR2 0x6, AND2 0x8, XOR3 0x96, MAJ3 0xE8
    (tmp_path / "net.json").write_text(net.to_json())
    (tmp_path / "mod.py").write_text(module_source(t, cov, source_name="add2.pla"))
    (tmp_path / "badmod.py").write_text(module_source(t, _corrupt(cov), source_name="add2.pla"))
    for name, ok in (("good.pla", True), ("bad.pla", False), ("net.json", True), ("mod.py", True),
                     ("badmod.py", False)):
        v = check_artifact(t, tmp_path / name)
        assert v.passed == ok, (name, v)
        assert v.artifact == name
    v = check_artifact(t, tmp_path / "badmod.py")
    fail = next(o for o in v.outputs if not o.passed)
    p, expected, actual = fail.failure
    j = t.output_names.index(fail.name)
    assert expected == ((p & 3) + (p >> 2 & 3)) >> j & 1  # reference: the sum itself
    assert "SAT on the gate netlist" in fail.method and "refuted" in format_verdict(v, t)
    report = format_verdict(v, t)
    assert "FAIL" in report and "first failure at a[2]=0x" in report and f"expected {expected}, got {actual}" in report
    # the exhaustive check counts the failing points: here counted from the sum and the corrupted cubes directly
    bad = _corrupt(cov)
    report = format_verdict(check_artifact(t, tmp_path / "bad.pla"), t)
    for j, name in enumerate(t.output_names):
        wrong = sum(any(p & c.care == c.value and c.outputs >> j & 1 for c in bad.cubes)
                    != bool(((p & 3) + (p >> 2 & 3)) >> j & 1) for p in range(16))
        line = next(ln for ln in report.splitlines() if ln.strip().startswith(name + " "))
        assert ("FAIL" in line) == (wrong > 0), (name, report)
        if wrong:
            assert f"; {wrong} of 16 care vectors fail" in report, report


def test_report_names_vector_by_ports() -> None:
    t = _add2()
    assert format_vector(t, 0b1101) == "a[2]=0x1 b[2]=0x3 (point 13)"


def test_bad_artifacts_are_user_errors(tmp_path: Path) -> None:
    t = _add2()
    (tmp_path / "x.txt").write_text("")
    with pytest.raises(PlaforgeError, match="unknown artifact type '.txt'"):
        check_artifact(t, tmp_path / "x.txt")
    (tmp_path / "broken.json").write_text("{\"k\": 4,")
    with pytest.raises(PlaforgeError, match="not JSON"):
        check_artifact(t, tmp_path / "broken.json")
    (tmp_path / "nokeys.json").write_text("{\"k\": 4}")
    with pytest.raises(PlaforgeError, match="not a LUT network"):
        check_artifact(t, tmp_path / "nokeys.json")
    (tmp_path / "two.py").write_text(
        "from amaranth.lib import wiring\nfrom amaranth.lib.wiring import In\n\n"
        "class A(wiring.Component):\n    x: In(1)\n\nclass B(wiring.Component):\n    x: In(1)\n"
    )
    with pytest.raises(PlaforgeError, match="exactly one wiring.Component subclass, found 2"):
        check_artifact(t, tmp_path / "two.py")
    (tmp_path / "boom.py").write_text("raise RuntimeError('nope')\n")
    with pytest.raises(PlaforgeError, match="importing it failed: RuntimeError: nope"):
        check_artifact(t, tmp_path / "boom.py")
    other = Table.from_function(["a[0]", "a[1]", "b[0]", "c"], ["s[0]", "s[1]", "s[2]"], lambda p: [p > 0] * 3)
    (tmp_path / "ports.py").write_text(module_source(other, _cover(other), source_name="x"))
    with pytest.raises(ArtifactError, match="port 'b'"):  # made for another spec: bad input, not a failed check
        check_artifact(t, tmp_path / "ports.py")


def test_wide_module_is_proven_from_its_own_logic_not_its_embedded_data(tmp_path: Path) -> None:
    """Above the exhaustive limit the verdict is the SAT proof on the module's netlist; the PLAFORGE_ARTIFACT lines
    are not trusted, so tampering with them changes nothing, while tampering with the logic is caught."""
    n = 20
    names = tuple(f"addr[{i}]" for i in range(n))
    # address decoder (invented demo map): sel0 = top nibble 0xA, sel1 = addr[19:16] == 0x3 and addr[0] == 0
    on = ((Cube(0xF0000, 0xA0000, 1),), (Cube(0xF0001, 0x30000, 2),))
    t = Table(names, ("sel0", "sel1"), on, ((), ()), (None, None), source="dec.toml")
    cov = Cover(names, ("sel0", "sel1"), (Cube(0xF0000, 0xA0000, 1), Cube(0xF0001, 0x30000, 2)))
    text = module_source(t, cov, source_name="dec.toml")
    (tmp_path / "dec.py").write_text(text)
    v = check_artifact(t, tmp_path / "dec.py", samples=200, enum_limit=16)
    assert v.passed and all(o.method.startswith("proven: SAT on the gate netlist") for o in v.outputs)
    v = check_artifact(t, tmp_path / "dec.py", samples=200, simulate=True)
    assert v.passed and all("sampled: Amaranth simulation" in o.method for o in v.outputs)
    data = text.replace('"----------------0101 10"', '"----------------0111 10"')
    assert data != text
    (tmp_path / "data.py").write_text(data)
    assert check_artifact(t, tmp_path / "data.py").passed
    # the logic tampered with: sel0 also decodes top nibble 0xE
    logic = text.replace("self.addr[17] & ~self.addr[18] & self.addr[19]", "self.addr[17] & self.addr[19]")
    assert logic != text
    (tmp_path / "tampered.py").write_text(logic)
    v = check_artifact(t, tmp_path / "tampered.py")
    assert [o.passed for o in v.outputs] == [False, True]
    p = v.outputs[0].failure[0]
    assert p >> 16 == 0xE  # the one extra nibble the edited AND admits (reference: the edit above)


# -- commands ------------------------------------------------------------------------------------------------------
def test_module_and_check_commands(tmp_path: Path) -> None:
    t = _add2()
    spec = tmp_path / "add2.pla"
    spec.write_text(write_table_pla(t))
    runner = CliRunner()
    out = tmp_path / "add2_sop.py"
    res = runner.invoke(cli, ["module", str(spec), "-o", str(out), "--verilog", str(tmp_path / "add2.v"),
                              "--harness", str(tmp_path / "test_add2.py")])
    assert res.exit_code == 0, res.output
    assert out.is_file() and (tmp_path / "add2.v").is_file() and (tmp_path / "test_add2.py").is_file()
    assert "module add2 (" in (tmp_path / "add2.v").read_text()  # the design name (the spec's stem here)
    res = runner.invoke(cli, ["module", str(spec), "--style", "lut", "-k", "3", "-o", str(tmp_path / "add2_lut.py")])
    assert res.exit_code == 0, res.output
    for art in ("add2_sop.py", "add2_lut.py"):
        res = runner.invoke(cli, ["check", str(spec), str(tmp_path / art)])
        assert res.exit_code == 0, res.output
        assert "3 of 3 outputs pass" in res.output and "PASS" in res.output
    (tmp_path / "bad.pla").write_text(write_pla(_corrupt(_cover(t))))
    res = runner.invoke(cli, ["check", str(spec), str(tmp_path / "bad.pla")])
    assert res.exit_code == 1
    assert "FAIL" in res.output and "first failure at" in res.output
    res = runner.invoke(cli, ["check", str(spec), str(tmp_path / "missing.json")])
    assert res.exit_code == 2 and "Traceback" not in res.output
    res = runner.invoke(cli, ["module", str(spec), "--harness", str(tmp_path / "t.py")])
    assert res.exit_code == 2 and "give the module file with -o" in res.output
    res = runner.invoke(cli, ["module", str(spec)])
    assert res.exit_code == 0 and "class Add2(wiring.Component):" in res.output
