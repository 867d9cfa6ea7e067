"""Malformed values, tried as a new user would type them: every command that reads the
condition answers exit 2 with the key and line, never a traceback and never a file
(SPEC.md "Conventions": dates are ISO 8601 calendar dates that exist)."""

from __future__ import annotations

import shutil

import pytest
from click.testing import CliRunner
from conftest import PASSING, ROOT

from reportgen.cli import main

CASES = [
    ("date: 2026-03-10", "date: 03/12/2026", "condition.date (line"),
    ("date: 2026-03-10", "date: 2026-02-30", "condition.date (line"),
    ("mass: 20.0", "mass: " + "9" * 5001, "items[0].mass (line"),
    ("  title: Ballast departure", "  ? [a, b]\n  : x\n  title: Ballast departure", "(line"),
]


@pytest.mark.parametrize("old, new, where", CASES, ids=["slashes", "feb30", "digits", "key"])
@pytest.mark.parametrize("command", ["check", "sheet"])
def test_malformed_value_is_exit_2_with_key_and_line(tmp_path, old, new, where, command):
    (tmp_path / "vessels").mkdir()
    shutil.copy(ROOT / "conditions" / "vessels" / "linnet-demo.yaml", tmp_path / "vessels")
    text = PASSING.read_text()
    assert old in text
    (tmp_path / "c.yaml").write_text(text.replace(old, new, 1))
    args = [command, str(tmp_path / "c.yaml")]
    if command == "sheet":
        args += ["-o", str(tmp_path / "c.pdf")]
    done = CliRunner().invoke(main, args)
    assert done.exit_code == 2, done.output
    assert "Traceback" not in done.output and where in done.output
    assert not (tmp_path / "c.pdf").exists()
