"""A result table as a pandas DataFrame, from the same declarations the sheets are written from.

Each :class:`~batch.writing.declare.ResultTable` (Envelopes, Reactions, Governing,
Ratings, ...) becomes one DataFrame whose columns are the sheet's header titles,
units included (``"M max (kip-ft)"``), and whose rows are the sheet's rows, cell for
cell: the values come from the columns' own ``values`` functions, so a frame and the
sheet the command writes cannot differ. Numbers keep their float64 values bit for
bit; an empty cell is NaN in a number column and missing in a text column; whole
numbers without gaps (span and support numbers) are integers.

``frame.attrs`` records what a notebook needs to read the frame on its own:
``"sheet"`` (the sheet's name), ``"units"`` (the unit of each column that has one,
by title) and ``"meaning"`` (what each column holds, by title). Sign conventions
are the workbook's: sagging moment positive; V the sum of the upward forces left
of the section; reactions upward positive.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

import pandas as pd

from batch.writing.declare import WEIGHT_LABELS, AnyTable, ResultColumn

if TYPE_CHECKING:
    from batch.running.executor import RunResult

__all__ = ["table_frame", "unit_labels"]


def unit_labels(result: RunResult) -> dict[str, str]:
    """The unit label of each result quantity in this run (``moment`` -> ``kip-ft``, ...)."""
    settings = result.case.settings
    return {**settings.unit_labels, "weight": WEIGHT_LABELS[settings.units]}


def _series(col: ResultColumn[Any], values: list[object], title: str) -> pd.Series:
    """One column's values with the type a reader of the sheet would give them."""
    if col.text or not col.number_format:
        # an empty text cell is no cell at all, as a reader of the sheet finds it
        cleaned = [None if v == "" else v for v in values]
        return pd.Series(cleaned, name=title, dtype="str" if col.text else None)
    if any(v is None for v in values):
        return pd.Series([float("nan") if v is None else v for v in values], name=title)
    return pd.Series(values, name=title, dtype="int64" if _whole(values) else "float64")


def _whole(values: list[object]) -> bool:
    return bool(values) and all(isinstance(v, int) and not isinstance(v, bool) for v in values)


def table_frame(table: AnyTable, result: RunResult) -> pd.DataFrame:
    """The rows of ``table`` for ``result`` as a DataFrame, titled as the sheet is.

    Every block of rows is taken (a table longer than one sheet is one frame).
    Columns are in the sheet's order, with units in their titles and in ``attrs``.
    """
    labels = unit_labels(result)
    columns = table.all_columns(result.case)
    cells: list[list[object]] = [[] for _ in columns]
    for block in table.blocks(result):
        for j, col in enumerate(columns):
            cells[j].extend(col.cells(block, labels))
    titles = [col.title(labels) for col in columns]
    frame = pd.concat(
        [_series(col, vals, t) for col, vals, t in zip(columns, cells, titles, strict=True)],
        axis=1,
    )
    frame.columns = pd.Index(titles)
    frame.attrs = {
        "sheet": table.sheet,
        "units": {
            t: labels[c.quantity] for t, c in zip(titles, columns, strict=True) if c.quantity
        },
        "meaning": {t: c.meaning for t, c in zip(titles, columns, strict=True)},
    }
    return frame
