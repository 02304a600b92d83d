"""The result sheets and their columns, declared once.

Every result column is declared here exactly once: its header (the unit is added
from the run's unit system, e.g. ``"M max (kip-ft)"``), the quantity that gives
the unit, the number format, a sensible width and how its values are taken from
a member's :class:`~batch.engine.MemberEnvelope`. The sheet writer (and later the
JSON writer and the docs) read these declarations; a column is added in one place.

Values keep the engine's sign conventions (those of the workbook contract):
sagging moment positive; shear V is the sum of the upward forces left of the
section (V = dM/dx), the section being just right of the station except at
station 1 of a span, where it is just left; reactions upward positive.

A column's ``values`` function returns one cell value per row the member
contributes to the table: one row per station (Envelopes), per support
(Reactions) or a single row (Governing). ``None`` is an empty cell.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from batch.engine.effects import (
    EFFECTS,
    Effect,
    Governing,
    MemberEnvelope,
    Rows,
    effect_named,
    governing_row,
)
from batch.model.units import Quantity

__all__ = [
    "ASSESSMENT_SHEETS",
    "CHARTS_SHEET",
    "EFFECTS",
    "ENVELOPES",
    "GOVERNING",
    "RATINGS_SHEET",
    "RATING_MATRIX_SHEET",
    "REACTIONS",
    "RESULT_TABLES",
    "RUN_LOG_SHEET",
    "SCREENING_DETAIL_SHEET",
    "SCREENING_SHEET",
    "VEHICLE_SUMMARY_COLUMNS",
    "VEHICLE_SUMMARY_SHEET",
    "Effect",
    "ResultColumn",
    "ResultTable",
    "direction_text",
    "effect_named",
    "governing_row",
    "is_result_sheet_name",
]


#: Direction codes of the engine and their text in the result sheets.
DIRECTION_TEXT: dict[int, str] = {1: "left-to-right", -1: "right-to-left"}

FORMAT_VALUE = "0.0"  # moments, shears, reactions, positions
FORMAT_FRACTION = "0.000"  # station fractions of a span
FORMAT_WHOLE = "0"  # span and support numbers
FORMAT_TEXT = "@"

RUN_LOG_SHEET = "Run Log"
CHARTS_SHEET = "Moment Charts"
VEHICLE_SUMMARY_SHEET = "Vehicle Summary"
#: Load rating (with a Capacities sheet) and screening (with a Reference vehicle):
#: see batch/writing/ratings.py.
RATINGS_SHEET = "Ratings"
RATING_MATRIX_SHEET = "Rating Matrix"
SCREENING_SHEET = "Screening"
SCREENING_DETAIL_SHEET = "Screening Detail"
ASSESSMENT_SHEETS = (RATINGS_SHEET, RATING_MATRIX_SHEET, SCREENING_SHEET, SCREENING_DETAIL_SHEET)

#: Columns of the Vehicle Summary sheet after Member and Vehicle: the member's
#: extreme of each effect under that vehicle, over all stations or supports.
VEHICLE_SUMMARY_COLUMNS: tuple[tuple[str, Quantity], ...] = (
    ("M max", "moment"),
    ("M min", "moment"),
    ("V max", "force"),
    ("V min", "force"),
    ("R max", "force"),
    ("R min", "force"),
)


Values = Callable[[MemberEnvelope], list[object]]


@dataclass(frozen=True, kw_only=True)
class ResultColumn:
    """One result column.

    ``header`` is shown followed by the unit of ``quantity`` in parentheses;
    ``effect`` names the :class:`Effect` whose governing row highlights this
    column's cell (empty: never highlighted). ``text`` columns are always
    written as text cells, never as formulas.
    """

    header: str
    quantity: Quantity = ""
    number_format: str = ""
    width: float = 10.0
    values: Values
    effect: str = ""
    text: bool = False
    meaning: str = ""

    def title(self, unit_labels: dict[str, str]) -> str:
        """Header text with its unit, e.g. ``"M max (kip-ft)"``."""
        return f"{self.header} ({unit_labels[self.quantity]})" if self.quantity else self.header


@dataclass(frozen=True, kw_only=True)
class ResultTable:
    """One result sheet: its name, its columns and the effects it highlights."""

    sheet: str
    columns: tuple[ResultColumn, ...]
    purpose: str
    highlights: tuple[str, ...] = ()

    def column(self, header: str) -> ResultColumn:
        """The column whose header (without unit) is ``header``."""
        for col in self.columns:
            if col.header == header:
                return col
        raise KeyError(f"{self.sheet} has no column {header!r}")


def direction_text(code: int) -> str | None:
    """``left-to-right``, ``right-to-left``, or None for no direction (0)."""
    return DIRECTION_TEXT.get(int(code))


# ---------------------------------------------------------------- cell values


def _row_count(effect_rows: Rows, env: MemberEnvelope) -> int:
    return int(env.station_x.size if effect_rows == "station" else env.support_x.size)


def _vehicle(env: MemberEnvelope, ext: Governing, i: int) -> str | None:
    case = int(ext.case[i])
    return env.labels[case] if case >= 0 else None


def _position(ext: Governing, i: int) -> float | None:
    p = float(ext.position[i])
    return p if int(ext.case[i]) >= 0 and np.isfinite(p) else None


def _direction(ext: Governing, i: int) -> str | None:
    return direction_text(int(ext.direction[i])) if int(ext.case[i]) >= 0 else None


def _member(rows: Rows) -> Values:
    return lambda env: [env.member] * _row_count(rows, env)


def _effect_columns(effect: Effect) -> tuple[ResultColumn, ...]:
    """The value, vehicle, at and direction columns of one effect, row by row."""

    def value(env: MemberEnvelope) -> list[object]:
        return [float(v) for v in effect.extremes(env).value]

    def per_row(get: Callable[[MemberEnvelope, Governing, int], object]) -> Values:
        def values(env: MemberEnvelope) -> list[object]:
            ext = effect.extremes(env)
            return [get(env, ext, i) for i in range(ext.value.size)]

        return values

    return (
        ResultColumn(
            header=effect.name,
            quantity=effect.quantity,
            number_format=FORMAT_VALUE,
            width=11,
            values=value,
            effect=effect.name,
            meaning=effect.meaning,
        ),
        ResultColumn(
            header=f"{effect.name} vehicle",
            width=20,
            values=per_row(_vehicle),
            effect=effect.name,
            text=True,
            meaning="The load case that governs (empty where no vehicle gives a value).",
        ),
        ResultColumn(
            header=f"{effect.name} at",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=10,
            values=per_row(lambda _env, ext, i: _position(ext, i)),
            effect=effect.name,
            meaning="Position of the governing vehicle's front axle from the member's left end.",
        ),
        ResultColumn(
            header=f"{effect.name} direction",
            width=14,
            values=per_row(lambda _env, ext, i: _direction(ext, i)),
            effect=effect.name,
            text=True,
            meaning="Direction of travel of the governing vehicle.",
        ),
    )


def _governing_columns(effect: Effect) -> tuple[ResultColumn, ...]:
    """One member's extreme of ``effect``: value, where, and which vehicle, position, direction."""

    def one(get: Callable[[MemberEnvelope, Governing, int], object], empty: object) -> Values:
        def values(env: MemberEnvelope) -> list[object]:
            i = governing_row(effect, env)
            return [empty if i is None else get(env, effect.extremes(env), i)]

        return values

    where: tuple[ResultColumn, ...]
    if effect.rows == "station":
        where = (
            ResultColumn(
                header=f"{effect.name} span",
                number_format=FORMAT_WHOLE,
                width=8,
                values=one(lambda env, _ext, i: int(env.station_span[i]), None),
            ),
            ResultColumn(
                header=f"{effect.name} station",
                number_format=FORMAT_FRACTION,
                width=9,
                values=one(lambda env, _ext, i: float(env.station_fraction[i]), None),
            ),
            ResultColumn(
                header=f"{effect.name} x",
                quantity="length",
                number_format=FORMAT_VALUE,
                width=9,
                values=one(lambda env, _ext, i: float(env.station_x[i]), None),
            ),
        )
    else:
        where = (
            ResultColumn(
                header=f"{effect.name} support",
                number_format=FORMAT_WHOLE,
                width=9,
                values=one(lambda _env, _ext, i: i + 1, None),
            ),
            ResultColumn(
                header=f"{effect.name} x",
                quantity="length",
                number_format=FORMAT_VALUE,
                width=9,
                values=one(lambda env, _ext, i: float(env.support_x[i]), None),
            ),
        )
    value, vehicle, at, direction = _effect_columns(effect)
    return (
        ResultColumn(
            header=value.header,
            quantity=value.quantity,
            number_format=value.number_format,
            width=value.width,
            values=one(lambda _env, ext, i: float(ext.value[i]), 0.0),
            meaning=f"The member's extreme: {effect.meaning[0].lower()}{effect.meaning[1:]}",
        ),
        *where,
        *(
            ResultColumn(
                header=col.header,
                quantity=col.quantity,
                number_format=col.number_format,
                width=col.width,
                values=one(get, None),
                text=col.text,
                meaning=col.meaning,
            )
            for col, get in (
                (vehicle, _vehicle),
                (at, lambda _env, ext, i: _position(ext, i)),
                (direction, lambda _env, ext, i: _direction(ext, i)),
            )
        ),
    )


# ---------------------------------------------------------------- the tables

ENVELOPES = ResultTable(
    sheet="Envelopes",
    purpose="One row per member and station: the live-load envelope of moment and shear.",
    highlights=("M max", "M min", "V max", "V min"),
    columns=(
        ResultColumn(
            header="Member", width=16, values=_member("station"), text=True, meaning="Member id."
        ),
        ResultColumn(
            header="Span",
            number_format=FORMAT_WHOLE,
            width=6,
            values=lambda env: [int(s) for s in env.station_span],
            meaning="Span number, from 1 at the left end.",
        ),
        ResultColumn(
            header="Station",
            number_format=FORMAT_FRACTION,
            width=8,
            values=lambda env: [float(f) for f in env.station_fraction],
            meaning="Fraction of the span's length.",
        ),
        ResultColumn(
            header="x",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=9,
            values=lambda env: [float(x) for x in env.station_x],
            meaning="Distance from the member's left end.",
        ),
        *(col for e in EFFECTS if e.rows == "station" for col in _effect_columns(e)),
    ),
)

REACTIONS = ResultTable(
    sheet="Reactions",
    purpose="One row per member and support: the live-load envelope of the reaction.",
    highlights=("R max", "R min"),
    columns=(
        ResultColumn(
            header="Member", width=16, values=_member("support"), text=True, meaning="Member id."
        ),
        ResultColumn(
            header="Support",
            number_format=FORMAT_WHOLE,
            width=8,
            values=lambda env: list(range(1, env.support_x.size + 1)),
            meaning="Support number, 1 = the left end.",
        ),
        ResultColumn(
            header="x",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=9,
            values=lambda env: [float(x) for x in env.support_x],
            meaning="Distance from the member's left end.",
        ),
        *(col for e in EFFECTS if e.rows == "support" for col in _effect_columns(e)),
    ),
)

GOVERNING = ResultTable(
    sheet="Governing",
    purpose="One row per member: its extreme value of every effect, where and by which vehicle.",
    columns=(
        ResultColumn(
            header="Member",
            width=16,
            values=lambda env: [env.member],
            text=True,
            meaning="Member id.",
        ),
        *(col for e in EFFECTS for col in _governing_columns(e)),
    ),
)

#: The tabular result sheets, in workbook order.
RESULT_TABLES: tuple[ResultTable, ...] = (ENVELOPES, REACTIONS, GOVERNING)

_NUMBERED_ENVELOPES = re.compile(rf"^{ENVELOPES.sheet.lower()} \d+$")
_RESULT_NAMES = {t.sheet.lower() for t in RESULT_TABLES} | {
    CHARTS_SHEET.lower(),
    RUN_LOG_SHEET.lower(),
    VEHICLE_SUMMARY_SHEET.lower(),
    *(name.lower() for name in ASSESSMENT_SHEETS),
}


def is_result_sheet_name(name: str) -> bool:
    """True for the name of a sheet spanfleet writes (spreadsheet names ignore case).

    Includes the continuation sheets ``Envelopes 2``, ``Envelopes 3``, … used
    when the Envelopes rows exceed one sheet.
    """
    key = name.strip().lower()
    return key in _RESULT_NAMES or bool(_NUMBERED_ENVELOPES.match(key))
