"""A designer's day in one command: names, listings, device fit, readable Verilog, the build report.

Outside references: iverilog -Wall (the Verilog compiles without a warning), Python's html.parser and
xml.etree (the report and its SVG pictures parse), headless chromium where installed (the report renders), and
De Morgan's law (common practice: a 9-input NAND is 9 product terms as a sum of products, 1 inverted).
"""

from __future__ import annotations

import json
import re
import shutil
import subprocess
import xml.etree.ElementTree as ET
from html.parser import HTMLParser
from pathlib import Path

import pytest
from click.testing import CliRunner

from plaforge.bundled import sample_path
from plaforge.cli import cli
from plaforge.flow import realize
from plaforge.formats import read_spec
from plaforge.listing import bit_ranges, listing_text

MEMORY_MAP = str(sample_path("memory_map.toml"))


def _run(*args: str) -> object:
    return CliRunner().invoke(cli, list(args))


@pytest.fixture(scope="module")
def built(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, dict, str]:
    out = tmp_path_factory.mktemp("b")
    res = _run("build", MEMORY_MAP, "-o", str(out), "-k", "4", "--json", "--device", "sop-8x8")
    assert res.exit_code == 0, res.output + res.stderr
    return out, json.loads(res.output), res.output


# --- names -------------------------------------------------------------------------------------------------------

def test_design_name_from_toml_names_files_class_and_module(built):
    out, obj, _ = built
    assert obj["name"] == "kestrel8_decoder"  # samples/memory_map.toml: [design] name
    assert (out / "kestrel8_decoder.pla").is_file() and (out / "kestrel8_decoder_lut.v").is_file()
    assert "class Kestrel8Decoder(wiring.Component)" in (out / "kestrel8_decoder_sop.py").read_text()
    assert re.search(r"^module kestrel8_decoder \($", (out / "kestrel8_decoder.v").read_text(), re.MULTILINE)


def test_name_option_wins_and_is_sanitized(tmp_path):
    res = _run("build", MEMORY_MAP, "-o", str(tmp_path), "--name", "door-lock 2")
    assert res.exit_code == 0, res.stderr
    assert (tmp_path / "door_lock_2.v").is_file()
    assert "class DoorLock2(" in (tmp_path / "door_lock_2_sop.py").read_text()


def test_module_from_a_cover_made_earlier_and_refuses_a_wrong_one(built, tmp_path):
    out, _, _ = built
    cover = out / "kestrel8_decoder.pla"
    good = _run("module", MEMORY_MAP, "--from", str(cover), "--name", "decoder", "-o", str(tmp_path / "d.py"))
    assert good.exit_code == 0, good.stderr
    assert "class Decoder(" in (tmp_path / "d.py").read_text()
    rows = cover.read_text().splitlines()
    k = next(i for i, r in enumerate(rows) if r and r[0] in "01-")
    ins, outs = rows[k].split()
    rows[k] = f"{ins} {''.join('1' if c == '0' else '0' for c in outs)}"  # the row now feeds the other outputs
    (tmp_path / "bad.pla").write_text("\n".join(rows) + "\n")
    bad = _run("module", MEMORY_MAP, "--from", str(tmp_path / "bad.pla"))
    assert bad.exit_code == 1
    assert re.search(r"does not realize the spec: .+ differ", bad.stderr)


# --- listing -----------------------------------------------------------------------------------------------------

def test_bit_ranges_group_runs_high_bit_first():
    assert bit_ranges([f"addr[{b}]" for b in range(4, 16)] + ["rw"]) == ["addr[15:4]", "rw"]
    assert bit_ranges(["a[0]", "a[2]", "a[3]"]) == ["a[3:2]", "a[0]"]


def _listing_value(lines: list[str], point: int, names: tuple[str, ...]) -> int:
    """Evaluate one equation of the listing by its own syntax: ~ bit, & and, | or, ~lhs inverted."""
    body = " ".join(ln.strip() for ln in lines if not ln.startswith("#"))
    lhs, rhs = body.split(" = ", 1)
    value = {n: point >> i & 1 for i, n in enumerate(names)}

    def lit(text: str) -> int:
        return 1 - value[text[1:]] if text.startswith("~") else value[text]

    terms = [t.strip() for t in rhs.split("|")]
    got = 0 if rhs.strip() == "0" else int(any(all(lit(x.strip()) for x in t.split("&")) for t in terms))
    return 1 - got if lhs.startswith("~") else got


@pytest.mark.parametrize("phase", [False, True])
def test_listing_equations_compute_the_table(phase):
    from plaforge.minimize import MinimizeOptions

    t = read_spec(MEMORY_MAP)
    cover = realize(t, "sop", minimize_options=MinimizeOptions(phase=phase))
    blocks = listing_text(t, cover).strip().split("\n\n")
    assert len(blocks) == t.n_outputs
    for j, block in enumerate(blocks):
        lines = block.splitlines()
        for p in range(1 << t.n_inputs):
            on, dc = t.evaluate(p)
            if not dc >> j & 1:
                assert _listing_value(lines, p, t.input_names) == on >> j & 1, (lines[0], p)


def test_minimize_listing_and_inspect_ranges():
    res = _run("minimize", MEMORY_MAP, "--listing")
    assert res.exit_code == 0
    assert "# vram_cs: 1 term; depends on page[7:4], mreq" in res.output
    ins = _run("inspect", str(sample_path("wide_address_map.toml")))
    assert "depends on 16: addr[31:16]" in ins.output and "ON 1 cube," in ins.output
    assert "1 cubes" not in ins.output


# --- device fit ----------------------------------------------------------------------------------------------------

def test_sample_fits_one_profile_and_not_a_tighter_one(built, tmp_path):
    _, obj, _ = built
    assert obj["device"]["fits"] is True and obj["device"]["profile"] == "sop-8x8"
    assert obj["per_output"]["ram_cs"]["terms"] == max(o["terms"] for o in obj["per_output"].values())
    tight = _run("build", MEMORY_MAP, "-o", str(tmp_path), "--device", "sop-8x4-fixed")
    assert tight.exit_code == 1
    assert re.search(r"ram_cs: needs \d+ terms, 4 available: \d+ over", tight.output)
    assert "would help: splitting it over two macrocells" in tight.output
    assert "does not fit the stated device" in tight.stderr


def _nand9(tmp_path: Path) -> Path:
    """y = NOT(a0 & ... & a8): De Morgan gives 9 one-literal terms, or 1 term for the complement."""
    rows = ["1" * 9 + " 0"] + ["-" * i + "0" + "-" * (8 - i) + " 1" for i in range(9)]
    text = ".i 9\n.o 1\n.type fr\n" + "\n".join(rows) + "\n.e\n"
    p = tmp_path / "nand9.pla"
    p.write_text(text)
    return p


def test_table_fitting_only_by_phase_fits_a_polarity_device(tmp_path):
    spec = str(_nand9(tmp_path))
    fixed = _run("build", spec, "-o", str(tmp_path / "a"), "--device", "sop-8x4-fixed", "--json")
    assert fixed.exit_code == 1
    f = json.loads(fixed.stdout)
    assert f["device"]["outputs"]["y[0]"]["terms"] == 9 and f["device"]["outputs"]["y[0]"]["fits"] is False
    assert any("complement needs 1 terms" in h for h in f["device"]["outputs"]["y[0]"]["help"])
    pol = _run("build", spec, "-o", str(tmp_path / "b"), "--device", "sop-8x8", "--json")
    assert pol.exit_code == 0, pol.output + pol.stderr
    p = json.loads(pol.output)
    assert p["per_output"]["y[0]"] == {"terms": 1, "luts": p["per_output"]["y[0]"]["luts"], "inverted": True}
    assert p["passed"] is True


def test_profile_file_and_bad_profile(tmp_path):
    prof = tmp_path / "tiny.toml"
    prof.write_text('[device]\nname = "tiny"\nrows = 5\n')
    res = _run("minimize", MEMORY_MAP, "--device", str(prof))
    assert res.exit_code == 1 and re.search(r"rows: needs 13, 5 available: 8 over", res.output)
    prof.write_text('[device]\nrowz = 5\n')
    bad = _run("minimize", MEMORY_MAP, "--device", str(prof))
    assert bad.exit_code == 2 and "unknown key 'rowz'" in bad.stderr
    missing = _run("build", MEMORY_MAP, "--device", "no-such-device", "-o", str(tmp_path / "x"))
    assert missing.exit_code == 2 and re.search(r"built-in: .*sop-8x8", missing.stderr)


# --- Verilog ---------------------------------------------------------------------------------------------------------

@pytest.mark.skipif(shutil.which("iverilog") is None, reason="iverilog not installed")
@pytest.mark.parametrize("name", ["kestrel8_decoder.v", "kestrel8_decoder_lut.v"])
def test_readable_verilog_compiles_without_warnings_ports_in_spec_order(built, tmp_path, name):
    out, _, _ = built
    path = out / name
    run = subprocess.run(["iverilog", "-Wall", "-o", str(tmp_path / "a.out"), str(path)], capture_output=True,
                         text=True, check=False)
    assert run.returncode == 0 and run.stdout + run.stderr == "", run.stderr  # iverilog -Wall: no warning
    text = path.read_text()
    assert "`timescale 1ns / 1ps" in text and "SHA-256" in text and "Caution" in text
    assert "wait -> wait_" in text  # a Verilog keyword renamed, and said so in the header
    ports = re.findall(r"^\s+(?:input|output)\s+wire\s+(?:\[\d+:0\]\s+)?(\w+)", text, re.MULTILINE)
    t = read_spec(MEMORY_MAP)
    assert ports == [b.name if b.name != "wait" else "wait_" for b in t.input_buses + t.output_buses]
    assert "\\$" not in text


# --- report --------------------------------------------------------------------------------------------------------

class _Collect(HTMLParser):
    def __init__(self) -> None:
        super().__init__()
        self.tags: list[str] = []
        self.external: list[str] = []

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.tags.append(tag)
        for k, v in attrs:
            if k in ("src", "href") and v and not v.startswith("#"):
                self.external.append(v)


def test_report_html_is_self_contained_with_both_pictures(built):
    out, _, _ = built
    html = (out / "report.html").read_text()
    parser = _Collect()
    parser.feed(html)
    assert "script" not in parser.tags and parser.external == []
    assert parser.tags.count("svg") == 2
    svgs = [ET.fromstring(s) for s in re.findall(r"<svg .*?</svg>", html, re.DOTALL)]
    ns = "{http://www.w3.org/2000/svg}"
    t = read_spec(MEMORY_MAP)
    cover = realize(t, "sop")
    matrix = svgs[0]
    ones = sum(bin(c.care & c.value).count("1") for c in cover.cubes)
    assert len([r for r in matrix.iter(f"{ns}rect") if r.get("class") == "one"]) == ones
    assert len([c for c in matrix.iter(f"{ns}circle") if c.get("class") == "feeds"]) == sum(
        bin(c.outputs).count("1") for c in cover.cubes)
    net = json.loads((out / "kestrel8_decoder.luts.json").read_text())
    assert len([r for r in svgs[1].iter(f"{ns}rect") if r.get("class") == "lut"]) == net["count"]
    for word in ("proven", "Cautions", "device sop-8x8: fits", "rom_cs ="):
        assert word in html, word
    md = (out / "report.md").read_text()
    assert "## Checks against the source table" in md and "| verilog_lut | rom_cs | proven |" in md


def _chromium() -> str | None:
    return shutil.which("chromium") or shutil.which("chromium-browser")


@pytest.mark.skipif(_chromium() is None, reason="headless chromium not installed (apt-get install chromium)")
def test_report_renders_in_headless_chromium(built, tmp_path):
    out, _, _ = built
    run = subprocess.run([_chromium(), "--headless", "--no-sandbox", "--disable-gpu", "--dump-dom",
                          (out / "report.html").as_uri()], capture_output=True, text=True, timeout=120, check=False)
    assert run.returncode == 0, run.stderr[-500:]
    assert run.stdout.count("<svg") == 2 and "Checks against the source table" in run.stdout
