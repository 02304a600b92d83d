"""Page setup of every sheet spanfleet writes, read back with openpyxl (no printing here).

tests/test_print.py prints the sample with LibreOffice and checks the result on paper;
this file checks the declarations a spreadsheet program prints from, quickly:
``pageSetup`` (paper, orientation, fit), ``pageSetUpPr fitToPage``, the header codes
and the ``_xlnm.Print_Titles`` and ``_xlnm.Print_Area`` names (ECMA-376 Part 1,
§18.3.1.63, §18.3.1.65, §18.3.1.36 and §18.2.5). Paper codes: 1 Letter, 9 A4 (the
same clause's table of paperSize values).
"""

from __future__ import annotations

import io
from pathlib import Path

import pytest
from openpyxl import load_workbook

from batch.model import Case, Member, Settings, Vehicle
from batch.running.executor import run_case
from batch.writing.package.save import atomic_save
from batch.writing.package.splice import SourcePackage, empty_package
from batch.writing.printing import MIN_SCALE, PAPERS, page_setup, wrapped_height, wrapped_lines
from batch.writing.results import result_package
from batch.writing.runlog import InputInfo
from batch.writing.template import write_template

PAPER_CODES = {"US": 1, "SI": 9}


def _results(tmp_path: Path, units: str) -> object:
    case = Case(
        settings=Settings(units=units, stations_per_span=4, reference_vehicle="KVHA tandem"),
        members=(Member(id="KV-0101 G1", spans=(20.0, 25.0)),),
        vehicles=(Vehicle(id="KVHA tandem", axle_loads=(25.0,)),),
    )
    info = InputInfo(name="case.json", digest="0" * 64, source="json", output="out.xlsx")
    path = tmp_path / "out.xlsx"
    atomic_save(
        result_package(SourcePackage(empty_package(), "out.xlsx"), run_case(case), info), path
    )
    return load_workbook(io.BytesIO(path.read_bytes()))


@pytest.mark.parametrize("units", ["US", "SI"])
def test_every_result_sheet_prints_fitted_with_titles_and_header(
    tmp_path: Path, units: str
) -> None:
    wb = _results(tmp_path, units)
    for ws in wb.worksheets:
        assert ws.sheet_properties.pageSetUpPr.fitToPage, ws.title
        assert int(ws.page_setup.paperSize) == PAPER_CODES[units], ws.title
        assert int(ws.page_setup.fitToHeight) == 0, ws.title  # as many pages down as rows take
        header = str(ws.oddHeader)
        assert all(code in header for code in ("&F", "&A", "&P", "&N")), (ws.title, header)
        if ws.title.endswith("Charts"):
            # only the charts print, two a page, no row repeated
            assert ws.print_area and ws.print_title_rows is None, ws.title
        else:
            assert ws.print_title_rows == "$1:$1", ws.title


def test_a_wide_sheet_spans_pages_with_its_identifying_columns_repeated(tmp_path: Path) -> None:
    wb = _results(tmp_path, "US")
    envelopes = wb["Envelopes"]
    assert envelopes.page_setup.orientation == "landscape"
    assert int(envelopes.page_setup.fitToWidth) >= 2
    assert envelopes.print_title_cols == "$A:$D"  # Member, Span, Station, x
    reactions = wb["Reactions"]
    assert int(reactions.page_setup.fitToWidth) == 1 and reactions.print_title_cols is None


def test_page_setup_keeps_the_print_at_or_above_the_smallest_scale() -> None:
    for units, paper in PAPERS.items():
        printable = paper.height_in - 1.4
        for n in (1, 5, 12, 30, 60):
            widths = [12.0] * n
            page = page_setup(widths, 1, units)
            inches = sum(widths) * 7 / 96
            if not page.landscape:
                assert inches <= paper.width_in - 1.4
            # the repeated column is printed on every page across
            across = inches + (page.pages_wide - 1) * 12 * 7 / 96
            assert printable * page.pages_wide / across >= MIN_SCALE * 0.999 or page.pages_wide == 1


def test_wrapped_rows_are_tall_enough_for_their_lines() -> None:
    text = "word " * 40  # 200 characters
    assert wrapped_lines(text, 50) >= 4
    assert wrapped_lines("short", 50) == 1
    assert wrapped_lines("one\ntwo\nthree", 50) == 3
    assert wrapped_height([("short", 50)]) == 0  # the default height serves
    assert wrapped_height([(text, 50), ("short", 10)]) == 15 * wrapped_lines(text, 50)


def test_the_template_prints_each_sheet_to_the_page_width(tmp_path: Path) -> None:
    path = tmp_path / "template.xlsx"
    write_template(path)
    wb = load_workbook(path)
    for ws in wb.worksheets:
        assert ws.sheet_properties.pageSetUpPr.fitToPage and int(ws.page_setup.fitToWidth) == 1
    guide = wb["Start Here"]
    # every wrapped paragraph has a row tall enough for it
    for row in guide.iter_rows(min_col=1, max_col=1):
        cell = row[0]
        if (
            isinstance(cell.value, str)
            and wrapped_lines(cell.value, guide.column_dimensions["A"].width) > 1
        ):
            assert guide.row_dimensions[cell.row].height >= 15 * wrapped_lines(
                cell.value, guide.column_dimensions["A"].width
            )
