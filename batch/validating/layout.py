"""Checks of the Girder Layout rows (distribution factors from the layout) a schema cannot express.

Each row must name a member of the Members sheet (ids compared ignoring case and
outer spaces), at most one row per member. The stiffness parameter is given
either as Kg or as n, Girder I, Girder A and eg (all four), not both; an exterior
girder needs its overhang de, and an interior girder's overhang is not used (a
warning). With a row that passed these checks and its member's spans, the
factors are computed (:func:`batch.loads.distribution.layout_factors`) and each
parameter outside a formula's range of applicability gets a warning at its cell,
naming the limit and the table: the specification then calls for a refined
analysis, and spanfleet computes with the formula. A distribution factor typed on
the Members row prevails over the layout's, which a warning says.

The schema has already judged each value on its own (types, choices, Girders a
whole number of at least 3, lengths above 0); a field it rejected, or that could
not be read, is skipped here.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import Any

from batch.loads.distribution import LAYOUT_DFS, Note, layout_factors, number
from batch.model.units import UnitSystem
from batch.reading.problems import DocPath, Locator, Severity
from batch.validating.analysis import one_row_per_member
from batch.validating.fields import finite_number, shown
from batch.validating.to_model import layout_of

__all__ = ["layout_problems", "with_layout"]

Found = tuple[DocPath, str, str, Severity]

#: The columns of the stiffness parameter computed from the girder's section.
_SECTION_KEYS = {
    "modular_ratio": "n",
    "inertia": "Girder I",
    "area": "Girder A",
    "eccentricity": "eg",
}
#: The row's cell where a note on each parameter goes (L: the member's Spans).
_NOTE_KEYS = {
    "S": "spacing",
    "ts": "deck",
    "Kg": "stiffness",
    "Nb": "girders",
    "de": "overhang",
    "theta": "skew",
}
#: Members columns by key, for messages.
_DF_NAMES = {
    "df_moment": "DF moment",
    "df_shear": "DF shear",
    "df_moment_single": "DF moment single lane",
    "df_shear_single": "DF shear single lane",
}


def with_layout(document: dict[str, Any]) -> set[str]:
    """The folded member ids that a Girder Layout row names: their factors come from it."""
    rows = document.get("layout")
    return {
        row["member"].strip().casefold()
        for row in (rows if isinstance(rows, list) else [])
        if isinstance(row, dict) and isinstance(row.get("member"), str)
    }


def layout_problems(
    rows: list[Any],
    document: dict[str, Any],
    locator: Locator,
    ok: Callable[[DocPath], bool],
    units: UnitSystem,
) -> Iterator[Found]:
    """Every cross-field problem of the Girder Layout rows (``ok(path)``: not yet reported)."""
    duplicates, found = one_row_per_member(rows, document, locator, ok, "layout", "Girder Layout")
    yield from duplicates
    for at, row, index, member in found:
        problems = list(_stiffness(row, at, ok)) + list(_overhang(row, at, ok))
        yield from problems
        member_at: DocPath = ("members", index)
        if any(p[3] == "error" for p in problems) or not _judged(row, at, ok):
            continue
        spans = member.get("spans")
        if not ok((*member_at, "spans")) or not isinstance(spans, list):
            continue
        lengths = [finite_number(s) for s in spans]
        if not lengths or any(s is None or s <= 0 for s in lengths):
            continue
        factors = layout_factors(layout_of(row), [float(s) for s in lengths if s], units)
        yield from _notes([n for f in factors.factors for n in f.notes], row, at, member_at)
        for df_key, name_ in LAYOUT_DFS.items():
            typed = finite_number(member.get(df_key))
            if typed is not None and ok((*member_at, df_key)):
                yield (
                    (*member_at, df_key),
                    "df-prevails",
                    f"{_DF_NAMES[df_key]} {shown(typed)} is typed here and prevails over the "
                    f"girder layout's {getattr(factors, name_):.3f} (Girder Layout sheet, "
                    f"Distribution Factors sheet); clear it to use the layout's factor",
                    "warning",
                )


def _judged(row: dict[str, Any], at: DocPath, ok: Callable[[DocPath], bool]) -> bool:
    """True when every value the factors need is present and was not rejected."""
    needed = ("cross_section", "position", "girders", "spacing", "deck")
    return all(k in row and ok((*at, k)) for k in needed) and all(
        ok((*at, k)) for k in ("stiffness", "overhang", "skew", *_SECTION_KEYS)
    )


def _stiffness(row: dict[str, Any], at: DocPath, ok: Callable[[DocPath], bool]) -> Iterator[Found]:
    """Kg, or n, Girder I, Girder A and eg: one of the two, complete."""
    if not all(ok((*at, k)) for k in ("stiffness", *_SECTION_KEYS)):
        return
    given = [k for k in _SECTION_KEYS if k in row]
    if "stiffness" in row:
        if given:
            yield (
                (*at, given[0]),
                "stiffness-twice",
                f"Kg is given and so is {_SECTION_KEYS[given[0]]}; give Kg, or n, Girder I, "
                "Girder A and eg to compute it (Kg = n (I + A eg^2)), not both",
                "error",
            )
        return
    missing = [k for k in _SECTION_KEYS if k not in row]
    if missing:
        yield (
            (*at, missing[0] if given else "stiffness"),
            "stiffness-missing",
            "the longitudinal stiffness parameter is missing: give Kg, or n, Girder I, "
            "Girder A and eg (Kg = n (I + A eg^2), AASHTO LRFD Eq. 4.6.2.2.1-1); missing: "
            + ", ".join(_SECTION_KEYS[k] for k in missing),
            "error",
        )


def _overhang(row: dict[str, Any], at: DocPath, ok: Callable[[DocPath], bool]) -> Iterator[Found]:
    """An exterior girder needs de; an interior one does not use it."""
    if not ok((*at, "overhang")) or not ok((*at, "position")):
        return
    position = row.get("position")
    if position == "exterior" and "overhang" not in row:
        yield (
            (*at, "overhang"),
            "overhang-missing",
            "an exterior girder needs Overhang de (from its web centreline to the inside face "
            "of the barrier or curb, positive when the roadway extends outboard of the web) "
            "for the lever rule and the factor e; give it",
            "error",
        )
    elif position == "interior" and "overhang" in row:
        yield (
            (*at, "overhang"),
            "overhang-unused",
            "Overhang de is not used for an interior girder; clear it, or set Girder to "
            "exterior if this is the exterior girder",
            "warning",
        )


def _notes(
    notes: list[Note], row: dict[str, Any], at: DocPath, member_at: DocPath
) -> Iterator[Found]:
    """One warning per parameter value outside a range, at its cell, naming every table."""
    tables: dict[tuple[str, float, str], list[str]] = {}
    for note in notes:
        tables.setdefault((note.symbol, note.value, note.bound), [])
        if note.table not in tables[(note.symbol, note.value, note.bound)]:
            tables[(note.symbol, note.value, note.bound)].append(note.table)
    for (symbol, value, bound), names in tables.items():
        key = _NOTE_KEYS.get(symbol)
        if symbol == "Kg" and "stiffness" not in row:
            key = "inertia"
        path: DocPath = (*at, key) if key else (*member_at, "spans")
        yield (
            path,
            "outside-range",
            f"{symbol} = {number(value)} is outside {bound} of AASHTO LRFD Table"
            f"{'s' if len(names) > 1 else ''} {', '.join(n.removeprefix('Table ') for n in names)}"
            " (in the formulas' US customary units): the specification "
            "calls for a refined analysis (Art. 4.6.3); spanfleet computes with the formula, "
            "and the Distribution Factors sheet says so. Check the value, or type the member's "
            "factors from a refined analysis on Members",
            "warning",
        )
