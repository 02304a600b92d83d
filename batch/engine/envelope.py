"""Live-load envelopes of one member under a list of load cases.

A *load case* is what the engine moves across the member: an axle train (with
fixed or ranged spacings), an optional uniform lane load, a dynamic load
allowance on the axles and a multiplier. A workbook vehicle is one load case; a
library load model may expand to several (its parts), each with its own label.

For every effect (moment and shear at every station, every reaction) the
envelope keeps the largest and smallest value over all load cases, positions,
directions and spacings, and which case, front-axle position and direction
give it. Values are

    factor * DF * ((1 + IM) * axle_effect + lane_load * adverse_area)

with DF the member's moment distribution factor for moments and its shear
factor for shears and reactions. A case with an impact formula (the Standard
Specifications' impact) instead takes (1 + I) on axles and lane load alike, I
computed for each effect from its loaded length (:mod:`batch.engine.impact`).
Sign conventions are those of :mod:`batch.engine.influence`.
"""

from __future__ import annotations

import functools
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import NDArray

from batch.engine.effects import EFFECTS, TIE_REL_TOL, Governing, ImpactRows, MemberEnvelope
from batch.engine.impact import impact_fraction, loaded_lengths
from batch.engine.influence import InfluenceLines, SpanExtremes, influence_lines
from batch.engine.moving import (
    LEFT_TO_RIGHT,
    RIGHT_TO_LEFT,
    FleetExtremes,
    fleet_extremes_of,
    ranged_width,
)
from batch.loads.cases import LoadCase
from batch.loads.factors import SINGLE_LANE_PRESENCE
from batch.model import Member
from batch.model.layout import POSITION_TOL, Section

__all__ = [
    "CaseEffects",
    "case_effects",
    "envelope_of",
    "governing",
    "member_envelope",
    "member_influence",
]

#: An extreme smaller than this fraction of the case's natural size is round-off, not an effect.
ZERO_TOL = 1e-10
#: The two one-sided limits of a train's effect (an axle on a break of the line) closer than
#: this fraction of the effect's natural size are one value: the line does not jump there.
SIDE_REL_TOL = 1e-9

DIRECTION_CODES: dict[str, tuple[int, ...]] = {
    "both": (LEFT_TO_RIGHT, RIGHT_TO_LEFT),
    "left-to-right": (LEFT_TO_RIGHT,),
    "right-to-left": (RIGHT_TO_LEFT,),
}


def member_influence(
    member: Member, stations_per_span: int, sections: Sequence[Section] = ()
) -> InfluenceLines:
    """Influence lines of a model member (see :func:`influence_lines`).

    ``stations_per_span`` is the run's setting (the member's own value wins);
    ``sections`` are stations to add off that grid, (span from 1, x).
    """
    return influence_lines(
        member.spans,
        member.stiffness,
        member.hinges,
        member.stations_per_span or stations_per_span,
        pieces=member.stiffness_pieces,
        sections=sections,
    )


def _scoped(il: InfluenceLines, scope: str) -> NDArray[np.bool_]:
    """Which effects (rows) a case of this scope may govern, as (n_effects, 2) for max/min."""
    applies = np.zeros((il.n_effects, 2), dtype=bool)
    if scope == "all":
        applies[:] = True
    elif scope == "moments":
        applies[il.moment_rows] = True
    elif scope == "shears-reactions":
        applies[il.shear_rows.start :] = True
    elif scope == "hogging":
        applies[il.moment_rows, 1] = True
    elif scope == "hogging-interior-reactions":
        applies[il.moment_rows, 1] = True
        applies[il.reaction_rows.start + 1 : il.reaction_rows.stop - 1, :] = True
    elif scope == "interior-hogging":
        applies[il.moment_rows, 1] = il.hogging_stations()
        interior = np.arange(il.reaction_rows.start + 1, il.reaction_rows.stop - 1)
        applies[interior, :] = True
    else:
        raise ValueError(f"unknown load-case scope {scope!r}")
    return applies


@dataclass(frozen=True, kw_only=True)
class CaseEffects(FleetExtremes):
    """Factored extremes of every load case on every effect of one member.

    Arrays of shape (n_cases, n_effects), effects laid out as in
    :class:`~batch.engine.influence.InfluenceLines` (moments at stations, shears
    at stations, reactions). ``max_value`` is the largest value of the case
    (>= 0) and ``min_value`` the smallest (<= 0), both including the case's
    factor, the member's distribution factor, the dynamic allowance on axles and
    the lane load on the adverse parts; 0 where the case gives no effect of that
    sign or its scope excludes the effect. ``*_position`` is the governing front
    axle's x (NaN when only a lane load acts; for a load placed again in another
    span, the load in the worst span), ``*_direction`` +1/-1 (0 none, or placed).
    ``*_spacing`` (n_cases, n_effects, W) is the spacing used for each ranged
    gap of the governing train, front to rear (W the most ranged gaps of any
    case; NaN past a case's own, for a train of fixed spacings and where
    ``*_position`` is NaN).

    ``max_impact`` and ``min_impact`` (n_cases, n_effects) are the impact
    allowance (fraction) each value includes: the case's fixed dynamic load
    allowance on its axles, or, for a case with an impact formula, the formula at
    the effect's loaded length, on its axles and its lane load alike (so that such
    a value is (1 + I) times the static one). ``max_loaded_length`` and
    ``min_loaded_length`` (n_effects,) are the loaded lengths of the Standard
    Specifications for every effect (:func:`batch.engine.impact.loaded_lengths`),
    member length unit, whether or not a case uses them. ``standard_impact`` is
    (for the max, for the min) the impact formula's value at those lengths,
    (n_effects,) each, for the first case with an impact formula; None when no
    case has one.

    ``*_axle`` and ``*_lane`` are the two static parts of each value, before the
    distribution factor and any allowance, the case's factor included:
    ``value = DF * ((1 + impact) * axle + (1 + lane impact) * lane)``, the lane's
    impact being the formula's for a case with an impact formula and 0 otherwise
    (all 0 where the value is 0). Rating recomputes a vehicle's effect from them
    with its own dynamic allowance and distribution factor (:mod:`batch.rating.lrfr`).

    ``cases`` are the load cases of the rows and ``distribution`` (n_cases,
    n_effects) the distribution factor each case takes on each effect.
    """

    lines: InfluenceLines
    cases: tuple[LoadCase, ...]
    distribution: NDArray[np.float64]
    max_impact: NDArray[np.float64]
    min_impact: NDArray[np.float64]
    max_loaded_length: NDArray[np.float64]
    min_loaded_length: NDArray[np.float64]
    max_axle: NDArray[np.float64]
    max_lane: NDArray[np.float64]
    min_axle: NDArray[np.float64]
    min_lane: NDArray[np.float64]
    standard_impact: tuple[NDArray[np.float64], NDArray[np.float64]] | None


def case_effects(
    member: Member,
    cases: list[LoadCase] | tuple[LoadCase, ...],
    stations_per_span: int = 10,
    directions: str = "both",
    il: InfluenceLines | None = None,
) -> CaseEffects:
    """Factored extremes of each load case on each effect of ``member``.

    Units follow the inputs (e.g. kip and ft give kip-ft moments and kip
    shears). A case whose span rule the member does not meet
    (:meth:`~batch.loads.cases.LoadCase.applies_to`) is not moved across it and
    gives no effect. Raises ``ValueError`` for a malformed member or case and
    :class:`batch.engine.influence.UnstableMemberError` for a mechanism.
    """
    if not cases:
        raise ValueError("give at least one load case")
    if directions not in DIRECTION_CODES:
        raise ValueError(f"directions must be one of {', '.join(DIRECTION_CODES)}")
    factors = (member.df_moment, member.df_shear, member.df_moment_single, member.df_shear_single)
    if not np.all(np.isfinite([f for f in factors if f is not None])):
        raise ValueError(f"member {member.id!r}: distribution factors must be finite numbers")
    for c in cases:
        numbers = (("lane load", c.lane_load), ("impact", c.impact), ("factor", c.factor))
        for name, number in numbers:
            if not np.isfinite(number):
                raise ValueError(f"load case {c.label!r}: {name} must be a finite number")
        if c.other_span_load and len(c.train.loads) != 1:
            raise ValueError(
                f"load case {c.label!r}: a load placed again in another span must be one axle"
            )
    il = il if il is not None else member_influence(member, stations_per_span)
    positive, negative = il.areas()
    n_eff = il.n_effects
    df = _distribution(member, cases, il)
    active = np.array([c.applies_to(member.spans) for c in cases], dtype=bool)
    width = ranged_width(cases)
    fleet = _active_extremes(il, cases, active, DIRECTION_CODES[directions], width)
    lengths = loaded_lengths(il)
    allowances = _allowances(cases, lengths)
    lane = np.array([c.lane_load for c in cases])[:, None]
    factor = np.array([c.factor for c in cases])[:, None]
    scale = factor * df
    total = np.array([c.train.weight for c in cases])[:, None]
    # The largest allowance a case can take, for the size below which an effect is round-off.
    axle_top = np.array([c.impact_formula.cap if c.impact_formula else c.impact for c in cases])
    lane_top = np.array([c.impact_formula.cap if c.impact_formula else 0.0 for c in cases])
    size = il.effect_scale[None, :] * (
        total * (1 + axle_top[:, None]) + lane * (1 + lane_top[:, None]) * il.length
    )
    scopes = {scope: _scoped(il, scope) for scope in {c.scope for c in cases}}
    applies = np.array([scopes[c.scope] for c in cases], dtype=bool).reshape(-1, n_eff, 2)
    applies &= active[:, None, None]
    out = {}
    for col, (sense, axle_v, axle_p, axle_d, axle_s, area) in enumerate(
        (
            ("max", fleet.max_value, fleet.max_position, fleet.max_direction,
             fleet.max_spacing, positive),
            ("min", fleet.min_value, fleet.min_position, fleet.min_direction,
             fleet.min_spacing, negative),
        )
    ):  # fmt: skip
        on_axles, on_lane = allowances[col]
        # Below ZERO_TOL of the case's natural size an extreme is round-off, not an effect.
        axle_part = np.where(np.abs(axle_v) > ZERO_TOL * size, axle_v, 0.0)
        value = scale * ((1 + on_axles) * axle_part + (1 + on_lane) * lane * area[None, :])
        value = np.where(np.abs(value) > ZERO_TOL * size * scale, value, 0.0)
        value = np.where(applies[:, :, col], value, 0.0)
        moving = (axle_part != 0.0) & (value != 0.0)
        acting = value != 0.0
        out[sense] = (
            value,
            np.where(moving, axle_p, np.nan),
            np.where(moving, axle_d, 0).astype(np.int8),
            np.where(acting, factor * axle_part, 0.0),
            np.where(acting, factor * lane * area[None, :], 0.0),
            np.where(moving[:, :, None], axle_s, np.nan),
        )
    return CaseEffects(
        lines=il,
        cases=tuple(cases),
        distribution=df,
        max_value=out["max"][0],
        max_position=out["max"][1],
        max_direction=out["max"][2],
        min_value=out["min"][0],
        min_position=out["min"][1],
        min_direction=out["min"][2],
        max_spacing=out["max"][5],
        min_spacing=out["min"][5],
        max_impact=np.broadcast_to(allowances[0][0], (len(cases), n_eff)),
        min_impact=np.broadcast_to(allowances[1][0], (len(cases), n_eff)),
        max_loaded_length=lengths[0],
        min_loaded_length=lengths[1],
        max_axle=out["max"][3],
        max_lane=out["max"][4],
        min_axle=out["min"][3],
        min_lane=out["min"][4],
        standard_impact=_standard_impact(cases, lengths),
    )


def _standard_impact(
    cases: Sequence[LoadCase], lengths: tuple[NDArray[np.float64], NDArray[np.float64]]
) -> tuple[NDArray[np.float64], NDArray[np.float64]] | None:
    """The first impact formula of ``cases`` at each effect's loaded length, or None."""
    formula = next((c.impact_formula for c in cases if c.impact_formula is not None), None)
    if formula is None:
        return None
    return impact_fraction(formula, lengths[0]), impact_fraction(formula, lengths[1])


def _distribution(
    member: Member, cases: Sequence[LoadCase], il: InfluenceLines
) -> NDArray[np.float64]:
    """Each case's distribution factor on every effect, (n_cases, n_effects).

    The member's DF moment on moments and DF shear on shears and reactions; for a
    fatigue case, its single-lane factors with the one-lane multiple presence
    factor divided out (AASHTO LRFD 3.6.1.1.2, 3.6.1.4.3b).
    """
    lanes = np.full(il.n_effects, member.df_shear)
    lanes[il.moment_rows] = member.df_moment
    df = np.tile(lanes, (len(cases), 1))
    fatigue = np.array([c.fatigue for c in cases], dtype=bool)
    if fatigue.any():
        moment, shear = member.df_moment_single, member.df_shear_single
        if moment is None or shear is None:
            raise ValueError(
                f"member {member.id!r}: a fatigue load needs its single-lane distribution "
                "factors (DF moment single lane, DF shear single lane)"
            )
        single = np.full(il.n_effects, shear)
        single[il.moment_rows] = moment
        df[fatigue] = single / SINGLE_LANE_PRESENCE.number
    return df


Allowance = NDArray[np.float64] | float


def _allowances(
    cases: Sequence[LoadCase], lengths: tuple[NDArray[np.float64], NDArray[np.float64]]
) -> tuple[tuple[NDArray[np.float64], Allowance], tuple[NDArray[np.float64], Allowance]]:
    """The allowance on axles and on the lane load of every case, for the max and for the min.

    A case with a fixed allowance has it on its axles and none on its lane load,
    one column for all effects ((n_cases, 1); the lane's is the number 0); a case
    with an impact formula has the formula's value at each effect's loaded length on
    both ((n_cases, n_effects)).
    """
    fixed = np.array([c.impact for c in cases])[:, None]
    formulas = [c.impact_formula for c in cases]
    if not any(formulas):
        return (fixed, 0.0), (fixed, 0.0)
    out = []
    for length in lengths:
        axles = np.repeat(fixed, length.size, axis=1)
        lane = np.zeros_like(axles)
        for row, formula in enumerate(formulas):
            if formula is not None:
                axles[row] = lane[row] = impact_fraction(formula, length)
        out.append((axles, lane))
    return out[0], out[1]


def _no_extremes(shape: tuple[int, int], width: int) -> FleetExtremes:
    """Extremes of cases that give no effect: zero, no position, direction or spacing."""
    return FleetExtremes(
        max_value=np.zeros(shape),
        max_position=np.full(shape, np.nan),
        max_direction=np.zeros(shape, np.int8),
        max_spacing=np.full((*shape, width), np.nan),
        min_value=np.zeros(shape),
        min_position=np.full(shape, np.nan),
        min_direction=np.zeros(shape, np.int8),
        min_spacing=np.full((*shape, width), np.nan),
    )


def _active_extremes(
    il: InfluenceLines,
    cases: Sequence[LoadCase],
    active: NDArray[np.bool_],
    directions: tuple[int, ...],
    width: int,
) -> FleetExtremes:
    """Axle extremes of the ``active`` cases (their span rule met); the others' rows hold none.

    The spacing arrays are ``width`` wide (:func:`~batch.engine.moving.ranged_width`).
    """
    if active.all():
        return _axle_extremes(il, cases, directions, width)
    out = _no_extremes((len(cases), il.n_effects), width)
    if active.any():
        kept = _axle_extremes(
            il, [c for c, a in zip(cases, active, strict=True) if a], directions, width
        )
        for name in vars(out):
            getattr(out, name)[active] = getattr(kept, name)
    return out


def _axle_extremes(
    il: InfluenceLines, cases: Sequence[LoadCase], directions: tuple[int, ...], width: int
) -> FleetExtremes:
    """The axle extremes of every case: moved across the member, or placed span by span.

    A case with ``other_span_load`` is not moved: its one axle goes at the worst
    ordinate of one span and again at the worst ordinate of one other span (see
    :func:`_other_span_extremes`); the others go through the moving-load sweep.
    """
    placed = np.array([c.other_span_load for c in cases], dtype=bool)
    if not placed.any():
        return fleet_extremes_of(il, cases, directions, width)
    out = _no_extremes((len(cases), il.n_effects), width)
    if not placed.all():
        moved = fleet_extremes_of(
            il, [c for c, p in zip(cases, placed, strict=True) if not p], directions, width
        )
        for name in vars(out):
            getattr(out, name)[~placed] = getattr(moved, name)
    largest, smallest = il.span_extremes
    for row, case in enumerate(cases):
        if not case.other_span_load:
            continue
        load = case.train.loads[0]
        for sign, ext, value, position in (
            (1.0, largest, out.max_value, out.max_position),
            (-1.0, smallest, out.min_value, out.min_position),
        ):
            value[row], position[row] = _other_span_extremes(ext, sign, load)
    return out


def _other_span_extremes(
    ext: SpanExtremes, sign: float, load: float
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """Two equal point loads in two different spans, each at its span's worst ordinate.

    ``ext`` holds each line's extreme ordinate per span in the sense ``sign``
    (+1 largest, -1 smallest). A span whose ordinates all relieve the effect
    takes no load (as a load on a support, where moment lines are zero). Returns
    the effect (load times the two best ordinates of different spans) and the
    position of the load in the worst span; on a member of one span, the one load.
    """
    adverse = np.maximum(sign * ext.value, 0.0)
    order = np.argsort(-adverse, axis=1, kind="stable")
    rows = np.arange(adverse.shape[0])
    best = adverse[rows, order[:, 0]]
    second = adverse[rows, order[:, 1]] if adverse.shape[1] > 1 else 0.0
    return sign * load * (best + second), ext.position[rows, order[:, 0]]


def governing(
    value: NDArray[np.float64],
    position: NDArray[np.float64],
    direction: NDArray[np.int8],
    spacing: NDArray[np.float64],
    sign: float,
    rows: NDArray[np.int64] | None = None,
) -> tuple[
    NDArray[np.float64],
    NDArray[np.int64],
    NDArray[np.float64],
    NDArray[np.int8],
    NDArray[np.float64],
]:
    """The worst of the given case rows per effect; the first row wins ties, -1 when none acts.

    Returns its value, case, position, direction and spacing ((n_effects, W)).
    """
    rows = np.arange(value.shape[0]) if rows is None else rows
    n_eff = value.shape[1]
    pad = np.zeros((1, n_eff))
    v = np.concatenate([pad, value[rows]])  # row 0 stands for "no case"
    p = np.concatenate([pad + np.nan, position[rows]])
    d = np.concatenate([pad.astype(np.int8), direction[rows]])
    s = np.concatenate([np.full((1, *spacing.shape[1:]), np.nan), spacing[rows]])
    signed = sign * v
    # Cases within round-off of the worst are a tie, and the first of them wins, so a
    # symmetric member names the same vehicle at mirrored stations.
    top = signed.max(axis=0)
    best = (signed >= top - TIE_REL_TOL * np.abs(top)).argmax(axis=0)
    cols = np.arange(n_eff)
    case = np.where(best > 0, rows[np.maximum(best - 1, 0)], -1)
    return v[best, cols], case, p[best, cols], d[best, cols], s[best, cols]


@dataclass(frozen=True)
class _Trains:
    """The load cases' trains as padded arrays, for evaluating them where they govern.

    ``loads`` (n_cases, A) the axle loads, 0 past a train's last axle; ``gaps``
    (n_cases, A - 1) the low end of every gap; ``ranged`` (n_cases, W) the gaps
    given as ranges, front to rear (-1 past the last); the rest one per case.
    """

    loads: NDArray[np.float64]
    gaps: NDArray[np.float64]
    ranged: NDArray[np.int64]
    lane: NDArray[np.float64]
    factor: NDArray[np.float64]
    drop: NDArray[np.bool_]
    placed: NDArray[np.bool_]
    formula: NDArray[np.bool_]


@functools.lru_cache(maxsize=8)
def _trains(cases: tuple[LoadCase, ...]) -> _Trains:
    """:class:`_Trains` of ``cases``, made once for all the members of a run."""
    most = max(len(c.train.loads) for c in cases)
    width = ranged_width(cases)
    loads = np.zeros((len(cases), most))
    gaps = np.zeros((len(cases), most - 1))
    ranged = np.full((len(cases), width), -1, dtype=np.int64)
    for row, c in enumerate(cases):
        loads[row, : len(c.train.loads)] = c.train.loads
        gaps[row, : len(c.train.low)] = c.train.low
        ranged[row, : len(c.train.ranged)] = c.train.ranged
    return _Trains(
        loads=loads,
        gaps=gaps,
        ranged=ranged,
        lane=np.array([c.lane_load for c in cases]),
        factor=np.array([c.factor for c in cases]),
        drop=np.array([c.drop_adverse_axles for c in cases], dtype=bool),
        placed=np.array([c.other_span_load for c in cases], dtype=bool),
        formula=np.array([c.impact_formula is not None for c in cases], dtype=bool),
    )


def _concurrent(
    effects: CaseEffects,
    sense: str,
    governing: NDArray[np.int64],
    companion: NDArray[np.int64],
    found: tuple[NDArray[Any], ...],
) -> NDArray[np.float64]:
    """The value of each ``companion`` line with the load placed as it governs ``governing``.

    ``found`` is :func:`_governing`'s (value, case, position, direction, spacing)
    of those governing lines in ``sense`` ("max" or "min"). The governing case's
    axles stand where they govern (front axle at the position, the direction,
    the spacing; with ``drop_adverse_axles`` only the axles that add to the
    governing effect), its lane load on the parts of the member where the
    governing line is adverse; the companion takes the case's factor, its own
    distribution factor and the governing value's dynamic allowance:
    ``DF * ((1 + IM) * axles + (1 + IM lane) * lane)``. Where an axle stands on
    a jump of a line, the limit from the side that gives the governing value
    is taken for both lines; where both sides give it (the governing line does
    not jump there, e.g. a moment with an axle on its station), the companion
    takes the load on the station as the governing line's section sees it
    (:mod:`batch.engine.influence`: just right of the station, or just left at
    fraction 1 of a span, where the load is then to its right). NaN where no
    case governs, and for a load placed again in another span (its second
    position is not kept).
    """
    il = effects.lines
    _, case, position, direction, spacing = found
    governs = case >= 0
    c = np.maximum(case, 0)
    trains = _trains(effects.cases)
    rows = np.arange(c.size)
    gaps = trains.gaps[c]
    for w in range(trains.ranged.shape[1]):  # (the ranged gaps, at most MAX_RANGES)
        gap = trains.ranged[c, w]
        used = (gap >= 0) & np.isfinite(spacing[:, w])
        gaps[rows[used], gap[used]] = spacing[used, w]
    offsets = np.concatenate([np.zeros((c.size, 1)), np.cumsum(gaps, axis=1)], axis=1)
    moving = governs & np.isfinite(position) & (direction != 0)
    x = np.where(moving, position, 0.0)[:, None] - direction[:, None] * offsets
    loads = np.where(moving[:, None], trains.loads[c], 0.0)
    tol = POSITION_TOL * il.length
    # An axle within round-off of a break stands on it (the sweep puts it there exactly).
    j = np.clip(np.searchsorted(il.breaks, x), 1, il.breaks.size - 1)
    before, after = il.breaks[j - 1], il.breaks[j]
    near = np.where(x - before <= after - x, before, after)
    x = np.where(np.abs(near - x) <= tol, near, x)
    sign = 1.0 if sense == "max" else -1.0
    sums = {}
    for side in ("left", "right"):
        # The limit from outside the member of a load on an end support is 0 (off it).
        off = x <= tol if side == "left" else x >= il.length - tol
        own = np.where(off, 0.0, il.ordinates(governing[:, None], x, side))
        other = np.where(off, 0.0, il.ordinates(companion[:, None], x, side))
        counted = ~trains.drop[c][:, None] | (sign * own > 0)
        sums[side] = ((loads * own * counted).sum(axis=1), (loads * other * counted).sum(axis=1))
    factor = trains.factor[c]
    target = getattr(effects, f"{sense}_axle")[c, governing]
    miss = {side: np.abs(factor * sums[side][0] - target) for side in sums}
    size = il.effect_scale[governing] * trains.loads[c].sum(axis=1) * np.abs(factor)
    tie = np.abs(factor * (sums["left"][0] - sums["right"][0])) <= SIDE_REL_TOL * size
    section_left = il.station_fraction[governing % il.n_stations] == 1.0
    left = np.where(tie, ~section_left, miss["left"] <= miss["right"])
    axles = factor * np.where(left, sums["left"][1], sums["right"][1])
    areas = il.areas_where(governing, companion)[0 if sense == "max" else 1]
    lane = factor * trains.lane[c] * areas
    impact = getattr(effects, f"{sense}_impact")[c, governing]
    impact_lane = np.where(trains.formula[c], impact, 0.0)
    value = effects.distribution[c, companion] * ((1 + impact) * axles + (1 + impact_lane) * lane)
    return np.where(governs & ~trains.placed[c], value, np.nan)


def envelope_of(
    member_id: str,
    effects: CaseEffects,
    labels: tuple[str, ...],
    rows: NDArray[np.int64] | None = None,
) -> MemberEnvelope:
    """The envelope over the load cases ``rows`` (all by default) of ``effects``.

    With each governing moment and shear, its concurrent shear and moment
    (:func:`_concurrent`).
    """
    il = effects.lines
    best = {
        sense: governing(
            getattr(effects, f"{sense}_value"),
            getattr(effects, f"{sense}_position"),
            getattr(effects, f"{sense}_direction"),
            getattr(effects, f"{sense}_spacing"),
            sign,
            rows,
        )
        for sense, sign in (("max", 1.0), ("min", -1.0))
    }

    # The companion of a station's moment line is the shear line at that station, and back.
    n = il.n_stations
    lines = np.arange(2 * n)
    companion = np.concatenate([lines[n:], lines[:n]])
    concurrent = {
        sense: np.concatenate(
            [
                _concurrent(effects, sense, lines, companion, tuple(a[: 2 * n] for a in found)),
                np.full(il.n_effects - 2 * n, np.nan),  # (a reaction has none)
            ]
        )
        for sense, found in best.items()
    }

    def pick(sense: str, part: slice) -> Governing:
        v, c, p, d, s = best[sense]
        return Governing(
            value=v[part],
            case=c[part],
            position=p[part],
            direction=d[part],
            spacing=s[part],
            concurrent=concurrent[sense][part],
        )

    impact = None
    if effects.standard_impact is not None:
        lengths = {"max": effects.max_loaded_length, "min": effects.min_loaded_length}
        fraction = dict(zip(("max", "min"), effects.standard_impact, strict=True))
        part = {"m": il.moment_rows, "v": il.shear_rows, "r": il.reaction_rows}
        impact = tuple(  # attr "m_max": rows of moments, sense max
            ImpactRows(
                loaded_length=lengths[e.attr[2:]][part[e.attr[0]]],
                fraction=fraction[e.attr[2:]][part[e.attr[0]]],
            )
            for e in EFFECTS
        )

    return MemberEnvelope(
        member=member_id,
        labels=labels,
        station_span=il.station_span,
        station_fraction=il.station_fraction,
        station_x=il.station_x,
        support_x=il.support_x,
        m_max=pick("max", il.moment_rows),
        m_min=pick("min", il.moment_rows),
        v_max=pick("max", il.shear_rows),
        v_min=pick("min", il.shear_rows),
        r_max=pick("max", il.reaction_rows),
        r_min=pick("min", il.reaction_rows),
        impact=impact,
    )


def member_envelope(
    member: Member,
    cases: list[LoadCase] | tuple[LoadCase, ...],
    stations_per_span: int = 10,
    directions: str = "both",
    il: InfluenceLines | None = None,
) -> MemberEnvelope:
    """Envelope of every effect of ``member`` over all ``cases``.

    See :func:`case_effects` for units and errors; the envelope keeps, per
    effect, the worst case, its front-axle position and direction.
    """
    effects = case_effects(member, cases, stations_per_span, directions, il)
    return envelope_of(member.id, effects, tuple(c.label for c in cases))
