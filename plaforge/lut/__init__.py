"""k-input LUT INIT vectors and LUT networks."""

from .network import Lut, LutNetwork, init_hex

__all__ = ["Lut", "LutNetwork", "init_hex"]
