"""Every result sheet and its columns, declared once.

Each sheet is a :class:`~batch.writing.declare.ResultTable`: its name, what it is
for, where its blocks of rows come from, and its columns, each declared exactly
once with header (the unit is added from the run's unit system, e.g.
``"M max (kip-ft)"``), quantity, number format, width, meaning and how its cells
come from a block. The writer (:mod:`batch.writing.tables`), the Result Guide
sheet and the docs read these declarations, so a column or a sheet is added here
and nowhere else.

Values keep the engine's sign conventions (those of docs/workbook.md): sagging
moment positive; shear V is the sum of the upward forces left of the section
(V = dM/dx), the section being just right of the station except at station 1 of
a span, where it is just left; reactions upward positive. Rating factors and
posting loads are computed by :mod:`batch.rating`; these columns only show them.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from typing import TYPE_CHECKING, Any, NamedTuple

import numpy as np
from numpy.typing import NDArray

from batch.engine.effects import (
    EFFECTS,
    Effect,
    Governing,
    MemberEnvelope,
    Rows,
    governing_row,
)
from batch.engine.fatigue import FatigueRanges
from batch.model import Case
from batch.rating.lrfr import FLAGS, RATED_EFFECTS, MemberRating, RatingFactors
from batch.rating.screening import SCREEN_EFFECTS, MemberScreening
from batch.writing.declare import (
    FORMAT_FRACTION,
    FORMAT_RATIO,
    FORMAT_VALUE,
    FORMAT_WHOLE,
    WEIGHT_LABELS,
    AnyTable,
    ResultColumn,
    ResultTable,
)

if TYPE_CHECKING:
    from batch.running.executor import RunResult

__all__ = [
    "CHARTS_SHEET",
    "ENVELOPES",
    "FATIGUE",
    "GOVERNING",
    "RATINGS",
    "RATING_MATRIX",
    "REACTIONS",
    "RESULT_GUIDE",
    "RESULT_TABLES",
    "RF_BANDS",
    "RUN_LOG_SHEET",
    "SCREENING",
    "SCREENING_DETAIL",
    "SCREEN_EXCEEDED_RGB",
    "SHEAR_CHARTS_SHEET",
    "VEHICLE_SUMMARY",
    "FatigueMember",
    "MemberPeaks",
    "RatedMember",
    "ScreenedMember",
    "direction_text",
    "is_result_sheet_name",
]

#: Direction codes of the engine and their text in the result sheets.
DIRECTION_TEXT: dict[int, str] = {1: "left-to-right", -1: "right-to-left"}

RUN_LOG_SHEET = "Run Log"
CHARTS_SHEET = "Moment Charts"
SHEAR_CHARTS_SHEET = "Shear Charts"

#: Fills of a rating factor, by band: (lowest RF of the band, fill RGB, words).
#: spanfleet's own palette: failures stand out, a thin margin is marked, the rest is calm.
RF_BANDS: tuple[tuple[float, str, str], ...] = (
    (-np.inf, "E3A9A2", "muted red: RF below 1"),
    (1.0, "F2E2B6", "pale wheat: RF 1 to 1.2"),
    (1.2, "D5E6CF", "pale sage: RF 1.2 or more"),
)
#: Fill of a screening ratio above 1 (the vehicle's effect exceeds the reference's).
SCREEN_EXCEEDED_RGB = RF_BANDS[0][1]

#: Columns of envelope sheets, cells taken from one member's envelope.
Column = ResultColumn[MemberEnvelope]
Values = Callable[[MemberEnvelope], list[object]]


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


def _effect_columns(effect: Effect) -> tuple[Column, ...]:
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
            highlight=effect.name,
            meaning=effect.meaning,
        ),
        ResultColumn(
            header=f"{effect.name} vehicle",
            width=20,
            values=per_row(_vehicle),
            highlight=effect.name,
            text=True,
            meaning="The load case that governs (empty where no vehicle gives a value).",
        ),
        ResultColumn(
            header=f"{effect.name} at",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=10,
            values=per_row(lambda _env, ext, i: _position(ext, i)),
            highlight=effect.name,
            meaning="Position of the governing vehicle's front axle from the member's left end.",
        ),
        ResultColumn(
            header=f"{effect.name} direction",
            width=14,
            values=per_row(lambda _env, ext, i: _direction(ext, i)),
            highlight=effect.name,
            text=True,
            meaning="Direction of travel of the governing vehicle.",
        ),
    )


def _governing_columns(effect: Effect) -> tuple[Column, ...]:
    """One member's extreme of ``effect``: value, where, and which vehicle, position, direction."""

    def one(get: Callable[[MemberEnvelope, Governing, int], object], empty: object) -> Values:
        def values(env: MemberEnvelope) -> list[object]:
            i = governing_row(effect, env)
            return [empty if i is None else get(env, effect.extremes(env), i)]

        return values

    where: tuple[Column, ...]
    if effect.rows == "station":
        where = (
            ResultColumn(
                header=f"{effect.name} span",
                number_format=FORMAT_WHOLE,
                width=8,
                values=one(lambda env, _ext, i: int(env.station_span[i]), None),
                meaning="Span of the station where the extreme occurs, from 1 at the left end.",
            ),
            ResultColumn(
                header=f"{effect.name} station",
                number_format=FORMAT_FRACTION,
                width=9,
                values=one(lambda env, _ext, i: float(env.station_fraction[i]), None),
                meaning="Fraction of that span's length.",
            ),
            ResultColumn(
                header=f"{effect.name} x",
                quantity="length",
                number_format=FORMAT_VALUE,
                width=9,
                values=one(lambda env, _ext, i: float(env.station_x[i]), None),
                meaning="Distance of that station from the member's left end.",
            ),
        )
    else:
        where = (
            ResultColumn(
                header=f"{effect.name} support",
                number_format=FORMAT_WHOLE,
                width=9,
                values=one(lambda _env, _ext, i: i + 1, None),
                meaning="Support where the extreme occurs, 1 = the left end.",
            ),
            ResultColumn(
                header=f"{effect.name} x",
                quantity="length",
                number_format=FORMAT_VALUE,
                width=9,
                values=one(lambda env, _ext, i: float(env.support_x[i]), None),
                meaning="Distance of that support from the member's left end.",
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


def _highlights(rows: Rows) -> dict[str, Callable[[MemberEnvelope], int | None]]:
    """Each effect's rule: the member's governing row of that effect is highlighted."""

    def rule(effect: Effect) -> Callable[[MemberEnvelope], int | None]:
        return lambda env: governing_row(effect, env)

    return {e.name: rule(e) for e in EFFECTS if e.rows == rows}


ENVELOPES: ResultTable[MemberEnvelope] = ResultTable(
    sheet="Envelopes",
    purpose="One row per member and station: the live-load envelope of moment and shear.",
    blocks=lambda result: result.envelopes,
    rows=lambda result: result.n_stations,
    highlights=_highlights("station"),
    frozen_columns=4,
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

REACTIONS: ResultTable[MemberEnvelope] = ResultTable(
    sheet="Reactions",
    purpose="One row per member and support: the live-load envelope of the reaction.",
    blocks=lambda result: result.envelopes,
    rows=lambda result: result.n_supports,
    highlights=_highlights("support"),
    frozen_columns=3,
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

GOVERNING: ResultTable[MemberEnvelope] = ResultTable(
    sheet="Governing",
    purpose="One row per member: its extreme value of every effect, where and by which vehicle.",
    blocks=lambda result: result.envelopes,
    rows=lambda result: result.n_members,
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


# ---------------------------------------------------------------- per member and vehicle


class MemberPeaks(NamedTuple):
    """One member's block of the Vehicle Summary: every vehicle's extremes over the member.

    ``peaks`` is (n_vehicles, 6): M max, M min, V max, V min, R max, R min.
    """

    member: str
    case: Case
    peaks: NDArray[np.float64]


class RatedMember(NamedTuple):
    """One rated member's block of the Ratings and Rating Matrix sheets."""

    envelope: MemberEnvelope
    rating: MemberRating
    case: Case


class ScreenedMember(NamedTuple):
    """One screened member's block of the Screening and Screening Detail sheets."""

    envelope: MemberEnvelope
    screening: MemberScreening
    case: Case


def _finite_or_blank(value: float) -> float | None:
    """A finite number, or an empty cell."""
    return float(value) if np.isfinite(value) else None


def _per_vehicle(get: Callable[[Any, int], object]) -> Callable[[Any], list[object]]:
    """A column with one cell per vehicle of the run: ``get(block, vehicle index)``."""
    return lambda block: [get(block, v) for v in range(len(block.case.vehicles))]


def _rf_fill(value: object) -> str | None:
    if not isinstance(value, float):
        return None
    return next(rgb for low, rgb, _ in reversed(RF_BANDS) if value >= low)


def _exceeded_fill(value: object) -> str | None:
    return SCREEN_EXCEEDED_RGB if isinstance(value, float) and value > 1.0 else None


def _peak_blocks(result: RunResult) -> list[MemberPeaks]:
    assert result.peaks is not None
    return [
        MemberPeaks(member=m.id, case=result.case, peaks=p)
        for m, p in zip(result.case.members, result.peaks, strict=True)
    ]


_MEMBER: ResultColumn[Any] = ResultColumn(
    header="Member",
    width=16,
    values=_per_vehicle(lambda b, _v: b.envelope.member if hasattr(b, "envelope") else b.member),
    text=True,
    meaning="Member id.",
)
_VEHICLE: ResultColumn[Any] = ResultColumn(
    header="Vehicle",
    width=18,
    values=_per_vehicle(lambda b, v: b.case.vehicles[v].id),
    text=True,
    meaning="Vehicle id, as on the Vehicles sheet.",
)
_CATEGORY: ResultColumn[Any] = ResultColumn(
    header="Category",
    width=9,
    values=_per_vehicle(lambda b, v: b.case.vehicles[v].category),
    text=True,
    meaning="The vehicle's category: design, legal or permit.",
)


def _peak_column(k: int, effect: Effect) -> ResultColumn[MemberPeaks]:
    """The Vehicle Summary column of one effect (column ``k`` of the peaks)."""
    return ResultColumn(
        header=effect.name,
        quantity=effect.quantity,
        number_format=FORMAT_VALUE,
        width=12,
        values=lambda b: [float(x) for x in b.peaks[:, k]],
        meaning=f"{effect.meaning} The member's extreme under this vehicle alone.",
    )


VEHICLE_SUMMARY: ResultTable[MemberPeaks] = ResultTable(
    sheet="Vehicle Summary",
    purpose="One row per member and vehicle: the vehicle's extreme of each effect over the "
    "member (all stations or supports), factored as in Envelopes.",
    blocks=_peak_blocks,
    rows=lambda result: result.n_members * result.n_vehicles,
    wanted=lambda result: result.peaks is not None,
    overflow="store",
    columns=(
        _MEMBER,
        _VEHICLE,
        *(_peak_column(k, e) for k, e in enumerate(EFFECTS)),
    ),
)


# ---------------------------------------------------------------- ratings


def _rated(result: RunResult) -> list[RatedMember]:
    return [
        RatedMember(envelope=env, rating=a.rating, case=result.case)
        for env, a in zip(result.envelopes, result.assessments, strict=True)
        if a.rating is not None
    ]


def _n_rated(result: RunResult) -> int:
    return sum(a.rating is not None for a in result.assessments)


def _place(b: RatedMember, v: int, get: Callable[[MemberEnvelope, int], object]) -> object:
    """A cell of the governing station of vehicle ``v`` (empty where nothing governs)."""
    row = int(b.rating.station[v])
    return get(b.envelope, row) if row >= 0 else None


RATINGS: ResultTable[RatedMember] = ResultTable(
    sheet="Ratings",
    purpose="One row per rated member and vehicle: the governing rating factor and where it "
    "governs, the posting load of a legal load and the operating level of a design load.",
    blocks=_rated,
    rows=lambda result: _n_rated(result) * result.n_vehicles,
    wanted=lambda result: _n_rated(result) > 0,
    overflow="store",
    frozen_columns=2,
    columns=(
        _MEMBER,
        _VEHICLE,
        _CATEGORY,
        ResultColumn(
            header="RF",
            number_format=FORMAT_RATIO,
            width=8,
            values=_per_vehicle(lambda b, v: _finite_or_blank(b.rating.rf[v])),
            fill=_rf_fill,
            meaning="Governing rating factor: the smallest over the member's rated stations and "
            "effects (inventory level for design loads); blank: the vehicle loads none of them. "
            "Colour: " + "; ".join(words for _, _, words in RF_BANDS) + ".",
        ),
        ResultColumn(
            header="Effect",
            width=7,
            values=_per_vehicle(
                lambda b, v: (
                    RATED_EFFECTS[int(b.rating.effect[v])][0] if b.rating.effect[v] >= 0 else None
                )
            ),
            text=True,
            meaning="The rated effect that governs: M+ (sagging), M- (hogging) or V (shear).",
        ),
        ResultColumn(
            header="Span",
            number_format=FORMAT_WHOLE,
            width=6,
            values=_per_vehicle(lambda b, v: _place(b, v, lambda e, i: int(e.station_span[i]))),
            meaning="Span of the governing station, from 1 at the left end.",
        ),
        ResultColumn(
            header="Station",
            number_format=FORMAT_FRACTION,
            width=8,
            values=_per_vehicle(
                lambda b, v: _place(b, v, lambda e, i: float(e.station_fraction[i]))
            ),
            meaning="Fraction of the span of the governing station.",
        ),
        ResultColumn(
            header="x",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=9,
            values=_per_vehicle(lambda b, v: _place(b, v, lambda e, i: float(e.station_x[i]))),
            meaning="Distance of the governing station from the member's left end.",
        ),
        ResultColumn(
            header="Posting load",
            quantity="weight",
            number_format=FORMAT_VALUE,
            width=12,
            values=_per_vehicle(lambda b, v: _finite_or_blank(b.rating.posting[v])),
            meaning="Legal loads with 0.3 <= RF < 1: the posting load (W/0.7)(RF - 0.3), "
            "MBE 6A.8.3.",
        ),
        ResultColumn(
            header="RF operating",
            number_format=FORMAT_RATIO,
            width=10,
            values=_per_vehicle(lambda b, v: _finite_or_blank(b.rating.rf_operating[v])),
            fill=_rf_fill,
            meaning="Design loads: the operating-level rating factor at the same place.",
        ),
        ResultColumn(
            header="LL factor",
            number_format=FORMAT_RATIO,
            width=8,
            values=_per_vehicle(
                lambda b, v: RatingFactors.of(b.case.settings).live(b.case.vehicles[v].category)
            ),
            meaning="The live-load factor the rating used (design loads: inventory).",
        ),
        ResultColumn(
            header="Flag",
            width=44,
            values=_per_vehicle(lambda b, v: FLAGS[int(b.rating.flag[v])] or None),
            text=True,
            meaning="A note on a rating below 1, or on a vehicle that loads no rated effect.",
        ),
    ),
)


def _vehicle_columns(
    get: Callable[[Any, int], object], fill: Callable[[object], str | None], meaning: str
) -> Callable[[Case], tuple[ResultColumn[Any], ...]]:
    """One column per vehicle of the run, headed by the vehicle's id."""

    def one(j: int, vehicle: str) -> ResultColumn[Any]:
        return ResultColumn(
            header=vehicle,
            number_format=FORMAT_RATIO,
            width=max(9.0, min(24.0, len(vehicle) * 0.9 + 2)),
            values=lambda b: [get(b, j)],
            fill=fill,
            meaning=meaning,
        )

    def columns(case: Case) -> tuple[ResultColumn[Any], ...]:
        return tuple(one(j, v.id) for j, v in enumerate(case.vehicles))

    return columns


RATING_MATRIX: ResultTable[RatedMember] = ResultTable(
    sheet="Rating Matrix",
    purpose="Rated members down, vehicles across: the governing rating factor of each pair.",
    blocks=_rated,
    rows=_n_rated,
    wanted=lambda result: _n_rated(result) > 0,
    overflow="store",
    columns=(
        ResultColumn(
            header="Member",
            width=18,
            values=lambda b: [b.envelope.member],
            text=True,
            meaning="Member id.",
        ),
    ),
    per_vehicle=_vehicle_columns(
        lambda b, j: _finite_or_blank(b.rating.rf[j]),
        _rf_fill,
        "The vehicle's governing RF on the member (design loads: inventory); blank: not "
        "loaded at the rated stations. Colour: "
        + "; ".join(words for _, _, words in RF_BANDS)
        + ".",
    ),
)


# ---------------------------------------------------------------- screening


def _screened(result: RunResult) -> list[ScreenedMember]:
    out = []
    for env, a in zip(result.envelopes, result.assessments, strict=True):
        assert a.screening is not None
        out.append(ScreenedMember(envelope=env, screening=a.screening, case=result.case))
    return out


def _is_screened(result: RunResult) -> bool:
    return bool(result.assessments) and result.assessments[0].screening is not None


SCREENING: ResultTable[ScreenedMember] = ResultTable(
    sheet="Screening",
    purpose="Members down, vehicles across: the largest ratio of each vehicle's effect to the "
    "reference vehicle's (Settings, Reference vehicle).",
    blocks=_screened,
    rows=lambda result: result.n_members,
    wanted=_is_screened,
    overflow="store",
    columns=(
        ResultColumn(
            header="Member",
            width=18,
            values=lambda b: [b.envelope.member],
            text=True,
            meaning="Member id.",
        ),
    ),
    per_vehicle=_vehicle_columns(
        lambda b, j: _finite_or_blank(b.screening.ratio[j]),
        _exceeded_fill,
        "The largest ratio of the vehicle's effect to the reference's on the member; above 1 "
        "(muted red) it exceeds the reference; blank: nothing to compare.",
    ),
)


def _screen_place(b: ScreenedMember, v: int) -> tuple[object, object, object, object]:
    """Span, station, support and x of the vehicle's largest ratio (empty where none)."""
    k, row = int(b.screening.effect[v]), int(b.screening.row[v])
    env = b.envelope
    if k < 0:
        return None, None, None, None
    if SCREEN_EFFECTS[k][1] == "reaction":
        return None, None, row + 1, float(env.support_x[row])
    return (
        int(env.station_span[row]),
        float(env.station_fraction[row]),
        None,
        float(env.station_x[row]),
    )


SCREENING_DETAIL: ResultTable[ScreenedMember] = ResultTable(
    sheet="Screening Detail",
    purpose="One row per member and vehicle: the largest ratio to the reference, which "
    "effect and where.",
    blocks=_screened,
    rows=lambda result: result.n_members * result.n_vehicles,
    wanted=_is_screened,
    overflow="store",
    frozen_columns=2,
    columns=(
        _MEMBER,
        _VEHICLE,
        _CATEGORY,
        ResultColumn(
            header="Ratio",
            number_format=FORMAT_RATIO,
            width=8,
            values=_per_vehicle(lambda b, v: _finite_or_blank(b.screening.ratio[v])),
            fill=_exceeded_fill,
            meaning="Largest ratio of the vehicle's effect to the reference's (muted red above 1).",
        ),
        ResultColumn(
            header="Effect",
            width=7,
            values=_per_vehicle(
                lambda b, v: (
                    SCREEN_EFFECTS[int(b.screening.effect[v])][0]
                    if b.screening.effect[v] >= 0
                    else None
                )
            ),
            text=True,
            meaning="The effect of the largest ratio: M+, M-, V+, V-, R+ or R-.",
        ),
        ResultColumn(
            header="Span",
            number_format=FORMAT_WHOLE,
            width=6,
            values=_per_vehicle(lambda b, v: _screen_place(b, v)[0]),
            meaning="Span of the station (moments and shears).",
        ),
        ResultColumn(
            header="Station",
            number_format=FORMAT_FRACTION,
            width=8,
            values=_per_vehicle(lambda b, v: _screen_place(b, v)[1]),
            meaning="Fraction of the span of the station (moments and shears).",
        ),
        ResultColumn(
            header="Support",
            number_format=FORMAT_WHOLE,
            width=8,
            values=_per_vehicle(lambda b, v: _screen_place(b, v)[2]),
            meaning="Support number, 1 = the left end (reactions).",
        ),
        ResultColumn(
            header="x",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=9,
            values=_per_vehicle(lambda b, v: _screen_place(b, v)[3]),
            meaning="Distance from the member's left end.",
        ),
    ),
)


# ---------------------------------------------------------------- fatigue


class FatigueMember(NamedTuple):
    """One member's block of the Fatigue sheet: each fatigue load case at every station."""

    envelope: MemberEnvelope
    ranges: FatigueRanges


def _fatigue_blocks(result: RunResult) -> list[FatigueMember]:
    return [
        FatigueMember(envelope=env, ranges=ranges)
        for env, ranges in zip(result.envelopes, result.fatigue, strict=True)
        if ranges is not None
    ]


def _n_fatigue(result: RunResult) -> int:
    return result.n_stations * sum(c.fatigue for c in result.load_cases)


def _each_case(get: Callable[[FatigueMember, int, int], object]) -> Callable[[Any], list[object]]:
    """A column with one cell per fatigue case and station: ``get(block, case row, station)``."""

    def values(b: FatigueMember) -> list[object]:
        stations = b.envelope.station_x.size
        return [get(b, k, i) for k in range(b.ranges.cases.size) for i in range(stations)]

    return values


FATIGUE: ResultTable[FatigueMember] = ResultTable(
    sheet="Fatigue",
    purpose="One row per member, fatigue load and station: the largest and smallest moment "
    "as the fatigue load crosses the member, and the moment range between them (AASHTO LRFD "
    "3.6.1.4: one fatigue truck, single-lane distribution factor without the multiple "
    "presence factor, IM 15 %, the model's load factor).",
    blocks=_fatigue_blocks,
    rows=_n_fatigue,
    wanted=lambda result: _n_fatigue(result) > 0,
    frozen_columns=5,
    columns=(
        ResultColumn(
            header="Member",
            width=16,
            values=_each_case(lambda b, _k, _i: b.envelope.member),
            text=True,
            meaning="Member id.",
        ),
        ResultColumn(
            header="Fatigue load",
            width=22,
            values=_each_case(lambda b, k, _i: b.envelope.labels[int(b.ranges.cases[k])]),
            text=True,
            meaning="The fatigue load case (a Vehicles row naming a fatigue model).",
        ),
        ResultColumn(
            header="Span",
            number_format=FORMAT_WHOLE,
            width=6,
            values=_each_case(lambda b, _k, i: int(b.envelope.station_span[i])),
            meaning="Span number, from 1 at the left end.",
        ),
        ResultColumn(
            header="Station",
            number_format=FORMAT_FRACTION,
            width=8,
            values=_each_case(lambda b, _k, i: float(b.envelope.station_fraction[i])),
            meaning="Fraction of the span's length.",
        ),
        ResultColumn(
            header="x",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=9,
            values=_each_case(lambda b, _k, i: float(b.envelope.station_x[i])),
            meaning="Distance from the member's left end.",
        ),
        ResultColumn(
            header="M max",
            quantity="moment",
            number_format=FORMAT_VALUE,
            width=11,
            values=_each_case(lambda b, k, i: float(b.ranges.m_max[k, i])),
            meaning="Largest (sagging) moment under the fatigue load, factored.",
        ),
        ResultColumn(
            header="M min",
            quantity="moment",
            number_format=FORMAT_VALUE,
            width=11,
            values=_each_case(lambda b, k, i: float(b.ranges.m_min[k, i])),
            meaning="Smallest (most hogging) moment under the fatigue load, factored.",
        ),
        ResultColumn(
            header="M range",
            quantity="moment",
            number_format=FORMAT_VALUE,
            width=11,
            values=_each_case(lambda b, k, i: float(b.ranges.m_range[k, i])),
            meaning="Moment range: M max minus M min (never negative).",
        ),
    ),
)


# ---------------------------------------------------------------- the guide to them all


class GuideRow(NamedTuple):
    """One column of one result sheet, as the Result Guide explains it."""

    sheet: str
    column: str
    unit: str
    meaning: str


def _guide(result: RunResult) -> list[list[GuideRow]]:
    """One block per row: what each sheet the run writes holds, and each of its columns."""
    settings = result.case.settings
    labels = {**settings.unit_labels, "weight": WEIGHT_LABELS[settings.units]}
    blocks = []
    for table in RESULT_TABLES:
        if not table.wanted(result):
            continue
        rows = [GuideRow(table.sheet, "", "", table.purpose)]
        rows += [
            GuideRow(table.sheet, col.header, labels.get(col.quantity, ""), col.meaning)
            for col in table.columns
        ]
        if table.per_vehicle is not None:
            sample = table.per_vehicle(result.case)[:1]
            rows += [GuideRow(table.sheet, "(one per vehicle)", "", c.meaning) for c in sample]
        blocks += [[row] for row in rows]
    return blocks


RESULT_GUIDE: ResultTable[list[GuideRow]] = ResultTable(
    sheet="Result Guide",
    purpose="One row per result sheet and per column: what it holds and its unit.",
    blocks=_guide,
    rows=lambda result: len(_guide(result)),
    columns=(
        ResultColumn(
            header="Sheet",
            width=18,
            values=lambda rows: [r.sheet for r in rows],
            text=True,
            wrap=True,
            meaning="A result sheet of this run.",
        ),
        ResultColumn(
            header="Column",
            width=22,
            values=lambda rows: [r.column for r in rows],
            text=True,
            wrap=True,
            meaning="A column of that sheet (blank: the sheet as a whole).",
        ),
        ResultColumn(
            header="Unit",
            width=9,
            values=lambda rows: [r.unit for r in rows],
            text=True,
            wrap=True,
            meaning="The column's unit in this run (blank: none).",
        ),
        ResultColumn(
            header="Meaning",
            width=80,
            values=lambda rows: [r.meaning for r in rows],
            text=True,
            wrap=True,
            meaning="What the sheet or column holds.",
        ),
    ),
)

#: The tabular result sheets, in workbook order (the charts and the Run Log follow).
RESULT_TABLES: tuple[AnyTable, ...] = (
    ENVELOPES,
    REACTIONS,
    GOVERNING,
    FATIGUE,
    VEHICLE_SUMMARY,
    RATINGS,
    RATING_MATRIX,
    SCREENING,
    SCREENING_DETAIL,
)

#: Every sheet a run writes, by name, for recognising them in the next run.
_RESULT_NAMES = {
    *(t.sheet.lower() for t in RESULT_TABLES),
    RESULT_GUIDE.sheet.lower(),
    CHARTS_SHEET.lower(),
    SHEAR_CHARTS_SHEET.lower(),
    RUN_LOG_SHEET.lower(),
}
#: Tables that continue on numbered sheets (``Envelopes 2``, ...) past one sheet's rows.
_CONTINUING = {t.sheet.lower() for t in RESULT_TABLES if t.overflow == "continue"}
_CONTINUED = re.compile(r"^(.*) [1-9]\d*$")


def is_result_sheet_name(name: str) -> bool:
    """True for the name of a sheet spanfleet writes (spreadsheet names ignore case).

    Includes the continuation sheets ``Envelopes 2``, ``Envelopes 3``, … of a
    table with more rows than one sheet holds.
    """
    key = name.strip().lower()
    numbered = _CONTINUED.match(key)
    return key in _RESULT_NAMES or bool(numbered and numbered.group(1) in _CONTINUING)
