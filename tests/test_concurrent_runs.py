"""Runs that share a checkpoint store by accident: a clean run's results, or a refusal.

Real ``python -m batch run`` processes, started at seeded random moments against each
other so that their steps interleave differently in each round: two runs of one
workbook at once, a run superseded by another input written to the same ``--out``,
a run in place superseded when the engineer saves a correction and runs again, and
a store deleted under a run. In every round each run ends with exit 0 or 1 (never
3), a refusal says what happened, and every workbook written holds exactly the
results of a clean run (``--no-store``, run alone) of the input its Run Log names.

The law is the store's own promise (batch/running/store.py): every stored member
proves the run key it belongs to, the last run to open a store owns it, and a run
that finds its store reset, taken over or deleted stops.
"""

from __future__ import annotations

import hashlib
import io
import random
import shutil
import subprocess
import sys
import time
from dataclasses import dataclass
from pathlib import Path

import openpyxl
import pytest

from batch.command.cli import EXIT_OK, EXIT_PROBLEMS
from batch.demo.synthetic import synthetic_case
from batch.model import Settings
from batch.running.store import store_path_for
from batch.writing.template import write_case_workbook

pytestmark = pytest.mark.slow

#: Rounds of each race; each starts its runs at different seeded moments.
ROUNDS = 4
SEED = 20261205
#: The second run starts after the first within this fraction of the time one run takes
#: alone (measured afresh: the machine's pace varies with its load).
MAX_OFFSET = 1.0
RUN_TIMEOUT_S = 300
#: The sheets that hold results (the Run Log differs in its times).
RESULT_SHEETS = ("Envelopes", "Reactions", "Governing", "Vehicle Summary")
#: What a run that lost its store says.
LOST = (
    "took over this checkpoint store",
    "no longer in the checkpoint store",
    "was deleted or replaced while the run was going",
)


def _inventory(folder: Path, name: str, seed: int) -> Path:
    path = folder / name
    write_case_workbook(synthetic_case(80, 20, seed, Settings(stations_per_span=10)), path)
    return path


def _start(*argv: str) -> subprocess.Popen[bytes]:
    return subprocess.Popen(
        [sys.executable, "-m", "batch", "run", *argv, "-q", "--jobs", "1"],
        stdout=subprocess.DEVNULL,
        stderr=subprocess.PIPE,
    )


def _finish(proc: subprocess.Popen[bytes]) -> tuple[int, str]:
    _, err = proc.communicate(timeout=RUN_TIMEOUT_S)
    text = err.decode()
    assert proc.returncode in (EXIT_OK, EXIT_PROBLEMS), text
    assert "internal error" not in text and "Traceback" not in text, text
    if proc.returncode == EXIT_PROBLEMS:
        assert any(words in text for words in LOST) or "changed by another program" in text, text
    return proc.returncode, text


def _results(data: bytes) -> tuple[str, dict[str, list[tuple[object, ...]]]]:
    """The input digest the Run Log names, and every result sheet's rows."""
    wb = openpyxl.load_workbook(io.BytesIO(data), read_only=True)
    try:
        log = {row[0]: row[1] for row in wb["Run Log"].iter_rows(values_only=True)}
        sheets = {s: [tuple(r) for r in wb[s].iter_rows(values_only=True)] for s in RESULT_SHEETS}
    finally:
        wb.close()
    return str(log["Input SHA-256"]), sheets


@dataclass(frozen=True)
class Books:
    """Two KVHA inventories by input digest (bytes, a clean run's result sheets), and the
    seconds one run takes alone."""

    clean: dict[str, tuple[bytes, dict[str, list[tuple[object, ...]]]]]
    pace: float


@pytest.fixture(scope="module")
def books(tmp_path_factory: pytest.TempPathFactory) -> Books:
    folder = tmp_path_factory.mktemp("clean")
    clean: dict[str, tuple[bytes, dict[str, list[tuple[object, ...]]]]] = {}
    pace = 0.0
    for name, seed in (("alder.xlsx", 9), ("heron.xlsx", 10)):
        book = _inventory(folder, name, seed)
        out = folder / f"clean-{name}"
        start = time.monotonic()
        code, text = _finish(_start(str(book), "--out", str(out), "--no-store"))
        pace = max(pace, time.monotonic() - start)
        assert code == EXIT_OK, text
        digest = hashlib.sha256(book.read_bytes()).hexdigest()
        clean[digest] = (book.read_bytes(), _results(out.read_bytes())[1])
    return Books(clean=clean, pace=pace)


def _assert_clean(path: Path, books: Books) -> None:
    digest, sheets = _results(path.read_bytes())
    assert sheets == books.clean[digest][1], f"{path.name} differs from a clean run of its input"


def _copy(books: Books, k: int, path: Path) -> Path:
    path.write_bytes(list(books.clean.values())[k][0])
    return path


def test_two_runs_of_one_workbook_at_once(tmp_path: Path, books: Books) -> None:
    rng = random.Random(SEED)
    refused = 0
    for round_ in range(ROUNDS):
        folder = tmp_path / f"round{round_}"
        folder.mkdir()
        book, out = _copy(books, 0, folder / "alder.xlsx"), folder / "results.xlsx"
        first = _start(str(book), "--out", str(out))
        time.sleep(rng.uniform(0.0, MAX_OFFSET * books.pace))
        second = _start(str(book), "--out", str(out))
        codes = [_finish(first)[0], _finish(second)[0]]
        assert EXIT_OK in codes, "one of them finishes"
        refused += codes.count(EXIT_PROBLEMS)
        _assert_clean(out, books)
        # What they left in the store is this input's, and a third run resumes it exactly.
        code, text = _finish(_start(str(book), "--out", str(out)))
        assert code == EXIT_OK, text
        _assert_clean(out, books)
    print(f"two at once: {refused} of {2 * ROUNDS} runs stopped when the other took over")


def test_a_run_superseded_by_another_input_on_the_same_out(tmp_path: Path, books: Books) -> None:
    rng = random.Random(SEED + 1)
    for round_ in range(ROUNDS):
        folder = tmp_path / f"round{round_}"
        folder.mkdir()
        alder, heron = (
            _copy(books, 0, folder / "alder.xlsx"),
            _copy(books, 1, folder / "heron.xlsx"),
        )
        out = folder / "results.xlsx"
        first = _start(str(alder), "--out", str(out))
        time.sleep(rng.uniform(0.0, MAX_OFFSET * books.pace))
        second = _start(str(heron), "--out", str(out))
        codes = [_finish(first)[0], _finish(second)[0]]
        assert EXIT_OK in codes
        _assert_clean(out, books)


def test_a_run_in_place_superseded_by_a_corrected_workbook(tmp_path: Path, books: Books) -> None:
    # The engineer saves a correction (here: the other inventory) while the first run is
    # going, and runs again: the workbook ends with the corrected input's clean results.
    rng = random.Random(SEED + 2)
    heron_digest = list(books.clean)[1]
    for round_ in range(ROUNDS):
        folder = tmp_path / f"round{round_}"
        folder.mkdir()
        book = _copy(books, 0, folder / "bridge.xlsx")
        first = _start(str(book))
        time.sleep(rng.uniform(0.0, MAX_OFFSET * books.pace))
        _copy(books, 1, folder / "saved.xlsx").replace(book)  # a spreadsheet program's save
        second = _start(str(book))
        _finish(first)
        code, text = _finish(second)
        assert code == EXIT_OK, text
        assert _results(book.read_bytes())[0] == heron_digest
        _assert_clean(book, books)


def test_a_store_deleted_under_a_run_stops_it(tmp_path: Path, books: Books) -> None:
    rng = random.Random(SEED + 3)
    stopped = 0
    for round_ in range(ROUNDS):
        folder = tmp_path / f"round{round_}"
        folder.mkdir()
        book, out = _copy(books, 0, folder / "alder.xlsx"), folder / "results.xlsx"
        store = store_path_for(out)
        proc = _start(str(book), "--out", str(out))
        while not store.exists() and proc.poll() is None:
            time.sleep(0.01)
        time.sleep(rng.uniform(0.0, 0.5 * books.pace))
        if store.exists():
            shutil.move(store, folder / "moved-away.sqlite")
        code, _ = _finish(proc)
        if code == EXIT_PROBLEMS:
            stopped += 1
            assert not out.exists()
        else:
            _assert_clean(out, books)
    assert stopped, "at least one run had its store taken away while it was going"
