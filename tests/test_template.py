"""The blank input workbook: built from batch/model/case.py, faithful to docs/workbook.md.

Reference for the expected sheet, column and setting names: docs/workbook.md, this
repository's specification of the workbook (sections "Input sheets" and "The
command"), copied below as plain lists so that a change to batch/model/case.py that
breaks it fails here.
"""

from __future__ import annotations

import os
from pathlib import Path

import openpyxl
import pytest
from generated_workbooks import assert_same_workbook, read_input_or_skip

from batch.model import UNIT_LABELS
from batch.model.declare import header_key
from batch.model.sheets import INPUT_SHEETS, MEMBERS, SETTING_ROWS, VEHICLES
from batch.writing.printing import wrapped_lines
from batch.writing.template import GUIDE_SHEET, write_template

COMMITTED = Path(__file__).resolve().parent.parent / "templates" / "spanfleet-template.xlsx"

# docs/workbook.md, "Input sheets": the columns each sheet must accept.
CONTRACT_COLUMNS = {
    "Settings": ["Setting", "Value"],
    "Members": [
        "Member", "Spans", "Hinges", "Span EI", "DF moment", "DF shear", "DC load", "DW load",
        "Condition factor", "System factor", "Description",
    ],
    "Vehicles": [
        "Vehicle", "Axle loads", "Axle spacings", "Lane load", "Load multiplier", "Library",
        "Category", "Description",
    ],
    "Capacities": [
        "Member", "Span", "Station", "Resistance M+", "Resistance M-", "Resistance V", "DC M",
        "DW M", "DC V", "DW V",
    ],
}  # fmt: skip
# docs/workbook.md, "Settings": name -> default.
CONTRACT_SETTINGS = {
    "Units": "US",
    "Directions": "both",
    "Stations per span": 10,
    "Dynamic load allowance": 0.33,
}
# docs/workbook.md ("Input sheets", "The blank workbook"): the fixed sets of values,
# offered as drop-down lists.
CONTRACT_CHOICES = {
    "Units": ["US", "SI"],
    "Directions": ["both", "left-to-right", "right-to-left"],
    "Category": ["design", "legal", "permit"],
}


@pytest.fixture
def template(tmp_path: Path) -> Path:
    path = tmp_path / "blank.xlsx"
    write_template(path)
    return path


def _headers(ws: openpyxl.worksheet.worksheet.Worksheet) -> list[str]:
    return [c.value for c in ws[1] if c.value is not None]


def _list_choices(ws: openpyxl.worksheet.worksheet.Worksheet, coordinate: str) -> list[str]:
    """The drop-down values offered in one cell (empty when it has none)."""
    for dv in ws.data_validations.dataValidation:
        if dv.type == "list" and coordinate in dv.sqref:
            return dv.formula1.strip('"').split(",")
    return []


def test_regenerated_template_equals_the_committed_file(template: Path) -> None:
    assert_same_workbook(template, COMMITTED)


def test_regeneration_is_byte_for_byte_repeatable(tmp_path: Path) -> None:
    first, second = tmp_path / "a.xlsx", tmp_path / "b.xlsx"
    write_template(first)
    write_template(second)
    assert first.read_bytes() == second.read_bytes()


def test_sheets_in_order_with_the_guide_first(template: Path) -> None:
    names = openpyxl.load_workbook(template).sheetnames
    assert names == [GUIDE_SHEET, *(sheet.name for sheet in INPUT_SHEETS)]


def test_headers_are_exactly_the_declared_ones_with_us_units(template: Path) -> None:
    wb = openpyxl.load_workbook(template)
    for sheet in INPUT_SHEETS:
        expected = [
            f"{c.header} ({UNIT_LABELS['US'][c.quantity]})" if c.quantity else c.header
            for c in sheet.columns
        ]
        assert _headers(wb[sheet.name]) == expected, sheet.name


def test_headers_cover_the_contract_columns(template: Path) -> None:
    wb = openpyxl.load_workbook(template)
    for sheet, columns in CONTRACT_COLUMNS.items():
        keys = [header_key(h) for h in _headers(wb[sheet])]
        assert keys[: len(columns)] == [header_key(c) for c in columns], sheet


def test_settings_rows_hold_the_contract_defaults(template: Path) -> None:
    ws = openpyxl.load_workbook(template)["Settings"]
    values = {row[0]: row[1] for row in ws.iter_rows(min_row=2, values_only=True)}
    assert [row.header for row in SETTING_ROWS] == list(values)
    for name, default in CONTRACT_SETTINGS.items():
        assert values[name] == default, name


def test_fixed_sets_are_drop_down_lists(template: Path) -> None:
    wb = openpyxl.load_workbook(template)
    settings = wb["Settings"]
    for row in range(2, settings.max_row + 1):
        name = settings.cell(row=row, column=1).value
        if name in CONTRACT_CHOICES:
            assert _list_choices(settings, f"B{row}") == CONTRACT_CHOICES[name], name
    vehicles = wb["Vehicles"]
    column = _headers(vehicles).index("Category") + 1
    letter = openpyxl.utils.get_column_letter(column)
    for row in (2, 3, 500, 1_048_576):  # the example row and rows an engineer adds later
        assert _list_choices(vehicles, f"{letter}{row}") == CONTRACT_CHOICES["Category"]


def test_every_documented_header_has_a_note_with_both_units(template: Path) -> None:
    wb = openpyxl.load_workbook(template)
    for sheet in INPUT_SHEETS:
        for cell, column in zip(wb[sheet.name][1], sheet.columns, strict=True):
            if not column.meaning:
                continue
            assert cell.comment is not None, f"{sheet.name}!{cell.coordinate}"
            note = cell.comment.text
            assert column.meaning in note
            if column.quantity:
                for system in ("US", "SI"):
                    assert UNIT_LABELS[system][column.quantity] in note, (cell.coordinate, system)


def test_one_marked_example_row_per_input_sheet(template: Path) -> None:
    wb = openpyxl.load_workbook(template)
    ids = {}
    for sheet in INPUT_SHEETS[1:]:
        ws = wb[sheet.name]
        rows = [
            r for r in ws.iter_rows(min_row=2, values_only=True) if any(v is not None for v in r)
        ]
        assert len(rows) == 1, sheet.name
        row = dict(zip(_headers(ws), rows[0], strict=False))
        if "Description" in row:
            assert row["Description"].startswith("EXAMPLE"), sheet.name
        ids[sheet.name] = rows[0][0]
    # The Capacities example must name the Members example, or it could not be read.
    assert ids["Capacities"] == ids["Members"]


def test_header_rows_are_frozen_and_columns_sized(template: Path) -> None:
    wb = openpyxl.load_workbook(template)
    for sheet in INPUT_SHEETS:
        ws = wb[sheet.name]
        assert ws.freeze_panes is not None and ws.freeze_panes[-1] == "2", sheet.name
        for j, header in enumerate(_headers(ws), start=1):
            width = ws.column_dimensions[openpyxl.utils.get_column_letter(j)].width
            # a long header wraps in its cell, the header row tall enough for its lines
            wraps = ws.cell(row=1, column=j).alignment.wrap_text
            tall = (ws.row_dimensions[1].height or 15) >= 15 * wrapped_lines(header, width)
            assert width >= min(len(header), 60) or (wraps and tall), (sheet.name, header)


def test_guide_sheet_gives_steps_conventions_and_cautions(template: Path) -> None:
    ws = openpyxl.load_workbook(template)[GUIDE_SHEET]
    text = "\n".join(str(c.value) for c in ws["A"] if c.value)
    for phrase in ("spanfleet check", "spanfleet run", "sagging", "licensed", "line girder"):
        assert phrase in text, phrase


def test_fixed_document_properties(template: Path) -> None:
    props = openpyxl.load_workbook(template).properties
    assert props.creator == "spanfleet"
    assert props.created == props.modified


def test_an_existing_file_is_never_overwritten(tmp_path: Path) -> None:
    path = tmp_path / "filled.xlsx"
    path.write_bytes(b"an engineer's filled workbook")
    with pytest.raises(FileExistsError, match="already exists"):
        write_template(path)
    assert path.read_bytes() == b"an engineer's filled workbook"


def test_a_name_that_is_not_xlsx_is_refused(tmp_path: Path) -> None:
    with pytest.raises(ValueError, match=r"\.xlsx"):
        write_template(tmp_path / "blank.xls")
    assert list(tmp_path.iterdir()) == []


def test_a_missing_folder_is_named(tmp_path: Path) -> None:
    with pytest.raises(FileNotFoundError, match="no such folder"):
        write_template(tmp_path / "absent" / "blank.xlsx")


def test_a_failed_save_leaves_the_old_file_and_no_debris(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    path = tmp_path / "blank.xlsx"
    write_template(path)
    before = path.read_bytes()

    def refuse(*_: object) -> None:
        raise OSError("disk full")

    monkeypatch.setattr(os, "replace", refuse)
    with pytest.raises(OSError, match="disk full"):
        write_template(path, overwrite=True)
    assert path.read_bytes() == before
    assert [p.name for p in tmp_path.iterdir()] == ["blank.xlsx"]


def test_template_reads_back_without_problems(template: Path) -> None:
    report = read_input_or_skip()(template)
    assert [p.render() for p in report.problems] == []
    # Any warning means the template itself needs fixing (its Capacities example included).
    assert [p.render() for p in report.warnings] == []
    assert report.case is not None
    assert [c.member for c in report.case.capacities] == [MEMBERS.columns[0].example]
    assert [m.id for m in report.case.members] == [MEMBERS.columns[0].example]
    assert [v.id for v in report.case.vehicles] == [VEHICLES.columns[0].example]
