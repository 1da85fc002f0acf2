"""The data types every layer shares: cubes, covers, tables, LUT networks, errors and file writing.

This package depends on nothing else in plaforge. A *point* is an integer whose bit ``i`` is the value of input
``i``; a :class:`Cube` is a product term over those inputs with an output mask; a :class:`Cover` is a list of
shared cubes; a :class:`Table` is the function as given (ON, DC and OFF cubes per output); a
:class:`LutNetwork` is a network of k-input LUTs.
"""

from .cube import Cover, Cube
from .errors import ArtifactError, CheckFailed, InternalError, LimitReached, PlaforgeError, SpecError
from .network import Lut, LutNetwork, init_hex
from .table import DEFAULT_ENUM_LIMIT, Bus, Table

__all__ = [
    "DEFAULT_ENUM_LIMIT",
    "ArtifactError",
    "Bus",
    "CheckFailed",
    "Cover",
    "Cube",
    "InternalError",
    "LimitReached",
    "Lut",
    "LutNetwork",
    "PlaforgeError",
    "SpecError",
    "Table",
    "init_hex",
]
