"""plaforge: truth tables to jointly minimized PLA covers, k-LUT networks and Amaranth modules, with proof.

The package itself re-exports the core types (:mod:`plaforge.core`); readers, producers and checks live in their
subpackages (see DEVELOPERS.md for the layers).
"""

from .core import *  # the core types, exactly core.__all__
from .core import __all__ as __all__

__version__ = "0.1.0"
