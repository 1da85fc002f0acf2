"""Emitters: Amaranth components, Verilog, and stand-alone pytest harnesses."""

from .amaranth import build_component, class_name_for, embedded_artifact, module_source, port_name, ports_of

__all__ = ["build_component", "class_name_for", "embedded_artifact", "module_source", "port_name", "ports_of"]
