"""Reading with limits and writing safely (DESIGN.md "Habits"; SPEC "Conventions" and
"Command line"): only regular files are read, never more than a cap, never blocking on a FIFO;
outputs go to a temporary name and take the target's name with a no-replace link (POSIX
link(2) fails with EEXIST), never replace an input, and leave nothing behind on an error,
SIGINT or SIGTERM."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time

import pytest

from reportgen.errors import InputError
from reportgen.files import command_scope, read_input, write_atomic


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


def test_missing_folder_folder_as_output_and_private_mode(tmp_path):
    with pytest.raises(InputError, match="does not exist"):
        write_atomic(tmp_path / "nowhere" / "out.pdf", b"x")
    with pytest.raises(InputError, match="is a folder"):
        write_atomic(tmp_path, b"x", force=True)
    key = tmp_path / "key.pem"
    write_atomic(key, b"secret", mode=0o600)
    assert key.stat().st_mode & 0o777 == 0o600


def test_a_file_that_appears_meanwhile_is_not_replaced(tmp_path, monkeypatch):
    target = tmp_path / "signed.pdf"
    real_fsync = os.fsync

    def someone_else_writes(fd):  # the target appears between the check and the rename
        real_fsync(fd)
        target.write_bytes(b"a signed sheet that appeared meanwhile")

    monkeypatch.setattr(os, "fsync", someone_else_writes)
    with pytest.raises(InputError, match="appeared while"):
        write_atomic(target, b"new")
    assert target.read_bytes() == b"a signed sheet that appeared meanwhile"
    assert [p.name for p in tmp_path.iterdir()] == ["signed.pdf"]


def test_unwritable_folder_is_a_clear_error(tmp_path, monkeypatch):
    import tempfile

    def refuse(*_a, **_k):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(tempfile, "mkstemp", refuse)
    with pytest.raises(InputError, match=r"out\.pdf: cannot write the file: no permission"):
        write_atomic(tmp_path / "out.pdf", b"x")


def test_an_input_is_never_replaced_even_with_force(tmp_path):
    source = tmp_path / "c.yaml"
    source.write_bytes(b"format: reportgen/condition-1\n")
    with command_scope():
        read_input(source, "condition file")
        with pytest.raises(InputError, match="one of the input files"):
            write_atomic(source, b"%PDF-", force=True)
    assert source.read_bytes() == b"format: reportgen/condition-1\n"
    write_atomic(source, b"outside the command, an ordinary file", force=True)


def test_only_regular_files_are_read_and_never_more_than_the_cap(tmp_path):
    with pytest.raises(InputError, match="character device"):
        read_input("/dev/zero", "vessel data file")
    with pytest.raises(InputError, match="folder"):
        read_input(tmp_path, "vessel data file")
    big = tmp_path / "big.yaml"
    big.write_bytes(b"x" * 2048)
    with pytest.raises(InputError, match="limit of 1024 bytes"):
        read_input(big, "vessel data file", max_bytes=1024)
    fifo = tmp_path / "fifo.yaml"
    os.mkfifo(fifo)
    start = time.monotonic()
    with pytest.raises(InputError, match="FIFO"):
        read_input(fifo, "condition file")  # refused at once: no writer is waited for
    assert time.monotonic() - start < 5


_SIGNAL_SCRIPT = textwrap.dedent("""
    import os, signal, sys
    from reportgen import files
    real = os.fsync
    def interrupted(fd):
        real(fd)
        os.kill(os.getpid(), getattr(signal, sys.argv[2]))
    os.fsync = interrupted
    files.write_atomic(sys.argv[1], b"half a sheet")
""")


@pytest.mark.parametrize("name, status", [("SIGTERM", 128 + 15), ("SIGINT", None),
                                          ("SIGHUP", 128 + 1)])  # SPEC: any exit it can catch
def test_temporary_file_removed_on_sigterm_and_sigint(tmp_path, name, status):
    target = tmp_path / "out.pdf"
    done = subprocess.run([sys.executable, "-c", _SIGNAL_SCRIPT, str(target), name],
                          capture_output=True, text=True, timeout=60, check=False)
    assert done.returncode != 0
    if status is not None:
        assert done.returncode == status, done.stderr
    assert list(tmp_path.iterdir()) == [], "a temporary or half-written file was left"
    assert getattr(signal, name)  # the signal exists on this system
