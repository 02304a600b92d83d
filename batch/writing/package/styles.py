"""Our few cell formats, appended to the workbook's own style sheet (``xl/styles.xml``).

A result cell's look is a :class:`CellFormat` (number format, bold, fill colour,
font colour, wrapping, alignment). :class:`StyleSheet` gives each distinct format
the index of a cell format record (``cellXfs``) that is appended after the
workbook's own records, so every style the engineer's sheets use keeps its
index and meaning. Fonts are the workbook's default font (its first ``<font>``)
with bold or a colour added, so results use the engineer's typeface; number
formats reuse a built-in id or one the workbook already defines, and otherwise
take fresh ids from 164 up (ECMA-376 Part 1, §18.8.30: ids below 164 are
built in).

Colours are RGB hex strings without alpha (``"FFE3B3"``).
"""

from __future__ import annotations

from dataclasses import dataclass

from batch.writing.package.xmltext import Node, Splice, attr, parse

__all__ = [
    "HEADER",
    "HEADER_RGB",
    "HIGHLIGHT_RGB",
    "CellFormat",
    "StyleSheet",
    "highlighted",
]

HIGHLIGHT_RGB = "FFE3B3"  # soft amber: the governing value of an effect
HEADER_RGB = "D3E1E8"  # pale slate: header rows and Run Log sections

#: Built-in number formats (ECMA-376 Part 1, §18.8.30), by format code.
BUILTIN_FORMATS: dict[str, int] = {"General": 0, "": 0, "0": 1, "0.00": 2, "@": 49}

_MAIN_NS = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_FIRST_CUSTOM_FORMAT = 164
#: The order of the style sheet's children (ECMA-376 Part 1, §18.8.39 CT_Stylesheet).
_ORDER = (
    "numFmts",
    "fonts",
    "fills",
    "borders",
    "cellStyleXfs",
    "cellXfs",
    "cellStyles",
    "dxfs",
    "tableStyles",
    "colors",
    "extLst",
)
_DEFAULT_FONT = '<sz val="11"/><name val="Calibri"/><family val="2"/>'
_EMPTY_STYLES = (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
    f'<styleSheet xmlns="{_MAIN_NS}">'
    f'<fonts count="1"><font>{_DEFAULT_FONT}</font></fonts>'
    '<fills count="2"><fill><patternFill patternType="none"/></fill>'
    '<fill><patternFill patternType="gray125"/></fill></fills>'
    '<borders count="1"><border><left/><right/><top/><bottom/><diagonal/></border></borders>'
    '<cellStyleXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></cellStyleXfs>'
    '<cellXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/></cellXfs>'
    '<cellStyles count="1"><cellStyle name="Normal" xfId="0" builtinId="0"/></cellStyles>'
    "</styleSheet>"
).encode()
#: The two fills every style sheet starts with (§18.8.21: they are reserved).
_RESERVED_FILLS = ("none", "gray125")


@dataclass(frozen=True)
class CellFormat:
    """How a cell looks.

    ``number_format`` (e.g. ``"0.0"``; empty: General), bold type, ``fill`` and
    ``font_rgb`` colours (hex RGB; None: no fill / the default colour), text
    wrapping and vertical alignment (``"top"``, ``"center"``; None: the default);
    ``indent`` the left indent of left-aligned text, in steps of about one character
    (so text never touches a right-aligned number in the column before it).
    """

    number_format: str = ""
    bold: bool = False
    fill: str | None = None
    font_rgb: str | None = None
    wrap: bool = False
    vertical: str | None = None
    indent: int = 0


#: The header row of every result sheet.
HEADER = CellFormat(bold=True, fill=HEADER_RGB, wrap=True, vertical="center")


def highlighted(fmt: CellFormat) -> CellFormat:
    """``fmt`` marked as a governing value: soft amber fill and bold type."""
    return CellFormat(
        number_format=fmt.number_format,
        bold=True,
        fill=HIGHLIGHT_RGB,
        font_rgb=fmt.font_rgb,
        wrap=fmt.wrap,
        vertical=fmt.vertical,
        indent=fmt.indent,
    )


def _count(node: Node | None) -> int:
    return 0 if node is None else len(node.children)


class StyleSheet:
    """The workbook's style sheet plus our formats; :meth:`xf` gives a format's index.

    ``data`` is the workbook's ``styles.xml`` (None: the workbook has none, and
    a minimal one is made). Formats may be asked for at any time before
    :meth:`xml` is called; asking twice gives the same index.
    """

    def __init__(self, data: bytes | None, part: str = "xl/styles.xml") -> None:
        self._data, self._root = parse(data if data is not None else _EMPTY_STYLES, part)
        self._p = self._root.prefix
        self._formats: dict[CellFormat, int] = {}
        self._numfmt_ids = self._known_number_formats()
        self._new_numfmts: dict[str, int] = {}
        self._fonts: dict[tuple[bool, str | None], int] = {(False, None): 0}
        self._new_fonts: list[str] = []
        self._fills: dict[str, int] = {}
        self._new_fills: list[str] = []
        self._base_fills = _count(self._root.find("fills"))
        self._base_fonts = _count(self._root.find("fonts"))
        self._base_xfs = _count(self._root.find("cellXfs"))
        self._new_xfs: list[str] = []

    def _known_number_formats(self) -> dict[str, int]:
        known = dict(BUILTIN_FORMATS)
        node = self._root.find("numFmts")
        for fmt in node.findall("numFmt") if node is not None else []:
            code, ident = fmt.get("formatCode"), fmt.get("numFmtId")
            if code is not None and ident is not None and ident.isdigit():
                known.setdefault(code, int(ident))
        return known

    def _number_format(self, code: str) -> int:
        if code in self._numfmt_ids:
            return self._numfmt_ids[code]
        used = [*self._numfmt_ids.values(), _FIRST_CUSTOM_FORMAT - 1]
        ident = max(used) + 1
        self._numfmt_ids[code] = self._new_numfmts[code] = ident
        return ident

    def _font(self, bold: bool, rgb: str | None) -> int:
        key = (bold, rgb)
        if key not in self._fonts:
            fonts = self._root.find("fonts")
            first = fonts.find("font") if fonts is not None else None
            p = first.prefix if first is not None else self._p
            inner = (
                self._data[first.open_end : first.close_start].decode("utf-8")
                if first is not None and not first.empty
                else _DEFAULT_FONT
            )
            if first is not None:  # drop the default font's own weight and colour
                for child in first.children:
                    if child.local in ("b", "color"):
                        own = self._data[child.start : child.end].decode("utf-8")
                        inner = inner.replace(own, "", 1)
            extra = (f"<{p}b/>" if bold else "") + (
                f'<{p}color rgb="FF{attr(rgb)}"/>' if rgb else ""
            )
            self._fonts[key] = max(self._base_fonts, 1) + len(self._new_fonts)
            self._new_fonts.append(f"<{p}font>{extra}{inner}</{p}font>")
        return self._fonts[key]

    def _fill(self, rgb: str) -> int:
        if rgb not in self._fills:
            p = self._p
            self._fills[rgb] = max(self._base_fills, 2) + len(self._new_fills)
            self._new_fills.append(
                f'<{p}fill><{p}patternFill patternType="solid"><{p}fgColor rgb="FF{attr(rgb)}"/>'
                f'<{p}bgColor indexed="64"/></{p}patternFill></{p}fill>'
            )
        return self._fills[rgb]

    def xf(self, fmt: CellFormat) -> int:
        """The cell format index (the ``s`` attribute of a cell) of ``fmt``."""
        if fmt in self._formats:
            return self._formats[fmt]
        p = self._p
        num = self._number_format(fmt.number_format)
        font = self._font(fmt.bold, fmt.font_rgb)
        fill = self._fill(fmt.fill) if fmt.fill else 0
        applied = ' applyNumberFormat="1"' if num else ""
        applied += ' applyFont="1"' if font else ""
        applied += ' applyFill="1"' if fill else ""
        align = ""
        if fmt.wrap or fmt.vertical or fmt.indent:
            wrap = ' wrapText="1"' if fmt.wrap else ""
            vertical = f' vertical="{attr(fmt.vertical)}"' if fmt.vertical else ""
            indent = f' horizontal="left" indent="{fmt.indent}"' if fmt.indent else ""
            align = f"<{p}alignment{indent}{wrap}{vertical}/>"
            applied += ' applyAlignment="1"'
        parent = ' xfId="0"' if _count(self._root.find("cellStyleXfs")) else ""
        body = f'numFmtId="{num}" fontId="{font}" fillId="{fill}" borderId="0"{parent}{applied}'
        record = f"<{p}xf {body}>{align}</{p}xf>" if align else f"<{p}xf {body}/>"
        index = max(self._base_xfs, 1) + len(self._new_xfs)
        self._new_xfs.append(record)
        self._formats[fmt] = index
        return index

    def xml(self) -> bytes:
        """The style sheet with our fonts, fills, number formats and cell formats added."""
        p = self._p
        numfmts = [
            f'<{p}numFmt numFmtId="{ident}" formatCode="{attr(code)}"/>'
            for code, ident in self._new_numfmts.items()
        ]
        fonts = [] if self._base_fonts else [f"<{p}font>{_DEFAULT_FONT}</{p}font>"]
        fills = [
            f'<{p}fill><{p}patternFill patternType="{kind}"/></{p}fill>'
            for kind in _RESERVED_FILLS[self._base_fills :]
        ]
        plain = f'<{p}xf numFmtId="0" fontId="0" fillId="0" borderId="0"/>'
        xfs = [] if self._base_xfs else [plain]
        borders = (
            []
            if _count(self._root.find("borders"))
            else [
                f"<{p}border><{p}left/><{p}right/><{p}top/><{p}bottom/><{p}diagonal/></{p}border>"
            ]
        )
        splice = Splice(self._data)
        self._add(splice, "numFmts", numfmts)
        self._add(splice, "fonts", fonts + self._new_fonts)
        self._add(splice, "fills", fills + self._new_fills)
        self._add(splice, "borders", borders)
        self._add(splice, "cellXfs", xfs + self._new_xfs)
        return splice.apply()

    def _add(self, splice: Splice, local: str, children: list[str]) -> None:
        """Append ``children`` to the ``local`` list, creating it in schema order if absent."""
        if not children:
            return
        p = self._p
        node = self._root.find(local)
        if node is not None and not node.empty:
            splice.set_attrs(node, {"count": str(len(node.children) + len(children))})
            splice.insert(node.close_start, "".join(children))
            return
        new = f'<{p}{local} count="{len(children)}">{"".join(children)}</{p}{local}>'
        if node is not None:  # an empty list written <fills/>
            splice.replace(node.start, node.end, new)
            return
        later = _ORDER[_ORDER.index(local) + 1 :]
        after = next((c for c in self._root.children if c.local in later), None)
        if after is not None:
            splice.insert(after.start, new)
        else:
            splice.append(self._root, new)
