"""Exact extremes of a train of axles crossing a member.

For a rigid group of axles with loads P_k at offsets d_k behind its front axle,
the effect of the front axle at position q is

    E(q) = sum_k P_k * IL(q - sigma * d_k)

with sigma = +1 travelling left to right and -1 right to left, and IL = 0 off
the member. Between consecutive *kink positions* q = b_j + sigma * d_k (some
axle on a break of the influence line) E is one cubic, so its extremes are at a
kink position (both one-sided limits are taken, so unit jumps of shear lines
are honoured) or at a root of its quadratic derivative. Every such candidate is
evaluated exactly; there is no stepping.

A spacing given as a range [lo, hi] splits the train into groups. At the
optimum either the spacing sits at one end of its range (then the groups move
as one rigid train), or it is strictly inside, and then each group must sit at
one of its own candidates. Every combination of {lo, hi, free} over the ranges
is taken, and the free groups are joined by an exact maximisation over
their candidate pairs that satisfy the range (a small dynamic programme along
the train). The result is the exact worst spacing, not just the range ends.
"""

from __future__ import annotations

import functools
import itertools
import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from batch.engine.influence import InfluenceLines
from batch.engine.kernel import SweepPlan, chain_extremes, chain_fleet, fleet_extremes
from batch.loads.cases import LoadCase
from batch.model import MAX_RANGES, AxleTrain
from batch.model.layout import POSITION_TOL

__all__ = [
    "LEFT_TO_RIGHT",
    "RIGHT_TO_LEFT",
    "AxleExtremes",
    "FleetExtremes",
    "axle_extremes",
    "fleet_extremes_of",
]

LEFT_TO_RIGHT = 1
RIGHT_TO_LEFT = -1


@dataclass(frozen=True, kw_only=True)
class FleetExtremes:
    """Governing of axle trains per effect (see :class:`AxleExtremes`).

    For one train the arrays have shape (n_effects,); for many, (n_trains,
    n_effects). ``*_spacing`` adds a last axis: for one train, the spacing used
    for each of its gaps; for many, one place per *ranged* gap (W = the most
    ranged gaps of any train among them, 0 when none): a ranged train's row
    holds the spacing used for each of its ranged gaps, front to rear (NaN past
    its last), a train of fixed spacings' row NaN (its spacings are its own).
    Lengths in the member's unit.
    """

    max_value: NDArray[np.float64]
    max_position: NDArray[np.float64]
    max_direction: NDArray[np.int8]
    max_spacing: NDArray[np.float64]
    min_value: NDArray[np.float64]
    min_position: NDArray[np.float64]
    min_direction: NDArray[np.int8]
    min_spacing: NDArray[np.float64]


@dataclass(frozen=True, kw_only=True)
class AxleExtremes(FleetExtremes):
    """Governing of the axle train alone (no lane load, no factors), per effect.

    ``max_value[e]`` is the largest value of effect e over all positions,
    directions and spacings (never below 0: the train can be off the member);
    ``min_value[e]`` the smallest (never above 0). ``*_position`` is the front
    axle's distance from the member's left end, ``*_direction`` +1 for left to
    right and -1 for right to left, ``*_spacing[e, g]`` the spacing used for
    each gap of the train. Position and direction are NaN and 0 where the
    extreme is 0 (no position of the train gives an effect of that sign).
    """


def ranged_width(cases: Sequence[LoadCase]) -> int:
    """The most ranged gaps of any train of ``cases`` (0 when none has a range).

    The width of the spacing arrays of :class:`FleetExtremes` for those cases.
    """
    return max((len(c.train.ranged) for c in cases), default=0)


@dataclass(frozen=True)
class _Combo:
    """One way of fixing a train's ranged spacings: each at its low or high end, or free."""

    spacing: NDArray[np.float64]  # every gap, free ones at their low end
    free: list[int]  # gaps left free: they split the train into groups
    group_start: NDArray[np.int64]  # G + 1 axle indices delimiting the groups
    offsets: NDArray[np.float64]  # each axle's distance behind its group's front axle
    own: NDArray[np.float64]  # each group's own length (all groups but the last)

    def gap_bounds(
        self, lo: NDArray[np.float64], hi: NDArray[np.float64]
    ) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
        """Front-to-front distance bounds between consecutive groups."""
        return self.own + lo[self.free], self.own + hi[self.free]


def _spacings(
    length: float,
    n_axles: int,
    spacing_low: tuple[float, ...],
    spacing_high: tuple[float, ...],
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    lo = np.asarray(spacing_low, dtype=float).reshape(-1)
    hi = np.asarray(spacing_high, dtype=float).reshape(-1)
    if n_axles == 0 or lo.size != n_axles - 1 or hi.size != lo.size:
        raise ValueError("give one or more axle loads and one spacing per gap between axles")
    if not (np.all(np.isfinite(lo)) and np.all(np.isfinite(hi))) or np.any(lo < 0):
        raise ValueError("axle spacings must be finite numbers, zero or more")
    if np.any(hi < lo):
        raise ValueError("a spacing range must not end below its start")
    # Beyond one member length the groups can never both be on the member, so a
    # longer spacing adds nothing that the member length does not already give.
    return lo, np.maximum(lo, np.minimum(hi, length))


def _check_loads(loads: NDArray[np.float64]) -> None:
    if not np.all(np.isfinite(loads)):
        raise ValueError("axle loads must be finite numbers")


def _check_directions(directions: tuple[int, ...]) -> None:
    if not directions or any(d not in (LEFT_TO_RIGHT, RIGHT_TO_LEFT) for d in directions):
        raise ValueError("directions must be one or both of +1 (left to right) and -1")


@dataclass(frozen=True)
class _Prepared:
    """A checked train: loads, spacing bounds (capped at the member length) and combinations."""

    loads: NDArray[np.float64]
    lo: NDArray[np.float64]
    hi: NDArray[np.float64]
    combos: list[_Combo]


@functools.lru_cache(maxsize=8192)
def _prepared(
    loads: tuple[float, ...], low: tuple[float, ...], high: tuple[float, ...]
) -> _Prepared:
    """The same train prepared once for every member whose length does not cap its ranges."""
    p = np.ascontiguousarray(loads, dtype=float).reshape(-1)
    _check_loads(p)
    lo, hi = _spacings(np.inf, p.size, low, high)
    return _Prepared(loads=p, lo=lo, hi=hi, combos=_combos(lo, hi))


def _prepare(length: float, train: AxleTrain) -> _Prepared:
    low, high = train.low, train.high
    if max(high, default=0.0) > length:
        # Cap ranges at the member length (see _spacings) without hiding an inverted range.
        high = tuple(
            max(lo, length) if hi > length else hi for lo, hi in zip(low, high, strict=True)
        )
    return _prepared(train.loads, low, high)


def _combos(lo: NDArray[np.float64], hi: NDArray[np.float64]) -> list[_Combo]:
    ranged = [g for g in range(lo.size) if hi[g] > lo[g]]
    if len(ranged) > MAX_RANGES:
        raise ValueError(f"at most {MAX_RANGES} spacings of one vehicle may be ranges")
    n_axles = lo.size + 1
    out = []
    for choice in itertools.product(("lo", "hi", "free"), repeat=len(ranged)):
        fixed = lo.copy()
        for g, c in zip(ranged, choice, strict=True):
            if c == "hi":
                fixed[g] = hi[g]
        free = [g for g, c in zip(ranged, choice, strict=True) if c == "free"]
        starts = [0, *[g + 1 for g in free]]
        ends = [*[g + 1 for g in free], n_axles]
        offsets = np.concatenate(
            [
                np.concatenate([[0.0], np.cumsum(fixed[a : z - 1])])
                for a, z in zip(starts, ends, strict=True)
            ]
        )
        out.append(
            _Combo(
                spacing=fixed,
                free=free,
                group_start=np.array([*starts, n_axles], dtype=np.int64),
                offsets=offsets,
                own=np.array([offsets[z - 1] for z in ends[:-1]]),
            )
        )
    return out


def _plans(il: InfluenceLines, drop_adverse_axles: bool) -> tuple[SweepPlan, SweepPlan]:
    """The lines swept for the maximum and for the minimum (whole, or their adverse parts)."""
    return il.clipped_plans if drop_adverse_axles else (il.plan, il.plan)


def _chain(
    plans: tuple[SweepPlan, SweepPlan],
    loads: NDArray[np.float64],
    combo: _Combo,
    gaps: tuple[NDArray[np.float64], NDArray[np.float64]],
    sigma: int,
    tol: float,
    held: tuple[NDArray[np.float64], NDArray[np.float64]],
) -> tuple[tuple[NDArray[np.float64], ...], tuple[NDArray[np.float64], ...]]:
    """(value, position, distances) of the maximum and of the minimum of one combination.

    Only values passing the ``held`` maxima and minima are sought (see
    :func:`chain_extremes`). One compiled call gives both when the two plans
    are the same.
    """
    args = (loads, combo.offsets, combo.group_start, gaps[0], gaps[1], float(sigma), tol, *held)
    high = chain_extremes(plans[0], *args)
    low = high if plans[1] is plans[0] else chain_extremes(plans[1], *args)
    return high[0:3], low[3:6]


def axle_extremes(
    il: InfluenceLines,
    train: AxleTrain,
    directions: tuple[int, ...] = (LEFT_TO_RIGHT, RIGHT_TO_LEFT),
    drop_adverse_axles: bool = False,
) -> AxleExtremes:
    """Exact largest and smallest effects of an axle train on every influence line.

    ``train`` gives the axle loads, front axle first (force, downward positive),
    and the bounds of each gap between consecutive axles. Axles off the
    member carry nothing. Effects are in the units of the influence lines times
    the load unit (no dynamic allowance, lane load or factors here). With
    ``drop_adverse_axles`` an axle standing where it would lessen the effect is
    left out (AASHTO LRFD 3.6.1.3.1), by sweeping the positive part of each line
    for the maximum and its negative part for the minimum. Also reports the
    spacing used for each gap.
    """
    p = np.ascontiguousarray(train.loads, dtype=float).reshape(-1)
    _check_loads(p)
    _check_directions(directions)
    lo, hi = _spacings(il.length, p.size, train.low, train.high)
    plans = _plans(il, drop_adverse_axles)
    tol = POSITION_TOL * il.length
    n_eff = il.n_effects
    best = {
        sense: [
            np.zeros(n_eff),
            np.full(n_eff, np.nan),
            np.zeros(n_eff, np.int8),
            np.tile(lo, (n_eff, 1)),
        ]
        for sense in (1.0, -1.0)
    }
    for sigma in directions:
        for combo in _combos(lo, hi):
            held = (best[1.0][0], best[-1.0][0])
            both = _chain(plans, p, combo, combo.gap_bounds(lo, hi), sigma, tol, held)
            for sense, (total, pos, dist) in zip((1.0, -1.0), both, strict=True):
                value, position, direction, spacing = best[sense]
                better = sense * total > sense * value
                used = np.tile(combo.spacing, (n_eff, 1))
                used[:, combo.free] = dist - combo.own
                value[better] = total[better]
                position[better] = pos[better]
                direction[better] = sigma
                spacing[better] = used[better]
    return AxleExtremes(
        max_value=best[1.0][0],
        max_position=best[1.0][1],
        max_direction=best[1.0][2],
        max_spacing=best[1.0][3],
        min_value=best[-1.0][0],
        min_position=best[-1.0][1],
        min_direction=best[-1.0][2],
        min_spacing=best[-1.0][3],
    )


def fleet_extremes_of(
    il: InfluenceLines,
    cases: Sequence[LoadCase],
    directions: tuple[int, ...] = (LEFT_TO_RIGHT, RIGHT_TO_LEFT),
    width: int = 0,
) -> FleetExtremes:
    """Exact extremes of every load case's axle train on every influence line of one member.

    Only the trains (and whether a case drops adverse axles) are used here; lane
    loads, the dynamic allowance and factors are applied by the caller.

    Every rigid train, and every rigid way of fixing a ranged train's spacings
    at the ends of their ranges, is swept in one compiled call per partition;
    only the ways that leave a spacing free go one by one through the group
    join. Units as in :func:`axle_extremes`. The spacing arrays are ``width``
    wide, or as wide as :func:`ranged_width` needs if that is more (so that
    the extremes of some cases fit beside those of others).
    """
    _check_directions(directions)
    n_eff = il.n_effects
    shape = (len(cases), n_eff)
    width = max(width, ranged_width(cases))
    out = FleetExtremes(
        max_value=np.zeros(shape),
        max_position=np.full(shape, np.nan),
        max_direction=np.zeros(shape, np.int8),
        max_spacing=np.full((*shape, width), np.nan),
        min_value=np.zeros(shape),
        min_position=np.full(shape, np.nan),
        min_direction=np.zeros(shape, np.int8),
        min_spacing=np.full((*shape, width), np.nan),
    )
    tol = POSITION_TOL * il.length
    kept = (
        out.max_value,
        out.max_position,
        out.max_direction,
        out.min_value,
        out.min_position,
        out.min_direction,
        out.max_spacing,
        out.min_spacing,
    )
    packed = _fleet_packed(cases, il.length, width)
    sigmas = np.array(directions, dtype=float)
    # Rigid trains first, then the free-gap chains of ranged ones; ties keep the first.
    for drop, (args, gaps, which) in packed.rigid.items():
        for plan, keep in _kept(il, drop):
            fleet_extremes(plan, *args, sigmas, tol, keep, kept, gaps, which)
    for drop, (links, link_gaps, link_ranged) in packed.chains.items():
        for plan, keep in _kept(il, drop):
            chain_fleet(plan, *links, sigmas, tol, keep, kept, link_gaps, link_ranged)
    return out


@dataclass(frozen=True)
class _Packed:
    """A fleet's trains laid out for the compiled sweeps, by whether adverse axles drop.

    For each: the arrays the sweep takes before the directions (rigid trains: loads,
    offsets, where each train starts, output rows; chains add their groups and gap
    bounds), every job's spacing and its ranged gaps padded to the output's width.
    """

    rigid: dict[bool, tuple[_RigidArgs, NDArray[np.float64], NDArray[np.int64]]]
    chains: dict[bool, tuple[_ChainArgs, NDArray[np.float64], NDArray[np.int64]]]


_F = NDArray[np.float64]
_I = NDArray[np.int64]
#: Loads, offsets, where each train starts, output rows.
_RigidArgs = tuple[_F, _F, _I, _I]
#: The same, then each chain's group starts and its gaps' lower and upper bounds.
_ChainArgs = tuple[_F, _F, _I, _I, _I, _F, _F]


#: The last fleet packed without capping, for the next member: (its cases, the width,
#: the packing, the longest range end of any train). A run hands every member the same
#: tuple of load cases, and only a member shorter than a range's end needs its own.
_last_packed: tuple[tuple[LoadCase, ...], int, _Packed, float] | None = None


def _fleet_packed(cases: Sequence[LoadCase], length: float, width: int) -> _Packed:
    """``cases`` packed for a member of ``length``, once for all members alike.

    Every member of a run whose length caps no range (see :func:`_prepare`) shares
    one packing; a shorter one gets its own.
    """
    global _last_packed
    last = _last_packed
    if last is not None and last[0] is cases and last[1] == width:
        return last[2] if length >= last[3] else _pack(cases, length, width)
    longest = max((max(c.train.high, default=0.0) for c in cases), default=0.0)
    if length < longest:
        return _pack(cases, length, width)
    packed = _pack(cases, math.inf, width)
    if isinstance(cases, tuple):
        _last_packed = (cases, width, packed, longest)
    return packed


def _pack(cases: Sequence[LoadCase], length: float, width: int) -> _Packed:
    """The jobs of ``cases`` for a member of ``length`` (ranges capped there)."""
    rigid: dict[bool, list[_Job]] = {}
    chains: dict[bool, list[_Link]] = {}
    for row, t in enumerate(cases):
        ready = _prepare(length, t.train)
        ranged = t.train.ranged
        for combo in ready.combos:
            if combo.free:
                lo, hi = combo.gap_bounds(ready.lo, ready.hi)
                link = (row, ready.loads, combo, lo, hi, ranged)
                chains.setdefault(t.drop_adverse_axles, []).append(link)
            else:
                job = (row, ready.loads, combo, ranged)
                rigid.setdefault(t.drop_adverse_axles, []).append(job)
    packed = _Packed(rigid={}, chains={})
    for drop, jobs in rigid.items():
        args = (
            np.concatenate([p for _, p, _, _ in jobs]),
            np.concatenate([c.offsets for _, _, c, _ in jobs]),
            np.cumsum([0] + [p.size for _, p, _, _ in jobs], dtype=np.int64),
            np.array([row for row, _, _, _ in jobs], dtype=np.int64),
        )
        gaps = np.concatenate([c.spacing for _, _, c, _ in jobs])
        packed.rigid[drop] = args, gaps, _padded([r for _, _, _, r in jobs], width)
    for drop, links in chains.items():
        most = max(c.group_start.size for _, _, c, _, _, _ in links)
        groups = np.full((len(links), most), -1, dtype=np.int64)
        gap_lo = np.zeros((len(links), most - 2))
        gap_hi = np.zeros((len(links), most - 2))
        for j, (_, _, combo, lo, hi, _) in enumerate(links):
            groups[j, : combo.group_start.size] = combo.group_start
            gap_lo[j, : lo.size] = lo
            gap_hi[j, : hi.size] = hi
        chain_args = (
            np.concatenate([p for _, p, _, _, _, _ in links]),
            np.concatenate([c.offsets for _, _, c, _, _, _ in links]),
            np.cumsum([0] + [p.size for _, p, _, _, _, _ in links], dtype=np.int64),
            np.array([row for row, _, _, _, _, _ in links], dtype=np.int64),
            groups,
            gap_lo,
            gap_hi,
        )
        gaps = np.concatenate([c.spacing for _, _, c, _, _, _ in links])
        packed.chains[drop] = chain_args, gaps, _padded([r for _, _, _, _, _, r in links], width)
    return packed


def _padded(rows: list[tuple[int, ...]], width: int) -> NDArray[np.int64]:
    """Each job's ranged gaps as one row of ``width``, padded with -1."""
    pad = (-1,) * width
    return np.array([r + pad[len(r) :] for r in rows], dtype=np.int64).reshape(len(rows), width)


#: A rigid job: output row, axle loads, the way its spacings are fixed, its ranged gaps.
_Job = tuple[int, NDArray[np.float64], _Combo, tuple[int, ...]]
#: A chain job: output row, axle loads, the way its spacings are fixed, its gap bounds,
#: its ranged gaps.
_Link = tuple[
    int, NDArray[np.float64], _Combo, NDArray[np.float64], NDArray[np.float64], tuple[int, ...]
]


def _kept(il: InfluenceLines, drop: bool) -> list[tuple[SweepPlan, tuple[bool, bool]]]:
    """The plans to sweep and which extreme each gives (maximum, minimum)."""
    high, low = _plans(il, drop)
    if high is low:
        return [(high, (True, True))]
    return [(high, (True, False)), (low, (False, True))]
