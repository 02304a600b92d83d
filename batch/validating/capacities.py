"""Checks of the Capacities rows that a JSON Schema cannot express.

Each row must name a member of the Members sheet (ids compared ignoring case
and outer spaces) and a point of it: one of its spans and a fraction of that
span, or x from its left end (with the span too where x is an interior support,
to say which side); a point between the member's stations becomes a station of
its own (:func:`batch.model.layout.section_of`). It must give at least one
resistance, and no station may be listed twice (two points within
:data:`batch.model.layout.STATION_TOL` of a span are one station). A member whose
dead load would silently be taken as 0 gets a warning.

The Service sheet's rows are checked the same way, but for the resistances.

The schema has already judged each value on its own (types, resistances not
negative, station from 0 to 1, span from 1); a field it rejected, or that
could not be read, is skipped here.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterator
from typing import Any

from batch.model.layout import POSITION_TOL, STATION_TOL, section_of
from batch.reading.problems import DocPath, Locator, Severity
from batch.validating.analysis import members_by_id, unknown_member
from batch.validating.fields import finite_number, shown

__all__ = ["capacity_problems"]

Found = tuple[DocPath, str, str, Severity]

_RESISTANCES = ("resistance_m_pos", "resistance_m_neg", "resistance_v")


def _spans(
    member: dict[str, Any], ok: Callable[[DocPath], bool], at: DocPath
) -> list[float] | None:
    """The member's span lengths, or None when its Spans are not usable."""
    spans = member.get("spans")
    if not ok((*at, "spans")) or not isinstance(spans, list) or not spans:
        return None
    lengths = [finite_number(v) for v in spans]
    if any(v is None or v <= 0 for v in lengths):
        return None
    return [float(v) for v in lengths if v is not None]


class _Context:
    """What every row is checked against: the members by id, and the stations seen."""

    def __init__(
        self, document: dict[str, Any], locator: Locator, ok: Callable[[DocPath], bool]
    ) -> None:
        self.by_id = members_by_id(document)
        self.locator = locator
        self.ok = ok
        # Per member: the stations already listed, (span, x, where).
        self.seen: dict[str, list[tuple[int, float, DocPath]]] = {}
        self.warned: set[str] = set()


def capacity_problems(
    rows: list[Any],
    document: dict[str, Any],
    locator: Locator,
    ok: Callable[[DocPath], bool],
    key: str = "capacities",
) -> Iterator[Found]:
    """Every cross-field problem of the Capacities rows (``ok(path)``: not yet reported).

    With ``key`` "service", the same checks of the Service sheet's member and station
    (its rows give no resistances: :mod:`batch.validating.service` checks the rest).
    """
    cx = _Context(document, locator, ok)
    for i, row in enumerate(rows):
        if isinstance(row, dict):
            yield from _row_problems(row, (key, i), cx)


def _row_problems(row: dict[str, Any], at: DocPath, cx: _Context) -> Iterator[Found]:
    """The problems of one Capacities (or Service) row, in the order a reader fixes them."""
    if at[0] == "capacities" and all(k not in row and cx.ok((*at, k)) for k in _RESISTANCES):
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
        yield unknown_member(name, at)
        return
    index, member = found
    yield from _dead_load_warning(row, member, at, cx.warned)
    spans = _spans(member, cx.ok, ("members", index))
    keys = ("span", "station", "x")
    if spans is None or not all(cx.ok((*at, k)) for k in keys):
        return
    span, station, x = (finite_number(row.get(k)) for k in keys)
    if span is not None and not 1 <= span <= len(spans):
        yield _span_off_member(span, len(spans), member, at)
        return
    if x is not None and station is not None:
        yield (
            (*at, "x"),
            "station-and-x",
            "the row gives both Station and x; give the section once: Span and Station, "
            "or x (with Span only where x is an interior support)",
            "error",
        )
        return
    if x is None and (span is None or station is None):
        missing = "Span" if span is None else "Station"
        yield (
            (*at, "span" if span is None else "station"),
            "no-section",
            f"{missing} is blank, so the row names no section; give Span and Station (the "
            "fraction of the span), or x (the distance from the member's left end)",
            "error",
        )
        return
    place = section_of(spans, None if span is None else int(span), station, x)
    if place is None:
        yield _x_problem(spans, span, float(x if x is not None else 0.0), member, at)
        return
    yield from _duplicate(place, spans, member, at, cx)


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


def _x_problem(
    spans: list[float], span: float | None, x: float, member: dict[str, Any], at: DocPath
) -> Found:
    """Why x names no section: off the member, at an interior support, or not in Span."""
    length = math.fsum(spans)
    ident = member["id"].strip()
    if x > length * (1 + POSITION_TOL):
        return (
            (*at, "x"),
            "x-off-member",
            f"x {shown(x)} is beyond the end of member {ident!r} (length {shown(length)}); "
            "measure x from the member's left end",
            "error",
        )
    if span is None:
        return (
            (*at, "span"),
            "x-at-support",
            f"x {shown(x)} is an interior support of member {ident!r}, the end of one span and "
            "the start of the next; give Span to say which (the shear differs on either side)",
            "error",
        )
    return (
        (*at, "x"),
        "x-not-in-span",
        f"x {shown(x)} is not in span {shown(span)} of member {ident!r}; give the span that "
        "holds x, or leave Span blank",
        "error",
    )


def _duplicate(
    place: tuple[int, float],
    spans: list[float],
    member: dict[str, Any],
    at: DocPath,
    cx: _Context,
) -> Iterator[Found]:
    """A problem when the member's station ``place`` is already listed."""
    span, x = place
    seen = cx.seen.setdefault(member["id"].strip().casefold(), [])
    for other_span, other_x, where in seen:
        if other_span == span and abs(other_x - x) <= STATION_TOL * spans[span - 1]:
            sheet, cell = cx.locator.where(where)
            yield (
                (*at, "member"),
                "duplicate-capacity",
                f"member {member['id'].strip()!r}, span {span}, x {shown(round(x, 6))} is "
                f"listed twice (also in {cell or sheet}); keep one row per station",
                "error",
            )
            return
    seen.append((span, x, (*at, "member")))


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
