"""Emitters: Amaranth components, Verilog through Amaranth's backend, and stand-alone pytest harnesses."""

from .amaranth import build_component, class_name_for, embedded_artifact, module_source, port_name, ports_of
from .harness import harness_source
from .verilog import verilog_name, verilog_source

__all__ = [
    "build_component",
    "class_name_for",
    "embedded_artifact",
    "harness_source",
    "module_source",
    "port_name",
    "ports_of",
    "verilog_name",
    "verilog_source",
]
