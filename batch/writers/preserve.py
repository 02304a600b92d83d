"""Open a workbook to receive results: keep what can be kept, and say what cannot.

The workbook is loaded with openpyxl (formulas, styles, comments, merged cells,
data validation, defined names, widths and hidden state survive a save; macros
too, for an ``.xlsm`` written back as ``.xlsm``). Result sheets of an earlier run
are removed: a sheet counts as spanfleet's when it has a result sheet's name
*and* the hidden mark :data:`batch.writers.sheets.OWNER_MARK`; a sheet with a
result name but no mark belongs to the engineer and stops the run.

Some content openpyxl cannot write back (charts, drawings, images, pivot tables,
form controls, links to other workbooks, ...). It is found from the package's
part names, following each sheet's relationships so that the charts of
spanfleet's own earlier chart sheet do not count, and from openpyxl's own
"will be removed" warnings. The caller refuses an in-place run when anything
would be lost, and warns when writing a copy.
"""

from __future__ import annotations

import io
import posixpath
import warnings
import zipfile
from collections.abc import Iterable, Iterator
from dataclasses import dataclass

from defusedxml import ElementTree
from openpyxl import Workbook, load_workbook

from batch.results import is_result_sheet_name
from batch.writers.sheets import OWNER_MARK

__all__ = [
    "LOSSY_PARTS",
    "BookProblem",
    "OpenedBook",
    "lossy_content",
    "new_book",
    "open_book",
    "sheet_parts",
]

#: Package part prefixes whose content openpyxl does not write back, and what they are.
LOSSY_PARTS: tuple[tuple[str, str], ...] = (
    ("xl/charts/chart", "charts"),
    ("xl/chartsheets/", "chart sheets"),
    ("xl/drawings/drawing", "drawings (shapes, text boxes, pictures)"),
    ("xl/media/", "images"),
    ("xl/pivotTables/", "pivot tables"),
    ("xl/pivotCache/", "pivot table caches"),
    ("xl/externalLinks/", "links to other workbooks"),
    ("xl/connections.xml", "data connections (external data sources)"),
    ("xl/queryTables/", "query tables (refreshable external data)"),
    ("xl/model/", "a data model (Power Pivot)"),
    ("xl/richData/", "linked data types or pictures in cells"),
    ("xl/vbaProject.bin", "macros (VBA)"),
    ("xl/embeddings/", "embedded objects"),
    ("xl/activeX/", "ActiveX controls"),
    ("xl/ctrlProps/", "form controls"),
    ("xl/slicers/", "slicers"),
    ("xl/slicerCaches/", "slicer caches"),
    ("xl/timelines/", "timelines"),
    ("xl/threadedComments/", "threaded comments (only their plain-note copies would remain)"),
    ("customXml/", "custom XML data (document metadata)"),
)

_REL_NS = "{http://schemas.openxmlformats.org/package/2006/relationships}"
_MAIN_NS = "{http://schemas.openxmlformats.org/spreadsheetml/2006/main}"
_R_ID = "{http://schemas.openxmlformats.org/officeDocument/2006/relationships}id"
_WORKBOOK_PART = "xl/workbook.xml"


class BookProblem(Exception):
    """The workbook cannot receive results as it is; the message says what to do."""


@dataclass(frozen=True, kw_only=True)
class OpenedBook:
    """A workbook ready for new result sheets.

    ``cannot_keep``: what a save would lose, for people (empty: nothing);
    ``replaced``: result sheets of an earlier run that were removed;
    ``active``: the sheet that was active, if it is kept; ``notes``: other
    remarks from reading the workbook.
    """

    workbook: Workbook
    cannot_keep: tuple[str, ...]
    replaced: tuple[str, ...]
    active: str | None
    notes: tuple[str, ...] = ()


def new_book() -> Workbook:
    """An empty workbook (no sheets yet) for results of a JSON input."""
    wb = Workbook()
    wb.remove(wb.active)
    return wb


def _rels_of(part: str) -> str:
    folder, name = posixpath.split(part)
    return posixpath.join(folder, "_rels", f"{name}.rels")


def _targets(zf: zipfile.ZipFile, names: set[str], part: str) -> Iterator[tuple[str, str]]:
    """(Id, part name) of each internal relationship of ``part``."""
    rels = _rels_of(part)
    if rels not in names:
        return
    for rel in ElementTree.fromstring(zf.read(rels)).iter(f"{_REL_NS}Relationship"):
        target = rel.get("Target") or ""
        if rel.get("TargetMode") == "External" or not target:
            continue
        if target.startswith("/"):
            path = target.lstrip("/")
        else:
            path = posixpath.normpath(posixpath.join(posixpath.dirname(part), target))
        yield rel.get("Id") or "", path


def sheet_parts(zf: zipfile.ZipFile) -> dict[str, str]:
    """Sheet name -> its part name, from the workbook part and its relationships."""
    targets = dict(_targets(zf, set(zf.namelist()), _WORKBOOK_PART))
    root = ElementTree.fromstring(zf.read(_WORKBOOK_PART))
    return {
        sheet.get("name") or "": targets.get(sheet.get(_R_ID) or "", "")
        for sheet in root.iter(f"{_MAIN_NS}sheet")
    }


def _reachable(zf: zipfile.ZipFile, names: set[str], starts: Iterable[str]) -> set[str]:
    seen: set[str] = set()
    todo = [s for s in starts if s]
    while todo:
        part = todo.pop()
        if part in seen:
            continue
        seen.add(part)
        todo.extend(path for _, path in _targets(zf, names, part) if path in names)
    return seen


def _kind(part: str, keep_vba: bool) -> str | None:
    if keep_vba and part == "xl/vbaProject.bin":
        return None
    return next((what for prefix, what in LOSSY_PARTS if part.startswith(prefix)), None)


def lossy_content(data: bytes, ours: set[str], keep_vba: bool) -> tuple[str, ...]:
    """What rewriting the workbook would lose, by sheet, ignoring the sheets named in ``ours``."""
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        names = set(zf.namelist())
        sheets = sheet_parts(zf)
        own = _reachable(zf, names, (part for name, part in sheets.items() if name in ours))
        found: dict[str, None] = {}
        placed: set[str] = set(own)
        for name, part in sheets.items():
            if name in ours:
                continue
            for p in sorted(_reachable(zf, names, [part]) - own):
                kind = _kind(p, keep_vba)
                placed.add(p)
                if kind:
                    found[f"{kind} on sheet {name!r}"] = None
        for p in sorted(names - placed):
            kind = _kind(p, keep_vba)
            if kind:
                found[f"{kind} in the workbook"] = None
    return tuple(found)


def open_book(data: bytes, name: str, keep_vba: bool) -> OpenedBook:
    """Load workbook bytes for writing results; remove spanfleet's earlier result sheets.

    ``name`` is the file name used in messages. Raises :class:`BookProblem` when
    the workbook cannot be opened or a sheet with a result name is not ours.
    """
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            wb = load_workbook(io.BytesIO(data), keep_vba=keep_vba, rich_text=True)
        except Exception as exc:  # openpyxl raises many types for damaged parts
            raise BookProblem(
                f"{name}: the workbook could not be opened to add the results ({exc}); "
                "open it in a spreadsheet program, save it as .xlsx and run again"
            ) from exc
    lost = [str(w.message) for w in caught if "removed" in str(w.message)]
    notes = tuple(str(w.message) for w in caught if "removed" not in str(w.message))
    active = wb.active.title if wb.active is not None else None
    ours: list[str] = []
    for sheet in [*wb.worksheets, *wb.chartsheets]:
        if not is_result_sheet_name(sheet.title):
            continue
        if OWNER_MARK not in getattr(sheet, "defined_names", {}):
            raise BookProblem(
                f"{sheet.title}: this sheet has the name of a spanfleet result sheet but was not "
                "written by spanfleet, so it will not be replaced; rename it and run again"
            )
        ours.append(sheet.title)
    lossy = lossy_content(data, set(ours), keep_vba)
    for title in ours:
        wb.remove(wb[title])
    return OpenedBook(
        workbook=wb,
        cannot_keep=(*lossy, *(f"openpyxl: {m}" for m in lost)),
        replaced=tuple(ours),
        active=active if active not in ours else None,
        notes=notes,
    )
