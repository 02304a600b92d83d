"""The Vehicle Summary sheet: what each vehicle does to each member.

One row per member and vehicle: the member's extreme M max, M min, V max, V min
(over all stations) and R max, R min (over all supports) under that vehicle alone,
with the same factors and sign conventions as Envelopes. Written only when it
fits on one sheet; the full table is always in the run's checkpoint store.
"""

from __future__ import annotations

from openpyxl.workbook.workbook import Workbook

from batch.results import FORMAT_VALUE, VEHICLE_SUMMARY_COLUMNS, VEHICLE_SUMMARY_SHEET
from batch.run import RunResult
from batch.writers.sheets import new_result_sheet, write_header_cells, write_value

__all__ = ["write_vehicle_summary"]


def write_vehicle_summary(wb: Workbook, result: RunResult, unit_labels: dict[str, str]) -> bool:
    """Add the Vehicle Summary sheet; False (nothing written) when it would not fit."""
    if result.peaks is None:
        return False
    ws = new_result_sheet(wb, VEHICLE_SUMMARY_SHEET)
    titles = ["Member", "Vehicle"] + [
        f"{name} ({unit_labels[quantity]})" for name, quantity in VEHICLE_SUMMARY_COLUMNS
    ]
    write_header_cells(ws, titles, [16.0, 18.0] + [12.0] * len(VEHICLE_SUMMARY_COLUMNS))
    row = 1
    for member, per_vehicle in zip(result.case.members, result.peaks, strict=True):
        for vehicle, values in zip(result.case.vehicles, per_vehicle, strict=True):
            row += 1
            write_value(ws, row, 1, member.id)
            write_value(ws, row, 2, vehicle.id)
            for j, value in enumerate(values, start=3):
                write_value(ws, row, j, float(value), FORMAT_VALUE)
    ws.auto_filter.ref = f"A1:{ws.cell(row=1, column=len(titles)).column_letter}{row}"
    return True
