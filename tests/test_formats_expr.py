"""The restricted expression language: semantics against Python's integer arithmetic, and refusals."""

from __future__ import annotations

import math
from collections.abc import Callable

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from plaforge.formats.expr import ExprError, compile_expr, evaluate

A = np.arange(16)
B = np.arange(16)[::-1].copy()
WIDTHS = {"a": 4, "b": 4}


def _run(src: str) -> list[int | float | bool]:
    return evaluate(compile_expr(src, WIDTHS), {"a": A, "b": B}).tolist()


# Reference: Python's own integer and float semantics (common practice), written out as plain functions.
CASES: list[tuple[str, Callable[[int, int], int | float | bool]]] = [
    ("(a * a) >> 2", lambda a, b: (a * a) >> 2),
    ("a - b", lambda a, b: a - b),
    ("(a - b) // 3", lambda a, b: (a - b) // 3),
    ("(a - b) % 5", lambda a, b: (a - b) % 5),
    ("a ** 3 ^ b", lambda a, b: a**3 ^ b),
    ("~a & 0xF | b << 1", lambda a, b: ~a & 0xF | b << 1),
    ("-a + +b", lambda a, b: -a + +b),
    ("1 if a < b <= 12 else 2", lambda a, b: 1 if a < b <= 12 else 2),
    ("a == 3 or b == 3", lambda a, b: a == 3 or b == 3),
    ("not (a and b)", lambda a, b: not (a and b)),
    ("a // b if b else 99", lambda a, b: a // b if b else 99),
    ("min(a, b, 6) + max(a, 3)", lambda a, b: min(a, b, 6) + max(a, 3)),
    ("abs(a - b)", lambda a, b: abs(a - b)),
    ("clamp(a - 4, 0, 7)", lambda a, b: min(max(a - 4, 0), 7)),
    ("isqrt(a * b)", lambda a, b: math.isqrt(a * b)),
    ("popcount(a * 37)", lambda a, b: (a * 37).bit_count()),
    ("floor(a / 3) + ceil(b / 4)", lambda a, b: math.floor(a / 3) + math.ceil(b / 4)),
    ("round(a / 2)", lambda a, b: math.floor(a / 2 + 0.5)),  # halves round up, as documented
    ("round(100 * sin(a * pi / 8))", lambda a, b: math.floor(100 * math.sin(a * math.pi / 8) + 0.5)),
    ("round(10 * cos(a) + log2(a + 1) + sqrt(b))",
     lambda a, b: math.floor(10 * math.cos(a) + math.log2(a + 1) + math.sqrt(b) + 0.5)),
    ("7", lambda a, b: 7),
    ("tau > 6", lambda a, b: True),
]


@pytest.mark.parametrize(("src", "ref"), CASES, ids=[c[0] for c in CASES])
def test_semantics_match_python(src: str, ref: Callable[[int, int], int | float | bool]) -> None:
    got = _run(src)
    want = [ref(int(a), int(b)) for a, b in zip(A, B, strict=True)]
    assert [int(g) for g in got] == [int(w) for w in want]


def test_names_are_recorded_in_first_use_order() -> None:
    assert compile_expr("b + a * b", WIDTHS).names == ("b", "a")


@given(st.integers(0, 2**20), st.integers(1, 2**20), st.integers(0, 30))
@settings(max_examples=200, deadline=None)
def test_integer_ops_random(x: int, y: int, s: int) -> None:
    env = {"a": np.array([x]), "b": np.array([y])}
    e = compile_expr(f"(a * b) // (b + {s}) + (a % b) - (a >> {s}) ^ (b << {s % 20}) & a | isqrt(a)",
                     {"a": 21, "b": 21})
    ref = (x * y) // (y + s) + (x % y) - (x >> s) ^ (y << s % 20) & x | math.isqrt(x)  # Python's ints
    assert int(evaluate(e, env)[0]) == ref


@pytest.mark.parametrize(("src", "message"), [
    ("a.__class__", "attribute access is not allowed"),
    ("__import__('os')", "function '__import__' is not allowed"),
    ("__import__('os').system('true')", "only calls of the named functions"),
    ("(lambda: 1)()", "only calls of the named functions"),
    ("lambda: 1", "lambda is not allowed"),
    ("[x for x in a]", "comprehension is not allowed"),
    ("a[0]", "indexing is not allowed"),
    ("'text'", "a string is not allowed"),
    ("(x := 3)", "assignment"),
    ("c + 1", "unknown name 'c'"),
    ("aa + 1", "did you mean 'a'"),
    ("sqr(a)", "did you mean 'sqrt'"),
    ("min(a)", "min\\(\\) takes at least 2 arguments, got 1"),
    ("clamp(a, lo=1, hi=2)", "positional arguments only"),
    ("open('x')", "not allowed"),
    ("a @ b", "'@' operator is not allowed"),
    ("a +", "syntax error"),
    ("import os", "syntax error"),
    ("a; b", "syntax error"),
    ("", "empty"),
    ("a if b", "syntax error"),
    ("sin", "is a function; call it"),
    ("a is b", "'is' and 'in' are not allowed"),
    ("10 ** 30", "can reach 2\\*\\*62"),
    ("1" * 40, "too large"),
])
def test_refusals(src: str, message: str) -> None:
    with pytest.raises(ExprError, match=message):
        evaluate(compile_expr(src, WIDTHS), {"a": A, "b": B})


@pytest.mark.parametrize(("src", "message"), [
    ("2 ** 2 ** 64", "can reach 2\\*\\*62"),  # refused from operand ranges, never computed
    ("(a + 1) ** 100", "can reach 2\\*\\*62"),
    ("a << 70", "can reach 2\\*\\*62"),
    ("(a * 2**40) * (b * 2**40)", "can reach 2\\*\\*62"),
    ("a // (b - b)", "division by zero in '//' at a=0, b=15"),
    ("a % (a - 3)", "division by zero in '%' at a=3, b=12"),
    ("a ** (a - 20)", "negative integer exponent"),
    ("a << (a - 20)", "negative shift count"),
    ("isqrt(a - 5)", "isqrt\\(\\) of a negative number at a=0"),
    ("log2(a)", "log2\\(\\) needs a positive argument at a=0"),
    ("2.0 ** (a * 100)", "not a finite number"),
    ("a / 2 & 1", "needs integers"),
    ("round(1e300 * (a + 1))", "2\\*\\*62 or more"),
])
def test_runtime_guards(src: str, message: str) -> None:
    with pytest.raises(ExprError, match=message):
        evaluate(compile_expr(src, WIDTHS), {"a": A, "b": B})


def test_limits_on_size() -> None:
    with pytest.raises(ExprError, match="characters long"):
        compile_expr("a + " * 1000 + "a", WIDTHS)
    with pytest.raises(ExprError, match="syntax nodes"):
        compile_expr("+".join(["a"] * 300), WIDTHS)
    with pytest.raises(ExprError, match="nested|syntax error"):
        compile_expr("(" * 250 + "a" + ")" * 250, WIDTHS)


def test_error_positions() -> None:
    with pytest.raises(ExprError) as info:
        compile_expr("a + b.real", WIDTHS)
    assert (info.value.line, info.value.col) == (1, 5)
    with pytest.raises(ExprError) as info:
        compile_expr("(a +\n  nope)", WIDTHS)
    assert (info.value.line, info.value.col) == (2, 3)
