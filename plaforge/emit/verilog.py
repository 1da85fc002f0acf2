"""Verilog through Amaranth's own backend (``amaranth.back.verilog.convert``, with the Yosys it bundles).

The generated component is converted as the top module; its ports keep the component's port names (see
:mod:`plaforge.emit.amaranth` for how spec names map to them). Source-location attributes are left out, so the text
depends only on the logic and on the backend version, not on where files live: the same input gives the same bytes.
"""

from __future__ import annotations

import re
import types
from typing import Any

from ..core.errors import PlaforgeError

__all__ = ["verilog_name", "verilog_source"]


def verilog_name(name: str) -> str:
    """A plain Verilog module identifier for ``name`` (other characters become ``_``; ``m_`` before a digit).

    >>> verilog_name("memory-map"), verilog_name("7seg")
    ('memory_map', 'm_7seg')
    """
    s = re.sub(r"[^A-Za-z0-9_]", "_", name) or "top"
    return "m_" + s if s[0].isdigit() else s


def _component_from_source(source: str) -> Any:
    from amaranth.lib import wiring

    mod = types.ModuleType("_plaforge_generated")
    try:
        exec(compile(source, "<generated module>", "exec", dont_inherit=True), mod.__dict__)  # noqa: S102 - our own generated text
    except Exception as exc:  # noqa: BLE001 - report any failure of the text as one line
        raise PlaforgeError(f"the module source does not run: {type(exc).__name__}: {exc}") from None
    found = [
        v for v in vars(mod).values()
        if isinstance(v, type) and issubclass(v, wiring.Component) and v is not wiring.Component
    ]
    if len(found) != 1:
        raise PlaforgeError(f"the module source defines {len(found)} wiring.Component subclasses; expected one")
    return found[0]()


def verilog_source(component_or_source: Any, name: str) -> str:
    """Verilog text for a component, or for the source text of a generated module file.

    Parameters
    ----------
    component_or_source : amaranth.lib.wiring.Component or str
        A component instance (from :func:`plaforge.emit.amaranth.build_component`, say) or the text
        :func:`plaforge.emit.amaranth.module_source` returned.
    name : str
        The Verilog module name (made a plain identifier by :func:`verilog_name`).

    Returns
    -------
    str
        The Verilog text, ending in a newline.

    Raises
    ------
    PlaforgeError
        If the source does not define exactly one component, or the backend fails.
    """
    from amaranth.back import verilog

    component = (
        _component_from_source(component_or_source) if isinstance(component_or_source, str) else component_or_source
    )
    try:
        text = verilog.convert(component, name=verilog_name(name), emit_src=False)
    except Exception as exc:  # noqa: BLE001 - the backend reports problems as assorted exceptions
        raise PlaforgeError(f"Verilog conversion failed: {type(exc).__name__}: {exc}") from None
    return text if text.endswith("\n") else text + "\n"
