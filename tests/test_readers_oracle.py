"""The readers against their documentation: generated PLA, CSV and TOML specs over the documented syntax, each read
by plaforge and by tests/oracle_formats.py (an independent, point-by-point reading written from docs/formats.md
alone). They must agree on every input combination of every output, and on whether the file is malformed.

Figures (2 shared cores, measured): 300 generated specs per format (TOML ones with expression outputs too), 900
in all, about 22 s for the three tests.
"""

from __future__ import annotations

import oracle_formats as oracle
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from plaforge.core.errors import SpecError
from plaforge.core.table import Table, unpack_bits
from plaforge.formats.csv import parse_csv
from plaforge.formats.design import parse_design
from plaforge.formats.pla import parse_pla

EXAMPLES = 300
SETTINGS = settings(max_examples=EXAMPLES, deadline=None, derandomize=True,
                    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])


def _agree(read, text: str, name: str, oracle_read) -> None:
    """Reader and oracle agree: both refuse the file, or both give the same names and values at every point."""
    try:
        want = oracle_read(text)
    except oracle.Invalid as exc:
        with pytest.raises(SpecError, match=r"^" + name.replace(".", r"\.") + ":"):
            read(text, name)
        assert str(exc)  # the oracle's reason, for the failure report
        return
    table: Table = read(text, name)
    assert list(table.input_names) == want.input_names
    assert list(table.output_names) == want.output_names
    n = table.n_inputs
    for j in range(table.n_outputs):
        on_b, dc_b = table.truth(j)
        on, dc = unpack_bits(on_b, n), unpack_bits(dc_b, n)
        got = [None if dc[p] else int(on[p]) for p in range(1 << n)]
        assert got == [want.value(p)[j] for p in range(1 << n)], (j, text)
    # and the cube path (no truth table) at a few points
    for p in range(0, 1 << n, max(1, (1 << n) // 7)):
        on_m, dc_m = table.evaluate(p)
        assert [None if dc_m >> j & 1 else on_m >> j & 1 for j in range(table.n_outputs)] == want.value(p)


def _num(draw, v: int, width: int) -> str:
    """A number as docs/formats.md writes it: decimal, 0x hex or 0b binary (possibly with leading zeros)."""
    style = draw(st.sampled_from(["dec", "hex", "bin"]))
    if style == "dec":
        return str(v)
    if style == "hex":
        return "0x" + format(v, "x").zfill(draw(st.integers(1, max(1, (width + 3) // 4))))
    return "0b" + format(v, "b").zfill(draw(st.integers(1, width)))


def _pattern(draw, width: int) -> str:
    """A pattern with at least one free digit; any length from 1 digit to a digit past the width."""
    if draw(st.booleans()):
        digits = draw(st.integers(1, width + 1))
        chars = draw(st.lists(st.sampled_from("01x-"), min_size=digits, max_size=digits))
        if digits > width:
            chars[0] = draw(st.sampled_from("0x-"))  # a digit past the width may be 0 or free
        if not set(chars) & set("x-"):
            chars[draw(st.integers(0, digits - 1))] = "x"
        return "0b" + "".join(chars)
    digits = draw(st.integers(1, max(1, (width + 3) // 4)))
    chars = [draw(st.sampled_from("0123456789abcdefx")) for _ in range(digits)]
    chars[0] = draw(st.sampled_from("x0" + "".join(format(d, "x") for d in range(1, 1 << ((width - 1) % 4 + 1)))))
    if "x" not in chars:
        chars[-1] = "x"
    return "0x" + "".join(chars)


# --- PLA -------------------------------------------------------------------------------------------------------------

@st.composite
def pla_text(draw) -> str:
    n = draw(st.integers(0, 12) if draw(st.integers(0, 9)) == 0 else st.integers(1, 6))
    m = draw(st.integers(1, 3))
    typ = draw(st.sampled_from([None, "f", "fd", "fr", "fdr", "r", "dr"]))
    k = draw(st.integers(0, 8))
    rows = []
    for _ in range(k):
        inp = "".join(draw(st.lists(st.sampled_from("01--xX"), min_size=n, max_size=n)))
        out = "".join(draw(st.lists(st.sampled_from("01-~"), min_size=m, max_size=m)))
        sep = draw(st.sampled_from([" ", "", "  ", " | ", "\t"]))
        if draw(st.integers(0, 5)) == 0 and n > 1:
            inp = inp[:1] + " " + inp[1:]  # spaces inside a part are allowed
        rows.append(inp + sep + out + draw(st.sampled_from(["", "  # note", "#"])))
    head = [f".i {n}", f".o {m}"]
    extra = []
    if typ:
        extra.append(f".type {typ}")
    if draw(st.booleans()):
        extra.append(".ilb " + " ".join(f"in{i}" for i in range(n)))
    if draw(st.booleans()):
        extra.append(".ob " + " ".join(f"out_{j}" for j in range(m)))
    if draw(st.booleans()):
        extra.append(f".p {k}")
    if draw(st.booleans()):
        extra.append(".phase " + "".join(draw(st.lists(st.sampled_from("01"), min_size=m, max_size=m))))
    extra = draw(st.permutations(extra))
    tail = draw(st.sampled_from(["", ".e\n", ".end\n", ".e\n11 junk after the end\n"]))
    body = head + list(extra) + rows
    return draw(st.sampled_from(["", "# generated\n", "\n"])) + "\n".join(body) + "\n" + tail


@given(pla_text())
@SETTINGS
def test_pla_reader_agrees_with_docs(text: str) -> None:
    _agree(parse_pla, text, "g.pla", oracle.read_pla)


# --- CSV -------------------------------------------------------------------------------------------------------------

@st.composite
def csv_text(draw) -> str:
    n_in = draw(st.integers(1, 3))
    n_out = draw(st.integers(1, 3))
    budget = draw(st.integers(1, 10))
    cols = []
    used = 0
    for i in range(n_in):
        w = draw(st.integers(1, max(1, min(4, budget - used - (n_in - i - 1)))))
        used += w
        cols.append((f"i{i}", False, w))
    cols += [(f"o{j}", True, draw(st.integers(1, 3))) for j in range(n_out)]
    cols = draw(st.permutations(cols))
    defaults = ["0", "1", "dc"]
    header = []
    for name, out, w in cols:
        cell = (">" if out else "") + name + (f":{w}" if w > 1 or draw(st.integers(0, 5)) == 0 else "")
        if out and draw(st.booleans()):
            cell += "=" + draw(st.sampled_from(defaults))
        header.append(cell)
    delim = draw(st.sampled_from([",", ";", "\t"]))
    space = draw(st.sampled_from(["", " "])) if delim != "\t" else ""
    lines = []
    if draw(st.booleans()):
        lines.append("#! default = " + draw(st.sampled_from(defaults)))
    lines.append((delim + space).join(header))
    for _ in range(draw(st.integers(0, 8))):
        cells = []
        for _name, _out, w in cols:
            kind = draw(st.sampled_from(["any", "num", "num", "pat"] if w > 1 else ["any", "num", "num"]))
            if kind == "any":
                cell = draw(st.sampled_from(["-", "x"]))
            elif kind == "num":
                v = draw(st.integers(0, (1 << w) - 1 if draw(st.integers(0, 15)) else (2 << w) - 1))
                cell = _num(draw, v, w) if w > 1 else str(v)
            else:
                cell = _pattern(draw, w)
            if draw(st.integers(0, 7)) == 0:
                cell = f'"{cell}"'
            cells.append(cell)
        lines.append((delim + space).join(cells))
        if draw(st.integers(0, 5)) == 0:
            lines.append(draw(st.sampled_from(["", "# a comment"])))
    return "\n".join(lines) + "\n"


@given(csv_text())
@SETTINGS
def test_csv_reader_agrees_with_docs(text: str) -> None:
    _agree(parse_csv, text, "g.csv", oracle.read_csv)


# --- TOML ------------------------------------------------------------------------------------------------------------

def _match_value(draw, width: int, in_list: bool = False) -> str:
    """One documented 'when' form over a field of ``width`` bits, as TOML source."""
    top = (1 << width) - 1
    kinds = ["int", "str", "range", "pattern", "mask"] + (["bool"] if width == 1 else [])
    kinds += [] if in_list else ["list"]
    kind = draw(st.sampled_from(kinds))
    if kind == "int":
        return str(draw(st.integers(0, top if draw(st.integers(0, 15)) else 2 * top + 1)))
    if kind == "bool":
        return draw(st.sampled_from(["true", "false"]))
    if kind == "str":
        return '"' + _num(draw, draw(st.integers(0, top)), width) + '"'
    if kind == "range":
        lo = draw(st.integers(0, top))
        hi = draw(st.integers(lo, top))
        if not draw(st.integers(0, 15)):  # now and then an empty range or a bound that does not fit
            lo, hi = (hi + 1, lo) if draw(st.booleans()) else (lo, hi + top + 1)
        # docs/formats.md: bounds are integers or the number strings other cells accept, in either order of keys
        lo_s, hi_s = (_num(draw, b, width) for b in (lo, hi))
        lo_s, hi_s = (f'"{b}"' if draw(st.booleans()) else b for b in (lo_s, hi_s))
        if draw(st.booleans()):
            return f"{{ to = {hi_s}, from = {lo_s} }}"
        return f"{{ from = {lo_s}, to = {hi_s} }}"
    if kind == "pattern":
        text = _pattern(draw, width)
        if len(text) > 3 and draw(st.booleans()):  # docs/formats.md writes "0b1xxx_xxxx_xxxx": '_' groups digits
            k = draw(st.integers(3, len(text) - 1))
            text = text[:k] + "_" + text[k:]
        return f'"{text}"'
    if kind == "mask":
        mask = draw(st.integers(0, top))
        value = draw(st.integers(0, top)) & mask
        return f"{{ value = {value}, mask = {hex(mask)} }}"
    return "[" + ", ".join(_match_value(draw, width, True) for _ in range(draw(st.integers(1, 3)))) + "]"


def _set_value(draw, width: int) -> str:
    kind = draw(st.sampled_from(["int", "int", "dc", "pattern"]))
    if kind == "int":
        return str(draw(st.integers(0, (1 << width) - 1)))
    if kind == "dc":
        return '"' + draw(st.sampled_from(["dc", "-", "x"])) + '"'
    return f'"{_pattern(draw, width)}"'


def _key(draw, name: str, width: int) -> tuple[str, int]:
    """The port itself, one bit or a slice: (TOML key, width of the view)."""
    kind = draw(st.sampled_from(["port", "port", "bit", "slice"])) if width > 1 else "port"
    if kind == "port":
        return name, width
    if kind == "bit":
        return f'"{name}[{draw(st.integers(0, width - 1))}]"', 1
    lo = draw(st.integers(0, width - 1))
    hi = draw(st.integers(lo, width - 1))
    return f'"{name}[{hi}:{lo}]"', hi - lo + 1


def _expr(draw, ports: list[tuple[str, int]], depth: int) -> str:
    """An expression of the documented language (small values: no operand may approach 2**62)."""
    if depth == 0 or draw(st.integers(0, 3)) == 0:
        kind = draw(st.sampled_from(["const", "port", "port", "bool", "power"]))
        if kind == "const":
            return str(draw(st.integers(0, 15)))
        if kind == "bool":
            return draw(st.sampled_from(["True", "False"]))
        port = draw(st.sampled_from(ports))[0]
        return f"{port} ** {draw(st.integers(0, 2))}" if kind == "power" else port
    sub = lambda: _expr(draw, ports, depth - 1)
    kind = draw(st.sampled_from(["bin", "bin", "cmp", "bool", "unary", "if", "call", "float", "guard"]))
    if kind == "bin":
        op = draw(st.sampled_from(["+", "-", "*", "&", "|", "^", "<<", ">>", "//", "%"]))
        right = str(draw(st.integers(0, 3) if op in ("<<", ">>") else st.integers(1, 5))) \
            if op in ("<<", ">>", "//", "%") else sub()
        return f"({sub()} {op} {right})"
    if kind == "cmp":
        ops = draw(st.lists(st.sampled_from(["<", "<=", "==", "!=", ">", ">="]), min_size=1, max_size=2))
        return "(" + sub() + "".join(f" {op} {sub()}" for op in ops) + ")"
    if kind == "bool":
        return f"({sub()} {draw(st.sampled_from(['and', 'or']))} {sub()})"
    if kind == "unary":
        return f"({draw(st.sampled_from(['-', '~', 'not ']))}{sub()})"
    if kind == "if":
        return f"({sub()} if {sub()} else {sub()})"
    if kind == "guard":  # only the chosen side is evaluated: no division by zero
        d = sub()
        return f"({sub()} // {d} if {d} else {sub()})"
    if kind == "float":
        f = draw(st.sampled_from(["round", "floor", "ceil"]))
        inner = draw(st.sampled_from([f"{sub()} / {draw(st.integers(1, 4))}", f"sqrt(abs({sub()}))", f"{sub()} * pi"]))
        return f"{f}({inner})"
    f = draw(st.sampled_from(["abs", "min", "max", "clamp", "popcount", "isqrt"]))
    if f in ("min", "max"):
        return f"{f}({', '.join(sub() for _ in range(draw(st.integers(2, 3))))})"
    if f == "clamp":
        lo = draw(st.integers(-3, 8))
        return f"clamp({sub()}, {lo}, {lo + draw(st.integers(0, 8))})"
    if f in ("popcount", "isqrt"):
        return f"{f}(abs({sub()}))"
    return f"abs({sub()})"


def _expr_output(draw, ins: list[tuple[str, int]], w: int) -> str:
    used = draw(st.lists(st.sampled_from(ins), min_size=1, max_size=len(ins), unique=True))
    body = _expr(draw, used, draw(st.integers(1, 3)))
    top = (1 << w) - 1
    wrap = draw(st.sampled_from(["mask", "mask", "clamp", "raw", "div"]))
    expr = {"mask": f"({body}) & {top}", "clamp": f"clamp({body}, 0, {top})", "raw": body,
            "div": f"(({body}) & {top}) / 1"}[wrap]  # a float result, even a whole one, is refused
    text = f"expr = \"{expr}\""
    if draw(st.booleans()):
        text += f", dc = \"{_expr(draw, used, 1)} == {draw(st.integers(0, 3))}\""
    return text


@st.composite
def toml_text(draw) -> str:
    n_ports = draw(st.integers(1, 3))
    ins = [(f"a{i}", draw(st.integers(1, 4))) for i in range(n_ports)]
    outs = [(f"y{j}", draw(st.integers(1, 3))) for j in range(draw(st.integers(1, 3)))]
    lines = []
    if draw(st.booleans()):
        lines += ["[design]", "default = " + draw(st.sampled_from(["0", "1", '"dc"']))]
    lines.append("[inputs]")
    lines += [f"{name} = {w}" if draw(st.booleans()) else f"{name} = {{ width = {w} }}" for name, w in ins]
    lines.append("[outputs]")
    for name, w in outs:
        form = draw(st.sampled_from(["plain", "default", "expr"]))
        if form == "plain":
            lines.append(f"{name} = {w}")
        elif form == "default":
            lines.append(f"{name} = {{ width = {w}, default = {_set_value(draw, w)} }}")
        else:
            lines.append(f"{name} = {{ width = {w}, {_expr_output(draw, ins, w)} }}")
    for _ in range(draw(st.integers(0, 5))):
        when = []
        for name, w in draw(st.lists(st.sampled_from(ins), max_size=2, unique=True)):
            key, vw = _key(draw, name, w)
            when.append(f"{key} = {_match_value(draw, vw)}")
        sets = []
        for name, w in draw(st.lists(st.sampled_from(outs), min_size=1, max_size=2, unique=True)):
            key, vw = _key(draw, name, w)
            sets.append(f"{key} = {_set_value(draw, vw)}")
        lines.append("[[rule]]")
        if when or draw(st.booleans()):
            lines.append("when = { " + ", ".join(when) + " }")
        lines.append("set = { " + ", ".join(sets) + " }")
    return "\n".join(lines) + "\n"


@given(toml_text())
@SETTINGS
def test_toml_reader_agrees_with_docs(text: str) -> None:
    _agree(parse_design, text, "g.toml", oracle.read_toml)
