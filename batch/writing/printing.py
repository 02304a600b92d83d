"""How spanfleet's sheets print: paper, orientation, fit, repeated titles, header and footer.

Every sheet spanfleet writes prints as a document: on the paper of the run's unit
system (US Letter for US units, A4 for SI), with row 1 (and, on a sheet too wide
for one page, the identifying columns) on every page, and a header naming the
workbook, the sheet and the page. A sheet is fitted to the page width; one so wide
that a single page would print it smaller than :data:`MIN_SCALE` is fitted to the
fewest pages across that keep it at that size or larger, its identifying columns
repeated on each.

Wrapped text gets row heights from :func:`wrapped_height`, a deliberately generous
estimate (a character of proportional type is taken as wide as a digit), so that
wrapped lines never overlap whatever program opens the workbook.

Widths are in characters of the default font (Calibri 11 pt: a digit is 7 pixels
at 96 pixels an inch, ECMA-376 Part 1, §18.3.1.13, from memory); heights in points.
"""

from __future__ import annotations

import math
import textwrap
from collections.abc import Sequence
from dataclasses import dataclass, replace

import batch
from batch.model.units import UnitSystem
from batch.writing.package.stream import PageSetup

__all__ = [
    "HEADER_PARTS",
    "LINE_POINTS",
    "MIN_SCALE",
    "PAPERS",
    "Paper",
    "area_page_setup",
    "page_setup",
    "wrapped_height",
    "wrapped_lines",
]


@dataclass(frozen=True)
class Paper:
    """A paper size: its code (ECMA-376 Part 1, §18.3.1.63) and its size in inches."""

    name: str
    code: int
    width_in: float
    height_in: float


#: The paper of each unit system: US Letter (8.5 x 11 in), ISO 216 A4 (210 x 297 mm).
PAPERS: dict[str, Paper] = {
    "US": Paper("Letter", 1, 8.5, 11.0),
    "SI": Paper("A4", 9, 210 / 25.4, 297 / 25.4),
}
#: Left plus right page margins, inches (the streamed sheets' pageMargins: 0.7 each).
SIDE_MARGINS_IN = 1.4
#: Smallest print scale a fit to one page width may come to; wider sheets span pages.
MIN_SCALE = 0.6
#: Height of one line of 11 pt text, points (the default row height).
LINE_POINTS = 15.0
_PIXELS_PER_CHAR = 7.0
_PIXELS_PER_INCH = 96.0
_CELL_PADDING_CHARS = 1.0

#: What every printed page shows in its header: the workbook (left), the sheet (centre)
#: and the page (right); the footer names the program and the day it was printed.
HEADER_PARTS = ("&F", "&A", "Page &P of &N")
HEADER = "&L{}&C{}&R{}".format(*HEADER_PARTS)
FOOTER = f"&Lspanfleet {batch.__version__}&RPrinted &D"


def _inches(widths: Sequence[float]) -> float:
    return sum(widths) * _PIXELS_PER_CHAR / _PIXELS_PER_INCH


def page_setup(widths: Sequence[float], title_columns: int, units: UnitSystem) -> PageSetup:
    """The page setup of a sheet whose columns are ``widths`` characters wide.

    ``title_columns`` are the identifying columns repeated on each page of a sheet
    that spans pages across. Portrait when the sheet fits a portrait page at full
    size, landscape otherwise.
    """
    paper = PAPERS[units]
    wide = _inches(widths)
    portrait = paper.width_in - SIDE_MARGINS_IN
    landscape = paper.height_in - SIDE_MARGINS_IN
    if wide <= portrait:
        return _page(paper, landscape=False, pages=1, title_columns=0)
    if landscape >= MIN_SCALE * wide:
        return _page(paper, landscape=True, pages=1, title_columns=0)
    titles = _inches(widths[:title_columns])
    per_page = landscape / MIN_SCALE - titles
    pages = math.ceil((wide - titles) / per_page) if per_page > 0 else 1
    return _page(paper, landscape=True, pages=max(pages, 1), title_columns=title_columns)


def area_page_setup(
    units: UnitSystem, area: str, width_in: float, breaks: Sequence[int]
) -> PageSetup:
    """A page setup that prints only ``area`` (e.g. the charts of a chart sheet).

    Portrait when ``width_in`` fits a portrait page, fitted to the page width; a new
    page starts after each row of ``breaks``, so that nothing is cut in two; no rows
    are repeated.
    """
    paper = PAPERS[units]
    landscape = width_in > paper.width_in - SIDE_MARGINS_IN
    return replace(
        _page(paper, landscape=landscape, pages=1, title_columns=0),
        title_rows=0,
        print_area=area,
        row_breaks=tuple(breaks),
    )


def _page(paper: Paper, *, landscape: bool, pages: int, title_columns: int) -> PageSetup:
    return PageSetup(
        paper=paper.code,
        landscape=landscape,
        pages_wide=pages,
        title_rows=1,
        title_columns=title_columns if pages > 1 else 0,
        header=HEADER,
        footer=FOOTER,
    )


def wrapped_lines(text: str, width: float) -> int:
    """Lines ``text`` takes when wrapped in a column ``width`` characters wide (at least 1).

    Every character is counted as wide as a digit, which is wider than most
    characters of proportional type, so the count errs on the side of more lines.
    """
    chars = max(int(width - _CELL_PADDING_CHARS), 1)
    return max(1, sum(max(1, len(textwrap.wrap(line, chars) or [""])) for line in text.split("\n")))


def wrapped_height(texts: Sequence[tuple[str, float]], font_points: float = 11.0) -> float:
    """Height (points) of a row whose cells hold ``(text, column width)`` pairs, wrapped.

    The row is as tall as its tallest cell; 0 when every text fits on one line
    (the row keeps the default height).
    """
    lines = max((wrapped_lines(t, w) for t, w in texts if t), default=1)
    if lines <= 1 and font_points <= 11.0:
        return 0.0
    return lines * LINE_POINTS * max(font_points, 11.0) / 11.0
