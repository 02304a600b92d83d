"""Splice result sheets into the input workbook's package, keeping every other part whole.

A workbook file is a zip package of parts (ECMA-376 Part 2, Open Packaging
Conventions) joined by relationship parts. Rather than load the workbook into
an object model and write it out again — which drops whatever the model does
not know (charts, pictures, pivot tables, connections, macros ...) — the result
package is made from the input package:

* every input part is copied unchanged, except the earlier run's result sheets
  and what only they use (their drawings and charts);
* the new result sheets are streamed into the package as they are written
  (:class:`~batch.writing.package.stream.SheetStream`), each with its parts, content type,
  relationship, sheet entry, the hidden name :data:`OWNER_MARK` and, where it
  has an autofilter, the ``_xlnm._FilterDatabase`` name Excel keeps for it, and
  where it has a page setup, the ``_xlnm.Print_Titles`` of the rows and columns
  printed on every page and the ``_xlnm.Print_Area`` when only part of it prints;
* the few parts that list sheets or styles are edited as text
  (:mod:`batch.writing.package.xmltext`): the workbook part (sheets, sheet-level names
  renumbered after removals, the active tab), its relationships, the content
  types, the style sheet (our formats appended, :mod:`batch.writing.package.styles`) and
  the sheet list in ``docProps/app.xml``.

Which sheets are an earlier run's, and what only they use, is read by
:class:`~batch.writing.package.source.SourcePackage`.

Formula cells of the input keep their cached values byte for byte. When an
earlier run's sheets are replaced, the workbook is flagged for a full
recalculation on opening (``calcPr fullCalcOnLoad``), so formulas that read the
results show the new values in a spreadsheet program.
"""

from __future__ import annotations

import contextlib
import posixpath
import re
import shutil
import zipfile
import zlib
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import IO, BinaryIO
from urllib.parse import unquote

from batch.writing.package.docprops import update_sheet_list
from batch.writing.package.source import (
    CONTENT_TYPES,
    CT_XLSX,
    NEEDS_OUT,
    OWNER_MARK,
    PKG_REL_NS,
    REL_NS,
    BookProblem,
    SourcePackage,
    empty_package,
    rels_of,
)
from batch.writing.package.stream import MAX_ROWS, PageSetup, SheetStream, column_letter
from batch.writing.package.styles import StyleSheet
from batch.writing.package.xmltext import Node, Splice, attr, parse, text

__all__ = [
    "OWNER_MARK",
    "BookProblem",
    "ResultBook",
    "ResultPackage",
    "SheetNameTaken",
    "SourcePackage",
    "empty_package",
]

#: zlib level of the new parts (copied parts keep zipfile's default): on this repetitive
#: XML, level 1 compresses about three times faster than the default 6 and makes the
#: result sheets only about a sixth larger (measured on Envelopes-like rows).
SHEET_COMPRESSION = 1

_CT = "application/vnd.openxmlformats-officedocument."
CT_WORKSHEET = _CT + "spreadsheetml.worksheet+xml"
CT_DRAWING = _CT + "drawing+xml"
CT_CHART = _CT + "drawingml.chart+xml"
CT_STYLES = _CT + "spreadsheetml.styles+xml"
#: A part this large (bytes) is written with zip64 headers (zipfile's limit without them).
_ZIP64_AT = 2**31 - 1
#: Generous bound of one streamed cell's bytes (a number, or a text cell with a longish
#: id), to know when a sheet might need zip64.
_CELL_BYTES = 100
#: Characters a sheet name may not hold (its length is at most 31; spreadsheet limits).
_BAD_NAME = re.compile(r"[\[\]:*?/\\]")


class SheetNameTaken(Exception):
    """A sheet of the same name (ignoring case) exists and is not spanfleet's."""


def _relative(source: str, target: str) -> str:
    """``target`` as a relationship target relative to the part ``source``."""
    return posixpath.relpath(target, posixpath.dirname(source) or ".")


# ---------------------------------------------------------------- writing


@dataclass
class _NewSheet:
    stream: SheetStream
    part: str
    rel: str
    sheet_id: int
    drawing: tuple[bytes, tuple[bytes, ...]] | None = None
    charts_at: list[str] = field(default_factory=list)


class ResultBook:
    """Where the writers put their sheets: one open sheet at a time, streamed into the package.

    Get a sheet with :meth:`new_sheet`, write it top to bottom, and start the
    next; a sheet is finished when the next one starts or the book is finished.
    ``styles`` gives cell style indices.
    """

    def __init__(
        self, source: SourcePackage, out: zipfile.ZipFile, fallback_active: str | None
    ) -> None:
        self.source = source
        self.out = out
        self.styles = StyleSheet(
            source.read(source.styles_part) if source.styles_part else None,
            source.styles_part or "xl/styles.xml",
        )
        self.fallback_active = None if source.active else fallback_active
        self.sheets: list[_NewSheet] = []
        self._open: tuple[_NewSheet, IO[bytes]] | None = None
        self._taken = {p.lower() for p in self._kept_parts()}
        self._taken_names = {s.name.lower() for s in source.sheets if s.name not in source.ours}
        self._next_id = 1 + max(
            (
                int(n.get("sheetId") or 0)
                for n in self._sheet_nodes()
                if (n.get("sheetId") or "").isdigit()
            ),
            default=0,
        )

    def _sheet_nodes(self) -> list[Node]:
        sheets = self.source.workbook.find("sheets")
        return sheets.findall("sheet") if sheets is not None else []

    def _kept_parts(self) -> list[str]:
        return [i.filename for i in self.source.infos if i.filename not in self.source.dropped]

    def _fresh(self, folder: str, stem: str, ext: str = "xml") -> str:
        base = posixpath.dirname(self.source.workbook_part)
        k = 1
        while True:
            part = posixpath.join(base, folder, f"{stem}{k}.{ext}")
            if part.lower() not in self._taken and rels_of(part).lower() not in self._taken:
                self._taken.add(part.lower())
                return part
            k += 1

    @property
    def names(self) -> tuple[str, ...]:
        """Names of the sheets written so far, in order."""
        return tuple(s.stream.name for s in self.sheets)

    def new_sheet(
        self, name: str, *, rows: int = MAX_ROWS, columns: int = 64, exact: bool = False
    ) -> SheetStream:
        """Start the sheet ``name``, finishing the one before.

        ``rows`` (header included) and ``columns`` bound the sheet's size: only
        a sheet that might pass 2 GiB of XML is written with zip64 headers, which
        some programs read less well, so give bounds as tight as you know.
        ``exact``: they are the sheet's size, written as its dimension (see
        :class:`~batch.writing.package.stream.SheetStream`), and checked when it closes.
        Raises :class:`SheetNameTaken` when a kept sheet has that name in any
        case, ``ValueError`` for a name no sheet may have.
        """
        if not name.strip() or len(name) > 31 or _BAD_NAME.search(name) or name[0] == "'":
            raise ValueError(f"{name!r} is not a valid sheet name")
        if name.lower() in self._taken_names:
            raise SheetNameTaken(name)
        self._finish_open()
        part = self._fresh("worksheets", "sheet")
        fh = self.out.open(part, "w", force_zip64=rows * columns * _CELL_BYTES > _ZIP64_AT)
        stream = SheetStream(
            fh,
            name,
            self.styles,
            selected=name == self.fallback_active,
            extent=(rows, columns) if exact else None,
        )
        entry = _NewSheet(stream=stream, part=part, rel="", sheet_id=self._next_id)
        self._next_id += 1
        self._taken_names.add(name.lower())
        self.sheets.append(entry)
        self._open = (entry, fh)
        return stream

    def add_drawing(self, stream: SheetStream, drawing: bytes, charts: tuple[bytes, ...]) -> None:
        """Give the open sheet ``stream`` a drawing part holding ``charts``.

        In ``drawing``, chart *k* (from 1) is referred to as relationship
        ``rId{k}``; the parts are written when the sheet is finished.
        """
        entry = self._entry(stream)
        stream.drawing = "rId1"
        entry.drawing = (drawing, charts)

    def _entry(self, stream: SheetStream) -> _NewSheet:
        if self._open is None or self._open[0].stream is not stream:
            raise ValueError(f"{stream.name}: the sheet is not the one being written")
        return self._open[0]

    def _finish_open(self) -> None:
        if self._open is None:
            return
        entry, fh = self._open
        entry.stream.close()  # if it refuses, the sheet stays open for abandon()
        self._open = None
        fh.close()
        if entry.drawing is not None:
            self._write_drawing(entry)

    def abandon(self) -> None:
        """Let go of the open sheet after a failure, whatever state its stream is in."""
        if self._open is None:
            return
        entry, fh = self._open
        self._open = None
        with contextlib.suppress(Exception):
            entry.stream.close()
        with contextlib.suppress(Exception):
            fh.close()

    def _write(self, part: str, data: bytes) -> None:
        self.out.writestr(part, data)

    def _write_drawing(self, entry: _NewSheet) -> None:
        assert entry.drawing is not None
        drawing, charts = entry.drawing
        drawing_part = self._fresh("drawings", "drawing")
        rels = [(1, "drawing", _relative(entry.part, drawing_part))]
        self._write(rels_of(entry.part), _rels_xml(rels))
        self._write(drawing_part, drawing)
        chart_rels = []
        for k, chart in enumerate(charts, start=1):
            chart_part = self._fresh("charts", "chart")
            self._write(chart_part, chart)
            entry.charts_at.append(chart_part)
            chart_rels.append((k, "chart", _relative(drawing_part, chart_part)))
        self._write(rels_of(drawing_part), _rels_xml(chart_rels))
        entry.charts_at.insert(0, drawing_part)

    # ------------------------------------------------------------ the edited parts

    def finish(self) -> None:
        """Finish the open sheet and write the parts that list sheets, styles and types."""
        self._finish_open()
        src = self.source
        rel_ids = {r.id for r in src.workbook_rels}
        for entry in self.sheets:
            k = len(rel_ids) + 1
            while f"rId{k}" in rel_ids:
                k += 1
            entry.rel = f"rId{k}"
            rel_ids.add(entry.rel)
        styles_part = src.styles_part or posixpath.join(
            posixpath.dirname(src.workbook_part), "styles.xml"
        )
        self._write(styles_part, self.styles.xml())
        self._write(src.workbook_part, self._workbook_xml())
        self._write(rels_of(src.workbook_part), self._workbook_rels(styles_part))
        self._write(CONTENT_TYPES, self._content_types(styles_part))
        if src.app_part is not None:
            kept = [s.name for s in src.sheets if s.name not in src.ours and s.kind == "worksheet"]
            self._write(
                src.app_part,
                update_sheet_list(
                    src.read(src.app_part), kept, src.ours, self.names, {s.name for s in src.sheets}
                ),
            )

    def _workbook_xml(self) -> bytes:
        src = self.source
        root = src.workbook
        p = root.prefix
        splice = Splice(src.workbook_xml)
        new_index: dict[int, int] = {}
        for sheet, node in zip(src.sheets, self._sheet_nodes(), strict=True):
            if sheet.name in src.ours:
                splice.delete(node)
            else:
                new_index[sheet.index] = len(new_index)
        r = src.r_prefix or "r:"
        declare = "" if src.r_prefix else f' xmlns:r="{REL_NS}"'
        sheets_node = root.find("sheets")
        assert sheets_node is not None
        splice.append(
            sheets_node,
            "".join(
                f'<{p}sheet name="{attr(e.stream.name)}" sheetId="{e.sheet_id}"{declare} '
                f'{r}id="{e.rel}"/>'
                for e in self.sheets
            ),
        )
        self._renumber_names(splice, new_index)
        names: list[str] = []
        first_new = len(new_index)
        for k, entry in enumerate(self.sheets, start=first_new):
            quoted = "'" + entry.stream.name.replace("'", "''") + "'"
            names.append(
                f'<{p}definedName name="{OWNER_MARK}" localSheetId="{k}" hidden="1">'
                f"{text(quoted)}!$A$1</{p}definedName>"
            )
            if entry.stream.autofilter:
                ref = _absolute(entry.stream.filter_ref)
                names.append(
                    f'<{p}definedName name="_xlnm._FilterDatabase" localSheetId="{k}" '
                    f'hidden="1">{text(quoted)}!{ref}</{p}definedName>'
                )
            titles = _print_titles(quoted, entry.stream.page)
            if titles:
                names.append(
                    f'<{p}definedName name="_xlnm.Print_Titles" localSheetId="{k}">'
                    f"{text(titles)}</{p}definedName>"
                )
            if entry.stream.page is not None and entry.stream.page.print_area:
                area = _absolute(entry.stream.page.print_area)
                names.append(
                    f'<{p}definedName name="_xlnm.Print_Area" localSheetId="{k}">'
                    f"{text(quoted)}!{area}</{p}definedName>"
                )
        defined = root.find("definedNames")
        anchor = _after_sheets(root)
        if defined is not None:
            splice.append(defined, "".join(names))
        elif names:
            splice.insert(anchor, f"<{p}definedNames>{''.join(names)}</{p}definedNames>")
        self._views(splice, new_index, first_new)
        if src.ours:
            calc = root.find("calcPr")
            if calc is not None:
                splice.set_attrs(calc, {"fullCalcOnLoad": "1"})
            else:
                at = defined.end if defined is not None else anchor
                splice.insert(at, f'<{p}calcPr fullCalcOnLoad="1"/>')
        return splice.apply()

    def _renumber_names(self, splice: Splice, new_index: dict[int, int]) -> None:
        """Drop the sheet-level names of removed sheets; renumber those of the sheets kept."""
        defined = self.source.workbook.find("definedNames")
        for node in defined.findall("definedName") if defined is not None else []:
            local = node.get("localSheetId")
            if local is None or not local.isdigit() or int(local) >= len(self.source.sheets):
                continue
            if int(local) not in new_index:
                splice.delete(node)
            elif new_index[int(local)] != int(local):
                splice.set_attrs(node, {"localSheetId": str(new_index[int(local)])})

    def _views(self, splice: Splice, new_index: dict[int, int], first_new: int) -> None:
        """Keep the active tab on the same sheet, or on the fallback result sheet."""
        src = self.source
        root = src.workbook
        p = root.prefix
        if src.active is not None:
            kept = next(s.index for s in src.sheets if s.name == src.active)
            active = new_index[kept]
        else:
            names = list(self.names)
            found = names.index(self.fallback_active) if self.fallback_active in names else 0
            active = first_new + found
        views = root.find("bookViews")
        view = views.find("workbookView") if views is not None else None
        if view is None:
            new = f'<{p}bookViews><{p}workbookView activeTab="{active}"/></{p}bookViews>'
            sheets_node = root.find("sheets")
            assert sheets_node is not None
            splice.insert(sheets_node.start, new)
            return
        changes: dict[str, str | None] = {"activeTab": str(active) if active else None}
        first = view.get("firstSheet")
        if first is not None and first.isdigit():
            mapped = new_index.get(int(first), 0)
            changes["firstSheet"] = str(min(mapped, active)) if min(mapped, active) else None
        splice.set_attrs(view, changes)

    def _workbook_rels(self, styles_part: str) -> bytes:
        src = self.source
        rels_part = rels_of(src.workbook_part)
        data = src.read(rels_part) if src.exists(rels_part) else _rels_xml([])
        data, root = parse(data, rels_part)
        splice = Splice(data)
        gone = {s.rel for s in src.sheets if s.name in src.ours} | src.dropped_rels
        for node in root.findall("Relationship"):
            if node.get("Id") in gone:
                splice.delete(node)
        p = root.prefix
        new = [
            f'<{p}Relationship Id="{e.rel}" Type="{REL_NS}/worksheet" '
            f'Target="{attr(_relative(src.workbook_part, e.part))}"/>'
            for e in self.sheets
        ]
        if src.styles_part is None:
            ids = {r.id for r in src.workbook_rels} | {e.rel for e in self.sheets}
            k = 1
            while f"rId{k}" in ids:
                k += 1
            new.append(
                f'<{p}Relationship Id="rId{k}" Type="{REL_NS}/styles" '
                f'Target="{attr(_relative(src.workbook_part, styles_part))}"/>'
            )
        splice.append(root, "".join(new))
        return splice.apply()

    def _content_types(self, styles_part: str) -> bytes:
        src = self.source
        data, root = parse(src.read(CONTENT_TYPES), CONTENT_TYPES)
        splice = Splice(data)
        dropped = {p.lower() for p in src.dropped}
        for node in root.findall("Override"):
            part = unquote(node.get("PartName") or "").lstrip("/").lower()
            if part in dropped:
                splice.delete(node)
            elif part == src.workbook_part.lower() and src.lacks:
                splice.set_attrs(node, {"ContentType": CT_XLSX})
        p = root.prefix
        overrides = []
        for entry in self.sheets:
            overrides.append((entry.part, CT_WORKSHEET))
            for k, part in enumerate(entry.charts_at):
                overrides.append((part, CT_DRAWING if k == 0 else CT_CHART))
        if src.styles_part is None:
            overrides.append((styles_part, CT_STYLES))
        splice.append(
            root,
            "".join(
                f'<{p}Override PartName="/{attr(part)}" ContentType="{ct}"/>'
                for part, ct in overrides
            ),
        )
        return splice.apply()


def _absolute(ref: str) -> str:
    """``A1:T9`` as ``$A$1:$T$9``."""
    out = []
    for corner in ref.split(":"):
        letters = corner.rstrip("0123456789")
        out.append(f"${letters}${corner[len(letters) :]}")
    return ":".join(out)


def _print_titles(quoted: str, page: PageSetup | None) -> str:
    """The rows and columns printed on every page, e.g. ``'Envelopes'!$A:$D,'Envelopes'!$1:$1``.

    Empty when the sheet has no page setup or repeats nothing (ECMA-376 Part 1,
    §18.2.5: the built-in name ``_xlnm.Print_Titles``).
    """
    if page is None:
        return ""
    parts = []
    if page.title_columns:
        parts.append(f"{quoted}!$A:${column_letter(page.title_columns)}")
    if page.title_rows:
        parts.append(f"{quoted}!$1:${page.title_rows}")
    return ",".join(parts)


def _after_sheets(root: Node) -> int:
    """Where a new ``definedNames`` element goes: after sheets and external references."""
    before = ("sheets", "functionGroups", "externalReferences")
    ends = [c.end for c in root.children if c.local in before]
    return max(ends) if ends else root.close_start


def _rels_xml(rels: list[tuple[int, str, str]]) -> bytes:
    body = "".join(
        f'<Relationship Id="rId{k}" Type="{REL_NS}/{kind}" Target="{attr(target)}"/>'
        for k, kind, target in rels
    )
    return (
        '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
        f'<Relationships xmlns="{PKG_REL_NS}">{body}</Relationships>'
    ).encode()


def _copy(src: SourcePackage, info: zipfile.ZipInfo, out: zipfile.ZipFile) -> None:
    """Copy one part unchanged; a part that cannot be decompressed is a damaged workbook."""
    copy = zipfile.ZipInfo(info.filename, date_time=info.date_time)
    copy.compress_type = info.compress_type
    copy.external_attr = info.external_attr
    try:
        with (
            src.zip.open(info) as fin,
            out.open(copy, "w", force_zip64=info.file_size > _ZIP64_AT // 2) as fout,
        ):
            shutil.copyfileobj(fin, fout, 1 << 20)
    except (zipfile.BadZipFile, zlib.error, EOFError, NotImplementedError) as exc:
        raise BookProblem(
            f"{src.name}: its part {info.filename} is damaged ({exc}), so the results were not "
            f"saved and {src.name} was not changed; " + NEEDS_OUT
        ) from exc


class ResultPackage:
    """The input package with result sheets spliced in, saved by :meth:`save`.

    ``write`` fills a :class:`ResultBook` with the result sheets. The sheet
    that was active stays active; when it was an earlier result sheet (or
    there was none), ``fallback_active`` becomes active. After a save,
    ``sheets`` names the sheets written.
    """

    def __init__(
        self,
        source: SourcePackage,
        write: Callable[[ResultBook], object],
        fallback_active: str | None = None,
    ) -> None:
        self.source = source
        self.write = write
        self.fallback_active = fallback_active
        self.sheets: tuple[str, ...] = ()

    def save(self, filename: BinaryIO) -> None:
        """Write the whole package to ``filename`` (a binary file open for writing)."""
        src = self.source
        edited = {
            p.lower()
            for p in (
                src.workbook_part,
                rels_of(src.workbook_part),
                CONTENT_TYPES,
                src.app_part or "",
                src.styles_part or "",
            )
        }
        dropped = src.dropped
        out = zipfile.ZipFile(filename, "w", zipfile.ZIP_DEFLATED, compresslevel=SHEET_COMPRESSION)
        book: ResultBook | None = None
        try:
            for info in src.infos:
                if info.filename not in dropped and info.filename.lower() not in edited:
                    _copy(src, info, out)
            book = ResultBook(src, out, self.fallback_active)
            self.write(book)
            book.finish()
        except BaseException:
            # The file is abandoned (the caller removes it); what failed (a full disk, say)
            # must reach the caller, not zipfile's complaint that a sheet is still open.
            if book is not None:
                book.abandon()
            with contextlib.suppress(Exception):
                out.close()
            raise
        out.close()
        self.sheets = book.names
