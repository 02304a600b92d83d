"""The Vehicle Summary sheet: what each vehicle does to each member.

One row per member and vehicle: the member's extreme M max, M min, V max, V min
(over all stations) and R max, R min (over all supports) under that vehicle alone,
with the same factors and sign conventions as Envelopes. Written only when it
fits on one sheet; the full table is always in the run's checkpoint store.
"""

from __future__ import annotations

from batch.running.executor import RunResult
from batch.writing.columns import (
    FORMAT_TEXT,
    FORMAT_VALUE,
    VEHICLE_SUMMARY_COLUMNS,
    VEHICLE_SUMMARY_SHEET,
)
from batch.writing.package.splice import ResultBook
from batch.writing.package.styles import CellFormat

__all__ = ["write_vehicle_summary"]


def write_vehicle_summary(book: ResultBook, result: RunResult, unit_labels: dict[str, str]) -> bool:
    """Add the Vehicle Summary sheet; False (nothing written) when it would not fit."""
    if result.peaks is None:
        return False
    titles = ["Member", "Vehicle"] + [
        f"{name} ({unit_labels[quantity]})" for name, quantity in VEHICLE_SUMMARY_COLUMNS
    ]
    rows = 1 + result.n_members * result.n_vehicles
    ws = book.new_sheet(VEHICLE_SUMMARY_SHEET, rows=rows, columns=len(titles))
    ws.header(titles, [16.0, 18.0] + [12.0] * len(VEHICLE_SUMMARY_COLUMNS))
    ws.autofilter = True
    text = book.styles.xf(CellFormat(number_format=FORMAT_TEXT))
    value = book.styles.xf(CellFormat(number_format=FORMAT_VALUE))
    styles = [text, text] + [value] * len(VEHICLE_SUMMARY_COLUMNS)
    vehicles = [v.id for v in result.case.vehicles]
    for member, per_vehicle in zip(result.case.members, result.peaks, strict=True):
        ws.block([[member.id] * len(vehicles), vehicles, *per_vehicle.T.tolist()], styles)
    return True
