"""The layering drawn in DEVELOPERS.md holds: no import cycle, no import against the layer order."""

from __future__ import annotations

import layering


def test_every_module_has_a_layer() -> None:
    for mod in layering.modules():
        layering.group_of(mod)  # raises LookupError naming the module


def test_no_import_points_up_or_across_producers() -> None:
    assert layering.violations(layering.edges()) == []


def test_no_import_cycle() -> None:
    assert layering.cycles(layering.edges()) == []


def test_checker_sees_a_cycle_and_an_upward_import() -> None:
    # the checker itself must be able to fail: a made-up graph with both faults
    graph = {"plaforge.core.cube": {"plaforge.verify.sat"}, "plaforge.verify.sat": {"plaforge.core.cube"}}
    assert layering.cycles(graph) == [["plaforge.core.cube", "plaforge.verify.sat"]]
    assert any("core imports the higher layer verify" in v for v in layering.violations(graph))
