"""A run's result sheets, written in order into the input's package.

Results are spliced into the input workbook's own package
(:mod:`batch.writing.package.splice`): every input part is kept byte for byte and the
result sheets are streamed in (:mod:`batch.writing.package.stream`).
:func:`result_package` puts a run's results into a source package, ready for
:func:`batch.writing.package.save.atomic_save`, which puts it on disk atomically.
"""

from __future__ import annotations

import weakref

from batch.reading.hidden import hidden_in_part
from batch.running.executor import RunResult
from batch.writing.charts import CHART_SHEETS, write_charts
from batch.writing.columns import (
    GOVERNING,
    RESULT_GUIDE,
    RESULT_TABLES,
    RUN_LOG_SHEET,
    VEHICLE_SUMMARY,
)
from batch.writing.package.splice import BookProblem, ResultBook, ResultPackage, SourcePackage
from batch.writing.runlog import InputInfo, write_run_log
from batch.writing.tables import MAX_DATA_ROWS, write_table

__all__ = [
    "BookProblem",
    "InputInfo",
    "ResultPackage",
    "SourcePackage",
    "replaced_note",
    "result_package",
    "write_results",
]


def write_results(
    book: ResultBook,
    result: RunResult,
    info: InputInfo,
    notes: tuple[str, ...] = (),
    max_rows: int = MAX_DATA_ROWS,
) -> tuple[str, ...]:
    """Write the result sheets of ``result`` into ``book``; returns their names in order.

    ``notes`` (e.g. the result sheets of an earlier run that were replaced) go
    to the Run Log with the writers' own notes. ``max_rows`` is the data-row
    limit of one sheet (smaller only in tests).
    """
    settings = result.case.settings
    remarks = list(notes)
    for table in RESULT_TABLES:
        if table.wanted(result):
            written = write_table(book, table, result, max_rows)
            remarks += [written.remark] if written.remark else []
    if result.peaks is None:
        remarks.append(
            f"{VEHICLE_SUMMARY.sheet}: {result.n_members * result.n_vehicles} member-vehicle "
            "rows are more than one sheet holds; they are in the checkpoint store "
            f"{result.store.name if result.store else '(none: the run used --no-store)'}, "
            "view vehicle_summary."
        )
    rated = result.rated.members
    if 0 < rated < result.n_members:
        remarks.append(
            f"{result.n_members - rated} of {result.n_members} members have no Capacities rows "
            "and are not rated."
        )
    for kind in CHART_SHEETS:
        charted = write_charts(book, kind, result.envelopes, settings)
        if charted < result.n_members:
            remarks.append(
                f"{kind.sheet} shows {charted} of {result.n_members} members; set "
                "'Chart members' in Settings to chart more."
            )
    write_table(book, RESULT_GUIDE, result, max_rows)
    sheets = (*book.names, RUN_LOG_SHEET)
    write_run_log(book, result, info, sheets, remarks)
    return book.names


#: Each source's note, once made: the run and the console both ask, and the result sheets
#: of a large run take seconds to scan.
_REPLACED: weakref.WeakKeyDictionary[SourcePackage, tuple[str, bool]] = weakref.WeakKeyDictionary()


def replaced_note(source: SourcePackage) -> tuple[str, bool] | None:
    """What a run does with the result sheets of an earlier run (None: there are none).

    For the Run Log and the console: the sheets replaced, the rows hidden or filtered
    out in them (the new sheets show every row, unfiltered) and that anything typed
    into them is not kept; and whether any of them had hidden rows or a filter.
    """
    if not source.ours:
        return None
    known = _REPLACED.get(source)
    if known is not None:
        return known
    changed = []
    for sheet in source.sheets:
        if sheet.name not in source.ours or sheet.part is None:
            continue
        seen = hidden_in_part(source.zip, sheet.part, 1)
        hidden, filtered = len(seen.rows), seen.filtered
        if hidden or filtered:
            what = [f"{hidden} hidden row{'s' if hidden != 1 else ''}"] if hidden else []
            changed.append(f"{sheet.name} ({', '.join(what + ['a filter'] * filtered)})")
    views = (
        f" Hidden rows and filters in them are not kept ({'; '.join(changed)}): the new "
        "sheets show every row."
        if changed
        else ""
    )
    text = (
        f"Replaced the result sheets of an earlier run: {', '.join(source.ours)}.{views} "
        "Anything typed into them is not kept; keep your notes on sheets of your own."
    )
    _REPLACED[source] = text, bool(changed)
    return _REPLACED[source]


def result_package(
    source: SourcePackage,
    result: RunResult,
    info: InputInfo,
    max_rows: int = MAX_DATA_ROWS,
) -> ResultPackage:
    """``source`` with the result sheets of ``result`` spliced in (written when saved).

    The Run Log notes which earlier result sheets were replaced. The sheet
    active in ``source`` stays active; if it was an earlier result sheet (or
    there is none), Governing becomes the active sheet.
    """
    note = replaced_note(source)
    notes = () if note is None else (note[0],)
    return ResultPackage(
        source,
        lambda book: write_results(book, result, info, notes, max_rows),
        fallback_active=GOVERNING.sheet,
    )
