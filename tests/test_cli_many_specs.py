"""``plaforge minimize`` and ``plaforge luts`` with several specs or a directory: a process pool, one line per spec
in a stable order, a JSON list, one file per spec named after its design, the worst status wins; and ``--name``.

Every cover and LUT network written is checked twice: by the project's own checker (``plaforge check``) and by a
brute-force evaluation written here, held against tests/oracle_formats.py (a second reading of the spec formats
written from docs/formats.md alone, sharing no code with plaforge): every input combination is visited, the cover
as an OR of its rows (PLA format, from memory: leftmost input column is input 0, ``.phase 0`` complements) and the
LUT network through its INITs (common practice: bit j of an INIT is the output for fan-in values reading j, fan-in
0 least significant).
"""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import oracle_formats as oracle
import pytest
from click.testing import CliRunner

from plaforge.bundled import sample_path
from plaforge.cli import cli

MEMORY_NAME = "kestrel8_decoder"  # memory_map.toml's [design] name
BROKEN = ".i 2\n.o 1\n0z 1\n.e\n"  # line 3, column 2: not an input character


def _run(*args: str):
    return CliRunner().invoke(cli, [str(a) for a in args])


@pytest.fixture
def specs(tmp_path):
    """A directory of three good specs, one per format."""
    src = tmp_path / "specs"
    src.mkdir()
    for name in ("segment_display.csv", "memory_map.toml", "arbiter.pla"):
        shutil.copy(sample_path(name), src / name)
    (src / "notes.txt").write_text("not a spec\n")
    return src


SORTED = ("arbiter.pla", "memory_map.toml", "segment_display.csv")  # the directory's specs by name
NAMES = {"arbiter.pla": "arbiter", "memory_map.toml": MEMORY_NAME, "segment_display.csv": "segment_display"}


# --- references written here ----------------------------------------------------------------------------------------

def _oracle(spec: Path) -> oracle.Spec:
    reader = {".pla": oracle.read_pla, ".csv": oracle.read_csv, ".toml": oracle.read_toml}[spec.suffix]
    return reader(spec.read_text())


def _cover_rows(text: str) -> tuple[list[str], list[str], list[tuple[str, str]], str | None]:
    """Input names, output names, rows and phase of a written cover (PLA format, from memory)."""
    ilb: list[str] = []
    ob: list[str] = []
    rows: list[tuple[str, str]] = []
    phase = None
    n = 0
    for raw in text.splitlines():
        line = raw.split("#")[0].strip()
        if not line:
            continue
        words = line.split()
        if words[0] == ".e":
            break
        if words[0] == ".i":
            n = int(words[1])
        elif words[0] == ".ilb":
            ilb = words[1:]
        elif words[0] == ".ob":
            ob = words[1:]
        elif words[0] == ".phase":
            phase = words[1]
        elif not words[0].startswith("."):
            chars = "".join(words)
            rows.append((chars[:n], chars[n:]))
    return ilb, ob, rows, phase


def _assert_cover_realizes(spec: Path, cover: Path) -> None:
    """Every care point of the spec (read by the oracle) gets its value from the cover, evaluated point by point."""
    ref = _oracle(spec)
    ilb, ob, rows, phase = _cover_rows(cover.read_text())
    assert ilb == ref.input_names and ob == ref.output_names
    n = len(ilb)
    for point, want in enumerate(ref.values):
        bits = [(point >> i) & 1 for i in range(n)]
        for j, value in enumerate(want):
            if value is None:
                continue
            got = int(any(outs[j] == "1" and all(c == "-" or int(c) == b for c, b in zip(inp, bits))
                          for inp, outs in rows))
            if phase is not None and phase[j] == "0":
                got = 1 - got
            assert got == value, (spec.name, point, ob[j])


def _assert_network_realizes(spec: Path, obj: dict) -> None:
    """The LUT JSON object evaluated LUT by LUT through its INITs agrees with every care point of the spec."""
    ref = _oracle(spec)
    assert obj["inputs"] == ref.input_names and list(obj["outputs"]) == ref.output_names
    for point, want in enumerate(ref.values):
        env = {"0": 0, "1": 1}
        env.update({name: (point >> i) & 1 for i, name in enumerate(obj["inputs"])})
        for lut in obj["luts"]:  # topological order (docs/conventions.md)
            j = sum(env[x] << pos for pos, x in enumerate(lut["inputs"]))
            env[lut["name"]] = (int(lut["init"], 16) >> j) & 1
        for (out, driver), value in zip(obj["outputs"].items(), want):
            if value is not None:
                assert env[driver] == value, (spec.name, point, out)


def _project_check(spec: Path, artifact: Path) -> None:
    res = _run("check", spec, artifact)
    assert res.exit_code == 0, res.output + res.stderr


# --- minimize ---------------------------------------------------------------------------------------------------------

def test_minimize_a_directory_one_cover_per_design(specs, tmp_path):
    out = tmp_path / "covers"
    res = _run("minimize", specs, "-o", out, "-j", "2")
    assert res.exit_code == 0, res.output + res.stderr
    lines = res.stdout.splitlines()
    assert len(lines) == 4 and "notes.txt" not in res.stdout
    for line, name in zip(lines, SORTED):  # one line per spec, sorted by name
        cover = out / f"{NAMES[name]}.pla"
        assert line.startswith(f"{specs / name}: ") and line.endswith(f"; written to {cover}")
        assert "# design " + NAMES[name] in cover.read_text().splitlines()[:3]
        _assert_cover_realizes(specs / name, cover)
        _project_check(specs / name, cover)
    assert lines[3] == f"3 specs into {out}/: 3 minimized, 0 failed"
    assert sorted(p.name for p in out.iterdir()) == sorted(f"{n}.pla" for n in NAMES.values())


def test_minimize_json_list_in_the_order_given_and_jobs_do_not_change_results(specs, tmp_path):
    given = [specs / "segment_display.csv", specs / "arbiter.pla", specs / "memory_map.toml"]  # not sorted
    results = {}
    for jobs in ("1", "2"):
        out = tmp_path / f"j{jobs}"
        res = _run("minimize", *given, "-o", out, "-j", jobs, "--json")
        assert res.exit_code == 0, res.output + res.stderr
        objs = json.loads(res.stdout)
        assert isinstance(objs, list) and [o["spec"] for o in objs] == [str(s) for s in given]
        for o, spec in zip(objs, given):
            assert o["name"] == NAMES[spec.name] and o["status"] == 0 and o["error"] is None
            assert o["output"] == str(out / f"{o['name']}.pla")
            assert list(o)[-5:] == ["name", "spec", "output", "status", "error"]
            text = Path(o["output"]).read_text()
            assert f".p {o['rows']}" in text  # the figures are the written cover's
            _assert_cover_realizes(spec, Path(o["output"]))
            o.pop("seconds"), o.pop("output")
        results[jobs] = (objs, {p.name: p.read_bytes() for p in out.iterdir()})
    assert results["1"] == results["2"]  # same figures and byte-identical covers in and out of the pool


def test_minimize_one_bad_spec_exits_2_and_the_good_ones_are_written(specs, tmp_path):
    (specs / "broken.pla").write_text(BROKEN)
    out = tmp_path / "covers"
    res = _run("minimize", specs, "-o", out, "-j", "2")
    assert res.exit_code == 2, res.output + res.stderr
    lines = res.stdout.splitlines()
    assert lines[0].startswith(f"{specs / 'arbiter.pla'}: ")
    assert lines[1].startswith(f"{specs / 'broken.pla'}: ") and "broken.pla:3:2:" in lines[1]
    assert lines[4] == f"4 specs into {out}/: 3 minimized, 1 failed"
    assert res.stderr == f"plaforge: 1 of 4 specs failed: {specs / 'broken.pla'} (see above)\n"
    assert not (out / "broken.pla").exists()
    for name in SORTED:
        _assert_cover_realizes(specs / name, out / f"{NAMES[name]}.pla")
    res = _run("minimize", specs / "broken.pla", specs / "arbiter.pla", "--json", "-j", "1")
    assert res.exit_code == 2
    bad, good = json.loads(res.stdout)
    assert bad == {"spec": str(specs / "broken.pla"), "output": None, "status": 2, "error": bad["error"]}
    assert "broken.pla:3:2:" in bad["error"] and good["status"] == 0 and good["rows"] > 0


def test_minimize_the_worst_status_wins(specs, tmp_path):
    # a profile of 15 shared rows: arbiter needs 16 (status 1), the decoder 13 and the display 14 fit
    profile = tmp_path / "rows15.toml"
    profile.write_text('[device]\nname = "rows15"\nrows = 15\n')
    res = _run("minimize", specs / "memory_map.toml", specs / "arbiter.pla", "--device", profile)
    assert res.exit_code == 1, res.output + res.stderr
    lines = res.stdout.splitlines()
    assert lines[0].endswith("; fits device rows15") and lines[1].endswith("; does not fit device rows15")
    (specs / "broken.pla").write_text(BROKEN)
    res = _run("minimize", specs / "arbiter.pla", specs / "broken.pla", "--device", profile, "-j", "1")
    assert res.exit_code == 2 and "2 of 2 specs failed" in res.stderr  # bad input (2) outranks a misfit (1)


def test_minimize_name_names_the_cover_and_the_json(specs, tmp_path):
    cover = tmp_path / "glue.pla"
    res = _run("minimize", specs / "arbiter.pla", "-o", cover, "--name", "front_panel")
    assert res.exit_code == 0 and res.stdout.splitlines()[-1] == f"cover written to {cover}"
    assert cover.read_text().splitlines()[2] == "# design front_panel"
    _assert_cover_realizes(specs / "arbiter.pla", cover)
    res = _run("minimize", specs / "arbiter.pla", "--name", "front_panel", "--json")
    assert json.loads(res.stdout)["name"] == "front_panel"
    # without --name: the [design] name, else the file name without its extension
    assert json.loads(_run("minimize", specs / "memory_map.toml", "--json").stdout)["name"] == MEMORY_NAME
    assert json.loads(_run("minimize", specs / "arbiter.pla", "--json").stdout)["name"] == "arbiter"


@pytest.mark.parametrize("extra", [["--name", "x"], ["--listing"]])
def test_minimize_refuses_one_spec_options_with_several(specs, tmp_path, extra):
    res = _run("minimize", specs, "-o", tmp_path / "o", *extra)
    assert res.exit_code == 2 and res.stderr.count("\n") == 1 and extra[0] in res.stderr
    assert not (tmp_path / "o").exists()


def test_minimize_refuses_before_any_work_files_that_collide(specs, tmp_path):
    other = tmp_path / "other"
    other.mkdir()
    shutil.copy(specs / "arbiter.pla", other / "arbiter.pla")
    res = _run("minimize", specs / "arbiter.pla", other / "arbiter.pla", "-o", tmp_path / "o")
    assert res.exit_code == 2 and "both have the design name 'arbiter'" in res.stderr
    assert not (tmp_path / "o").exists()
    before = (specs / "arbiter.pla").read_bytes()
    res = _run("minimize", specs, "-o", specs)  # arbiter.pla's cover would land on the spec itself
    assert res.exit_code == 2 and "would destroy the input" in res.stderr
    assert (specs / "arbiter.pla").read_bytes() == before and not (specs / f"{MEMORY_NAME}.pla").exists()


def test_one_spec_keeps_o_as_a_file_and_a_directory_keeps_it_a_directory(specs, tmp_path):
    res = _run("minimize", specs / "arbiter.pla", "-o", tmp_path / "one.pla", "--json")
    assert res.exit_code == 0 and isinstance(json.loads(res.stdout), dict) and (tmp_path / "one.pla").is_file()
    single = tmp_path / "single"
    single.mkdir()
    shutil.copy(specs / "arbiter.pla", single / "arbiter.pla")
    res = _run("minimize", single, "-o", tmp_path / "d", "--json")
    assert res.exit_code == 0 and isinstance(json.loads(res.stdout), list)
    assert (tmp_path / "d" / "arbiter.pla").read_bytes() == (tmp_path / "one.pla").read_bytes()
    _assert_cover_realizes(single / "arbiter.pla", tmp_path / "d" / "arbiter.pla")


# --- luts -------------------------------------------------------------------------------------------------------------

def test_luts_a_directory_every_export_per_design(specs, tmp_path):
    out = tmp_path / "luts"
    res = _run("luts", specs, "-k", "4", "-o", out, "--c-header", out, "--verilog", out, "-j", "2")
    assert res.exit_code == 0, res.output + res.stderr
    lines = res.stdout.splitlines()
    assert lines[-1] == "3 specs: 3 mapped, 0 failed" and len(lines) == 4
    for line, name in zip(lines, SORTED):
        stem = NAMES[name]
        files = [out / f"{stem}.luts.json", out / f"{stem}.h", out / f"{stem}.v"]
        assert line.startswith(f"{specs / name}: ") and "4-input LUTs in depth" in line
        assert line.endswith("written to " + ", ".join(str(f) for f in files))
        _assert_network_realizes(specs / name, json.loads(files[0].read_text()))
        _project_check(specs / name, files[0])
        assert f"{stem.upper()}_LUTS_H" in files[1].read_text()  # the C prefix is the design name
        assert f"module {stem}" in files[2].read_text()


def test_luts_json_list_and_jobs_do_not_change_results(specs, tmp_path):
    (specs / "broken.pla").write_text(BROKEN)
    results = []
    for jobs in ("1", "2"):
        out = tmp_path / f"j{jobs}"
        res = _run("luts", specs, "-o", out, "-j", jobs, "--json")
        assert res.exit_code == 2, res.output + res.stderr  # the broken spec; the others are still mapped
        objs = json.loads(res.stdout)
        assert [Path(o["spec"]).name for o in objs] == ["arbiter.pla", "broken.pla", *SORTED[1:]]
        assert objs[1]["status"] == 2 and "broken.pla:3:2:" in objs[1]["error"] and "luts" not in objs[1]
        assert objs[1]["output"] == str(out / "broken.luts.json") and not Path(objs[1]["output"]).exists()
        objs[1].pop("output")
        for o in objs[:1] + objs[2:]:
            spec = Path(o["spec"])
            assert o["status"] == 0 and o["name"] == NAMES[spec.name] and o["c_header"] is None
            written = json.loads(Path(o["output"]).read_text())
            assert written == {k: o[k] for k in written}  # the list entry starts with the file's object
            _assert_network_realizes(spec, written)
            o.pop("output")
        results.append(objs)
    assert results[0] == results[1]


def test_luts_refusals_with_several_specs(specs, tmp_path):
    for extra in (["--name", "x"], ["--init-format", "bits"]):
        res = _run("luts", specs, "-o", tmp_path / "o", *extra)
        assert res.exit_code == 2 and res.stderr.count("\n") == 1 and extra[0] in res.stderr
    assert not (tmp_path / "o").exists()


def test_luts_name_defaults_to_the_design_name(specs, tmp_path):
    hdr = tmp_path / "x.h"
    res = _run("luts", specs / "memory_map.toml", "-k", "4", "--c-header", hdr)
    assert res.exit_code == 0, res.output + res.stderr
    assert f"{MEMORY_NAME.upper()}_LUTS_H" in hdr.read_text()  # [design] name, as build and module
    res = _run("luts", specs / "memory_map.toml", "-k", "4", "--c-header", hdr, "--name", "panel")
    assert res.exit_code == 0 and "PANEL_LUTS_H" in hdr.read_text()
