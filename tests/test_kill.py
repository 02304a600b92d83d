"""Kill a run at random moments: the workbook is always the original, whole, or the finished one.

``python -m batch run BOOK.xlsx`` is started on a workbook that takes a second
or two (most of it starting Python and its libraries), and killed with SIGKILL
(which no program can catch or clean up after, POSIX signal(7)) at seeded random
moments: half of them anywhere before the save, half while the temporary file is
being written or just after its rename. After every kill the workbook must open
in openpyxl and be byte-for-byte the original; only when the kill came after the
rename may it be the finished result workbook instead, with the same envelopes
as an uninterrupted run. A killed run may leave its temporary file behind, but
it never takes the workbook's place, the next run removes it (issue 13), and
neither it nor a partly written checkpoint store stops a later run or changes
its results.

Why this holds: results are written to a temporary file in the same folder and
swapped in with one rename, which POSIX rename(2) makes atomic (common practice
for safe saves; see batch/writing/package/save.py).
"""

from __future__ import annotations

import io
import os
import random
import signal
import subprocess
import sys
import time
from collections.abc import Callable
from pathlib import Path

import openpyxl
import pytest

from batch.validating import read_input
from batch.writing.package.save import TEMP_PREFIX

#: Kills that must land while the run is still going (issue 7: "at least 20 times").
KILLS = 20
#: Most attempts to get them (a kill that comes after the run has ended does not count).
MAX_ATTEMPTS = 40
#: Seed of the kill moments, so every test run kills at the same points.
SEED = 20240507
#: Kills during the save land in this multiple of the time the temporary file exists.
SAVE_SPAN = 1.5
#: Seconds between looks for the temporary file while waiting for the save to start.
POLL_S = 0.002
#: Longest a single run may take before the test gives up on it (a hang is a failure).
RUN_TIMEOUT_S = 60.0

pytestmark = [
    pytest.mark.slow,
    pytest.mark.skipif(not hasattr(os, "killpg"), reason="needs POSIX process groups"),
]


def _big_workbook(folder: Path, make: Callable[..., Path]) -> Path:
    """A KVHA inventory that takes a second or two to run: 8 members, three vehicles."""
    members = [
        {
            "Member": f"KV-{i:04d} G1",
            "Spans (ft)": "40, 55, 40" if i % 2 else "70",
            "Description": f"KVHA girder line {i}",
        }
        for i in range(8)
    ]
    vehicles = [
        {"Vehicle": "KV-T3", "Axle loads (kip)": "10, 30, 30", "Axle spacings (ft)": "14, 14-30"},
        {"Vehicle": "KV-HL", "Library": "HL-93"},
        {"Vehicle": "KV-3S2", "Library": "Type 3S2"},
    ]
    return make(folder, settings={"Stations per span": 10}, members=members, vehicles=vehicles)


def _start(book: Path, *more: str) -> subprocess.Popen[bytes]:
    # A session of its own, so the kill reaches any worker process the run starts too.
    return subprocess.Popen(
        [sys.executable, "-m", "batch", "run", str(book), "-q", *more],
        stdout=subprocess.DEVNULL,
        stderr=subprocess.PIPE,
        start_new_session=True,
    )


def _temp_files(folder: Path) -> set[Path]:
    return set(folder.glob(f"{TEMP_PREFIX}*"))


def _wait_for_new_temp(proc: subprocess.Popen[bytes], folder: Path, old: set[Path]) -> float:
    """Wait until the run opens a new temporary file (or ends); returns the time it did."""
    deadline = time.monotonic() + RUN_TIMEOUT_S
    while proc.poll() is None and not (_temp_files(folder) - old):
        assert time.monotonic() < deadline, "the run hung"
        time.sleep(POLL_S)
    return time.monotonic()


def _opens(data: bytes) -> list[str]:
    """The sheet names of a workbook's bytes (fails the test if openpyxl cannot load it)."""
    wb = openpyxl.load_workbook(io.BytesIO(data), read_only=True)
    try:
        return list(wb.sheetnames)
    finally:
        wb.close()


def _envelopes(data: bytes) -> list[tuple[object, ...]]:
    """The Envelopes sheet's rows (header first) of a result workbook's bytes."""
    wb = openpyxl.load_workbook(io.BytesIO(data), read_only=True)
    try:
        return [tuple(row) for row in wb["Envelopes"].iter_rows(values_only=True)]
    finally:
        wb.close()


def _reference_run(book: Path) -> tuple[float, float, list[tuple[object, ...]]]:
    """An uninterrupted run into another folder (so it leaves ``book``'s folder alone).

    Returns the seconds until the save starts (the temporary file appears), the
    seconds until the temporary file is renamed, and the Envelopes rows written.
    """
    folder = book.parent / "reference"
    folder.mkdir()
    out = folder / book.name
    start = time.monotonic()
    proc = _start(book, "--out", str(out))
    saved_at = _wait_for_new_temp(proc, folder, set())
    while _temp_files(folder) and proc.poll() is None:
        time.sleep(POLL_S)
    renamed_at = time.monotonic()
    _, err = proc.communicate(timeout=RUN_TIMEOUT_S)
    assert proc.returncode == 0, err.decode()
    return saved_at - start, renamed_at - saved_at, _envelopes(out.read_bytes())


def test_killed_runs_never_damage_the_workbook(tmp_path: Path, make_workbook) -> None:
    book = _big_workbook(tmp_path, make_workbook)
    original = book.read_bytes()
    original_sheets = _opens(original)
    until_save, save_time, reference = _reference_run(book)
    rng = random.Random(SEED)
    kills = finished = attempts = 0
    while kills < KILLS and attempts < MAX_ATTEMPTS:
        attempts += 1
        old = _temp_files(tmp_path)
        start = time.monotonic()
        proc = _start(book)
        if attempts % 2:  # before the save: starting, reading, computing, checkpointing
            time.sleep(rng.uniform(0.0, until_save))
        else:  # while the temporary file is being written, or just after its rename
            # The time to the save is measured afresh: the machine's pace varies with its load.
            until_save = _wait_for_new_temp(proc, tmp_path, old) - start
            time.sleep(rng.uniform(0.0, SAVE_SPAN * save_time))
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
        proc.communicate(timeout=RUN_TIMEOUT_S)
        # The run may have ended just before the kill; then it counts as finished, not killed.
        assert proc.returncode in (0, -signal.SIGKILL)
        kills += proc.returncode == -signal.SIGKILL
        data = book.read_bytes()
        sheets = _opens(data)
        if data == original:
            assert sheets == original_sheets
            continue
        # Only a run that got as far as the rename may have changed the workbook, and then
        # the workbook is the finished one: every input sheet, the same results, readable.
        finished += 1
        assert set(original_sheets) < set(sheets), f"attempt {attempts}"
        assert _envelopes(data) == reference
        assert read_input(book).ok
        book.write_bytes(original)
    assert kills >= KILLS, f"only {kills} of {attempts} kills landed while the run was going"
    leftovers = _temp_files(tmp_path)
    assert [p.name for p in tmp_path.glob("*.xls*")] == [book.name], "the workbook was not moved"
    # What the killed runs left behind (temporary files, a partly written checkpoint store)
    # neither stops the next run nor changes its results.
    proc = _start(book)
    _, err = proc.communicate(timeout=RUN_TIMEOUT_S)
    assert proc.returncode == 0, err.decode()
    assert _envelopes(book.read_bytes()) == reference
    assert not _temp_files(tmp_path), "the next run removes what killed runs left behind"
    print(
        f"kill test: save from {until_save:.2f} s, taking {save_time:.2f} s; {kills} kills in "
        f"{attempts} attempts; {finished} runs got to the rename first; {len(leftovers)} "
        "temporary files left"
    )
