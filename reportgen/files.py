"""Reading input files with clear errors; writing output files safely (a temporary name in
the same folder, then a rename)."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from reportgen.errors import InputError


def check_output(path: Path, force: bool, inputs: list[Path] | tuple = ()) -> None:
    """InputError when `path` cannot be written: it is one of the command's `inputs`, it
    exists and `force` is not set (nothing is silently overwritten), or its folder does not
    exist."""
    path = Path(path)
    for source in inputs:
        if path.exists() and Path(source).exists() and path.resolve() == Path(source).resolve():
            raise InputError(f"{path}: the output would replace an input file; choose another "
                             f"name")
    if path.exists() and not force:
        raise InputError(f"{path}: already exists; choose another name or add --force to "
                         f"replace it")
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"{path}: the folder {folder} does not exist")


def read_input(path: str | Path, what: str) -> bytes:
    """The bytes of an input file; InputError naming the file and what it was meant to be."""
    path = Path(path)
    try:
        return path.read_bytes()
    except FileNotFoundError:
        reason = "not found"
    except IsADirectoryError:
        reason = "it is a folder, not a file"
    except OSError as exc:
        reason = exc.strerror or str(exc)
    raise InputError(f"{path}: cannot read the {what}: {reason}")


def _umask() -> int:
    current = os.umask(0)
    os.umask(current)
    return current


def write_atomic(path: str | Path, data: bytes, force: bool = False,
                 mode: int | None = None) -> None:
    """Write `data` to `path` so that a failure never leaves a half-written file.

    The bytes go to a temporary file in the target folder, are flushed to disk, and the file is
    renamed over `path` (os.replace is atomic on POSIX within one file system). `mode`: the
    permission bits (default: those of an ordinary new file, 0o666 less the umask; 0o600 for
    a private key).
    """
    path = Path(path)
    check_output(path, force)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part",
                               dir=path.parent if str(path.parent) else ".")
    try:
        with os.fdopen(fd, "wb") as out:
            out.write(data)
            out.flush()
            os.fsync(out.fileno())
        os.chmod(tmp, mode if mode is not None else 0o666 & ~_umask())
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
