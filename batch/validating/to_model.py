"""Turn a validated input document into the model (:class:`batch.model.Case`).

Only call this on a document with no errors: it trusts the schema and the
checks. The conversion follows the declarations of :mod:`batch.model.columns` (each
column's kind); a key that is absent takes the model's default. Numbers become
floats, or ints where the model's field is an int; text loses its outer spaces
(ids were compared for uniqueness that way).

A vehicle row that names a library model and leaves Category blank takes the
model's category. A capacity row names its member by the member's id exactly
as the Members sheet spells it (ids match ignoring case and outer spaces).
"""

from __future__ import annotations

import dataclasses
from typing import Any

from batch.loads import library
from batch.model import Capacity, Case, Member, Settings, Spacing, Vehicle
from batch.model.columns import CAPACITIES, MEMBERS, SETTING_ROWS, VEHICLES, InputSheet

__all__ = ["to_case"]

_INT_SETTINGS = {f.name for f in dataclasses.fields(Settings) if f.type in (int, "int")}


def _spacing(value: Any) -> Spacing:
    if isinstance(value, dict):
        return Spacing(low=float(value["low"]), high=float(value["high"]))
    return Spacing(low=float(value), high=float(value))


def _value(kind: str, value: Any) -> Any:
    if kind == "list":
        return tuple(float(v) for v in value)
    if kind == "spacing-list":
        return tuple(_spacing(v) for v in value)
    if kind == "number":
        return float(value)
    if kind == "text":
        return value.strip()
    return value


def _fields(sheet: InputSheet, doc: dict[str, Any]) -> dict[str, Any]:
    return {c.key: _value(c.kind, doc[c.key]) for c in sheet.columns if c.key in doc}


def _settings(doc: dict[str, Any]) -> Settings:
    values = {r.key: _value(r.kind, doc[r.key]) for r in SETTING_ROWS if r.key in doc}
    for key in _INT_SETTINGS & set(values):
        values[key] = int(values[key])
    return Settings(**values)


def _vehicle(doc: dict[str, Any]) -> Vehicle:
    values = _fields(VEHICLES, doc)
    if "category" not in values and values.get("library"):
        values["category"] = library.model(values["library"]).category
    return Vehicle(**values)


def _capacity(doc: dict[str, Any], ids: dict[str, str]) -> Capacity:
    values = _fields(CAPACITIES, doc)
    values["member"] = ids[values["member"].casefold()]
    values["span"] = int(values["span"])
    return Capacity(**values)


def to_case(document: dict[str, Any]) -> Case:
    """The model of a document that passed validation with no errors."""
    members = tuple(Member(**_fields(MEMBERS, m)) for m in document["members"])
    ids = {m.id.casefold(): m.id for m in members}
    return Case(
        settings=_settings(document.get("settings", {})),
        members=members,
        vehicles=tuple(_vehicle(v) for v in document["vehicles"]),
        capacities=tuple(_capacity(c, ids) for c in document.get("capacities", [])),
    )
