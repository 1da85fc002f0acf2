"""A second, independent reading of the three spec formats, written from docs/formats.md alone.

It is deliberately naive: no cubes, no sharing with plaforge (only the standard library), every input combination
visited one by one. Each reader returns a :class:`Spec` whose ``value(point)`` lists, per output bit, 1, 0 or
``None`` (don't-care). A file the documentation calls malformed raises :class:`Invalid`. The property tests in
tests/test_readers_oracle.py hold plaforge's readers to this reading on generated specs; it is meant for the
documented syntax only (what the generators produce), not as a full validator.
"""

from __future__ import annotations

import ast
import math
import tomllib
from dataclasses import dataclass, field

__all__ = ["Invalid", "Spec", "read_csv", "read_pla", "read_toml"]


class Invalid(Exception):
    """The documentation says this file is malformed."""


@dataclass
class Spec:
    input_names: list[str]
    output_names: list[str]
    values: list[list[int | None]] = field(default_factory=list)  # values[point][output]

    def value(self, point: int) -> list[int | None]:
        return self.values[point]


# --- PLA -------------------------------------------------------------------------------------------------------------

# docs/formats.md, "Output characters by .type": what each character says; None = the row says nothing.
_PLA_CHAR = {
    "f": {"1": "ON"}, "fd": {"1": "ON", "-": "DC"}, "fr": {"1": "ON", "0": "OFF"},
    "fdr": {"1": "ON", "0": "OFF", "-": "DC"}, "r": {"0": "OFF"}, "dr": {"0": "OFF", "-": "DC"},
}
# "Combinations no row mentions are OFF for f/fd, don't-care for fr/fdr and ON for r/dr."
_PLA_REST = {"f": 0, "fd": 0, "fr": None, "fdr": None, "r": 1, "dr": 1}


def read_pla(text: str) -> Spec:
    n = m = None
    typ = "fd"
    ilb = ob = phase = None
    declared_p = None
    rows: list[tuple[str, str]] = []
    for raw in text.split("\n"):
        line = raw.split("#")[0].strip()
        if not line:
            continue
        if line.startswith("."):
            words = line.split()
            d, args = words[0], words[1:]
            if d in (".e", ".end"):
                break
            if d == ".i":
                n = int(args[0])
            elif d == ".o":
                m = int(args[0])
                if m < 1:
                    raise Invalid(".o must be at least 1")
            elif d == ".ilb":
                ilb = args
            elif d == ".ob":
                ob = args
            elif d == ".p":
                declared_p = int(args[0])
            elif d == ".type":
                typ = args[0]
            elif d == ".phase":
                phase = args[0]
            else:
                raise Invalid(f"directive {d}")
            continue
        chars = "".join(ch for ch in line if ch not in " \t|")
        if n is None or m is None or len(chars) != n + m:
            raise Invalid("row")
        rows.append((chars[:n].replace("x", "-").replace("X", "-"), chars[n:]))
    if n is None or m is None:
        raise Invalid("missing .i/.o")
    if declared_p is not None and declared_p != len(rows):
        raise Invalid(".p")
    spec = Spec(ilb or [f"x[{i}]" for i in range(n)], ob or [f"y[{j}]" for j in range(m)])
    for point in range(2 ** n):
        bits = [(point >> i) & 1 for i in range(n)]  # "leftmost column is input 0"
        out: list[int | None] = []
        for j in range(m):
            said = set()
            for inp, outp in rows:
                if all(c == "-" or int(c) == b for c, b in zip(inp, bits)):
                    kind = _PLA_CHAR[typ].get(outp[j])
                    if kind:
                        said.add(kind)
            if "ON" in said and "OFF" in said:
                raise Invalid("contradiction")
            v = None if "DC" in said else 1 if "ON" in said else 0 if "OFF" in said else _PLA_REST[typ]
            if phase is not None and phase[j] == "0" and v is not None:
                v = 1 - v  # ".phase 0: they describe its complement"
            out.append(v)
        spec.values.append(out)
    return spec


# --- numbers and patterns (shared wording in the CSV and TOML sections) ---------------------------------------------

def _number(t: str) -> int:
    """Decimal, 0x hex or 0b binary."""
    if t.startswith("0x"):
        return int(t, 0)
    if t.startswith("0b"):
        return int(t, 0)
    if t.isdigit():
        return int(t)
    raise Invalid(f"number {t!r}")


def _bits_of(t: str, width: int) -> list[int | None]:
    """Per bit (LSB first) 0, 1 or None (free) for a number or a pattern; missing digits on the left are 0."""
    if t.startswith(("0b", "0x")) and any(ch in t[2:] for ch in "x-"):
        per = 1 if t[1] == "b" else 4
        bits: list[int | None] = []
        for ch in reversed(t[2:]):
            if ch in "x-":
                bits += [None] * per
            else:
                d = int(ch, 16)
                bits += [(d >> k) & 1 for k in range(per)]
        if any(b == 1 for b in bits[width:]):
            raise Invalid("pattern does not fit")
        bits = bits[:width]
        return bits + [0] * (width - len(bits))
    v = _number(t)
    if v >= 2 ** width:
        raise Invalid("does not fit")
    return [(v >> k) & 1 for k in range(width)]


def _fits(bits: list[int | None], actual: int) -> bool:
    return all(b is None or b == (actual >> k) & 1 for k, b in enumerate(bits))


# --- CSV -------------------------------------------------------------------------------------------------------------

def _cells(line: str, delim: str) -> list[str]:
    out = []
    for cell in line.split(delim):
        c = cell.strip()
        if len(c) >= 2 and c[0] == c[-1] == '"':
            c = c[1:-1].replace('""', '"')
        out.append(c)
    return out


def read_csv(text: str) -> Spec:
    file_default = "0"
    header = None
    delim = ","
    rows = []
    for raw in text.split("\n"):
        s = raw.strip()
        if not s:
            continue
        if s.startswith("#"):
            if s.startswith("#!"):
                key, _, val = s[2:].partition("=")
                assert key.strip() == "default"
                file_default = val.strip()
            continue
        if header is None:
            if "," not in s:
                delim = ";" if ";" in s else "\t"
            header = []
            for cell in _cells(s, delim):
                out = cell.startswith(">")
                cell = cell.lstrip(">").strip()
                name, _, default = cell.partition("=")
                name, colon, width = name.partition(":")
                # ":WIDTH makes the column a bus of that many bits"; ":1" is one bit, like no width at all
                header.append((name.strip(), out, int(width) if colon else 1, bool(colon) and int(width) > 1,
                               default.strip() or None))
            continue
        cells = _cells(s, delim)
        if len(cells) != len(header):
            raise Invalid("row length")
        rows.append(cells)
    assert header is not None
    ins = [h for h in header if not h[1]]
    outs = [h for h in header if h[1]]
    names = lambda cols: [nm for name, _o, w, bus, _d in cols for nm in ([f"{name}[{b}]" for b in range(w)]
                                                                         if bus and w > 1 else [name])]
    spec = Spec(names(ins), names(outs))

    def parse(cell: str, width: int) -> list[int | None]:
        if cell in ("-", "x"):
            return [None] * width
        return _bits_of(cell, width)

    parsed = [[parse(c, h[2]) for c, h in zip(r, header)] for r in rows]
    n = sum(h[2] for h in ins)
    for point in range(2 ** n):
        ports = {}
        off = 0
        for h in ins:
            ports[h[0]] = (point >> off) & (2 ** h[2] - 1)
            off += h[2]
        said: list[set] = [set() for _ in range(sum(h[2] for h in outs))]
        for row in parsed:
            if all(_fits(bits, ports[h[0]]) for bits, h in zip(row, header) if not h[1]):
                k = 0
                for bits, h in zip(row, header):
                    if h[1]:
                        for b in bits:
                            said[k].add("dc" if b is None else b)
                            k += 1
        values: list[int | None] = []
        k = 0
        for h in outs:
            default = h[4] or file_default
            for _b in range(h[2]):
                s = said[k]
                if 0 in s and 1 in s:
                    raise Invalid("rows disagree")
                if "dc" in s:  # "don't-care wins"
                    values.append(None)
                elif s:
                    values.append(next(iter(s)))
                else:
                    values.append(None if default == "dc" else int(default))
                k += 1
        spec.values.append(values)
    return spec


# --- expressions (docs/formats.md, "Expression outputs") ----------------------------------------------------------

_CONST = {"pi": math.pi, "tau": math.tau, "e": math.e, "True": 1, "False": 0}


def _int(x: float) -> int:
    if isinstance(x, float):
        raise Invalid("integer operator on a float")
    return x


def _eval(node: ast.AST, env: dict[str, int]) -> int | float:
    """One point's value, by the documented meaning of each construct (Python's operators)."""
    if isinstance(node, ast.Expression):
        return _eval(node.body, env)
    if isinstance(node, ast.Constant):
        return int(node.value) if isinstance(node.value, bool) else node.value
    if isinstance(node, ast.Name):
        return env[node.id] if node.id in env else _CONST[node.id]
    if isinstance(node, ast.UnaryOp):
        v = _eval(node.operand, env)
        if isinstance(node.op, ast.Not):
            return int(not v)
        if isinstance(node.op, ast.Invert):
            return ~_int(v)
        return -v if isinstance(node.op, ast.USub) else v
    if isinstance(node, ast.BoolOp):  # "giving 0/1"
        vals = [bool(_eval(v, env)) for v in node.values]
        return int(all(vals) if isinstance(node.op, ast.And) else any(vals))
    if isinstance(node, ast.Compare):
        left = _eval(node.left, env)
        ok = True
        for op, right_node in zip(node.ops, node.comparators):
            right = _eval(right_node, env)
            ok = ok and {ast.Lt: left < right, ast.LtE: left <= right, ast.Gt: left > right,
                         ast.GtE: left >= right, ast.Eq: left == right, ast.NotEq: left != right}[type(op)]
            left = right
        return int(ok)
    if isinstance(node, ast.IfExp):  # "only the chosen side is evaluated"
        return _eval(node.body if _eval(node.test, env) else node.orelse, env)
    if isinstance(node, ast.BinOp):
        a, b = _eval(node.left, env), _eval(node.right, env)
        op = type(node.op)
        if op in (ast.Div, ast.FloorDiv, ast.Mod) and b == 0:
            raise Invalid("division by zero")
        if op in (ast.LShift, ast.RShift, ast.BitAnd, ast.BitOr, ast.BitXor):
            a, b = _int(a), _int(b)
        return {ast.Add: lambda: a + b, ast.Sub: lambda: a - b, ast.Mult: lambda: a * b, ast.Div: lambda: a / b,
                ast.FloorDiv: lambda: a // b, ast.Mod: lambda: a % b, ast.Pow: lambda: a ** b,
                ast.LShift: lambda: a << b, ast.RShift: lambda: a >> b, ast.BitAnd: lambda: a & b,
                ast.BitOr: lambda: a | b, ast.BitXor: lambda: a ^ b}[op]()
    if isinstance(node, ast.Call):
        name = node.func.id  # type: ignore[attr-defined]
        args = [_eval(a, env) for a in node.args]
        if name in ("isqrt", "popcount", "sqrt") and args[0] < 0:
            raise Invalid(f"{name} of a negative number")
        return {"abs": lambda: abs(args[0]), "min": lambda: min(args), "max": lambda: max(args),
                "clamp": lambda: min(max(args[0], args[1]), args[2]), "isqrt": lambda: math.isqrt(_int(args[0])),
                "sqrt": lambda: math.sqrt(args[0]), "floor": lambda: math.floor(args[0]),
                "ceil": lambda: math.ceil(args[0]),
                "round": lambda: math.floor(args[0] + 0.5),  # "halves round up"
                "popcount": lambda: _int(args[0]).bit_count()}[name]()
    raise Invalid(f"not in the language: {type(node).__name__}")


def _expression(source: str, env: dict[str, int], width: int, must_fit: bool) -> int:
    v = _eval(ast.parse(source.strip(), mode="eval"), env)
    if isinstance(v, float):
        raise Invalid("a float result must go through round, floor or ceil")
    if must_fit and not 0 <= v < 2 ** width:
        raise Invalid("does not fit")
    return v


# --- TOML design files -----------------------------------------------------------------------------------------------

def _ports(table: dict) -> list[tuple[str, int, dict]]:
    return [(name, v if isinstance(v, int) else v["width"], v if isinstance(v, dict) else {})
            for name, v in table.items()]


def _view(key: str, ports: dict[str, tuple[int, int]]) -> tuple[str, int, int]:
    """(port, low bit, width) for NAME, NAME[i] or NAME[h:l]."""
    if "[" not in key:
        return key, 0, ports[key][1]
    name, _, rest = key.partition("[")
    hi, _, lo = rest.rstrip("]").partition(":")
    lo = lo or hi
    return name, int(lo), int(hi) - int(lo) + 1


def _match(value: object, actual: int, width: int) -> bool:
    if isinstance(value, list):
        return any([_match(v, actual, width) for v in value])  # every item, so each is checked to fit
    if isinstance(value, dict):
        if set(value) == {"from", "to"}:  # "{ from = LOW, to = HIGH }: inclusive range, bounds as for a value"
            lo, hi = (_number(str(b).lower().replace("_", "")) if isinstance(b, str) else b
                      for b in (value["from"], value["to"]))
            if lo > hi or hi >= 2 ** width:
                raise Invalid("range")
            return lo <= actual <= hi
        v, mask = value["value"], value["mask"]
        return actual & mask == v
    if isinstance(value, bool):
        value = int(value)
    if isinstance(value, int):
        if value >= 2 ** width:
            raise Invalid("does not fit")
        return actual == value
    s = str(value).lower().replace("_", "")
    return _fits(_bits_of(s, width), actual)


def _set_bits(value: object, width: int) -> list[int | None]:
    if isinstance(value, bool):
        value = int(value)
    if isinstance(value, int):
        if value >= 2 ** width:
            raise Invalid("does not fit")
        return [(value >> k) & 1 for k in range(width)]
    s = str(value).lower().replace("_", "")
    if s in ("dc", "-", "x"):
        return [None] * width
    return _bits_of(s, width)


def read_toml(text: str) -> Spec:
    doc = tomllib.loads(text)
    d = doc.get("design", {}).get("default", 0)
    design_default: int | None = None if isinstance(d, str) else d
    ins = _ports(doc["inputs"])
    outs = _ports(doc["outputs"])
    names = lambda ports: [nm for name, w, _o in ports for nm in ([name] if w == 1 else
                                                                  [f"{name}[{b}]" for b in range(w)])]
    spec = Spec(names(ins), names(outs))
    in_at: dict[str, tuple[int, int]] = {}
    off = 0
    for name, w, _o in ins:
        in_at[name] = (off, w)
        off += w
    out_at: dict[str, tuple[int, int]] = {}
    k = 0
    defaults: list[int | None] = []
    for name, w, opts in outs:
        out_at[name] = (k, w)
        k += w
        defaults += _set_bits(opts["default"], w) if "default" in opts else [design_default] * w
    rules = doc.get("rule", [])
    sets = []  # per rule: {output bit index: value}
    for rule in rules:
        given: dict[int, int | None] = {}
        for key, value in rule["set"].items():
            port, lo, w = _view(key, out_at)
            for b, v in enumerate(_set_bits(value, w)):
                given[out_at[port][0] + lo + b] = v
        sets.append(given)
    exprs = [(out_at[name][0], w, opts) for name, w, opts in outs if "expr" in opts]
    for point in range(2 ** off):
        values = list(defaults)
        decided = [False] * len(values)
        env = {name: (point >> at) & (2 ** w - 1) for name, (at, w) in in_at.items()}
        for k0, w, opts in exprs:  # "expr gives the value wherever no rule decides it; dc marks don't-cares"
            v = _expression(opts["expr"], env, w, True)
            free = "dc" in opts and _expression(opts["dc"], env, w, False) != 0
            values[k0:k0 + w] = [None if free else (v >> b) & 1 for b in range(w)]
        for rule, given in zip(rules, sets):
            ok = True
            for key, value in rule.get("when", {}).items():
                port, lo, w = _view(key, in_at)
                actual = (point >> (in_at[port][0] + lo)) & (2 ** w - 1)
                if not _match(value, actual, w):
                    ok = False
            if not ok:
                continue
            for j, v in given.items():
                if not decided[j]:  # "the first rule that matches and sets that output decides it"
                    values[j] = v
                    decided[j] = True
        spec.values.append(values)
    return spec
