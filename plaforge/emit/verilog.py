"""Verilog through Amaranth's own backend (``amaranth.back.verilog.convert``, with the Yosys it bundles).

The generated component is converted as the top module; its ports keep the component's port names (see
:mod:`plaforge.core.names` for how spec names map to them). Source-location attributes are left out, so the text
depends only on the logic and on the backend version, not on where files live: the same input gives the same bytes.
"""

from __future__ import annotations

from typing import Any

from ..core.errors import ArtifactError
from ..core.names import VERILOG_KEYWORDS, identifier
from ..verify.component import instantiate, load_source

__all__ = ["verilog_name", "verilog_source"]


def verilog_name(name: str) -> str:
    """A plain Verilog module identifier for ``name`` (:func:`plaforge.core.names.identifier`, avoiding keywords).

    >>> verilog_name("memory-map"), verilog_name("7seg"), verilog_name("wire")
    ('memory_map', 'p_7seg', 'wire_')
    """
    return identifier(name, VERILOG_KEYWORDS)


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
    ArtifactError
        If the source does not run or does not define exactly one component, or the backend cannot convert the
        component (its ``elaborate`` raises, say).
    """
    from amaranth.back import verilog

    if isinstance(component_or_source, str):
        where = "<module source>"
        component = instantiate(load_source(component_or_source, where), where)
    else:
        component = component_or_source
    try:
        text = verilog.convert(component, name=verilog_name(name), emit_src=False)
    except Exception as exc:  # noqa: BLE001 - the backend reports problems as assorted exceptions
        raise ArtifactError(f"Verilog conversion failed: {type(exc).__name__}: {exc}") from None
    return text if text.endswith("\n") else text + "\n"
