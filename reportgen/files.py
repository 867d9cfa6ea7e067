"""Reading input files with limits and clear errors; writing output files safely.

Reading (``read_input``): only regular files (a FIFO, a device such as /dev/zero, a socket or
a folder is refused without blocking on it), at most ``MAX_INPUT_BYTES`` (a file that grows
while it is read is refused too). Every file read is remembered for the running command
(``command_scope``), so that no output of the command can replace one of its own inputs.

Writing (``write_atomic``): the bytes go to a temporary file in the target folder, are flushed
to disk and then take the target's name. Without ``force`` that last step is a hard link,
which the kernel refuses when the name exists (POSIX link(2), EEXIST): a file that appears
while the work runs is never replaced. The temporary file is removed on every exit that can
be caught: an error, Ctrl-C (SIGINT), SIGTERM and SIGHUP. Every failure names the path
(InputError).
"""

from __future__ import annotations

import contextlib
import errno
import os
import signal
import stat
import tempfile
import threading
from collections.abc import Iterator
from pathlib import Path

from reportgen.errors import InputError

MAX_INPUT_BYTES = 64 * 1024 * 1024  # 64 MiB: far above any vessel file, sheet or certificate
_READ_CHUNK = 1024 * 1024

# For each open ``command_scope`` (innermost last), (st_dev, st_ino, st_ctime_ns) of every file
# read by read_input in it: the change time tells the file that was read from a later file
# that happens to reuse its inode number.
_SCOPES: list[set[tuple[int, int, int]]] = []

_KINDS = (
    (stat.S_ISDIR, "it is a folder, not a file"),
    (stat.S_ISFIFO, "it is a FIFO (named pipe), not a regular file"),
    (stat.S_ISCHR, "it is a character device, not a regular file"),
    (stat.S_ISBLK, "it is a block device, not a regular file"),
    (stat.S_ISSOCK, "it is a socket, not a regular file"),
)


def _not_regular(mode: int) -> str | None:
    for test, reason in _KINDS:
        if test(mode):
            return reason
    return None if stat.S_ISREG(mode) else "it is not a regular file"


def not_a_file(path: str | Path) -> str | None:
    """Why ``path`` cannot be read as an input file ("not found", "it is a folder, not a
    file", ...), without opening it; None for a regular file."""
    try:
        return _not_regular(os.stat(path).st_mode)
    except FileNotFoundError:
        return "not found"
    except OSError as exc:
        return exc.strerror or str(exc)


def read_input(path: str | Path, what: str, max_bytes: int = MAX_INPUT_BYTES) -> bytes:
    """The bytes of a regular input file of at most ``max_bytes``.

    InputError naming the file and what it was meant to be when it is missing, unreadable,
    not a regular file, too large, or named by bytes that are not UTF-8 text. The file is opened without blocking (O_NONBLOCK), so a
    FIFO with no writer is refused at once instead of hanging.
    """
    path = Path(path)
    try:  # the name goes into documents and results (UTF-8 text): a name of other bytes
        path.name.encode("utf-8")  # would fail there, far from its cause
    except UnicodeEncodeError:
        shown = os.fsencode(path).decode("utf-8", "backslashreplace")
        raise InputError(f"{shown}: the name of the {what} is not UTF-8 text; rename the "
                         f"file") from None
    try:
        fd = os.open(path, os.O_RDONLY | os.O_NONBLOCK | getattr(os, "O_CLOEXEC", 0))
    except FileNotFoundError:
        raise InputError(f"{path}: cannot read the {what}: not found") from None
    except IsADirectoryError:
        raise InputError(f"{path}: cannot read the {what}: it is a folder, not a file") from None
    except OSError as exc:
        raise InputError(f"{path}: cannot read the {what}: {exc.strerror or exc}") from None
    try:
        info = os.fstat(fd)
        reason = _not_regular(info.st_mode)
        if reason is not None:
            raise InputError(f"{path}: cannot read the {what}: {reason}")
        if info.st_size > max_bytes:
            raise InputError(f"{path}: cannot read the {what}: {info.st_size} bytes is more "
                             f"than the limit of {max_bytes} bytes")
        chunks: list[bytes] = []
        size = 0
        while True:
            chunk = os.read(fd, _READ_CHUNK)
            if not chunk:
                break
            size += len(chunk)
            if size > max_bytes:
                raise InputError(f"{path}: cannot read the {what}: it grew beyond the limit "
                                 f"of {max_bytes} bytes while being read")
            chunks.append(chunk)
        if _SCOPES:
            _SCOPES[-1].add(_identity(info))
        return b"".join(chunks)
    except OSError as exc:
        raise InputError(f"{path}: cannot read the {what}: {exc.strerror or exc}") from None
    finally:
        os.close(fd)


@contextlib.contextmanager
def command_scope() -> Iterator[None]:
    """Within this scope (one command; scopes nest), every file read by ``read_input`` is an
    input that no output may replace. The command line opens one per command; the library
    functions that write (sign, approve, extract) open their own."""
    _SCOPES.append(set())
    try:
        yield
    finally:
        _SCOPES.pop()


def is_input(path: str | Path) -> bool:
    """True when ``path`` names a file that this process has read as an input."""
    try:
        info = os.stat(path)
    except OSError:
        return False
    return any(_identity(info) in scope for scope in _SCOPES)


def _identity(info: os.stat_result) -> tuple[int, int, int]:
    return info.st_dev, info.st_ino, info.st_ctime_ns


def check_output(path: str | Path, force: bool, make_folders: bool = False) -> None:
    """InputError when ``path`` cannot be written: it is one of this command's inputs, it is a
    folder, it exists and ``force`` is not set (nothing is silently overwritten), or its folder
    does not exist (with ``make_folders``: cannot be made, because a file stands where a
    folder is needed). Checked again at the moment of writing (``write_atomic``)."""
    path = Path(path)
    if make_folders:
        _folders_can_be_made(_folder(path))
    if is_input(path):
        raise InputError(f"{path}: is one of the input files of this command; an output never "
                         f"replaces an input (choose another name)")
    if path.is_dir():
        raise InputError(f"{path}: is a folder; give the name of the file to write")
    if (path.exists() or path.is_symlink()) and not force:
        raise InputError(f"{path}: already exists; choose another name or add --force to "
                         f"replace it")
    kind = not_a_file(path) if path.exists() else None
    if kind is not None:  # /dev/stdout, a FIFO, a device: --force replaces files only
        raise InputError(f"{path}: {kind.removeprefix('it ')}; reportgen replaces only a "
                         f"regular file (give the name of a file to write)")
    folder = _folder(path)
    if not make_folders and not folder.is_dir():
        raise InputError(f"{path}: the folder {folder} does not exist")


def _folders_can_be_made(folder: Path) -> None:
    """InputError when some part of ``folder`` exists and is not a folder (make_folder would
    fail there); a command that writes several files checks them all before the first."""
    for part in (folder, *folder.parents):
        if part.exists():
            if not part.is_dir():
                raise InputError(f"{part}: exists and is not a folder")
            return


def _folder(path: Path) -> Path:
    return path.parent if str(path.parent) else Path(".")


def _umask() -> int:
    current = os.umask(0)
    os.umask(current)
    return current


class Terminated(SystemExit):
    """SIGTERM (or SIGHUP: the terminal closed) arrived while a temporary file existed; exit
    status 128 + the signal's number, as a shell reports a process the signal ended."""

    def __init__(self, signum: int = signal.SIGTERM) -> None:
        super().__init__(128 + signum)


def _raise_terminated(signum: int, _frame: object) -> None:
    raise Terminated(signum)


# The signals that end the program by default and can be caught: SIGTERM (kill, timeout) and
# SIGHUP (the terminal window closed, an ssh session dropped). Ctrl-C is KeyboardInterrupt.
_CAUGHT = tuple(getattr(signal, name) for name in ("SIGTERM", "SIGHUP") if hasattr(signal, name))


@contextlib.contextmanager
def _cleanup_on_signals() -> Iterator[None]:
    """While active (main thread only), SIGTERM and SIGHUP raise ``Terminated`` so that
    ``finally`` and ``except BaseException`` blocks run, as they do for Ctrl-C
    (KeyboardInterrupt). A signal somebody else handles is left to them."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    before = {}
    for signum in _CAUGHT:
        handler = signal.getsignal(signum)
        if handler in (signal.SIG_DFL, None):
            before[signum] = handler
            signal.signal(signum, _raise_terminated)
    try:
        yield
    finally:
        for signum, handler in before.items():
            signal.signal(signum, handler if handler is not None else signal.SIG_DFL)


def _write_error(path: Path, exc: OSError) -> InputError:
    reason = exc.strerror or str(exc)
    if exc.errno in (errno.EACCES, errno.EPERM, errno.EROFS):
        reason = f"no permission to write there ({reason})"
    return InputError(f"{path}: cannot write the file: {reason}")


def _place_no_replace(tmp: str, path: Path) -> None:
    """Give the temporary file the name ``path`` unless that name exists at this moment.

    link(2) fails with EEXIST when the name exists, atomically; where the file system has no
    hard links, a check just before os.replace is the fallback (a short window remains).
    """
    try:
        os.link(tmp, path, follow_symlinks=False)
    except FileExistsError:
        raise InputError(f"{path}: appeared while this command ran; nothing was replaced "
                         f"(add --force to replace it)") from None
    except OSError as exc:
        if exc.errno not in (errno.EPERM, errno.ENOTSUP, errno.EOPNOTSUPP, errno.EXDEV,
                             errno.EMLINK):
            raise
        if path.exists() or path.is_symlink():
            raise InputError(f"{path}: appeared while this command ran; nothing was "
                             f"replaced (add --force to replace it)") from None
        os.replace(tmp, path)
        return
    os.unlink(tmp)


def write_atomic(path: str | Path, data: bytes, force: bool = False,
                 mode: int | None = None) -> None:
    """Write ``data`` to ``path`` so that a failure never leaves a half-written file.

    ``force``: replace an existing file (never one of this command's inputs, never a folder).
    ``mode``: the permission bits (default: those of an ordinary new file, 0o666 less the
    umask; 0o600 for a private key). InputError, naming the path, for every failure.
    """
    path = Path(path)
    check_output(path, force)
    with _cleanup_on_signals():
        try:
            fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part",
                                       dir=_folder(path))
        except OSError as exc:
            raise _write_error(path, exc) from None
        try:
            with os.fdopen(fd, "wb") as out:
                out.write(data)
                out.flush()
                os.fsync(out.fileno())
            os.chmod(tmp, mode if mode is not None else 0o666 & ~_umask())
            if is_input(path):  # the check of check_output, again at the last moment
                raise InputError(f"{path}: is one of the input files of this command; an "
                                 f"output never replaces an input")
            if force:
                if path.is_dir():
                    raise InputError(f"{path}: is a folder; give the name of the file to write")
                os.replace(tmp, path)
            else:
                _place_no_replace(tmp, path)
        except OSError as exc:
            Path(tmp).unlink(missing_ok=True)
            raise _write_error(path, exc) from None
        except BaseException:
            Path(tmp).unlink(missing_ok=True)
            raise


def make_folder(path: str | Path) -> Path:
    """Create the folder ``path`` (and its parents) if missing; InputError naming it when that
    fails or when ``path`` is a file."""
    path = Path(path)
    if path.exists() and not path.is_dir():
        raise InputError(f"{path}: exists and is not a folder")
    try:
        path.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise InputError(f"{path}: cannot create the folder: {exc.strerror or exc}") from None
    return path
