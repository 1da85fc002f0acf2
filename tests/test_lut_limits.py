"""Limits of the LUT mapper: a work budget that sends outputs to the cover, a time limit that raises TimeLimit (exit
3) only when nothing can finish, and wide sparse row lists mapped on their real supports. Networks are checked
against Python integer arithmetic."""

from __future__ import annotations

import numpy as np
import pytest
from click.testing import CliRunner
from tables import adder

from plaforge.cli import cli
from plaforge.core.cube import Cover, Cube
from plaforge.core.errors import TimeLimit
from plaforge.core.table import Table
from plaforge.lut import LutOptions, map_luts
from plaforge.minimize import minimize


def test_outputs_over_the_work_budget_are_mapped_from_the_cover():
    t = adder(4)
    net = map_luts(t, minimize(t), 4, LutOptions(work_budget=1))
    assert "cover cuts" in net.method
    for p in range(256):
        assert net.evaluate(p) == (p & 15) + (p >> 4)  # reference: Python integer addition


def test_a_time_limit_already_past_raises_time_limit_naming_the_option():
    t = adder(4)
    with pytest.raises(TimeLimit, match="--time-limit"):
        map_luts(t, minimize(t), 4, LutOptions(time_limit=1e-9))


def test_cli_time_limit_exits_3(tmp_path):
    spec = tmp_path / "add.pla"
    rows = [".i 4", ".o 3", ".ilb a0 a1 b0 b1", ".ob s0 s1 s2", ".type fr"]
    for p in range(16):
        s = (p & 3) + (p >> 2)  # reference: Python integer addition
        rows.append(f"{''.join(str(p >> i & 1) for i in range(4))} {''.join(str(s >> i & 1) for i in range(3))}")
    spec.write_text("\n".join(rows + [".e"]) + "\n")
    res = CliRunner().invoke(cli, ["luts", str(spec), "--time-limit", "1e-9"])
    assert res.exit_code == 3, res.output
    assert "--time-limit" in res.output


def test_sparse_rows_of_twenty_inputs_map_on_their_real_supports():
    # 1500 seeded points of 20 inputs, ON or OFF each, every other point don't-care: y0 is the parity of inputs 0-2,
    # y1 whether the field at inputs 3-5 exceeds the one at 6-8 (Python integer comparison)
    n = 20
    rng = np.random.default_rng(5)
    pts = sorted({int(x) for x in rng.integers(0, 1 << n, size=1500)})
    ref = [((p & 7).bit_count() & 1, int((p >> 3 & 7) > (p >> 6 & 7))) for p in pts]
    full = (1 << n) - 1
    on = tuple(tuple(Cube(full, p, 1 << j) for p, r in zip(pts, ref) if r[j]) for j in range(2))
    off = tuple(tuple(Cube(full, p, 1 << j) for p, r in zip(pts, ref) if not r[j]) for j in range(2))
    t = Table(tuple(f"x{i}" for i in range(n)), ("y0", "y1"), on, (None, None), off)
    cover = Cover(t.input_names, t.output_names, on[0] + on[1])  # the ON rows themselves realize the table
    net = map_luts(t, cover, 6)
    assert net.method.startswith("decomposition")
    assert net.count <= 3  # a 3-input parity is one LUT; a 6-input comparison is one LUT
    for p, r in zip(pts, ref):
        assert net.evaluate(p) == r[0] | r[1] << 1
