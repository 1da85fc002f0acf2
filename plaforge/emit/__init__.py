"""Emitters: Amaranth components, Verilog through Amaranth's backend, and stand-alone pytest harnesses."""

from .amaranth import build_component, module_source
from .harness import harness_source
from .verilog import verilog_name, verilog_source

__all__ = [
    "build_component",
    "harness_source",
    "module_source",
    "verilog_name",
    "verilog_source",
]
