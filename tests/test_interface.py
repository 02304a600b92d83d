"""The Python interface, called the way a notebook calls it, against the command's workbook.

The command (``spanfleet run``) is the reference: the interface must give the same
numbers as the sheets it writes (read back by pandas, an independent reader) and
write the same workbook. The KVHA sample inventory is rated and screened, so every
result table is compared. Units come from the workbook contract (docs/workbook.md:
US kip, ft, kip-ft; SI kN, m, kN-m).
"""

from __future__ import annotations

import contextlib
import io
import json
import shutil
import zipfile
from pathlib import Path

import pandas as pd
import pytest
from openpyxl import load_workbook

from batch.command.cli import EXIT_OK, main
from batch.demo.kvha import KVHA_SI_DEMO

SAMPLES = Path(__file__).resolve().parent.parent / "sample_workbooks"
SAMPLE = SAMPLES / "kvha-inventory.xlsx"
#: Run Log rows that differ between two runs of the same input: when and how long.
TIMED_ITEMS = {"Started (UTC)", "Run time (s)"}


def _command(*argv: str) -> None:
    out = io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(out):
        assert main(list(argv)) == EXIT_OK, out.getvalue()


@pytest.fixture(scope="module")
def command_book(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("command")
    book = folder / "kvha-inventory.xlsx"
    shutil.copyfile(SAMPLE, book)
    out = folder / "kvha-results.xlsx"
    # the interface keeps no store unless asked, so the command keeps none either
    _command("run", str(book), "--out", str(out), "--jobs", "1", "--no-store")
    return out


@pytest.fixture(scope="module")
def results():
    # what a notebook does (the README's example)
    from batch.interface import read, run

    return run(read(SAMPLE), jobs=1)


def test_three_lines_give_dataframes_with_units(results) -> None:
    frame = results.envelopes
    assert isinstance(frame, pd.DataFrame)
    assert list(frame.columns[:4]) == ["Member", "Span", "Station", "x (ft)"]
    assert frame.attrs["units"]["M max (kip-ft)"] == "kip-ft"
    assert frame.attrs["units"]["x (ft)"] == "ft"
    assert "sagging" in frame.attrs["meaning"]["M max (kip-ft)"]
    assert dict(results.units)["moment"] == "kip-ft"
    assert len(results.governing) == len(results.case.members)
    assert {"R max (kip)", "R min (kip)"} <= set(results.reactions.columns)


def test_every_frame_equals_the_commands_sheet(results, command_book: Path) -> None:
    frames = results.frames()
    assert set(frames) >= {"Envelopes", "Reactions", "Governing", "Ratings", "Screening"}
    for sheet, frame in frames.items():
        on_sheet = pd.read_excel(command_book, sheet_name=sheet)
        pd.testing.assert_frame_equal(frame, on_sheet, check_dtype=False, obj=sheet)
        # numbers bit for bit; a number column is a number column (pandas reads a column of
        # whole floats such as station 0.0 as integers, the frame keeps the declared float)
        for col in frame.columns:
            numeric = frame[col].dtype.kind in "fi"
            assert numeric == (on_sheet[col].dtype.kind in "fi") or on_sheet[col].isna().all()


def test_postings_are_the_legal_loads_rows_with_a_posting_load(results) -> None:
    postings = results.postings
    assert len(postings) > 0  # the sample has legal loads below 1 (common practice check)
    assert (postings["Category"] == "legal").all()
    assert (postings["RF"] < 1).all()


def _cells(path: Path) -> dict[str, list[tuple[object, ...]]]:
    wb = load_workbook(io.BytesIO(path.read_bytes()))
    cells = {}
    for ws in wb.worksheets:
        rows = list(ws.iter_rows(values_only=True))
        if ws.title == "Run Log":
            rows = [r for r in rows if r[0] not in TIMED_ITEMS]
        cells[ws.title] = rows
    return cells


def test_the_written_workbook_is_the_commands(results, command_book: Path, tmp_path: Path) -> None:
    ours = results.write(tmp_path / "kvha-results.xlsx")
    assert _cells(ours) == _cells(command_book)
    with zipfile.ZipFile(ours) as a, zipfile.ZipFile(command_book) as b:
        assert a.namelist() == b.namelist()
        for name in a.namelist():
            if "worksheets/sheet" not in name:  # the Run Log's times differ, nothing else
                assert a.read(name) == b.read(name), name
    with pytest.raises(FileExistsError):
        results.write(ours)
    with pytest.raises(FileExistsError):
        results.write(results.input.path, overwrite=True)  # never over the input


def test_a_json_input_and_a_case_write_their_input_sheets(tmp_path: Path) -> None:
    from batch.interface import from_case, read, run

    case = KVHA_SI_DEMO
    results = run(from_case(case), jobs=1)
    assert results.envelopes.columns[3] == "x (m)"
    assert results.envelopes.attrs["units"]["M max (kN-m)"] == "kN-m"
    book = results.write(tmp_path / "from-case.xlsx")
    assert {"Settings", "Members", "Vehicles", "Envelopes"} <= set(
        load_workbook(io.BytesIO(book.read_bytes())).sheetnames
    )
    # the written input sheets read back into the same case, and give the same numbers
    again = run(read(book), jobs=1)
    pd.testing.assert_frame_equal(again.envelopes, results.envelopes)
    doc = tmp_path / "empty.json"
    doc.write_text(json.dumps({"settings": {"units": "SI"}, "members": [], "vehicles": []}))
    from batch.interface import InputError

    with pytest.raises(InputError) as refused:
        read(doc)
    assert refused.value.problems and "problem" in str(refused.value)


def test_read_store_gives_the_finished_runs_results(tmp_path: Path) -> None:
    from batch.interface import StoreMismatch, read, read_store

    book = tmp_path / "kvha-inventory.xlsx"
    shutil.copyfile(SAMPLE, book)
    out = tmp_path / "kvha-results.xlsx"
    _command("run", str(book), "--out", str(out), "--jobs", "1")
    store = tmp_path / "kvha-results.spanfleet.sqlite"
    assert store.is_file()
    stored = read_store(store, book)
    assert stored.result.resumed == len(stored.case.members)  # nothing computed again
    for sheet, frame in stored.frames().items():
        pd.testing.assert_frame_equal(
            frame, pd.read_excel(out, sheet_name=sheet), check_dtype=False
        )
    # a store of another input is refused and left as it was
    other = tmp_path / "kvha-si.xlsx"
    shutil.copyfile(SAMPLES / "kvha-si-demo.xlsx", other)
    before = store.read_bytes()
    with pytest.raises(StoreMismatch, match="another input"):
        read_store(store, other)
    assert store.read_bytes() == before
    assert read(book).case == stored.case


def test_a_sheet_the_run_does_not_write_says_why(tmp_path: Path) -> None:
    from batch.interface import from_case, run

    case = KVHA_SI_DEMO
    results = run(from_case(case), jobs=1)
    if "Ratings" not in {t.sheet for t in results.tables()}:
        with pytest.raises(KeyError, match="Capacities"):
            results.frame("Ratings")
    with pytest.raises(KeyError, match="not a result sheet"):
        results.frame("Envelope")
