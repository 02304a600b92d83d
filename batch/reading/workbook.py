"""Read the input sheets of an .xlsx workbook into the normalised document.

The workbook is opened twice from its bytes, read-only: once for the values
(``data_only=True`` gives the value saved with each formula) and once for the
formulas, to tell a formula with no saved value (a file written by a program
that does not calculate) from a blank cell. Only the columns declared in
:mod:`batch.model.columns` are read, and never more than
:data:`~batch.reading.safety.MAX_INPUT_ROWS` rows of
:data:`~batch.reading.safety.MAX_INPUT_COLUMNS` columns.

Every value taken into the document has its (sheet, cell) recorded in the
:class:`~batch.reading.problems.WorkbookLocator`, so schema errors and
checks found later point back at the cell the engineer typed.
"""

from __future__ import annotations

import io
import itertools
import re
import warnings
import zipfile
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

import openpyxl
from defusedxml import DefusedXmlException
from openpyxl.utils import get_column_letter

from batch.model import UNIT_SYSTEMS, Settings
from batch.model.declare import InputSheet, header_key
from batch.model.sheets import INPUT_SHEETS, SETTING_ROWS, SETTINGS, TABLE_SHEETS
from batch.reading.cells import Note, read_cell
from batch.reading.headers import HeaderMatch, match_headers, unit_in_header
from batch.reading.hidden import Hidden, hidden_in_part
from batch.reading.problems import (
    DocPath,
    Problem,
    Reading,
    Severity,
    WorkbookLocator,
    file_problem,
)
from batch.reading.safety import MAX_INPUT_COLUMNS, MAX_INPUT_ROWS, xml_entities_problem

__all__ = ["read_workbook"]

# A formula element in sheet XML, with or without a namespace prefix (<f>, <x:f t="shared">).
_FORMULA_TAG = re.compile(rb"<(?:\w+:)?f[\s>/]")


@dataclass(frozen=True)
class _Cell:
    value: object
    number_format: str
    formula: str | None  # formula text, when the formula has no saved value


@dataclass(frozen=True)
class _RawSheet:
    """One input sheet as found: header, the rows of the columns read, and what was not read.

    ``beyond`` is the first cell holding data below the last row read (row
    :data:`MAX_INPUT_ROWS` + 1); ``unheaded`` the first cell with data of each column
    with no header; ``unread_rows`` the first data cell of each row whose data is
    all in columns spanfleet does not read; ``hidden_rows`` the data rows the
    sheet hides (by hand or by a filter), ``hidden_columns`` the read columns it
    hides.
    """

    title: str
    header: list[tuple[str, object]]  # (cell, value) of row 1
    match: HeaderMatch
    rows: list[tuple[int, dict[int, _Cell]]]  # non-blank rows: (row number, column -> cell)
    too_many_columns: bool
    beyond: str | None = None
    unheaded: tuple[str, ...] = ()
    unread_rows: tuple[str, ...] = ()
    hidden_rows: tuple[int, ...] = ()
    hidden_columns: tuple[int, ...] = ()


def _is_blank(value: object) -> bool:
    return value is None or (isinstance(value, str) and not value.strip())


def _formula(frow: Any, col: int) -> str | None:
    """The formula text of a cell of the formulas pass, when it holds one."""
    if frow is None or col > len(frow) or frow[col - 1].data_type != "f":
        return None
    value = frow[col - 1].value
    return str(getattr(value, "text", value))


def _raw_sheet(
    values: Any, formulas: Any | None, spec: InputSheet, title: str, hidden: Hidden
) -> _RawSheet:
    ws = values[title]
    # Each row as long as its own last cell, whatever size the sheet's dimension claims.
    ws.reset_dimensions()
    first = next(iter(ws.iter_rows(min_row=1, max_row=1, max_col=MAX_INPUT_COLUMNS + 1)), ())
    header = [(f"{get_column_letter(i)}1", c.value) for i, c in enumerate(first, start=1)]
    too_wide = len(header) > MAX_INPUT_COLUMNS and not _is_blank(header[MAX_INPUT_COLUMNS][1])
    match = match_headers(spec, header[:MAX_INPUT_COLUMNS])
    wanted = sorted(set(match.columns.values()))
    unread = [c for c in range(1, MAX_INPUT_COLUMNS + 1) if c not in set(wanted)]
    headed = {i for i, (_, v) in enumerate(header[:MAX_INPUT_COLUMNS], start=1) if not _is_blank(v)}
    rows: list[tuple[int, dict[int, _Cell]]] = []
    unheaded: dict[int, str] = {}
    unread_rows: list[str] = []
    beyond = None
    if formulas is not None:
        formulas[title].reset_dimensions()
    value_rows = ws.iter_rows(min_row=2)
    formula_rows = (
        itertools.repeat(None) if formulas is None else formulas[title].iter_rows(min_row=2)
    )
    # The values pass ends the rows; the formula pass (or the endless None) follows it.
    paired = zip(value_rows, formula_rows, strict=False)
    for number, (row, frow) in enumerate(paired, start=2):
        cells = {}
        for col in wanted:
            if col > len(row):
                break
            cell = row[col - 1]
            formula = _formula(frow, col) if cell.value is None else None
            if formula or not _is_blank(cell.value):
                fmt = getattr(cell, "number_format", None) or "General"
                cells[col] = _Cell(cell.value, fmt, formula)
        # Data in a column that is not read: under no header, or under an unknown one.
        width = max(len(row), 0 if frow is None else len(frow))
        other = [
            col
            for col in itertools.chain(unread, range(MAX_INPUT_COLUMNS + 1, width + 1))
            if col <= width
            and ((col <= len(row) and not _is_blank(row[col - 1].value)) or _formula(frow, col))
        ]
        if not cells and not other:
            continue
        if number > MAX_INPUT_ROWS + 1:
            beyond = f"{get_column_letter((sorted(cells) or other)[0])}{number}"
            break
        if not cells:
            unread_rows.append(f"{get_column_letter(other[0])}{number}")
            continue
        for col in other:
            if col not in headed:
                unheaded.setdefault(col, f"{get_column_letter(col)}{number}")
        rows.append((number, cells))
    return _RawSheet(
        title=title,
        header=header,
        match=match,
        rows=rows,
        too_many_columns=too_wide,
        beyond=beyond,
        unheaded=tuple(unheaded[c] for c in sorted(unheaded)),
        unread_rows=tuple(unread_rows),
        hidden_rows=tuple(n for n, _ in rows if n in hidden.rows),
        hidden_columns=tuple(c for c in wanted if c in hidden.columns),
    )


def _has_formulas(data: bytes, parts: Sequence[str] | None) -> bool:
    """Whether a worksheet holds a formula (an ``<f>`` element), by a scan of the raw XML.

    Only the worksheet ``parts`` are scanned (the input sheets; None: every worksheet),
    not the result sheets of an earlier run, which are replaced and never read. Most
    inventories hold no formula, and then the second, formula-reading pass is skipped.
    """
    with zipfile.ZipFile(io.BytesIO(data)) as archive:
        for name in archive.namelist() if parts is None else parts:
            if name.startswith("xl/worksheets/") and name.endswith(".xml"):
                if _FORMULA_TAG.search(archive.read(name)):
                    return True
    return False


def _input_parts(values: Any, matching: Mapping[str, list[str]]) -> list[str] | None:
    """The worksheet parts of the input sheets found (None: one part's name is unknown)."""
    parts = []
    for spec in INPUT_SHEETS:
        for title in matching.get(spec.name.lower(), []):
            # (openpyxl's read-only sheet keeps the name of its part privately)
            part = getattr(values[title], "_worksheet_path", None)
            if not isinstance(part, str):
                return None
            parts.append(part)
    return parts


@dataclass(frozen=True)
class _Extracted:
    """What the workbook holds for the reader: the input sheets, and every sheet's title."""

    raw: dict[str, _RawSheet]
    titles: set[str]  # lower-cased, outer spaces removed
    twins: dict[str, tuple[str, ...]]  # input sheet name -> titles of every sheet matching it


def _extract(data: bytes) -> _Extracted:
    """The raw input sheets by declared name, and the sheet titles of the workbook."""
    with warnings.catch_warnings():
        # openpyxl warns about features it drops (data validation extensions, odd
        # dates); reading values only, none of them matters here.
        warnings.simplefilter("ignore")
        values = openpyxl.load_workbook(io.BytesIO(data), read_only=True, data_only=True)
        formulas = None
        try:
            matching: dict[str, list[str]] = {}
            for t in values.sheetnames:
                matching.setdefault(t.strip().lower(), []).append(t)
            if _has_formulas(data, _input_parts(values, matching)):
                formulas = openpyxl.load_workbook(io.BytesIO(data), read_only=True, data_only=False)
            raw = {}
            with zipfile.ZipFile(io.BytesIO(data)) as archive:
                for spec in INPUT_SHEETS:
                    found = matching.get(spec.name.lower(), [])
                    if len(found) != 1 or not hasattr(values[found[0]], "iter_rows"):
                        continue
                    part = getattr(values[found[0]], "_worksheet_path", None)
                    hidden = (
                        Hidden()
                        if not isinstance(part, str)
                        else hidden_in_part(archive, part, MAX_INPUT_COLUMNS)
                    )
                    raw[spec.name] = _raw_sheet(values, formulas, spec, found[0], hidden)
            twins = {
                spec.name: tuple(matching[spec.name.lower()])
                for spec in INPUT_SHEETS
                if len(matching.get(spec.name.lower(), [])) > 1
            }
            return _Extracted(raw=raw, titles=set(matching), twins=twins)
        finally:
            values.close()
            if formulas is not None:
                formulas.close()


#: What one row of each input sheet is, for messages.
_NOUNS = {
    "settings": "setting",
    "members": "member",
    "vehicles": "vehicle",
    "capacities": "station",
    "service": "station",
    "segments": "stretch",
    "analysis": "member",
    "layout": "member",
    "bridges": "bridge",
}


def _listed(items: Sequence[str], noun: str, verb: tuple[str, str] = ("", "")) -> str:
    """``"rows 7, 9 and 12 are"``: five items named, the rest counted; ``verb`` (one, many)."""
    named = [*items[:5]]
    if len(items) > len(named):
        named.append(f"{len(items) - len(named):,} more")
    if len(items) == 1:
        return f"{noun} {named[0]} {verb[0]}".strip()
    return f"{noun}s {', '.join(named[:-1])} and {named[-1]} {verb[1]}".strip()


@dataclass
class _Builder:
    """Collects the document's cell positions, problems and unreadable paths."""

    cells: dict[DocPath, tuple[str, str]] = field(default_factory=dict)
    problems: list[Problem] = field(default_factory=list)
    blocked: set[DocPath] = field(default_factory=set)
    twins: dict[str, tuple[str, ...]] = field(default_factory=dict)

    def add(
        self,
        code: str,
        sheet: str,
        cell: str,
        message: str,
        severity: Severity = "error",
        value: object = None,
    ) -> None:
        shown = None if value is None else str(value)
        self.problems.append(
            Problem(
                code=code, sheet=sheet, cell=cell, message=message, severity=severity, value=shown
            )
        )

    def value(self, sheet: str, ref: str, path: DocPath, column: Any, cell: _Cell | None) -> object:
        """The document value of one cell (``None`` when blank or unreadable)."""
        self.cells[path] = (sheet, ref)
        if cell is None:
            return None
        if cell.formula:
            self.blocked.add(path)
            self.add(
                "formula-not-calculated",
                sheet,
                ref,
                f"the formula {cell.formula} has no saved result (the file was written by a "
                "program that does not calculate); open the workbook in your spreadsheet "
                "program, recalculate and save it, or type the value",
                value=cell.formula,
            )
            return None
        got = read_cell(column.kind, cell.value, cell.number_format, column.choices)
        if isinstance(got, Note):
            self.blocked.add(path)
            self.add(got.code, sheet, ref, got.message, value=cell.value)
            return None
        return got

    def headers(self, spec: InputSheet, raw: _RawSheet | None, units: str | None) -> bool:
        """Report header problems of one sheet; True when its rows can be read."""
        if spec.name in self.twins:
            titles = " and ".join(repr(t) for t in self.twins[spec.name])
            self.add(
                "duplicate-sheet",
                spec.name,
                "",
                f"the workbook has sheets {titles}, which are the same name once case and "
                "spaces are ignored, so it is not clear which to read; rename or delete all "
                f"but one of them",
            )
            return False
        if raw is None:
            names = ", ".join(c.header for c in spec.columns if c.required)
            self.add(
                "missing-sheet",
                spec.name,
                "",
                f"the workbook has no sheet named {spec.name}; add a sheet {spec.name} with "
                f"{names} in row 1 (`spanfleet template NEW.xlsx` writes a blank workbook "
                "to copy from)",
            )
            return False
        sheet, match = raw.title, raw.match
        if raw.too_many_columns:
            self.add(
                "too-many-columns",
                sheet,
                "",
                f"row 1 has more than {MAX_INPUT_COLUMNS} columns; delete the unused columns",
            )
        for text, first, second in match.duplicates:
            self.add(
                "duplicate-header",
                sheet,
                second,
                f"the column {text} appears twice (also {first}); delete or rename one of them",
                value=text,
            )
        for cell, text in match.unknown:
            close = HeaderMatch.suggestion(text, spec)
            hint = f"; did you mean {close}?" if close else ""
            self.add(
                "unknown-column",
                sheet,
                cell,
                f"spanfleet does not read a column headed {text!r}; it is ignored{hint}",
                severity="warning",
                value=text,
            )
        for column in match.missing(spec):
            found = ", ".join(repr(str(v).strip()) for _, v in raw.header if not _is_blank(v))
            self.add(
                "missing-header",
                sheet,
                "",
                f"row 1 has no {column.header} header; add a column headed {column.header} "
                f"(headers found: {found or 'none'})",
            )
        header_text = dict(raw.header)
        for column in spec.columns:
            ref = match.cells.get(column.key)
            if ref is None or units is None:
                continue
            why = unit_in_header(header_text[ref], column, units)
            if why:
                self.add(why[0], sheet, ref, why[1], value=header_text[ref])
        if match.missing(spec):
            return False
        self.unread(spec, raw)
        return raw.beyond is None

    def unread(self, spec: InputSheet, raw: _RawSheet) -> None:
        """Report data the sheet holds where spanfleet does not read, and what it hides."""
        sheet, noun = raw.title, _NOUNS[spec.key]
        if raw.beyond is not None:
            self.add(
                "too-many-rows",
                sheet,
                raw.beyond,
                f"this cell holds data below row {MAX_INPUT_ROWS + 1:,}, and spanfleet reads at "
                f"most {MAX_INPUT_ROWS:,} rows of one sheet, so the rows there would be left out; "
                f"split the inventory into workbooks of at most {MAX_INPUT_ROWS:,} {noun}s",
            )
        if raw.unheaded:
            letters = [ref.rstrip("0123456789") for ref in raw.unheaded]
            absent = [c.header for c in spec.columns if c.key not in raw.match.columns]
            example = f" (e.g. {absent[0]})" if absent else ""
            self.add(
                "data-without-header",
                sheet,
                raw.unheaded[0],
                f"there is data in {_listed(letters, 'column')} under no header in row 1 "
                f"(first at {raw.unheaded[0]}), which spanfleet would not read; give each such "
                f"column the header it belongs under{example}, or delete its values",
            )
        if raw.unread_rows:
            needs = ", ".join(c.header for c in spec.columns if c.required)
            numbers = [ref.lstrip("ABCDEFGHIJKLMNOPQRSTUVWXYZ") for ref in raw.unread_rows]
            self.add(
                "row-not-read",
                sheet,
                raw.unread_rows[0],
                f"{_listed(numbers, 'row', ('holds', 'hold'))} data only in columns spanfleet "
                "does not read, so it would be left out; put the values under the right "
                f"headers (a {noun} row needs {needs}) or delete them",
            )
        if raw.hidden_rows:
            id_col = get_column_letter(raw.match.columns[spec.columns[0].key])
            numbers = [str(n) for n in raw.hidden_rows]
            self.add(
                "hidden-rows",
                sheet,
                f"{id_col}{raw.hidden_rows[0]}",
                f"{_listed(numbers, 'row', ('is', 'are'))} hidden (by hand or by a filter); "
                f"spanfleet reads hidden rows like any other, so each {noun} there is used; "
                "delete the rows you do not want used",
                severity="warning",
            )
        for col in raw.hidden_columns:
            ref = f"{get_column_letter(col)}1"
            self.add(
                "hidden-column",
                sheet,
                ref,
                f"the column {dict(raw.header)[ref]} is hidden; spanfleet reads hidden "
                "columns like any other, so its values are used; show it to check them",
                severity="warning",
            )

    def settings(self, raw: _RawSheet | None) -> dict[str, object]:
        """The Settings sheet as the document's ``settings`` object."""
        self.cells[("settings",)] = (SETTINGS.name, "")
        out: dict[str, object] = {}
        if not self.headers(SETTINGS, raw, None) or raw is None:
            self.blocked.add(("settings",))
            return out
        by_name = {header_key(r.header): r for r in SETTING_ROWS}
        name_col, value_col = raw.match.columns["setting"], raw.match.columns["value"]
        seen: dict[str, str] = {}
        for number, cells in raw.rows:
            name_ref = f"{get_column_letter(name_col)}{number}"
            value_ref = f"{get_column_letter(value_col)}{number}"
            name_cell, value_cell = cells.get(name_col), cells.get(value_col)
            name = "" if name_cell is None else str(name_cell.value or "").strip()
            if not name:
                if value_cell is not None:
                    self.add(
                        "setting-without-name",
                        raw.title,
                        value_ref,
                        "a value with no setting name beside it is ignored; type the "
                        f"setting's name in {name_ref} or delete the value",
                        severity="warning",
                    )
                continue
            row = by_name.get(header_key(name))
            if row is None:
                known = ", ".join(r.header for r in SETTING_ROWS)
                self.add(
                    "unknown-setting",
                    raw.title,
                    name_ref,
                    f"{name!r} is not a setting spanfleet knows, so it is ignored; "
                    f"the settings are: {known}",
                    severity="warning",
                    value=name,
                )
                continue
            if row.key in seen:
                self.add(
                    "duplicate-setting",
                    raw.title,
                    name_ref,
                    f"{row.header} is set twice (also in {seen[row.key]}); keep one of the rows",
                    value=name,
                )
                continue
            seen[row.key] = name_ref
            path = ("settings", row.key)
            got = self.value(raw.title, value_ref, path, row, value_cell)
            if got is not None:
                out[row.key] = got
        return out

    def table(self, spec: InputSheet, raw: _RawSheet | None, units: str | None) -> list:
        """The rows of a table sheet (Members, Vehicles, ...) as the document's list of objects."""
        key = spec.key
        self.cells[(key,)] = (spec.name, "")
        if not self.headers(spec, raw, units) or raw is None:
            self.blocked.add((key,))
            return []
        columns = raw.match.columns
        id_col = columns[spec.columns[0].key]  # the row's id (Capacities: its member)
        out: list[dict[str, object]] = []
        for number, cells in raw.rows:
            index = len(out)
            self.cells[(key, index)] = (raw.title, f"{get_column_letter(id_col)}{number}")
            entry: dict[str, object] = {}
            for column in spec.columns:
                col = columns.get(column.key)
                if col is None:
                    continue
                ref = f"{get_column_letter(col)}{number}"
                got = self.value(raw.title, ref, (key, index, column.key), column, cells.get(col))
                if got is not None:
                    entry[column.key] = got
            out.append(entry)
        return out


def _refused_xml(exc: BaseException | None) -> bool:
    """True when ``exc`` or an error it was raised from is defusedxml refusing the XML."""
    for _ in range(10):  # a chain of causes is short; the bound guards against a cycle
        if exc is None:
            return False
        if isinstance(exc, DefusedXmlException):
            return True
        exc = exc.__cause__ or exc.__context__
    return False


def read_workbook(data: bytes) -> Reading:
    """Read a workbook's bytes into the normalised document; never raises for bad input."""
    try:
        found = _extract(data)
    except Exception as exc:
        # Whatever openpyxl trips over inside a damaged file, the fix is the same,
        # except for XML that defusedxml refused (openpyxl may wrap that error).
        if _refused_xml(exc):
            return Reading(
                document=None, locator=WorkbookLocator(), problems=(xml_entities_problem(),)
            )
        return Reading(
            document=None,
            locator=WorkbookLocator(),
            problems=(
                file_problem(
                    "workbook-unreadable",
                    f"the workbook cannot be read ({type(exc).__name__}: {exc}); open it in "
                    "your spreadsheet program and save it again as .xlsx",
                ),
            ),
        )
    raw, titles = found.raw, found.titles
    build = _Builder(twins=found.twins)
    settings = build.settings(raw.get(SETTINGS.name))
    units = settings.get("units", Settings().units)
    if units not in UNIT_SYSTEMS or ("settings", "units") in build.blocked:
        units = None  # unknown unit system: the schema reports it; header units go unjudged
    document: dict[str, Any] = {"settings": settings}
    for sheet in TABLE_SHEETS:
        # An optional sheet (Capacities) is read when the workbook has a sheet of that name.
        if sheet.required or sheet.name.lower() in titles:
            document[sheet.key] = build.table(sheet, raw.get(sheet.name), units)
    return Reading(
        document=document,
        locator=WorkbookLocator(build.cells),
        problems=tuple(build.problems),
        blocked=frozenset(build.blocked),
    )
