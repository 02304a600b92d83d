"""Atomic save: a workbook reaches its file whole, or the file is left exactly as it was.

The workbook is written to a temporary file in the target's own folder (so the
final step is a rename within one file system), flushed and fsynced, given the
permissions of the file it replaces, and then swapped in with :func:`os.replace`,
which is atomic. On any failure, including Ctrl-C, the temporary file is removed
and the target is untouched. When the target is the input workbook itself, its
bytes are checked once more just before the swap, so an edit saved by someone
else during the run is never overwritten.
"""

from __future__ import annotations

import errno
import hashlib
import os
import stat
import tempfile
from pathlib import Path
from typing import BinaryIO, Protocol

__all__ = [
    "TEMP_PREFIX",
    "SaveError",
    "atomic_save",
    "open_elsewhere",
]

#: Temporary files start with this (hidden on Unix; unlike a spreadsheet program's lock files).
TEMP_PREFIX = ".~spanfleet-"


class Saveable(Protocol):
    """Anything with an openpyxl-style ``save(file)`` method."""

    def save(self, filename: BinaryIO) -> None:
        """Write the whole workbook to ``filename``."""


class SaveError(Exception):
    """The results could not be saved; the message says why and what to do.

    The target file is unchanged whenever this is raised.
    """


def sha256_file(path: Path) -> str:
    """SHA-256 (hex) of a file's bytes."""
    digest = hashlib.sha256()
    with path.open("rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            digest.update(chunk)
    return digest.hexdigest()


def _sha256_or_none(path: Path) -> str | None:
    try:
        return sha256_file(path)
    except OSError:
        return None


def open_elsewhere(path: Path) -> Path | None:
    """The lock file of a spreadsheet program that has ``path`` open, if one is found.

    Looks for LibreOffice's ``.~lock.NAME#`` and Excel's ``~$NAME`` owner files
    beside the workbook. A lock file can outlive a crashed program; the caller's
    message says to delete it then.
    """
    name = path.name
    candidates = [f".~lock.{name}#", f"~${name}"]
    if len(name) > 2:
        candidates.append(f"~${name[2:]}")
    for candidate in candidates:
        lock = path.with_name(candidate)
        if lock.exists():
            return lock
    return None


def _new_file_mode() -> int:
    umask = os.umask(0)
    os.umask(umask)
    return 0o666 & ~umask


def _explain(exc: OSError, target: Path) -> str:
    where = target.parent
    if exc.errno == errno.ENOSPC:
        why = f"the disk holding {where} is full; free some space"
    elif exc.errno in (errno.EACCES, errno.EPERM):
        why = (
            f"permission denied; check that you may write to {where} and that no other "
            "program (e.g. a spreadsheet program) has the file open"
        )
    elif exc.errno == errno.EROFS:
        why = f"{where} is on a read-only file system; write the results elsewhere with --out"
    elif exc.errno == errno.ENOENT:
        why = f"the folder {where} does not exist; create it or choose another --out"
    else:
        why = f"{exc.strerror or exc}; check the folder and try again"
    outcome = f"{target.name} was not changed" if target.exists() else "nothing was written"
    return f"{target.name}: could not save the results: {why}; {outcome}."


def _fsync_folder(folder: Path) -> None:
    """Make the rename itself durable (POSIX); best effort elsewhere."""
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def atomic_save(book: Saveable, target: Path, expect_sha256: str | None = None) -> None:
    """Save ``book`` to ``target`` atomically (temporary file in the same folder, then rename).

    ``expect_sha256``: the digest ``target`` must still have just before the
    swap (used when writing back into the input workbook); if it differs the
    save is abandoned. Raises :class:`SaveError` with a message for the user;
    the target is unchanged on any error or interruption.
    """
    folder = target.parent
    try:
        mode = stat.S_IMODE(target.stat().st_mode) if target.exists() else _new_file_mode()
        fd, name = tempfile.mkstemp(prefix=TEMP_PREFIX, suffix=".tmp", dir=folder)
    except OSError as exc:
        raise SaveError(_explain(exc, target)) from exc
    temp = Path(name)
    try:
        with os.fdopen(fd, "wb") as fh:
            book.save(fh)
            fh.flush()
            os.fsync(fh.fileno())
        os.chmod(temp, mode)
        if expect_sha256 is not None and _sha256_or_none(target) != expect_sha256:
            raise SaveError(
                f"{target.name}: the workbook was changed by another program while spanfleet "
                f"was running, so the results were not saved (that would overwrite the change). "
                f"{target.name} was not changed; run again."
            )
        os.replace(temp, target)
    except OSError as exc:
        temp.unlink(missing_ok=True)
        raise SaveError(_explain(exc, target)) from exc
    except BaseException:
        temp.unlink(missing_ok=True)
        raise
    _fsync_folder(folder)
