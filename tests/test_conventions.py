"""docs/conventions.md is read here and held against the code, so the written contract cannot drift silently.

Behaviour is also held against outside references where one exists: the PLA format's type semantics (the open
two-level PLA format, from memory) and the LUT INIT bit order (common practice).
"""

from __future__ import annotations

import json
import re
from pathlib import Path

import click
import pytest
from click.testing import CliRunner

from plaforge.bundled import sample_path
from plaforge.cli import cli
from plaforge.core import errors
from plaforge.core.network import Lut, init_hex
from plaforge.formats import read_spec
from plaforge.formats.pla import parse_pla

ROOT = Path(__file__).resolve().parent.parent
DOC = ROOT / "docs" / "conventions.md"
TEXT = DOC.read_text(encoding="utf-8")


def _section(title: str) -> str:
    """The text under the heading ``title`` up to the next heading of the same or a higher level."""
    lines = TEXT.splitlines()
    for i, line in enumerate(lines):
        m = re.match(r"^(#+) (.*)$", line)
        if m and m.group(2).strip() == title:
            level = len(m.group(1))
            out = []
            for nxt in lines[i + 1:]:
                h = re.match(r"^(#+) ", nxt)
                if h and len(h.group(1)) <= level:
                    break
                out.append(nxt)
            return "\n".join(out)
    raise AssertionError(f"docs/conventions.md has no heading {title!r}")


def _tables(section: str) -> list[list[list[str]]]:
    """Markdown tables of a section, each a list of rows of cells (header row first, separator row dropped)."""
    tables: list[list[list[str]]] = []
    current: list[list[str]] = []
    for line in section.splitlines():
        s = line.strip()
        if s.startswith("|"):
            cells = [c.strip() for c in s.strip("|").split("|")]
            if not all(re.fullmatch(r":?-+:?", c) for c in cells):
                current.append(cells)
        elif current:
            tables.append(current)
            current = []
    if current:
        tables.append(current)
    return tables


def _keys(section: str, table: int = 0) -> list[str]:
    """First-column backticked keys of a table in a section, in order."""
    rows = _tables(section)[table][1:]
    return [re.fullmatch(r"`([^`]+)`", r[0]).group(1) for r in rows]  # type: ignore[union-attr]


def _invoke(*args: str) -> tuple[int, str, str]:
    res = CliRunner().invoke(cli, list(args))
    return res.exit_code, res.stdout, res.stderr


MEMORY_MAP = str(sample_path("memory_map.toml"))


# --- exit statuses --------------------------------------------------------------------------------------------------

def test_exit_status_table_matches_the_error_classes():
    rows = _tables(_section("Exit statuses"))[0][1:]
    statuses = [int(r[0]) for r in rows]
    assert statuses == [0, 1, 2, 3, 4]
    constants = [errors.EXIT_OK, errors.EXIT_CHECK_FAILED, errors.EXIT_BAD_INPUT, errors.EXIT_LIMIT,
                 errors.EXIT_INTERNAL]
    assert constants == statuses
    named = 0
    for status, row in zip(statuses, rows):
        for name in re.findall(r"`(\w+)`", row[2]):
            cls = getattr(errors, name)
            assert issubclass(cls, errors.PlaforgeError)
            assert cls.exit_code == status, name
            named += 1
    assert named == len([n for n in errors.__all__ if n[0].isupper() and not n.startswith("EXIT")])


def test_statuses_as_the_cli_exits_with_them(tmp_path, monkeypatch):
    # bad input: one line on stderr, status 2
    code, _out, err = _invoke("inspect", str(tmp_path / "table.txt"))
    assert code == 2 and err.count("\n") == 1 and err.startswith("plaforge: ")
    # a result that does not fit a budget: status 1
    code, _out, err = _invoke("build", MEMORY_MAP, "-o", str(tmp_path / "b"), "--budget-rows", "1")
    assert code == 1 and "does not fit" in err
    # an unexpected exception: status 4 and the documented prefix

    def boom(path: object) -> None:
        raise RuntimeError("simulated bug")

    monkeypatch.setattr("plaforge.cli.inspect.read_spec", boom)
    code, _out, err = _invoke("inspect", MEMORY_MAP)
    assert code == 4 and err.startswith("plaforge: internal error, please report: ")


# --- JSON objects -----------------------------------------------------------------------------------------------------

def test_minimize_json_keys_in_documented_order():
    code, out, _err = _invoke("minimize", MEMORY_MAP, "--json")
    assert code == 0
    obj = json.loads(out)
    section = _section("`plaforge minimize --json`")
    assert list(obj) == _keys(section, 0) + _keys(section, 1)  # the cover's figures, then the design name
    assert obj["name"] == "kestrel8_decoder"  # memory_map.toml's [design] name
    assert obj["method"] in ("heuristic", "exact")
    table = read_spec(MEMORY_MAP)
    assert list(obj["terms"]) == list(table.output_names)  # output name, in output order
    assert (obj["inputs"], obj["outputs"]) == (table.n_inputs, table.n_outputs)


def test_lut_json_keys_and_init_strings():
    section = _section("The LUT JSON file")
    code, out, _err = _invoke("luts", MEMORY_MAP, "-k", "4", "--json")
    assert code == 0
    obj = json.loads(out)
    assert list(obj) == _keys(section, 0)
    assert obj["count"] == len(obj["luts"])
    seen = {"0", "1", *obj["inputs"]}
    for lut in obj["luts"]:
        assert list(lut) == _keys(section, 1)
        assert len(lut["inputs"]) <= obj["k"]
        assert all(x in seen for x in lut["inputs"])  # topological order, as documented
        assert re.fullmatch(r"0x[0-9A-Fa-f]+", lut["init"])
        assert len(lut["init"]) - 2 == max(1, (1 << len(lut["inputs"])) // 4)  # 2^n bits in hex
        seen.add(lut["name"])
    assert all(d in seen for d in obj["outputs"].values())


def test_build_json_keys(tmp_path):
    code, out, _err = _invoke("build", MEMORY_MAP, "-o", str(tmp_path / "b"), "-k", "4", "--budget-rows", "1000",
                              "--budget-luts", "1000", "--json")
    assert code == 0
    obj = json.loads(out)
    section = _section("`plaforge build --json`")
    top = _keys(section, 0)
    assert set(obj) == set(top)
    assert list(obj) == sorted(obj)  # printed with keys sorted, at every level
    assert list(obj["cover"]) == sorted(_keys(_section("`plaforge minimize --json`")))
    nested = _keys(section, 1)
    assert {k.split(".", 1)[1] for k in nested} == set(obj["luts"])
    rows = {r[0].strip("`"): r[1] for r in _tables(section)[0][1:]}
    assert set(obj["artifacts"]) == set(re.findall(r"`(\w+)`", rows["artifacts"]))
    assert set(obj["checks"]) == set(re.findall(r"`(\w+)`", rows["checks"])) - {"true", "false"}
    assert all(isinstance(v, bool) for c in obj["checks"].values() for v in c.values())
    assert set(obj["fit"]) == {"rows", "luts"}
    assert all(set(v) == {"budget", "used", "fits"} for v in obj["fit"].values())


# --- command line ------------------------------------------------------------------------------------------------------

def _synopsis() -> dict[str, str]:
    block = re.search(r"```\n(.*?)```", _section("Command line"), re.DOTALL)
    assert block is not None
    lines = {}
    for line in block.group(1).splitlines():
        words = line.split()
        if len(words) >= 2 and words[0] == "plaforge" and not words[1].startswith("-"):
            lines[words[1]] = " ".join(words[2:])
    return lines


def test_synopsis_names_every_command_option_and_argument():
    synopsis = _synopsis()
    assert set(synopsis) == set(cli.commands)  # type: ignore[attr-defined]
    for name, rest in synopsis.items():
        cmd = cli.commands[name]  # type: ignore[attr-defined]
        doc_opts = set(re.findall(r"(?<![\w-])(--?[a-z][a-z-]*)", rest))
        # An argument is an upper-case word; written alone it is required, alone in brackets (`[COVER]`) optional.
        doc_args = [(m.group(2) or m.group(1), m.group(1) is None)
                    for m in re.finditer(r"\[([A-Z][A-Z_]*)\]|\[[^\]]*\]|(?<!\S)([A-Z][A-Z_]*)(?!\S)", rest)
                    if m.group(1) or m.group(2)]
        options = [p for p in cmd.params if isinstance(p, click.Option) and "--help" not in p.opts]
        arguments = [(p.name.upper(), p.required) for p in cmd.params if isinstance(p, click.Argument)]
        assert doc_args == arguments, name
        for opt in options:
            assert doc_opts & set(opt.opts + opt.secondary_opts), (name, opt.opts)
        known = {o for opt in options for o in opt.opts + opt.secondary_opts}
        assert doc_opts <= known, (name, doc_opts - known)


# --- the PLA dialect (PLA format, from memory) ------------------------------------------------------------------------

_TYPE_TABLE = next(t for t in _tables(_section("The PLA dialect")) if t[0][0] == "char")


@pytest.mark.parametrize("pla_type", ["f", "fd", "fr", "fdr", "r", "dr"])
@pytest.mark.parametrize("row", _TYPE_TABLE[1:], ids=lambda r: r[0])
def test_output_character_table(pla_type, row):
    # PLA format (from memory): under f/fd unmentioned combinations are OFF, under fr/fdr they are don't-care,
    # under r/dr (the rows list the OFF set and, for dr, the don't-cares) they are ON.
    char = row[0].strip("`")
    said = row[_TYPE_TABLE[0].index(f"`{pla_type}`")]
    t = parse_pla(f".i 1\n.o 1\n.type {pla_type}\n1 {char}\n.e\n", "t.pla")
    on, dc = t.evaluate(1)
    got = "DC" if dc & 1 else "ON" if on & 1 else "OFF"
    unmentioned = {"fr": "DC", "fdr": "DC", "r": "ON", "dr": "ON"}.get(pla_type, "OFF")
    assert got == (unmentioned if said == "nothing" else said)
    on0, dc0 = t.evaluate(0)
    assert ("DC" if dc0 & 1 else "ON" if on0 & 1 else "OFF") == unmentioned


def test_leftmost_input_column_is_input_0_and_default_type_is_fd():
    assert "**leftmost input column is input 0**" in _section("The PLA dialect")
    t = parse_pla(".i 2\n.o 1\n10 1\n01 -\n.e\n", "t.pla")
    assert t.evaluate(0b01) == (1, 0)  # input 0 is 1, input 1 is 0
    assert t.evaluate(0b10) == (0, 1)  # '-' is don't-care under the default type fd
    assert t.evaluate(0b11) == (0, 0)


def test_written_cover_carries_names_type_and_row_count(tmp_path):
    out = tmp_path / "c.pla"
    code, _o, _e = _invoke("minimize", MEMORY_MAP, "-o", str(out))
    assert code == 0
    lines = [ln for ln in out.read_text().splitlines() if not ln.startswith("#")]
    directives = [ln.split()[0] for ln in lines if ln.startswith(".")]
    assert directives == [".i", ".o", ".ilb", ".ob", ".type", ".p", ".e"]
    assert ".type fd" in lines
    rows = [ln for ln in lines if not ln.startswith(".")]
    p = int(next(ln for ln in lines if ln.startswith(".p ")).split()[1])
    assert p == len(rows) > 0


# --- LUT INIT bit order (common practice) -----------------------------------------------------------------------------

def test_init_bit_order_example():
    section = _section("LUT INIT bit order (common practice)")
    assert "`0x8`" in section and "`0x8888`" in section
    # common practice: a 2-input AND on fan-ins 0 and 1 inside a 4-input LUT is 0x8888
    lut = Lut("n", ("a", "b", "c", "d"), 0x8888)
    for j in range(16):
        values = {"a": j & 1, "b": j >> 1 & 1, "c": j >> 2 & 1, "d": j >> 3 & 1}
        assert lut.eval(values) == (values["a"] & values["b"])
    assert init_hex(0x8888, 4) == "0x8888"
    assert init_hex(0x8, 2) == "0x8"


# --- the repository carries its own contracts -------------------------------------------------------------------------

def test_no_citation_of_a_document_outside_the_repository():
    outside = "DESIGN" + ".md"  # the name of a document that was never part of the repository
    places = [ROOT / "README.md", *ROOT.glob("docs/*.md"), *ROOT.glob("plaforge/**/*.py"), *ROOT.glob("tests/*.py"),
              *ROOT.glob("benchmarks/*.py")]
    citing = [str(p.relative_to(ROOT)) for p in places if outside in p.read_text(encoding="utf-8")]
    assert citing == []
