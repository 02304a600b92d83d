"""The tabular result sheets (Envelopes, Reactions, Governing) and their cell styles.

Columns come from :mod:`batch.results`, each declared once. Every sheet gets a
bold header row with units, a frozen header, an autofilter over the data and the
declared widths and number formats. Text is always written as a text cell, so an
id such as ``=cmd|...`` can never become a live formula.

For each member, the cell holding the member's governing (extreme) value of each
highlighted effect, and its vehicle, position and direction cells in the same
row, get :data:`HIGHLIGHT_FILL` (a soft amber) and bold type.

Every sheet spanfleet writes carries a hidden sheet-level defined name
:data:`OWNER_MARK`; a later run removes only sheets that have a result name and
this mark, so an engineer's own sheet that happens to share a name is never lost.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from openpyxl.cell.cell import ILLEGAL_CHARACTERS_RE, Cell
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter, quote_sheetname
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.workbook.workbook import Workbook
from openpyxl.worksheet.worksheet import Worksheet

from batch.engine import MemberEnvelope
from batch.results import ResultColumn, ResultTable, effect_named, governing_row

__all__ = [
    "HEADER_FILL",
    "HIGHLIGHT_FILL",
    "HIGHLIGHT_RGB",
    "MAX_DATA_ROWS",
    "OWNER_MARK",
    "WrittenTable",
    "new_result_sheet",
    "write_header",
    "write_header_cells",
    "write_table",
    "write_value",
]

#: Data rows that fit on one sheet below the header (1,048,576 rows in all).
MAX_DATA_ROWS = 1_048_575

#: Hidden sheet-level defined name that marks a sheet as written by spanfleet.
OWNER_MARK = "spanfleet_result"

HIGHLIGHT_RGB = "FFE3B3"  # soft amber: the governing value of an effect
HIGHLIGHT_FILL = PatternFill(fill_type="solid", fgColor=HIGHLIGHT_RGB)
HIGHLIGHT_FONT = Font(bold=True)
HEADER_FILL = PatternFill(fill_type="solid", fgColor="D3E1E8")  # pale slate
HEADER_FONT = Font(bold=True)
HEADER_ALIGN = Alignment(wrap_text=True, vertical="center")


@dataclass(frozen=True, kw_only=True)
class WrittenTable:
    """Where a table went: its sheets in order and how many data rows in all."""

    sheets: tuple[str, ...]
    rows: int


class SheetNameTaken(Exception):
    """A sheet of the same name (ignoring case) exists and is not spanfleet's."""


def new_result_sheet(wb: Workbook, name: str) -> Worksheet:
    """Append an empty sheet called ``name``, marked as written by spanfleet.

    Raises :class:`SheetNameTaken` when a sheet of that name (in any case)
    already exists: spreadsheet programs treat such names as the same sheet.
    """
    if any(title.lower() == name.lower() for title in wb.sheetnames):
        raise SheetNameTaken(name)
    ws = wb.create_sheet(name)
    ws.defined_names[OWNER_MARK] = DefinedName(
        OWNER_MARK, attr_text=f"{quote_sheetname(name)}!$A$1", hidden=True
    )
    return ws


def write_value(
    ws: Worksheet, row: int, col: int, value: object, number_format: str = "", text: bool = False
) -> Cell:
    """Write one cell; strings are always text cells (never formulas).

    Characters a workbook cannot hold (control characters) are dropped.
    """
    if isinstance(value, str):
        value = ILLEGAL_CHARACTERS_RE.sub("", value)
    cell = ws.cell(row=row, column=col, value=value)
    if isinstance(value, str):
        cell.data_type = "s"
    if number_format and value is not None and not text:
        cell.number_format = number_format
    return cell


def write_header_cells(ws: Worksheet, titles: Sequence[str], widths: Sequence[float]) -> None:
    """Bold, filled header row; each column at least its width or its title's; row 1 frozen."""
    for j, (title, width) in enumerate(zip(titles, widths, strict=True), start=1):
        cell = write_value(ws, 1, j, title)
        cell.font = HEADER_FONT
        cell.fill = HEADER_FILL
        cell.alignment = HEADER_ALIGN
        fit = max(width, len(title) * 0.9 + 2)
        ws.column_dimensions[get_column_letter(j)].width = round(fit, 1)
    ws.freeze_panes = "A2"


def write_header(
    ws: Worksheet, columns: Sequence[ResultColumn], unit_labels: dict[str, str]
) -> None:
    """Header row of result columns, titles with units (see :func:`write_header_cells`)."""
    titles = [col.title(unit_labels) for col in columns]
    write_header_cells(ws, titles, [col.width for col in columns])


def _finish(ws: Worksheet, n_cols: int, last_row: int) -> None:
    ws.auto_filter.ref = f"A1:{get_column_letter(n_cols)}{max(last_row, 1)}"


def _highlight(ws: Worksheet, row: int, cols: Sequence[int]) -> None:
    for j in cols:
        cell = ws.cell(row=row, column=j)
        cell.fill = HIGHLIGHT_FILL
        cell.font = HIGHLIGHT_FONT


def _member_block(table: ResultTable, env: MemberEnvelope) -> list[list[object]]:
    """One member's rows of ``table``, column values zipped into rows."""
    columns = [col.values(env) for col in table.columns]
    sizes = {len(values) for values in columns}
    if len(sizes) != 1:
        raise ValueError(f"{table.sheet}: columns of member {env.member!r} differ in length")
    return [list(row) for row in zip(*columns, strict=True)]


def write_table(
    wb: Workbook,
    table: ResultTable,
    envelopes: Sequence[MemberEnvelope],
    unit_labels: dict[str, str],
    max_rows: int = MAX_DATA_ROWS,
) -> WrittenTable:
    """Write ``table`` for every member, continuing on ``<sheet> 2``, … past ``max_rows``.

    A member's rows always stay together on one sheet. Returns the sheets
    written and the row count.
    """
    columns = table.columns
    marked = {
        name: [j for j, col in enumerate(columns, start=1) if col.effect == name]
        for name in table.highlights
    }
    sheets: list[Worksheet] = []
    row = 1
    total = 0

    def next_sheet() -> Worksheet:
        name = table.sheet if not sheets else f"{table.sheet} {len(sheets) + 1}"
        ws = new_result_sheet(wb, name)
        write_header(ws, columns, unit_labels)
        sheets.append(ws)
        return ws

    ws = next_sheet()
    for env in envelopes:
        block = _member_block(table, env)
        if len(block) > max_rows:
            raise ValueError(f"member {env.member!r} has more rows than one sheet holds")
        if row - 1 + len(block) > max_rows:
            _finish(ws, len(columns), row)
            ws = next_sheet()
            row = 1
        first = row + 1
        for values in block:
            row += 1
            for j, (col, value) in enumerate(zip(columns, values, strict=True), start=1):
                if value is not None:
                    write_value(ws, row, j, value, col.number_format, col.text)
        total += len(block)
        for name, cols in marked.items():
            i = governing_row(effect_named(name), env)
            if i is not None:
                _highlight(ws, first + i, cols)
    _finish(ws, len(columns), row)
    return WrittenTable(sheets=tuple(s.title for s in sheets), rows=total)
