"""Atomic save: a workbook reaches its file whole, or the file is left exactly as it was.

The workbook is written to a temporary file in the target's own folder (so the
final step is a rename within one file system), flushed and fsynced, given the
permissions of the file it replaces, and then swapped in with :func:`os.replace`,
which is atomic. On any failure, including Ctrl-C and a full disk, the temporary
file is removed and the target is untouched. When the target is the input
workbook itself, its bytes are checked once more just before the swap, so an
edit saved by someone else during the run is never overwritten; a read-only
target is never replaced.

A process killed during the save cannot remove its temporary file. Temporary
files are named ``.~spanfleet-HOST-PID-XXXX.tmp`` (:data:`TEMP_PREFIX`, a tag of
the machine, the process id), so the next save into the same folder removes
those whose process no longer runs on this machine
(:func:`remove_stale_temporaries`).
"""

from __future__ import annotations

import errno
import hashlib
import os
import re
import socket
import stat
import tempfile
import zipfile
from pathlib import Path
from typing import BinaryIO, Protocol

from batch.writing.package.source import OWNER_MARK

__all__ = [
    "TEMP_PREFIX",
    "SaveError",
    "atomic_save",
    "open_elsewhere",
    "written_by_spanfleet",
]

#: Temporary files start with this (hidden on Unix; unlike a spreadsheet program's lock files).
TEMP_PREFIX = ".~spanfleet-"
#: This machine's tag in temporary file names: a process id means something only here.
_HOST = hashlib.sha256(socket.gethostname().encode()).hexdigest()[:8]
_TEMP_NAME = re.compile(rf"{re.escape(TEMP_PREFIX)}([0-9a-f]{{8}})-(\d+)-[^/]*\.tmp")
#: Errors of a write that found no room: a full disk, a quota, a file-size limit.
_NO_ROOM = (errno.ENOSPC, errno.EDQUOT, errno.EFBIG)


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
    if exc.errno in _NO_ROOM:
        why = (
            f"there is no room to write it in {where} (the disk is full, or a quota or "
            "file-size limit is reached); free some space or write the results elsewhere "
            "with --out"
        )
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


def _running_here(pid: int) -> bool:
    """Whether process ``pid`` runs on this machine (POSIX: signal 0 checks, sends nothing)."""
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except OSError:  # it exists, but belongs to someone else
        return True
    return True


def _remove_stale_temporaries(folder: Path) -> None:
    """Remove the temporary files of spanfleet saves whose process no longer runs here.

    Only files named by :func:`atomic_save` on this machine are touched; a save
    still going on (its process alive) keeps its file. Does nothing where a
    process cannot be asked whether it runs (not POSIX).
    """
    if os.name != "posix":
        return
    try:
        names = [p for p in folder.iterdir() if p.name.startswith(TEMP_PREFIX)]
    except OSError:
        return
    for path in names:
        found = _TEMP_NAME.fullmatch(path.name)
        if found is None or found.group(1) != _HOST or _running_here(int(found.group(2))):
            continue
        path.unlink(missing_ok=True)


def written_by_spanfleet(path: Path) -> bool:
    """Whether the workbook at ``path`` holds result sheets spanfleet marked as its own.

    Looks for the hidden name :data:`~batch.writing.package.source.OWNER_MARK` in
    the workbook part; a file that is not a workbook is not spanfleet's.
    """
    mark = f'name="{OWNER_MARK}"'.encode()
    try:
        with zipfile.ZipFile(path) as archive:
            parts = [n for n in archive.namelist() if re.fullmatch(r"xl/workbook\d*\.xml", n)]
            return any(mark in archive.read(n) for n in parts)
    except (OSError, zipfile.BadZipFile, EOFError, ValueError, RuntimeError):
        return False


def atomic_save(book: Saveable, target: Path, expect_sha256: str | None = None) -> None:
    """Save ``book`` to ``target`` atomically (temporary file in the same folder, then rename).

    ``expect_sha256``: the digest ``target`` must still have just before the
    swap (used when writing back into the input workbook); if it differs the
    save is abandoned. Raises :class:`SaveError` with a message for the user;
    the target is unchanged on any error or interruption.
    """
    folder = target.parent
    try:
        _remove_stale_temporaries(folder)
    except OSError:
        pass  # tidying up is no reason to fail a save
    if target.exists() and not os.access(target, os.W_OK):
        raise SaveError(
            f"{target.name}: the workbook is read-only, so the results were not saved; make "
            f"it writable, or write the results to another workbook with --out. "
            f"{target.name} was not changed."
        )
    try:
        mode = stat.S_IMODE(target.stat().st_mode) if target.exists() else _new_file_mode()
        prefix = f"{TEMP_PREFIX}{_HOST}-{os.getpid()}-"
        fd, name = tempfile.mkstemp(prefix=prefix, suffix=".tmp", dir=folder)
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
