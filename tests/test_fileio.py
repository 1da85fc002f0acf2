"""Artifact files get the modes an ordinary file write would give them.

Reference (POSIX semantics, common practice): open(2)/creat(2) create a file with the requested mode 0666 cleared by
the process umask, so umask 022 gives 0644 and umask 077 gives 0600; rewriting an existing file in place keeps its
permission bits. An atomic write (temporary file, then rename(2)) must end with the same modes.
"""

from __future__ import annotations

import os
import stat
from collections.abc import Iterator

import pytest

from plaforge.core.errors import PlaforgeError
from plaforge.core.fileio import current_umask, write_text_atomic


@pytest.fixture
def umask() -> Iterator[None]:
    saved = os.umask(0o022)
    os.umask(saved)
    yield
    os.umask(saved)


def _mode(path: object) -> int:
    return stat.S_IMODE(os.stat(path).st_mode)  # type: ignore[arg-type]


@pytest.mark.parametrize(("mask", "expected"), [(0o022, 0o644), (0o077, 0o600), (0o027, 0o640), (0o002, 0o664)])
def test_new_file_mode_is_0666_less_umask(tmp_path, umask, mask, expected):
    os.umask(mask)
    p = write_text_atomic(tmp_path / "out.pla", ".i 1\n.o 1\n.e\n")
    assert _mode(p) == expected  # POSIX: creat(path, 0666) under umask `mask`
    # a plain open() under the same umask gives the same mode (the behaviour imitated)
    q = tmp_path / "plain.txt"
    q.write_text("x")
    assert _mode(q) == expected


@pytest.mark.parametrize("mask", [0o022, 0o077])
def test_current_umask_reads_without_changing_it(umask, mask):
    os.umask(mask)
    assert current_umask() == mask
    assert current_umask() == mask  # unchanged by the first read
    assert os.umask(mask) == mask


@pytest.mark.parametrize("existing", [0o644, 0o640, 0o600, 0o664])
@pytest.mark.parametrize("mask", [0o022, 0o077])
def test_replaced_file_keeps_its_mode(tmp_path, umask, existing, mask):
    os.umask(0)
    target = tmp_path / "cover.pla"
    target.write_text("old\n")
    os.chmod(target, existing)
    os.umask(mask)
    write_text_atomic(target, "new\n")
    assert target.read_text() == "new\n"
    assert _mode(target) == existing  # POSIX: rewriting a file's contents leaves its permission bits alone


def test_no_temporary_file_left_behind(tmp_path, umask):
    write_text_atomic(tmp_path / "a.json", "{}\n")
    write_text_atomic(tmp_path / "a.json", "[]\n")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a.json"]


def test_directory_in_the_way_is_a_user_error(tmp_path):
    (tmp_path / "out.pla").mkdir()
    with pytest.raises(PlaforgeError, match=r"out\.pla: exists and is not a regular file"):
        write_text_atomic(tmp_path / "out.pla", "x")


def test_missing_directory_is_a_user_error(tmp_path):
    with pytest.raises(PlaforgeError, match=r"directory .*nowhere.* does not exist"):
        write_text_atomic(tmp_path / "nowhere" / "out.pla", "x")
