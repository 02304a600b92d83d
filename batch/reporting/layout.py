"""Pages of a printed report, laid out top to bottom with matplotlib, saved as one PDF.

A :class:`Document` flows headings, paragraphs, tables, plots and boxes down pages of
the run's paper (US Letter or A4, as the workbook prints), starting a new page when
the next block does not fit; a table that runs over a page break repeats its header
row. Every page gets a running header (the report's title and scope) and a footer
(program, "Page k of N", the date). Text is wrapped by an estimate of its width
(a character taken as 0.6 of its font size, generous for the DejaVu Sans that
matplotlib uses), so lines never run into each other or off the page.

Dimensions are in inches from the page's top-left corner; font sizes in points.
Only matplotlib's object-oriented interface is used (no pyplot state), with its
PDF backend.
"""

from __future__ import annotations

import textwrap
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path

from matplotlib.axes import Axes
from matplotlib.backends.backend_pdf import PdfPages
from matplotlib.figure import Figure
from matplotlib.lines import Line2D
from matplotlib.patches import Rectangle

from batch.writing.printing import Paper

__all__ = ["Column", "Document"]

MARGIN_IN = 0.75
BODY_PT = 9.0
SMALL_PT = 7.5
HEADING_PT = 12.0
TITLE_PT = 18.0
#: Width of a character as a fraction of the font size (generous for DejaVu Sans).
CHAR_EM = 0.6
#: Line height as a multiple of the font size.
LEADING = 1.3
HEADER_FILL = "#D3E1E8"  # pale slate, as the workbook's header rows
RULE_COLOUR = "#8A8A8A"
_PT_PER_IN = 72.0


@dataclass(frozen=True)
class Column:
    """A table column: its title, its share of the text width, and its alignment."""

    title: str
    share: float
    align: str = "left"


def _chars(width_in: float, size_pt: float) -> int:
    """How many characters of ``size_pt`` type fit in ``width_in`` (at least 1)."""
    return max(int(width_in * _PT_PER_IN / (CHAR_EM * size_pt)), 1)


def _wrap(text: str, width_in: float, size_pt: float) -> list[str]:
    """``text`` wrapped to ``width_in``; its own line breaks kept; at least one line."""
    lines: list[str] = []
    for part in str(text).split("\n"):
        lines += textwrap.wrap(part, _chars(width_in, size_pt), break_long_words=True) or [""]
    return lines or [""]


def _widths(width: float, columns: Sequence[Column], size: float, pad: float) -> list[float]:
    """Column widths (inches) by share, each at least as wide as its title's longest word.

    What a column is widened by is taken from the others in proportion to their slack.
    """
    total = sum(c.share for c in columns)
    least = [
        (max(len(w) for w in c.title.split() or [""]) + 1) * CHAR_EM * size / _PT_PER_IN + 2 * pad
        for c in columns
    ]
    widths = [max(width * c.share / total, m) for c, m in zip(columns, least, strict=True)]
    excess = sum(widths) - width
    slack = [w - m for w, m in zip(widths, least, strict=True)]
    if excess > 0 and sum(slack) > 0:
        cut = min(excess / sum(slack), 1.0)
        widths = [w - s * cut for w, s in zip(widths, slack, strict=True)]
    return widths


def _line_in(size_pt: float) -> float:
    return size_pt * LEADING / _PT_PER_IN


class Document:
    """A report being laid out; :meth:`save` numbers its pages and writes the PDF.

    ``title`` and ``scope`` head every page; ``footer`` is printed at the foot of
    every page, left, with "Page k of N" in the middle and ``date`` on the right.
    """

    def __init__(self, paper: Paper, title: str, scope: str, footer: str, date: str) -> None:
        self.paper = paper
        self.title = title
        self.scope = scope
        self.footer = footer
        self.date = date
        self.width = paper.width_in - 2 * MARGIN_IN
        self.pages: list[Figure] = []
        self.y = 0.0  # inches below the top of the current page
        self._bottom = paper.height_in - MARGIN_IN - 0.3  # above the footer
        self.new_page()

    # ------------------------------------------------------------ pages

    @property
    def page(self) -> Figure:
        """The page being laid out."""
        return self.pages[-1]

    def new_page(self) -> None:
        """Start a new page below its running header."""
        self.pages.append(Figure(figsize=(self.paper.width_in, self.paper.height_in)))
        self.y = MARGIN_IN + 0.35

    def room(self) -> float:
        """Inches left on the current page."""
        return self._bottom - self.y

    def need(self, height: float) -> None:
        """Start a new page unless ``height`` inches fit on this one."""
        if height > self.room() and self.y > MARGIN_IN + 0.4:
            self.new_page()

    def _text(self, x: float, y: float, text: str, size: float, **kw: object) -> None:
        """Text with its top-left corner (``ha``, ``va`` may say otherwise) at (x, y) in."""
        fig = self.page
        fig.text(
            x / self.paper.width_in,
            1 - y / self.paper.height_in,
            text,
            fontsize=size,
            va=kw.pop("va", "top"),
            ha=kw.pop("ha", "left"),
            **kw,  # type: ignore[arg-type]
        )

    def _rect(self, x: float, y: float, w: float, h: float, **kw: object) -> None:
        pw, ph = self.paper.width_in, self.paper.height_in
        self.page.add_artist(
            Rectangle(
                (x / pw, 1 - (y + h) / ph),
                w / pw,
                h / ph,
                transform=self.page.transFigure,
                **kw,  # type: ignore[arg-type]
            )
        )

    # ------------------------------------------------------------ blocks

    def space(self, inches: float) -> None:
        """Leave ``inches`` of space (nothing at the top of a page)."""
        if self.y > MARGIN_IN + 0.4:
            self.y += inches

    def heading(self, text: str, size: float = HEADING_PT) -> None:
        """A bold heading, kept with at least an inch of what follows."""
        lines = _wrap(text, self.width, size)
        self.need(len(lines) * _line_in(size) + 1.0)
        self.space(0.12)
        for line in lines:
            self._text(MARGIN_IN, self.y, line, size, fontweight="bold")
            self.y += _line_in(size)
        self.y += 0.04

    def paragraph(self, text: str, size: float = BODY_PT, indent: float = 0.0) -> None:
        """Wrapped text; it may continue on the next page."""
        for line in _wrap(text, self.width - indent, size):
            self.need(_line_in(size))
            self._text(MARGIN_IN + indent, self.y, line, size)
            self.y += _line_in(size)
        self.y += 0.05

    def table(
        self, columns: Sequence[Column], rows: Sequence[Sequence[object]], size: float = SMALL_PT
    ) -> None:
        """A table; its header row is repeated on each page it runs onto."""
        pad = 0.04
        widths = _widths(self.width, columns, size, pad)

        def cells(values: Sequence[object]) -> list[list[str]]:
            return [
                _wrap("" if v is None else str(v), w - 2 * pad, size)
                for v, w in zip(values, widths, strict=True)
            ]

        def height(wrapped: list[list[str]]) -> float:
            return max(len(c) for c in wrapped) * _line_in(size) + 2 * pad

        head = cells([c.title for c in columns])

        def draw(wrapped: list[list[str]], bold: bool) -> None:
            h = height(wrapped)
            if bold:
                self._rect(MARGIN_IN, self.y, self.width, h, color=HEADER_FILL, lw=0)
            x = MARGIN_IN
            for lines, w, col in zip(wrapped, widths, columns, strict=True):
                at = {"left": x + pad, "right": x + w - pad, "center": x + w / 2}[col.align]
                for k, line in enumerate(lines):
                    self._text(
                        at,
                        self.y + pad + k * _line_in(size),
                        line,
                        size,
                        ha=col.align,
                        fontweight="bold" if bold else "normal",
                    )
                x += w
            self.y += h
            self._rule()

        self.need(height(head) + (height(cells(rows[0])) if rows else 0.0))
        draw(head, True)
        for row in rows:
            wrapped = cells(row)
            if height(wrapped) > self.room():
                self.new_page()
                draw(head, True)
            draw(wrapped, False)
        self.y += 0.1

    def _rule(self) -> None:
        self.page.add_artist(
            _line(self, MARGIN_IN, self.y, MARGIN_IN + self.width, self.y, RULE_COLOUR, 0.3)
        )

    def plots(self, draws: Sequence[Callable[[Axes], None]], height: float) -> list[Axes]:
        """Plots side by side, ``height`` inches tall; each drawn by its function."""
        self.need(height)
        gap = 0.55
        w = (self.width - gap * (len(draws) - 1)) / len(draws)
        axes = []
        pw, ph = self.paper.width_in, self.paper.height_in
        for k, draw in enumerate(draws):
            left = MARGIN_IN + 0.55 + k * (w + gap)
            ax = self.page.add_axes(
                (left / pw, 1 - (self.y + height - 0.45) / ph, (w - 0.6) / pw, (height - 0.8) / ph)
            )
            draw(ax)
            axes.append(ax)
        self.y += height
        return axes

    def box(self, fields: Sequence[str], height: float) -> None:
        """A bordered block of labelled blank lines and an empty square (review and seal)."""
        self.need(height)
        self._rect(MARGIN_IN, self.y, self.width, height, fill=False, edgecolor="black", lw=0.8)
        seal = min(height - 0.3, 1.9)
        self._rect(
            MARGIN_IN + self.width - seal - 0.15,
            self.y + 0.15,
            seal,
            seal,
            fill=False,
            edgecolor=RULE_COLOUR,
            lw=0.6,
            linestyle="--",
        )
        self._text(
            MARGIN_IN + self.width - seal / 2 - 0.15,
            self.y + 0.15 + seal / 2,
            "Seal",
            BODY_PT,
            ha="center",
            va="center",
            color=RULE_COLOUR,
        )
        step = (height - 0.3) / max(len(fields), 1)
        right = MARGIN_IN + self.width - seal - 0.4
        for k, label in enumerate(fields):
            y = self.y + 0.15 + (k + 1) * step - 0.08
            self._text(MARGIN_IN + 0.15, y, label, BODY_PT, va="bottom")
            self.page.add_artist(_line(self, MARGIN_IN + 2.2, y, right, y, "black", 0.5))
        self.y += height + 0.1

    # ------------------------------------------------------------ output

    def save(self, path: Path) -> int:
        """Number the pages, write the PDF to ``path``; returns the page count."""
        total = len(self.pages)
        with PdfPages(path, metadata={"Title": f"{self.title}: {self.scope}"}) as pdf:
            for k, fig in enumerate(self.pages, start=1):
                self._frame(fig, k, total)
                pdf.savefig(fig)
        self.pages.clear()
        return total

    def _frame(self, fig: Figure, k: int, total: int) -> None:
        pw, ph = self.paper.width_in, self.paper.height_in
        top = 1 - (MARGIN_IN - 0.05) / ph
        foot = (MARGIN_IN - 0.25) / ph
        fig.text(MARGIN_IN / pw, top, self.title, fontsize=SMALL_PT, va="bottom", ha="left")
        fig.text(1 - MARGIN_IN / pw, top, self.scope, fontsize=SMALL_PT, va="bottom", ha="right")
        fig.text(MARGIN_IN / pw, foot, self.footer, fontsize=SMALL_PT, va="top", ha="left")
        fig.text(0.5, foot, f"Page {k} of {total}", fontsize=SMALL_PT, va="top", ha="center")
        fig.text(1 - MARGIN_IN / pw, foot, self.date, fontsize=SMALL_PT, va="top", ha="right")


def _line(
    doc: Document, x0: float, y0: float, x1: float, y1: float, colour: str, lw: float
) -> Line2D:
    """A straight line on the current page between two points given in inches."""
    pw, ph = doc.paper.width_in, doc.paper.height_in
    return Line2D(
        [x0 / pw, x1 / pw],
        [1 - y0 / ph, 1 - y1 / ph],
        transform=doc.page.transFigure,
        color=colour,
        lw=lw,
    )
