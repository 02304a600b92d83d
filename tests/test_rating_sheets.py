"""The rating and screening sheets, end to end through the ``spanfleet`` command.

Sources:
* the LRFR general equation and load factors (MBE 6A.4.2.1 and Table 6A.4.2.2-1,
  from memory), worked by hand below for a simple span;
* the posting load (W/0.7)(RF - 0.3) (MBE 6A.8.3, from memory);
* statics of a simple span (common practice): a single axle P gives PL/4 at
  midspan; a uniform load w gives wL^2/8 there;
* docs/workbook.md ("Result sheets": result sheets replaced on a later run, every
  other sheet kept) and docs/rating.md ("The sheets": the Ratings columns);
* a screening ratio of the reference against itself is 1 (the definition).
Everything else on the sheets is compared with the run's own result (in
process), which tests/test_rating.py and tests/test_rating_runs.py check.
"""

from __future__ import annotations

import contextlib
import dataclasses
import io
import shutil
from pathlib import Path

import numpy as np
import openpyxl
import pandas as pd
import pytest
from tolerances import REL_TOL_FLOAT

from batch.command.cli import main
from batch.rating.lrfr import gross_weight, posting_load, weight_in_tons
from batch.running.executor import run_case
from batch.validating import read_input
from batch.writing.columns import (
    RATING_MATRIX,
    RATINGS,
    RF_BANDS,
    SCREEN_EXCEEDED_RGB,
    SCREENING,
    SCREENING_DETAIL,
    is_result_sheet_name,
)
from batch.writing.package.save import atomic_save
from batch.writing.package.splice import SourcePackage, empty_package
from batch.writing.results import result_package
from batch.writing.runlog import InputInfo

ASSESSMENT_SHEETS = tuple(t.sheet for t in (RATINGS, RATING_MATRIX, SCREENING, SCREENING_DETAIL))
SAMPLES = Path(__file__).resolve().parent.parent / "sample_workbooks"


def _run(*argv: str) -> tuple[int, str]:
    err = io.StringIO()
    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(err):
        status = main(list(argv))
    return status, err.getvalue()


def _fill(cell: openpyxl.cell.cell.Cell) -> str | None:
    rgb = cell.fill.fgColor.rgb if cell.fill and cell.fill.fill_type == "solid" else None
    return str(rgb)[-6:] if rgb else None


# A 60 ft simple span, DF 0.6 / 0.7, DC 1.2 and DW 0.2 kip/ft, condition factor 0.95;
# one 40 kip axle, legal (W = 20 tons), IM 0.33; Resistance M+ 1300 kip-ft at midspan.
SIMPLE = {
    "members": [
        {
            "Member": "KV-0330 G3",
            "Spans (ft)": 60,
            "DF moment": 0.6,
            "DF shear": 0.7,
            "DC load (kip/ft)": 1.2,
            "DW load (kip/ft)": 0.2,
            "Condition factor": 0.95,
        }
    ],
    "vehicles": [
        {"Vehicle": "KV-A40", "Axle loads (kip)": 40, "Category": "legal"},
        {"Vehicle": "KV-A20", "Axle loads (kip)": 20, "Category": "design"},
    ],
    "extra": {
        "Capacities": [
            ["Member", "Span", "Station", "Resistance M+ (kip-ft)"],
            ["KV-0330 G3", 1, 0.5, 1300],
        ]
    },
}


def test_a_simple_span_rated_by_hand(tmp_path: Path, make_workbook) -> None:
    book = make_workbook(tmp_path, **SIMPLE)
    status, err = _run("run", str(book), "--no-store")
    assert status == 0, err
    ratings = pd.read_excel(book, sheet_name="Ratings")
    legal = ratings[ratings["Vehicle"] == "KV-A40"].iloc[0]
    # DC M = 1.2 x 60^2/8 = 540, DW M = 90; LL + IM = 0.6 x 1.33 x 40 x 60/4 = 478.8;
    # C = 0.95 x 1300 = 1235; RF = (1235 - 675 - 135) / (1.45 x 478.8) = 425 / 694.26.
    rf = 425 / 694.26
    assert legal["RF"] == pytest.approx(rf, rel=REL_TOL_FLOAT)
    assert (legal["Effect"], legal["Span"], legal["Station"], legal["x (ft)"]) == ("M+", 1, 0.5, 30)
    # Posting: W = 40 kip = 20 tons; (20/0.7)(RF - 0.3).
    assert legal["Posting load (tons)"] == pytest.approx(20 / 0.7 * (rf - 0.3), rel=REL_TOL_FLOAT)
    assert legal["Flag"] == "RF below 1: post at the posting load"
    assert legal["gamma LL"] == 1.45
    design = ratings[ratings["Vehicle"] == "KV-A20"].iloc[0]
    # LL + IM = 239.4: inventory 425 / (1.75 x 239.4), operating 425 / (1.35 x 239.4).
    assert design["RF"] == pytest.approx(425 / (1.75 * 239.4), rel=REL_TOL_FLOAT)
    assert design["RF operating"] == pytest.approx(425 / (1.35 * 239.4), rel=REL_TOL_FLOAT)
    assert pd.isna(design["Flag"])  # RF 1.01: nothing to flag
    assert np.isnan(design["Posting load (tons)"])


def test_a_legal_load_below_0_3_is_flagged_for_closing(tmp_path: Path, make_workbook) -> None:
    args = SIMPLE | {"extra": {"Capacities": [SIMPLE["extra"]["Capacities"][0],
                                              ["KV-0330 G3", 1, 0.5, 1000]]}}  # fmt: skip
    book = make_workbook(tmp_path, **args)
    assert _run("run", str(book), "--no-store")[0] == 0
    legal = pd.read_excel(book, sheet_name="Ratings").iloc[0]
    # (950 - 810) / 694.26 = 0.2017: below 0.3, no posting load, closing considered.
    assert legal["RF"] == pytest.approx(140 / 694.26, rel=REL_TOL_FLOAT)
    assert np.isnan(legal["Posting load (tons)"])
    assert "closing" in legal["Flag"]


@pytest.fixture
def us_results(tmp_path: Path) -> tuple[Path, Path]:
    src = tmp_path / "kvha-inventory.xlsx"
    shutil.copyfile(SAMPLES / src.name, src)
    out = tmp_path / "results.xlsx"
    status, err = _run("run", str(src), "--out", str(out), "--no-store")
    assert status == 0, err
    return src, out


def test_ratings_sheet_holds_the_runs_ratings(us_results: tuple[Path, Path]) -> None:
    src, out = us_results
    case = read_input(src).case
    assert case is not None
    result = run_case(case)
    ratings = pd.read_excel(out, sheet_name="Ratings")
    rated = [m for m in case.members if any(c.member == m.id for c in case.capacities)]
    # The Ratings columns, in order (docs/rating.md, "The sheets").
    contract = ["Member", "Vehicle", "Category", "RF", "Effect", "Span", "Station", "x (ft)"]
    assert list(ratings.columns[:8]) == contract
    assert len(ratings) == len(rated) * len(case.vehicles)
    k = 0
    for member, assessment in zip(case.members, result.assessments, strict=True):
        if assessment.rating is None:
            continue
        for v, vehicle in enumerate(case.vehicles):
            row = ratings.iloc[k]
            k += 1
            assert (row["Member"], row["Vehicle"]) == (member.id, vehicle.id)
            assert row["RF"] == assessment.rating.rf[v]
            weight = weight_in_tons(gross_weight(vehicle, "US"), "US")
            posting = posting_load(row["RF"], weight) if vehicle.category == "legal" else None
            if posting is None:
                assert np.isnan(row["Posting load (tons)"])
            else:
                assert row["Posting load (tons)"] == pytest.approx(posting, rel=REL_TOL_FLOAT)
    # The sample is built to show every outcome (batch/demo/kvha.py).
    assert (ratings["RF"] < 1).any() and (ratings["RF"] >= 1.2).any()
    assert ratings["Posting load (tons)"].notna().any()


def test_rating_matrix_is_coloured_by_band_with_frozen_headers(
    us_results: tuple[Path, Path],
) -> None:
    _, out = us_results
    book = openpyxl.load_workbook(out)
    ws = book["Rating Matrix"]
    assert ws.freeze_panes == "B2"  # one header row, then records; the Member column in view
    ratings = pd.read_excel(out, sheet_name="Ratings")
    vehicles = [c.value for c in ws[1]][1:]
    cells = 0
    for row in ws.iter_rows(min_row=2):
        member = row[0].value
        for cell, vehicle in zip(row[1:], vehicles, strict=True):
            expected = ratings[(ratings["Member"] == member) & (ratings["Vehicle"] == vehicle)]
            assert cell.value == expected["RF"].iloc[0]
            band = [rgb for low, rgb, _ in RF_BANDS if cell.value >= low][-1]
            assert _fill(cell) == band
            cells += 1
    assert cells == len(ratings)
    # The colours' legend is in the Result Guide, beside the matrix's columns.
    guide = pd.read_excel(out, sheet_name="Result Guide")
    meaning = " ".join(guide[guide["Sheet"] == "Rating Matrix"]["Meaning"].astype(str))
    for _, _, words in RF_BANDS:
        assert words in meaning


def test_screening_against_the_reference(us_results: tuple[Path, Path]) -> None:
    src, out = us_results
    case = read_input(src).case
    assert case is not None and case.settings.reference_vehicle == "KVHA-D1"
    matrix = pd.read_excel(out, sheet_name="Screening")
    assert len(matrix) == len(case.members)
    assert (matrix["KVHA-D1"] == 1.0).all()  # the reference against itself
    ws = openpyxl.load_workbook(out)["Screening"]
    for row in ws.iter_rows(min_row=2):
        for cell in row[1:]:
            assert (_fill(cell) == SCREEN_EXCEEDED_RGB) == (cell.value > 1.0)
    detail = pd.read_excel(out, sheet_name="Screening Detail")
    assert len(detail) == len(case.members) * len(case.vehicles)
    assert set(detail["Effect"]) <= {"M+", "M-", "V+", "V-", "R+", "R-"}
    flat = matrix.drop(columns="Member").to_numpy(dtype=float).ravel()
    assert np.array_equal(detail["Ratio"].to_numpy(), flat)


def test_no_rating_sheets_without_capacities_or_reference(tmp_path: Path, make_workbook) -> None:
    book = make_workbook(tmp_path)
    assert _run("run", str(book), "--no-store")[0] == 0
    names = openpyxl.load_workbook(book).sheetnames
    assert not set(ASSESSMENT_SHEETS) & set(names)


def test_si_posting_is_in_tonnes(tmp_path: Path) -> None:
    src = tmp_path / "kvha-si-demo.xlsx"
    shutil.copyfile(SAMPLES / src.name, src)
    status, err = _run("run", str(src), "--no-store")
    assert status == 0, err
    ratings = pd.read_excel(src, sheet_name="Ratings")
    legal = ratings[ratings["Posting load (tonnes)"].notna()].iloc[0]
    # KV-SI-L3: 70 + 75 + 75 = 220 kN = 220 / 9.80665 tonnes.
    weight = 220 / 9.80665
    expected = weight / 0.7 * (legal["RF"] - 0.3)
    assert legal["Posting load (tonnes)"] == pytest.approx(expected, rel=REL_TOL_FLOAT)
    # A second run replaces the rating sheets (they are result sheets) and keeps Capacities.
    assert _run("run", str(src), "--no-store")[0] == 0
    names = openpyxl.load_workbook(src).sheetnames
    assert names.count("Ratings") == 1 and "Capacities" in names


@pytest.mark.parametrize("name", [*ASSESSMENT_SHEETS, "ratings", "RATING MATRIX"])
def test_rating_sheets_are_result_sheets(name: str) -> None:
    assert is_result_sheet_name(name)


def test_a_ratings_table_too_long_for_a_sheet_is_left_to_the_store(tmp_path: Path) -> None:
    # The spreadsheet row limit (here lowered): the long table is left out with a remark in
    # the Run Log, while the matrix (one row per member) still fits.
    case = read_input(SAMPLES / "kvha-inventory.xlsx").case
    assert case is not None
    # (without HS20, whose Impact sheet gives a member more rows than this lowered limit)
    case = dataclasses.replace(case, vehicles=tuple(v for v in case.vehicles if v.id != "HS20"))
    result = run_case(case)
    info = InputInfo(name="case.json", digest="0" * 64, source="json", output="out.xlsx")
    path = tmp_path / "out.xlsx"
    package = result_package(SourcePackage(empty_package(), "out.xlsx"), result, info, max_rows=60)
    atomic_save(package, path)
    wb = openpyxl.load_workbook(path)
    # The rated members x 15 vehicles > 60 rows; the matrix needs one row per rated member + 2;
    # the longest member (3 spans of 15 stations) has 50 rows of dead loads.
    rows = len({c.member for c in case.capacities}) * len(case.vehicles)
    assert rows > 60
    assert "Ratings" not in wb.sheetnames and "Rating Matrix" in wb.sheetnames
    assert "Screening Detail" not in wb.sheetnames and "Screening" in wb.sheetnames
    log = [str(v) for row in wb["Run Log"].iter_rows(values_only=True) for v in row if v]
    assert any(text.startswith(f"Ratings is not written: {rows} rows") for text in log)
