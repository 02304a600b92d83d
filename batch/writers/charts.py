"""The moment-chart sheet: a native spreadsheet chart of M max and M min against x per member.

The sheet holds its own copy of the plotted numbers (Member, x, M max, M min,
with the Envelopes column declarations), so sorting or filtering the Envelopes
sheet never disturbs a chart. One scatter chart with straight lines per member,
for the first ``Settings.chart_members`` members, is placed beside the data.
Moments are plotted as computed: sagging positive, upward.
"""

from __future__ import annotations

from collections.abc import Sequence

from openpyxl.chart import Reference, ScatterChart, Series
from openpyxl.utils import get_column_letter
from openpyxl.workbook.workbook import Workbook

from batch.engine import MemberEnvelope
from batch.results import CHARTS_SHEET, ENVELOPES
from batch.writers.sheets import new_result_sheet, write_header, write_value

__all__ = ["CHART_COLOURS", "write_moment_charts"]

#: Line colours of the two series (dark teal for M max, brick red for M min).
CHART_COLOURS = {"M max": "1F6F8B", "M min": "B5452F"}

_COLUMNS = tuple(ENVELOPES.column(h) for h in ("Member", "x", "M max", "M min"))
_CHART_ROWS = 16  # rows of sheet taken by one chart
_CHART_COL = len(_COLUMNS) + 2  # one empty column between data and charts


def write_moment_charts(
    wb: Workbook, envelopes: Sequence[MemberEnvelope], unit_labels: dict[str, str], count: int
) -> int:
    """Write the chart sheet for the first ``count`` members; returns how many were charted.

    Writes nothing (and returns 0) when ``count`` is 0 or there are no members.
    """
    charted = list(envelopes[: max(count, 0)])
    if not charted:
        return 0
    ws = new_result_sheet(wb, CHARTS_SHEET)
    write_header(ws, _COLUMNS, unit_labels)
    row = 1
    for k, env in enumerate(charted):
        first = row + 1
        rows = zip(*(col.values(env) for col in _COLUMNS), strict=True)
        for values in rows:
            row += 1
            for j, (col, value) in enumerate(zip(_COLUMNS, values, strict=True), start=1):
                write_value(ws, row, j, value, col.number_format, col.text)
        chart = _chart(ws, env.member, first, row, unit_labels)
        ws.add_chart(chart, f"{get_column_letter(_CHART_COL)}{1 + k * _CHART_ROWS}")
    return len(charted)


def _chart(ws: object, member: str, first: int, last: int, unit: dict[str, str]) -> ScatterChart:
    chart = ScatterChart(scatterStyle="line")
    chart.title = f"{member}: live-load moment envelope"
    chart.x_axis.title = f"x ({unit['length']})"
    chart.y_axis.title = f"M ({unit['moment']}), sagging positive"
    chart.x_axis.delete = False
    chart.y_axis.delete = False
    chart.height = 7.5
    chart.width = 17.0
    chart.legend.position = "b"
    xs = Reference(ws, min_col=2, min_row=first, max_row=last)
    for col, name in ((3, "M max"), (4, "M min")):
        series = Series(Reference(ws, min_col=col, min_row=first, max_row=last), xs, title=name)
        series.marker.symbol = "none"
        series.smooth = False
        series.graphicalProperties.line.solidFill = CHART_COLOURS[name]
        series.graphicalProperties.line.width = 19050  # 1.5 pt in EMU
        chart.series.append(series)
    return chart
