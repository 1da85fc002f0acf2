"""Malformed input, tried the way a new user would: one SpecError naming FILE:LINE, and through the CLI exit 2 with
one line on stderr and no traceback."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

import pytest
from click.testing import CliRunner
from hypothesis import given, settings
from hypothesis import strategies as st

from plaforge.cli import cli
from plaforge.core.errors import SpecError
from plaforge.formats.csv import parse_csv
from plaforge.formats.design import parse_design
from plaforge.formats.pla import parse_cover, parse_pla

PLA_OK = ".i 3\n.o 2\n.ilb a b c\n.ob y z\n.p 2\n1-0 10\n011 01\n.e\n"
TOML_OK = """\
[inputs]
addr = 8
rw = 1

[outputs]
cs = 1
sq = { width = 8, expr = "(addr & 0xF) ** 2" }

[[rule]]
when = { addr = { from = 0x00, to = 0x3F } }
set = { cs = 1 }
"""

CASES: list[tuple[str, str, str]] = [
    # (file name, contents, regex the one-line message must match: it starts with FILE:LINE)
    ("trunc.pla", ".i 3\n.o 2\n.p 2\n1-0 10\n01", r"trunc\.pla:5(:1)?: row has 2 characters, expected 5"),
    ("short.pla", ".i 3\n.o 2\n.p 2\n1-0 10\n01 01\n", r"short\.pla:5:1: input part '01' has 2 characters"),
    ("wide.pla", ".i 3\n.o 2\n1-00 10\n", r"wide\.pla:3:1: input part '1-00' has 4 characters, expected 3"),
    ("outw.pla", ".i 3\n.o 2\n1-0 101\n", r"outw\.pla:3:5: output part '101' has 3 characters, expected 2"),
    ("char.pla", ".i 3\n.o 2\n1a0 10\n", r"char\.pla:3:2: input character 'a' not allowed"),
    ("ochar.pla", ".i 3\n.o 2\n1-0 1?\n", r"ochar\.pla:3:6: output character '\?' not allowed"),
    ("contra.pla", ".i 2\n.o 1\n.type fdr\n1- 1\n-1 -\n11 0\n", r"contra\.pla:6: rows on lines 4 and 6 contradict"),
    ("noi.pla", "# no header\n10 1\n", r"noi\.pla:2: row before any \.i directive"),
    ("empty.pla", "", r"empty\.pla:1: missing \.i directive"),
    ("dir.pla", ".i 2\n.o 1\n.inputs a b\n", r"dir\.pla:3:1: unknown directive '\.inputs'"),
    ("count.pla", PLA_OK.replace(".p 2", ".p 3"), r"count\.pla:5: \.p says 3 rows but the file has 2"),
    ("ilb.pla", PLA_OK.replace(".ilb a b c", ".ilb a b"), r"ilb\.pla:3: \.ilb gives 2 names but \.i 3"),
    ("dupname.pla", PLA_OK.replace(".ilb a b c", ".ilb a b a"), r"dupname\.pla:3: \.ilb names 'a' twice"),
    ("type.pla", PLA_OK.replace(".p 2", ".type fx\n.p 2"), r"type\.pla:5:1: \.type 'fx' is not known"),
    ("twice.pla", ".i 2\n.i 3\n", r"twice\.pla:2:1: \.i given twice \(first on line 1\)"),
    ("neg.pla", ".i -2\n", r"neg\.pla:1:1: \.i must not be negative"),
    ("word.pla", ".i two\n", r"word\.pla:1:1: \.i needs a whole number, not 'two'"),
    ("phase.pla", PLA_OK.replace(".p 2", ".phase 1\n.p 2"), r"phase\.pla:5: \.phase has 1 characters, expected 2"),
    ("o0.pla", ".i 2\n.o 0\n11\n", r"o0\.pla:2:1: \.o 0 declares no outputs; expected at least one output"),
    ("hash.pla", PLA_OK.replace(".ob y z", ".ob y#1 z"),
     r"hash\.pla:4: \.ob gives 1 names but \.o 2 \(line 2\) says 2 \('#' starts a comment"),
    # CSV
    ("trunc.csv", "a, b, >y\n1, 0, 1\n1, 1\n", r"trunc\.csv:3: row has 2 cells but the header has 3"),
    ("char.csv", "a, b, >y\n1, 2, 1\n", r"char\.csv:2:4: '2' in bit column 'b'"),
    ("bus.csv", "a:3, >y\n8, 1\n", r"bus\.csv:2:1: '8' does not fit: 'a' is 3 bits wide"),
    ("busch.csv", "a:3, >y\n0b1z1, 1\n", r"busch\.csv:2:1: '0b1z1' in bus column 'a'"),
    ("dis.csv", "a, b, >y\n1, -, 1\n1, 1, 0\n", r"dis\.csv:3: rows on lines 2 and 3 disagree for output 'y'"),
    ("noout.csv", "a, b, y\n1, 1, 1\n", r"noout\.csv:1: no output column; mark outputs with '>'"),
    ("hdr.csv", "a, b c, >y\n", r"hdr\.csv:1:4: header cell 'b c' not understood"),
    ("empty.csv", "# only a comment\n", r"empty\.csv:1: no header row"),
    ("setting.csv", "#! dflt = 1\na, >y\n", r"setting\.csv:1: unknown setting"),
    ("indef.csv", "a=1, >y\n", r"indef\.csv:1:1: input column 'a' has a default"),
    ("blank.csv", "a, b, >y\n1, , 1\n", r"blank\.csv:2:4: empty cell for 'b'"),
    # TOML design files
    ("trunc.toml", TOML_OK[:80], r"trunc\.toml:\d+(:\d+)?: not valid TOML"),
    ("typo.toml", TOML_OK.replace("when = { addr", "when = { adr"), (r"typo\.toml:10:10: unknown port 'adr' \(did you "
                                                                       r"mean 'addr'\?\)")),
    ("outin.toml", TOML_OK.replace("when = { addr = { from = 0x00, to = 0x3F }", "when = { cs = 1"),
     r"outin\.toml:10:10: 'cs' is an output; 'when' tests inputs only"),
    ("setin.toml", TOML_OK.replace("set = { cs = 1 }", "set = { rw = 1 }"),
     r"setin\.toml:11:9: 'rw' is an input; 'set' assigns outputs only"),
    ("range.toml", TOML_OK.replace("to = 0x3F", "to = 0x1FF"), r"range\.toml:10:10: to 511 for 'addr' does not fit: 'addr' "
                                                                 r"is 8 bits wide \(0\.\.0xff\)"),
    ("rangefrom.toml", TOML_OK.replace("from = 0x00", 'from = "0x100"'),
     r"rangefrom\.toml:10:10: from '0x100' for 'addr' does not fit"),
    ("empty.toml", TOML_OK.replace("from = 0x00", "from = 0x40"),
     r"empty\.toml:10:10: the range for 'addr' is empty: from 0x40 is above to 0x3f"),
    ("rangekey.toml", TOML_OK.replace("to = 0x3F", "upto = 0x3F"),
     r"rangekey\.toml:10:10: unknown key 'upto' in the table matching 'addr' \(did you mean 'to'\?\)"),
    ("rangehalf.toml", TOML_OK.replace(", to = 0x3F", ""), r"rangehalf\.toml:10:10: the range for 'addr' has no 'to'"),
    ("oldrange.toml", TOML_OK.replace("{ from = 0x00, to = 0x3F }", '"0x00..0x3F"'),
     r"oldrange\.toml:10:10: '0x00\.\.0x3F' for 'addr' is not a match; write a range as an inline table with both "
     r"bounds, \{ from = 0x00, to = 0x3F \}"),
    ("value.toml", TOML_OK.replace("set = { cs = 1 }", "set = { cs = 2 }"), (r"value\.toml:11:9: value 2 \(0x2\) does "
                                                                             r"not fit: 'cs' is 1 bit wide")),
    ("width.toml", TOML_OK.replace("addr = 8", "addr = 0"), r"width\.toml:2:1: input 'addr' width is 0"),
    ("top.toml", TOML_OK + "[[rules]]\nset = { cs = 1 }\n", (r"top\.toml:12:1: unknown top-level key 'rules' \(did you "
                                                           r"mean 'rule'\?\)")),
    ("rkey.toml", TOML_OK + "[[rule]]\nsett = { cs = 1 }\n", r"rkey\.toml:13:1: unknown key 'sett' in rule 2"),
    ("attr.toml", TOML_OK.replace("(addr & 0xF) ** 2", "addr.__class__"),
     r"attr\.toml:7:27: output 'sq' expr: attribute access is not allowed"),
    ("imp.toml", TOML_OK.replace("(addr & 0xF) ** 2", "__import__('os')"),
     r"imp\.toml:7:27: output 'sq' expr: function '__import__' is not allowed"),
    ("lam.toml", TOML_OK.replace("(addr & 0xF) ** 2", "lambda: 3"), r"lam\.toml:7:27: output 'sq' expr: lambda"),
    ("comp.toml", TOML_OK.replace("(addr & 0xF) ** 2", "sum([x for x in addr])"),
     r"comp\.toml:7:27: output 'sq' expr: function 'sum' is not allowed"),
    ("pow.toml", TOML_OK.replace("(addr & 0xF) ** 2", "2**2**64"), (r"pow\.toml:7:30: output 'sq' expr: values in "
                                                                     r"'\*\*' can reach 2\*\*62")),
    ("fit.toml", TOML_OK.replace("(addr & 0xF) ** 2", "addr * 2"), (r"fit\.toml:7:27: output 'sq' expr: gives 256 at "
                                                                     r"addr=128, which does not fit 8 bits")),
    ("name.toml", TOML_OK.replace("(addr & 0xF) ** 2", "adr + 1"), (r"name\.toml:7:27: output 'sq' expr: unknown name "
                                                                     r"'adr' \(did you mean 'addr'\?\)")),
    ("outref.toml", TOML_OK.replace("(addr & 0xF) ** 2", "cs + 1"),
     r"outref\.toml:7:27: output 'sq' expr: 'cs' is an output; expressions read inputs only"),
    ("float.toml", TOML_OK.replace("(addr & 0xF) ** 2", "addr / 3"), r"float\.toml:7:27: .*wrap it in round\(\)"),
    ("enum.toml", TOML_OK.replace("addr = 8", "addr = 30"), (r"enum\.toml:7:\d+: output 'sq' is an expression over 30 "
                                                             r"input bits")),
    ("div.toml", TOML_OK.replace("(addr & 0xF) ** 2", "100 // (addr - 7)"), (r"div\.toml:7:\d+: output 'sq' expr: "
                                                                              r"division by zero in '//' at addr=7")),
]


@pytest.mark.parametrize(("name", "text", "pattern"), CASES, ids=[c[0] for c in CASES])
def test_one_spec_error(name: str, text: str, pattern: str) -> None:
    reader = {"pla": parse_pla, "csv": parse_csv, "toml": parse_design}[name.rsplit(".", 1)[1]]
    with pytest.raises(SpecError, match="^" + pattern):
        reader(text, name)


@pytest.mark.parametrize(("name", "text", "pattern"), CASES[::4], ids=[c[0] for c in CASES[::4]])
def test_cli_exit_two_one_line(tmp_path: Path, name: str, text: str, pattern: str) -> None:
    spec = tmp_path / name
    spec.write_text(text, encoding="utf-8")
    res = CliRunner().invoke(cli, ["inspect", str(spec)])
    assert res.exit_code == 2, res.output
    err = res.stderr.strip()
    assert "\n" not in err and "Traceback" not in res.output + res.stderr
    assert res.stdout == ""
    assert err.startswith("plaforge: " + str(tmp_path)), err
    assert pattern.split(":", 1)[0].replace("\\", "") in err


def test_cover_reader_errors() -> None:
    with pytest.raises(SpecError, match=r"^c\.pla:3:2: input character 'q' not allowed"):
        parse_cover(".i 2\n.o 1\n1q 1\n", "c.pla")


def _only_spec_errors(reader: Callable[[str, str], object], text: str, name: str) -> None:
    """Reading ``text`` either succeeds or raises SpecError (whose line, when it names one, counts from 1)."""
    try:
        reader(text, name)
    except SpecError as exc:
        assert exc.line is None or exc.line >= 1


@given(st.text(alphabet=".iopeltyb01-~xX# \n|fdr23", max_size=120))
@settings(max_examples=300, deadline=None)
def test_pla_garbage_only_spec_errors(text: str) -> None:
    _only_spec_errors(parse_pla, text, "g.pla")


@given(st.text(alphabet="ab:>=,;-x01\n#!\"2 ", max_size=80))
@settings(max_examples=300, deadline=None)
def test_csv_garbage_only_spec_errors(text: str) -> None:
    _only_spec_errors(parse_csv, text, "g.csv")


@given(st.lists(st.sampled_from(TOML_OK.splitlines() + ["[[rule]]", "set = { sq = 3 }", 'when = { addr = 7 }',
                                                         "x = ", '"', "[outputs]", "sq = 0"]), max_size=14))
@settings(max_examples=200, deadline=None)
def test_toml_shuffles_only_spec_errors(lines: list[str]) -> None:
    _only_spec_errors(parse_design, "\n".join(lines) + "\n", "g.toml")


def test_directory_as_spec_is_one_line(tmp_path: Path) -> None:
    # POSIX: a directory cannot be read as a file; the reader entry says so (exit 2 through the CLI, one line)
    from plaforge.formats import read_spec

    d = tmp_path / "spec.pla"
    d.mkdir()
    with pytest.raises(SpecError, match=r"spec\.pla: is a directory; expected a spec file"):
        read_spec(d)
