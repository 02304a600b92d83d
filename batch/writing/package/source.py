"""Read an input workbook's package: its sheets, relationships and earlier results.

A workbook file is a zip package of parts (ECMA-376 Part 2, Open Packaging
Conventions) joined by relationship parts. :class:`SourcePackage` reads the
structure a splice needs (:mod:`batch.writing.package.splice`): the workbook part and
its sheets, the style sheet, which sheets are spanfleet's from an earlier run,
the active sheet, and which parts only those sheets use.

A sheet counts as spanfleet's when it has a result sheet's name
(:func:`batch.writing.columns.is_result_sheet_name`) *and* the sheet-level name
:data:`OWNER_MARK`; a sheet with a result name but no mark belongs to the
engineer and stops the run (:class:`BookProblem`). Part names compare without
case (OPC §9.1.1.2). Every part read is parsed through ``defusedxml`` first
(:func:`batch.writing.package.xmltext.parse`).
"""

from __future__ import annotations

import io
import posixpath
import zipfile
from collections import Counter
from dataclasses import dataclass
from urllib.parse import unquote

from batch.writing.columns import is_result_sheet_name
from batch.writing.package.styles import StyleSheet
from batch.writing.package.xmltext import Node, XmlPartError, parse

__all__ = [
    "CONTENT_TYPES",
    "OWNER_MARK",
    "BookProblem",
    "Rel",
    "SourcePackage",
    "SourceSheet",
    "empty_package",
    "rels_of",
]

#: Hidden sheet-level defined name that marks a sheet as written by spanfleet.
OWNER_MARK = "spanfleet_result"

REL_NS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
PKG_REL_NS = "http://schemas.openxmlformats.org/package/2006/relationships"
CT_XLSX = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"
CONTENT_TYPES = "[Content_Types].xml"
_ROOT_RELS = "_rels/.rels"
NEEDS_OUT = "open it in a spreadsheet program, save it as .xlsx and run again"


class BookProblem(Exception):
    """The workbook cannot receive results as it is; the message says what to do."""


def _kind(rel_type: str) -> str:
    """The last segment of a relationship type (``worksheet``, ``vbaProject`` ...)."""
    return rel_type.rstrip("/").rpartition("/")[2]


def rels_of(part: str) -> str:
    """The name of the relationship part of ``part`` (OPC §9.3.1)."""
    folder, name = posixpath.split(part)
    return posixpath.join(folder, "_rels", f"{name}.rels")


@dataclass(frozen=True)
class Rel:
    """One relationship: id, type, the part it points to (None: external) and its element."""

    id: str
    type: str
    part: str | None
    node: Node


@dataclass(frozen=True, kw_only=True)
class SourceSheet:
    """A sheet of the input: its name, position, part and kind (``worksheet`` ...)."""

    name: str
    index: int
    part: str | None
    kind: str
    rel: str


class SourcePackage:
    """An input workbook package, read for splicing.

    ``ours`` are the result sheets of an earlier run (to be replaced), ``active``
    the sheet that was active if it is kept (and ``keep_active``), ``lacks``
    what a copy will not have (the macro project, when ``keep_vba`` is false:
    an ``.xlsx`` workbook cannot hold one). Raises :class:`BookProblem`
    when the package cannot be read or an engineer's sheet has a result name.
    """

    def __init__(
        self, data: bytes, name: str, *, keep_vba: bool = True, keep_active: bool = True
    ) -> None:
        self.data = data
        self.name = name
        self.keep_vba = keep_vba
        self.keep_active = keep_active
        try:
            self.zip = zipfile.ZipFile(io.BytesIO(data))
            self._read_structure()
            self._find_ours()
        except (zipfile.BadZipFile, XmlPartError, KeyError, ValueError, EOFError) as exc:
            raise BookProblem(
                f"{name}: the workbook could not be opened to add the results ({exc}); " + NEEDS_OUT
            ) from exc

    # ------------------------------------------------------------ reading

    def _read_structure(self) -> None:
        self.infos = [i for i in self.zip.infolist() if not i.is_dir()]
        self._lookup = {i.filename.lower(): i.filename for i in self.infos}
        twice = [n for n, k in Counter(i.filename.lower() for i in self.infos).items() if k > 1]
        if twice:
            raise BookProblem(
                f"{self.name}: the workbook holds the part {twice[0]} twice, so it is damaged "
                "and it is not clear which copy counts; " + NEEDS_OUT
            )
        office = [r for r in self.rels("") if _kind(r.type) == "officeDocument" and r.part]
        if not office or office[0].part is None:
            raise KeyError("the package names no workbook part")
        self.workbook_part = office[0].part
        self.workbook_rels = self.rels(self.workbook_part)
        by_id = {r.id: r for r in self.workbook_rels}
        self.workbook_xml, self.workbook = parse(self.read(self.workbook_part), self.workbook_part)
        self.r_prefix = next(
            (
                k[6:] + ":"
                for k, v in self.workbook.attrs.items()
                if k.startswith("xmlns:") and v == REL_NS
            ),
            None,
        )
        sheets_node = self.workbook.find("sheets")
        if sheets_node is None:
            raise KeyError("the workbook part lists no sheets")
        self.sheets: list[SourceSheet] = []
        for index, node in enumerate(sheets_node.findall("sheet")):
            rid = next((v for k, v in node.attrs.items() if k.endswith(":id")), "")
            rel = by_id.get(rid)
            self.sheets.append(
                SourceSheet(
                    name=node.get("name") or "",
                    index=index,
                    part=rel.part if rel else None,
                    kind=_kind(rel.type) if rel else "",
                    rel=rid,
                )
            )
        self.styles_part = next(
            (r.part for r in self.workbook_rels if _kind(r.type) == "styles" and r.part), None
        )
        # Parse now what a save edits, so a damaged part is refused before any work is done.
        parse(self.read(CONTENT_TYPES), CONTENT_TYPES)
        if self.styles_part is not None:
            StyleSheet(self.read(self.styles_part), self.styles_part)
        self.app_part = self._app_part()

    def _app_part(self) -> str | None:
        """The extended properties part, if there is one and it can be edited.

        It is optional metadata; a damaged one is copied as it is.
        """
        part = next(
            (r.part for r in self.rels("") if _kind(r.type) == "extended-properties" and r.part),
            None,
        )
        if part is None:
            return None
        try:
            parse(self.read(part), part)
        except XmlPartError:
            return None
        return part

    def exists(self, part: str) -> bool:
        """True when the package has ``part`` (part names ignore case, OPC §9.1.1.2)."""
        return part.lower() in self._lookup

    def read(self, part: str) -> bytes:
        """The bytes of ``part``."""
        return self.zip.read(self._lookup[part.lower()])

    def rels(self, part: str) -> list[Rel]:
        """The relationships of ``part`` (``""``: the package's own)."""
        rels_part = _ROOT_RELS if not part else rels_of(part)
        if not self.exists(rels_part):
            return []
        _, root = parse(self.read(rels_part), rels_part)
        out = []
        for node in root.findall("Relationship"):
            target = unquote(node.get("Target") or "")
            if node.get("TargetMode") == "External" or not target:
                path = None
            elif target.startswith("/"):
                path = target.lstrip("/")
            else:
                path = posixpath.normpath(posixpath.join(posixpath.dirname(part), target))
            if path is not None and self.exists(path):
                path = self._lookup[path.lower()]
            out.append(Rel(node.get("Id") or "", node.get("Type") or "", path, node))
        return out

    def _find_ours(self) -> None:
        marked = set()
        names = self.workbook.find("definedNames")
        for node in names.findall("definedName") if names is not None else []:
            local = node.get("localSheetId")
            if node.get("name") == OWNER_MARK and local is not None and local.isdigit():
                marked.add(int(local))
        ours = []
        for sheet in self.sheets:
            if not is_result_sheet_name(sheet.name):
                continue
            if sheet.index not in marked:
                raise BookProblem(
                    f"{sheet.name}: this sheet has the name of a spanfleet result sheet but was "
                    "not written by spanfleet, so it will not be replaced; rename it and run again"
                )
            ours.append(sheet.name)
        self.ours = tuple(ours)
        view = self.workbook.find("bookViews")
        first_view = view.find("workbookView") if view is not None else None
        tab = first_view.get("activeTab", "0") if first_view is not None else "0"
        index = int(tab) if tab and tab.isdigit() else 0
        active = self.sheets[index].name if index < len(self.sheets) else None
        self.active = active if active not in self.ours and self.keep_active else None
        vba = [r for r in self.workbook_rels if _kind(r.type) == "vbaProject"]
        self.dropped_rels = {r.id for r in vba} if not self.keep_vba else set()
        self.lacks = ("macros (VBA)",) if vba and not self.keep_vba else ()
        self.dropped = self._dropped_parts()

    def _dropped_parts(self) -> set[str]:
        """The parts a splice leaves out: our earlier sheets and what nothing else uses."""
        blocked = {s.part for s in self.sheets if s.name in self.ours and s.part}
        blocked |= {r.part for r in self.workbook_rels if r.id in self.dropped_rels and r.part}
        before = self._reachable(set())
        after = self._reachable(blocked)
        dropped = before - after
        return dropped | {rels_of(p) for p in dropped if self.exists(rels_of(p))}

    def _reachable(self, blocked: set[str]) -> set[str]:
        seen: set[str] = set()
        todo = [r.part for r in self.rels("") if r.part]
        while todo:
            part = todo.pop()
            if part in seen or part in blocked:
                continue
            seen.add(part)
            todo.extend(r.part for r in self.rels(part) if r.part)
        return seen


def empty_package() -> bytes:
    """A valid workbook package with no sheets, the base of a results-only workbook."""
    ns = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
    parts = {
        CONTENT_TYPES: (
            '<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">'
            '<Default Extension="rels" '
            'ContentType="application/vnd.openxmlformats-package.relationships+xml"/>'
            '<Default Extension="xml" ContentType="application/xml"/>'
            f'<Override PartName="/xl/workbook.xml" ContentType="{CT_XLSX}"/></Types>'
        ),
        _ROOT_RELS: (
            f'<Relationships xmlns="{PKG_REL_NS}"><Relationship Id="rId1" '
            f'Type="{REL_NS}/officeDocument" Target="xl/workbook.xml"/></Relationships>'
        ),
        "xl/workbook.xml": (
            f'<workbook xmlns="{ns}" xmlns:r="{REL_NS}"><bookViews><workbookView/></bookViews>'
            "<sheets/></workbook>"
        ),
        "xl/_rels/workbook.xml.rels": f'<Relationships xmlns="{PKG_REL_NS}"/>',
    }
    out = io.BytesIO()
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zf:
        for name, xml in parts.items():
            info = zipfile.ZipInfo(name, date_time=(1980, 1, 1, 0, 0, 0))
            info.compress_type = zipfile.ZIP_DEFLATED
            zf.writestr(info, '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n' + xml)
    return out.getvalue()
