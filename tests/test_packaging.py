"""The package as it is installed: every subpackage listed, the bundled samples shipped as package data.

Reference (setuptools documentation, from memory): with an explicit ``packages`` list only the listed packages are
built into a wheel, ``package-dir`` maps a package name onto a directory, and only files matching ``package-data``
patterns are copied beside a package's modules.
"""

from __future__ import annotations

import fnmatch
import tomllib
from importlib import resources
from pathlib import Path

import pytest

from plaforge import bundled
from plaforge.core.errors import PlaforgeError

ROOT = Path(__file__).resolve().parent.parent
PYPROJECT = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
SETUPTOOLS = PYPROJECT["tool"]["setuptools"]


def test_every_package_directory_is_listed():
    on_disk = {".".join(p.parent.relative_to(ROOT).parts) for p in (ROOT / "plaforge").rglob("__init__.py")}
    listed = set(SETUPTOOLS["packages"])
    assert listed - {"plaforge.samples"} == on_disk  # a package left out would be missing from the wheel


def test_samples_directory_is_the_samples_package():
    assert SETUPTOOLS["package-dir"]["plaforge.samples"] == "samples"
    assert "plaforge.samples" in SETUPTOOLS["packages"]
    assert (ROOT / "samples" / "__init__.py").is_file()


def test_every_sample_file_is_package_data():
    patterns = SETUPTOOLS["package-data"]["plaforge.samples"]
    files = sorted(p.name for p in (ROOT / "samples").iterdir() if p.is_file() and p.suffix in bundled.SAMPLE_SUFFIXES)
    assert files, "no samples found"
    for name in files:
        assert any(fnmatch.fnmatch(name, pat) for pat in patterns), name
    assert bundled.sample_names() == files


def test_sample_path_is_a_readable_file():
    p = bundled.sample_path("memory_map.toml")
    assert p.is_file() and p.read_text(encoding="utf-8").lstrip().startswith(("#", "["))


def test_missing_sample_names_the_ones_there():
    with pytest.raises(PlaforgeError, match=r"bundled sample 'absent\.pla' not found; have \[.*'arbiter\.pla'"):
        bundled.sample_path("absent.pla")


def test_uninstalled_checkout_falls_back_to_the_samples_directory(monkeypatch):
    def not_installed(name: str) -> None:
        raise ModuleNotFoundError(name)

    monkeypatch.setattr(resources, "files", not_installed)
    assert bundled.sample_path("arbiter.pla") == ROOT / "samples" / "arbiter.pla"
