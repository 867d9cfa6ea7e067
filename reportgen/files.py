"""Writing output files safely: a temporary name in the same folder, then a rename."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from reportgen.errors import InputError


def refuse_existing(path: Path, force: bool) -> None:
    """InputError when `path` exists and `force` is not set: nothing is silently overwritten."""
    if path.exists() and not force:
        raise InputError(f"{path}: already exists; choose another name or add --force to "
                         f"replace it")


def write_atomic(path: str | Path, data: bytes, force: bool = False) -> None:
    """Write `data` to `path` so that a failure never leaves a half-written file.

    The bytes go to a temporary file in the target folder, are flushed to disk, and the file is
    renamed over `path` (os.replace is atomic on POSIX within one file system).
    """
    path = Path(path)
    refuse_existing(path, force)
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"{path}: the folder {folder} does not exist")
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=folder)
    try:
        with os.fdopen(fd, "wb") as out:
            out.write(data)
            out.flush()
            os.fsync(out.fileno())
        os.chmod(tmp, 0o644)
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
