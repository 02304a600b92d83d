"""Checks of the Capacities rows that a JSON Schema cannot express.

Each row must name a member of the Members sheet (ids compared ignoring case
and outer spaces), one of its spans, and one of the stations of that span
(0, 1/n, ..., 1 with n the Stations per span setting, matched within
:data:`batch.model.layout.STATION_TOL`); it must give at least one resistance; and
no station may be listed twice. A member whose dead load would silently be
taken as 0 gets a warning.

The schema has already judged each value on its own (types, resistances not
negative, station from 0 to 1, span from 1); a field it rejected, or that
could not be read, is skipped here.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterator
from typing import Any

from batch.model import Settings
from batch.model.layout import STATION_TOL, station_row
from batch.reading.problems import DocPath, Locator, Severity
from batch.validating.fields import finite_number, shown

__all__ = ["capacity_problems"]

Found = tuple[DocPath, str, str, Severity]

_RESISTANCES = ("resistance_m_pos", "resistance_m_neg", "resistance_v")


def _spans(member: dict[str, Any], ok: Callable[[DocPath], bool], at: DocPath) -> int | None:
    """The member's number of spans, or None when its Spans are not usable."""
    spans = member.get("spans")
    if not ok((*at, "spans")) or not isinstance(spans, list) or not spans:
        return None
    return len(spans)


def _stations(document: dict[str, Any], ok: Callable[[DocPath], bool]) -> int | None:
    settings = document.get("settings")
    value = settings.get("stations_per_span") if isinstance(settings, dict) else None
    if value is None:
        return Settings().stations_per_span
    number = finite_number(value)
    if number is None or not ok(("settings", "stations_per_span")) or number < 1:
        return None
    return int(number) if number.is_integer() else None


def _nearest(station: float, n: int) -> str:
    """The stations of a span nearest ``station``, as typed fractions."""
    j = min(max(math.floor(station * n), 0), n - 1)
    return f"{shown(round(j / n, 6))} or {shown(round((j + 1) / n, 6))}"


class _Context:
    """What every row is checked against: the members by id, the stations, rows seen."""

    def __init__(
        self, document: dict[str, Any], locator: Locator, ok: Callable[[DocPath], bool]
    ) -> None:
        members = document.get("members")
        self.by_id: dict[str, tuple[int, dict[str, Any]]] = {}
        for i, m in enumerate(members if isinstance(members, list) else []):
            if isinstance(m, dict) and isinstance(m.get("id"), str):
                self.by_id.setdefault(m["id"].strip().casefold(), (i, m))
        self.n_per_span = _stations(document, ok)
        self.locator = locator
        self.ok = ok
        self.seen: dict[tuple[str, int, int], DocPath] = {}
        self.warned: set[str] = set()


def capacity_problems(
    rows: list[Any],
    document: dict[str, Any],
    locator: Locator,
    ok: Callable[[DocPath], bool],
) -> Iterator[Found]:
    """Every cross-field problem of the Capacities rows (``ok(path)``: not yet reported)."""
    cx = _Context(document, locator, ok)
    for i, row in enumerate(rows):
        if isinstance(row, dict):
            yield from _row_problems(row, ("capacities", i), cx)


def _row_problems(row: dict[str, Any], at: DocPath, cx: _Context) -> Iterator[Found]:
    """The problems of one Capacities row, in the order a reader fixes them."""
    if all(k not in row and cx.ok((*at, k)) for k in _RESISTANCES):
        yield (
            (*at, "resistance_m_pos"),
            "no-resistance",
            "Resistance M+, Resistance M- and Resistance V are all blank, so nothing is "
            "rated at this station; give at least one factored resistance, or delete the row",
            "error",
        )
    name = row.get("member")
    if not isinstance(name, str) or not cx.ok((*at, "member")):
        return
    found = cx.by_id.get(name.strip().casefold())
    if found is None:
        yield (
            (*at, "member"),
            "unknown-member",
            f"Member {name.strip()!r} is not on the Members sheet; give the id of a member "
            "listed there (ids are compared ignoring case and outer spaces)",
            "error",
        )
        return
    index, member = found
    yield from _dead_load_warning(row, member, at, cx.warned)
    n_spans = _spans(member, cx.ok, ("members", index))
    span = finite_number(row.get("span"))
    if span is None or not cx.ok((*at, "span")) or n_spans is None:
        return
    if not 1 <= span <= n_spans:
        yield _span_off_member(span, n_spans, member, at)
        return
    yield from _station_problems(row, member, int(span), n_spans, at, cx)


def _span_off_member(span: float, n_spans: int, member: dict[str, Any], at: DocPath) -> Found:
    fix = (
        "give span 1"
        if n_spans == 1
        else f"give a span number from 1 to {n_spans}, counted from the member's left end"
    )
    plural = "s" if n_spans != 1 else ""
    return (
        (*at, "span"),
        "span-not-on-member",
        f"Span {shown(span)}: member {member['id'].strip()!r} has {n_spans} span{plural}; {fix}",
        "error",
    )


def _station_problems(
    row: dict[str, Any],
    member: dict[str, Any],
    span: int,
    n_spans: int,
    at: DocPath,
    cx: _Context,
) -> Iterator[Found]:
    """The row's station must be one of the span's stations, and listed only once."""
    station, n_per_span = finite_number(row.get("station")), cx.n_per_span
    if station is None or not cx.ok((*at, "station")) or n_per_span is None:
        return
    place = station_row(span, station, n_spans, n_per_span)
    if place is None:
        yield (
            (*at, "station"),
            "station-not-on-grid",
            f"Station {shown(station)} is not one of the stations of the span (0, 1/n, ..., "
            f"1 with n = {n_per_span}, the Stations per span setting, within "
            f"{STATION_TOL:g}); give a station of the Envelopes sheet, here "
            f"{_nearest(station, n_per_span)}, or change Stations per span",
            "error",
        )
        return
    key = (member["id"].strip().casefold(), span, place)
    if key in cx.seen:
        sheet, cell = cx.locator.where(cx.seen[key])
        yield (
            (*at, "member"),
            "duplicate-capacity",
            f"member {member['id'].strip()!r}, span {shown(span)}, station "
            f"{shown(station)} is listed twice (also in {cell or sheet}); keep one row per "
            "station",
            "error",
        )
    else:
        cx.seen[key] = (*at, "member")


def _dead_load_warning(
    row: dict[str, Any], member: dict[str, Any], at: DocPath, warned: set[str]
) -> Iterator[Found]:
    """Once per member: no DC load on the member and none given here, so DC is taken as 0."""
    ident = member["id"].strip()
    needs = "dc_m" not in row or "dc_v" not in row
    if ident in warned or not needs or finite_number(member.get("dc_load")) not in (None, 0.0):
        return
    warned.add(ident)
    yield (
        (*at, "member"),
        "no-dead-load",
        f"member {ident!r} has no DC load on the Members sheet and this row leaves DC M or "
        "DC V blank, so the rating takes the component dead load as 0; give the member's DC "
        "load, or the dead-load effects on this row",
        "warning",
    )
