"""Where the bundled samples live (the repository's ``samples/`` directory)."""

from __future__ import annotations

from pathlib import Path

from .core.errors import PlaforgeError

__all__ = ["SAMPLES_DIR", "sample_path"]

SAMPLES_DIR = Path(__file__).resolve().parent.parent / "samples"


def sample_path(name: str) -> Path:
    """Path of a bundled sample; an error naming the ones that exist if it is missing."""
    p = SAMPLES_DIR / name
    if not p.is_file():
        have = sorted(x.name for x in SAMPLES_DIR.glob("*.*") if x.suffix in {".pla", ".csv", ".toml"})
        raise PlaforgeError(f"bundled sample {name!r} not found in {SAMPLES_DIR}; have {have}")
    return p
