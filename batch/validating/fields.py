"""Names of document fields in the words of the input sheets, for messages.

A document path such as ``("members", 3, "spans", 1)`` is described with the
sheet's header (``Spans``) so that workbook users and JSON users read the same
message; the declarations come from :mod:`batch.model.sheets`.
"""

from __future__ import annotations

import json
import math

from batch.model.declare import InputColumn
from batch.model.sheets import SETTING_ROWS, TABLE_SHEETS
from batch.reading.problems import DocPath

__all__ = ["declaration", "entry", "finite_number", "label", "shown"]

_TABLES = {sheet.key: sheet for sheet in TABLE_SHEETS}


def declaration(path: DocPath) -> InputColumn | None:
    """The declared column (or setting row) a path belongs to, if any."""
    if len(path) >= 3 and path[0] in _TABLES:
        return next((c for c in _TABLES[str(path[0])].columns if c.key == path[2]), None)
    if len(path) >= 2 and path[0] == "settings":
        return next((r for r in SETTING_ROWS if r.key == path[1]), None)
    return None


def label(path: DocPath) -> str:
    """The field's name as headed in the workbook (``Spans``), or the sheet's name."""
    found = declaration(path)
    if found is not None:
        return found.header
    if path and path[0] in _TABLES:
        return _TABLES[str(path[0])].name
    if path and path[0] == "settings":
        return "Settings"
    return "the document"


def entry(path: DocPath) -> str:
    """``"Spans"``, or ``"entry 2 of Spans"`` for the second item of a list field."""
    name = label(path)
    depth = 3 if path and path[0] in _TABLES else 2
    index = path[depth] if len(path) > depth else None
    if isinstance(index, int):
        return f"entry {index + 1} of {name}"
    return name


def shown(value: object) -> str:
    """A value as written in a message: numbers plainly, text quoted, the rest as JSON."""
    if isinstance(value, bool) or value is None:
        return json.dumps(value)
    if isinstance(value, float) and value.is_integer() and abs(value) < 1e15:
        return str(int(value))
    if isinstance(value, int | float):
        return str(value)
    if isinstance(value, str):
        return repr(value)
    try:
        return json.dumps(value)
    except (TypeError, ValueError):
        return repr(value)


def finite_number(value: object) -> float | None:
    """A document value as a finite float, or None when it is not one (text, bool, NaN)."""
    if isinstance(value, bool) or not isinstance(value, int | float):
        return None
    return float(value) if math.isfinite(value) else None
