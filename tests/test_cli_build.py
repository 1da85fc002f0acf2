"""The whole path through ``plaforge build`` and ``plaforge demo``: artifacts written, checked, deterministic."""

from __future__ import annotations

import json

from click.testing import CliRunner

from plaforge.bundled import sample_names, sample_path
from plaforge.cli import cli


def test_demo_writes_and_checks_every_artifact(tmp_path):
    out = tmp_path / "demo"
    res = CliRunner().invoke(cli, ["demo", "-o", str(out)])
    assert res.exit_code == 0, res.output + res.stderr
    names = sample_names()
    assert len(names) >= 7
    for name in names:  # one subfolder per sample, named after the file, with its report and checked artifacts
        folder = out / name.rsplit(".", 1)[0]
        assert (folder / "report.md").is_file() and (folder / "report.html").is_file(), name
        assert f"  {folder / 'report.html'}" in res.output.splitlines(), name  # printed where to look
        assert len(list(folder.glob("*.pla"))) == 1 and len(list(folder.glob("*_lut.v"))) == 1, name
    stem = "kestrel8_decoder"  # the memory-map sample's [design] name
    for name in (f"{stem}.pla", f"{stem}.luts.json", f"{stem}_sop.py", f"{stem}_lut.py", f"{stem}.v",
                 f"{stem}_lut.v", f"test_{stem}.py"):
        assert (out / "memory_map" / name).is_file(), name
    assert "FAIL" not in res.output
    assert res.output.count("; 6 checks pass;") == len(names)  # cover, network, both modules, both Verilog files
    wide = next(ln for ln in res.output.splitlines() if ln.startswith("  wide_address_map.toml:"))
    assert "heuristic, too large for the exact path" in wide  # 32 inputs: the exact path refuses, the demo goes on
    assert "Caution" in res.output


def test_build_json_and_determinism(tmp_path):
    spec = str(sample_path("segment_display.csv"))
    a, b = tmp_path / "a", tmp_path / "b"
    r1 = CliRunner().invoke(cli, ["build", spec, "-o", str(a), "-k", "4", "--json"])
    r2 = CliRunner().invoke(cli, ["build", spec, "-o", str(b), "-k", "4", "--json"])
    assert r1.exit_code == 0 and r2.exit_code == 0, r1.output + r1.stderr
    obj = json.loads(r1.output)  # --json: exactly one JSON object on stdout
    assert obj["passed"] is True and obj["inputs"] == 6 and obj["outputs"] == 7
    assert obj["luts"]["k"] == 4
    assert set(obj["checks"]) == {"cover", "luts", "module_sop", "module_lut", "verilog", "verilog_lut"}
    for f in a.iterdir():  # docs/conventions.md: the same input gives byte-identical artifacts
        assert f.read_bytes() == (b / f.name).read_bytes(), f.name


def test_budget_that_does_not_fit_exits_1(tmp_path):
    spec = str(sample_path("arbiter.pla"))
    res = CliRunner().invoke(cli, ["build", spec, "-o", str(tmp_path), "--budget-rows", "1"])
    assert res.exit_code == 1
    assert "budget rows: needs" in res.output and "1 available:" in res.output
    assert "does not fit the stated device or budget" in res.stderr
