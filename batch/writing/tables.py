"""The tabular result sheets (Envelopes, Reactions, Governing), streamed member by member.

Columns come from :mod:`batch.writing.columns`, each declared once. Every sheet gets a
bold header row with units, a frozen header, an autofilter over the data and the
declared widths and number formats (text columns use the text format ``@``).
Text is always written as a text cell, so an id such as ``=cmd|...`` can never
become a live formula.

For each member, the cell holding the member's governing (extreme) value of each
highlighted effect, and its vehicle, position and direction cells in the same
row, get the highlight: the soft amber fill
:data:`~batch.writing.package.styles.HIGHLIGHT_RGB` and bold type. The governing row is
known before the member's rows are written (:func:`batch.engine.effects.governing_row`),
so rows go out strictly top to bottom.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from batch.engine.effects import MemberEnvelope, effect_named, governing_row
from batch.writing.columns import FORMAT_TEXT, ResultColumn, ResultTable
from batch.writing.package.splice import OWNER_MARK, ResultBook
from batch.writing.package.stream import MAX_ROWS, SheetStream
from batch.writing.package.styles import HIGHLIGHT_RGB, CellFormat, StyleSheet, highlighted

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
    """Where a table went: its sheets in order and how many data rows in all."""

    sheets: tuple[str, ...]
    rows: int


def column_format(col: ResultColumn) -> CellFormat:
    """The cell format of a result column's data cells."""
    return CellFormat(number_format=FORMAT_TEXT if col.text else col.number_format)


def write_header(
    ws: SheetStream, columns: Sequence[ResultColumn], unit_labels: dict[str, str]
) -> None:
    """Header row of result columns: titles with units, bold on the header fill, frozen."""
    ws.header([col.title(unit_labels) for col in columns], [col.width for col in columns])


# ---------------------------------------------------------------- tables


def _styles(styles: StyleSheet, columns: Sequence[ResultColumn]) -> tuple[list[int], list[int]]:
    """Each column's plain and highlighted style index."""
    formats = [column_format(col) for col in columns]
    return [styles.xf(f) for f in formats], [styles.xf(highlighted(f)) for f in formats]


def write_table(
    book: ResultBook,
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
    plain, marked = _styles(book.styles, columns)
    effects = {
        effect_named(name): [j for j, col in enumerate(columns) if col.effect == name]
        for name in table.highlights
    }
    sheets: list[str] = []
    on_sheet = total = 0
    expected = sum(len(columns[0].values(env)) for env in envelopes)

    def next_sheet() -> SheetStream:
        name = table.sheet if not sheets else f"{table.sheet} {len(sheets) + 1}"
        rows = min(max_rows, expected - total) + 1
        ws = book.new_sheet(name, rows=rows, columns=len(columns))
        write_header(ws, columns, unit_labels)
        ws.autofilter = True
        sheets.append(name)
        return ws

    ws = next_sheet()
    for env in envelopes:
        block = [col.values(env) for col in columns]
        n = len(block[0])
        if any(len(values) != n for values in block):
            raise ValueError(f"{table.sheet}: columns of member {env.member!r} differ in length")
        if n > max_rows:
            raise ValueError(f"member {env.member!r} has more rows than one sheet holds")
        if on_sheet + n > max_rows:
            ws = next_sheet()
            on_sheet = 0
        marks: dict[tuple[int, int], int] = {}
        for effect, cols in effects.items():
            i = governing_row(effect, env)
            if i is not None:
                marks.update({(i, j): marked[j] for j in cols})
        ws.block(block, plain, marks)
        on_sheet += n
        total += n
    return WrittenTable(sheets=tuple(sheets), rows=total)
