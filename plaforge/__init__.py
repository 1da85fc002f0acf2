"""plaforge: truth tables to jointly minimized PLA covers, k-LUT networks and Amaranth modules, with proof."""

from .core import (
    DEFAULT_ENUM_LIMIT,
    ArtifactError,
    Bus,
    CheckFailed,
    Cover,
    Cube,
    InternalError,
    LimitReached,
    LutNetwork,
    PlaforgeError,
    SpecError,
    Table,
)

__all__ = [
    "DEFAULT_ENUM_LIMIT",
    "ArtifactError",
    "Bus",
    "CheckFailed",
    "Cover",
    "Cube",
    "InternalError",
    "LimitReached",
    "LutNetwork",
    "PlaforgeError",
    "SpecError",
    "Table",
]
__version__ = "0.1.0"
