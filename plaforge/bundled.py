"""The bundled samples: the repository's ``samples/`` directory, shipped inside the package as ``plaforge.samples``.

``pyproject.toml`` maps the package ``plaforge.samples`` onto the top-level ``samples/`` directory, so an installed
plaforge (a wheel, not only an editable checkout) carries them as package data; they are found with
:mod:`importlib.resources`. In a source checkout that was never installed, the ``samples/`` directory next to the
package is used directly.
"""

from __future__ import annotations

import atexit
import contextlib
from importlib import resources
from importlib.resources.abc import Traversable
from pathlib import Path

from .core.errors import PlaforgeError

__all__ = ["SAMPLES_PACKAGE", "SAMPLE_SUFFIXES", "sample_names", "sample_path"]

SAMPLES_PACKAGE = "plaforge.samples"
SAMPLE_SUFFIXES = (".pla", ".csv", ".toml")
_CHECKOUT_SAMPLES = Path(__file__).resolve().parent.parent / "samples"
_extracted = contextlib.ExitStack()
atexit.register(_extracted.close)


def _root() -> Traversable:
    try:
        return resources.files(SAMPLES_PACKAGE)
    except ModuleNotFoundError:
        if _CHECKOUT_SAMPLES.is_dir():
            return _CHECKOUT_SAMPLES
        raise PlaforgeError(f"the bundled samples ({SAMPLES_PACKAGE}) are not installed; reinstall plaforge") from None


def sample_names() -> list[str]:
    """File names of the bundled samples, sorted."""
    return sorted(x.name for x in _root().iterdir() if x.is_file() and x.name.endswith(SAMPLE_SUFFIXES))


def sample_path(name: str) -> Path:
    """A file-system path of the bundled sample ``name``; an error naming the ones that exist if it is missing."""
    item = _root().joinpath(name)
    if not item.is_file():
        raise PlaforgeError(f"bundled sample {name!r} not found; have {sample_names()}")
    if isinstance(item, Path):
        return item
    return _extracted.enter_context(resources.as_file(item))  # an install that is not on a file system (a zip)
