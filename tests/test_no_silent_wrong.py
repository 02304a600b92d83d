"""No silent wrong answer: each class of issue 13, met as an engineer meets it.

Every case is a workbook (or a JSON document) and a command line. Each asserts the
exit status (1 for a refusal, never 3), that the message names the sheet and cell
and says what to do (``Sheet!Cell: what is wrong; how to fix it``, DEVELOPERS.md,
"House rules"), that ``check`` refuses what ``run`` refuses, and that the input is
byte-identical afterwards.

Sources: the number rule, header units, sheet names and the rows read are the
workbook format (docs/workbook.md, "Reading rules"); what a cell can hold is W3C
XML 1.0 (Fifth Edition) §2.2, production [2] Char; the least span ratio rests on
the engine's equilibrium measured here (a unit load's reactions sum to 1 and their
moment about the left end is the load's position: statics, common practice).
"""

from __future__ import annotations

import contextlib
import io
import json
import os
import re
import subprocess
import sys
import zipfile
from collections.abc import Callable
from pathlib import Path

import numpy as np
import openpyxl
import pytest

from batch.command.cli import EXIT_OK, EXIT_PROBLEMS, main
from batch.engine.influence import influence_lines
from batch.reading import workbook
from batch.validating.checks import MIN_SPAN_RATIO
from batch.writing.package import save
from batch.writing.package.save import TEMP_PREFIX
from batch.writing.package.source import SourcePackage

#: The reactions of a unit load sum to 1 within this at the least span ratio accepted.
EQUILIBRIUM_TOL = 1e-12

VEHICLE = {"Vehicle": "KV-T3", "Axle loads (kip)": "10, 30, 30", "Axle spacings (ft)": "14, 16"}


def spanfleet(*argv: str) -> tuple[int, str]:
    """``spanfleet ARGV`` in this process: exit status and everything it printed."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        status = main(list(argv))
    return status, out.getvalue() + err.getvalue()


def assert_refused(book: Path, where: str, *words: str) -> str:
    """``check``, ``run`` in place and ``run --out`` all refuse ``book`` at ``where``."""
    before = book.read_bytes()
    out = book.with_name("results.xlsx")
    texts = []
    for argv in (["check"], ["run"], ["run", "--out", str(out)]):
        status, text = spanfleet(argv[0], str(book), *argv[1:])
        assert status == EXIT_PROBLEMS, text
        assert "Traceback" not in text and "internal error" not in text, text
        line = next((ln for ln in text.splitlines() if ln.startswith(f"{where}: ")), None)
        assert line is not None, text
        assert "; " in line, f"no fix given: {line}"
        for word in words:
            assert word in line, line
        assert book.read_bytes() == before
        assert not out.exists()
        texts.append(line)
    assert len(set(texts)) == 1, "check says the same as run"
    return texts[0]


# ---------------------------------------------------------------- never drop a row


def test_data_below_the_last_row_read_is_refused_by_its_cell(
    tmp_path: Path, make_workbook: Callable[..., Path], monkeypatch: pytest.MonkeyPatch
) -> None:
    # The cap is lowered so the test stays small; the rule is the same at 100,000 rows.
    monkeypatch.setattr(workbook, "MAX_INPUT_ROWS", 4)
    members = [{"Member": f"KV-{k:04d} G1", "Spans (ft)": 40 + k} for k in range(3)]
    book = make_workbook(tmp_path, members=members, vehicles=[VEHICLE])
    wb = openpyxl.load_workbook(book)
    wb["Members"]["A7000"] = "KV-7000 G1"  # far below, after thousands of blank rows
    wb["Members"]["B7000"] = 55
    wb.save(book)
    assert_refused(book, "Members!A7000", "below row 5")


def test_a_value_under_no_header_is_refused(tmp_path: Path, make_workbook) -> None:
    # Hinges typed one column to the right of the table, where no header is: read as
    # nothing, the member would be analysed as continuous.
    book = make_workbook(
        tmp_path,
        extra={"Members": [["Member", "Spans (ft)"], ["KV-0311 G1", "50, 60, 50", 75]]},
        vehicles=[VEHICLE],
    )
    assert_refused(book, "Members!C2", "no header", "Hinges")


def test_a_row_with_data_only_where_nothing_is_read_is_refused(
    tmp_path: Path, make_workbook
) -> None:
    book = make_workbook(
        tmp_path,
        extra={
            "Members": [
                ["Member", "Spans (ft)", "Remarks"],
                ["KV-0101 G1", 60, "deck replaced 2011"],
                [None, None, "KV-0102 G1 60 ft"],
            ]
        },
        vehicles=[VEHICLE],
    )
    assert_refused(book, "Members!C3", "row 3", "left out")


def test_hidden_and_filtered_rows_are_analysed_and_the_run_says_so(
    tmp_path: Path, make_workbook
) -> None:
    members = [{"Member": f"KV-{k:04d} G1", "Spans (ft)": 40 + 5 * k} for k in range(4)]
    book = make_workbook(tmp_path, members=members, vehicles=[VEHICLE])
    wb = openpyxl.load_workbook(book)
    wb["Members"].row_dimensions[3].hidden = True
    wb["Members"].row_dimensions[5].hidden = True
    wb.save(book)
    status, text = spanfleet("run", str(book), "-q")
    assert status == EXIT_OK, text
    assert "warning: Members!A3: rows 3 and 5 are hidden" in text
    log = openpyxl.load_workbook(io.BytesIO(book.read_bytes()), read_only=True)["Run Log"]
    rows = {row[0]: row[1] for row in log.iter_rows(values_only=True)}
    assert rows["Members"] == 4, "hidden members are analysed"
    logged = [v for k, v in log.iter_rows(values_only=True) if k == "warning"]
    assert any(str(v).startswith("Members!A3: rows 3 and 5 are hidden") for v in logged)


# ---------------------------------------------------------------- never guess a number


@pytest.mark.parametrize(
    ("column", "text", "cell", "decimal"),
    [
        ("Spans (m)", "12,5, 14", "Members!B2", "12.5"),
        ("Spans (m)", "12,5", "Members!B2", "12.5"),
        ("DF moment", "0,62", "Members!C2", "0.62"),
    ],
)
def test_a_decimal_comma_in_an_si_workbook_is_refused_alike_in_lists_and_numbers(
    tmp_path: Path, make_workbook, column: str, text: str, cell: str, decimal: str
) -> None:
    member = {"Member": "KV-0101 G1", "Spans (m)": 18} | {column: text}
    book = make_workbook(
        tmp_path,
        settings={"Units": "SI"},
        members=[member],
        vehicles=[{"Vehicle": "KV-TS", "Axle loads (kN)": "120, 120", "Axle spacings (m)": 1.2}],
    )
    assert_refused(book, cell, f"the decimal {decimal}", "never guesses")


def test_spacings_typed_without_spaces_are_refused_not_split(tmp_path: Path, make_workbook) -> None:
    # 3 axles and "4,3-9" would otherwise be read as three spacings 4, 3-9: wrong count, or
    # worse, a silently different truck.
    book = make_workbook(
        tmp_path,
        vehicles=[
            {"Vehicle": "KV-T3", "Axle loads (kip)": "8, 32, 32", "Axle spacings (ft)": "14,5"}
        ],
    )
    assert_refused(book, "Vehicles!C2", "14.5", "14, 5")


@pytest.mark.parametrize(
    ("member", "cell", "word"),
    [
        ({"Spans (ft)": "60, 0.01, 60"}, "Members!B2", "shorter than 1 ft"),
        ({"Spans (ft)": "60, 1e999"}, "Members!B2", "not a finite number"),
        ({"Spans (ft)": 60, "DF moment": "1e300"}, "Members!C2", "the most spanfleet accepts"),
        ({"Spans (ft)": 60, "DF shear": "NaN"}, "Members!C2", "not a number"),
    ],
)
def test_numbers_the_engine_cannot_honour_are_refused_by_cell(
    tmp_path: Path, make_workbook, member: dict, cell: str, word: str
) -> None:
    book = make_workbook(tmp_path, members=[{"Member": "KV-0101 G1"} | member], vehicles=[VEHICLE])
    assert_refused(book, cell, word)


def test_the_least_span_ratio_accepted_keeps_the_engine_in_equilibrium() -> None:
    # Statics: the reactions to a unit load sum to 1, and their moment about the left end
    # equals the load's position (common practice). At the least ratio accepted
    # (batch/validating/checks.py, MIN_SPAN_RATIO) both hold to EQUILIBRIUM_TOL.
    spans = (60.0, 60.0 * MIN_SPAN_RATIO, 60.0)
    lines = influence_lines(spans, stations_per_span=4)
    x = np.linspace(0.0, sum(spans), 2001)
    reactions = lines.evaluate(x)[lines.reaction_rows]
    supports = np.concatenate(([0.0], np.cumsum(spans)))
    assert np.abs(reactions.sum(axis=0) - 1.0).max() < EQUILIBRIUM_TOL
    assert np.abs(supports @ reactions - x).max() / sum(spans) < EQUILIBRIUM_TOL


# ---------------------------------------------------------------- never ignore a unit


def test_a_header_unit_spanfleet_does_not_know_is_refused(tmp_path: Path, make_workbook) -> None:
    book = make_workbook(
        tmp_path, members=[{"Member": "KV-0101 G1", "Spans (chains)": 3}], vehicles=[VEHICLE]
    )
    assert_refused(book, "Members!B1", "'chains'", "not a unit spanfleet knows", "Spans (ft)")


# ---------------------------------------------------------------- one sheet, one name


def test_two_sheets_with_one_name_are_refused_naming_both(tmp_path: Path, make_workbook) -> None:
    book = make_workbook(
        tmp_path,
        vehicles=[VEHICLE],
        extra={"VEHICLES ": [["Vehicle", "Axle loads"], ["KV-HEAVY", "40, 40"]]},
    )
    assert_refused(book, "Vehicles", "'Vehicles' and 'VEHICLES '")


# ---------------------------------------------------------------- characters


@pytest.mark.parametrize(
    ("escaped", "code"), [("\\u0007", "U+0007"), ("\\ud83d", "U+D83D"), ("\\uffff", "U+FFFF")]
)
def test_characters_a_workbook_cannot_hold_are_refused_by_check(
    tmp_path: Path, escaped: str, code: str
) -> None:
    doc = tmp_path / "case.json"
    doc.write_text(
        '{"members": [{"id": "KV-0101 G1", "spans": [60]}], "vehicles": [{"id": "KV-T3'
        + escaped
        + '", "axle_loads": [10, 30, 30], "spacings": [14, 16]}]}'
    )
    before = doc.read_bytes()
    out = tmp_path / "results.xlsx"
    for argv in (["check", str(doc)], ["run", str(doc), "--out", str(out)]):
        status, text = spanfleet(*argv)
        assert status == EXIT_PROBLEMS, text
        assert "JSON /vehicles/0/id: Vehicle: 'KV-T3\\" in text and code in text, text
        assert "internal error" not in text
    assert doc.read_bytes() == before
    assert not out.exists()


def test_a_key_with_a_lone_surrogate_is_printed_not_crashed_on(tmp_path: Path) -> None:
    # The message quotes the key; a real terminal's UTF-8 stream cannot encode a lone
    # surrogate, so this runs in a real process.
    doc = tmp_path / "case.json"
    doc.write_text(json.dumps({"members": [], "vehicles": []})[:-1] + ', "KV\\udc00": 1}')
    for argv in (["check", str(doc)], ["run", str(doc), "--out", str(tmp_path / "r.xlsx")]):
        done = subprocess.run(
            [sys.executable, "-m", "batch", *argv], capture_output=True, check=False, timeout=60
        )
        text = (done.stdout + done.stderr).decode("utf-8", "replace")
        assert done.returncode == EXIT_PROBLEMS, text
        assert "JSON /KV\\udc00: " in text and "internal error" not in text, text


# ---------------------------------------------------------------- never replace what is not ours


def _inventory(tmp_path: Path, make_workbook: Callable[..., Path], name: str) -> Path:
    return make_workbook(
        tmp_path,
        members=[{"Member": "KV-0101 G1", "Spans (ft)": "40, 50"}],
        vehicles=[VEHICLE],
        name=name,
    )


def test_out_onto_a_workbook_spanfleet_did_not_write_asks_for_overwrite(
    tmp_path: Path, make_workbook
) -> None:
    book = _inventory(tmp_path, make_workbook, "kvha-book.xlsx")
    theirs = make_workbook(tmp_path, name="bridge-notes.xlsx")  # the engineer's own workbook
    mine = book.read_bytes()
    before = theirs.read_bytes()
    status, text = spanfleet("run", str(book), "--out", str(theirs), "-q")
    assert status == EXIT_PROBLEMS, text
    assert text.startswith("bridge-notes.xlsx: the file exists and is not a copy spanfleet wrote")
    assert "--overwrite" in text
    assert theirs.read_bytes() == before and book.read_bytes() == mine
    status, text = spanfleet("run", str(book), "--out", str(theirs), "-q", "--overwrite")
    assert status == EXIT_OK, text
    assert "Envelopes" in openpyxl.load_workbook(theirs, read_only=True).sheetnames


def test_out_onto_a_copy_spanfleet_wrote_replaces_it_without_asking(
    tmp_path: Path, make_workbook
) -> None:
    book = _inventory(tmp_path, make_workbook, "kvha-book.xlsx")
    out = tmp_path / "results.xlsx"
    assert spanfleet("run", str(book), "--out", str(out), "-q")[0] == EXIT_OK
    status, text = spanfleet("run", str(book), "--out", str(out), "-q")
    assert status == EXIT_OK, text


def test_out_onto_a_workbook_run_in_place_asks_first(tmp_path: Path, make_workbook) -> None:
    # A workbook that was run in place holds spanfleet's sheets, but its input sheets are
    # the engineer's: another input's results must not replace it unasked.
    first = _inventory(tmp_path, make_workbook, "alder-brook.xlsx")
    assert spanfleet("run", str(first), "-q")[0] == EXIT_OK
    before = first.read_bytes()
    other = _inventory(tmp_path, make_workbook, "heron-creek.xlsx")
    status, text = spanfleet("run", str(other), "--out", str(first), "-q")
    assert status == EXIT_PROBLEMS and "--overwrite" in text, text
    assert first.read_bytes() == before


def _honour_mode_bits(monkeypatch: pytest.MonkeyPatch) -> None:
    """As root, make os.access answer as it would for an ordinary user (mode bits count)."""
    if os.geteuid() != 0:
        return
    real = os.access

    def access(path: object, mode: int, **kw: object) -> bool:
        if mode & os.W_OK and not os.stat(str(path)).st_mode & 0o222:
            return False
        return real(path, mode, **kw)  # type: ignore[arg-type]

    monkeypatch.setattr(os, "access", access)


def test_a_read_only_workbook_run_in_place_is_refused(
    tmp_path: Path, make_workbook, monkeypatch: pytest.MonkeyPatch
) -> None:
    book = _inventory(tmp_path, make_workbook, "kvha-book.xlsx")
    book.chmod(0o444)
    _honour_mode_bits(monkeypatch)
    before = book.read_bytes()
    status, text = spanfleet("run", str(book), "-q")
    assert status == EXIT_PROBLEMS, text
    assert text.startswith("kvha-book.xlsx: the workbook is read-only")
    assert "--out" in text
    assert book.read_bytes() == before
    assert not list(tmp_path.glob("*.sqlite")), "refused before any work"


def test_a_read_only_folder_is_refused_before_any_work(
    tmp_path: Path, make_workbook, monkeypatch: pytest.MonkeyPatch
) -> None:
    # The workbook's temporary file and the checkpoint store both go beside the target.
    book = _inventory(tmp_path, make_workbook, "kvha-book.xlsx")
    shared = tmp_path / "shared"
    shared.mkdir()
    there = _inventory(shared, make_workbook, "on-the-share.xlsx")
    before = there.read_bytes()
    shared.chmod(0o555)
    _honour_mode_bits(monkeypatch)
    try:
        for argv in (
            ["run", str(book), "--out", str(shared / "results.xlsx")],
            ["run", str(there)],
        ):
            status, text = spanfleet(*argv, "-q")
            assert status == EXIT_PROBLEMS, text
            assert "is read-only for you" in text and "checkpoint store" in text, text
        assert [p.name for p in shared.iterdir()] == [there.name]
        assert there.read_bytes() == before
    finally:
        shared.chmod(0o755)


def test_out_into_a_folder_that_does_not_exist(tmp_path: Path, make_workbook) -> None:
    book = _inventory(tmp_path, make_workbook, "kvha-book.xlsx")
    status, text = spanfleet("run", str(book), "--out", str(tmp_path / "2027" / "r.xlsx"), "-q")
    assert status == EXIT_PROBLEMS, text
    assert text.startswith(f"r.xlsx: the folder {tmp_path / '2027'} does not exist; create it")


def test_an_out_target_open_in_a_spreadsheet_program_is_refused(
    tmp_path: Path, make_workbook
) -> None:
    book = _inventory(tmp_path, make_workbook, "kvha-book.xlsx")
    out = tmp_path / "results.xlsx"
    assert spanfleet("run", str(book), "--out", str(out), "-q")[0] == EXIT_OK
    (tmp_path / "~$results.xlsx").write_text("owner")  # Excel's owner file
    before = out.read_bytes()
    status, text = spanfleet("run", str(book), "--out", str(out), "-q")
    assert status == EXIT_PROBLEMS and "open in a spreadsheet program" in text, text
    assert out.read_bytes() == before


def test_temporary_files_of_killed_saves_are_removed_by_the_next_run(
    tmp_path: Path, make_workbook
) -> None:
    # Names as atomic_save makes them: the prefix, this machine's tag, the process id.
    book = _inventory(tmp_path, make_workbook, "kvha-book.xlsx")
    dead = subprocess.Popen([sys.executable, "-c", "pass"])
    dead.wait()
    stale = tmp_path / f"{TEMP_PREFIX}{save._HOST}-{dead.pid}-x1y2.tmp"
    live = tmp_path / f"{TEMP_PREFIX}{save._HOST}-{os.getpid()}-x1y2.tmp"
    other_host = tmp_path / f"{TEMP_PREFIX}00000000-{dead.pid}-x1y2.tmp"
    for path in (stale, live, other_host):
        path.write_bytes(b"PK half a workbook")
    assert spanfleet("run", str(book), "-q")[0] == EXIT_OK
    assert not stale.exists(), "a dead process's temporary file is removed"
    assert live.exists() and other_host.exists(), "a save that may be going on is left alone"


# ---------------------------------------------------------------- every failure is a message


def test_a_cluster_that_does_not_answer_is_a_message_after_the_time_limit(
    tmp_path: Path, make_workbook
) -> None:
    # Port 1 of this machine: nothing listens there (a privileged port, common practice).
    book = _inventory(tmp_path, make_workbook, "kvha-book.xlsx")
    before = book.read_bytes()
    argv = ["--cluster", "tcp://127.0.0.1:1", "--cluster-timeout", "1", "-q"]
    status, text = spanfleet("run", str(book), *argv)
    assert status == EXIT_PROBLEMS, text
    assert text.startswith("--cluster tcp://127.0.0.1:1: no Dask scheduler answered within 1 s")
    assert "kvha-book.xlsx was not changed" in text
    assert book.read_bytes() == before
    status, text = spanfleet("run", str(book), "--cluster", "KVHA-cluster", "-q")
    assert status == EXIT_PROBLEMS and "check the address" in text, text


# ---------------------------------------------------------------- earlier result sheets


def _rezip(data: bytes, part: str, change: Callable[[bytes], bytes]) -> bytes:
    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as zin, zipfile.ZipFile(out, "w") as zout:
        for info in zin.infolist():
            body = zin.read(info)
            zout.writestr(info, change(body) if info.filename == part else body)
    return out.getvalue()


def test_hidden_and_filtered_rows_of_earlier_results_are_said_to_be_undone(
    tmp_path: Path, make_workbook
) -> None:
    # The engineer hid two rows of Envelopes and filtered it (ECMA-376 Part 1, §18.3.1.73
    # row hidden, §18.3.2.7 filterColumn), then runs again.
    book = _inventory(tmp_path, make_workbook, "kvha-book.xlsx")
    assert spanfleet("run", str(book), "-q")[0] == EXIT_OK
    data = book.read_bytes()
    part = next(s.part for s in SourcePackage(data, book.name).sheets if s.name == "Envelopes")
    assert part is not None

    def hide(xml: bytes) -> bytes:
        xml = xml.replace(b'<row r="3"', b'<row hidden="1" r="3"', 1)
        xml = xml.replace(b'<row r="4"', b'<row hidden="1" r="4"', 1)
        return re.sub(
            rb"<autoFilter ref=\"([^\"]+)\"\s*/>",
            rb'<autoFilter ref="\1">'
            rb'<filterColumn colId="0"><filters><filter val="KV-0101 G1"/>'
            rb"</filters></filterColumn></autoFilter>",
            xml,
            count=1,
        )

    book.write_bytes(_rezip(data, part, hide))
    status, text = spanfleet("run", str(book))
    assert status == EXIT_OK, text
    expected = "Envelopes (2 hidden rows, a filter)"
    assert "warning: kvha-book.xlsx: Replaced the result sheets of an earlier run" in text
    assert expected in text and "Anything typed into them is not kept" in text, text
    log = openpyxl.load_workbook(io.BytesIO(book.read_bytes()), read_only=True)["Run Log"]
    notes = [str(v) for k, v in log.iter_rows(values_only=True) if k == "Note"]
    assert any(expected in note for note in notes), notes
