"""Above the exhaustive limit, the stand-alone harness drives exactly the vectors ``plaforge check`` drives.

The harness file is loaded as the user's pytest would load it (from its own text, plaforge not involved once it is
written) and its ``_expected()`` is asked for its points; ``check_component``'s points are recorded where it hands
them to the simulator. Reference for the expected values: the definition of the function below (Python integer
comparison), evaluated on every point either side drives.
"""

from __future__ import annotations

import importlib.util
from pathlib import Path

import pytest

from plaforge.core.cube import Cover
from plaforge.core.table import Table
from plaforge.emit.amaranth import build_component
from plaforge.emit.harness import harness_source
from plaforge.verify import simulate


def _table() -> Table:
    ins = [f"addr[{i}]" for i in range(10)] + ["wr"]
    # hit = addr in 0x100..0x17F (common practice: an address window); busy = wr and addr < 16.
    # Don't-care: addr >= 0x3F0 for both outputs, so some points are skipped by both sides.
    return Table.from_function(
        ins, ["hit", "busy"],
        lambda p: [((p & 0x3FF) >= 0x100) & ((p & 0x3FF) < 0x180), ((p >> 10) & 1 == 1) & ((p & 0x3FF) < 16)],
        dc_fn=lambda p: [(p & 0x3FF) >= 0x3F0] * 2,
        source="window.toml",
    )


def test_harness_and_check_drive_the_same_vectors(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    t = _table()
    limit, samples, seed = 8, 300, 11  # 11 inputs: above the limit, so both sides sample
    harness = tmp_path / "test_window.py"
    harness.write_text(harness_source(t, "window_sop", limit=limit, samples=samples, seed=seed))
    spec = importlib.util.spec_from_file_location("harness_under_test", harness)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    points, on, dc = module._expected()

    driven: list[list[int]] = []
    real = simulate.simulate_points
    monkeypatch.setattr(simulate, "simulate_points", lambda *a, **kw: driven.append(list(a[2])) or real(*a, **kw))
    cover = Cover(t.input_names, t.output_names, tuple(c for j in range(t.n_outputs) for c in t.on_cubes(j)))
    verdict = simulate.check_component(t, build_component(t, cover), exhaustive_limit=limit, samples=samples,
                                       seed=seed)
    assert verdict.passed and " random = " in verdict.outputs[0].method
    # check_component skips points where every output is a don't-care; the harness skips them output by output
    everything_dc = (1 << t.n_outputs) - 1
    assert driven == [[p for p, d in zip(points, dc) if d != everything_dc]]
    assert len(points) > samples // 2  # corners plus random points, not a degenerate list
    for p, o, d in zip(points, on, dc):  # the harness's expected values agree with the definition
        a, wr = p & 0x3FF, p >> 10 & 1
        want = int(0x100 <= a < 0x180) | int(wr == 1 and a < 16) << 1
        assert (o, d) == ((0, 3) if a >= 0x3F0 else (want, 0)), p
