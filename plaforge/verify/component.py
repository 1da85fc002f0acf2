"""Loading a generated module and finding its component.

A generated module defines exactly one :class:`amaranth.lib.wiring.Component` subclass. :func:`component_class`
finds it; the stand-alone harness (:mod:`plaforge.emit.harness`) carries that function's source text, so it
depends on amaranth only and is laid out as the ruff formatter lays out code at line length 88.
"""

from __future__ import annotations

import hashlib
import os
import types
from pathlib import Path
from typing import Any

from ..core.errors import ArtifactError

__all__ = ["component_class", "instantiate", "load_module", "load_source"]


def component_class(module: types.ModuleType) -> type:
    """The one ``amaranth.lib.wiring.Component`` subclass defined in ``module``.

    Raises ``LookupError`` when the module defines none or more than one.
    """
    from amaranth.lib import wiring

    found = [
        value
        for value in vars(module).values()
        if isinstance(value, type)
        and issubclass(value, wiring.Component)
        and value is not wiring.Component
        and value.__module__ == module.__name__
    ]
    if len(found) != 1:
        names = [c.__name__ for c in found]
        raise LookupError(
            f"expected exactly one wiring.Component subclass, found {len(found)} {names}"
        )
    return found[0]


def load_source(source: str, where: str) -> types.ModuleType:
    """Run module source text as a fresh module (not added to ``sys.modules``; no bytecode cache).

    Parameters
    ----------
    source : str
        The module text.
    where : str
        The file name, for tracebacks and error messages.

    Raises
    ------
    ArtifactError
        If running the text raises (the message names ``where`` and the exception).
    """
    name = "_plaforge_loaded_" + hashlib.sha256(where.encode()).hexdigest()[:16]
    module = types.ModuleType(name)
    module.__file__ = where
    try:
        exec(compile(source, where, "exec", dont_inherit=True), module.__dict__)  # noqa: S102 - running it is the point
    except Exception as exc:  # noqa: BLE001 - a module can raise anything while it runs
        raise ArtifactError(f"{where}: importing it failed: {type(exc).__name__}: {exc}") from None
    return module


def load_module(path: str | os.PathLike[str]) -> types.ModuleType:
    """Import a Python file by its path, in isolation (see :func:`load_source`), compiled from its current text.

    Raises
    ------
    ArtifactError
        If the file is missing, unreadable, or fails to import.
    """
    p = Path(path)
    if not p.is_file():
        raise ArtifactError(f"{p}: no such module file")
    try:
        source = p.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise ArtifactError(f"{p}: cannot read: {exc}") from None
    return load_source(source, str(p))


def instantiate(module: types.ModuleType, where: str) -> Any:
    """An instance of the module's one component class (:func:`component_class`), built without arguments.

    Raises
    ------
    ArtifactError
        If there is not exactly one component class, or building it raises.
    """
    try:
        cls = component_class(module)
    except LookupError as exc:
        raise ArtifactError(f"{where}: {exc}") from None
    try:
        return cls()
    except Exception as exc:  # noqa: BLE001 - a user's class can raise anything
        raise ArtifactError(f"{where}: {cls.__name__}() failed: {type(exc).__name__}: {exc}") from None
