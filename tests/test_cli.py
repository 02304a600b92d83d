"""The ``spanfleet`` command: exit statuses, messages, and the input workbook never harmed.

Exit statuses and commands are those of docs/workbook.md ("The command"): 0
success, 1 input problems, 2 usage error, 3 internal error (a fault of spanfleet,
reported without a traceback unless SPANFLEET_DEBUG=1), 130 interrupted (the
shell convention 128 + SIGINT). Every call goes through ``main([...])`` in-process.
"""

from __future__ import annotations

import io
import json
import os
import sqlite3
import zipfile
from pathlib import Path

import pytest
from openpyxl import load_workbook as _load_path
from openpyxl.chart import BarChart, Reference

import batch
import batch.interface.session
from batch.command.cli import EXIT_INTERNAL, EXIT_OK, EXIT_PROBLEMS, EXIT_USAGE, main
from batch.validating import read_input

RESULT_SHEETS = {
    "Envelopes",
    "Reactions",
    "Governing",
    "Concurrent Forces",
    "Vehicle Summary",
    "Moment Charts",
    "Shear Charts",
    "Result Guide",
    "Run Log",
}


def load_workbook(path: Path, **kwargs):
    """Load from bytes, so no file handle is left open."""
    return _load_path(io.BytesIO(Path(path).read_bytes()), **kwargs)


@pytest.fixture
def book(tmp_path: Path, make_workbook) -> Path:
    return make_workbook(
        tmp_path,
        settings={"Stations per span": 4},
        members=[
            {"Member": "KV-0101 G1", "Spans (ft)": "60"},
            {"Member": "KV-0207 G2", "Spans (ft)": "45, 55"},
        ],
        extra={"Inspection notes": [["Inspector", "Date"], ["R. Okafor", "2024-05-02"]]},
    )


def test_version(capsys) -> None:
    assert main(["--version"]) == EXIT_OK
    assert capsys.readouterr().out.strip() == f"spanfleet {batch.__version__}"


@pytest.mark.parametrize(
    "argv",
    [
        [],
        ["frobnicate"],
        ["run"],
        ["check"],
        ["run", "a.xlsx", "--bogus"],
    ],
)
def test_usage_errors_exit_2(argv: list[str], capsys) -> None:
    assert main(argv) == EXIT_USAGE
    assert "usage:" in capsys.readouterr().err


def test_json_input_needs_out(tmp_path: Path, capsys) -> None:
    doc = tmp_path / "case.json"
    doc.write_text("{}")
    assert main(["run", str(doc)]) == EXIT_USAGE
    assert "needs --out" in capsys.readouterr().err


def test_results_must_go_to_a_workbook(book: Path, capsys) -> None:
    assert main(["run", str(book), "--out", str(book.with_suffix(".csv"))]) == EXIT_USAGE
    assert "ending in .xlsx" in capsys.readouterr().err


def test_check_clean_workbook(book: Path, capsys) -> None:
    before = book.read_bytes()
    assert main(["check", str(book)]) == EXIT_OK
    assert "no problems found (2 members, 1 vehicles)" in capsys.readouterr().out
    assert book.read_bytes() == before


def _bad_book(tmp_path: Path, make_workbook) -> Path:
    return make_workbook(
        tmp_path,
        members=[{"Member": "KV-0101 G1", "Spans (ft)": "sixty"}],
        name="bad.xlsx",
    )


def test_check_prints_every_problem_by_cell(tmp_path: Path, make_workbook, capsys) -> None:
    bad = _bad_book(tmp_path, make_workbook)
    assert main(["check", str(bad)]) == EXIT_PROBLEMS
    out = capsys.readouterr().out
    assert out.startswith("Members!B2: ")
    assert "Traceback" not in out


def test_check_json_report(tmp_path: Path, make_workbook, capsys) -> None:
    bad = _bad_book(tmp_path, make_workbook)
    assert main(["check", str(bad), "--json"]) == EXIT_PROBLEMS
    report = json.loads(capsys.readouterr().out)
    assert report["ok"] is False
    assert [(p["sheet"], p["cell"]) for p in report["problems"]] == [("Members", "B2")]


def test_run_with_problems_changes_nothing(tmp_path: Path, make_workbook, capsys) -> None:
    bad = _bad_book(tmp_path, make_workbook)
    before = bad.read_bytes()
    assert main(["run", str(bad)]) == EXIT_PROBLEMS
    err = capsys.readouterr().err
    assert "Members!B2: " in err and "bad.xlsx was not changed" in err
    assert bad.read_bytes() == before


def test_missing_input_is_a_clear_problem(tmp_path: Path, capsys) -> None:
    assert main(["run", str(tmp_path / "nowhere.xlsx")]) == EXIT_PROBLEMS
    assert "no such file" in capsys.readouterr().err


def test_run_in_place_adds_results_and_keeps_every_other_sheet(book: Path, capsys) -> None:
    before = load_workbook(book)
    assert main(["run", str(book)]) == EXIT_OK
    assert "wrote Envelopes, Reactions, Governing" in capsys.readouterr().out
    after = load_workbook(book)
    kept = [n for n in after.sheetnames if n not in RESULT_SHEETS]
    assert kept == before.sheetnames
    for name in kept:
        assert [[c.value for c in r] for r in after[name].iter_rows()] == [
            [c.value for c in r] for r in before[name].iter_rows()
        ]
    assert after.active.title == before.active.title


def test_second_run_replaces_results(book: Path, capsys) -> None:
    assert main(["run", str(book)]) == EXIT_OK
    first = load_workbook(book).sheetnames
    assert main(["run", str(book)]) == EXIT_OK
    after = load_workbook(book)
    assert after.sheetnames == first
    log = [c.value for c in after["Run Log"]["B"]]
    assert any(isinstance(v, str) and v.startswith("Replaced the result sheets") for v in log)


def test_out_leaves_the_input_bytes_unchanged(book: Path, tmp_path: Path) -> None:
    before = book.read_bytes()
    out = tmp_path / "results.xlsx"
    assert main(["run", str(book), "--out", str(out), "-q"]) == EXIT_OK
    assert book.read_bytes() == before
    sheets = load_workbook(out).sheetnames
    assert set(sheets) >= RESULT_SHEETS | {"Settings", "Members", "Vehicles", "Inspection notes"}


def test_json_input_gives_input_sheets_and_results(book: Path, tmp_path: Path) -> None:
    doc = tmp_path / "case.json"
    doc.write_text(json.dumps(read_input(book).document))
    out = tmp_path / "from-json.xlsx"
    assert main(["run", str(doc), "--out", str(out)]) == EXIT_OK
    wb = load_workbook(out)
    assert set(wb.sheetnames) >= RESULT_SHEETS | {"Settings", "Members", "Vehicles"}
    # The copy is itself a valid input that gives the same case.
    assert read_input(out).case == read_input(book).case


def _add_user_chart(path: Path) -> None:
    wb = load_workbook(path)
    ws = wb["Inspection notes"]
    chart = BarChart()
    chart.add_data(Reference(ws, min_col=1, min_row=1, max_row=2))
    ws.add_chart(chart, "D2")
    wb.save(path)


def test_a_workbook_with_a_chart_is_written_in_place_and_keeps_it(book: Path, capsys) -> None:
    # Results are spliced into the input's own package (batch/writing/package/splice.py), so the
    # engineer's chart parts come back byte for byte (ECMA-376 Part 2 package parts).
    _add_user_chart(book)
    with zipfile.ZipFile(book) as zf:
        before = {
            n: zf.read(n) for n in zf.namelist() if n.startswith(("xl/charts/", "xl/drawings/"))
        }
    assert main(["run", str(book)]) == EXIT_OK
    assert "warning" not in capsys.readouterr().err
    with zipfile.ZipFile(book) as zf:
        assert {n: zf.read(n) for n in before} == before
    assert len(load_workbook(book)["Inspection notes"]._charts) == 1
    assert main(["check", str(book)]) == EXIT_OK
    assert "warning" not in capsys.readouterr().out


def test_an_open_workbook_is_not_replaced(book: Path, capsys) -> None:
    (book.parent / f".~lock.{book.name}#").write_text("someone,somewhere")
    before = book.read_bytes()
    assert main(["run", str(book)]) == EXIT_PROBLEMS
    assert "seems to be open in a spreadsheet program" in capsys.readouterr().err
    assert book.read_bytes() == before


def test_a_foreign_result_named_sheet_stops_the_run(tmp_path: Path, make_workbook, capsys) -> None:
    path = make_workbook(tmp_path, extra={"Run Log": [["my own diary"]]})
    before = path.read_bytes()
    assert main(["run", str(path)]) == EXIT_PROBLEMS
    assert "Run Log: this sheet has the name of a spanfleet result sheet" in (
        capsys.readouterr().err
    )
    assert path.read_bytes() == before


def test_save_failure_is_reported_and_changes_nothing(book: Path, monkeypatch, capsys) -> None:
    before = book.read_bytes()

    def locked(*_args, **_kw):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(os, "replace", locked)
    assert main(["run", str(book)]) == EXIT_PROBLEMS
    assert "permission denied" in capsys.readouterr().err
    assert book.read_bytes() == before


def test_internal_error_exit_3_without_traceback(book: Path, monkeypatch, capsys) -> None:
    before = book.read_bytes()

    def broken(*_args, **_kw):
        raise RuntimeError("unexpected state")

    monkeypatch.setattr(batch.interface.session, "run_case", broken)
    monkeypatch.delenv("SPANFLEET_DEBUG", raising=False)
    assert main(["run", str(book)]) == EXIT_INTERNAL
    err = capsys.readouterr().err
    assert "internal error" in err and "Please report this" in err and "not changed" in err
    assert "Traceback" not in err
    assert book.read_bytes() == before
    monkeypatch.setenv("SPANFLEET_DEBUG", "1")
    assert main(["run", str(book)]) == EXIT_INTERNAL
    assert "Traceback" in capsys.readouterr().err


def test_interrupt_changes_nothing(book: Path, monkeypatch, capsys) -> None:
    before = book.read_bytes()

    def interrupted(*_args, **_kw):
        raise KeyboardInterrupt

    monkeypatch.setattr(batch.interface.session, "run_case", interrupted)
    assert main(["run", str(book)]) == 130
    assert "interrupted" in capsys.readouterr().err
    assert book.read_bytes() == before


def test_warnings_are_printed_and_do_not_change_the_exit(
    tmp_path: Path, make_workbook, capsys
) -> None:
    path = make_workbook(tmp_path, settings={"Colour scheme": "teal"})
    assert main(["run", str(path)]) == EXIT_OK
    err = capsys.readouterr().err
    assert "warning: Settings!A2: " in err


def test_template_writes_once_and_never_overwrites(tmp_path: Path, capsys) -> None:
    new = tmp_path / "blank.xlsx"
    assert main(["template", str(new)]) == EXIT_OK
    assert new.exists()
    before = new.read_bytes()
    assert main(["template", str(new)]) == EXIT_PROBLEMS
    assert "already exists" in capsys.readouterr().err
    assert new.read_bytes() == before


def test_library_lists_models(capsys) -> None:
    assert main(["library"]) == EXIT_OK
    out = capsys.readouterr().out
    assert out.startswith("Library name") or out.startswith("No built-in load models")
    assert main(["library", "--units", "SI"]) == EXIT_OK


XLSX_MAIN = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"
XLSM_MAIN = "application/vnd.ms-excel.sheet.macroEnabled.main+xml"
VBA_DEFAULT = '<Default Extension="bin" ContentType="application/vnd.ms-office.vbaProject" />'


def _as_xlsm(xlsx: Path, vba: bytes) -> Path:
    """The workbook as a macro-enabled package holding ``vba`` as its VBA project.

    Part names, relationship and content types as in ECMA-376 / [MS-OFFMACRO]
    (a vbaProject.bin part related from the workbook).
    """
    out = io.BytesIO()
    with zipfile.ZipFile(xlsx) as zin, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            data = zin.read(info.filename).decode()
            if info.filename == "[Content_Types].xml":
                data = data.replace(XLSX_MAIN, XLSM_MAIN).replace(
                    '<Default Extension="xml"', f'{VBA_DEFAULT}<Default Extension="xml"'
                )
            if info.filename == "xl/_rels/workbook.xml.rels":
                data = data.replace(
                    "</Relationships>",
                    '<Relationship Id="rIdVba" Type="http://schemas.microsoft.com/office/2006/'
                    'relationships/vbaProject" Target="vbaProject.bin" /></Relationships>',
                )
            zout.writestr(info, data.encode())
        zout.writestr("xl/vbaProject.bin", vba)
    path = xlsx.with_suffix(".xlsm")
    path.write_bytes(out.getvalue())
    return path


def test_macros_survive_in_place_and_a_copy_without_them_warns(book: Path, capsys) -> None:
    vba = b"\xd0\xcf\x11\xe0 stand-in VBA project bytes"
    xlsm = _as_xlsm(book, vba)
    assert main(["run", str(xlsm)]) == EXIT_OK
    with zipfile.ZipFile(xlsm) as zf:
        assert zf.read("xl/vbaProject.bin") == vba
        assert "macroEnabled" in zf.read("[Content_Types].xml").decode()
    assert "Envelopes" in load_workbook(xlsm).sheetnames
    copy = book.parent / "no-macros.xlsx"
    assert main(["run", str(xlsm), "--out", str(copy)]) == EXIT_OK
    assert "no-macros.xlsx will lack macros (VBA)" in capsys.readouterr().err
    with zipfile.ZipFile(copy) as zf:
        assert "xl/vbaProject.bin" not in zf.namelist()
    assert main(["run", str(book), "--out", str(book.with_name("x.xlsm"))]) == EXIT_USAGE


def test_a_formula_input_keeps_its_cached_value_so_a_second_run_reads_it(
    tmp_path: Path, make_workbook, capsys
) -> None:
    # A spreadsheet program saves each formula with its last result (ECMA-376 Part 1,
    # §18.3.1.4 c: an <f> element beside a <v> value); openpyxl drops the <v> on save.
    path = make_workbook(tmp_path, members=[{"Member": "KV-0311 G1", "Spans (ft)": "=30+30"}])
    out = io.BytesIO()
    with zipfile.ZipFile(path) as zin, zipfile.ZipFile(out, "w") as zout:
        for info in zin.infolist():
            zout.writestr(
                info, zin.read(info).replace(b"<f>30+30</f><v />", b"<f>30+30</f><v>60</v>")
            )
    path.write_bytes(out.getvalue())
    assert read_input(path).ok
    for _ in range(2):  # the second run reads the workbook the first one wrote
        assert main(["run", str(path), "-q"]) == EXIT_OK, capsys.readouterr().err
    report = read_input(path)
    assert report.ok, [p.render() for p in report.problems]
    assert report.case is not None
    assert report.case.members[0].spans == (60.0,)
    assert load_workbook(path)["Members"]["B2"].value == "=30+30"


def test_a_damaged_checkpoint_store_is_refused_with_the_fix(book: Path, capsys) -> None:
    # A file in the store's place that is not a database: say so, name it, give the way out.
    before = book.read_bytes()
    store = book.with_name(f"{book.stem}.spanfleet.sqlite")
    store.write_bytes(b"not a database, whatever the name says" * 100)
    assert main(["run", str(book), "-q"]) == EXIT_PROBLEMS
    err = capsys.readouterr().err
    assert f"{store.name}: the checkpoint store could not be used" in err
    assert "delete it to start afresh, or run with --no-store" in err
    assert f"{book.name} was not changed" in err
    assert book.read_bytes() == before
    assert main(["run", str(book), "-q", "--no-store"]) == EXIT_OK


def test_stored_results_that_do_not_decode_are_refused_with_the_fix(book: Path, capsys) -> None:
    # A store cut short (a copy broken in transit, say): refuse it rather than write
    # results read from it; a fresh run after deleting it succeeds.
    out = book.with_name("results.xlsx")
    assert main(["run", str(book), "--out", str(out), "-q"]) == EXIT_OK
    store = out.with_name("results.spanfleet.sqlite")
    with sqlite3.connect(store) as db:
        db.execute("UPDATE members SET envelope = substr(envelope, 1, 40)")
    db.close()
    out.unlink()
    assert main(["run", str(book), "--out", str(out), "-q"]) == EXIT_PROBLEMS
    err = capsys.readouterr().err
    assert "the checkpoint store could not be used" in err and "cut short" in err
    assert not out.exists()
    store.unlink()
    assert main(["run", str(book), "--out", str(out), "-q"]) == EXIT_OK
