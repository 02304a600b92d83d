"""Stream a worksheet part (SpreadsheetML XML) to a file, row by row, top to bottom.

Nothing of a sheet is held in memory beyond the rows being written, so a sheet
of a million rows costs what one member's rows cost. The part is laid out as
ECMA-376 Part 1, §18.3.1.99 (CT_Worksheet) orders it: a frozen header pane in
``sheetViews``, column widths in ``cols``, the rows in ``sheetData``, then an
``autoFilter`` over the header and data, the page setup (§18.3.1.63 ``pageSetup``,
§18.3.1.46 ``headerFooter``, with ``sheetPr/pageSetUpPr fitToPage`` first) and,
for a chart sheet, the ``drawing`` that holds the charts. A row may have a height
of its own (``ht``, in points), e.g. for wrapped text.

Cells: ``None`` and the empty string leave a cell empty; numbers are written as
``<v>`` values in their shortest round-trip form (so a float64 reads back bit
for bit; see :func:`_numerals`); booleans as ``t="b"``; text *always* as an inline string
(``t="inlineStr"``), never as a formula, so an id such as ``=cmd|...`` stays
text. Characters XML 1.0 forbids are dropped, and text past a cell's limit of
32,767 characters is cut there. A number that is not finite is refused
(:class:`ValueError`): it has no representation in a cell.
"""

from __future__ import annotations

import math
import queue
import threading
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import IO

import orjson

from batch.writing.package.styles import HEADER, StyleSheet
from batch.writing.package.xmltext import text

__all__ = [
    "MAX_COLUMNS",
    "MAX_ROWS",
    "MAX_TEXT",
    "PageSetup",
    "SheetStream",
    "column_letter",
    "header_widths",
]

#: Rows and columns a sheet holds (ECMA-376 Part 1, §18.3.1.73 and the spreadsheet limits).
MAX_ROWS = 1_048_576
MAX_COLUMNS = 16_384
#: Characters a cell holds.
MAX_TEXT = 32_767

_MAIN_NS = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_REL_NS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_FLUSH_BYTES = 1 << 16
_CACHE_LIMIT = 100_000
_NONE = type(None)
_NUMBERS = frozenset((int, float, _NONE))
_TEXTS = frozenset((str, _NONE))


class _Behind:
    """Writes bytes to ``fh`` on a thread of its own, in order, while the caller goes on.

    A zip entry compresses what it is given (zlib and its checksum let other threads
    run meanwhile), so a sheet's XML is made on one core while the last chunk is
    compressed on another. At most ``depth`` chunks wait. A failure to write (a full
    disk, say) is raised to the caller at its next :meth:`put` or at :meth:`close`.
    """

    def __init__(self, fh: IO[bytes], depth: int = 4) -> None:
        self.fh = fh
        self._queue: queue.Queue[bytes | None] = queue.Queue(depth)  # None: no more
        self._error: BaseException | None = None
        self._thread = threading.Thread(target=self._run, name="sheet-writer", daemon=True)
        self._thread.start()

    def _run(self) -> None:
        while (data := self._queue.get()) is not None:
            if self._error is None:
                try:
                    self.fh.write(data)
                except BaseException as exc:  # handed to the caller, which decides
                    self._error = exc

    def _raise(self) -> None:
        if self._error is not None:
            raise self._error

    def put(self, data: bytes) -> None:
        """Queue ``data`` to be written after what was queued before."""
        self._raise()
        self._queue.put(data)

    def close(self) -> None:
        """Wait until everything queued is written (or has failed, which is raised)."""
        if self._thread.is_alive():
            self._queue.put(None)
            self._thread.join()
        self._raise()


def column_letter(j: int) -> str:
    """The letters of column ``j`` (1 = ``A``, 27 = ``AA``)."""
    if not 1 <= j <= MAX_COLUMNS:
        raise ValueError(f"column {j} is outside a sheet (1 to {MAX_COLUMNS})")
    letters = ""
    while j:
        j, rem = divmod(j - 1, 26)
        letters = chr(65 + rem) + letters
    return letters


@dataclass(frozen=True, kw_only=True)
class PageSetup:
    """How a sheet prints: paper, orientation, fit, the rows and columns repeated, header.

    The sheet is fitted to ``pages_wide`` pages across and as many pages down as its
    rows take. ``paper`` is a paper size code of ECMA-376 Part 1, §18.3.1.63 (1 Letter,
    9 A4). ``title_rows`` and ``title_columns`` are printed on every page (the first
    rows and columns). ``header`` and ``footer`` use the header and footer codes of
    §18.3.1.36 (``&L``, ``&C``, ``&R`` sections; ``&F`` workbook, ``&A`` sheet,
    ``&P`` page, ``&N`` pages). ``print_area`` (a range such as ``F2:F40``; empty: the
    whole sheet) is what prints; ``row_breaks`` are rows after which a new page starts
    (§18.3.1.74 ``rowBreaks``).
    """

    paper: int = 1
    landscape: bool = False
    pages_wide: int = 1
    title_rows: int = 1
    title_columns: int = 0
    header: str = ""
    footer: str = ""
    print_area: str = ""
    row_breaks: tuple[int, ...] = ()


def header_widths(titles: Sequence[str], widths: Sequence[float]) -> list[float]:
    """Column widths in characters, each at least wide enough for its header title."""
    if len(titles) != len(widths):
        raise ValueError(f"{len(titles)} titles but {len(widths)} widths")
    return [round(max(w, len(t) * 0.9 + 2), 1) for t, w in zip(titles, widths, strict=True)]


def _page_xml(page: PageSetup) -> str:
    """The ``pageSetup``, ``headerFooter`` and ``rowBreaks`` elements of ``page``."""
    orientation = "landscape" if page.landscape else "portrait"
    xml = (
        f'<pageSetup paperSize="{page.paper}" fitToWidth="{page.pages_wide}" fitToHeight="0" '
        f'orientation="{orientation}"/>'
    )
    if page.header or page.footer:
        xml += "<headerFooter>"
        xml += f"<oddHeader>{text(page.header)}</oddHeader>" if page.header else ""
        xml += f"<oddFooter>{text(page.footer)}</oddFooter>" if page.footer else ""
        xml += "</headerFooter>"
    if page.row_breaks:
        n = len(page.row_breaks)
        breaks = "".join(
            f'<brk id="{r}" max="{MAX_COLUMNS - 1}" man="1"/>' for r in page.row_breaks
        )
        xml += f'<rowBreaks count="{n}" manualBreakCount="{n}">{breaks}</rowBreaks>'
    return xml


def _xml_number(value: object) -> int | float | None:
    """``value`` as a Python number (numpy scalars included), or None if it is not one."""
    if isinstance(value, int | float):
        return value
    if hasattr(value, "__index__"):
        return int(value.__index__())
    if hasattr(value, "__float__"):
        return float(value.__float__())
    return None


def _height(points: float) -> str:
    """The attributes of a row of its own height (none for 0: the default height)."""
    return f' ht="{points:g}" customHeight="1"' if points > 0 else ""


def _numerals(numbers: Sequence[object]) -> list[str]:
    """Each finite number's shortest round-trip text (a float64 reads back bit for bit).

    orjson writes them (Ryu: the fewest digits that read back as the same double, the
    nearest such when there are several, as Python's ``repr``) about nine times faster
    than ``repr``, one call for a column; only where exponents begin differs from
    ``repr`` (``0.000025``, ``1e+16``), both read alike by every XML number parser.
    An integer past 64 bits falls back to ``repr``.
    """
    if not numbers:
        return []
    try:
        return orjson.dumps(numbers)[1:-1].decode("ascii").split(",")
    except orjson.JSONEncodeError:
        return [repr(v) for v in numbers]


class SheetStream:
    """One worksheet, written top to bottom to ``fh`` (a binary file, e.g. a zip entry).

    Call :meth:`header` (or :meth:`columns` and :meth:`freeze`) before the first
    row, then :meth:`row` or :meth:`block` for the rows in order, then
    :meth:`close`; set :attr:`autofilter` for a filter over the rows. Cell
    styles are indices from ``styles`` (see :meth:`StyleSheet.xf`). ``selected``
    marks the sheet's tab as selected (for the workbook's active sheet). Set
    :attr:`page` before the first row for a page setup.

    ``extent`` (rows, columns), when the writer knows it, is the sheet's used range
    from ``A1``, written as its ``dimension`` (§18.3.1.35): a reader then knows the
    sheet's size without reading every row (openpyxl's read-only mode, which pandas
    uses, reads a whole sheet to find it otherwise, for every sheet of the book).
    :meth:`close` refuses a sheet whose rows and columns turn out otherwise.
    """

    def __init__(
        self,
        fh: IO[bytes],
        name: str,
        styles: StyleSheet,
        *,
        selected: bool = False,
        extent: tuple[int, int] | None = None,
    ) -> None:
        self.fh = fh
        self.name = name
        self.styles = styles
        self.selected = selected
        self.extent = extent
        self.last_row = 0
        self.last_column = 0
        self.drawing: str | None = None  # relationship id of the sheet's drawing
        self.autofilter = False  # an autofilter over the header and data rows
        self.page: PageSetup | None = None  # how the sheet prints (set before the first row)
        self._widths: list[float] = []
        self._frozen = (0, 0)
        self._started = False
        self._closed = False
        self._pending: list[str] = []
        self._size = 0
        self._behind: _Behind | None = None
        self._letters: list[str] = [""]
        self._texts: dict[str, str] = {}
        self.header_style = styles.xf(HEADER)

    # ------------------------------------------------------------ layout

    def columns(self, widths: Sequence[float]) -> None:
        """Column widths in characters, from column A."""
        self._before_rows("column widths")
        self._widths = [float(w) for w in widths]

    def freeze(self, rows: int = 1, cols: int = 0) -> None:
        """Keep the first ``rows`` rows and ``cols`` columns in view while scrolling."""
        self._before_rows("frozen panes")
        self._frozen = (rows, cols)

    def header(
        self,
        titles: Sequence[str],
        widths: Sequence[float],
        frozen_columns: int = 0,
        height: float = 0.0,
    ) -> None:
        """Row 1: bold titles on the header fill, wrapped; widths at least the titles'.

        Row 1 and the first ``frozen_columns`` columns stay in view while scrolling.
        ``height`` is the header row's height in points (0: the default), room for a
        title that wraps.
        """
        if len(titles) != len(widths):
            raise ValueError(f"{self.name}: {len(titles)} titles but {len(widths)} widths")
        self.columns(header_widths(titles, widths))
        self.freeze(1, frozen_columns)
        self.row(titles, [self.header_style] * len(titles), height)

    def _before_rows(self, what: str) -> None:
        if self._started:
            raise ValueError(f"{self.name}: {what} must be set before the first row")

    def _start(self) -> None:
        self._started = True
        selected = ' tabSelected="1"' if self.selected else ""
        rows, cols = self._frozen
        if rows or cols:
            corner = f"{column_letter(cols + 1)}{rows + 1}"
            pane = "bottomRight" if rows and cols else ("bottomLeft" if rows else "topRight")
            split = (f' xSplit="{cols}"' if cols else "") + (f' ySplit="{rows}"' if rows else "")
            view = (
                f'<pane{split} topLeftCell="{corner}" activePane="{pane}" state="frozen"/>'
                f'<selection pane="{pane}" activeCell="{corner}" sqref="{corner}"/>'
            )
        else:
            view = '<selection activeCell="A1" sqref="A1"/>'
        cols_xml = "".join(
            f'<col min="{j}" max="{j}" width="{w:g}" customWidth="1"/>'
            for j, w in enumerate(self._widths, start=1)
        )
        fit = '<sheetPr><pageSetUpPr fitToPage="1"/></sheetPr>' if self.page else ""
        if self.extent is not None:
            last_row, last_column = self.extent
            fit += f'<dimension ref="A1:{column_letter(last_column)}{last_row}"/>'
        self._emit(
            '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
            f'<worksheet xmlns="{_MAIN_NS}" xmlns:r="{_REL_NS}">{fit}'
            f'<sheetViews><sheetView workbookViewId="0"{selected}>{view}</sheetView></sheetViews>'
            '<sheetFormatPr defaultRowHeight="15"/>'
            + (f"<cols>{cols_xml}</cols>" if cols_xml else "")
            + "<sheetData>"
        )

    # ------------------------------------------------------------ cells

    def _letter(self, j: int) -> str:
        while len(self._letters) <= j:
            self._letters.append(column_letter(len(self._letters)))
        return self._letters[j]

    def _inline(self, value: str) -> str:
        """``<is>`` content of a text cell (cached: ids and vehicle names repeat)."""
        known = self._texts.get(value)
        if known is None:
            body = text(value[:MAX_TEXT])
            space = ' xml:space="preserve"' if body != body.strip() else ""
            known = f"<is><t{space}>{body}</t></is>"
            if len(self._texts) >= _CACHE_LIMIT:
                self._texts.clear()
            self._texts[value] = known
        return known

    def _cell(self, ref: str, value: object, style: int) -> str:
        s = f' s="{style}"' if style else ""
        if value is None or value == "":
            return f'<c r="{ref}"{s}/>' if style else ""
        if isinstance(value, bool):
            return f'<c r="{ref}"{s} t="b"><v>{int(value)}</v></c>'
        if isinstance(value, str):
            return f'<c r="{ref}"{s} t="inlineStr">{self._inline(value)}</c>'
        number = _xml_number(value)
        if number is not None:
            if not math.isfinite(number):
                raise ValueError(f"{self.name}!{ref}: {number} is not a number a cell can hold")
            return f'<c r="{ref}"{s}><v>{number}</v></c>'
        return f'<c r="{ref}"{s} t="inlineStr">{self._inline(str(value))}</c>'

    def _next_row(self, count: int) -> int:
        if self._closed:
            raise ValueError(f"{self.name}: the sheet is already closed")
        if not self._started:
            self._start()
        first = self.last_row + 1
        if first + count - 1 > MAX_ROWS:
            raise ValueError(f"{self.name}: more than {MAX_ROWS:,} rows")
        self.last_row = first + count - 1
        return first

    def row(
        self, values: Sequence[object], styles: Sequence[int] | int = 0, height: float = 0.0
    ) -> int:
        """Write the next row (``None`` values: empty cells); returns its number.

        ``styles`` gives one style index per value, or one for all of them;
        ``height`` the row's height in points (0: the sheet's default).
        """
        r = self._next_row(1)
        each = [styles] * len(values) if isinstance(styles, int) else styles
        if len(each) != len(values):
            raise ValueError(f"{self.name}: {len(values)} values but {len(each)} styles")
        cells = "".join(
            self._cell(f"{self._letter(j)}{r}", v, s)
            for j, (v, s) in enumerate(zip(values, each, strict=True), start=1)
        )
        self.last_column = max(self.last_column, len(values))
        self._emit(f'<row r="{r}"{_height(height)}>{cells}</row>')
        return r

    def block(
        self,
        columns: Sequence[Sequence[object]],
        styles: Sequence[int],
        marks: Mapping[tuple[int, int], int] | None = None,
        heights: Sequence[float] | None = None,
    ) -> int:
        """Write rows given column by column; returns the first row's number.

        ``columns[j][i]`` is the value of row ``i``, column ``j + 1``;
        ``styles[j]`` its style, except where ``marks[(i, j)]`` gives another
        (a marked cell is written even when empty, so its fill shows).
        ``heights[i]`` is row ``i``'s height in points (0 or none: the default).
        """
        if len(styles) != len(columns):
            raise ValueError(f"{self.name}: {len(columns)} columns but {len(styles)} styles")
        n = len(columns[0]) if columns else 0
        if any(len(col) != n for col in columns):
            raise ValueError(f"{self.name}: the columns of a block differ in length")
        if n == 0:
            return self.last_row + 1
        first = self._next_row(n)
        rs = [str(r) for r in range(first, first + n)]
        texts: list[list[str]] = []
        for j, (values, style) in enumerate(zip(columns, styles, strict=True), start=1):
            texts.append(self._column_cells(self._letter(j), rs, values, style))
        for (i, j), style in (marks or {}).items():
            texts[j][i] = self._cell(f"{self._letter(j + 1)}{rs[i]}", columns[j][i], style)
        self.last_column = max(self.last_column, len(columns))
        if heights is not None and len(heights) != n:
            raise ValueError(f"{self.name}: {n} rows but {len(heights)} heights")
        tall = [_height(h) for h in heights] if heights is not None else [""] * n
        self._emit(
            "".join(
                [
                    f'<row r="{r}"{h}>{"".join(cells)}</row>'
                    for r, h, *cells in zip(rs, tall, *texts, strict=True)
                ]
            )
        )
        return first

    def _column_cells(
        self, letter: str, rs: list[str], values: Sequence[object], style: int
    ) -> list[str]:
        """One column's cells of a block: a fast path for all-number and all-text columns."""
        kinds = set(map(type, values))
        s = f' s="{style}"' if style else ""
        head = f'<c r="{letter}'
        if kinds <= _NUMBERS:
            gaps = _NONE in kinds
            numbers = [v for v in values if v is not None] if gaps else values
            if float in kinds and not all(map(math.isfinite, numbers)):  # type: ignore[arg-type]
                bad = next(v for v in numbers if not math.isfinite(v))  # type: ignore[arg-type]
                raise ValueError(f"{self.name}: {bad} in column {letter} is not a number")
            mid = f'"{s}><v>'
            if not gaps:
                return [
                    f"{head}{r}{mid}{t}</v></c>" for r, t in zip(rs, _numerals(values), strict=True)
                ]
            shown = iter(_numerals(numbers))
            return [
                "" if v is None else f"{head}{r}{mid}{next(shown)}</v></c>"
                for r, v in zip(rs, values, strict=True)
            ]
        if kinds <= _TEXTS:
            mid = f'"{s} t="inlineStr">'
            # Each distinct text once (a column repeats a few ids and words), then a lookup.
            inline = {v: self._inline(v) for v in set(values) if v}  # type: ignore[arg-type]
            return [
                f"{head}{r}{mid}{inline[v]}</c>" if v else ""
                for r, v in zip(rs, values, strict=True)
            ]
        return [
            "" if v is None else self._cell(f"{letter}{r}", v, style)
            for r, v in zip(rs, values, strict=True)
        ]

    # ------------------------------------------------------------ output

    def _emit(self, xml: str) -> None:
        self._pending.append(xml)
        self._size += len(xml)
        if self._size >= _FLUSH_BYTES:
            self._flush()

    def _flush(self) -> None:
        if self._pending:
            if self._behind is None:
                self._behind = _Behind(self.fh)
            self._behind.put("".join(self._pending).encode("utf-8"))
        self._pending.clear()
        self._size = 0

    @property
    def filter_ref(self) -> str:
        """The range of the autofilter: the header row and every data row."""
        return f"A1:{column_letter(max(self.last_column, 1))}{max(self.last_row, 1)}"

    def close(self) -> None:
        """End the sheet: autofilter (if :attr:`autofilter`), margins, page, drawing if any."""
        if self._closed:
            return
        try:
            if not self._started:
                self._start()
            if self.extent is not None and self.extent != (self.last_row, self.last_column):
                raise ValueError(
                    f"{self.name}: {self.last_row} rows and {self.last_column} columns written, "
                    f"not the {self.extent[0]} and {self.extent[1]} declared as its dimension"
                )
            tail = "</sheetData>"
            if self.autofilter:
                tail += f'<autoFilter ref="{self.filter_ref}"/>'
            tail += '<pageMargins left="0.7" right="0.7" top="0.75" bottom="0.75" header="0.3"'
            tail += ' footer="0.3"/>'
            if self.page is not None:
                tail += _page_xml(self.page)
            if self.drawing:
                tail += f'<drawing r:id="{self.drawing}"/>'
            self._emit(tail + "</worksheet>")
            self._flush()
        finally:
            # Everything queued is written (or its failure raised) before ``fh`` is let go.
            self._closed = True
            behind, self._behind = self._behind, None
            if behind is not None:
                behind.close()
