"""The JSON Schema (draft 2020-12) of the normalised input document, generated.

Every rule comes from a column's declaration (:mod:`batch.model.declare`): its
kind gives the JSON type, its bounds the minimum and maximum, ``required`` the
required keys. Validation checks documents against :func:`input_schema`; the
copy in ``schemas/spanfleet-input.schema.json`` is written from it by
``scripts/generate.py`` for people and other programs, and a test keeps it
current. Rules a schema cannot express (lists whose lengths must agree, hinge
layouts, unique ids, library names) are checked by :mod:`batch.validating.checks`.
"""

from __future__ import annotations

import functools
from typing import Any

from batch.model.declare import InputColumn, InputSheet
from batch.model.sheets import SETTING_ROWS, TABLE_SHEETS

__all__ = ["SCHEMA_ID", "input_schema"]

SCHEMA_ID = "urn:spanfleet:schema:input:1"

_DESCRIPTION = (
    "The normalised input of a spanfleet run: settings, members (girder lines), vehicles "
    "and, optionally, capacities for rating. Lengths, forces and loads per length are in the "
    "unit system named by settings.units (US: ft, kip, kip/ft; SI: m, kN, kN/m). A workbook's "
    "input sheets are read into this document; the same document may be given directly as a "
    ".json file. Generated from the column declarations of spanfleet's model; rules that JSON "
    "Schema cannot express (list lengths that must agree, hinge layouts, unique ids, library "
    "names, plausible magnitudes, capacities that match a member's stations) are checked by "
    "spanfleet's validation."
)


def _number_rule(col: InputColumn) -> dict[str, Any]:
    rule: dict[str, Any] = {"type": "integer" if col.whole else "number"}
    for key, value in (
        ("minimum", col.minimum),
        ("exclusiveMinimum", col.above),
        ("maximum", col.maximum),
        ("exclusiveMaximum", col.below),
    ):
        if value is not None:
            rule[key] = value
    return rule


def _value(col: InputColumn) -> dict[str, Any]:
    """The schema of one column's value."""
    if col.kind == "id":
        rule: dict[str, Any] = {"type": "string", "pattern": r"\S"}
    elif col.kind == "text":
        rule = {"type": "string"}
    elif col.kind == "choice":
        rule = {"enum": list(col.choices)}
    elif col.kind == "number":
        rule = _number_rule(col)
    else:
        item = _number_rule(col)
        if col.kind == "spacing-list":
            span = {
                "description": "A spacing that may vary between low and high "
                "(the worst spacing within is used).",
                "type": "object",
                "required": ["low", "high"],
                "additionalProperties": False,
                "properties": {"low": item, "high": item},
            }
            item = {"oneOf": [item, span]}
        rule = {"type": "array", "items": item}
        if col.min_items:
            rule["minItems"] = col.min_items
    return {"description": col.meaning, **rule} if col.meaning else rule


def _object(columns: tuple[InputColumn, ...], description: str) -> dict[str, Any]:
    required = [c.key for c in columns if c.required]
    out: dict[str, Any] = {"description": description, "type": "object"}
    if required:
        out["required"] = required
    out["additionalProperties"] = False
    out["properties"] = {c.key: _value(c) for c in columns}
    return out


def _table(sheet: InputSheet) -> dict[str, Any]:
    out: dict[str, Any] = {"description": sheet.purpose, "type": "array"}
    if sheet.required:
        out["minItems"] = 1
    out["items"] = _object(sheet.columns, f"One row of the {sheet.name} sheet.")
    return out


@functools.cache
def input_schema() -> dict[str, Any]:
    """The input document's JSON Schema (draft 2020-12), built from the declarations."""
    return {
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "$id": SCHEMA_ID,
        "title": "spanfleet input document",
        "description": _DESCRIPTION,
        "type": "object",
        "required": [s.key for s in TABLE_SHEETS if s.required],
        "additionalProperties": False,
        "properties": {
            "settings": _object(SETTING_ROWS, "Run settings; a missing key takes its default."),
            **{s.key: _table(s) for s in TABLE_SHEETS},
        },
    }
