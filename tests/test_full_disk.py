"""A full disk while the results are written: a message, never exit 3, nothing damaged.

The disk is simulated inside the test by a file-size limit on the command's own
process (RLIMIT_FSIZE, POSIX setrlimit(2)): a write that would take a file past
it fails with EFBIG, as a write to a full disk fails with ENOSPC. SIGXFSZ, which
the kernel sends first, is ignored so that the write returns the error (POSIX
signal(7): the default action ends the process). The limit is per file, so it
catches whichever file outgrows it first: the checkpoint store or the workbook.
"""

from __future__ import annotations

import resource
import signal
import subprocess
import sys
from collections.abc import Callable
from pathlib import Path

import pytest

from batch.command.cli import EXIT_OK, EXIT_PROBLEMS
from batch.running.store import store_path_for
from batch.writing.package.save import TEMP_PREFIX

pytestmark = pytest.mark.skipif(not hasattr(resource, "RLIMIT_FSIZE"), reason="needs POSIX")

#: Bytes a file may grow to: less than the result workbook of the test inventory (about
#: 50 KB), more than its input (6 KB) and than SQLite's 32 KB shared-memory index of a
#: store, so that a store resumed in full writes nothing past it.
WORKBOOK_ROOM = 40_000
#: Bytes the checkpoint store may grow to: less than its first pages and journal.
STORE_ROOM = 8_000


def _limited(size: int) -> Callable[[], None]:
    def limit() -> None:
        signal.signal(signal.SIGXFSZ, signal.SIG_IGN)
        resource.setrlimit(resource.RLIMIT_FSIZE, (size, size))

    return limit


def _spanfleet(argv: list[str], room: int | None = None) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "batch", *argv],
        capture_output=True,
        text=True,
        check=False,
        timeout=120,
        preexec_fn=None if room is None else _limited(room),
    )


@pytest.fixture
def book(tmp_path: Path, make_workbook: Callable[..., Path]) -> Path:
    members = [
        {"Member": f"KV-{k:04d} G1", "Spans (ft)": "40, 55, 40" if k % 2 else "70"}
        for k in range(6)
    ]
    vehicles = [
        {"Vehicle": "KV-T3", "Axle loads (kip)": "10, 30, 30", "Axle spacings (ft)": "14, 14-30"},
        {"Vehicle": "KV-HL", "Library": "HL-93"},
    ]
    return make_workbook(
        tmp_path, settings={"Stations per span": 10}, members=members, vehicles=vehicles
    )


def _assert_refused(result: subprocess.CompletedProcess[str], book: Path, before: bytes) -> str:
    text = result.stdout + result.stderr
    assert result.returncode == EXIT_PROBLEMS, text
    assert "Traceback" not in text and "internal error" not in text, text
    assert "no room to write" in text and "free some space" in text, text
    assert book.read_bytes() == before
    assert not list(book.parent.glob(f"{TEMP_PREFIX}*")), "no temporary file is left"
    return text


@pytest.mark.parametrize("where", ["in place", "--out"])
def test_a_full_disk_while_a_result_sheet_is_written_without_a_store(
    book: Path, where: str
) -> None:
    before = book.read_bytes()
    out = book.with_name("results.xlsx")
    argv = ["run", str(book), "--no-store", "-q"] + (
        ["--out", str(out)] if where == "--out" else []
    )
    text = _assert_refused(_spanfleet(argv, WORKBOOK_ROOM), book, before)
    assert text.startswith(
        f"{(out if where == '--out' else book).name}: could not save the results"
    )
    assert not out.exists()


def test_a_full_disk_while_a_result_sheet_is_written_with_a_store(book: Path) -> None:
    # A first run fills the store; the second resumes every member from it and meets the
    # full disk while writing the workbook, which then holds more than the limit.
    out = book.with_name("results.xlsx")
    assert _spanfleet(["run", str(book), "--out", str(out), "-q"]).returncode == EXIT_OK
    out.unlink()
    before = book.read_bytes()
    argv = ["run", str(book), "--out", str(out), "-q"]
    text = _assert_refused(_spanfleet(argv, WORKBOOK_ROOM), book, before)
    assert text.startswith("results.xlsx: could not save the results")
    assert not out.exists()
    assert _spanfleet(argv).returncode == EXIT_OK, "with room again, the same command succeeds"


def test_a_full_disk_while_the_store_is_written(book: Path) -> None:
    before = book.read_bytes()
    out = book.with_name("results.xlsx")
    argv = ["run", str(book), "--out", str(out), "-q"]
    text = _assert_refused(_spanfleet(argv, STORE_ROOM), book, before)
    assert text.startswith(f"{store_path_for(out).name}: ")
    assert "--no-store" in text
    assert not out.exists()
