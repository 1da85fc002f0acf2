"""plaforge: truth tables to jointly minimized PLA covers, k-LUT networks and Amaranth modules, with proof."""

from .core import DEFAULT_ENUM_LIMIT, Bus, CheckFailed, Cover, Cube, PlaforgeError, SpecError, Table, TooWide

__all__ = ["DEFAULT_ENUM_LIMIT", "Bus", "CheckFailed", "Cover", "Cube", "PlaforgeError", "SpecError", "Table", "TooWide"]
__version__ = "0.1.0"
