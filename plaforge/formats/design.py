"""Design files (``.toml``): ports with widths, default values, match rules and expression-defined outputs.

Vocabulary
----------
port
    A named input or output of a given width. A port of width 1 is a single bit named after the port; a wider port
    is a bus whose bits are named ``name[0]`` (least significant) to ``name[w-1]``. Inputs are numbered in the order
    the file declares them, each bus's bits consecutively from bit 0.
match
    What a rule requires of an input port (all of a rule's matches must hold):

    * an integer (``0x3F``, ``12``, ``true``) or a string holding one (``"0xC000"``, ``"0b1010"``): that value;
    * ``{ from = LOW, to = HIGH }``: the inclusive range, bounds as for a value (``{ from = 0xC000, to = 0xC0FF }``);
    * a pattern ``"0b1x0x"`` (binary digits, ``x`` or ``-`` for "either") or ``"0xC0xx"`` (hex digits, ``x`` for four
      free bits); digits missing on the left are 0, as for a number;
    * ``{ value = V, mask = M }``: the bits set in ``M`` equal those of ``V``;
    * a list of any of these: any of them.

    A port may be narrowed to bits: ``"addr[15]"`` (one bit) or ``"addr[15:12]"`` (bits 15 down to 12, read as a
    number with bit 12 least significant). Ranges and patterns become cubes directly (a range over a ``w``-bit port is
    at most ``2w`` cubes), so a 32-bit address map is never enumerated.
value
    What a rule sets an output port to, and what an output's ``default`` is: an integer, ``"dc"`` (don't-care, also
    ``"-"`` or ``"x"``), or a pattern whose ``x``/``-`` digits are don't-care bits (``"0b1x0"``).
precedence
    **The first rule (in file order) that matches a point and sets an output decides that output there**; later
    rules setting the same output only fill the points earlier ones left open. Points no rule decides take the
    output's default. Computed with cube sharp products, never by enumeration.
expression output
    An output with ``expr = "..."`` takes that integer expression's value (see :mod:`plaforge.formats.expr`) where no
    rule decides it; an optional ``dc = "..."`` expression marks don't-care points (where it is non-zero).
    Expressions are evaluated at every combination of the input ports they name, so those ports may total at most
    :data:`plaforge.table.DEFAULT_ENUM_LIMIT` bits.

File layout
-----------
::

    [design]                 # optional
    default = 0              # 0, 1 or "dc": every output bit not otherwise given (1 means all ones); default 0

    [inputs]                 # name = width, in bit order
    addr = 16
    rw = 1

    [outputs]                # name = width, or a table with width and optional default / expr / dc
    rom_cs = 1
    bank = { width = 2, default = "dc" }
    square = { width = 8, expr = "(addr & 0xF) ** 2" }

    [[rule]]                 # as many as needed; first match wins per output
    when = { addr = { from = 0x0000, to = 0x3FFF }, rw = 1 }
    set = { rom_cs = 1, bank = 0 }

A rule may also carry ``note = "..."`` (ignored). A rule without ``when`` matches every point.
"""

from __future__ import annotations

import difflib
import keyword
import os
import re
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..core.cube import Cube, sharp
from ..core.errors import SpecError
from ..core.table import DEFAULT_ENUM_LIMIT, Bus, Table, bool_array_to_cubes
from ._cubes import and_lists, field_cube, place, range_cubes
from ._numbers import parse_int as _parse_int
from ._numbers import pattern as _pattern
from ._toml import Locator, load_toml
from .expr import ExprError, Expression, compile_expr, evaluate

__all__ = ["MAX_WIDTH", "declared_name", "parse_design"]

MAX_WIDTH = 4096
_NAME = re.compile(r"^[A-Za-z_][A-Za-z0-9_]*$")
_SLICE = re.compile(r"^([A-Za-z_][A-Za-z0-9_]*)\[(\d+)(?::(\d+))?\]$")
_TOP_KEYS = ("design", "inputs", "outputs", "rule")
_DESIGN_KEYS = ("default", "name", "description", "note")
_OUTPUT_KEYS = ("width", "default", "expr", "dc", "note")
_RULE_KEYS = ("when", "set", "note")
_RANGE_KEYS = ("from", "to")
_MASK_KEYS = ("value", "mask")
_DC_WORDS = ("dc", "-", "x")
_CHUNK = 1 << 16


@dataclass(frozen=True)
class _Port:
    name: str
    width: int
    indices: tuple[int, ...]


def _suggest(word: str, choices: list[str]) -> str:
    hint = difflib.get_close_matches(word, choices, n=1, cutoff=0.5)
    return f" (did you mean {hint[0]!r}?)" if hint else ""


class _Reader:
    def __init__(self, text: str, path: str) -> None:
        self.path = path
        self.text = text
        self.loc = Locator(text)
        self.doc = load_toml(text, path)

    # -- errors --------------------------------------------------------------------------------------------------
    def err(self, where: tuple[int | None, int | None], message: str) -> SpecError:
        return SpecError(self.path, where[0], message, where[1] if where[0] is not None else None)

    def top_key(self, key: str) -> tuple[int | None, int | None]:
        hdr = self.loc.header(key)
        if hdr is not None:
            return hdr, 1
        return self.loc.key("", 0, key)

    def port_where(self, section: str, name: str, key: str | None = None) -> tuple[int | None, int | None]:
        if (f"{section}.{name}", 0) in self.loc.sections:
            if key is None:
                return self.loc.header(f"{section}.{name}"), 1
            return self.loc.key(f"{section}.{name}", 0, key)
        if key is None:
            return self.loc.key(section, 0, name)
        return self.loc.key(section, 0, key, after=name)

    def rule_where(self, r: int, key: str | None = None, sub: str | None = None) -> tuple[int | None, int | None]:
        if ("rule", r) in self.loc.headers:
            if key is None:
                return self.loc.header("rule", r), 1
            if sub is None:
                return self.loc.key("rule", r, key)
            if (f"rule.{key}", r) in self.loc.sections:  # [rule.when] sub-table form
                return self.loc.key(f"rule.{key}", r, sub)
            return self.loc.key("rule", r, sub, after=key)
        return self.loc.find_text(sub or key or "rule")

    # -- ports ---------------------------------------------------------------------------------------------------
    def ports(self) -> None:
        doc = self.doc
        for k in doc:
            if k not in _TOP_KEYS:
                raise self.err(self.top_key(k), f"unknown top-level key {k!r}{_suggest(k, list(_TOP_KEYS))}; "
                                                 f"expected [design], [inputs], [outputs] and [[rule]] tables")
        design = doc.get("design", {})
        if not isinstance(design, dict):
            raise self.err(self.top_key("design"), "'design' must be a table ([design])")
        for k in design:
            if k not in _DESIGN_KEYS:
                raise self.err(self.loc.key("design", 0, k),
                               f"unknown key {k!r} in [design]{_suggest(k, list(_DESIGN_KEYS))}; "
                               f"expected {', '.join(_DESIGN_KEYS)}")
        self.default_kind = "0"
        if "default" in design:
            d = design["default"]
            where = self.loc.key("design", 0, "default")
            if isinstance(d, bool) or d not in (0, 1) and not (isinstance(d, str) and d.lower() in _DC_WORDS):
                raise self.err(where, f"[design] default is {d!r}; expected 0, 1 or \"dc\"")
            self.default_kind = "dc" if isinstance(d, str) else str(d)
        for section in ("inputs", "outputs"):
            if section not in doc:
                raise self.err((1, None), f"no [{section}] table; declare each {section[:-1]} as name = width")
            if not isinstance(doc[section], dict) or not doc[section]:
                raise self.err(self.top_key(section), f"[{section}] must declare at least one port as name = width")
        self.inputs: dict[str, _Port] = {}
        self.input_names: list[str] = []
        self.input_buses: list[Bus] = []
        for name, spec in doc["inputs"].items():
            where = self.port_where("inputs", name)
            self.check_name(name, where, "input")
            width = spec.get("width") if isinstance(spec, dict) else spec
            if isinstance(spec, dict) and set(spec) - {"width", "note"}:
                bad = min(set(spec) - {"width", "note"})
                raise self.err(self.port_where("inputs", name, bad),
                               f"input {name!r} has unknown key {bad!r}; inputs take only width (and note)")
            width = self.check_width(width, where, f"input {name!r}")
            start = len(self.input_names)
            idx = tuple(range(start, start + width))
            self.input_names += [name] if width == 1 else [f"{name}[{b}]" for b in range(width)]
            self.inputs[name] = _Port(name, width, idx)
            self.input_buses.append(Bus(name, idx, width == 1))
        self.outputs: dict[str, _Port] = {}
        self.output_specs: dict[str, dict[str, Any]] = {}
        self.output_names: list[str] = []
        self.output_buses: list[Bus] = []
        for name, spec in doc["outputs"].items():
            where = self.port_where("outputs", name)
            self.check_name(name, where, "output")
            if name in self.inputs:
                raise self.err(where, f"{name!r} is declared both as an input and as an output; rename one")
            if isinstance(spec, dict):
                for k in spec:
                    if k not in _OUTPUT_KEYS:
                        raise self.err(self.port_where("outputs", name, k),
                                       f"output {name!r} has unknown key {k!r}{_suggest(k, list(_OUTPUT_KEYS))}; "
                                       f"expected {', '.join(_OUTPUT_KEYS)}")
                if "width" not in spec:
                    raise self.err(where, f"output {name!r} needs a width, e.g. {name} = {{ width = 1, ... }}")
                width, opts = spec["width"], spec
            else:
                width, opts = spec, {}
            width = self.check_width(width, where, f"output {name!r}")
            start = len(self.output_names)
            idx = tuple(range(start, start + width))
            self.output_names += [name] if width == 1 else [f"{name}[{b}]" for b in range(width)]
            self.outputs[name] = _Port(name, width, idx)
            self.output_specs[name] = opts
            self.output_buses.append(Bus(name, idx, width == 1))

    def check_name(self, name: str, where: tuple[int | None, int | None], what: str) -> None:
        if not _NAME.match(name) or keyword.iskeyword(name):
            raise self.err(where, f"{what} name {name!r} is not usable; expected letters, digits and '_', not "
                                  f"starting with a digit and not a Python keyword")

    def check_width(self, width: object, where: tuple[int | None, int | None], what: str) -> int:
        if isinstance(width, bool) or not isinstance(width, int):
            raise self.err(where, f"{what} width is {width!r}; expected a whole number of bits such as 1 or 8")
        if not 1 <= width <= MAX_WIDTH:
            raise self.err(where, f"{what} width is {width}; expected 1 to {MAX_WIDTH} bits")
        return width

    # -- values --------------------------------------------------------------------------------------------------
    def view(self, key: str, ports: dict[str, _Port], where: tuple[int | None, int | None], role: str
             ) -> tuple[str, tuple[int, ...]]:
        """Port (or bit slice of one) named by ``key``: display name and the indices of its bits, LSB first."""
        m = _SLICE.match(key)
        base = m.group(1) if m else key
        if base not in ports:
            other = self.outputs if ports is self.inputs else self.inputs
            if base in other:
                kind = "an output" if ports is self.inputs else "an input"
                raise self.err(where, f"{base!r} is {kind}; {role}")
            raise self.err(where, f"unknown port {base!r}{_suggest(base, list(ports))}; "
                                  f"known: {', '.join(ports)}")
        port = ports[base]
        if not m:
            return key, port.indices
        hi = int(m.group(2))
        lo = int(m.group(3)) if m.group(3) is not None else hi
        if hi < lo or hi >= port.width:
            raise self.err(where, f"bit slice {key!r} is outside {base!r} (bits {port.width - 1}..0); "
                                  f"write name[HIGH:LOW] with HIGH >= LOW")
        return key, port.indices[lo: hi + 1]

    def match_cubes(self, value: object, name: str, indices: tuple[int, ...],
                    where: tuple[int | None, int | None]) -> list[Cube]:
        w = len(indices)
        top = (1 << w) - 1
        fits = f"{name!r} is {w} bit{'s' if w > 1 else ''} wide (0..{top:#x})"
        if isinstance(value, list):
            if not value:
                raise self.err(where, f"empty list for {name!r}; expected at least one value")
            out: list[Cube] = []
            for v in value:
                out += self.match_cubes(v, name, indices, where)
            return list(dict.fromkeys(out))
        if isinstance(value, dict):
            return self.table_match(value, name, indices, where)
        if isinstance(value, bool):
            value = int(value)
        if isinstance(value, int):
            if not 0 <= value <= top:
                raise self.err(where, f"value {value} ({value:#x}) does not fit: {fits}")
            return [field_cube(value, top, indices)]
        if isinstance(value, str):
            s = value.strip()
            if s.lower() in _DC_WORDS or s == "":
                raise self.err(where, f"{value!r} as a match for {name!r} matches anything; leave {name!r} out of "
                                      f"'when' instead")
            if ".." in s:
                lo_s, _, hi_s = s.partition("..")
                raise self.err(where, f"{value!r} for {name!r} is not a match; write a range as an inline table "
                                      f"with both bounds, {{ from = {lo_s.strip() or 'LOW'}, to = "
                                      f"{hi_s.strip() or 'HIGH'} }}")
            pat = _pattern(s, w)
            if pat is not None:
                care, val = pat
                if val >> w:
                    raise self.err(where, f"pattern {value!r} does not fit: {fits}")
                return [field_cube(val, care, indices)]
            n = _parse_int(s)
            if n is None:
                raise self.err(where, f"cannot read {value!r} as a match for {name!r}; expected a number, "
                                      f"a pattern like \"0b1x0x\", {{ from = .., to = .. }} or {{ value = .., mask = .. }}")
            if n > top:
                raise self.err(where, f"value {value!r} does not fit: {fits}")
            return [field_cube(n, top, indices)]
        raise self.err(where, f"cannot use {value!r} as a match for {name!r}; expected a number, a range or a pattern")

    def table_match(self, value: dict[str, Any], name: str, indices: tuple[int, ...],
                    where: tuple[int | None, int | None]) -> list[Cube]:
        """An inline-table match: ``{ from = LOW, to = HIGH }`` (inclusive range) or ``{ value = V, mask = M }``."""
        top = (1 << len(indices)) - 1
        fits = f"{name!r} is {len(indices)} bit{'s' if len(indices) > 1 else ''} wide (0..{top:#x})"
        kind = "range" if set(value) & set(_RANGE_KEYS) else "masked match" if set(value) & set(_MASK_KEYS) else ""
        keys = _RANGE_KEYS if kind == "range" else _MASK_KEYS
        extra = sorted(set(value) - set(keys))
        if not value:
            raise self.err(where, f"empty table matching {name!r}; expected {{ from = LOW, to = HIGH }} or "
                                  f"{{ value = V, mask = M }}")
        if not kind or extra:
            bad = extra[0] if extra else min(value)
            raise self.err(where, f"unknown key {bad!r} in the table matching {name!r}"
                                  f"{_suggest(bad, list(_RANGE_KEYS + _MASK_KEYS))}; expected "
                                  f"{{ from = LOW, to = HIGH }} or {{ value = V, mask = M }}")
        missing = [k for k in keys if k not in value]
        if missing:
            raise self.err(where, f"the {kind} for {name!r} has no {missing[0]!r}; write "
                                  + ("{ from = LOW, to = HIGH }" if kind == "range" else "{ value = V, mask = M }"))
        got: dict[str, int] = {}
        for key in keys:
            x = value[key]
            n = _parse_int(x) if isinstance(x, str) else None if isinstance(x, bool) else x
            if not isinstance(n, int):
                raise self.err(where, f"{key} {x!r} for {name!r} is not a number; expected an integer such as 12, "
                                      f"0x3F or 0b1010 (or a string holding one)")
            if not 0 <= n <= top:
                raise self.err(where, f"{key} {x!r} for {name!r} does not fit: {fits}")
            got[key] = n
        if kind == "range":
            lo, hi = got["from"], got["to"]
            if lo > hi:
                raise self.err(where, f"the range for {name!r} is empty: from {lo:#x} is above to {hi:#x}; "
                                      f"write the lower bound in from")
            return range_cubes(lo, hi, indices)
        v, msk = got["value"], got["mask"]
        if v & ~msk:
            raise self.err(where, f"value {v:#x} for {name!r} sets bits outside mask {msk:#x}; "
                                  f"clear them or widen the mask")
        return [field_cube(v, msk, indices)]

    def set_value(self, value: object, name: str, width: int, where: tuple[int | None, int | None],
                  what: str = "value") -> tuple[int, int]:
        """``(care, value)`` bits over the output's width: care bits set are given, the rest don't-care."""
        top = (1 << width) - 1
        fits = f"{name!r} is {width} bit{'s' if width > 1 else ''} wide (0..{top:#x})"
        if isinstance(value, bool):
            value = int(value)
        if isinstance(value, int):
            if not 0 <= value <= top:
                raise self.err(where, f"{what} {value} ({value:#x}) does not fit: {fits}")
            return top, value
        if isinstance(value, str):
            s = value.strip()
            if s.lower() in _DC_WORDS:
                return 0, 0
            pat = _pattern(s, width)
            if pat is not None:
                care, val = pat
                if val >> width:
                    raise self.err(where, f"{what} {value!r} does not fit: {fits}")
                return care, val
            n = _parse_int(s)
            if n is not None:
                if n > top:
                    raise self.err(where, f"{what} {value!r} does not fit: {fits}")
                return top, n
        raise self.err(where, f"cannot read {what} {value!r} for {name!r}; expected a number, \"dc\", or a pattern "
                              f"like \"0b1x0\"")

    # -- rules ---------------------------------------------------------------------------------------------------
    def rules(self) -> list[tuple[int, list[Cube], dict[str, tuple[tuple[int, ...], int, int]]]]:
        raw = self.doc.get("rule", [])
        if not isinstance(raw, list) or not all(isinstance(r, dict) for r in raw):
            raise self.err(self.top_key("rule"), "'rule' must be an array of tables: write each as [[rule]]")
        out = []
        for r, rule in enumerate(raw):
            for k in rule:
                if k not in _RULE_KEYS:
                    raise self.err(self.rule_where(r, k), f"unknown key {k!r} in rule {r + 1}"
                                                          f"{_suggest(k, list(_RULE_KEYS))}; expected when, set, note")
            when = rule.get("when", {})
            if not isinstance(when, dict):
                raise self.err(self.rule_where(r, "when"), f"rule {r + 1}: 'when' must be a table like "
                                                           f"{{ addr = {{ from = 0x00, to = 0x0F }} }}")
            if "set" not in rule or not isinstance(rule["set"], dict) or not rule["set"]:
                raise self.err(self.rule_where(r), f"rule {r + 1} sets nothing; add set = {{ output = value }}")
            cubes = [Cube(0, 0)]
            for key, value in when.items():
                where = self.rule_where(r, "when", key)
                label, idx = self.view(key, self.inputs, where, "'when' tests inputs only")
                cubes = and_lists(cubes, self.match_cubes(value, label, idx, where))
            sets: dict[str, tuple[tuple[int, ...], int, int]] = {}
            for key, value in rule["set"].items():
                where = self.rule_where(r, "set", key)
                label, idx = self.view(key, self.outputs, where, "'set' assigns outputs only")
                care, val = self.set_value(value, label, len(idx), where)
                sets[key] = (idx, care, val)
            # overlapping bit views of one output inside a rule would be ambiguous
            seen: dict[int, str] = {}
            for key, (idx, _c, _v) in sets.items():
                for i in idx:
                    if i in seen:
                        raise self.err(self.rule_where(r, "set", key),
                                       f"rule {r + 1} sets output bit {self.output_names[i]!r} twice "
                                       f"({seen[i]!r} and {key!r})")
                    seen[i] = key
            out.append((r, cubes, sets))
        return out

    # -- expressions ---------------------------------------------------------------------------------------------
    def expr_error(self, name: str, key: str, source: str, exc: ExprError) -> SpecError:
        kl, kc = self.port_where("outputs", name, key)
        line, col = kl, None
        if kl is not None:
            offset = sum(len(x) + 1 for x in self.loc.lines[: kl - 1]) + (kc or 1) - 1
            first = source.strip("\n").splitlines()[0] if source.strip() else source
            pos = self.text.find(first, offset) if first else -1
            if pos >= 0:
                sline = self.text.count("\n", 0, pos) + 1
                scol = pos - (self.text.rfind("\n", 0, pos) + 1) + 1
                line = sline + exc.line - 1
                col = scol + exc.col - 1 if exc.line == 1 else exc.col
        return SpecError(self.path, line, f"output {name!r} {key}: {exc.message}", col)

    def expr_sets(self, name: str) -> tuple[list[list[Cube]], list[Cube]] | None:
        """Per-bit ON cubes and the DC cubes of an expression output (``None`` if it has no ``expr``)."""
        opts = self.output_specs[name]
        if "expr" not in opts:
            if "dc" in opts:
                raise self.err(self.port_where("outputs", name, "dc"),
                               f"output {name!r} has dc but no expr; mark don't-cares with rules instead")
            return None
        port = self.outputs[name]
        widths = {p.name: p.width for p in self.inputs.values()}
        others = {o: "is an output; expressions read inputs only" for o in self.outputs}
        compiled: dict[str, Expression] = {}
        for key in ("expr", "dc"):
            if key not in opts:
                continue
            src = opts[key]
            if not isinstance(src, str):
                raise self.err(self.port_where("outputs", name, key),
                               f"output {name!r} {key} must be a string holding an expression, not {src!r}")
            try:
                compiled[key] = compile_expr(src, widths, others)
            except ExprError as exc:
                raise self.expr_error(name, key, src, exc) from None
        used: list[str] = []
        for e in compiled.values():
            used += [u for u in e.names if u not in used]
        bits = sum(self.inputs[u].width for u in used)
        if bits > DEFAULT_ENUM_LIMIT:
            raise self.err(self.port_where("outputs", name, "expr"),
                           f"output {name!r} is an expression over {bits} input bits ({', '.join(used)}); "
                           f"expressions are evaluated at every point and the limit is {DEFAULT_ENUM_LIMIT} bits; "
                           f"describe it with rules (ranges, patterns) instead")
        local: list[int] = []
        offsets: dict[str, int] = {}
        for u in used:
            offsets[u] = len(local)
            local += list(self.inputs[u].indices)
        total = 1 << bits
        dtype = np.uint8 if port.width <= 8 else np.uint16 if port.width <= 16 else np.uint32 \
            if port.width <= 32 else np.uint64
        values = np.zeros(total, dtype=dtype)
        dcmask = np.zeros(total, dtype=bool)
        top = (1 << port.width) - 1
        for start in range(0, total, _CHUNK):
            pts = np.arange(start, min(total, start + _CHUNK), dtype=np.int64)
            env = {u: (pts >> offsets[u]) & ((1 << self.inputs[u].width) - 1) for u in used}
            for key, e in compiled.items():
                sub_env = {u: env[u] for u in e.names}
                try:
                    r = evaluate(e, sub_env)
                except ExprError as exc:
                    raise self.expr_error(name, key, e.source, exc) from None
                r = np.broadcast_to(r, pts.shape)
                if key == "dc":
                    dcmask[start: start + pts.size] = r != 0
                    continue
                if r.dtype.kind == "f":
                    raise self.expr_error(name, key, e.source, ExprError(
                        "gives a fractional (float) value; wrap it in round(), floor() or ceil()"))
                r = r.astype(np.int64)
                bad = (r < 0) | (r > top)
                if bad.any():
                    i = int(np.flatnonzero(bad)[0])
                    at = ", ".join(f"{u}={int(env[u][i])}" for u in e.names) or "every point"
                    raise self.expr_error(name, key, e.source, ExprError(
                        f"gives {int(r[i])} at {at}, which does not fit {port.width} bit"
                        f"{'s' if port.width > 1 else ''} (0..{top}); mask it (& {top:#x}) or widen the output"))
                values[start: start + pts.size] = r.astype(dtype)
        per_bit: list[list[Cube]] = []
        for b in range(port.width):
            on = ((values >> b) & 1).astype(bool) & ~dcmask
            per_bit.append([Cube(*place(c.care, c.value, local)) for c in bool_array_to_cubes(on, bits)])
        dc = [Cube(*place(c.care, c.value, local)) for c in bool_array_to_cubes(dcmask, bits)]
        return per_bit, dc

    # -- assembly ------------------------------------------------------------------------------------------------
    def table(self) -> Table:
        self.ports()
        rules = self.rules()
        m = len(self.output_names)
        on: list[list[Cube]] = [[] for _ in range(m)]
        dc: list[list[Cube]] = [[] for _ in range(m)]
        off: list[list[Cube]] = [[] for _ in range(m)]
        claimed: list[list[Cube]] = [[] for _ in range(m)]  # per output bit: points an earlier rule decided
        for _r, cubes, sets in rules:
            for idx, care, val in sets.values():
                for b, j in enumerate(idx):
                    region = sharp(cubes, claimed[j]) if claimed[j] else cubes
                    target = (on if val >> b & 1 else off) if care >> b & 1 else dc
                    target[j] += region
                    claimed[j] += cubes
        on_t: list[tuple[Cube, ...] | None] = []
        dc_t: list[tuple[Cube, ...] | None] = []
        off_t: list[tuple[Cube, ...] | None] = []
        for name, port in self.outputs.items():
            opts = self.output_specs[name]
            ex = self.expr_sets(name)
            if ex is not None and "default" in opts:
                raise self.err(self.port_where("outputs", name, "default"),
                               f"output {name!r} has both expr and default; the expression is its default")
            if ex is None:
                if "default" in opts:
                    care, val = self.set_value(opts["default"], name, port.width,
                                               self.port_where("outputs", name, "default"), "default")
                    kinds = ["dc" if not care >> b & 1 else str(val >> b & 1) for b in range(port.width)]
                else:
                    kinds = [self.default_kind] * port.width
            for b, j in enumerate(port.indices):
                bit = 1 << j
                if ex is not None:
                    per_bit, ex_dc = ex
                    rest_on = sharp(per_bit[b], claimed[j]) if claimed[j] else per_bit[b]
                    rest_dc = sharp(ex_dc, claimed[j]) if claimed[j] else ex_dc
                    sets: list[list[Cube] | None] = [on[j] + rest_on, dc[j] + rest_dc, None]
                else:
                    sets = [on[j], dc[j], off[j]]
                    sets[{"1": 0, "dc": 1, "0": 2}[kinds[b]]] = None
                s_on, s_dc, s_off = (None if s is None else tuple(dict.fromkeys(c.with_outputs(bit) for c in s))
                                     for s in sets)
                on_t.append(s_on)
                dc_t.append(s_dc)
                off_t.append(s_off)
        return Table(tuple(self.input_names), tuple(self.output_names), tuple(on_t), tuple(dc_t), tuple(off_t),
                     input_buses=tuple(self.input_buses), output_buses=tuple(self.output_buses),
                     source=os.path.basename(self.path))


def parse_design(text: str, path: str) -> Table:
    """Read a design file (see the module docs) into a :class:`~plaforge.table.Table`.

    ``text`` is the TOML text; ``path`` names the file as for every reader (see :mod:`plaforge.formats`).

    Raises
    ------
    SpecError
        On invalid TOML, unknown or misspelt keys and ports (with a suggestion), values that do not fit their port,
        expressions outside the allowed subset or beyond the enumeration limit; each names the line (and column
        where known).

    Examples
    --------
    >>> t = parse_design('[inputs]\\na = 2\\n[outputs]\\ny = 1\\n[[rule]]\\nwhen = { a = 3 }\\nset = { y = 1 }\\n',
    ...                  "and.toml")
    >>> [t.evaluate(p)[0] for p in range(4)]
    [0, 0, 0, 1]
    """
    return _Reader(text, path).table()


def declared_name(text: str) -> str | None:
    """The ``[design] name`` string of a design file's text, or None when it gives none (or is not TOML).

    >>> declared_name('[design]\\nname = "door_lock"\\n[inputs]\\na = 1\\n'), declared_name("[inputs]\\na = 1\\n")
    ('door_lock', None)
    """
    import tomllib

    try:
        design = tomllib.loads(text).get("design", {})
    except tomllib.TOMLDecodeError:
        return None
    name = design.get("name") if isinstance(design, dict) else None
    return name if isinstance(name, str) and name.strip() else None
