"""The chart sheets: native spreadsheet charts of the moment and the shear envelope per member.

Each chart sheet (:data:`CHART_SHEETS`: Moment Charts with M max and M min,
Shear Charts with V max and V min) holds its own copy of the plotted numbers
(Member, x and the two effects, with the Envelopes column declarations), so
sorting or filtering the Envelopes sheet never disturbs a chart. One scatter
chart with straight lines per member, for the first ``Settings.chart_members``
members, is placed beside the data. Values are plotted as computed: sagging
moment positive, upward; V the sum of the upward forces left of the section, so
an interior support (two stations at one x) shows the shear's jump there.

The charts are DrawingML (ECMA-376 Part 1, §21.2 charts, §20.5 spreadsheet
drawings): a drawing part anchors each chart beside its member's rows, and each
chart part holds a scatter chart whose series refer to the sheet's cells (no
cached copy, so a spreadsheet program reads the values from the cells).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from batch.engine.effects import MemberEnvelope
from batch.model import Settings
from batch.writing.columns import CHARTS_SHEET, ENVELOPES, SHEAR_CHARTS_SHEET
from batch.writing.package.splice import ResultBook
from batch.writing.package.stream import column_letter, header_widths
from batch.writing.package.xmltext import attr, text
from batch.writing.printing import area_page_setup, wrapped_height
from batch.writing.tables import column_format

__all__ = ["CHART_COLOURS", "CHART_SHEETS", "ChartSheet", "write_charts"]

#: Line colours of the two series: dark teal for the largest value, brick red for the least.
CHART_COLOURS = ("1F6F8B", "B5452F")


@dataclass(frozen=True)
class ChartSheet:
    """One chart sheet: its name, the two effects plotted (max, min), what and how to label.

    ``quantity`` names the unit of the values (``moment``, ``force``); ``axis``
    is the value axis title with ``{unit}`` for the unit.
    """

    sheet: str
    effects: tuple[str, str]
    quantity: str
    title: str
    axis: str


#: The chart sheets, in workbook order.
CHART_SHEETS: tuple[ChartSheet, ...] = (
    ChartSheet(
        CHARTS_SHEET, ("M max", "M min"), "moment", "moment", "M ({unit}), sagging positive"
    ),
    ChartSheet(
        SHEAR_CHARTS_SHEET,
        ("V max", "V min"),
        "force",
        "shear",
        "V ({unit}), sum of upward forces left of the section",
    ),
)

_N_COLUMNS = 4  # Member, x and the two effects
_CHART_ROWS = 16  # rows of sheet taken by one chart
_CHART_COL = _N_COLUMNS + 2  # one empty column between data and charts
_EMU_PER_CM = 360_000
_WIDTH_CM, _HEIGHT_CM = 17.0, 7.5
_WIDTH_IN = _WIDTH_CM / 2.54
_CHARS_PER_IN = 96 / 7  # characters of the default font an inch (see batch.writing.printing)
_PER_PAGE = 2  # charts on one printed page
_LINE_EMU = 19_050  # 1.5 pt
_GAP_EMU = 72_000  # 2 mm: a chart starts this far into its first row, clear of a page break

_C = "http://schemas.openxmlformats.org/drawingml/2006/chart"
_A = "http://schemas.openxmlformats.org/drawingml/2006/main"
_R = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_XDR = "http://schemas.openxmlformats.org/drawingml/2006/spreadsheetDrawing"
_HEAD = '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'


def write_charts(
    book: ResultBook, kind: ChartSheet, envelopes: Sequence[MemberEnvelope], settings: Settings
) -> int:
    """Write the chart sheet ``kind`` for the first ``Chart members`` members.

    Returns how many were charted; writes nothing (and returns 0) when ``Chart
    members`` is 0 or there are no members.
    """
    charted = list(envelopes[: max(settings.chart_members, 0)])
    if not charted:
        return 0
    columns = tuple(ENVELOPES.column(h) for h in ("Member", "x", *kind.effects))
    units = settings.unit_labels
    rows = 1 + sum(int(env.station_x.size) for env in charted)
    ws = book.new_sheet(kind.sheet, rows=rows, columns=_CHART_COL, exact=True)
    titles = [col.title(units) for col in columns]
    widths = header_widths(titles, [col.width for col in columns])
    # The charts print, not their numbers (those are on Envelopes): two charts a page,
    # none cut by a page break; the charts' column spans their width, so a program
    # fitting the printed area to the page fits the charts.
    last = 1 + len(charted) * _CHART_ROWS
    breaks = range(1 + _PER_PAGE * _CHART_ROWS, last, _PER_PAGE * _CHART_ROWS)
    letter = column_letter(_CHART_COL)
    ws.page = area_page_setup(settings.units, f"{letter}2:{letter}{last}", _WIDTH_IN, breaks)
    ws.header(
        [*titles, "", ""],
        [*widths, 2.0, _WIDTH_IN * _CHARS_PER_IN],
        height=wrapped_height(list(zip(titles, widths, strict=True))),
    )
    styles = [book.styles.xf(column_format(col)) for col in columns]
    charts = []
    for env in charted:
        block = [col.values(env) for col in columns]
        first = ws.block(block, styles)
        charts.append(_chart(kind, env.member, first, ws.last_row, units))
    book.add_drawing(ws, _drawing(len(charts)), tuple(charts))
    return len(charted)


def _rich(words: str) -> str:
    """A chart or axis title."""
    return (
        f"<c:title><c:tx><c:rich><a:bodyPr/><a:p><a:r><a:t>{text(words)}</a:t></a:r></a:p>"
        '</c:rich></c:tx><c:overlay val="0"/></c:title>'
    )


def _series(sheet: str, k: int, name: str, col: int, first: int, last: int) -> str:
    quoted = "'" + sheet.replace("'", "''") + "'"
    xs = f"{quoted}!$B${first}:$B${last}"
    letter = column_letter(col)
    ys = f"{quoted}!${letter}${first}:${letter}${last}"
    return (
        f'<c:ser><c:idx val="{k}"/><c:order val="{k}"/><c:tx><c:v>{text(name)}</c:v></c:tx>'
        f'<c:spPr><a:ln w="{_LINE_EMU}"><a:solidFill><a:srgbClr val="{CHART_COLOURS[k]}"/>'
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


def _chart(kind: ChartSheet, member: str, first: int, last: int, unit: dict[str, str]) -> bytes:
    """One member's chart part: the two effects against x, straight lines, no markers."""
    series = "".join(
        _series(kind.sheet, k, name, 3 + k, first, last) for k, name in enumerate(kind.effects)
    )
    return (
        f'{_HEAD}<c:chartSpace xmlns:c="{_C}" xmlns:a="{_A}" xmlns:r="{_R}">'
        '<c:roundedCorners val="0"/><c:chart>'
        + _rich(f"{member}: live-load {kind.title} envelope")
        + '<c:autoTitleDeleted val="0"/><c:plotArea><c:layout/>'
        '<c:scatterChart><c:scatterStyle val="lineMarker"/><c:varyColors val="0"/>'
        + series
        + '<c:axId val="10"/><c:axId val="20"/></c:scatterChart>'
        + _axis(10, 20, "b", f"x ({unit['length']})", grid=False)
        + _axis(20, 10, "l", kind.axis.format(unit=unit[kind.quantity]), grid=True)
        + '</c:plotArea><c:legend><c:legendPos val="b"/><c:overlay val="0"/></c:legend>'
        '<c:plotVisOnly val="1"/><c:dispBlanksAs val="gap"/></c:chart></c:chartSpace>'
    ).encode()


def _drawing(count: int) -> bytes:
    """The drawing part: chart *k* anchored beside the data, ``_CHART_ROWS`` rows apart.

    The first chart starts below the header row, which is printed on every page:
    a chart touching it would be printed on every page too.
    """
    size = f'cx="{round(_WIDTH_CM * _EMU_PER_CM)}" cy="{round(_HEIGHT_CM * _EMU_PER_CM)}"'
    anchors = "".join(
        "<xdr:oneCellAnchor><xdr:from>"
        f"<xdr:col>{_CHART_COL - 1}</xdr:col><xdr:colOff>0</xdr:colOff>"
        f"<xdr:row>{1 + k * _CHART_ROWS}</xdr:row><xdr:rowOff>{_GAP_EMU}</xdr:rowOff></xdr:from>"
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
