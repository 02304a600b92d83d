"""Match a sheet's header row to the declared columns, and check header units.

Headers are matched with :func:`batch.model.declare.header_key` (case, outer spaces
and a trailing part in parentheses ignored). On a column that has a unit, that
trailing part must be the unit of the run's unit system for the column's quantity:
a workbook whose Spans are headed in metres while Units is US would otherwise be
read as feet, and one headed in a unit spanfleet does not know (``"Spans (yards)"``,
``"Spans (left to right)"``) would be read in the run's unit whatever was meant, so
both are refused, the latter with the units spanfleet does know.
"""

from __future__ import annotations

import difflib
import re
from dataclasses import dataclass

from batch.model import UNIT_LABELS
from batch.model.declare import InputColumn, InputSheet, header_key

__all__ = ["HeaderMatch", "match_headers", "unit_in_header"]

# Spellings of units seen in headers -> (quantity, unit system); None = neither system's unit.
_UNIT_SPELLINGS: dict[str, tuple[str, str | None]] = {
    **{s: ("length", "US") for s in ("ft", "feet", "foot", "'")},
    **{s: ("length", "SI") for s in ("m", "metre", "metres", "meter", "meters")},
    **{s: ("length", None) for s in ("in", "inch", "inches", "mm", "cm", "km", "mi", "yd")},
    **{s: ("force", "US") for s in ("kip", "kips", "k")},
    **{s: ("force", "SI") for s in ("kn",)},
    **{s: ("force", None) for s in ("lb", "lbs", "lbf", "n", "t", "ton", "tons", "tonne", "mn")},
    **{s: ("moment", "US") for s in ("kip-ft", "ft-kip", "k-ft", "ft-k", "kip·ft", "kipft")},
    **{s: ("moment", "SI") for s in ("kn-m", "kn·m", "knm", "m-kn")},
    **{s: ("moment", None) for s in ("lb-ft", "kip-in", "n-mm", "n-m", "t-m")},
    **{s: ("line_load", "US") for s in ("kip/ft", "klf", "k/ft", "kips/ft")},
    **{s: ("line_load", "SI") for s in ("kn/m",)},
    **{s: ("line_load", None) for s in ("lb/ft", "plf", "n/mm", "n/m", "t/m")},
    # Members as built: flexural rigidity (EI scale).
    **{s: ("rigidity", "US") for s in ("kip-in2", "kip-in²", "kip·in2", "kip·in²", "k-in2")},
    **{s: ("rigidity", "SI") for s in ("kn-m2", "kn-m²", "kn·m2", "kn·m²", "knm2")},
    **{
        s: ("rigidity", None)
        for s in ("kip-ft2", "kip-ft²", "lb-in2", "n-mm2", "n-mm²", "kn-mm2", "n-m2", "mn-m2")
    },
    # Capacities, service limit states: stresses and section moduli.
    **{s: ("stress", "US") for s in ("ksi",)},
    **{s: ("stress", "SI") for s in ("mpa", "n/mm2", "n/mm²")},
    **{s: ("stress", None) for s in ("psi", "ksf", "psf", "kpa", "gpa", "kn/m2", "pa")},
    **{s: ("section_modulus", "US") for s in ("in3", "in³", "in^3")},
    **{s: ("section_modulus", "SI") for s in ("mm3", "mm³", "mm^3")},
    **{s: ("section_modulus", None) for s in ("ft3", "ft³", "m3", "m³", "cm3", "cm³")},
}

#: Units of the girder layout's section dimensions and skew, by quantity: spelling -> the
#: unit systems that use it (these spellings mean other quantities in other columns).
_US: tuple[str, ...] = ("US",)
_SI: tuple[str, ...] = ("SI",)
_SECTION_SPELLINGS: dict[str, dict[str, tuple[str, ...]]] = {
    "thickness": {"in": _US, "inch": _US, "inches": _US, "mm": _SI},
    "area": {s: _US for s in ("in2", "in²", "sq.in", "sqin")} | {s: _SI for s in ("mm2", "mm²")},
    "inertia": {s: _US for s in ("in4", "in⁴")} | {s: _SI for s in ("mm4", "mm⁴")},
    "angle": {s: ("US", "SI") for s in ("deg", "degree", "degrees", "°")},
}


@dataclass(frozen=True, kw_only=True)
class HeaderMatch:
    """The columns found in a header row.

    ``columns`` maps each declared column key to its 1-based column index;
    ``cells`` gives the header's cell reference (``"C1"``) by key; ``unknown``
    lists (cell, text) of headers that match no declared column.
    """

    columns: dict[str, int]
    cells: dict[str, str]
    duplicates: tuple[tuple[str, str, str], ...]  # (header, first cell, second cell)
    unknown: tuple[tuple[str, str], ...]

    def missing(self, sheet: InputSheet) -> tuple[InputColumn, ...]:
        """Required columns of ``sheet`` with no header."""
        return tuple(c for c in sheet.columns if c.required and c.key not in self.columns)

    @staticmethod
    def suggestion(text: str, sheet: InputSheet) -> str:
        """The declared header closest to ``text``, or ``""``."""
        keys = {header_key(c.header): c.header for c in sheet.columns}
        close = difflib.get_close_matches(header_key(text), list(keys), n=1, cutoff=0.75)
        return keys[close[0]] if close else ""


def match_headers(sheet: InputSheet, row: list[tuple[str, object]]) -> HeaderMatch:
    """Match ``row`` (header (cell, value) pairs, left to right) to the columns of ``sheet``."""
    wanted = {header_key(h): c.key for c in sheet.columns for h in c.headers}
    columns: dict[str, int] = {}
    cells: dict[str, str] = {}
    duplicates: list[tuple[str, str, str]] = []
    unknown: list[tuple[str, str]] = []
    for index, (cell, value) in enumerate(row, start=1):
        if value is None or not str(value).strip():
            continue
        key = wanted.get(header_key(value))
        if key is None:
            unknown.append((cell, str(value).strip()))
        elif key in columns:
            duplicates.append((str(value).strip(), cells[key], cell))
        else:
            columns[key] = index
            cells[key] = cell
    return HeaderMatch(
        columns=columns, cells=cells, duplicates=tuple(duplicates), unknown=tuple(unknown)
    )


def unit_in_header(header: object, column: InputColumn, units: str) -> tuple[str, str] | None:
    """Why the unit in ``header`` cannot be read with the run's ``units``, as (code, message).

    ``None`` when the header has no trailing ``(...)``, when it is the run's unit,
    or when the column has no unit. A trailing ``(...)`` on a column with a unit
    that is no unit spanfleet knows is refused (``header-unit-unknown``): it
    would otherwise be read in the run's unit whatever it says; a unit of the
    wrong quantity or system gives ``header-unit-mismatch``.
    """
    if not column.quantity or units not in UNIT_LABELS:
        return None
    found = re.search(r"\(([^()]*)\)\s*$", str(header))
    if not found:
        return None
    expected = UNIT_LABELS[units][column.quantity]
    spelled = re.sub(r"\s+", "", found.group(1)).lower().replace("*", "·")
    quantity, system = _UNIT_SPELLINGS.get(spelled, (None, None))
    systems = _SECTION_SPELLINGS.get(column.quantity, {}).get(spelled)
    if systems is not None:
        quantity, system = column.quantity, units if units in systems else systems[0]
    if quantity is None:
        known = " or ".join(
            f"{labels[column.quantity]} (Units {system})" for system, labels in UNIT_LABELS.items()
        )
        return (
            "header-unit-unknown",
            f"the header says the values are in {found.group(1).strip()!r}, which is not a unit "
            f"spanfleet knows (it reads {column.header} in {known}), so the values would be "
            f"read in {expected} whatever was meant; give them in {expected} and head the "
            f"column '{column.header} ({expected})' or '{column.header}'",
        )
    if quantity == column.quantity and system == units:
        return None
    other = "US" if units == "SI" else "SI"
    if quantity == column.quantity and system == other:
        fix = (
            f"set Units to {other} on the Settings sheet if the whole workbook is in "
            f"{other} units, or convert this column to {expected} and head it "
            f"'{column.header} ({expected})'"
        )
    else:
        fix = f"give the values in {expected} and head the column '{column.header} ({expected})'"
    return (
        "header-unit-mismatch",
        f"the header says the values are in {found.group(1).strip()}, but with Units "
        f"{units} spanfleet reads {column.header} in {expected}; {fix}",
    )
