"""A run's result sheets, written in order into the input's package.

Results are spliced into the input workbook's own package
(:mod:`batch.writing.package.splice`): every input part is kept byte for byte and the
result sheets are streamed in (:mod:`batch.writing.package.stream`).
:func:`result_package` puts a run's results into a source package, ready for
:func:`batch.writing.package.save.atomic_save`, which puts it on disk atomically.
"""

from __future__ import annotations

from batch.running.executor import RunResult
from batch.writing.charts import write_moment_charts
from batch.writing.columns import (
    CHARTS_SHEET,
    GOVERNING,
    RESULT_TABLES,
    RUN_LOG_SHEET,
    VEHICLE_SUMMARY_SHEET,
)
from batch.writing.package.splice import BookProblem, ResultBook, ResultPackage, SourcePackage
from batch.writing.ratings import write_assessments
from batch.writing.runlog import InputInfo, write_run_log
from batch.writing.summary import write_vehicle_summary
from batch.writing.tables import MAX_DATA_ROWS, write_table

__all__ = [
    "BookProblem",
    "InputInfo",
    "ResultPackage",
    "SourcePackage",
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
    units = settings.unit_labels
    remarks = list(notes)
    for table in RESULT_TABLES:
        written = write_table(book, table, result.envelopes, units, max_rows)
        if len(written.sheets) > 1:
            remarks.append(
                f"{table.sheet} has {written.rows} rows, more than one sheet holds "
                f"({max_rows} below the header); they continue on "
                f"{', '.join(written.sheets[1:])}. A member's rows are never split."
            )
    if not write_vehicle_summary(book, result, units):
        remarks.append(
            f"{VEHICLE_SUMMARY_SHEET}: {result.n_members * result.n_vehicles} member-vehicle "
            "rows are more than one sheet holds; they are in the checkpoint store "
            f"{result.store.name if result.store else '(none: the run used --no-store)'}, "
            "view vehicle_summary."
        )
    remarks += write_assessments(book, result, max_rows)
    charted = write_moment_charts(book, result.envelopes, units, settings.chart_members)
    if charted < result.n_members:
        remarks.append(
            f"{CHARTS_SHEET} shows {charted} of {result.n_members} members; set "
            "'Chart members' in Settings to chart more."
        )
    sheets = (*book.names, RUN_LOG_SHEET)
    write_run_log(book, result, info, sheets, remarks)
    return book.names


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
    notes: tuple[str, ...] = ()
    if source.ours:
        notes = (f"Replaced the result sheets of an earlier run: {', '.join(source.ours)}.",)
    return ResultPackage(
        source,
        lambda book: write_results(book, result, info, notes, max_rows),
        fallback_active=GOVERNING.sheet,
    )
