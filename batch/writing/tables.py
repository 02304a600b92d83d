"""Every declared result sheet, streamed block by block (one member at a time).

The tables and their columns come from :mod:`batch.writing.columns`, each declared
once. Every sheet gets one bold header row with units, frozen with the table's
identifying columns, an autofilter over the data, the declared widths and
number formats (text columns use the text format ``@``; wrapped columns give their
rows the height their text needs) and a page setup (:mod:`batch.writing.printing`).
Text is always written as a text cell, so an id such as ``=cmd|...`` can never
become a live formula.

For each member, the cell holding the member's governing (extreme) value of each
highlighted effect, and its vehicle, position and direction cells in the same
row, get the highlight: the soft amber fill
:data:`~batch.writing.package.styles.HIGHLIGHT_RGB` and bold type. A column with a
``fill`` rule colours each cell by its value (rating factors by band). The marks
of a block are known before its rows are written, so rows go out strictly top to
bottom.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from batch.model.units import UnitSystem
from batch.writing.declare import FORMAT_TEXT, WEIGHT_LABELS, AnyTable, ResultColumn
from batch.writing.package.splice import OWNER_MARK, ResultBook
from batch.writing.package.stream import MAX_COLUMNS, MAX_ROWS, SheetStream, header_widths
from batch.writing.package.styles import HIGHLIGHT_RGB, CellFormat, StyleSheet, highlighted
from batch.writing.printing import page_setup, wrapped_height

if TYPE_CHECKING:
    from batch.running.executor import RunResult

__all__ = [
    "HIGHLIGHT_RGB",
    "MAX_DATA_ROWS",
    "OWNER_MARK",
    "WrittenTable",
    "column_format",
    "write_header",
    "write_table",
]

#: Data rows that fit on one sheet below the header.
MAX_DATA_ROWS = MAX_ROWS - 1


@dataclass(frozen=True, kw_only=True)
class WrittenTable:
    """Where a table went: its sheets in order and how many data rows in all.

    ``remark`` says, for the Run Log, why a table was not written (or how it
    continued); empty when there is nothing to say.
    """

    sheets: tuple[str, ...]
    rows: int
    remark: str = ""


def column_format(col: ResultColumn[Any]) -> CellFormat:
    """The cell format of a result column's data cells.

    Wrapped ones are aligned to the top; text is indented a step, so that it never
    touches the right-aligned number of the column before it.
    """
    return CellFormat(
        number_format=FORMAT_TEXT if col.text else col.number_format,
        wrap=col.wrap,
        vertical="top" if col.wrap else None,
        indent=1 if col.text else 0,
    )


def write_header(
    ws: SheetStream,
    columns: Sequence[ResultColumn[Any]],
    unit_labels: Mapping[str, str],
    units: UnitSystem,
    frozen_columns: int = 0,
) -> None:
    """Page setup, then the header row: titles with units, bold on the header fill, frozen.

    The header row is tall enough for a title that wraps. The page setup
    (:func:`batch.writing.printing.page_setup`) is for the paper of ``units``.
    """
    titles = [col.title(unit_labels) for col in columns]
    widths = header_widths(titles, [col.width for col in columns])
    frozen = min(frozen_columns, len(columns))
    ws.page = page_setup(widths, frozen, units)
    ws.header(titles, widths, frozen, wrapped_height(list(zip(titles, widths, strict=True))))


def _heights(
    columns: Sequence[ResultColumn[Any]], cells: Sequence[Sequence[object]]
) -> list[float]:
    """Each row's height for its wrapped columns' text (0: the default height)."""
    wrapped = [j for j, col in enumerate(columns) if col.wrap]
    return [
        wrapped_height([(str(cells[j][i] or ""), columns[j].width) for j in wrapped])
        for i in range(len(cells[0]))
    ]


class _Styles:
    """Each column's plain and highlighted style index, and its fills, made once per sheet."""

    def __init__(self, styles: StyleSheet, columns: Sequence[ResultColumn[Any]]) -> None:
        self.sheet = styles
        self.formats = [column_format(col) for col in columns]
        self.plain = [styles.xf(f) for f in self.formats]
        self.marked = [styles.xf(highlighted(f)) for f in self.formats]
        self._filled: dict[tuple[int, str], int] = {}

    def filled(self, j: int, rgb: str) -> int:
        key = (j, rgb)
        if key not in self._filled:
            fmt = self.formats[j]
            self._filled[key] = self.sheet.xf(dataclasses.replace(fmt, fill=rgb))
        return self._filled[key]


def _marks(
    table: AnyTable,
    columns: Sequence[ResultColumn[Any]],
    block: object,
    cells: Sequence[Sequence[object]],
    styles: _Styles,
) -> dict[tuple[int, int], int]:
    """Cells of one block with a style of their own: fills by value, then highlights."""
    marks: dict[tuple[int, int], int] = {}
    for j, col in enumerate(columns):
        if col.fill is not None:
            for i, value in enumerate(cells[j]):
                rgb = col.fill(value)
                if rgb is not None:
                    marks[i, j] = styles.filled(j, rgb)
    for name, rule in table.highlights.items():
        row = rule(block)
        if row is not None:
            marks.update(
                {(row, j): styles.marked[j] for j, c in enumerate(columns) if c.highlight == name}
            )
    return marks


def _sheet_rows(
    table: AnyTable,
    columns: Sequence[ResultColumn[Any]],
    result: RunResult,
    units: Mapping[str, str],
    max_rows: int,
) -> list[int]:
    """The data rows of each sheet of a table that continues: whole blocks, in order."""
    sizes = [0]
    for block in table.blocks(result):
        n = len(columns[0].cells(block, units))
        if sizes[-1] + n > max_rows and sizes[-1]:
            sizes.append(0)
        sizes[-1] += n
    return sizes


def write_table(
    book: ResultBook, table: AnyTable, result: RunResult, max_rows: int = MAX_DATA_ROWS
) -> WrittenTable:
    """Write ``table`` for ``result``; past ``max_rows`` it continues on ``<sheet> 2``, ….

    A member's rows always stay together on one sheet. A table whose overflow is
    ``store`` is left out instead when it does not fit on one sheet (rows or
    columns), with a remark. Returns the sheets written and the row count.
    """
    case = result.case
    columns = table.all_columns(case)
    expected = table.rows(result)
    too_big = expected > max_rows and table.overflow == "store"
    if too_big or len(columns) > MAX_COLUMNS:
        return WrittenTable(
            sheets=(),
            rows=0,
            remark=f"{table.sheet} is not written: {expected} rows of {len(columns)} columns are "
            "more than a sheet holds; its numbers are in the checkpoint store "
            f"{result.store.name if result.store else '(none: the run used --no-store)'}.",
        )
    units = {**case.settings.unit_labels, "weight": WEIGHT_LABELS[case.settings.units]}
    styles = _Styles(book.styles, columns)
    # Each sheet's data rows, known before it is started (its dimension): all of them on
    # one sheet, or, for a table that continues, counted block by block beforehand.
    sizes = _sheet_rows(table, columns, result, units, max_rows) if expected > max_rows else []
    sheets: list[str] = []
    on_sheet = total = 0

    def next_sheet() -> SheetStream:
        name = table.sheet if not sheets else f"{table.sheet} {len(sheets) + 1}"
        rows = (sizes[len(sheets)] if sizes else expected) + 1
        ws = book.new_sheet(name, rows=rows, columns=len(columns), exact=True)
        write_header(ws, columns, units, case.settings.units, table.frozen_columns)
        ws.autofilter = True
        sheets.append(name)
        return ws

    ws = next_sheet()
    for block in table.blocks(result):
        cells = [col.cells(block, units) for col in columns]
        n = len(cells[0])
        if any(len(values) != n for values in cells):
            raise ValueError(f"{table.sheet}: the columns of one member's rows differ in length")
        if n > max_rows:
            raise ValueError(f"{table.sheet}: one member has more rows than one sheet holds")
        if sizes and on_sheet + n > sizes[len(sheets) - 1]:  # the sheet is full
            ws = next_sheet()
            on_sheet = 0
        heights = _heights(columns, cells) if any(col.wrap for col in columns) else None
        ws.block(cells, styles.plain, _marks(table, columns, block, cells, styles), heights)
        on_sheet += n
        total += n
    remark = ""
    if len(sheets) > 1:
        remark = (
            f"{table.sheet} has {total} rows, more than one sheet holds ({max_rows} below the "
            f"header); they continue on {', '.join(sheets[1:])}. A member's rows are never split."
        )
    return WrittenTable(sheets=tuple(sheets), rows=total, remark=remark)
