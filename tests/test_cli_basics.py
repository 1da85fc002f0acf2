"""Command-line behaviour shared by every command: help, exit statuses, one-line errors (docs/conventions.md)."""

from __future__ import annotations

import pytest
from click.testing import CliRunner

from plaforge.cli import cli

COMMANDS = ["build", "minimize", "luts", "module", "check", "demo", "inspect"]


@pytest.mark.parametrize("command", COMMANDS)
def test_every_contract_command_has_help(command):
    res = CliRunner().invoke(cli, [command, "--help"])
    assert res.exit_code == 0, res.output
    assert "Usage:" in res.output


def test_unknown_extension_is_bad_input(tmp_path):
    spec = tmp_path / "table.txt"
    spec.write_text("a,b\n")
    res = CliRunner().invoke(cli, ["inspect", str(spec)])
    assert res.exit_code == 2
    assert res.stderr.strip().count("\n") == 0
    assert "table.txt: unknown spec extension '.txt'" in res.stderr
    assert "Traceback" not in res.output + res.stderr


def test_missing_file_is_bad_input(tmp_path):
    res = CliRunner().invoke(cli, ["inspect", str(tmp_path / "absent.pla")])
    assert res.exit_code == 2
    assert "absent.pla: no such file" in res.stderr


def test_not_utf8_is_bad_input(tmp_path):
    spec = tmp_path / "bin.csv"
    spec.write_bytes(b"\xff\xfe\x00garbage")
    res = CliRunner().invoke(cli, ["inspect", str(spec)])
    assert res.exit_code == 2
    assert "not UTF-8 text" in res.stderr


def test_unknown_option_is_usage_error():
    res = CliRunner().invoke(cli, ["minimize", "--no-such-option", "x.pla"])
    assert res.exit_code == 2
