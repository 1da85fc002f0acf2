"""Outputs never overwrite inputs, and every filesystem failure is one line with exit status 2.

Outside references: POSIX file semantics (a symbolic link and a hard link name the same file as their target; a
directory without write permission refuses new entries, except to root) and docs/conventions.md (exit status 2
for bad input or usage, one line on stderr).
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest
from click.testing import CliRunner

from plaforge.cli import cli
from plaforge.core.errors import PlaforgeError
from plaforge.core.fileio import make_directory, refuse_clobbering, same_file

SPEC = ".i 2\n.o 1\n.ilb a b\n.ob y\n11 1\n.e\n"


def _run(*args: str) -> tuple[int, str, str]:
    res = CliRunner().invoke(cli, list(args))
    return res.exit_code, res.stdout, res.stderr


def _one_line_exit_2(args: list[str], *must_name: str) -> str:
    code, out, err = _run(*args)
    assert code == 2, (args, out, err)
    assert err.count("\n") == 1 and err.startswith("plaforge: ") and "Traceback" not in out + err, err
    for text in must_name:
        assert text in err, (text, err)
    return err


# --- the functions ------------------------------------------------------------------------------------------------

def test_same_file_follows_links_and_dot_dot(tmp_path: Path) -> None:
    # POSIX: a symbolic link and a hard link name the file they point to; 'd/../f' is 'f'
    f = tmp_path / "spec.pla"
    f.write_text(SPEC)
    (tmp_path / "sym.pla").symlink_to(f)
    os.link(f, tmp_path / "hard.pla")
    (tmp_path / "d").mkdir()
    assert same_file(f, tmp_path / "sym.pla") and same_file(f, tmp_path / "hard.pla")
    assert same_file(f, tmp_path / "d" / ".." / "spec.pla")
    assert not same_file(f, tmp_path / "other.pla") and not same_file(tmp_path / "x", tmp_path / "y")


def test_refuse_clobbering_names_both_paths(tmp_path: Path) -> None:
    spec = tmp_path / "s.pla"
    spec.write_text(SPEC)
    with pytest.raises(PlaforgeError, match=r"^-o .*s\.pla is SPEC .*s\.pla; writing it would destroy the input"):
        refuse_clobbering([("SPEC", spec)], [("-o", str(spec))])
    with pytest.raises(PlaforgeError, match=r"^-o .*a\.json and --c-header .*a\.json are the same file"):
        refuse_clobbering([("SPEC", spec)], [("-o", tmp_path / "a.json"), ("--c-header", tmp_path / "a.json")])
    refuse_clobbering([("SPEC", spec)], [("-o", tmp_path / "a.json"), ("--c-header", None)])  # distinct: no error


def test_make_directory_errors_are_one_line(tmp_path: Path) -> None:
    f = tmp_path / "file"
    f.write_text("x")
    with pytest.raises(PlaforgeError, match=r"file: exists and is not a directory"):
        make_directory(f)
    with pytest.raises(PlaforgeError, match=r"file/sub: cannot create the directory \(Not a directory\)"):
        make_directory(f / "sub")
    assert make_directory(tmp_path / "a" / "b").is_dir()


# --- the commands -------------------------------------------------------------------------------------------------

COLLISIONS = [
    (["minimize", "{spec}", "-o", "{spec}"], "-o"),
    (["minimize", "{spec}", "-o", "{link}"], "-o"),
    (["luts", "{spec}", "-o", "{spec}"], "-o"),
    (["luts", "{spec}", "--c-header", "{spec}"], "--c-header"),
    (["luts", "{spec}", "-o", "{dir}/x.h", "--c-header", "{dir}/x.h"], "--c-header"),
    (["module", "{spec}", "-o", "{dir}/m.py", "--verilog", "{spec}"], "--verilog"),
    (["module", "{spec}", "-o", "{dir}/m.py", "--harness", "{spec}"], "--harness"),
    (["module", "{spec}", "-o", "{dir}/m.py", "--verilog", "{dir}/m.py"], "--verilog"),
    (["module", "{spec}", "-o", "{dir}/m.py", "--harness", "{dir}/m.py"], "--harness"),
    (["build", "{spec}", "-o", "{dir}"], "the cover artifact"),
    (["build", "{spec}", "-o", "{dir}/sub/.."], "the cover artifact"),
]


@pytest.mark.parametrize(("args", "label"), COLLISIONS, ids=[" ".join(a[:1] + a[2:]) for a, _ in COLLISIONS])
def test_output_on_an_input_is_refused_and_the_spec_kept(tmp_path: Path, args: list[str], label: str) -> None:
    spec = tmp_path / "spec.pla"
    spec.write_text(SPEC)
    (tmp_path / "link.pla").symlink_to(spec)
    (tmp_path / "sub").mkdir()
    before = sorted(os.listdir(tmp_path))
    argv = [a.format(spec=spec, link=tmp_path / "link.pla", dir=tmp_path) for a in args]
    _one_line_exit_2(argv, label)
    assert spec.read_text() == SPEC  # byte-identical afterwards
    assert sorted(os.listdir(tmp_path)) == before  # refused before any work: nothing written


def test_build_in_another_directory_still_works(tmp_path: Path) -> None:
    spec = tmp_path / "spec.pla"
    spec.write_text(SPEC)
    code, _out, err = _run("build", str(spec), "-o", str(tmp_path / "out"))
    assert code == 0, err
    assert (tmp_path / "out" / "spec.pla").read_text() != SPEC and spec.read_text() == SPEC


def test_read_only_output_directory_is_one_line(tmp_path: Path) -> None:
    spec = tmp_path / "spec.pla"
    spec.write_text(SPEC)
    ro = tmp_path / "ro"
    ro.mkdir()
    ro.chmod(0o555)
    try:
        if os.access(ro, os.W_OK):
            pytest.skip("this user (root) may write into a read-only directory")  # POSIX: root bypasses modes
        _one_line_exit_2(["build", str(spec), "-o", str(ro / "sub")], "ro/sub", "cannot create the directory")
        _one_line_exit_2(["build", str(spec), "-o", str(ro)], "is not writable")
        _one_line_exit_2(["minimize", str(spec), "-o", str(ro / "c.pla")], "c.pla: cannot write here")
    finally:
        ro.chmod(0o755)


@pytest.mark.parametrize(("args", "text"), [
    (["minimize", "{spec}", "-o", "{dir}/missing/c.pla"], "does not exist"),
    (["minimize", "{spec}", "-o", "{dir}"], "exists and is not a regular file"),
    (["minimize", "{spec}", "-o", "{spec}/c.pla"], "is not a directory"),
    (["build", "{spec}", "-o", "{spec}"], "exists and is not a directory"),
    (["inspect", "{dir}"], "is a directory; expected a spec file"),
    (["check", "{dir}", "{spec}"], "is a directory; expected a spec file"),
])
def test_filesystem_errors_are_one_line(tmp_path: Path, args: list[str], text: str) -> None:
    spec = tmp_path / "spec.pla"
    spec.write_text(SPEC)
    _one_line_exit_2([a.format(spec=spec, dir=tmp_path) for a in args], text)
    assert spec.read_text() == SPEC


def test_pla_without_outputs_is_refused(tmp_path: Path) -> None:
    # docs/formats.md: .o M with M at least 1
    spec = tmp_path / "none.pla"
    spec.write_text(".i 2\n.o 0\n.e\n")
    _one_line_exit_2(["inspect", str(spec)], "none.pla:2:1: .o 0 declares no outputs")


def test_permission_errors_are_one_line_even_as_root(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    # The read-only test above is skipped for root; here the system calls fail the way POSIX says they do for an
    # unprivileged user (EACCES from mkdir and from creating the temporary file), so the messages are still checked.
    import tempfile

    spec = tmp_path / "spec.pla"
    spec.write_text(SPEC)

    def denied(*_a: object, **_k: object) -> None:
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(Path, "mkdir", denied)
    _one_line_exit_2(["build", str(spec), "-o", str(tmp_path / "new")], "cannot create the directory (Permission")
    monkeypatch.setattr(tempfile, "mkstemp", denied)
    _one_line_exit_2(["minimize", str(spec), "-o", str(tmp_path / "c.pla")], "cannot write here (Permission denied)")
    assert spec.read_text() == SPEC


def test_interrupt_while_writing_leaves_the_old_file_and_no_temporary(tmp_path: Path,
                                                                        monkeypatch: pytest.MonkeyPatch) -> None:
    # POSIX rename(2) is atomic: until it runs the target is the old file; an interrupt before it leaves nothing new
    from plaforge.core.fileio import write_text_atomic

    target = tmp_path / "cover.pla"
    target.write_text("old\n")

    def interrupted(*_a: object) -> None:  # Ctrl-C after the text is written, before the rename
        raise KeyboardInterrupt

    monkeypatch.setattr(os, "fchmod", interrupted)
    with pytest.raises(KeyboardInterrupt, match=r"^$"):
        write_text_atomic(target, "new\n" * 1000)
    monkeypatch.undo()
    assert target.read_text() == "old\n" and sorted(os.listdir(tmp_path)) == ["cover.pla"]
