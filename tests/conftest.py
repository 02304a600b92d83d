"""Shared fixtures: build input workbooks from plain Python data in a test's tmp_path.

``make_workbook(tmp_path, settings=..., members=[...], vehicles=[...], extra=...)``
writes an .xlsx with a Settings sheet (Setting/Value rows), a Members sheet and
a Vehicles sheet whose header row is the union of the row dicts' keys (in first
seen order), and returns its path. Demo data is the fictional Kestrel Valley
Highway Authority's (KVHA).
"""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence
from pathlib import Path
from typing import Any

import openpyxl
import pytest

#: One valid simple-span member and one valid truck, used when a test passes none.
DEFAULT_MEMBERS: tuple[dict[str, Any], ...] = (
    {"Member": "KV-0101 G1", "Spans (ft)": "60", "Description": "Alder Brook culvert deck"},
)
DEFAULT_VEHICLES: tuple[dict[str, Any], ...] = (
    {"Vehicle": "KV-T3", "Axle loads (kip)": "10, 30, 30", "Axle spacings (ft)": "14, 16"},
)
#: The headers written on an empty Members or Vehicles sheet (the required ones).
_EMPTY_HEADERS = {"Members": ["Member", "Spans"], "Vehicles": ["Vehicle", "Axle loads"]}


def _table(ws: Any, rows: Sequence[Mapping[str, Any]], empty_headers: list[str]) -> None:
    headers: list[str] = []
    for row in rows:
        headers += [h for h in row if h not in headers]
    ws.append(headers or empty_headers)
    for row in rows:
        ws.append([row.get(h) for h in headers])


def write_workbook(
    folder: Path,
    *,
    settings: Mapping[str, Any] | None = None,
    members: Sequence[Mapping[str, Any]] | None = None,
    vehicles: Sequence[Mapping[str, Any]] | None = None,
    extra: Mapping[str, Sequence[Sequence[Any]]] | None = None,
    omit: Sequence[str] = (),
    name: str = "kvha-book.xlsx",
) -> Path:
    """Write an input workbook into ``folder`` and return its path.

    ``settings`` maps setting names to values (None: a Settings sheet with the
    header row only, so every setting takes its default). ``members`` and
    ``vehicles`` are lists of {header: value} rows (None: one valid row; []: the
    required headers and no rows). ``extra`` maps sheet names to raw rows (row 1
    first); a name equal to an input sheet replaces the generated sheet.
    ``omit`` names input sheets to leave out.
    """
    extra = dict(extra or {})
    wb = openpyxl.Workbook()
    wb.remove(wb.active)
    tables = {
        "Members": DEFAULT_MEMBERS if members is None else members,
        "Vehicles": DEFAULT_VEHICLES if vehicles is None else vehicles,
    }
    for title in ("Settings", "Members", "Vehicles"):
        if title in omit or title in extra:
            continue
        ws = wb.create_sheet(title)
        if title == "Settings":
            ws.append(["Setting", "Value"])
            for key, value in (settings or {}).items():
                ws.append([key, value])
        else:
            _table(ws, tables[title], _EMPTY_HEADERS[title])
    for title, rows in extra.items():
        ws = wb.create_sheet(title)
        for row in rows:
            ws.append(list(row))
    path = folder / name
    wb.save(path)
    return path


@pytest.fixture
def make_workbook() -> Callable[..., Path]:
    """The workbook builder :func:`write_workbook` (call it with ``tmp_path`` first)."""
    return write_workbook
