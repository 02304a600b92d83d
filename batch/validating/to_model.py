"""Turn a validated input document into the model (:class:`batch.model.Case`).

Only call this on a document with no errors: it trusts the schema and the
checks. The conversion follows the declarations of :mod:`batch.model.sheets` (each
column's kind); a key that is absent takes the model's default. Numbers become
floats, or ints where the model's field is an int; text loses its outer spaces
(ids were compared for uniqueness that way).

A vehicle row that names a library model and leaves Category blank takes the
model's category. A capacity (or service) row names its member by the member's id exactly
as the Members sheet spells it, and a member its bridge by the Bridges sheet's
spelling (ids match ignoring case and outer spaces). Each member carries its
Segments rows, its Analysis row and its Girder Layout row
(:attr:`batch.model.Member.segments`, :attr:`batch.model.Member.analysis`,
:attr:`batch.model.Member.layout`). A member with a girder layout takes each of
its four distribution factors (DF moment, DF shear and their single-lane
values) that its Members row leaves blank from the layout
(:func:`batch.loads.distribution.layout_factors`); one typed there prevails.
"""

from __future__ import annotations

import dataclasses
from typing import Any

from batch.loads import library
from batch.loads.distribution import LAYOUT_DFS, layout_factors
from batch.model import (
    Analysis,
    Bridge,
    Capacity,
    Case,
    GirderLayout,
    Member,
    Segment,
    ServiceSection,
    Settings,
    Spacing,
    Vehicle,
)
from batch.model.declare import InputColumn
from batch.model.sheets import (
    ANALYSIS,
    BRIDGES,
    CAPACITIES,
    LAYOUT,
    MEMBERS,
    SEGMENTS,
    SERVICE,
    SETTING_ROWS,
    VEHICLES,
)

__all__ = ["layout_of", "to_case"]


def _spacing(value: Any) -> Spacing:
    if isinstance(value, dict):
        return Spacing(low=float(value["low"]), high=float(value["high"]))
    return Spacing(low=float(value), high=float(value))


def _value(col: InputColumn, value: Any) -> Any:
    if col.kind == "list":
        return tuple(float(v) for v in value)
    if col.kind == "spacing-list":
        return tuple(_spacing(v) for v in value)
    if col.kind == "number":
        return int(value) if col.whole else float(value)
    if col.kind in ("text", "id"):
        return value.strip()
    return value


def _fields(columns: tuple[InputColumn, ...], doc: dict[str, Any]) -> dict[str, Any]:
    return {c.key: _value(c, doc[c.key]) for c in columns if c.key in doc}


def _vehicle(doc: dict[str, Any]) -> Vehicle:
    values = _fields(VEHICLES.columns, doc)
    if "category" not in values and values.get("library"):
        values["category"] = library.model(values["library"]).category
    return Vehicle(**values)


def _capacity(doc: dict[str, Any], ids: dict[str, str]) -> Capacity:
    values = _fields(CAPACITIES.columns, doc)
    values["member"] = ids[values["member"].casefold()]
    return Capacity(**values)


def _service(doc: dict[str, Any], ids: dict[str, str]) -> ServiceSection:
    values = _fields(SERVICE.columns, doc)
    values["member"] = ids[values["member"].casefold()]
    return ServiceSection(**values)


def _segments(document: dict[str, Any], ids: dict[str, str]) -> dict[str, tuple[Segment, ...]]:
    """Each member's Segments rows by member id (spelled as on Members), in sheet order."""
    out: dict[str, list[Segment]] = {}
    for row in document.get("segments", []):
        values = _fields(SEGMENTS.columns, row)
        values["member"] = ids[values["member"].casefold()]
        out.setdefault(values["member"], []).append(Segment(**values))
    return {member: tuple(rows) for member, rows in out.items()}


def _analysis(document: dict[str, Any], ids: dict[str, str]) -> dict[str, Analysis]:
    """Each member's Analysis row by member id (spelled as on Members)."""
    out = {}
    for row in document.get("analysis", []):
        values = _fields(ANALYSIS.columns, row)
        values["member"] = ids[values["member"].casefold()]
        out[values["member"]] = Analysis(**values)
    return out


def layout_of(row: dict[str, Any]) -> GirderLayout:
    """The model of one Girder Layout row that passed validation (its member as typed)."""
    return GirderLayout(**_fields(LAYOUT.columns, row))


def _layouts(document: dict[str, Any], ids: dict[str, str]) -> dict[str, GirderLayout]:
    """Each member's Girder Layout row by member id (spelled as on Members)."""
    out = {}
    for row in document.get("layout", []):
        layout = layout_of(row)
        member = ids[layout.member.casefold()]
        out[member] = dataclasses.replace(layout, member=member)
    return out


def _member(
    doc: dict[str, Any],
    segments: dict[str, tuple[Segment, ...]],
    analysis: dict[str, Analysis],
    bridges: dict[str, str],
    layouts: dict[str, GirderLayout],
    settings: Settings,
) -> Member:
    values = _fields(MEMBERS.columns, doc)
    if values.get("bridge") is not None:
        values["bridge"] = bridges[values["bridge"].casefold()]
    ident = values["id"]
    layout = layouts.get(ident)
    if layout is not None:
        factors = layout_factors(layout, values["spans"], settings.units)
        for key, name in LAYOUT_DFS.items():
            values.setdefault(key, getattr(factors, name))
    return Member(
        **values,
        segments=segments.get(ident, ()),
        analysis=analysis.get(ident),
        layout=layout,
    )


def to_case(document: dict[str, Any]) -> Case:
    """The model of a document that passed validation with no errors."""
    rows = document["members"]
    ids = {str(m["id"]).strip().casefold(): str(m["id"]).strip() for m in rows}
    segments = _segments(document, ids)
    analysis = _analysis(document, ids)
    layouts = _layouts(document, ids)
    settings = Settings(**_fields(SETTING_ROWS, document.get("settings", {})))
    bridges = tuple(Bridge(**_fields(BRIDGES.columns, b)) for b in document.get("bridges", []))
    bridge_ids = {b.id.casefold(): b.id for b in bridges}
    members = tuple(_member(m, segments, analysis, bridge_ids, layouts, settings) for m in rows)
    return Case(
        settings=settings,
        members=members,
        vehicles=tuple(_vehicle(v) for v in document["vehicles"]),
        capacities=tuple(_capacity(c, ids) for c in document.get("capacities", [])),
        bridges=bridges,
        service=tuple(_service(r, ids) for r in document.get("service", [])),
    )
