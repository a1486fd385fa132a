"""The one way cellchem writes a file: atomically, beside the output.

Every output (a filled or annotated copy, a findings report) is written to a
temporary file in the output's own folder and moved into place only when it
is complete (and verified, where the caller verifies). On Linux the
temporary file is anonymous (``O_TMPFILE``): it has no name until it is
complete, so a process killed mid-write (kill -9, power loss) leaves nothing
behind. Elsewhere it is a hidden ``.cellchem-*`` file, removed on every
failure path the process survives. The output gets the permissions the
user's umask gives a new file (or those of the file it replaces), never a
temporary file's owner-only 0600.

A write that fails for the output's sake (a read-only folder, a full disk, a
folder that is a file) is an ``OutputError`` naming the output: the input is
never blamed.
"""

from __future__ import annotations

import errno
import os
import stat
import tempfile
from collections.abc import Callable
from pathlib import Path
from typing import BinaryIO

from ...errors import OutputError

_REASONS = {
    errno.ENOSPC: "the disk is full",
    errno.EDQUOT: "the disk quota is used up",
    errno.EFBIG: "the file would be larger than this system allows",
    errno.EROFS: "the folder is on a read-only disk",
    errno.EACCES: "permission denied",
    errno.EPERM: "permission denied",
    errno.ENOTDIR: "a part of the folder path is a file, not a folder",
    errno.ENOENT: "the folder does not exist",
    errno.EISDIR: "the output path is a folder",
}


def _umask() -> int:
    """The process's file-creation mask, read without changing it where the
    system shows it (Linux), else set and restored at once."""
    try:
        with open("/proc/self/status", encoding="ascii", errors="replace") as fh:
            for line in fh:
                if line.startswith("Umask:"):
                    return int(line.split()[1], 8)
    except (OSError, ValueError, IndexError):
        pass
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def new_file_mode(path: str | Path) -> int:
    """The permissions an output file gets: those of the file it replaces, or
    for a new file what the user's umask gives a file any program creates
    (0o666 less the mask)."""
    try:
        return stat.S_IMODE(os.stat(path).st_mode)
    except OSError:
        return 0o666 & ~_umask()


def output_error(path: str | Path, exc: OSError) -> OutputError:
    """An OSError met while writing ``path`` as a one-line OutputError."""
    reason = _REASONS.get(exc.errno or 0) or (exc.strerror or str(exc)).lower()
    return OutputError(f"could not write the output '{path}': {reason}; nothing was written there")


def _anonymous(folder: Path) -> int | None:
    """A nameless file in ``folder`` (Linux O_TMPFILE), or None where the
    system or the file system has none."""
    flag = getattr(os, "O_TMPFILE", 0)
    if not flag or _LINK is None or not os.path.isdir("/proc/self/fd"):
        return None
    try:
        return os.open(folder, flag | os.O_RDWR, 0o600)
    except OSError as exc:
        if exc.errno in (errno.EOPNOTSUPP, errno.EISDIR, errno.EINVAL, errno.ENOENT):
            return None  # no O_TMPFILE here: a named temporary file instead
        raise


def _linkat():
    """libc's linkat, which can give an anonymous file a name by following
    /proc/self/fd (os.link does not follow that link before Python 3.12 on
    Linux); None where it cannot be had."""
    try:
        import ctypes

        libc = ctypes.CDLL(None, use_errno=True)
        fn = libc.linkat
    except (OSError, AttributeError):
        return None
    fn.argtypes = (ctypes.c_int, ctypes.c_char_p, ctypes.c_int, ctypes.c_char_p, ctypes.c_int)
    fn.restype = ctypes.c_int

    def link(source: str, target: Path) -> None:
        # AT_FDCWD (-100) for both paths, AT_SYMLINK_FOLLOW (0x400)
        if fn(-100, os.fsencode(source), -100, os.fsencode(target), 0x400) != 0:
            err = ctypes.get_errno()
            raise OSError(err, os.strerror(err), str(target))

    return link


def _publish(fd: int, folder: Path, path: Path) -> None:
    """Give the anonymous file ``fd`` the name ``path`` (replacing any file
    there) in two steps that each leave a complete file."""
    for _attempt in range(100):
        name = folder / f".cellchem-{os.urandom(6).hex()}{path.suffix}"
        try:
            _LINK(f"/proc/self/fd/{fd}", name)
        except FileExistsError:
            continue
        try:
            os.replace(name, path)
        except BaseException:
            name.unlink(missing_ok=True)
            raise
        return
    raise OSError(errno.EEXIST, "no free temporary name")


_LINK = _linkat()


def write_atomically(path: str | Path, write: Callable[[BinaryIO], None]) -> None:
    """Write ``path`` with ``write(fh)``, all or nothing.

    ``fh`` is a seekable binary file opened for reading and writing in the
    output's folder; ``write`` may seek back and read it to verify what it
    wrote. When ``write`` returns, the file is flushed, given its permissions
    and moved into place. If ``write`` raises, the output is left as it was,
    nothing is left beside it and the exception propagates (an OSError of
    the output's file system as an OutputError).
    """
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    try:
        if path.is_dir():
            raise OSError(errno.EISDIR, "is a folder")
        mode = new_file_mode(path)
        fd = _anonymous(folder)
    except OSError as exc:
        raise output_error(path, exc) from None
    if fd is not None:
        try:
            with os.fdopen(fd, "w+b") as fh:
                write(fh)
                fh.flush()
                os.fchmod(fh.fileno(), mode)
                _publish(fh.fileno(), folder, path)
        except OSError as exc:
            raise output_error(path, exc) from None
        return
    try:
        handle, name = tempfile.mkstemp(prefix=".cellchem-", suffix=path.suffix, dir=folder)
    except OSError as exc:
        raise output_error(path, exc) from None
    tmp = Path(name)
    try:
        with os.fdopen(handle, "w+b") as fh:
            write(fh)
            fh.flush()
        try:
            os.chmod(tmp, mode)
        except OSError:  # a file system without Unix permissions: its own rules apply
            pass
        os.replace(tmp, path)
    except OSError as exc:
        tmp.unlink(missing_ok=True)
        raise output_error(path, exc) from None
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise


def write_text_atomically(path: str | Path, text: str, encoding: str = "utf-8", newline: str = "") -> None:
    """``write_atomically`` for a text: ``newline`` as ``open`` takes it."""
    data = text.encode(encoding) if not newline else text.replace("\n", newline).encode(encoding)
    write_atomically(path, lambda fh: fh.write(data))
