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

import dataclasses
import math
import re
from collections.abc import Callable, Iterator
from typing import TYPE_CHECKING, Any, NamedTuple

import numpy as np
from numpy.typing import NDArray

from batch.engine.asbuilt import DEFLECTION_DF_SOURCES, MemberDeflection
from batch.engine.effects import (
    EFFECTS,
    Effect,
    Governing,
    MemberEnvelope,
    Rows,
    governing_row,
)
from batch.engine.fatigue import FatigueRanges
from batch.loads.distribution import (
    Factor,
    MemberFactors,
    layout_factors,
    layout_girder,
    number,
)
from batch.model import RATING_METHODS, Bridge, Case, GirderLayout, Member
from batch.rating.lrfr import FLAGS, FR_RULES, RATED_EFFECTS, MemberDeadLoads, MemberRating
from batch.rating.posting import BridgePosting
from batch.rating.screening import SCREEN_EFFECTS, MemberScreening
from batch.rating.traffic import DF_SOURCES, GAMMA_SOURCES, IMPACT_SOURCES, LIMIT_STATES
from batch.writing.declare import (
    FORMAT_FACTOR,
    FORMAT_FRACTION,
    FORMAT_RATIO,
    FORMAT_VALUE,
    FORMAT_WHOLE,
    WEIGHT_LABELS,
    AnyTable,
    ResultColumn,
    ResultQuantity,
    ResultTable,
)

if TYPE_CHECKING:
    from batch.running.executor import RunResult

__all__ = [
    "CHARTS_SHEET",
    "CONCURRENT",
    "DEAD_LOADS",
    "DEFLECTIONS",
    "DEFLECTION_CHECK",
    "DISTRIBUTION_FACTORS",
    "ENVELOPES",
    "FATIGUE",
    "GOVERNING",
    "IMPACT",
    "POSTINGS",
    "RATINGS",
    "RATINGS_SUMMARY",
    "RATING_DETAIL",
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
    "shown_position",
    "spacing_text",
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


#: Decimals of a spacing shown as text (trailing zeros dropped, one kept: ``14.0``).
SPACING_DECIMALS = 3


def spacing_text(spacing: NDArray[np.float64]) -> str | None:
    """The spacings of a ranged train's ranged gaps as text, e.g. ``14.0`` or ``14.0; 30.0``.

    Front to rear, in the length unit (the sheet adds it: ``14.0 ft``); None (an
    empty cell) when none is finite (a train of fixed spacings, or no vehicle).
    """
    shown = []
    for v in np.asarray(spacing, dtype=float).tolist():
        if np.isfinite(v):
            text = f"{v:.{SPACING_DECIMALS}f}".rstrip("0")
            shown.append(text + "0" if text.endswith(".") else text)
    return "; ".join(shown) or None


# ---------------------------------------------------------------- cell values


def _row_count(effect_rows: Rows, env: MemberEnvelope) -> int:
    return int(env.station_x.size if effect_rows == "station" else env.support_x.size)


def _vehicle(env: MemberEnvelope, ext: Governing, i: int) -> str | None:
    case = int(ext.case[i])
    return env.labels[case] if case >= 0 else None


def shown_position(p: NDArray[np.float64]) -> NDArray[np.float64]:
    """Computed positions (ft or m) as the decimals an engineer would type.

    Rounded to twelve significant digits (a nanometre-scale step on any real member),
    so that a front axle 13.2 ft behind a station at 14 ft reads 0.8, not
    0.8000000000000007: each is N / 10**k with N an integer below 10**12 and 10**k exact,
    so the quotient is the double nearest that decimal. Zero and NaN stay as they are.
    """
    p = np.asarray(p, dtype=float)
    finite = np.isfinite(p) & (p != 0)
    size = np.abs(np.where(finite, p, 1.0))
    scale = 10.0 ** (11 - np.floor(np.log10(size)))
    return np.where(finite, np.round(p * scale) / scale, p)


def _position(ext: Governing, i: int) -> float | None:
    p = float(ext.position[i])
    return float(shown_position(np.array(p))) if int(ext.case[i]) >= 0 and np.isfinite(p) else None


def _direction(ext: Governing, i: int) -> str | None:
    return direction_text(int(ext.direction[i])) if int(ext.case[i]) >= 0 else None


def _spacing(ext: Governing, i: int) -> str | None:
    return spacing_text(ext.spacing[i]) if int(ext.case[i]) >= 0 else None


#: What a spacing column holds (the envelope sheets and the rating sheets alike).
SPACING_MEANING = (
    "The spacing the governing vehicle used for each gap of its given as a range, front to "
    "rear, separated by '; ' (blank for a vehicle of fixed spacings): the worst one within "
    "the range, found exactly."
)


def _member(rows: Rows) -> Values:
    return lambda env: [env.member] * _row_count(rows, env)


def _effect_columns(effect: Effect) -> tuple[Column, ...]:
    """The value, vehicle, at, direction and spacing columns of one effect, row by row."""

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
        ResultColumn(
            header=f"{effect.name} spacing",
            quantity="length",
            width=14,
            values=per_row(lambda _env, ext, i: _spacing(ext, i)),
            highlight=effect.name,
            text=True,
            unit_in_cells=True,
            meaning=SPACING_MEANING,
        ),
    )


def _governing_columns(effect: Effect) -> tuple[Column, ...]:
    """One member's extreme of ``effect``: its value, where, and what governs it (see below).

    Which vehicle, its position, direction and spacing, as on the Envelopes sheet.
    """

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
    value, vehicle, at, direction, spacing = _effect_columns(effect)
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
                unit_in_cells=col.unit_in_cells,
                meaning=col.meaning,
            )
            for col, get in (
                (vehicle, _vehicle),
                (at, lambda _env, ext, i: _position(ext, i)),
                (direction, lambda _env, ext, i: _direction(ext, i)),
                (spacing, lambda _env, ext, i: _spacing(ext, i)),
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


# ---------------------------------------------------------------- concurrent forces


def _concurrent_columns(effect: Effect) -> tuple[Column, ...]:
    """A governing moment or shear, the shear or moment acting with it, and what governs."""
    value, *governs = _effect_columns(effect)
    moment = effect.quantity == "moment"
    other = "V" if moment else "M"
    return (
        value,
        ResultColumn(
            header=f"{other} with {effect.name}",
            quantity="force" if moment else "moment",
            number_format=FORMAT_VALUE,
            width=12,
            values=lambda env: _numbers(effect.extremes(env).concurrent),
            highlight=effect.name,
            meaning=f"The {'shear' if moment else 'moment'} at the station that acts with "
            f"{effect.name}: the same vehicle at the same position, direction and spacing, its "
            "lane load on the same parts of the member; its own distribution factor, the "
            f"dynamic allowance of {effect.name}. Blank where no vehicle governs, and for a "
            "load placed again in another span.",
        ),
        *governs,
    )


CONCURRENT: ResultTable[MemberEnvelope] = ResultTable(
    sheet="Concurrent Forces",
    purpose="One row per member and station: the largest and smallest shear, each with the "
    "moment that acts with it, and the largest sagging and hogging moment, each with the "
    "shear that acts with it (the same vehicle in the same place): for checks that take a "
    "shear with its concurrent moment, as the shear resistance of concrete does (AASHTO "
    "LRFD 5.7.3.4.2 takes Mu with Vu).",
    blocks=lambda result: result.envelopes,
    rows=lambda result: result.n_stations,
    highlights=_highlights("station"),
    frozen_columns=4,
    columns=(
        *ENVELOPES.columns[:4],
        *(
            col
            for name in ("V max", "V min", "M max", "M min")
            for col in _concurrent_columns(next(e for e in EFFECTS if e.name == name))
        ),
    ),
)


# ---------------------------------------------------------------- impact


def _impact_cells(get: Callable[[MemberEnvelope, int, Effect, int], object]) -> Values:
    """A column of the Impact sheet: ``get(envelope, effect index, effect, row)`` per row.

    A member's rows are every effect of :data:`EFFECTS` in order, each at every
    station (moments, shears) or support (reactions).
    """

    def values(env: MemberEnvelope) -> list[object]:
        return [
            get(env, k, e, i) for k, e in enumerate(EFFECTS) for i in range(_row_count(e.rows, env))
        ]

    return values


def _impact_of(env: MemberEnvelope, k: int, field: str, i: int) -> float | None:
    rows = env.impact[k] if env.impact is not None else None
    return None if rows is None else float(getattr(rows, field)[i])


def _has_standard_impact(result: RunResult) -> bool:
    return any(c.impact_formula is not None for c in result.load_cases)


IMPACT: ResultTable[MemberEnvelope] = ResultTable(
    sheet="Impact",
    purpose="One row per member, effect and station or support: the loaded length L and the "
    "impact I = 50/(L + 125) <= 0.30 (L in ft) of the AASHTO Standard Specifications, Art. "
    "3.8, which every load case following that rule (the H and HS models; Vehicles rows "
    "with Impact Standard Specifications) includes on its axles and lane load. L: the span "
    "for M max; for M min the average of the two spans beside an interior support between "
    "it and its point of contraflexure under a uniform load, else the span; for V max the "
    "station to its span's right end, for V min its span's left end to the station; for "
    "reactions the span beside an end support, the average of the two beside an interior "
    "one.",
    blocks=lambda result: result.envelopes,
    rows=lambda result: 4 * result.n_stations + 2 * result.n_supports,
    wanted=_has_standard_impact,
    frozen_columns=2,
    columns=(
        ResultColumn(
            header="Member",
            width=16,
            values=_impact_cells(lambda env, _k, _e, _i: env.member),
            text=True,
            meaning="Member id.",
        ),
        ResultColumn(
            header="Effect",
            width=8,
            values=_impact_cells(lambda _env, _k, e, _i: e.name),
            text=True,
            meaning="The effect and sense: M max, M min, V max, V min, R max or R min.",
        ),
        ResultColumn(
            header="Span",
            number_format=FORMAT_WHOLE,
            width=6,
            values=_impact_cells(
                lambda env, _k, e, i: int(env.station_span[i]) if e.rows == "station" else None
            ),
            meaning="Span number of the station, from 1 at the left end (moments, shears).",
        ),
        ResultColumn(
            header="Station",
            number_format=FORMAT_FRACTION,
            width=8,
            values=_impact_cells(
                lambda env, _k, e, i: (
                    float(env.station_fraction[i]) if e.rows == "station" else None
                )
            ),
            meaning="Fraction of the span of the station (moments, shears).",
        ),
        ResultColumn(
            header="Support",
            number_format=FORMAT_WHOLE,
            width=8,
            values=_impact_cells(lambda _env, _k, e, i: i + 1 if e.rows == "support" else None),
            meaning="Support number, 1 = the left end (reactions).",
        ),
        ResultColumn(
            header="x",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=9,
            values=_impact_cells(
                lambda env, _k, e, i: float(
                    env.station_x[i] if e.rows == "station" else env.support_x[i]
                )
            ),
            meaning="Distance from the member's left end.",
        ),
        ResultColumn(
            header="Loaded length",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=13,
            values=_impact_cells(lambda env, k, _e, i: _impact_of(env, k, "loaded_length", i)),
            meaning="The loaded length L of the effect here (see the sheet's purpose).",
        ),
        ResultColumn(
            header="Impact",
            number_format=FORMAT_FRACTION,
            width=8,
            values=_impact_cells(lambda env, k, _e, i: _impact_of(env, k, "fraction", i)),
            meaning="I = 50/(L + 125) <= 0.30, L in ft (the same in metres in an SI run), as a "
            "fraction: the value of the effect is (1 + I) times its static value.",
        ),
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
    """One rated member's block of the Ratings, Rating Matrix and Rating Detail sheets."""

    envelope: MemberEnvelope
    rating: MemberRating
    case: Case
    member: Member


class DeadMember(NamedTuple):
    """One member's block of the Dead Loads sheet: its stations, then its supports."""

    envelope: MemberEnvelope
    dead: MemberDeadLoads


class ScreenedMember(NamedTuple):
    """One screened member's block of the Screening and Screening Detail sheets."""

    envelope: MemberEnvelope
    screening: MemberScreening
    case: Case


def _finite_or_blank(value: float) -> float | None:
    """A finite number, or an empty cell (math, not numpy: called once per cell)."""
    number = float(value)
    return number if math.isfinite(number) else None


def _per_vehicle(get: Callable[[Any, int], object]) -> Callable[[Any], list[object]]:
    """A column with one cell per vehicle of the run: ``get(block, vehicle index)``."""
    return lambda block: [get(block, v) for v in range(len(block.case.vehicles))]


#: RF_BANDS from the highest band down, for the fill of one cell.
_RF_DOWN = tuple((low, rgb) for low, rgb, _ in reversed(RF_BANDS))


def _rf_fill(value: object) -> str | None:
    if not isinstance(value, float):
        return None
    for low, rgb in _RF_DOWN:  # a plain loop: called once per RF cell of a run
        if value >= low:
            return rgb
    return None


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
    values=lambda b: (
        [b.envelope.member if hasattr(b, "envelope") else b.member] * len(b.case.vehicles)
    ),
    text=True,
    meaning="Member id.",
)
_VEHICLE: ResultColumn[Any] = ResultColumn(
    header="Vehicle",
    width=18,
    values=lambda b: [v.id for v in b.case.vehicles],
    text=True,
    meaning="Vehicle id, as on the Vehicles sheet.",
)
_CATEGORY: ResultColumn[Any] = ResultColumn(
    header="Category",
    width=9,
    values=lambda b: [v.category for v in b.case.vehicles],
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
        values=lambda b: b.peaks[:, k].tolist(),
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


def _rated(result: RunResult) -> Iterator[RatedMember]:
    for member, env, a in zip(
        result.case.members, result.envelopes, result.assessments, strict=True
    ):
        if a.rating is not None:
            yield RatedMember(envelope=env, rating=a.rating, case=result.case, member=member)


def _n_rated(result: RunResult) -> int:
    return result.rated.members


def _place(get: Callable[[MemberEnvelope], NDArray[Any]]) -> Callable[[RatedMember], list[object]]:
    """Per vehicle, ``get`` (a station array of the envelope) at its governing station.

    Empty where nothing governs.
    """

    def values(b: RatedMember) -> list[object]:
        rows = b.rating.station
        cells: list[object] = get(b.envelope)[np.maximum(rows, 0)].tolist()
        for v in np.flatnonzero(rows < 0).tolist():
            cells[v] = None
        return cells

    return values


def _numbers(values: NDArray[Any]) -> list[object]:
    """Finite numbers as they are, anything else an empty cell."""
    cells: list[object] = np.asarray(values, dtype=float).tolist()
    for i in np.flatnonzero(~np.isfinite(values)).tolist():
        cells[i] = None
    return cells


def _one_line(columns: tuple[ResultColumn[Any], ...]) -> tuple[ResultColumn[Any], ...]:
    """The columns, each wide enough for its header and unit on one line (one header row)."""
    unit = len(" (tonnes)")  # the longest unit label a header may take
    return tuple(
        dataclasses.replace(c, width=max(c.width, len(c.header) + (unit if c.quantity else 0) + 3))
        for c in columns
    )


def _words(table: tuple[str, ...], codes: NDArray[np.int8]) -> NDArray[np.str_]:
    """The words of each code of one of :mod:`batch.rating.traffic`'s tables."""
    return np.array(table, dtype=np.str_)[codes]


#: The terms of the rating equation shown for every rated check: (header, quantity of the
#: effect or "", format, width, meaning, cell from (rating, vehicle, check)). Declared once,
#: for the Ratings sheet (the governing check) and the Rating Detail sheet (every check).
#: A term's cells from (rating, vehicle indices, check indices), element by element.
_Cells = Callable[[MemberRating, NDArray[np.int64], NDArray[np.int64]], NDArray[Any]]
_Term = tuple[str, ResultQuantity, str, float, str, _Cells]
_TERMS: tuple[_Term, ...] = (
    (
        "Method",
        "",
        "",
        7,
        "The member's rating method: LRFR (MBE Section 6A), LFR or ASR (Section 6B).",
        lambda r, v, k: np.full(np.shape(k), RATING_METHODS[int(r.method[0])]),
    ),
    (
        "Limit state",
        "",
        "",
        11,
        "The limit state of the check, as the MBE names it: Strength I for design and legal "
        "loads, Strength II for permits (MBE Table 6A.4.2.2-1); Load factor or Allowable "
        "stress for LFR and ASR members; Service II (steel), Service III (prestressed "
        "concrete) or Service I (reinforced concrete) on a service check, whose terms are "
        "stresses at the checked fibre.",
        lambda r, v, k: _words(LIMIT_STATES, r.limit_state(v, k)),
    ),
    (
        "phi Rn",
        "",
        FORMAT_VALUE,
        10,
        "The capacity typed on the Capacities row (moment or shear): the factored resistance "
        "phi*Rn (LRFR), the capacity (LFR), the inventory allowable (ASR); blank on a service "
        "check.",
        lambda r, v, k: r.k_resistance[k],
    ),
    (
        "phi c",
        "",
        FORMAT_FACTOR,
        7,
        "The member's condition factor phi_c (MBE Table 6A.4.2.3-1).",
        lambda r, v, k: r.k_phi_c[k],
    ),
    (
        "phi s",
        "",
        FORMAT_FACTOR,
        7,
        "The system factor phi_s as used: the member's for moment, 1 for shear (MBE 6A.4.2.4).",
        lambda r, v, k: r.k_phi_s[k],
    ),
    (
        "phi c phi s",
        "",
        FORMAT_FACTOR,
        9,
        "phi_c * phi_s as used: not below 0.85 for moment (MBE Eq. 6A.4.2.1-3).",
        lambda r, v, k: r.k_phi[k],
    ),
    (
        "Floor applied",
        "",
        "",
        8,
        "yes where phi_c * phi_s was below 0.85 and 0.85 was used.",
        lambda r, v, k: np.where(r.k_floored[k], "yes", ""),
    ),
    (
        "C",
        "",
        FORMAT_VALUE,
        10,
        "Capacity C = (phi c phi s) * (phi Rn); on a service check the allowable stress fR "
        "(see fR from).",
        lambda r, v, k: r.k_capacity[k],
    ),
    (
        "C operating",
        "",
        FORMAT_VALUE,
        10,
        "The operating level's capacity: the ASR operating allowable; C itself for LRFR and LFR.",
        lambda r, v, k: r.k_capacity_operating[k],
    ),
    (
        "C used",
        "",
        "",
        12,
        "Which capacity RF uses: C, or C operating (legal loads and permits of an LFR or ASR "
        "member, rated at the operating level).",
        lambda r, v, k: np.where(
            r.k_limit_state[k] >= 0, "C = fR", np.where(r.v_operating[v], "C operating", "C")
        ),
    ),
    (
        "DC",
        "",
        FORMAT_VALUE,
        10,
        "Component dead-load effect in the rated sense (positive where it adds to the effect); "
        "on a service check the stress fDC = s * M DC / S nc + (1 - s) * M DC / S lt, s the "
        "DC1 share.",
        lambda r, v, k: r.k_dc[k],
    ),
    (
        "gamma DC",
        "",
        FORMAT_FACTOR,
        8,
        "Load factor on DC: the DC factor, or DC factor relieving where DC is negative "
        "(LRFR); A1 (LFR 1.3, ASR 1); 1 on a service check.",
        lambda r, v, k: r.k_gamma_dc[k],
    ),
    (
        "DW",
        "",
        FORMAT_VALUE,
        10,
        "Wearing-surface dead-load effect in the rated sense; on a service check the stress "
        "fDW = M DW / S lt.",
        lambda r, v, k: r.k_dw[k],
    ),
    (
        "gamma DW",
        "",
        FORMAT_FACTOR,
        8,
        "Load factor on DW: the DW factor, or DW factor relieving where DW is negative "
        "(LRFR); A1 (LFR, ASR).",
        lambda r, v, k: r.k_gamma_dw[k],
    ),
    (
        "Dead loads from",
        "",
        "",
        14,
        "Where DC and DW came from: the Capacities row, or the member's DC and DW loads.",
        lambda r, v, k: np.where(r.k_dead_given[k], "Capacities row", "member's loads"),
    ),
    (
        "DF",
        "",
        FORMAT_FACTOR,
        7,
        "The distribution factor used (moment or shear).",
        lambda r, v, k: np.where(r.k_effect[k] < 2, r.v_df_moment[v], r.v_df_shear[v]),
    ),
    (
        "DF lanes",
        "",
        "",
        14,
        "Which DF: multi-lane, or the one-lane DF divided by the multiple presence factor 1.2 "
        "(special permits, MBE 6A.4.5.4.2).",
        lambda r, v, k: _words(DF_SOURCES, r.v_df_source[v]),
    ),
    (
        "LL axles",
        "",
        FORMAT_VALUE,
        10,
        "Axle part of the live-load effect: DF times the vehicle row's Factor times the axles' "
        "effect, without dynamic allowance.",
        lambda r, v, k: r.p_axle[v, k],
    ),
    (
        "LL lane",
        "",
        FORMAT_VALUE,
        10,
        "Lane-load part of the live-load effect (DF and Factor included; never takes IM).",
        lambda r, v, k: r.p_lane[v, k],
    ),
    (
        "IM",
        "",
        FORMAT_FACTOR,
        7,
        "Dynamic load allowance on the axles (fraction).",
        lambda r, v, k: r.p_impact[v, k],
    ),
    (
        "IM on lane",
        "",
        FORMAT_FACTOR,
        7,
        "Dynamic allowance on the lane load: 0 (LRFR: the lane load takes none), or the "
        "impact formula's where the load case's standard applies it to the lane too.",
        lambda r, v, k: r.p_impact_lane[v, k],
    ),
    (
        "IM from",
        "",
        "",
        16,
        "Where IM came from: the load case's own (the Settings', or one a library model "
        "fixes), the bridge's riding surface (legal loads) or crawl speed (permits).",
        lambda r, v, k: _words(IMPACT_SOURCES, r.v_impact_source[v]),
    ),
    (
        "LL+IM",
        "",
        FORMAT_VALUE,
        10,
        "Live-load effect rated: (1 + IM) * LL axles + (1 + IM on lane) * LL lane; on a "
        "service check the stress fLL = M LL+IM / S st (LL axles and LL lane are stresses too).",
        lambda r, v, k: r.p_live[v, k],
    ),
    (
        "gamma LL",
        "",
        FORMAT_FACTOR,
        8,
        "Live-load factor (design loads: inventory); on a service check the MBE's factor of the "
        "limit state for the load's kind (blank: the manual does not check this kind there).",
        lambda r, v, k: r.gamma(v, k),
    ),
    (
        "gamma LL from",
        "",
        "",
        30,
        "Where the live-load factor came from: the MBE table with the bridge's ADTT, the "
        "bridge's own factor, or the Settings.",
        lambda r, v, k: _words(GAMMA_SOURCES, r.gamma_source(v, k)),
    ),
    (
        "gamma LL operating",
        "",
        FORMAT_FACTOR,
        9,
        "Design loads: the operating-level live-load factor (blank at a service check with no "
        "operating level).",
        lambda r, v, k: r.gamma(v, k, operating=True),
    ),
    (
        "Load case",
        "",
        "",
        20,
        "The load case (a library model's part) that governs LL+IM.",
        lambda r, v, k: r.p_case[v, k],
    ),
    (
        "at",
        "length",
        FORMAT_VALUE,
        9,
        "Position of its front axle from the member's left end (blank: lane load alone).",
        lambda r, v, k: shown_position(r.p_position[v, k]),
    ),
    (
        "direction",
        "",
        "",
        14,
        "Its direction of travel.",
        lambda r, v, k: r.p_direction[v, k],
    ),
    (
        "spacing",
        "length",
        "",
        12,
        SPACING_MEANING,
        lambda r, v, k: r.p_spacing[v, k],
    ),
    # The service checks' own terms (blank on strength checks): see batch/rating/lrfr.py.
    (
        "fR from",
        "",
        "",
        30,
        "Service check: how the allowable stress C = fR was found: 0.95 Rh Fy (composite "
        "steel: S lt or S st given) or 0.80 Rh Fy (non-composite), AASHTO LRFD 6.10.4.2.2; "
        "0.9 fy (reinforced concrete); Allowable stress + Prestress stress (prestressed "
        "concrete); or the Allowable stress given.",
        lambda r, v, k: np.where(
            r.k_fr_rule[k] >= 0, np.array(FR_RULES, dtype=np.str_)[r.k_fr_rule[k]], ""
        ),
    ),
    (
        "Fy",
        "stress",
        FORMAT_VALUE,
        8,
        "Service check: the Fy of the Service row (steel flange or reinforcement).",
        lambda r, v, k: r.k_fy[k],
    ),
    (
        "Rh",
        "",
        FORMAT_FACTOR,
        6,
        "Service check, steel: the hybrid factor Rh used.",
        lambda r, v, k: r.k_rh[k],
    ),
    (
        "Allowable stress",
        "stress",
        FORMAT_VALUE,
        9,
        "Service check: the Allowable stress of the Service row.",
        lambda r, v, k: r.k_allowable[k],
    ),
    (
        "Prestress stress",
        "stress",
        FORMAT_VALUE,
        9,
        "Service check, prestressed concrete: the effective prestress compression at the fibre.",
        lambda r, v, k: r.k_prestress[k],
    ),
    (
        "DC1 share",
        "",
        FORMAT_FACTOR,
        7,
        "Service check: the Service row's share s of DC on the non-composite section.",
        lambda r, v, k: r.k_dc1_share[k],
    ),
    (
        "M DC",
        "moment",
        FORMAT_VALUE,
        10,
        "Service check: the component dead-load moment in the checked sense.",
        lambda r, v, k: r.k_m_dc[k],
    ),
    (
        "M DW",
        "moment",
        FORMAT_VALUE,
        10,
        "Service check: the wearing-surface moment in the checked sense.",
        lambda r, v, k: r.k_m_dw[k],
    ),
    (
        "M LL+IM",
        "moment",
        FORMAT_VALUE,
        10,
        "Service check: the live-load moment (1 + IM) * axles + lane, DF included; fLL = "
        "M LL+IM / S st.",
        lambda r, v, k: r.p_live[v, k] / r.k_per_moment[k],
    ),
    (
        "S nc",
        "section_modulus",
        FORMAT_VALUE,
        9,
        "Service check: section modulus of the non-composite section (for the DC1 share of DC).",
        lambda r, v, k: r.k_s_nc[k],
    ),
    (
        "S lt",
        "section_modulus",
        FORMAT_VALUE,
        9,
        "Service check: long-term composite section modulus used (for DC2 and DW).",
        lambda r, v, k: r.k_s_lt[k],
    ),
    (
        "S st",
        "section_modulus",
        FORMAT_VALUE,
        9,
        "Service check: short-term composite section modulus used (for LL+IM). A stress is "
        "12 M / S (kip-ft and in3 to ksi) or 1e6 M / S (kN-m and mm3 to MPa).",
        lambda r, v, k: r.k_s_st[k],
    ),
)


def _term_columns(rows: Callable[[RatedMember], tuple[Any, Any]]) -> tuple[ResultColumn[Any], ...]:
    """The columns of :data:`_TERMS` over the (vehicle, check) pairs ``rows`` gives.

    A check of -1 (a vehicle that loads none of the rated effects) gives empty cells.
    """

    def column(
        header: str, quantity: ResultQuantity, fmt: str, width: float, meaning: str, get: _Cells
    ) -> ResultColumn[Any]:
        def values(b: RatedMember) -> list[object]:
            v, k = rows(b)
            rated = k >= 0
            cells = get(b.rating, v, np.where(rated, k, 0))
            if header == "Load case":
                return [
                    b.envelope.labels[c] if c >= 0 and ok else None
                    for c, ok in zip(cells.tolist(), rated.tolist(), strict=True)
                ]
            if header == "direction":
                return [
                    direction_text(d) if ok else None
                    for d, ok in zip(cells.tolist(), rated.tolist(), strict=True)
                ]
            if header == "spacing":
                return [
                    spacing_text(g) if ok else None
                    for g, ok in zip(cells, rated.tolist(), strict=True)
                ]
            if cells.dtype.kind == "U":
                return [
                    t if t and ok else None
                    for t, ok in zip(cells.tolist(), rated.tolist(), strict=True)
                ]
            return _numbers(np.where(rated, cells, np.nan))

        return ResultColumn(
            header=header,
            quantity=quantity,
            number_format=fmt,
            width=max(width, len(header) + 3),  # a header on one line, so it prints as one row
            values=values,
            text=not fmt,
            unit_in_cells=not fmt and bool(quantity),  # (a text cell says its own unit)
            meaning=meaning,
        )

    return tuple(column(*term) for term in _TERMS)


def _unit_column(rows: Callable[[RatedMember], tuple[Any, Any]]) -> ResultColumn[Any]:
    """The unit of the row's effect values (phi Rn, C, DC, DW, LL): moment or force."""

    def values(b: RatedMember) -> list[object]:
        units = b.case.settings.unit_labels

        def unit(k: int) -> str:
            if b.rating.k_limit_state[k] >= 0:
                return units["stress"]
            return units["moment"] if b.rating.k_effect[k] < 2 else units["force"]

        return [unit(k) if k >= 0 else None for _, k in zip(*rows(b), strict=True)]

    return ResultColumn(
        header="Unit",
        width=7,
        values=values,
        text=True,
        meaning="Unit of the row's effects (phi Rn, C, DC, DW, LL axles, LL lane, LL+IM): the "
        "moment unit for M+ and M-, the force unit for V+ and V-, the stress unit on a service "
        "check.",
    )


def _governing_rows(b: RatedMember) -> tuple[Any, Any]:
    return np.arange(len(b.case.vehicles)), b.rating.check


def _detail_rows(b: RatedMember) -> tuple[Any, Any]:
    n_v, n_k = b.rating.p_rf.shape
    return np.repeat(np.arange(n_v), n_k), np.tile(np.arange(n_k), n_v)


RATINGS: ResultTable[RatedMember] = ResultTable(
    sheet="Ratings",
    purpose="One row per rated member and vehicle: the governing rating factor, where it "
    "governs and every term of its equation (as on the Rating Detail sheet), the posting "
    "load of a legal load and the operating level of a design load.",
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
            values=lambda b: _numbers(b.rating.rf),
            fill=_rf_fill,
            meaning="Governing rating factor: the smallest over the member's rated stations and "
            "effects (inventory level for design loads); blank: the vehicle loads none of them. "
            "Colour: " + "; ".join(words for _, _, words in RF_BANDS) + ".",
        ),
        ResultColumn(
            header="Effect",
            width=7,
            values=lambda b: [
                RATED_EFFECTS[e][0] if e >= 0 else None for e in b.rating.effect.tolist()
            ],
            text=True,
            meaning="The rated effect that governs: M+ (sagging), M- (hogging), V+ or V- (shear "
            "in either sense).",
        ),
        ResultColumn(
            header="Span",
            number_format=FORMAT_WHOLE,
            width=6,
            values=_place(lambda e: e.station_span),
            meaning="Span of the governing station, from 1 at the left end.",
        ),
        ResultColumn(
            header="Station",
            number_format=FORMAT_FRACTION,
            width=8,
            values=_place(lambda e: e.station_fraction),
            meaning="Fraction of the span of the governing station.",
        ),
        ResultColumn(
            header="x",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=9,
            values=_place(lambda e: e.station_x),
            meaning="Distance of the governing station from the member's left end.",
        ),
        ResultColumn(
            header="Posting load",
            quantity="weight",
            number_format=FORMAT_VALUE,
            width=12,
            values=lambda b: _numbers(b.rating.posting),
            meaning="Legal loads with 0.3 <= RF < 1: the posting load (W/0.7)(RF - 0.3), "
            "MBE 6A.8.3.",
        ),
        ResultColumn(
            header="RF operating",
            number_format=FORMAT_RATIO,
            width=10,
            values=lambda b: _numbers(b.rating.rf_operating),
            fill=_rf_fill,
            meaning="Design loads: the operating-level rating factor at the same place.",
        ),
        ResultColumn(
            header="Flag",
            width=44,
            values=lambda b: [FLAGS[f] or None for f in b.rating.flag.tolist()],
            text=True,
            meaning="A note on a rating below 1, or on a vehicle that loads no rated effect.",
        ),
        # (every term of the governing check follows: see RATINGS_SUMMARY)
        _unit_column(_governing_rows),
        *_term_columns(_governing_rows),
    ),
)


def _adtt(b: RatedMember) -> float | None:
    bridge = _bridge_of(b.case, b.member.bridge or "")
    return None if bridge is None else bridge.adtt


#: The Ratings sheet's own columns, before the terms of the governing check (a summary a
#: printed report can show).
RATINGS_SUMMARY: tuple[str, ...] = tuple(
    c.header for c in RATINGS.columns[: [c.header for c in RATINGS.columns].index("Unit")]
)


def _detail_place(get: Callable[[MemberEnvelope, int], object]) -> Callable[[Any], list[object]]:
    def values(b: RatedMember) -> list[object]:
        _, k = _detail_rows(b)
        return [get(b.envelope, int(b.rating.k_station[j])) for j in k]

    return values


RATING_DETAIL: ResultTable[RatedMember] = ResultTable(
    sheet="Rating Detail",
    purpose="One row per rated member, vehicle and check (a rated station and effect, in its "
    "sense): every term of the rating equation, so that each RF can be recomputed from its "
    "row alone: RF = (C used - gamma DC * DC - gamma DW * DW) / (gamma LL * (LL+IM)), with "
    "C = (phi c phi s) * (phi Rn) and LL+IM = (1 + IM) * LL axles + (1 + IM on lane) * LL lane; "
    "on a service check (Limit state Service I, II or III) the same in stresses at the "
    "checked fibre, C = fR, DC = s * M DC / S nc + (1 - s) * M DC / S lt, DW = M DW / S lt, "
    "LL+IM = M LL+IM / S st.",
    blocks=_rated,
    rows=lambda result: result.rated.checks,
    wanted=lambda result: _n_rated(result) > 0,
    overflow="store",
    frozen_columns=2,
    columns=_one_line(
        (
            ResultColumn(
                header="Member",
                width=16,
                values=lambda b: [b.member.id] * b.rating.p_rf.size,
                text=True,
                meaning="Member id.",
            ),
            ResultColumn(
                header="Vehicle",
                width=18,
                values=lambda b: [b.case.vehicles[int(v)].id for v in _detail_rows(b)[0]],
                text=True,
                meaning="Vehicle id, as on the Vehicles sheet.",
            ),
            ResultColumn(
                header="Bridge",
                width=12,
                values=lambda b: [b.member.bridge] * b.rating.p_rf.size,
                text=True,
                meaning="The member's bridge (blank: none, the Settings' factors).",
            ),
            ResultColumn(
                header="ADTT",
                number_format=FORMAT_WHOLE,
                width=7,
                values=lambda b: [_adtt(b)] * b.rating.p_rf.size,
                meaning="The bridge's ADTT (trucks a day, one direction), which the MBE tables of "
                "legal and permit live-load factors are read at; blank: not known or no bridge.",
            ),
            ResultColumn(
                header="Category",
                width=9,
                values=lambda b: [b.case.vehicles[int(v)].category for v in _detail_rows(b)[0]],
                text=True,
                meaning="The vehicle's category: design, legal or permit.",
            ),
            ResultColumn(
                header="Permit type",
                width=18,
                values=lambda b: [b.case.vehicles[int(v)].permit_type for v in _detail_rows(b)[0]],
                text=True,
                meaning="The permit's kind of crossing (MBE Table 6A.4.5.4.2a-1); blank: none "
                "given.",
            ),
            ResultColumn(
                header="Span",
                number_format=FORMAT_WHOLE,
                width=6,
                values=_detail_place(lambda e, i: int(e.station_span[i])),
                meaning="Span of the rated station, from 1 at the left end.",
            ),
            ResultColumn(
                header="Station",
                number_format=FORMAT_FRACTION,
                width=8,
                values=_detail_place(lambda e, i: float(e.station_fraction[i])),
                meaning="Fraction of the span of the rated station.",
            ),
            ResultColumn(
                header="x",
                quantity="length",
                number_format=FORMAT_VALUE,
                width=9,
                values=_detail_place(lambda e, i: float(e.station_x[i])),
                meaning="Distance of the rated station from the member's left end.",
            ),
            ResultColumn(
                header="Effect",
                width=7,
                values=lambda b: [
                    RATED_EFFECTS[int(b.rating.k_effect[k])][0] for k in _detail_rows(b)[1]
                ],
                text=True,
                meaning="The rated effect and sense: M+, M-, V+ or V-.",
            ),
            ResultColumn(
                header="RF",
                number_format=FORMAT_RATIO,
                width=8,
                values=lambda b: _numbers(b.rating.p_rf.ravel()),
                fill=_rf_fill,
                meaning="Rating factor of this check (design loads: inventory); blank: the vehicle "
                "gives no effect of this sense here.",
            ),
            ResultColumn(
                header="RF operating",
                number_format=FORMAT_RATIO,
                width=10,
                values=lambda b: _numbers(b.rating.p_rf_operating.ravel()),
                fill=_rf_fill,
                meaning="Design loads: the operating-level RF, with gamma LL operating.",
            ),
            ResultColumn(
                header="Governs",
                width=8,
                values=lambda b: [
                    "yes" if int(b.rating.check[v]) == k else None
                    for v, k in zip(*_detail_rows(b), strict=True)
                ],
                text=True,
                meaning="yes on the check that governs the member's rating for the vehicle (as on "
                "the Ratings sheet).",
            ),
            _unit_column(_detail_rows),
            *_term_columns(_detail_rows),
        )
    ),
)


def _dead(result: RunResult) -> Iterator[DeadMember]:
    for env, a in zip(result.envelopes, result.assessments, strict=True):
        if a.dead is not None:
            yield DeadMember(envelope=env, dead=a.dead)


def _dead_wanted(result: RunResult) -> bool:
    return bool(result.assessments) and result.assessments[0].dead is not None


def _dead_column(
    header: str, quantity: ResultQuantity, rows: str, part: str, meaning: str
) -> ResultColumn[Any]:
    def values(b: DeadMember) -> list[object]:
        n_st, n_su = b.envelope.station_x.size, b.envelope.support_x.size
        array = getattr(b.dead, part)
        if rows == "moment":
            cells = [*_numbers(array[:n_st]), *[None] * n_su]
        elif rows == "shear":
            cells = [*_numbers(array[n_st : 2 * n_st]), *[None] * n_su]
        else:
            cells = [*[None] * n_st, *_numbers(array[2 * n_st :])]
        return cells

    return ResultColumn(
        header=header,
        quantity=quantity,
        number_format=FORMAT_VALUE,
        width=10,
        values=values,
        meaning=meaning,
    )


def _station_or_support(get_station: Any, get_support: Any) -> Callable[[DeadMember], list[object]]:
    def values(b: DeadMember) -> list[object]:
        env = b.envelope
        return [
            *(get_station(env, i) for i in range(env.station_x.size)),
            *(get_support(env, i) for i in range(env.support_x.size)),
        ]

    return values


DEAD_LOADS: ResultTable[DeadMember] = ResultTable(
    sheet="Dead Loads",
    purpose="One row per member and station, then per support: the dead-load effects of the "
    "member's uniform DC and DW loads, on the same model as the live load (spans, EI, hinges).",
    blocks=_dead,
    rows=lambda result: result.n_stations + result.n_supports if _dead_wanted(result) else 0,
    wanted=_dead_wanted,
    frozen_columns=2,
    columns=_one_line(
        (
            ResultColumn(
                header="Member",
                width=16,
                values=lambda b: (
                    [b.envelope.member] * (b.envelope.station_x.size + b.envelope.support_x.size)
                ),
                text=True,
                meaning="Member id.",
            ),
            ResultColumn(
                header="Span",
                number_format=FORMAT_WHOLE,
                width=6,
                values=_station_or_support(lambda e, i: int(e.station_span[i]), lambda e, i: None),
                meaning="Span of the station (station rows).",
            ),
            ResultColumn(
                header="Station",
                number_format=FORMAT_FRACTION,
                width=8,
                values=_station_or_support(
                    lambda e, i: float(e.station_fraction[i]), lambda e, i: None
                ),
                meaning="Fraction of the span (station rows).",
            ),
            ResultColumn(
                header="Support",
                number_format=FORMAT_WHOLE,
                width=8,
                values=_station_or_support(lambda e, i: None, lambda e, i: i + 1),
                meaning="Support number, 1 = the left end (support rows).",
            ),
            ResultColumn(
                header="x",
                quantity="length",
                number_format=FORMAT_VALUE,
                width=9,
                values=_station_or_support(
                    lambda e, i: float(e.station_x[i]), lambda e, i: float(e.support_x[i])
                ),
                meaning="Distance from the member's left end.",
            ),
            _dead_column("DC M", "moment", "moment", "dc", "Moment of DC, sagging positive."),
            _dead_column("DW M", "moment", "moment", "dw", "Moment of DW, sagging positive."),
            _dead_column(
                "DC V",
                "force",
                "shear",
                "dc",
                "Shear of DC (sum of upward forces left of the section).",
            ),
            _dead_column("DW V", "force", "shear", "dw", "Shear of DW."),
            _dead_column("DC R", "force", "reaction", "dc", "Reaction of DC, upward positive."),
            _dead_column("DW R", "force", "reaction", "dw", "Reaction of DW, upward positive."),
        )
    ),
)


def _posting_columns(case: Case) -> tuple[ResultColumn[Any], ...]:
    """Five columns per legal vehicle: RF, member, posting load, posted value, note."""

    def one(j: int, vid: str) -> tuple[ResultColumn[Any], ...]:
        return (
            ResultColumn(
                header=f"{vid} RF",
                number_format=FORMAT_RATIO,
                width=9,
                values=lambda b: [_finite_or_blank(b.rf[j])],
                fill=_rf_fill,
                meaning="Per legal vehicle, five columns: its smallest RF over the bridge's rated "
                "members (RF); the member that governs (member); the posting load there, "
                "(W/0.7)(RF - 0.3) for 0.3 <= RF < 1, MBE 6A.8.3 (posting); the same rounded "
                "down by the Settings' Posting rounded down to (posted); a note: the MBE's "
                "closure recommendation below RF 0.3 and the exemptions federal guidance "
                "allows, with their sources (note).",
            ),
            ResultColumn(
                header=f"{vid} member",
                width=14,
                values=lambda b: [b.member[j]],
                text=True,
                meaning="The member that governs.",
            ),
            ResultColumn(
                header=f"{vid} posting",
                quantity="weight",
                number_format=FORMAT_VALUE,
                width=10,
                values=lambda b: [_finite_or_blank(b.posting[j])],
                meaning="The posting load.",
            ),
            ResultColumn(
                header=f"{vid} posted",
                quantity="weight",
                number_format=FORMAT_VALUE,
                width=10,
                values=lambda b: [_finite_or_blank(b.rounded[j])],
                meaning="The posting load rounded down by the owner's rule.",
            ),
            ResultColumn(
                header=f"{vid} note",
                width=40,
                values=lambda b: [b.note[j] or None],
                text=True,
                meaning="Closure recommendation and exemptions, with sources.",
            ),
        )

    legal = [v.id for v in case.vehicles if v.category == "legal"]
    return _one_line(tuple(col for j, vid in enumerate(legal) for col in one(j, vid)))


def _bridge_of(case: Case, ident: str) -> Bridge | None:
    return next((b for b in case.bridges if b.id == ident), None)


POSTINGS: ResultTable[BridgePosting] = ResultTable(
    sheet="Postings",
    purpose="One row per bridge (rated members with no bridge share a row): for every legal "
    "vehicle, its smallest rating factor over the bridge's rated members, the member that "
    "governs, the posting load (MBE 6A.8.3) and its value rounded by the owner's rule, and "
    "notes.",
    blocks=lambda result: result.rated.postings,
    rows=lambda result: len(result.rated.postings),
    wanted=lambda result: bool(result.rated.postings),
    overflow="store",
    columns=_one_line(
        (
            ResultColumn(
                header="Bridge",
                width=14,
                values=lambda b: [b.bridge or "(no bridge)"],
                text=True,
                meaning="Bridge id; (no bridge) for the rated members that name none.",
            ),
            ResultColumn(
                header="Rated members",
                number_format=FORMAT_WHOLE,
                width=8,
                values=lambda b: [b.members],
                meaning="How many of the bridge's members are rated (have Capacities rows).",
            ),
        )
    ),
    per_vehicle=_posting_columns,
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


# ---------------------------------------------------------------- members as built: deflection

#: Deflections in in or mm: three decimals.
FORMAT_DEFLECTION = "0.000"
#: Fill of a span whose deflection exceeds its limit (the muted red of a failing RF).
DEFLECTION_EXCEEDED_RGB = RF_BANDS[0][1]


class DeflectedMember(NamedTuple):
    """One member's block of the Deflection sheets: its stations and its deflections."""

    envelope: MemberEnvelope
    deflection: MemberDeflection


def _deflected(result: RunResult) -> list[DeflectedMember]:
    return [
        DeflectedMember(envelope=env, deflection=built.deflection)
        for env, built in zip(result.envelopes, result.asbuilt, strict=True)
        if built.deflection is not None
    ]


def _asks_deflection(result: RunResult) -> bool:
    return any(m.analysis is not None and m.analysis.ei_scale for m in result.case.members)


def _deflection_rows(result: RunResult) -> int:
    """One row per station of every deflected member."""
    return sum(b.deflection.down.value.size for b in result.asbuilt if b.deflection is not None)


def _deflection_sense(sense: str, name: str) -> tuple[ResultColumn[DeflectedMember], ...]:
    """The value, load, at, direction and spacing columns of the downward or upward deflection."""

    def get(f: Callable[[DeflectedMember, Governing, int], object]) -> Callable[..., list]:
        def values(b: DeflectedMember) -> list[object]:
            ext = getattr(b.deflection, sense)
            return [f(b, ext, i) for i in range(ext.value.size)]

        return values

    def label(b: DeflectedMember, ext: Governing, i: int) -> str | None:
        case = int(ext.case[i])
        return b.deflection.labels[case] if case >= 0 else None

    return (
        ResultColumn(
            header=name,
            quantity="deflection",
            number_format=FORMAT_DEFLECTION,
            width=12,
            values=get(lambda _b, ext, i: float(ext.value[i])),
            meaning=f"Largest {sense}ward live-load deflection at the station (downward "
            "positive), with the dynamic load allowance and DF deflection.",
        ),
        ResultColumn(
            header=f"{name} load",
            width=26,
            values=get(label),
            text=True,
            meaning="The part of the deflection loading that governs.",
        ),
        ResultColumn(
            header=f"{name} at",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=10,
            values=get(lambda _b, ext, i: _position(ext, i)),
            meaning="Position of the governing truck's front axle from the member's left end.",
        ),
        ResultColumn(
            header=f"{name} direction",
            width=14,
            values=get(lambda _b, ext, i: _direction(ext, i)),
            text=True,
            meaning="Direction of travel of the governing truck.",
        ),
        ResultColumn(
            header=f"{name} spacing",
            quantity="length",
            width=14,
            values=get(lambda _b, ext, i: _spacing(ext, i)),
            text=True,
            unit_in_cells=True,
            meaning=SPACING_MEANING,
        ),
    )


def _per_station(get: Callable[[MemberEnvelope, int], object]) -> Callable[..., list]:
    return lambda b: [get(b.envelope, i) for i in range(b.envelope.station_x.size)]


DEFLECTIONS: ResultTable[DeflectedMember] = ResultTable(
    sheet="Deflections",
    purpose="One row per member and station, for the members whose Analysis row gives an EI "
    "scale: the live-load deflection envelope under the LRFD deflection loading (the design "
    "truck alone, or 25 % of it with the lane load, AASHTO LRFD 3.6.1.3.2), downward "
    "positive.",
    blocks=_deflected,
    rows=_deflection_rows,
    wanted=_asks_deflection,
    frozen_columns=4,
    columns=(
        ResultColumn(
            header="Member",
            width=16,
            values=_per_station(lambda env, _i: env.member),
            text=True,
            meaning="Member id.",
        ),
        ResultColumn(
            header="Span",
            number_format=FORMAT_WHOLE,
            width=6,
            values=_per_station(lambda env, i: int(env.station_span[i])),
            meaning="Span number, from 1 at the left end.",
        ),
        ResultColumn(
            header="Station",
            number_format=FORMAT_FRACTION,
            width=8,
            values=_per_station(lambda env, i: float(env.station_fraction[i])),
            meaning="Fraction of the span's length.",
        ),
        ResultColumn(
            header="x",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=9,
            values=_per_station(lambda env, i: float(env.station_x[i])),
            meaning="Distance from the member's left end.",
        ),
        *_deflection_sense("down", "Deflection down"),
        *_deflection_sense("up", "Deflection up"),
    ),
)


def _per_span(get: Callable[[DeflectedMember, int], object]) -> Callable[..., list]:
    return lambda b: [get(b, k) for k in range(b.deflection.span_length.size)]


def _ratio(b: DeflectedMember, k: int) -> float | None:
    ratio = float(b.deflection.span_ratio[k])
    return ratio if np.isfinite(ratio) else None


def _check(b: DeflectedMember, k: int) -> str:
    d = b.deflection
    if bool(d.passes[k]):
        return f"OK (L/{d.limit:g})"
    return f"exceeds L/{d.limit:g}"


DEFLECTION_CHECK: ResultTable[DeflectedMember] = ResultTable(
    sheet="Deflection Check",
    purpose="One row per member and span, for the members whose Analysis row gives an EI "
    "scale: the largest downward live-load deflection at the span's stations, the ratio span "
    "/ deflection and the member's limit (AASHTO LRFD 2.5.2.6.2; 800 unless the Analysis row "
    "gives another). Between stations the deflection may be a little larger: use more "
    "stations per span for a closer value.",
    blocks=_deflected,
    rows=lambda result: sum(
        b.deflection.span_length.size for b in result.asbuilt if b.deflection is not None
    ),
    wanted=_asks_deflection,
    frozen_columns=2,
    columns=(
        ResultColumn(
            header="Member",
            width=16,
            values=_per_span(lambda b, _k: b.envelope.member),
            text=True,
            meaning="Member id.",
        ),
        ResultColumn(
            header="Span",
            number_format=FORMAT_WHOLE,
            width=6,
            values=_per_span(lambda _b, k: k + 1),
            meaning="Span number, from 1 at the left end.",
        ),
        ResultColumn(
            header="Span length",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=12,
            values=_per_span(lambda b, k: float(b.deflection.span_length[k])),
            meaning="Length of the span.",
        ),
        ResultColumn(
            header="Deflection",
            quantity="deflection",
            number_format=FORMAT_DEFLECTION,
            width=12,
            values=_per_span(lambda b, k: float(b.deflection.span_deflection[k])),
            meaning="Largest downward live-load deflection at the span's stations.",
        ),
        ResultColumn(
            header="Span/deflection",
            number_format=FORMAT_WHOLE,
            width=15,
            values=_per_span(_ratio),
            meaning="Span length over that deflection (empty where the span does not deflect "
            "down).",
        ),
        ResultColumn(
            header="Limit",
            number_format=FORMAT_WHOLE,
            width=8,
            values=_per_span(lambda b, _k: float(b.deflection.limit)),
            meaning="The least span/deflection accepted (Analysis sheet; 800 when blank).",
        ),
        ResultColumn(
            header="Check",
            width=16,
            values=_per_span(_check),
            fill=lambda v: DEFLECTION_EXCEEDED_RGB if str(v).startswith("exceeds") else None,
            text=True,
            meaning="OK when span/deflection is at least the limit.",
        ),
        ResultColumn(
            header="DF",
            number_format=FORMAT_RATIO,
            width=7,
            values=_per_span(lambda b, _k: float(b.deflection.df)),
            meaning="Distribution factor of the deflection loading.",
        ),
        ResultColumn(
            header="DF from",
            width=16,
            values=_per_span(lambda b, _k: DEFLECTION_DF_SOURCES[b.deflection.df_source]),
            text=True,
            meaning="Where that factor comes from: DF deflection (Analysis sheet), the girder "
            "layout, or DF moment (AASHTO LRFD 2.5.2.6.2 asks for all lanes loaded, shared "
            "equally by the girders: check it).",
        ),
    ),
)


# ---------------------------------------------------------------- distribution factors from
# the girder layout

_SI_FT = 0.3048  # m in one ft, for showing L in the run's unit (exact)


class LayoutMember(NamedTuple):
    """One member's block of the Distribution Factors sheet: its layout and every factor."""

    member: Member
    layout: GirderLayout
    factors: MemberFactors
    units: str


def _layout_blocks(result: RunResult) -> list[LayoutMember]:
    units = result.case.settings.units
    return [
        LayoutMember(m, m.layout, layout_factors(m.layout, m.spans, units), units)
        for m in result.case.members
        if m.layout is not None
    ]


def _n_layout(result: RunResult) -> int:
    # Per member: a positive moment and a shear per span and a negative moment per interior
    # support, each for one lane and for two or more.
    return sum(2 * (3 * len(m.spans) - 1) for m in result.case.members if m.layout is not None)


def _each_factor(get: Callable[[LayoutMember, Factor], object]) -> Callable[[Any], list[object]]:
    return lambda b: [get(b, f) for f in b.factors.factors]


def _inputs(b: LayoutMember, _f: Factor) -> str:
    g = layout_girder(b.layout, "SI" if b.units == "SI" else "US")
    parts = [
        f"type {g.cross_section}, {g.position}",
        f"Nb = {g.girders}",
        f"S = {number(g.spacing)} ft",
        f"ts = {number(g.deck)} in",
        f"Kg = {number(g.stiffness)} in4",
    ]
    if g.overhang is not None:
        parts.append(f"de = {number(g.overhang)} ft")
    parts.append(f"skew = {number(g.skew)} deg")
    converted = "; SI inputs converted exactly (1 ft = 0.3048 m, 1 in = 25.4 mm)"
    return ", ".join(parts) + (converted if b.units == "SI" else "")


def _uses(b: LayoutMember, f: Factor) -> str:
    """Which of the member's factors this one is, and whether a typed one prevails."""
    kind = "moment" if f.is_moment else "shear"
    out = []
    for single, suffix in ((False, ""), (True, " single lane")):
        if f is not b.factors.largest(f.is_moment, single):
            continue
        used = getattr(b.member, f"df_{kind}{'_single' if single else ''}")
        if used == f.value:
            out.append(f"DF {kind}{suffix}")
        else:
            out.append(f"DF {kind}{suffix}: {used:.3f} typed on Members prevails")
    return "; ".join(out)


DISTRIBUTION_FACTORS: ResultTable[LayoutMember] = ResultTable(
    sheet="Distribution Factors",
    purpose="One row per member with a Girder Layout row, per effect (positive moment in each "
    "span, negative moment over each interior support, shear in each span) and per number of "
    "loaded lanes: the live-load distribution factor by AASHTO LRFD 4.6.2.2, in design lanes "
    "per girder, as tabulated (multiple presence included), the article or table it comes "
    "from and whether its inputs are within the formula's range of applicability. The member "
    "takes the largest moment and the largest shear factor (and the largest one-lane ones for "
    "fatigue and special permits) unless its Members row gives them. The formulas are in US "
    "customary units; SI inputs are converted exactly. docs/distribution.md lists them.",
    blocks=_layout_blocks,
    rows=_n_layout,
    wanted=lambda result: _n_layout(result) > 0,
    frozen_columns=1,
    columns=(
        ResultColumn(
            header="Member",
            width=16,
            values=_each_factor(lambda b, _f: b.member.id),
            text=True,
            meaning="Member id.",
        ),
        ResultColumn(
            header="Effect",
            width=16,
            values=_each_factor(lambda _b, f: f.effect),
            text=True,
            meaning="Positive moment, negative moment (near an interior support) or shear.",
        ),
        ResultColumn(
            header="Where",
            width=10,
            values=_each_factor(lambda _b, f: f.where),
            text=True,
            meaning="Span or interior support, counted from 1 at the member's left end.",
        ),
        ResultColumn(
            header="Lanes",
            width=11,
            values=_each_factor(lambda _b, f: "one" if f.lanes == 1 else "two or more"),
            text=True,
            meaning="Loaded design lanes: one, or two or more.",
        ),
        ResultColumn(
            header="L",
            quantity="length",
            number_format=FORMAT_VALUE,
            width=9,
            values=_each_factor(lambda b, f: f.length * (_SI_FT if b.units == "SI" else 1.0)),
            meaning="Span length in the formulas: the span; for negative moment the average of "
            "the two adjacent spans (LRFD C4.6.2.2.1).",
        ),
        ResultColumn(
            header="Factor before skew",
            number_format=FORMAT_FACTOR,
            width=10,
            values=_each_factor(lambda _b, f: f.base),
            meaning="The factor before the skew correction, lanes per girder.",
        ),
        ResultColumn(
            header="Skew factor",
            number_format=FORMAT_FACTOR,
            width=9,
            values=_each_factor(lambda _b, f: f.skew),
            meaning="Skew correction: moment 1 - c1 (tan theta)^1.5 (Table 4.6.2.2.2e-1), shear "
            "1 + 0.20 (12 L ts^3 / Kg)^0.3 tan theta (Table 4.6.2.2.3c-1), applied along the "
            "whole member; 1 where none.",
        ),
        ResultColumn(
            header="Factor",
            number_format=FORMAT_FACTOR,
            width=9,
            values=_each_factor(lambda _b, f: f.value),
            meaning="The distribution factor, lanes per girder, multiple presence included.",
        ),
        ResultColumn(
            header="Method",
            width=34,
            values=_each_factor(lambda _b, f: f.method),
            text=True,
            wrap=True,
            meaning="Formula, e x interior factor, lever rule (one lane times m = 1.2), or the "
            "lesser of formula and lever rule for three girders.",
        ),
        ResultColumn(
            header="Source",
            width=30,
            values=_each_factor(lambda _b, f: f.source),
            text=True,
            wrap=True,
            meaning="The article or table of the AASHTO LRFD Bridge Design Specifications.",
        ),
        ResultColumn(
            header="Range",
            width=40,
            values=_each_factor(
                lambda _b, f: "within" if not f.notes else "; ".join(n.text for n in f.notes)
            ),
            fill=lambda v: None if v == "within" else DEFLECTION_EXCEEDED_RGB,
            text=True,
            wrap=True,
            meaning="within: every input in the formula's range of applicability; else each "
            "limit it is outside: the specification then calls for a refined analysis (Art. "
            "4.6.3), and the factor shown is still the formula's.",
        ),
        ResultColumn(
            header="Run uses",
            width=26,
            values=_each_factor(_uses),
            text=True,
            wrap=True,
            meaning="The member's factor this row gives (the largest of its kind), or the value "
            "typed on Members that prevails over it; blank: not the largest.",
        ),
        ResultColumn(
            header="Inputs",
            width=40,
            values=_each_factor(_inputs),
            text=True,
            wrap=True,
            meaning="The layout as the formulas take it, in US customary units.",
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
    CONCURRENT,
    IMPACT,
    FATIGUE,
    DEFLECTIONS,
    DEFLECTION_CHECK,
    DISTRIBUTION_FACTORS,
    VEHICLE_SUMMARY,
    RATINGS,
    RATING_MATRIX,
    RATING_DETAIL,
    POSTINGS,
    DEAD_LOADS,
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
