"""``plaforge build`` with several specs: a process pool, one subfolder per design, the worst status wins."""

from __future__ import annotations

import json
import shutil

import pytest
from click.testing import CliRunner

from plaforge.bundled import sample_path
from plaforge.cli import cli

MEMORY_STEM = "kestrel8_decoder"  # memory_map.toml's [design] name
ARTIFACTS = ("{s}.pla", "{s}.luts.json", "{s}_sop.py", "{s}_lut.py", "{s}.v", "{s}_lut.v", "test_{s}.py", "report.md")


@pytest.fixture
def specs(tmp_path):
    src = tmp_path / "specs"
    src.mkdir()
    shutil.copy(sample_path("memory_map.toml"), src / "memory_map.toml")
    shutil.copy(sample_path("arbiter.pla"), src / "arbiter.pla")
    return src


def _run(*args: str):
    return CliRunner().invoke(cli, ["build", *args])


def _assert_built(folder, stem):
    for pattern in ARTIFACTS:
        assert (folder / pattern.format(s=stem)).is_file(), pattern


def test_two_specs_in_a_pool_each_in_its_subfolder(specs, tmp_path):
    out = tmp_path / "out"
    res = _run(str(specs / "memory_map.toml"), str(specs / "arbiter.pla"), "-o", str(out), "-j", "2")
    assert res.exit_code == 0, res.output + res.stderr
    _assert_built(out / MEMORY_STEM, MEMORY_STEM)
    _assert_built(out / "arbiter", "arbiter")
    lines = res.stdout.splitlines()
    assert len(lines) == 3  # one line per spec in the order given, then the summary
    assert lines[0].startswith(f"{specs / 'memory_map.toml'}: {out / MEMORY_STEM}: ") and lines[0].endswith(
        "6 checks pass")
    assert lines[1].startswith(f"{specs / 'arbiter.pla'}: {out / 'arbiter'}: ")
    assert lines[2] == f"2 specs into {out}/: 2 built and checked, 0 failed"


def test_a_directory_means_its_specs_sorted_by_name(specs, tmp_path):
    (specs / "notes.txt").write_text("not a spec\n")
    out = tmp_path / "out"
    res = _run(str(specs), "-o", str(out), "-j", "1")
    assert res.exit_code == 0, res.output + res.stderr
    lines = res.stdout.splitlines()
    assert [ln.split(": ", 1)[0] for ln in lines[:2]] == [str(specs / "arbiter.pla"), str(specs / "memory_map.toml")]
    assert len(lines) == 3 and "notes.txt" not in res.stdout
    _assert_built(out / "arbiter", "arbiter")
    _assert_built(out / MEMORY_STEM, MEMORY_STEM)


def test_a_bad_spec_exits_2_and_the_good_one_is_still_built(specs, tmp_path):
    (specs / "broken.pla").write_text(".i 2\n.o 1\n0z 1\n.e\n")
    out = tmp_path / "out"
    res = _run(str(specs / "broken.pla"), str(specs / "arbiter.pla"), "-o", str(out), "-j", "2")
    assert res.exit_code == 2, res.output + res.stderr
    lines = res.stdout.splitlines()
    assert lines[0].startswith(f"{specs / 'broken.pla'}: ") and "broken.pla:3" in lines[0]
    assert lines[1].endswith("6 checks pass")
    assert lines[2] == f"2 specs into {out}/: 1 built and checked, 1 failed"
    assert res.stderr == f"plaforge: 1 of 2 specs failed: {specs / 'broken.pla'} (see above)\n"
    _assert_built(out / "arbiter", "arbiter")
    assert not (out / "broken").exists()


def test_the_worst_status_wins(specs, tmp_path):
    (specs / "broken.pla").write_text(".i 2\n.o 1\n0z 1\n.e\n")
    # arbiter does not fit one row (status 1), broken is bad input (status 2): the batch exits 2
    res = _run(str(specs / "arbiter.pla"), str(specs / "broken.pla"), "-o", str(tmp_path / "o"), "-j", "1",
               "--budget-rows", "1")
    assert res.exit_code == 2, res.output + res.stderr
    assert res.stdout.splitlines()[0].endswith("pass; does not fit")
    res = _run(str(specs / "arbiter.pla"), str(specs / "memory_map.toml"), "-o", str(tmp_path / "p"), "-j", "1",
               "--budget-rows", "1")
    assert res.exit_code == 1 and "2 of 2 specs failed" in res.stderr


def test_json_gives_a_list_of_objects(specs, tmp_path):
    out = tmp_path / "out"
    res = _run(str(specs), "-o", str(out), "-j", "2", "--json")
    assert res.exit_code == 0, res.output + res.stderr
    objs = json.loads(res.stdout)
    assert isinstance(objs, list) and len(objs) == 2
    assert [o["folder"] for o in objs] == [str(out / "arbiter"), str(out / MEMORY_STEM)]
    assert all(o["passed"] is True and o["status"] == 0 and o["error"] is None for o in objs)
    assert objs[1]["name"] == MEMORY_STEM and objs[1]["artifacts"]["cover"] == str(out / MEMORY_STEM / f"{MEMORY_STEM}.pla")


def test_one_spec_keeps_the_single_object_and_layout(specs, tmp_path):
    out = tmp_path / "out"
    res = _run(str(specs / "arbiter.pla"), "-o", str(out), "--json")
    assert res.exit_code == 0, res.output + res.stderr
    assert isinstance(json.loads(res.stdout), dict)
    _assert_built(out, "arbiter")


def test_two_specs_for_one_folder_are_refused(specs, tmp_path):
    res = _run(str(specs / "arbiter.pla"), str(specs / "memory_map.toml"), "-o", str(tmp_path / "o"),
               "--name", "same")
    assert res.exit_code == 2 and "both build into" in res.stderr
    assert not (tmp_path / "o").exists()


def test_an_empty_directory_is_bad_input(tmp_path):
    (tmp_path / "empty").mkdir()
    res = _run(str(tmp_path / "empty"), "-o", str(tmp_path / "o"))
    assert res.exit_code == 2 and "no .pla, .csv or .toml" in res.stderr
