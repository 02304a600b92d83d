"""The blank input workbook and any filled one, built from the input declarations.

Every sheet name, header, note, drop-down list, setting and example row comes
from :mod:`batch.model.columns`; this module only lays them out. Headers carry the
unit of the workbook's unit system in parentheses ("Spans (ft)"); each header
has a note with the column's meaning and its unit in both systems.

Output is deterministic (fixed document properties and zip timestamps), so a
regenerated workbook can be compared with a committed one, and it is written
atomically: a temporary file in the target folder replaces the target only
once it is complete.
"""

from __future__ import annotations

import datetime as dt
import io
import zipfile
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, replace
from pathlib import Path
from typing import BinaryIO

from openpyxl import Workbook
from openpyxl.cell.cell import Cell, MergedCell
from openpyxl.comments import Comment
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.datavalidation import DataValidation
from openpyxl.worksheet.header_footer import HeaderFooterItem
from openpyxl.worksheet.page import PageMargins
from openpyxl.worksheet.properties import PageSetupProperties
from openpyxl.worksheet.worksheet import Worksheet
from openpyxl.writer.excel import ExcelWriter

from batch.loads.distribution import LAYOUT_DFS, layout_factors
from batch.model import UNIT_LABELS, UNIT_SYSTEMS, Case, Spacing
from batch.model.declare import InputColumn, InputSheet
from batch.model.sheets import INPUT_SHEETS, SETTING_ROWS, SETTINGS
from batch.model.units import UnitSystem
from batch.reading.cells import NUMBER_RULE
from batch.writing.cautions import CAUTIONS, SIGN_CONVENTIONS
from batch.writing.package.save import SaveError, atomic_save
from batch.writing.package.stream import PageSetup
from batch.writing.printing import (
    HEADER_PARTS,
    LINE_POINTS,
    page_setup,
    wrapped_height,
    wrapped_lines,
)

__all__ = [
    "GUIDE_SHEET",
    "CellValue",
    "case_rows",
    "case_workbook",
    "input_workbook",
    "write_case_workbook",
    "write_template",
]

CellValue = str | int | float | None
Rows = Mapping[str, Sequence[Mapping[str, CellValue]]]

#: Name of the first sheet: how to fill the workbook in, and the cautions.
GUIDE_SHEET = "Start Here"

#: Fixed document timestamp, so that regenerating a workbook gives the same file.
FIXED_TIME = dt.datetime(2025, 1, 1)
_ZIP_TIME = (1980, 1, 1, 0, 0, 0)
#: Drop-down lists apply from row 2 down to the last row a sheet can have.
_LAST_ROW = 1_048_576
_MAX_WIDTH = 60
#: Widest a column grows for its header alone (characters); a longer header wraps.
_HEADER_CHARS = 16
#: Width of the guide sheet's one column, characters: narrow enough to print on a
#: portrait page of Letter or A4 at full size even in a font a third wider than the
#: workbook's (a program without Calibri substitutes one), since a one-column sheet is
#: not always shrunk to the page width (LibreOffice 7 does not, as its test shows).
_GUIDE_WIDTH = 68
#: Font sizes, points (the title's, and the default of every other cell).
_TITLE_POINTS = 14.0

_HEADER_FILL = PatternFill("solid", fgColor="D6E4DC")  # pale sage: optional columns
_REQUIRED_FILL = PatternFill("solid", fgColor="9FC2B0")  # deeper sage: required columns
_HEADER_FONT = Font(bold=True, color="17332A")
_EXAMPLE_FONT = Font(italic=True, color="6B6B6B")
_TITLE_FONT = Font(bold=True, size=_TITLE_POINTS, color="17332A")
_SECTION_FONT = Font(bold=True, color="17332A")
_WRAP = Alignment(wrap_text=True, vertical="top")


def _unit_note(column: InputColumn) -> str:
    if not column.quantity:
        return ""
    both = " or ".join(f"{UNIT_LABELS[u][column.quantity]} ({u})" for u in UNIT_SYSTEMS)
    return f"Unit: {both}, as set by Units on the Settings sheet."


def _header_note(column: InputColumn) -> str:
    """The note on a header: meaning, whether required, format, unit and an example."""
    if not column.meaning:
        return ""
    lines = [column.meaning, "Required." if column.required else ""]
    if column.kind in ("list", "spacing-list"):
        lines.append(
            "A list: numbers separated by commas, semicolons or spaces (not a mix); decimals "
            "with a point. A comma between two digits (12,5 or 60,80) is refused."
        )
    if column.choices:
        lines.append("One of: " + ", ".join(column.choices) + ".")
    lines.append(_unit_note(column))
    if column.example is not None and column.kind not in ("text", "id"):
        lines.append(f"Example: {column.example}")
    return "\n".join(line for line in lines if line)


def header_text(column: InputColumn, units: UnitSystem) -> str:
    """An input column's header with its unit in ``units``, e.g. ``"Spans (ft)"``."""
    if not column.quantity:
        return column.header
    return f"{column.header} ({UNIT_LABELS[units][column.quantity]})"


def _number_text(value: float) -> str:
    v = float(value)
    return str(int(v)) if v.is_integer() else repr(v)


def entry_text(entry: float | Spacing) -> str:
    """A list entry as typed in an input cell: ``60``, ``14.5`` or a range ``14-30``."""
    if not isinstance(entry, Spacing):
        return _number_text(entry)
    if entry.is_range:
        return f"{_number_text(entry.low)}-{_number_text(entry.high)}"
    return _number_text(entry.low)


def _cell_value(value: object) -> CellValue:
    """One model value as a cell: a list as text "60, 80, 60", a single number as a number."""
    if value is None or value == "" or value == ():
        return None
    if isinstance(value, tuple):
        first = value[0]
        if len(value) == 1 and not (isinstance(first, Spacing) and first.is_range):
            return _cell_value(first.low if isinstance(first, Spacing) else first)
        return ", ".join(entry_text(v) for v in value)
    if isinstance(value, str):
        return value
    if isinstance(value, int | float) and not isinstance(value, bool):
        return int(value) if float(value).is_integer() else float(value)
    raise TypeError(f"cannot write {value!r} into an input cell")


def _put(cell: Cell | MergedCell, value: CellValue) -> None:
    cell.value = value
    if isinstance(value, str) and value.startswith("="):
        cell.data_type = "s"  # text that looks like a formula stays text


def case_rows(case: Case) -> dict[str, list[dict[str, CellValue]]]:
    """The input-sheet rows of a model case (the optional sheets when it has rows for them).

    Rows are keyed by the declared column keys. Empty values (no hinges, no
    library, a blank resistance, ...) become blank cells; every other value is
    written, defaults included, so the sheet shows what was used. A member with a
    girder layout leaves blank each distribution factor the layout gives (so that
    reading the sheet back computes it again rather than taking it as typed).
    """
    objects: dict[str, tuple[object, ...]] = {"Members": case.members, "Vehicles": case.vehicles}
    if case.capacities:
        objects["Capacities"] = case.capacities
    segments = tuple(s for m in case.members for s in m.segments)
    if segments:
        objects["Segments"] = segments
    analysis = tuple(m.analysis for m in case.members if m.analysis is not None)
    if analysis:
        objects["Analysis"] = analysis
    layouts = tuple(m.layout for m in case.members if m.layout is not None)
    if layouts:
        objects["Girder Layout"] = layouts
    if case.service:
        objects["Service"] = case.service
    if case.bridges:
        objects["Bridges"] = case.bridges
    sheets = {sheet.name: sheet for sheet in INPUT_SHEETS}
    rows = {
        name: [
            {col.key: _cell_value(getattr(obj, col.key)) for col in sheets[name].columns}
            for obj in items
        ]
        for name, items in objects.items()
    }
    for member, row in zip(case.members, rows["Members"], strict=True):
        if member.layout is not None:
            factors = layout_factors(member.layout, member.spans, case.settings.units)
            for key, name in LAYOUT_DFS.items():
                if getattr(member, key) == getattr(factors, name):
                    row[key] = None
    return rows


def example_rows() -> dict[str, list[dict[str, CellValue]]]:
    """One example row per input sheet (Settings excepted), from the declared examples."""
    return {
        sheet.name: [{col.key: col.example for col in sheet.columns}]
        for sheet in INPUT_SHEETS
        if sheet is not SETTINGS
    }


def _style_header(ws: Worksheet, sheet: InputSheet, units: UnitSystem) -> None:
    for j, column in enumerate(sheet.columns, start=1):
        cell = ws.cell(row=1, column=j)
        _put(cell, header_text(column, units))
        cell.font = _HEADER_FONT
        cell.fill = _REQUIRED_FILL if column.required else _HEADER_FILL
        cell.alignment = Alignment(vertical="center", wrap_text=True)
        note = _header_note(column)
        if note:
            cell.comment = Comment(note, "spanfleet", height=150, width=320)


def _add_choice_list(ws: Worksheet, name: str, choices: tuple[str, ...], where: str) -> None:
    rule = DataValidation(
        type="list",
        formula1='"' + ",".join(choices) + '"',
        allow_blank=True,
        showErrorMessage=True,
        errorTitle=f"{name}: not a listed value",
        error=f"{name}: choose one of " + ", ".join(choices) + ".",
    )
    rule.add(where)
    ws.add_data_validation(rule)


def _set_widths(ws: Worksheet, texts_by_column: list[list[str]]) -> list[float]:
    widths: list[float] = []
    for j, texts in enumerate(texts_by_column, start=1):
        width = min(_MAX_WIDTH, max([10, *(len(t) + 3 for t in texts)]))
        ws.column_dimensions[get_column_letter(j)].width = width
        widths.append(width)
    return widths


def _print_setup(ws: Worksheet, page: PageSetup) -> None:
    """Apply ``page`` (:func:`batch.writing.printing.page_setup`) to an openpyxl sheet.

    The margins are those of the streamed result sheets, which the fit assumes.
    """
    ws.sheet_properties.pageSetUpPr = PageSetupProperties(fitToPage=True)
    ws.page_setup.paperSize = page.paper
    ws.page_setup.orientation = "landscape" if page.landscape else "portrait"
    ws.page_setup.fitToWidth = page.pages_wide
    ws.page_setup.fitToHeight = 0
    ws.page_margins = PageMargins(left=0.7, right=0.7, top=0.75, bottom=0.75)
    if page.title_rows:
        ws.print_title_rows = f"1:{page.title_rows}"
    if page.title_columns:
        ws.print_title_cols = f"A:{get_column_letter(page.title_columns)}"
    header = HeaderFooterItem()
    header.left.text, header.center.text, header.right.text = HEADER_PARTS
    ws.HeaderFooter.oddHeader = header


def _write_table(
    ws: Worksheet,
    sheet: InputSheet,
    units: UnitSystem,
    rows: Sequence[Mapping[str, CellValue]],
    example: bool,
) -> None:
    _style_header(ws, sheet, units)
    for i, row in enumerate(rows, start=2):
        for j, column in enumerate(sheet.columns, start=1):
            cell = ws.cell(row=i, column=j)
            _put(cell, row.get(column.key))
            if example:
                cell.font = _EXAMPLE_FONT
    for j, column in enumerate(sheet.columns, start=1):
        if column.choices:
            letter = get_column_letter(j)
            _add_choice_list(ws, column.header, column.choices, f"{letter}2:{letter}{_LAST_ROW}")
    headers = [header_text(c, units) for c in sheet.columns]
    # A long header wraps onto a second line rather than widening its column, so that a
    # sheet of many columns still prints to the page width.
    widths = _set_widths(
        ws,
        [
            [h[: _HEADER_CHARS - 3], *(str(r.get(c.key) or "") for r in rows)]
            for h, c in zip(headers, sheet.columns, strict=True)
        ],
    )
    lines = max(wrapped_lines(h, w) for h, w in zip(headers, widths, strict=True))
    if lines > 1:
        ws.row_dimensions[1].height = lines * LINE_POINTS
    ws.freeze_panes = "B2"
    _print_setup(ws, page_setup(widths, 1, units))


def _write_settings(ws: Worksheet, values: Mapping[str, CellValue], units: UnitSystem) -> None:
    _style_header(ws, SETTINGS, units)
    widths = [max(len(s.header) for s in SETTING_ROWS) + 4, 16, _MAX_WIDTH + 10]
    for i, setting in enumerate(SETTING_ROWS, start=2):
        _put(ws.cell(row=i, column=1), setting.header)
        _put(ws.cell(row=i, column=2), values.get(setting.key, setting.default))
        _put(ws.cell(row=i, column=3), setting.meaning)
        for j in (1, 2, 3):
            ws.cell(row=i, column=j).alignment = _WRAP
        height = wrapped_height([(setting.meaning, widths[2])])
        if height:
            ws.row_dimensions[i].height = height
        if setting.choices:
            _add_choice_list(ws, setting.header, setting.choices, f"B{i}")
    for j, width in enumerate(widths, start=1):
        ws.column_dimensions[get_column_letter(j)].width = width
    ws.freeze_panes = "A2"
    _print_setup(ws, page_setup(widths, 1, units))


def _guide_lines(units: UnitSystem) -> list[tuple[str, Font | None]]:
    section, plain = _SECTION_FONT, None
    lines: list[tuple[str, Font | None]] = [
        ("spanfleet input workbook", _TITLE_FONT),
        (
            "Fill in the sheets of this workbook, then run  spanfleet check BOOK.xlsx  to see "
            "every input problem at once, and  spanfleet run BOOK.xlsx  to compute the "
            "live-load envelopes. Results come back into this workbook as new sheets "
            "(Envelopes, Reactions, Governing, Run Log, and the rating and screening sheets "
            "when asked for); your own sheets are kept.",
            plain,
        ),
        ("", plain),
        ("The input sheets", section),
        *((f"{sheet.name}: {sheet.purpose}", plain) for sheet in INPUT_SHEETS),
        ("", plain),
        ("How to fill them in", section),
        (
            "1. Settings: choose the unit system first; every number in the workbook is in it "
            f"(this workbook: {units}, i.e. "
            + ", ".join(UNIT_LABELS[units][q] for q in ("force", "length", "moment", "line_load"))
            + f"; flexural rigidity in {UNIT_LABELS[units]['rigidity']}). "
            "The unit in a header's parentheses must agree with it. A blank value takes the "
            "default shown.",
            plain,
        ),
        (
            "2. Each input sheet holds one example row (Description starting EXAMPLE, in grey "
            "italics). Type over it or delete it.",
            plain,
        ),
        (
            "3. Point at a column header to read its meaning, whether it is required, its unit "
            "and an example. Darker headers are required columns.",
            plain,
        ),
        (
            "4. Lists: numbers separated by commas, semicolons or spaces, e.g. 60, 80, 60. An "
            "axle spacing may be a range such as 14-30: the spacing within the range that "
            "gives the worst effect is used.",
            plain,
        ),
        (f"5. Numbers and lists: {NUMBER_RULE}", plain),
        (
            "6. Capacities is optional: every station listed there is rated against every "
            "vehicle (Ratings and Rating Matrix sheets). Delete its example row, or the whole "
            "sheet, when you want envelopes only. Without capacities, a Reference vehicle in "
            "Settings compares every vehicle with that load (Screening sheets).",
            plain,
        ),
        (
            "7. Segments is optional: stretches of a member whose stiffness is not its Span "
            "EI (cover plates, flange changes, haunches). Delete its example row, or the whole "
            "sheet, when every span is prismatic.",
            plain,
        ),
        (
            "8. Bridges is optional too: a member that names its bridge (Bridge column) is "
            "rated with the live-load factors of the bridge's truck traffic (ADTT) and, for "
            "legal loads, the dynamic load allowance of its riding surface (AASHTO Manual for "
            "Bridge Evaluation); members with no bridge take the Settings' factors.",
            plain,
        ),
        (
            "9. Girder Layout is optional: from a member's place in its cross-section (girder "
            "type, spacing, deck, stiffness, overhang, skew) spanfleet computes its distribution "
            "factors by AASHTO LRFD 4.6.2.2 where Members leaves DF moment and DF shear blank "
            "(Distribution Factors sheet).",
            plain,
        ),
        (
            "10. Blank rows are skipped; hidden and filtered rows are read like any other. Keep "
            "the sheet names; you may add sheets of your own.",
            plain,
        ),
        ("", plain),
        ("Sign conventions", section),
        *((text, plain) for text in SIGN_CONVENTIONS),
        ("", plain),
        ("Cautions", section),
        *((text, plain) for text in CAUTIONS),
    ]
    return lines


def _write_guide(ws: Worksheet, units: UnitSystem) -> None:
    """The guide sheet: one column of wrapped text, each row as tall as its text needs."""
    for i, (text, font) in enumerate(_guide_lines(units), start=1):
        cell = ws.cell(row=i, column=1)
        _put(cell, text or None)
        cell.alignment = _WRAP
        if font is not None:
            cell.font = font
        points = float(font.size) if font is not None and font.size else 11.0
        height = wrapped_height([(text, _GUIDE_WIDTH)], points)
        if height:
            ws.row_dimensions[i].height = height
    ws.column_dimensions["A"].width = _GUIDE_WIDTH
    ws.sheet_view.showGridLines = False
    _print_setup(ws, replace(page_setup([_GUIDE_WIDTH], 0, units), title_rows=0))


def input_workbook(
    *,
    units: UnitSystem,
    settings: Mapping[str, CellValue],
    rows: Rows,
    example: bool = False,
) -> Workbook:
    """An input workbook: the guide sheet, Settings, then each input sheet named in ``rows``.

    ``settings`` maps setting keys to values (missing ones take their
    declared default); ``rows`` maps a sheet name to its rows, each a mapping
    from column key to cell value. ``example`` styles the rows as examples.
    """
    wb = Workbook()
    guide = wb.active
    assert isinstance(guide, Worksheet)  # a new workbook's one sheet
    _write_guide(guide, units)
    guide.title = GUIDE_SHEET
    _write_settings(wb.create_sheet(SETTINGS.name), settings, units)
    for sheet in INPUT_SHEETS:
        if sheet is not SETTINGS and sheet.name in rows:
            _write_table(wb.create_sheet(sheet.name), sheet, units, rows[sheet.name], example)
    props = wb.properties
    props.creator = props.lastModifiedBy = "spanfleet"
    props.title = "spanfleet input workbook"
    props.created = props.modified = FIXED_TIME
    return wb


def _fixed_zip(data: bytes) -> bytes:
    """Re-pack an xlsx with fixed member timestamps, so equal content gives equal bytes."""
    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as src, zipfile.ZipFile(out, "w") as dst:
        for info in src.infolist():
            fixed = zipfile.ZipInfo(info.filename, date_time=_ZIP_TIME)
            fixed.compress_type = zipfile.ZIP_DEFLATED
            dst.writestr(fixed, src.read(info.filename))
    return out.getvalue()


@dataclass(frozen=True)
class _Bytes:
    """A finished file's bytes, saved by :func:`batch.writing.package.save.atomic_save`."""

    data: bytes

    def save(self, filename: BinaryIO) -> None:
        filename.write(self.data)


def save_workbook(wb: Workbook, path: Path, *, overwrite: bool = False) -> None:
    """Save ``wb`` to ``path`` deterministically and atomically.

    The document properties set on ``wb`` are kept as they are (openpyxl's own
    save would stamp the current time). Raises ``FileExistsError`` when
    ``path`` exists and ``overwrite`` is false, ``FileNotFoundError`` when its
    folder does not exist, ``ValueError`` when the name does not end in ``.xlsx``,
    ``OSError`` (with the reason and what to do) when it cannot be written.
    """
    path = Path(path)
    if path.suffix.lower() != ".xlsx":
        raise ValueError(f"{path}: give a file name ending in .xlsx")
    if not path.parent.is_dir():
        raise FileNotFoundError(f"{path.parent}: no such folder; create it or choose another")
    if path.exists() and not overwrite:
        raise FileExistsError(
            f"{path} already exists; give a new file name (an existing workbook is never "
            "overwritten by a template)"
        )
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w", zipfile.ZIP_DEFLATED) as archive:
        ExcelWriter(wb, archive).write_data()
    try:
        atomic_save(_Bytes(_fixed_zip(buffer.getvalue())), path)
    except SaveError as exc:  # its message already says what to do
        raise OSError(str(exc)) from exc


def write_template(path: Path, *, overwrite: bool = False) -> None:
    """Write the blank, documented input workbook to ``path``.

    Settings hold their defaults, so headers show US units (kip, ft); each
    input sheet holds one example row to be replaced. Raises
    ``FileExistsError`` rather than overwrite an existing file unless
    ``overwrite`` is true, and ``ValueError`` for a name not ending in ``.xlsx``.
    """
    settings = {row.key: row.default for row in SETTING_ROWS}
    wb = input_workbook(units="US", settings=settings, rows=example_rows(), example=True)
    save_workbook(wb, path, overwrite=overwrite)


def case_workbook(case: Case) -> Workbook:
    """A model case as a filled input workbook (guide, Settings, Members, Vehicles, Capacities)."""
    settings = {row.key: _cell_value(getattr(case.settings, row.key)) for row in SETTING_ROWS}
    return input_workbook(units=case.settings.units, settings=settings, rows=case_rows(case))


def write_case_workbook(case: Case, path: Path, *, overwrite: bool = False) -> None:
    """Write a model case as a filled input workbook; see :func:`save_workbook` for errors."""
    save_workbook(case_workbook(case), path, overwrite=overwrite)
