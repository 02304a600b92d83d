"""Generated parts of the documentation are current (scripts/generate.py writes them).

docs/workbook.md states the input sheets; its tables are generated from the column
declarations of batch/model/case.py, so a column added in code cannot be missing
from the specification that engineers and scripts read.
"""

from __future__ import annotations

from generate import WORKBOOK_DOC, input_sheet_tables, workbook_doc


def test_workbook_doc_tables_are_current() -> None:
    current = WORKBOOK_DOC.read_text("utf-8")
    assert workbook_doc(current) == current, "run `python scripts/generate.py` and commit"


def test_every_input_column_is_in_the_workbook_doc() -> None:
    from batch.model.sheets import INPUT_SHEETS, SETTING_ROWS, SETTINGS

    tables = input_sheet_tables()
    for sheet in INPUT_SHEETS:
        assert f"### {sheet.name}" in tables
        for col in SETTING_ROWS if sheet is SETTINGS else sheet.columns:
            assert f"| {col.header} |" in tables, (sheet.name, col.header)
