"""Outputs are written safely (DESIGN.md, "Habits"): a temporary name and a rename, no silent
overwrite, nothing left behind by a failure."""

from __future__ import annotations

import pytest

from reportgen.errors import InputError
from reportgen.files import write_atomic


def test_existing_file_is_kept_unless_forced(tmp_path):
    target = tmp_path / "out.pdf"
    target.write_bytes(b"the user's file")
    with pytest.raises(InputError, match="already exists"):
        write_atomic(target, b"new")
    assert target.read_bytes() == b"the user's file"
    write_atomic(target, b"new", force=True)
    assert target.read_bytes() == b"new"


def test_failure_leaves_nothing_behind(tmp_path):
    target = tmp_path / "out.pdf"
    with pytest.raises(TypeError):
        write_atomic(target, "not bytes")  # type: ignore[arg-type]
    assert list(tmp_path.iterdir()) == []


def test_missing_folder_and_private_mode(tmp_path):
    with pytest.raises(InputError, match="does not exist"):
        write_atomic(tmp_path / "nowhere" / "out.pdf", b"x")
    key = tmp_path / "key.pem"
    write_atomic(key, b"secret", mode=0o600)
    assert key.stat().st_mode & 0o777 == 0o600
