"""Checks of the Segments rows (stiffness along a member) that a JSON Schema cannot express.

Each row must name a member of the Members sheet (ids compared ignoring case and
outer spaces) and a stretch that runs forwards and lies on the member; the
stretches of one member must not overlap; a haunch needs its EI at To, and a
prismatic stretch must not give one that differs; a member may hold at most
:data:`MAX_PIECES` prismatic pieces in all. A stretch far stiffer or softer than
its member's Span EI gets a warning (a typing slip such as 14 for 1.4).

The schema has already judged each value on its own (types, From at least 0, EI
above 0, Haunch one of its choices, Pieces a whole number); a field it rejected,
or that could not be read, is skipped here.
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Callable, Iterator
from typing import Any

from batch.model.layout import POSITION_TOL
from batch.reading.problems import DocPath, Severity
from batch.validating.analysis import members_by_id, unknown_member
from batch.validating.fields import finite_number, shown

__all__ = ["EI_RATIO_WARN", "MAX_PIECES", "segment_problems"]

Found = tuple[DocPath, str, str, Severity]

#: Most prismatic pieces (stretches plus haunch pieces) on one member.
MAX_PIECES = 400
#: A stretch whose EI differs from the member's Span EI by more than this factor gets a
#: warning (common practice: cover plates add tens of percent, deep haunches a few times).
EI_RATIO_WARN = 20.0


def _numbers(value: object) -> list[float] | None:
    if not isinstance(value, list):
        return None
    out = [finite_number(v) for v in value]
    return None if any(v is None for v in out) else [v for v in out if v is not None]


def segment_problems(
    rows: list[Any],
    document: dict[str, Any],
    ok: Callable[[DocPath], bool],
    unit: str,
) -> Iterator[Found]:
    """Every cross-field problem of the Segments rows (``ok(path)``: not yet reported).

    ``unit`` is the run's length unit label, for messages.
    """
    by_id = members_by_id(document)
    stretches: dict[str, list[tuple[float, float, DocPath]]] = {}
    pieces: dict[str, int] = {}
    for i, row in enumerate(rows):
        if not isinstance(row, dict):
            continue
        at: DocPath = ("segments", i)
        yield from _haunch(row, at, ok)
        name = row.get("member")
        if not isinstance(name, str) or not ok((*at, "member")):
            continue
        found = by_id.get(name.strip().casefold())
        if found is None:
            yield unknown_member(name, at)
            continue
        index, member = found
        key = member["id"].strip().casefold()
        count = 1 if row.get("haunch", "none") == "none" else row.get("pieces", 12)
        pieces[key] = pieces.get(key, 0) + (count if isinstance(count, int) else 1)
        if pieces[key] > MAX_PIECES:
            pieces[key] = -(10**9)  # report once per member
            yield (
                (*at, "pieces"),
                "too-many-pieces",
                f"member {member['id'].strip()!r} has more than {MAX_PIECES} prismatic pieces "
                "in its Segments rows (a haunch counts its Pieces); use fewer pieces or "
                "fewer stretches",
                "error",
            )
        stretch, problem = _stretch(row, member, ("members", index), at, ok, unit)
        if stretch is not None:
            stretches.setdefault(key, []).append((*stretch, at))
        if problem is not None:
            yield problem
        yield from _ratio(row, member, ("members", index), at, ok)
    for found_rows in stretches.values():
        yield from _overlaps(found_rows, unit)


def _haunch(row: dict[str, Any], at: DocPath, ok: Callable[[DocPath], bool]) -> Iterator[Found]:
    """A haunch needs EI at To; a prismatic stretch must not give a different one."""
    if not ok((*at, "haunch")) or not ok((*at, "ei_end")):
        return
    shape = row.get("haunch", "none")
    ei, ei_end = finite_number(row.get("ei")), finite_number(row.get("ei_end"))
    if shape != "none" and ei_end is None:
        yield (
            (*at, "haunch"),
            "haunch-without-end",
            f"Haunch is {shape} but EI at To is blank; give the stiffness at To (EI is the "
            "value at From), or set Haunch to none for a prismatic stretch",
            "error",
        )
    elif shape == "none" and ei_end is not None and ei is not None and ei_end != ei:
        yield (
            (*at, "ei_end"),
            "end-without-haunch",
            f"EI at To ({shown(ei_end)}) differs from EI ({shown(ei)}) but Haunch is none; "
            "set Haunch to linear or parabolic for a stiffness that varies, or clear EI at To",
            "error",
        )


def _stretch(
    row: dict[str, Any],
    member: dict[str, Any],
    member_at: DocPath,
    at: DocPath,
    ok: Callable[[DocPath], bool],
    unit: str,
) -> tuple[tuple[float, float] | None, Found | None]:
    """(From, To) of a stretch on its member, or the problem with it (both None: not judged)."""
    start, end = finite_number(row.get("start")), finite_number(row.get("end"))
    if start is None or end is None or not ok((*at, "start")) or not ok((*at, "end")):
        return None, None
    spans = _numbers(member.get("spans")) if ok((*member_at, "spans")) else None
    length = math.fsum(spans) if spans else None
    tol = POSITION_TOL * (length or max(abs(start), abs(end), 1.0))
    if end <= start + tol:
        return None, (
            (*at, "end"),
            "segment-backwards",
            f"To ({shown(end)} {unit}) is not beyond From ({shown(start)} {unit}); give the "
            "stretch's start in From and its end in To, both from the member's left end",
            "error",
        )
    if length is not None and end > length + tol:
        return None, (
            (*at, "end"),
            "segment-off-member",
            f"To ({shown(end)} {unit}) is beyond the end of member "
            f"{member['id'].strip()!r} ({shown(length)} {unit}); measure From and To from the "
            "member's left end, within its length",
            "error",
        )
    return (start, end), None


def _ratio(
    row: dict[str, Any],
    member: dict[str, Any],
    member_at: DocPath,
    at: DocPath,
    ok: Callable[[DocPath], bool],
) -> Iterator[Found]:
    """A warning when the stretch's EI is far from every Span EI of its member."""
    span_ei = _numbers(member.get("span_ei", [])) if ok((*member_at, "span_ei")) else None
    reference = span_ei or [1.0]
    for key in ("ei", "ei_end"):
        value = finite_number(row.get(key))
        if value is None or not ok((*at, key)) or value <= 0:
            continue
        low, high = min(reference), max(reference)
        if value > EI_RATIO_WARN * high or value < low / EI_RATIO_WARN:
            yield (
                (*at, key),
                "implausible-stiffness",
                f"{'EI' if key == 'ei' else 'EI at To'} {shown(value)} is more than "
                f"{shown(EI_RATIO_WARN)} times away from the member's Span EI "
                f"({', '.join(shown(v) for v in reference)}); both are on the same scale: "
                "check the value",
                "warning",
            )
            return


def _overlaps(rows: list[tuple[float, float, DocPath]], unit: str) -> Iterator[Found]:
    """Stretches of one member that overlap (each reported at the later row)."""
    ordered = sorted(rows, key=lambda r: (r[0], r[1]))
    for (a0, a1, first), (b0, _b1, second) in itertools.pairwise(ordered):
        if b0 < a1 - POSITION_TOL * max(abs(a1), 1.0):
            later = max(first, second, key=lambda p: int(p[1]))
            yield (
                (*later, "start"),
                "segment-overlap",
                f"the stretch from {shown(b0)} {unit} overlaps the one from {shown(a0)} to "
                f"{shown(a1)} {unit} of the same member; give each part of a member one "
                "stiffness (split or shorten one of them)",
                "error",
            )
