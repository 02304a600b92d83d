"""Checks of the Analysis rows (a member's own analysis options) that a schema cannot express.

Each row must name a member of the Members sheet (ids compared ignoring case and
outer spaces), at most one row per member. A deflection limit or a deflection
distribution factor without an EI scale does nothing, so it is an error; an EI
scale with no deflection distribution factor takes DF moment (typed, or from the
member's girder layout), which a warning says (AASHTO LRFD 2.5.2.6.2 loads every lane and
shares the load equally among the girders, a different factor from the moment one).

The schema has already judged each value on its own; a field it rejected, or that
could not be read, is skipped here.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import Any

from batch.reading.problems import DocPath, Locator, Severity
from batch.validating.fields import finite_number

__all__ = ["MemberRow", "analysis_problems", "members_by_id", "one_row_per_member"]

Found = tuple[DocPath, str, str, Severity]

#: A row of a sheet of one row per member, its member found: the row's path, the row,
#: the member's index on the Members sheet and the member's row.
MemberRow = tuple[DocPath, dict[str, Any], int, dict[str, Any]]


def members_by_id(document: dict[str, Any]) -> dict[str, tuple[int, dict[str, Any]]]:
    """The Members rows by folded id (the first of a repeated id), with their index."""
    members = document.get("members")
    by_id: dict[str, tuple[int, dict[str, Any]]] = {}
    for i, m in enumerate(members if isinstance(members, list) else []):
        if isinstance(m, dict) and isinstance(m.get("id"), str):
            by_id.setdefault(m["id"].strip().casefold(), (i, m))
    return by_id


def unknown_member(name: str, at: DocPath) -> Found:
    """The problem of a row that names no member of the Members sheet."""
    return (
        (*at, "member"),
        "unknown-member",
        f"Member {name.strip()!r} is not on the Members sheet; give the id of a member "
        "listed there (ids are compared ignoring case and outer spaces)",
        "error",
    )


def one_row_per_member(
    rows: list[Any],
    document: dict[str, Any],
    locator: Locator,
    ok: Callable[[DocPath], bool],
    key: str,
    sheet: str,
) -> tuple[list[Found], list[MemberRow]]:
    """The rows of a sheet of one row per member (document key ``key``, titled ``sheet``).

    Returns the problems (a member not on the Members sheet; a member's second row, code
    ``duplicate-<key>``) and the rows whose member is found, first rows only; a row whose
    Member was not read is skipped (its problem is already reported).
    """
    by_id = members_by_id(document)
    seen: dict[str, DocPath] = {}
    problems: list[Found] = []
    found: list[MemberRow] = []
    for i, row in enumerate(rows):
        if not isinstance(row, dict):
            continue
        at: DocPath = (key, i)
        name = row.get("member")
        if not isinstance(name, str) or not ok((*at, "member")):
            continue
        member_key = name.strip().casefold()
        hit = by_id.get(member_key)
        if hit is None:
            problems.append(unknown_member(name, at))
            continue
        if member_key in seen:
            first_sheet, cell = locator.where(seen[member_key])
            problems.append(
                (
                    (*at, "member"),
                    f"duplicate-{key}",
                    f"member {name.strip()!r} has a row already (also in {cell or first_sheet}); "
                    f"keep one {sheet} row per member",
                    "error",
                )
            )
            continue
        seen[member_key] = (*at, "member")
        found.append((at, row, *hit))
    return problems, found


def analysis_problems(
    rows: list[Any],
    document: dict[str, Any],
    locator: Locator,
    ok: Callable[[DocPath], bool],
) -> Iterator[Found]:
    """Every cross-field problem of the Analysis rows (``ok(path)``: not yet reported)."""
    problems, found = one_row_per_member(rows, document, locator, ok, "analysis", "Analysis")
    yield from problems
    for at, row, _index, _member in found:
        yield from _deflection(row, at, ok)


def _deflection(row: dict[str, Any], at: DocPath, ok: Callable[[DocPath], bool]) -> Iterator[Found]:
    """Deflection inputs need the EI scale; without a DF deflection, say which DF is used."""
    if not ok((*at, "ei_scale")):
        return
    if finite_number(row.get("ei_scale")) is None:
        for key, name in (
            ("deflection_limit", "Deflection limit"),
            ("df_deflection", "DF deflection"),
        ):
            if key in row and ok((*at, key)):
                yield (
                    (*at, key),
                    "deflection-without-ei",
                    f"{name} is given but EI scale is blank, so no deflection is computed; "
                    "give the member's EI scale (the absolute E*I that a stiffness of 1 stands "
                    f"for), or clear {name}",
                    "error",
                )
        return
    if "df_deflection" not in row and ok((*at, "df_deflection")):
        yield (
            (*at, "ei_scale"),
            "deflection-takes-df-moment",
            "no DF deflection for this member, so deflections take the member's DF moment "
            "(typed on Members or from its girder layout); AASHTO LRFD 2.5.2.6.2 loads every "
            "design lane and shares it equally among the girders (lanes x multiple presence "
            "factor / girders): give DF deflection",
            "warning",
        )
