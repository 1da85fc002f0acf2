"""The one caution every generated artifact and report carries, worded once.

Reports, generated modules, Verilog headers and LUT listings all take their caution from :func:`caution`; each
wraps or prefixes it as its format needs, none rewords it. A registered module (outputs from a clocked stage) gets
the registered form of the first sentence: its outputs change only at the clock edge, but the logic feeding the
registers still has to settle within the clock period.
"""

from __future__ import annotations

__all__ = ["CAUTION", "REGISTERED_CAUTION", "caution"]

_GLITCH = ("Caution: combinational outputs can glitch while inputs change; register them or prove the hazard "
           "harmless.")
_REGISTERED = ("Caution: the outputs are registered, one clock cycle after the inputs; the logic feeding the "
               "registers can glitch between clock edges and must settle within the clock period.")
_REST = ("Close timing in the device flow, follow the device maker's documentation, and have the logic reviewed "
         "before any safety-relevant use.")


def caution(registered: bool = False) -> str:
    """The caution as one paragraph: the glitch sentence (its registered form when ``registered``), then timing,
    the device maker's documentation and review."""
    return f"{_REGISTERED if registered else _GLITCH} {_REST}"


CAUTION = caution()
"""The caution for combinational logic."""

REGISTERED_CAUTION = caution(registered=True)
"""The caution for a module whose outputs are registered."""
