"""A real spreadsheet program as a client: LibreOffice Calc reads what spanfleet writes.

openpyxl reading back what openpyxl wrote proves little about other programs.
Here LibreOffice (headless, its own throw-away profile) converts, in one call
each:

* to .xlsx: the blank template (``spanfleet template``), a results workbook
  (``spanfleet run`` on the KVHA sample inventory) and an input workbook whose
  input cells are formulas with no saved result, which LibreOffice calculates
  and saves with their results;
* to CSV, every sheet: the results workbook, and that LibreOffice-saved
  workbook after an in-place ``spanfleet run``.

Checks: every cell LibreOffice reads from our files equals what we wrote (text
exactly, numbers to :data:`REL_TOL_15_DIGITS`); the workbook LibreOffice saved
reads back into the same case as the same values typed; and after our run it
still holds its formulas, with results LibreOffice and spanfleet both read.

Sources: the conversion command line and the CSV filter options (separator 44
",", text delimiter 34 '"', character set 76 UTF-8, first line 1, ..., token 9
"save cell contents as shown" false, token 12 "-1" every sheet to its own file)
are LibreOffice's documented ``--convert-to`` filter options (LibreOffice help,
"CSV Filter Options"; the all-sheets token since 7.2, from memory). A formula
cell's saved result is the ``<v>`` beside its ``<f>`` (ECMA-376 Part 1,
§18.3.1.4).
"""

from __future__ import annotations

import csv
import datetime as dt
import shutil
import subprocess
from dataclasses import dataclass
from pathlib import Path

import openpyxl
import pytest
from tolerances import REL_TOL_15_DIGITS

from batch.command.cli import EXIT_OK, main
from batch.validating import read_input

SOFFICE = shutil.which("soffice") or shutil.which("libreoffice")

pytestmark = [
    pytest.mark.slow,
    pytest.mark.skipif(
        SOFFICE is None,
        reason="LibreOffice (soffice) is not installed; .ci/run installs it from Debian's "
        "libreoffice-calc-nogui package",
    ),
]

#: Every sheet to its own UTF-8 CSV file, values unformatted (see the module docstring).
CSV_EVERY_SHEET = "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false,-1"
#: Longest one LibreOffice conversion may take (a first start builds its profile).
SOFFICE_TIMEOUT_S = 120
SAMPLE = Path(__file__).resolve().parent.parent / "sample_workbooks" / "kvha-inventory.xlsx"
RESULT_TABLES = ("Envelopes", "Reactions", "Governing")

#: Input cells typed as formulas, and the same values typed plainly (KVHA demo data).
FORMULA_SETTINGS = {"Stations per span": "=2*2"}
PLAIN_SETTINGS = {"Stations per span": 4}
FORMULA_MEMBERS = [
    {
        "Member": "KV-0311 G1",
        "Spans (ft)": "=30+30",
        "DF moment": "=0.5+0.1",
        "Description": '="Alder "&"Brook"',
    },
    {"Member": "KV-0312 G2", "Spans (ft)": '="30, "&"40"'},
]
PLAIN_MEMBERS = [
    {"Member": "KV-0311 G1", "Spans (ft)": 60, "DF moment": 0.6, "Description": "Alder Brook"},
    {"Member": "KV-0312 G2", "Spans (ft)": "30, 40"},
]


@dataclass(frozen=True)
class Converted:
    """Our files and what LibreOffice made of them."""

    template: Path
    results: Path
    formulas: Path  # formulas without saved results, as openpyxl writes them
    typed: Path  # the same values typed plainly
    lo_xlsx: Path  # folder of LibreOffice's .xlsx conversions
    rerun: Path  # LibreOffice's saved formulas workbook after an in-place spanfleet run
    rerun_status: int
    lo_csv: Path  # folder of LibreOffice's CSV conversions


def _soffice(profile: Path, target: str, outdir: Path, *files: Path) -> None:
    done = subprocess.run(
        [
            str(SOFFICE),
            f"-env:UserInstallation={profile.as_uri()}",
            "--headless",
            "--norestore",
            "--convert-to",
            target,
            "--outdir",
            str(outdir),
            *(str(f) for f in files),
        ],
        capture_output=True,
        text=True,
        timeout=SOFFICE_TIMEOUT_S,
        check=False,
    )
    assert done.returncode == 0, done.stdout + done.stderr
    assert "Error" not in done.stderr, done.stderr


@pytest.fixture(scope="module")
def converted(tmp_path_factory: pytest.TempPathFactory) -> Converted:
    from conftest import write_workbook

    root = tmp_path_factory.mktemp("libreoffice")
    ours = root / "ours"
    ours.mkdir()
    template, results = ours / "template.xlsx", ours / "results.xlsx"
    assert main(["template", str(template)]) == EXIT_OK
    assert main(["run", str(SAMPLE), "--out", str(results), "-q"]) == EXIT_OK
    formulas = write_workbook(
        ours, settings=FORMULA_SETTINGS, members=FORMULA_MEMBERS, name="formulas.xlsx"
    )
    typed = write_workbook(ours, settings=PLAIN_SETTINGS, members=PLAIN_MEMBERS, name="typed.xlsx")
    profile = root / "profile"
    lo_xlsx = root / "lo-xlsx"
    _soffice(profile, "xlsx", lo_xlsx, template, results, formulas)
    rerun = root / "rerun" / "formulas.xlsx"
    rerun.parent.mkdir()
    shutil.copyfile(lo_xlsx / formulas.name, rerun)
    rerun_status = main(["run", str(rerun), "-q"])
    lo_csv = root / "lo-csv"
    _soffice(profile, CSV_EVERY_SHEET, lo_csv, results, rerun)
    return Converted(template, results, formulas, typed, lo_xlsx, rerun, rerun_status, lo_csv)


def _load(path: Path) -> openpyxl.Workbook:
    return openpyxl.load_workbook(path)


def _same(ours: object, theirs: object) -> bool:
    """Text and other values exactly; numbers (not booleans) within REL_TOL_15_DIGITS."""
    numbers = (int, float)
    if isinstance(ours, numbers) and not isinstance(ours, bool):
        if not isinstance(theirs, numbers) or isinstance(theirs, bool):
            return False
        return abs(ours - theirs) <= REL_TOL_15_DIGITS * abs(ours)
    return ours == theirs


def _differences(ours: Path, theirs: Path) -> list[str]:
    """Every cell whose value differs between two workbooks (all sheets, both ways)."""
    a, b = _load(ours), _load(theirs)
    assert a.sheetnames == b.sheetnames
    found = []
    for name in a.sheetnames:
        refs = {c.coordinate for ws in (a[name], b[name]) for row in ws.iter_rows() for c in row}
        for ref in sorted(refs):
            mine, read = a[name][ref].value, b[name][ref].value
            if not _same(mine, read):
                found.append(f"{name}!{ref}: wrote {mine!r}, LibreOffice read {read!r}")
    return found


def _csv_rows(path: Path) -> list[list[str]]:
    with path.open(encoding="utf-8", newline="") as fh:
        return list(csv.reader(fh))


def _as_csv_text(value: object) -> str | float:
    """A cell value as LibreOffice's unformatted CSV shows it (numbers compared as numbers)."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, (int, float)):
        return float(value)
    assert not isinstance(value, (dt.date, dt.time)), "no dates in the result tables"
    return str(value)


def test_libreoffice_reads_the_template_as_written(converted: Converted) -> None:
    assert _differences(converted.template, converted.lo_xlsx / converted.template.name) == []


def test_libreoffice_reads_every_result_cell_as_written(converted: Converted) -> None:
    lo = converted.lo_xlsx / converted.results.name
    assert _differences(converted.results, lo) == []
    # The check compares something: the sample's envelopes are there, and not all zero.
    envelopes = [row for row in _load(lo)["Envelopes"].iter_rows(min_row=2, values_only=True)]
    assert len(envelopes) > 50
    assert any(isinstance(v, float) and v > 0 for row in envelopes for v in row)


@pytest.mark.parametrize("sheet", RESULT_TABLES)
def test_libreoffice_csv_of_the_results_shows_the_numbers_written(
    converted: Converted, sheet: str
) -> None:
    rows = _csv_rows(converted.lo_csv / f"{converted.results.stem}-{sheet}.csv")
    ws = _load(converted.results)[sheet]
    written = [list(row) for row in ws.iter_rows(values_only=True)]
    assert len(rows) == len(written)
    for number, (theirs, mine) in enumerate(zip(rows, written, strict=True), start=1):
        mine_text = [_as_csv_text(v) for v in mine]
        mine_text += [""] * (len(theirs) - len(mine_text))  # LibreOffice pads short rows
        for col, (text, want) in enumerate(zip(theirs, mine_text, strict=True), start=1):
            got: object = float(text) if isinstance(want, float) else text
            assert _same(want, got), f"{sheet} row {number} column {col}: {text!r} != {want!r}"


def test_a_workbook_saved_by_libreoffice_reads_back_like_typed_values(
    converted: Converted,
) -> None:
    # Before LibreOffice: formulas without results, each reported by cell.
    before = read_input(converted.formulas)
    assert sorted((p.sheet, p.cell, p.code) for p in before.problems) == [
        ("Members", "B2", "formula-not-calculated"),
        ("Members", "B3", "formula-not-calculated"),
        ("Members", "C2", "formula-not-calculated"),
        ("Members", "D2", "formula-not-calculated"),
        ("Settings", "B2", "formula-not-calculated"),
    ]
    saved = converted.lo_xlsx / converted.formulas.name
    assert _load(saved)["Members"]["B2"].value == "=30+30", "LibreOffice kept the formula"
    report, typed = read_input(saved), read_input(converted.typed)
    assert report.ok, [p.render() for p in report.problems]
    assert typed.ok
    assert report.case == typed.case
    assert report.case is not None
    assert [m.spans for m in report.case.members] == [(60.0,), (30.0, 40.0)]


def test_a_run_keeps_libreoffice_formulas_and_their_results(converted: Converted) -> None:
    assert converted.rerun_status == EXIT_OK
    members = _load(converted.rerun)["Members"]
    assert (members["B2"].value, members["B3"].value) == ("=30+30", '="30, "&"40"')
    report = read_input(converted.rerun)  # spanfleet reads the results we kept ...
    assert report.ok, [p.render() for p in report.problems]
    assert report.case == read_input(converted.typed).case
    rows = _csv_rows(converted.lo_csv / f"{converted.rerun.stem}-Members.csv")
    by_id = {row[0]: row for row in rows[1:]}  # ... and so does LibreOffice
    assert by_id["KV-0311 G1"][1:4] == ["60", "0.6", "Alder Brook"]
    assert by_id["KV-0312 G2"][1] == "30, 40"
    assert (converted.lo_csv / f"{converted.rerun.stem}-Envelopes.csv").exists()
