"""k-input LUT INIT vectors and LUT networks.

Public API
----------
:func:`map_luts`
    A table and its two-level cover as one shared network of k-LUTs (functional decomposition, cut-based mapping
    from the cover for wide outputs), re-checked.
:class:`LutOptions`
    Its options.
:func:`format_init`, :func:`pad_init`, :func:`c_header`
    INIT text for designs (Verilog-style sized hex, Python int, bit string), padding to a physical k, and a C
    header of constants.
"""

from ..core.network import Lut, LutNetwork
from .export import c_header, format_listing, net_init_constants
from .init import INIT_STYLES, format_init, pad_init
from .mapper import lower_bounds, map_luts
from .options import LutOptions

__all__ = [
    "INIT_STYLES",
    "Lut",
    "LutNetwork",
    "LutOptions",
    "c_header",
    "format_init",
    "format_listing",
    "lower_bounds",
    "map_luts",
    "net_init_constants",
    "pad_init",
]
