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

import itertools
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from batch.engine.influence import POSITION_TOL, InfluenceLines
from batch.engine.kernel import chain_extremes, fleet_extremes

__all__ = [
    "LEFT_TO_RIGHT",
    "RIGHT_TO_LEFT",
    "AxleExtremes",
    "FleetExtremes",
    "Train",
    "axle_extremes",
    "fleet_extremes_of",
]

LEFT_TO_RIGHT = 1
RIGHT_TO_LEFT = -1

#: Most spacing ranges in one vehicle (3**n combinations are swept).
MAX_RANGES = 4


@dataclass(frozen=True, kw_only=True)
class AxleExtremes:
    """Extremes of the axle train alone (no lane load, no factors), per effect.

    ``max_value[e]`` is the largest value of effect e over all positions,
    directions and spacings (never below 0: the train can be off the member);
    ``min_value[e]`` the smallest (never above 0). ``*_position`` is the front
    axle's distance from the member's left end, ``*_direction`` +1 for left to
    right and -1 for right to left, ``*_spacing[e, g]`` the spacing used for
    each gap of the train. Position and direction are NaN and 0 where the
    extreme is 0 (no position of the train gives an effect of that sign).
    """

    max_value: NDArray[np.float64]
    max_position: NDArray[np.float64]
    max_direction: NDArray[np.int8]
    max_spacing: NDArray[np.float64]
    min_value: NDArray[np.float64]
    min_position: NDArray[np.float64]
    min_direction: NDArray[np.int8]
    min_spacing: NDArray[np.float64]


def axle_extremes(
    il: InfluenceLines,
    loads: NDArray[np.float64] | list[float] | tuple[float, ...],
    spacing_low: NDArray[np.float64] | list[float] | tuple[float, ...] = (),
    spacing_high: NDArray[np.float64] | list[float] | tuple[float, ...] | None = None,
    directions: tuple[int, ...] = (LEFT_TO_RIGHT, RIGHT_TO_LEFT),
    drop_adverse_axles: bool = False,
) -> AxleExtremes:
    """Exact largest and smallest effects of an axle train on every influence line.

    ``loads`` front axle first (force, downward positive); ``spacing_low`` and
    ``spacing_high`` the bounds of each gap between consecutive axles (equal for
    a fixed spacing; ``spacing_high`` defaults to ``spacing_low``). Axles off the
    member carry nothing. Effects are in the units of the influence lines times
    the load unit (no dynamic allowance, lane load or factors here). With
    ``drop_adverse_axles`` an axle standing where it would lessen the effect is
    left out (AASHTO LRFD 3.6.1.3.1), by sweeping the positive part of each line
    for the maximum and its negative part for the minimum.
    """
    p = np.ascontiguousarray(loads, dtype=float)
    lo = np.asarray(spacing_low, dtype=float).reshape(-1)
    hi = lo if spacing_high is None else np.asarray(spacing_high, dtype=float).reshape(-1)
    if p.ndim != 1 or p.size == 0 or lo.size != p.size - 1 or hi.size != lo.size:
        raise ValueError("give one or more axle loads and one spacing per gap between axles")
    # Beyond one member length the groups can never both be on the member, so a
    # longer spacing adds nothing that the member length does not already give.
    hi = np.maximum(lo, np.minimum(hi, il.length))
    ranged = [g for g in range(lo.size) if hi[g] > lo[g]]
    if len(ranged) > MAX_RANGES:
        raise ValueError(f"at most {MAX_RANGES} spacings of one vehicle may be ranges")
    partitions = il.clipped if drop_adverse_axles else (il.reduced, il.reduced)
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
        for choice in itertools.product(("lo", "hi", "free"), repeat=len(ranged)):
            fixed = lo.copy()
            free = [g for g, c in zip(ranged, choice, strict=True) if c == "free"]
            for g, c in zip(ranged, choice, strict=True):
                if c == "hi":
                    fixed[g] = hi[g]
            starts = [0, *[g + 1 for g in free]]
            ends = [*[g + 1 for g in free], p.size]
            offsets = np.concatenate(
                [
                    np.concatenate([[0.0], np.cumsum(fixed[a : z - 1])])
                    for a, z in zip(starts, ends, strict=True)
                ]
            )
            own = np.array([offsets[z - 1] for z in ends[:-1]])
            results = [
                chain_extremes(
                    *partition,
                    p,
                    offsets,
                    np.array([*starts, p.size]),
                    own + lo[free],
                    own + hi[free],
                    float(sigma),
                    tol,
                )
                for partition in (partitions if drop_adverse_axles else partitions[:1])
            ]
            for sense, (total, pos, dist) in (
                (1.0, results[0][0:3]),
                (-1.0, results[-1][3:6]),
            ):
                value, position, direction, spacing = best[sense]
                better = sense * total > sense * value
                if not np.any(better):
                    continue
                used = np.tile(fixed, (n_eff, 1))
                used[:, free] = dist - own
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


@dataclass(frozen=True, kw_only=True)
class Train:
    """An axle train as the sweep needs it (see :func:`axle_extremes` for units)."""

    loads: tuple[float, ...]
    spacing_low: tuple[float, ...] = ()
    spacing_high: tuple[float, ...] = ()
    drop_adverse_axles: bool = False

    @property
    def is_rigid(self) -> bool:
        """True when no spacing is a range."""
        return not any(h > lo for lo, h in zip(self.spacing_low, self.spacing_high, strict=False))


@dataclass(frozen=True, kw_only=True)
class FleetExtremes:
    """Extremes of many trains, as in :class:`AxleExtremes`, shape (n_trains, n_effects)."""

    max_value: NDArray[np.float64]
    max_position: NDArray[np.float64]
    max_direction: NDArray[np.int8]
    min_value: NDArray[np.float64]
    min_position: NDArray[np.float64]
    min_direction: NDArray[np.int8]


def fleet_extremes_of(
    il: InfluenceLines,
    trains: list[Train] | tuple[Train, ...],
    directions: tuple[int, ...] = (LEFT_TO_RIGHT, RIGHT_TO_LEFT),
) -> FleetExtremes:
    """Exact extremes of every train on every influence line of one member.

    Rigid trains are swept together in one compiled call per partition;
    trains with ranged spacings go through :func:`axle_extremes` one by one.
    """
    n_eff = il.n_effects
    shape = (len(trains), n_eff)
    out = FleetExtremes(
        max_value=np.zeros(shape),
        max_position=np.full(shape, np.nan),
        max_direction=np.zeros(shape, np.int8),
        min_value=np.zeros(shape),
        min_position=np.full(shape, np.nan),
        min_direction=np.zeros(shape, np.int8),
    )
    sigmas = np.array(directions, dtype=float)
    tol = POSITION_TOL * il.length
    for drop in (False, True):
        rows = [i for i, t in enumerate(trains) if t.is_rigid and t.drop_adverse_axles == drop]
        if not rows:
            continue
        loads = np.concatenate([np.asarray(trains[i].loads, dtype=float) for i in rows])
        offsets = np.concatenate(
            [np.concatenate([[0.0], np.cumsum(trains[i].spacing_low)]) for i in rows]
        )
        start = np.concatenate([[0], np.cumsum([len(trains[i].loads) for i in rows])])
        positive, negative = il.clipped if drop else (il.reduced, il.reduced)
        high = fleet_extremes(*positive, loads, offsets, start, sigmas, tol)
        low = high if not drop else fleet_extremes(*negative, loads, offsets, start, sigmas, tol)
        out.max_value[rows], out.max_position[rows], out.max_direction[rows] = high[0:3]
        out.min_value[rows], out.min_position[rows], out.min_direction[rows] = low[3:6]
    for i, t in enumerate(trains):
        if t.is_rigid:
            continue
        one = axle_extremes(
            il, t.loads, t.spacing_low, t.spacing_high, directions, t.drop_adverse_axles
        )
        out.max_value[i], out.max_position[i], out.max_direction[i] = (
            one.max_value,
            one.max_position,
            one.max_direction,
        )
        out.min_value[i], out.min_position[i], out.min_direction[i] = (
            one.min_value,
            one.min_position,
            one.min_direction,
        )
    return out
