"""Helpers for the tests of the generated workbooks (template and samples).

:func:`snapshot` is a comparable picture of a workbook, what a person sees and
what a reader relies on, used to check that regenerated workbooks equal the
committed ones cell for cell.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path
from typing import Any

import openpyxl
import pytest


def snapshot(path: Path) -> dict[str, Any]:
    """Sheet names, document properties and, per sheet, cells, notes, lists and layout."""
    wb = openpyxl.load_workbook(path)
    props = wb.properties
    picture: dict[str, Any] = {
        "sheet names": wb.sheetnames,
        "properties": (props.creator, props.created, props.modified, props.title),
    }
    for ws in wb:
        cells = [c for row in ws.iter_rows() for c in row]
        picture[ws.title] = {
            "values": {c.coordinate: c.value for c in cells if c.value is not None},
            "notes": {c.coordinate: c.comment.text for c in cells if c.comment},
            "styles": {
                c.coordinate: (
                    c.font.b,
                    c.font.i,
                    c.font.color.rgb if c.font.color else None,
                    c.fill.fgColor.rgb,
                )
                for c in cells
                if c.value is not None
            },
            "validations": sorted(
                (dv.type, dv.formula1, str(dv.sqref), dv.allow_blank, dv.error)
                for dv in ws.data_validations.dataValidation
            ),
            "freeze panes": ws.freeze_panes,
            "widths": {k: d.width for k, d in ws.column_dimensions.items()},
        }
    return picture


def assert_same_workbook(fresh: Path, committed: Path) -> None:
    """Assert two workbooks look the same, sheet by sheet, naming what differs."""
    a, b = snapshot(fresh), snapshot(committed)
    hint = f"{committed.name} is out of date: run `python scripts/generate.py` and commit"
    assert a.keys() == b.keys(), hint
    for key in a:
        if isinstance(a[key], dict):
            for part in a[key]:
                assert a[key][part] == b[key][part], f"{key} {part}: {hint}"
        else:
            assert a[key] == b[key], f"{key}: {hint}"


def read_input_or_skip() -> Callable[[Path], Any]:
    """The workbook reader ``batch.validating.read_input``, or skip while it is not built."""
    readers = pytest.importorskip("batch.validating", reason="batch.validating is not built yet")
    if not hasattr(readers, "read_input"):
        pytest.skip("batch.validating.read_input is not built yet")
    return readers.read_input
