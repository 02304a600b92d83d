"""The moment-chart sheet: a native spreadsheet chart of M max and M min against x per member.

The sheet holds its own copy of the plotted numbers (Member, x, M max, M min,
with the Envelopes column declarations), so sorting or filtering the Envelopes
sheet never disturbs a chart. One scatter chart with straight lines per member,
for the first ``Settings.chart_members`` members, is placed beside the data.
Moments are plotted as computed: sagging positive, upward.

The charts are DrawingML (ECMA-376 Part 1, §21.2 charts, §20.5 spreadsheet
drawings): a drawing part anchors each chart beside its member's rows, and each
chart part holds a scatter chart whose series refer to the sheet's cells (no
cached copy, so a spreadsheet program reads the values from the cells).
"""

from __future__ import annotations

from collections.abc import Sequence

from batch.engine.effects import MemberEnvelope
from batch.writing.columns import CHARTS_SHEET, ENVELOPES
from batch.writing.package.splice import ResultBook
from batch.writing.package.stream import column_letter
from batch.writing.package.xmltext import attr, text
from batch.writing.tables import column_format, write_header

__all__ = ["write_moment_charts"]

#: Line colours of the two series (dark teal for M max, brick red for M min).
CHART_COLOURS = {"M max": "1F6F8B", "M min": "B5452F"}

_COLUMNS = tuple(ENVELOPES.column(h) for h in ("Member", "x", "M max", "M min"))
_CHART_ROWS = 16  # rows of sheet taken by one chart
_CHART_COL = len(_COLUMNS) + 2  # one empty column between data and charts
_EMU_PER_CM = 360_000
_WIDTH_CM, _HEIGHT_CM = 17.0, 7.5
_LINE_EMU = 19_050  # 1.5 pt

_C = "http://schemas.openxmlformats.org/drawingml/2006/chart"
_A = "http://schemas.openxmlformats.org/drawingml/2006/main"
_R = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_XDR = "http://schemas.openxmlformats.org/drawingml/2006/spreadsheetDrawing"
_HEAD = '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'


def write_moment_charts(
    book: ResultBook,
    envelopes: Sequence[MemberEnvelope],
    unit_labels: dict[str, str],
    count: int,
) -> int:
    """Write the chart sheet for the first ``count`` members; returns how many were charted.

    Writes nothing (and returns 0) when ``count`` is 0 or there are no members.
    """
    charted = list(envelopes[: max(count, 0)])
    if not charted:
        return 0
    rows = 1 + sum(int(env.station_x.size) for env in charted)
    ws = book.new_sheet(CHARTS_SHEET, rows=rows, columns=len(_COLUMNS))
    write_header(ws, _COLUMNS, unit_labels)
    styles = [book.styles.xf(column_format(col)) for col in _COLUMNS]
    charts = []
    for env in charted:
        block = [col.values(env) for col in _COLUMNS]
        first = ws.block(block, styles)
        charts.append(_chart(env.member, first, ws.last_row, unit_labels))
    book.add_drawing(ws, _drawing(len(charts)), tuple(charts))
    return len(charted)


def _rich(words: str) -> str:
    """A chart or axis title."""
    return (
        f"<c:title><c:tx><c:rich><a:bodyPr/><a:p><a:r><a:t>{text(words)}</a:t></a:r></a:p>"
        '</c:rich></c:tx><c:overlay val="0"/></c:title>'
    )


def _series(k: int, name: str, col: int, first: int, last: int) -> str:
    quoted = "'" + CHARTS_SHEET.replace("'", "''") + "'"
    xs = f"{quoted}!$B${first}:$B${last}"
    letter = column_letter(col)
    ys = f"{quoted}!${letter}${first}:${letter}${last}"
    return (
        f'<c:ser><c:idx val="{k}"/><c:order val="{k}"/><c:tx><c:v>{text(name)}</c:v></c:tx>'
        f'<c:spPr><a:ln w="{_LINE_EMU}"><a:solidFill><a:srgbClr val="{CHART_COLOURS[name]}"/>'
        '</a:solidFill></a:ln></c:spPr><c:marker><c:symbol val="none"/></c:marker>'
        f"<c:xVal><c:numRef><c:f>{text(xs)}</c:f></c:numRef></c:xVal>"
        f"<c:yVal><c:numRef><c:f>{text(ys)}</c:f></c:numRef></c:yVal>"
        '<c:smooth val="0"/></c:ser>'
    )


def _axis(ident: int, cross: int, position: str, title: str, grid: bool) -> str:
    return (
        f'<c:valAx><c:axId val="{ident}"/><c:scaling><c:orientation val="minMax"/></c:scaling>'
        f'<c:delete val="0"/><c:axPos val="{position}"/>'
        + ("<c:majorGridlines/>" if grid else "")
        + _rich(title)
        + '<c:numFmt formatCode="General" sourceLinked="1"/><c:majorTickMark val="out"/>'
        '<c:minorTickMark val="none"/><c:tickLblPos val="low"/>'
        f'<c:crossAx val="{cross}"/><c:crosses val="autoZero"/>'
        '<c:crossBetween val="midCat"/></c:valAx>'
    )


def _chart(member: str, first: int, last: int, unit: dict[str, str]) -> bytes:
    """One member's chart part: M max and M min against x, straight lines, no markers."""
    series = _series(0, "M max", 3, first, last) + _series(1, "M min", 4, first, last)
    return (
        f'{_HEAD}<c:chartSpace xmlns:c="{_C}" xmlns:a="{_A}" xmlns:r="{_R}">'
        '<c:roundedCorners val="0"/><c:chart>'
        + _rich(f"{member}: live-load moment envelope")
        + '<c:autoTitleDeleted val="0"/><c:plotArea><c:layout/>'
        '<c:scatterChart><c:scatterStyle val="lineMarker"/><c:varyColors val="0"/>'
        + series
        + '<c:axId val="10"/><c:axId val="20"/></c:scatterChart>'
        + _axis(10, 20, "b", f"x ({unit['length']})", grid=False)
        + _axis(20, 10, "l", f"M ({unit['moment']}), sagging positive", grid=True)
        + '</c:plotArea><c:legend><c:legendPos val="b"/><c:overlay val="0"/></c:legend>'
        '<c:plotVisOnly val="1"/><c:dispBlanksAs val="gap"/></c:chart></c:chartSpace>'
    ).encode()


def _drawing(count: int) -> bytes:
    """The drawing part: chart *k* anchored beside the data, ``_CHART_ROWS`` rows apart."""
    size = f'cx="{round(_WIDTH_CM * _EMU_PER_CM)}" cy="{round(_HEIGHT_CM * _EMU_PER_CM)}"'
    anchors = "".join(
        "<xdr:oneCellAnchor><xdr:from>"
        f"<xdr:col>{_CHART_COL - 1}</xdr:col><xdr:colOff>0</xdr:colOff>"
        f"<xdr:row>{k * _CHART_ROWS}</xdr:row><xdr:rowOff>0</xdr:rowOff></xdr:from>"
        f'<xdr:ext {size}/><xdr:graphicFrame macro="">'
        f'<xdr:nvGraphicFramePr><xdr:cNvPr id="{k + 2}" name="{attr(f"Chart {k + 1}")}"/>'
        "<xdr:cNvGraphicFramePr/></xdr:nvGraphicFramePr>"
        '<xdr:xfrm><a:off x="0" y="0"/><a:ext cx="0" cy="0"/></xdr:xfrm>'
        f'<a:graphic><a:graphicData uri="{_C}"><c:chart xmlns:c="{_C}" r:id="rId{k + 1}"/>'
        "</a:graphicData></a:graphic></xdr:graphicFrame><xdr:clientData/></xdr:oneCellAnchor>"
        for k in range(count)
    )
    return (
        f'{_HEAD}<xdr:wsDr xmlns:xdr="{_XDR}" xmlns:a="{_A}" xmlns:r="{_R}">{anchors}</xdr:wsDr>'
    ).encode()
