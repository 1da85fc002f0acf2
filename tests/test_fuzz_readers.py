"""Malformed files and injection attempts: every generated case is either read (a Table) or refused with one
PlaforgeError whose message is one line; nothing else escapes, nothing is executed.

The cases come from a seeded generator (so a failure names a case that can be replayed) built from the bundled
samples: byte mutations (including bytes that are not UTF-8), truncations, line shuffles, deletions and
duplications; and an injection battery of expressions (attribute access, dunder names, calls, huge exponents, deep
nesting) and port names with quotes, newlines and backslashes.

Figures (2 shared cores, measured): 1,200 malformed files per format (3,600) in 1.3 s; 1,200 injection cases per
format (3,600) in 1.5 s; 45 more through the command line, and one build-and-check with hostile port names;
about 12 s for the file with start-up.
"""

from __future__ import annotations

import random
from pathlib import Path

import pytest
from click.testing import CliRunner

from plaforge.bundled import sample_path
from plaforge.cli import cli
from plaforge.core.errors import PlaforgeError
from plaforge.core.table import Table
from plaforge.formats import read_spec

CASES_PER_FORMAT = 1200
SEEDS = {".pla": ["arbiter.pla"], ".csv": ["segment_display.csv"],
         ".toml": ["gamma.toml", "memory_map.toml", "wide_address_map.toml", "vending_controller.toml",
                   "sine_rom.toml"]}


def _read_once(path: Path) -> str:
    """'ok' or the one-line message; any exception other than a PlaforgeError fails the test."""
    try:
        table = read_spec(path)
    except PlaforgeError as exc:
        msg = str(exc)
        assert msg and "\n" not in msg and "Traceback" not in msg, msg
        return msg
    assert isinstance(table, Table)
    return "ok"


def _mutate(rng: random.Random, data: bytes) -> bytes:
    kind = rng.randrange(6)
    b = bytearray(data)
    if kind == 0:  # flip some bytes to anything, including bytes that are not UTF-8
        for _ in range(rng.randint(1, 4)):
            b[rng.randrange(len(b))] = rng.randrange(256)
    elif kind == 1:  # replace bytes by characters the formats give meaning to
        for _ in range(rng.randint(1, 6)):
            b[rng.randrange(len(b))] = rng.choice(b'01-x~.#=,;"[]{}:>\n \t\\')
    elif kind == 2:  # truncate
        del b[rng.randrange(len(b)):]
    elif kind == 3:  # shuffle the lines
        lines = bytes(b).split(b"\n")
        rng.shuffle(lines)
        b = bytearray(b"\n".join(lines))
    elif kind == 4:  # drop or duplicate some lines
        lines = bytes(b).split(b"\n")
        for _ in range(rng.randint(1, 3)):
            k = rng.randrange(len(lines))
            if rng.random() < 0.5:
                del lines[k]
            else:
                lines.insert(k, lines[k])
            if not lines:
                break
        b = bytearray(b"\n".join(lines))
    else:  # insert a run of random bytes
        k = rng.randrange(len(b) + 1)
        b[k:k] = bytes(rng.randrange(256) for _ in range(rng.randint(1, 8)))
    return bytes(b)


@pytest.mark.parametrize("suffix", sorted(SEEDS))
def test_malformed_files_give_a_table_or_one_line(tmp_path: Path, suffix: str) -> None:
    rng = random.Random(f"fuzz{suffix}")
    seeds = [sample_path(name).read_bytes() for name in SEEDS[suffix]]
    outcomes = {"ok": 0, "refused": 0}
    for k in range(CASES_PER_FORMAT):
        data = rng.choice(seeds)
        for _ in range(rng.randint(1, 3)):
            data = _mutate(rng, data) or b"\n"
        path = tmp_path / f"case{k}{suffix}"
        path.write_bytes(data)
        outcomes["ok" if _read_once(path) == "ok" else "refused"] += 1
        path.unlink()
    assert outcomes["refused"] > CASES_PER_FORMAT // 4  # the mutations do break files (a generator that cannot fail
    # to break nothing would make this test pass vacuously)


# --- injection ---------------------------------------------------------------------------------------------------------

SENTINEL = "plaforge_injected"
_PAYLOADS = [
    f"__import__('os').system('touch {SENTINEL}')",
    f"open('{SENTINEL}', 'w')",
    "a.__class__.__mro__[1].__subclasses__()",
    "a.__class__",
    "(lambda: 1)()",
    "[x for x in (1, 2)][0]",
    "__builtins__",
    "globals()",
    "eval('1')",
    "exec('x = 1')",
    "getattr(a, '__class__')",
    "9 ** 9 ** 9",
    "2 ** 2 ** 64",
    "(1 << 4000)",
    "a ** a ** a ** a",
    "'abc' * 3",
    "a if a else __import__('sys')",
    "min(a, 1).real",
    "abs(a)(1)",
    "a[0]",
    "a; b",
    "a\nb",
    "1 / 0",
    "not a",
]


def _expression(rng: random.Random) -> str:
    kind = rng.randrange(4)
    if kind == 0:
        return rng.choice(_PAYLOADS)
    if kind == 1:  # deep nesting of parentheses, unary operators or calls
        depth = rng.choice([50, 150, 400, 1000, 5000])
        return rng.choice(["(" * depth + "a" + ")" * depth, "-" * depth + "a", "~" * depth + "a",
                           "abs(" * depth + "a" + ")" * depth, "a+" * depth + "a"])
    if kind == 2:  # two payloads glued by an operator
        return f"({rng.choice(_PAYLOADS)}) {rng.choice(['+', '*', '**', '<<', 'and', 'if a else'])} " \
               f"({rng.choice(_PAYLOADS)})"
    return "a" + "".join(rng.choice(["+a", "*2", "**2", "<<3", ">>1", "&7", "|a", "^a", "//a", "%3"])
                         for _ in range(rng.randint(1, 40)))


_NAME_BITS = ['"', "'", "\\", "\n", "\r", "\t", " ", "#", "\x00", "__class__", "${x}", "`", "]", "[", "=", ",",
              "}", "{", "..", "é", "\u202e", "a"]


def _name(rng: random.Random) -> str:
    return "".join(rng.choice(_NAME_BITS) for _ in range(rng.randint(1, 6)))


def _toml_string(s: str) -> str:
    """``s`` as a TOML basic string (escaped), so the text reaches the reader intact."""
    return '"' + s.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n").replace("\r", "\\r") \
        .replace("\t", "\\t").replace("\x00", "\\u0000") + '"'


def _injection_case(rng: random.Random, suffix: str) -> str:
    if suffix == ".toml":
        if rng.random() < 0.6:
            expr = _toml_string(_expression(rng))
            return f"[inputs]\na = 4\nb = 2\n[outputs]\ny = {{ width = 8, expr = {expr} }}\n"
        name = _toml_string(_name(rng))
        return f"[inputs]\n{name} = 2\n[outputs]\ny = 1\n[[rule]]\nwhen = {{ {name} = 1 }}\nset = {{ y = 1 }}\n"
    if suffix == ".csv":
        name = _name(rng).replace("\n", "")
        quoted = rng.random() < 0.5
        cell = '"' + name.replace('"', '""') + '"' if quoted else name
        return f"a, {cell}, >y\n1, 1, 1\n"
    names = " ".join(_name(rng).replace("\n", " ") for _ in range(2))
    return f".i 2\n.o 1\n.ilb {names}\n.ob y\n11 1\n.e\n"


@pytest.mark.parametrize("suffix", [".csv", ".pla", ".toml"])
def test_injection_executes_nothing(tmp_path: Path, monkeypatch: pytest.MonkeyPatch, suffix: str) -> None:
    monkeypatch.chdir(tmp_path)
    rng = random.Random(f"inject{suffix}")
    refused = 0
    for k in range(CASES_PER_FORMAT):
        path = tmp_path / f"case{k}{suffix}"
        path.write_text(_injection_case(rng, suffix), encoding="utf-8")
        refused += _read_once(path) != "ok"
        path.unlink()
    assert not (tmp_path / SENTINEL).exists()  # no payload ran
    assert refused > CASES_PER_FORMAT // 2


@pytest.mark.parametrize("suffix", [".csv", ".pla", ".toml"])
def test_command_line_says_one_line_and_exits_0_or_2(tmp_path: Path, suffix: str) -> None:
    rng = random.Random(f"cli{suffix}")
    seeds = [sample_path(name).read_bytes() for name in SEEDS[suffix]]
    for k in range(15):
        spec = tmp_path / f"case{k}{suffix}"
        if k % 3 == 0:
            spec.write_text(_injection_case(rng, suffix), encoding="utf-8")
        else:
            spec.write_bytes(_mutate(rng, rng.choice(seeds)) or b"\n")
        res = CliRunner().invoke(cli, ["inspect", str(spec)])
        assert res.exit_code in (0, 2), (spec.read_bytes(), res.output, res.stderr)
        assert "Traceback" not in res.output + res.stderr
        if res.exit_code == 2:
            err = res.stderr.strip()
            assert err.count("\n") == 0 and err.startswith("plaforge: "), err


def test_hostile_names_pass_through_build_and_check_without_running(tmp_path: Path,
                                                                      monkeypatch: pytest.MonkeyPatch) -> None:
    # Names holding quotes, backslashes and code reach every generated artifact; building and then checking the
    # generated modules (which imports them) must run none of it.
    monkeypatch.chdir(tmp_path)
    spec = tmp_path / "hostile.pla"
    spec.write_text(f'.i 2\n.o 2\n.ilb a"+__import__("os").system("touch_{SENTINEL}")+" b\\\\"\n'
                    f".ob y')+open('{SENTINEL}','w')+(' z\"\"\"\n11 1-\n0- 01\n.e\n", encoding="utf-8")
    res = CliRunner().invoke(cli, ["build", str(spec), "-o", "out"])
    assert res.exit_code == 0, res.output + res.stderr
    for module in ("hostile_sop.py", "hostile_lut.py"):
        check = CliRunner().invoke(cli, ["check", str(spec), str(tmp_path / "out" / module)])
        assert check.exit_code == 0, check.output + check.stderr
    assert not list(tmp_path.rglob(f"*{SENTINEL}*"))
