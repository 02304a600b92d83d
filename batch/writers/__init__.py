"""Writers: the result sheets, the moment charts, the Run Log, and the safe save.

:func:`write_results` adds every result sheet of a run to an open workbook;
:func:`batch.writers.preserve.open_book` prepares an input workbook for them and
:func:`batch.writers.save.atomic_save` puts the workbook on disk atomically.
"""

from __future__ import annotations

from openpyxl.workbook.workbook import Workbook

from batch.results import CHARTS_SHEET, RESULT_TABLES, RUN_LOG_SHEET, VEHICLE_SUMMARY_SHEET
from batch.run import RunResult
from batch.writers.charts import write_moment_charts
from batch.writers.runlog import InputInfo, write_run_log
from batch.writers.sheets import MAX_DATA_ROWS, write_table
from batch.writers.summary import write_vehicle_summary

__all__ = ["InputInfo", "select_sheet", "write_results"]


def select_sheet(wb: Workbook, title: str) -> None:
    """Make ``title`` the active sheet, and the only selected one (no grouped sheets)."""
    target = wb[title]
    wb.active = wb.index(target)
    for ws in wb.worksheets:
        ws.sheet_view.tabSelected = ws is target


def write_results(
    wb: Workbook,
    result: RunResult,
    info: InputInfo,
    notes: tuple[str, ...] = (),
    max_rows: int = MAX_DATA_ROWS,
) -> tuple[str, ...]:
    """Add the result sheets of ``result`` to ``wb``; returns their names in workbook order.

    ``notes`` (e.g. the result sheets of an earlier run that were replaced) go
    to the Run Log with the writers' own notes. ``max_rows`` is the data-row
    limit of one sheet (smaller only in tests).
    """
    settings = result.case.settings
    units = settings.unit_labels
    sheets: list[str] = []
    remarks = list(notes)
    for table in RESULT_TABLES:
        written = write_table(wb, table, result.envelopes, units, max_rows)
        sheets.extend(written.sheets)
        if len(written.sheets) > 1:
            remarks.append(
                f"{table.sheet} has {written.rows} rows, more than one sheet holds "
                f"({max_rows} below the header); they continue on "
                f"{', '.join(written.sheets[1:])}. A member's rows are never split."
            )
    if write_vehicle_summary(wb, result, units):
        sheets.append(VEHICLE_SUMMARY_SHEET)
    else:
        remarks.append(
            f"{VEHICLE_SUMMARY_SHEET}: {result.n_members * result.n_vehicles} member-vehicle "
            "rows are more than one sheet holds; they are in the checkpoint store "
            f"{result.store.name if result.store else '(none: the run used --no-store)'}, "
            "view vehicle_summary."
        )
    charted = write_moment_charts(wb, result.envelopes, units, settings.chart_members)
    if charted:
        sheets.append(CHARTS_SHEET)
    if charted < result.n_members:
        remarks.append(
            f"{CHARTS_SHEET} shows {charted} of {result.n_members} members; set "
            "'Chart members' in Settings to chart more."
        )
    sheets.append(RUN_LOG_SHEET)
    write_run_log(wb, result, info, sheets, remarks)
    return tuple(sheets)
