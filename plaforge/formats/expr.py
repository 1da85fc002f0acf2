"""A small, restricted integer expression language for outputs of design files, evaluated over numpy arrays.

Vocabulary
----------
expression
    One line (or a few) of Python operator syntax over the declared input buses, giving an output's value at every
    point at once. It is parsed with :mod:`ast` and evaluated by walking the tree; ``eval``/``exec`` are never used.
value
    Each input bus is an unsigned integer (bus member 0 is the least significant bit). Intermediate values are 64-bit
    integers or floats; comparisons give 0/1. The final value must be a non-negative integer that fits the output's
    width (a float result must be converted with ``round``/``floor``/``ceil``).

Allowed
-------
* integer and float literals, ``True``/``False``; the constants ``pi``, ``tau`` and ``e``;
* the names of the design's input buses (and nothing else);
* ``+ - * / // % **``, ``<< >> & | ^ ~``, unary ``-``/``+``, ``not``, ``and``, ``or`` (giving 0/1),
  comparisons (chains allowed) and ``A if COND else B`` (only the chosen branch is evaluated at each point, so
  ``x // y if y else 0`` is fine);
* calls of these functions, positional arguments only:

  ============================  ======================================================================
  ``abs(x)``                    absolute value
  ``min(a, b, ...)``            smallest argument (two or more)
  ``max(a, b, ...)``            largest argument (two or more)
  ``clamp(x, lo, hi)``          ``min(max(x, lo), hi)``
  ``isqrt(x)``                  integer square root, ``floor(sqrt(x))`` exactly, for ``x >= 0``
  ``sqrt(x)``                   square root as a float, ``x >= 0``
  ``log2(x)``                   base-2 logarithm as a float, ``x > 0``
  ``sin(x)``, ``cos(x)``        trigonometric functions of radians, as floats
  ``floor(x)``, ``ceil(x)``     to an integer
  ``round(x)``                  to the nearest integer, halves rounded **up** (``round(2.5) == 3``,
                                ``round(-2.5) == -2``), unlike Python's round-half-to-even
  ``popcount(x)``               number of one bits of ``x >= 0``
  ============================  ======================================================================

Refused, each with a message naming the line and column: attribute access, subscripts, any other call, lambdas,
comprehensions, strings, assignments, unknown names (with a suggestion), bitwise operators on floats, division by
zero at any point, integer values reaching 2**62 in magnitude (checked *before* each operation from the operands'
ranges, so ``2**2**64`` is refused without being computed), non-finite floats, expressions longer than
:data:`MAX_SOURCE` characters or with more than :data:`MAX_NODES` syntax nodes.

>>> import numpy as np
>>> e = compile_expr("(a * a) >> 2", {"a": 4})
>>> evaluate(e, {"a": np.arange(16)}).tolist()[:6]
[0, 0, 1, 2, 4, 6]
"""

from __future__ import annotations

import ast
import difflib
import math
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from types import MappingProxyType

import numpy as np

__all__ = [
    "CONSTANTS",
    "FUNCTIONS",
    "MAX_NODES",
    "MAX_SOURCE",
    "ExprError",
    "Expression",
    "compile_expr",
    "evaluate",
]

MAX_SOURCE = 2000
MAX_NODES = 400
_LIMIT = 1 << 62

CONSTANTS: Mapping[str, float] = MappingProxyType({"pi": math.pi, "tau": math.tau, "e": math.e})
FUNCTIONS: Mapping[str, tuple[int, int | None]] = MappingProxyType({  # name -> (min args, max args or None: any)
    "abs": (1, 1), "min": (2, None), "max": (2, None), "clamp": (3, 3), "isqrt": (1, 1), "sqrt": (1, 1),
    "log2": (1, 1), "sin": (1, 1), "cos": (1, 1), "floor": (1, 1), "ceil": (1, 1), "round": (1, 1),
    "popcount": (1, 1),
})

_BIN_SYMBOL: Mapping[type, str] = MappingProxyType({
    ast.Add: "+", ast.Sub: "-", ast.Mult: "*", ast.Div: "/", ast.FloorDiv: "//", ast.Mod: "%", ast.Pow: "**",
    ast.LShift: "<<", ast.RShift: ">>", ast.BitAnd: "&", ast.BitOr: "|", ast.BitXor: "^",
})
_CMP: Mapping[type, Callable[..., np.ndarray]] = MappingProxyType({
    ast.Eq: np.equal, ast.NotEq: np.not_equal, ast.Lt: np.less, ast.LtE: np.less_equal, ast.Gt: np.greater,
    ast.GtE: np.greater_equal,
})
_NAMED_NODES: Mapping[type, str] = MappingProxyType({
    ast.Attribute: "attribute access", ast.Subscript: "indexing", ast.Lambda: "lambda", ast.ListComp: "a comprehension",
    ast.SetComp: "a comprehension", ast.DictComp: "a comprehension", ast.GeneratorExp: "a generator expression",
    ast.NamedExpr: "assignment (:=)", ast.Starred: "star arguments", ast.List: "a list", ast.Tuple: "a tuple",
    ast.Dict: "a dict", ast.Set: "a set", ast.JoinedStr: "an f-string", ast.Await: "await", ast.Yield: "yield",
    ast.YieldFrom: "yield", ast.Slice: "slicing",
})


class ExprError(Exception):
    """A problem in an expression at ``line``/``col`` (1-based, relative to the expression text)."""

    def __init__(self, message: str, line: int = 1, col: int = 1) -> None:
        super().__init__(message)
        self.message, self.line, self.col = message, line, col


@dataclass(frozen=True, eq=False)
class Expression:
    """A checked expression: the source, its syntax tree, and the input names it reads (in order of first use)."""

    source: str
    tree: ast.Expression
    names: tuple[str, ...]


def _pos(node: ast.AST) -> tuple[int, int]:
    return getattr(node, "lineno", 1), getattr(node, "col_offset", 0) + 1


def _fail(node: ast.AST, message: str) -> ExprError:
    return ExprError(message, *_pos(node))


def compile_expr(source: str, inputs: Mapping[str, int], others: Mapping[str, str] | None = None) -> Expression:
    """Parse and check an expression.

    Parameters
    ----------
    source : str
        The expression text.
    inputs : mapping of str to int
        Input bus names and widths it may read.
    others : mapping of str to str, optional
        Other names the design knows (e.g. outputs) with a word on why they cannot be read here, for messages.

    Returns
    -------
    Expression

    Raises
    ------
    ExprError
        If the text is not a valid expression of the allowed subset (see the module docs).
    """
    if not isinstance(source, str):
        raise ExprError(f"an expression must be a string, not {type(source).__name__}")
    if len(source) > MAX_SOURCE:
        raise ExprError(f"expression is {len(source)} characters long; the limit is {MAX_SOURCE}")
    if not source.strip():
        raise ExprError("expression is empty; expected something like '(a * a) >> 2'")
    try:
        tree = ast.parse(source.strip("\n"), mode="eval")
    except SyntaxError as exc:
        msg = (exc.msg or "invalid syntax").rstrip(".")
        raise ExprError(f"syntax error: {msg}", exc.lineno or 1, exc.offset or 1) from None
    except (RecursionError, MemoryError, ValueError):
        raise ExprError("expression is nested too deeply or is not plain text") from None
    nodes = list(ast.walk(tree))
    if len(nodes) > MAX_NODES:
        raise ExprError(f"expression has {len(nodes)} syntax nodes; the limit is {MAX_NODES}")
    used: list[str] = []
    others = others or {}
    callee = {id(n.func) for n in nodes if isinstance(n, ast.Call)}
    for node in nodes:
        if id(node) not in callee:  # a called name is checked with its call
            _check_node(node, inputs, others, used)
    return Expression(source, tree, tuple(used))


def _check_node(node: ast.AST, inputs: Mapping[str, int], others: Mapping[str, str], used: list[str]) -> None:
    allowed_names = list(inputs) + list(CONSTANTS) + ["True", "False"]
    if isinstance(node, ast.Expression | ast.Load | ast.operator | ast.unaryop | ast.boolop | ast.cmpop):
        return
    if isinstance(node, ast.BinOp):
        if type(node.op) not in _BIN_SYMBOL:
            raise _fail(node, "the '@' operator is not allowed")
        return
    if isinstance(node, ast.UnaryOp | ast.BoolOp | ast.Compare | ast.IfExp):
        return
    if isinstance(node, ast.Constant):
        v = node.value
        if isinstance(v, bool):
            return
        if isinstance(v, int):
            if abs(v) >= _LIMIT:
                raise _fail(node, f"literal {v if v < 10**20 else 'with ' + str(len(str(v))) + ' digits'} is too "
                                  f"large; values must stay below 2**62")
            return
        if isinstance(v, float):
            if not math.isfinite(v):
                raise _fail(node, "literal is not a finite number")
            return
        kind = "a string" if isinstance(v, str) else type(v).__name__
        raise _fail(node, f"{kind} is not allowed in an expression; expected numbers and input names")
    if isinstance(node, ast.Name):
        if node.id in inputs:
            if node.id not in used:
                used.append(node.id)
            return
        if node.id in CONSTANTS:
            return
        if node.id in FUNCTIONS:
            raise _fail(node, f"{node.id!r} is a function; call it, e.g. {node.id}(x)")
        if node.id in others:
            raise _fail(node, f"{node.id!r} {others[node.id]}")
        hint = difflib.get_close_matches(node.id, allowed_names, n=1)
        known = ", ".join(list(inputs)) or "(none)"
        raise _fail(
            node,
            f"unknown name {node.id!r}" + (f" (did you mean {hint[0]!r}?)" if hint else "")
            + f"; expressions may read the inputs {known} and the constants pi, tau, e",
        )
    if isinstance(node, ast.Call):
        if not isinstance(node.func, ast.Name):
            raise _fail(node, "only calls of the named functions are allowed, e.g. isqrt(a)")
        name = node.func.id
        if name not in FUNCTIONS:
            hint = difflib.get_close_matches(name, list(FUNCTIONS), n=1)
            raise _fail(
                node,
                f"function {name!r} is not allowed" + (f" (did you mean {hint[0]!r}?)" if hint else "")
                + f"; allowed functions: {', '.join(FUNCTIONS)}",
            )
        if node.keywords:
            raise _fail(node, f"{name}() takes positional arguments only")
        lo, hi = FUNCTIONS[name]
        k = len(node.args)
        if k < lo or (hi is not None and k > hi):
            want = f"{lo}" if lo == hi else f"at least {lo}" if hi is None else f"{lo} to {hi}"
            raise _fail(node, f"{name}() takes {want} argument{'s' if want != '1' else ''}, got {k}")
        return
    what = _NAMED_NODES.get(type(node), type(node).__name__)
    raise _fail(node, f"{what} is not allowed in an expression")


# -- evaluation --------------------------------------------------------------------------------------------------
def evaluate(expr: Expression, env: Mapping[str, np.ndarray]) -> np.ndarray:
    """Value of ``expr`` at every point: ``env`` maps each input name to an integer array (all the same length).

    Returns
    -------
    numpy.ndarray
        int64, float64 or bool array of the common length (constants broadcast).

    Raises
    ------
    ExprError
        On division by zero, values out of range or non-finite floats, naming an example point.
    """
    arrays = {k: np.asarray(v, dtype=np.int64) for k, v in env.items()}
    length = next(iter(arrays.values())).shape[0] if arrays else 1
    with np.errstate(all="ignore"):
        out = _Eval(arrays, length).run(expr.tree.body)
    return np.broadcast_to(out, (length,)).copy() if out.shape != (length,) else out


class _Eval:
    def __init__(self, env: dict[str, np.ndarray], length: int) -> None:
        self.env, self.length = env, length

    # helpers -------------------------------------------------------------------------------------------------
    def where(self, idx: np.ndarray) -> str:
        """Input values at index ``idx`` of the current arrays, for messages."""
        if not self.env:
            return ""
        i = int(idx)
        return " at " + ", ".join(f"{k}={int(v[i])}" for k, v in self.env.items())

    def first(self, bad: np.ndarray) -> str:
        bad = np.broadcast_to(bad, (self.length,))
        hits = np.flatnonzero(bad)
        return self.where(hits[0]) if hits.size else ""

    @staticmethod
    def num(x: np.ndarray) -> np.ndarray:
        return x.astype(np.int64) if x.dtype == np.bool_ else x

    @staticmethod
    def maxabs(x: np.ndarray) -> int:
        if x.size == 0:
            return 0
        return int(np.abs(x).max())

    def finite(self, node: ast.AST, r: np.ndarray) -> np.ndarray:
        if r.dtype.kind == "f":
            bad = ~np.isfinite(r)
            if bad.any():
                raise _fail(node, "result is not a finite number" + self.first(bad))
        return r

    def sub(self, mask: np.ndarray) -> _Eval:
        return _Eval({k: v[mask] for k, v in self.env.items()}, int(mask.sum()))

    # dispatch ------------------------------------------------------------------------------------------------
    def run(self, node: ast.AST) -> np.ndarray:
        if isinstance(node, ast.Constant):
            v = node.value
            return np.asarray(v, dtype=np.bool_ if isinstance(v, bool) else np.int64 if isinstance(v, int)
                              else np.float64)
        if isinstance(node, ast.Name):
            if node.id in self.env:
                return self.env[node.id]
            return np.asarray(CONSTANTS[node.id], dtype=np.float64)
        if isinstance(node, ast.BinOp):
            return self.binop(node, self.num(self.run(node.left)), self.num(self.run(node.right)))
        if isinstance(node, ast.UnaryOp):
            x = self.run(node.operand)
            if isinstance(node.op, ast.Not):
                return ~self.truth(x)
            x = self.num(x)
            if isinstance(node.op, ast.USub):
                return -x
            if isinstance(node.op, ast.UAdd):
                return x
            if x.dtype.kind == "f":
                raise _fail(node, "'~' needs an integer; convert with round(), floor() or ceil() first")
            return ~x
        if isinstance(node, ast.Compare):
            left = self.num(self.run(node.left))
            acc: np.ndarray | None = None
            for op, comp in zip(node.ops, node.comparators, strict=True):
                if isinstance(op, ast.Is | ast.IsNot | ast.In | ast.NotIn):
                    raise _fail(node, "'is' and 'in' are not allowed; use == or !=")
                right = self.num(self.run(comp))
                r = _CMP[type(op)](left, right)
                acc = r if acc is None else acc & r
                left = right
            assert acc is not None
            return acc
        if isinstance(node, ast.BoolOp):
            return self.boolop(node)
        if isinstance(node, ast.IfExp):
            return self.ifexp(node)
        if isinstance(node, ast.Call):
            assert isinstance(node.func, ast.Name)
            return self.call(node, node.func.id, [self.num(self.run(a)) for a in node.args])
        raise _fail(node, f"{type(node).__name__} is not allowed in an expression")  # compile_expr stops these

    def truth(self, x: np.ndarray) -> np.ndarray:
        return np.asarray(x != 0)

    def full(self, x: np.ndarray) -> np.ndarray:
        return np.broadcast_to(x, (self.length,))

    def split(self, cond: np.ndarray, node_t: ast.AST, node_f: ast.AST | None, value_f: np.ndarray | None
              ) -> np.ndarray:
        """Evaluate ``node_t`` where ``cond`` holds and ``node_f`` (or take ``value_f``) elsewhere."""
        c = self.full(self.truth(cond))
        parts: list[tuple[np.ndarray, np.ndarray]] = []
        for mask, node, fixed in ((c, node_t, None), (~c, node_f, value_f)):
            if not mask.any():
                continue
            if node is not None:
                val = self.num(self.sub(mask).run(node)) if mask.sum() else np.zeros(0, dtype=np.int64)
            else:
                assert fixed is not None
                val = self.full(fixed)[mask]
            parts.append((mask, np.broadcast_to(val, (int(mask.sum()),))))
        kinds = {p[1].dtype.kind for p in parts}
        dtype = np.float64 if "f" in kinds else np.bool_ if kinds == {"b"} else np.int64
        out = np.zeros(self.length, dtype=dtype)
        for mask, val in parts:
            out[mask] = val
        return out

    def ifexp(self, node: ast.IfExp) -> np.ndarray:
        cond = self.run(node.test)
        return self.split(cond, node.body, node.orelse, None)

    def boolop(self, node: ast.BoolOp) -> np.ndarray:
        acc = self.full(self.truth(self.run(node.values[0])))
        for v in node.values[1:]:
            if isinstance(node.op, ast.And):  # evaluate the right side only where the left side holds
                acc = self.split(acc, v, None, np.asarray(False)) != 0
            else:
                acc = self.split(~acc, v, None, np.asarray(True)) != 0
        return acc

    def binop(self, node: ast.BinOp, a: np.ndarray, b: np.ndarray) -> np.ndarray:
        op = type(node.op)
        sym = _BIN_SYMBOL[op]
        is_float = a.dtype.kind == "f" or b.dtype.kind == "f"
        if op in (ast.LShift, ast.RShift, ast.BitAnd, ast.BitOr, ast.BitXor) and is_float:
            raise _fail(node, f"'{sym}' needs integers; convert with round(), floor() or ceil() first")
        if op in (ast.Div, ast.FloorDiv, ast.Mod):
            zero = b == 0
            if np.any(zero):
                raise _fail(node, f"division by zero in '{sym}'" + self.first(zero))
            if op is ast.Div:
                return self.finite(node, np.true_divide(a, b))
            if op is ast.FloorDiv:
                return self.finite(node, np.floor_divide(a, b))
            return self.finite(node, np.mod(a, b))
        if is_float:
            if op is ast.Pow:
                return self.finite(node, np.power(a.astype(np.float64), b))
            f = {ast.Add: np.add, ast.Sub: np.subtract, ast.Mult: np.multiply}[op]
            return self.finite(node, f(a, b))
        ma, mb = self.maxabs(a), self.maxabs(b)
        too_big = f"values in '{sym}' can reach 2**62 or more; keep intermediate values smaller"
        if op in (ast.Add, ast.Sub):
            if ma + mb >= _LIMIT:
                raise _fail(node, too_big)
            return a + b if op is ast.Add else a - b
        if op is ast.Mult:
            if ma * mb >= _LIMIT:
                raise _fail(node, too_big)
            return a * b
        if op is ast.Pow:
            neg = b < 0
            if np.any(neg):
                raise _fail(node, "negative integer exponent; write a float base (e.g. 2.0 ** x) for fractions"
                            + self.first(neg))
            if ma > 1 and (mb >= 64 or (ma.bit_length()) * mb > 62):
                raise _fail(node, too_big)
            return np.power(a, b)
        if op in (ast.LShift, ast.RShift):
            neg = b < 0
            if np.any(neg):
                raise _fail(node, f"negative shift count in '{sym}'" + self.first(neg))
            if op is ast.LShift:
                if ma and (mb >= 62 or ma << mb >= _LIMIT):
                    raise _fail(node, too_big)
                return np.left_shift(a, b)
            return np.right_shift(a, np.minimum(b, 63))
        f = {ast.BitAnd: np.bitwise_and, ast.BitOr: np.bitwise_or, ast.BitXor: np.bitwise_xor}[op]
        return f(a, b)

    def call(self, node: ast.Call, name: str, args: list[np.ndarray]) -> np.ndarray:
        x = args[0]
        is_float = any(a.dtype.kind == "f" for a in args)
        if name == "abs":
            return np.abs(x)
        if name in ("min", "max"):
            f: Callable[..., np.ndarray] = np.minimum if name == "min" else np.maximum
            acc = args[0]
            for a in args[1:]:
                acc = f(acc, a)
            return acc
        if name == "clamp":
            lo, hi = args[1], args[2]
            bad = np.asarray(lo > hi)
            if bad.any():
                raise _fail(node, "clamp(x, lo, hi) needs lo <= hi" + self.first(bad))
            return np.minimum(np.maximum(x, lo), hi)
        if name in ("isqrt", "popcount"):
            if is_float:
                raise _fail(node, f"{name}() needs an integer; convert with round(), floor() or ceil() first")
            neg = x < 0
            if np.any(neg):
                raise _fail(node, f"{name}() of a negative number" + self.first(neg))
            if name == "popcount":
                return np.bitwise_count(x).astype(np.int64)
            r = np.floor(np.sqrt(x.astype(np.float64))).astype(np.int64)
            r = np.where(r * r > x, r - 1, r)
            r = np.where((r + 1) * (r + 1) <= x, r + 1, r)
            return r
        if name == "sqrt":
            neg = x < 0
            if np.any(neg):
                raise _fail(node, "sqrt() of a negative number" + self.first(neg))
            return np.sqrt(x.astype(np.float64))
        if name == "log2":
            bad = x <= 0
            if np.any(bad):
                raise _fail(node, "log2() needs a positive argument" + self.first(bad))
            return np.log2(x.astype(np.float64))
        if name in ("sin", "cos"):
            return self.finite(node, (np.sin if name == "sin" else np.cos)(x.astype(np.float64)))
        # floor, ceil, round: to integers
        if x.dtype.kind != "f":
            return x
        r = np.floor(x + 0.5) if name == "round" else np.floor(x) if name == "floor" else np.ceil(x)
        big = np.abs(r) >= _LIMIT
        if np.any(big):
            raise _fail(node, f"{name}() result is 2**62 or more in magnitude" + self.first(big))
        return r.astype(np.int64)
