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
from batch.engine.polynomials import quadratic_roots_in

__all__ = ["LEFT_TO_RIGHT", "RIGHT_TO_LEFT", "AxleExtremes", "axle_extremes"]

LEFT_TO_RIGHT = 1
RIGHT_TO_LEFT = -1

#: Most spacing ranges in one vehicle (3**n combinations are swept).
MAX_RANGES = 4

# Binomial coefficients C(n, r) for the Taylor shift of a cubic.
_BINOM = np.array([[1, 0, 0, 0], [1, 1, 0, 0], [1, 2, 1, 0], [1, 3, 3, 1]], dtype=float)


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


@dataclass(frozen=True)
class _Candidates:
    position: NDArray[np.float64]  # (E, C) front-axle position of the group
    value: NDArray[np.float64]  # (E, C), NaN where the candidate does not exist


def _snap(x: NDArray[np.float64], breaks: NDArray[np.float64], tol: float) -> NDArray[np.float64]:
    """Put positions that are within ``tol`` of a break exactly on it."""
    j = np.clip(np.searchsorted(breaks, x), 1, breaks.size - 1)
    near = np.where(x - breaks[j - 1] < breaks[j] - x, breaks[j - 1], breaks[j])
    return np.where(np.abs(x - near) <= tol, near, x)


def _group_candidates(
    il: InfluenceLines, loads: NDArray[np.float64], offsets: NDArray[np.float64]
) -> _Candidates:
    """All positions where a rigid group of axles can reach an extreme, with values.

    ``offsets`` are signed: axle k stands at q - offsets[k] for front position q.
    """
    breaks = il.breaks
    n_pieces = breaks.size - 1
    tol = POSITION_TOL * il.length
    kinks = np.sort((breaks[:, None] + offsets[None, :]).ravel())
    q = kinks[np.concatenate([[True], np.diff(kinks) > tol])]
    m = q.size
    x = _snap(q[:, None] - offsets[None, :], breaks, tol)  # (M, K)
    width = 4 * n_pieces
    rows, cols, vals = [], [], []
    # Block 0: right limits (and Taylor coefficients 1..3 in blocks 1..3); block 4: left limits.
    j_right = np.searchsorted(breaks, x, side="right") - 1
    j_left = np.searchsorted(breaks, x, side="left") - 1
    row_index = np.broadcast_to(np.arange(m)[:, None], x.shape)
    load = np.broadcast_to(loads[None, :], x.shape)
    for block, (j, order) in enumerate(
        [(j_right, 0), (j_right, 1), (j_right, 2), (j_right, 3), (j_left, 0)]
    ):
        ok = (j >= 0) & (j < n_pieces)
        jj, tt, rr, pp = (
            j[ok],
            (x - breaks[np.clip(j, 0, n_pieces - 1)])[ok],
            row_index[ok],
            load[ok],
        )
        for n in range(order, 4):
            rows.append(block * m + rr)
            cols.append(4 * jj + n)
            vals.append(pp * _BINOM[n, order] * tt ** (n - order))
    flat = np.bincount(
        np.concatenate(rows) * width + np.concatenate(cols),
        weights=np.concatenate(vals),
        minlength=5 * m * width,
    ).reshape(5 * m, width)
    sums = flat @ il.coef.reshape(il.coef.shape[0], width).T  # (5M, E)
    a0, a1, a2, a3, left = (sums[b * m : (b + 1) * m].T for b in range(5))  # each (E, M)
    dq = np.diff(q)
    roots = quadratic_roots_in(a1[:, :-1], 2.0 * a2[:, :-1], 3.0 * a3[:, :-1], dq[None, :])
    t = roots
    interior = ((a3[:, :-1, None] * t + a2[:, :-1, None]) * t + a1[:, :-1, None]) * t + a0[
        :, :-1, None
    ]
    n_eff = il.n_effects
    position = np.concatenate(
        [
            np.broadcast_to(q, (n_eff, m)),
            np.broadcast_to(q, (n_eff, m)),
            (q[:-1, None] + t).reshape(n_eff, -1) if m > 1 else np.empty((n_eff, 0)),
        ],
        axis=1,
    )
    value = np.concatenate([a0, left, interior.reshape(n_eff, -1)], axis=1)
    return _Candidates(position=position, value=value)


def _best_chain(
    groups: list[_Candidates],
    gaps: list[tuple[float, float]],
    sigma: int,
    sense: float,
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]:
    """Best total over groups joined by free gaps, per effect.

    ``gaps[g] = (lo, hi)`` bounds the distance sigma*(q_g - q_{g+1}) between
    the fronts of groups g and g+1 (already including group g's own length).
    ``sense`` is +1 for the maximum, -1 for the minimum. Returns the signed best
    value, the first group's position and the front distances used (E, G-1).
    """
    n_eff = groups[0].value.shape[0]
    best = np.where(np.isnan(groups[-1].value), -np.inf, sense * groups[-1].value)
    choices: list[NDArray[np.int64]] = []
    for g in range(len(groups) - 2, -1, -1):
        lo, hi = gaps[g]
        here = groups[g]
        nxt = groups[g + 1]
        dist = sigma * (here.position[:, :, None] - nxt.position[:, None, :])  # (E, Ci, Cj)
        tol = POSITION_TOL * max(1.0, hi)
        feasible = (dist >= lo - tol) & (dist <= hi + tol)
        tail = np.where(feasible, best[:, None, :], -np.inf)
        pick = tail.argmax(axis=2)
        tail_best = np.take_along_axis(tail, pick[..., None], axis=2)[..., 0]
        best = np.where(np.isnan(here.value), -np.inf, sense * here.value) + tail_best
        choices.append(pick)
    first = best.argmax(axis=1)
    total = sense * best[np.arange(n_eff), first]
    position = groups[0].position[np.arange(n_eff), first]
    fronts = [position]
    idx = first
    for g, pick in enumerate(reversed(choices)):
        idx = pick[np.arange(n_eff), idx]
        fronts.append(groups[g + 1].position[np.arange(n_eff), idx])
    distances = (
        sigma * -np.diff(np.stack(fronts, axis=1), axis=1)
        if len(fronts) > 1
        else np.empty((n_eff, 0))
    )
    return total, position, distances


def axle_extremes(
    il: InfluenceLines,
    loads: NDArray[np.float64] | list[float] | tuple[float, ...],
    spacing_low: NDArray[np.float64] | list[float] | tuple[float, ...] = (),
    spacing_high: NDArray[np.float64] | list[float] | tuple[float, ...] | None = None,
    directions: tuple[int, ...] = (LEFT_TO_RIGHT, RIGHT_TO_LEFT),
) -> AxleExtremes:
    """Exact largest and smallest effects of an axle train on every influence line.

    ``loads`` front axle first (force, downward positive); ``spacing_low`` and
    ``spacing_high`` the bounds of each gap between consecutive axles (equal for
    a fixed spacing; ``spacing_high`` defaults to ``spacing_low``). Axles off the
    member carry nothing. Effects are in the units of the influence lines times
    the load unit (no dynamic allowance, lane load or factors here).
    """
    p = np.asarray(loads, dtype=float)
    lo = np.asarray(spacing_low, dtype=float).reshape(-1)
    hi = lo if spacing_high is None else np.asarray(spacing_high, dtype=float).reshape(-1)
    if lo.size != p.size - 1 or hi.size != lo.size:
        raise ValueError("give one spacing per gap between consecutive axles")
    # Beyond one member length the groups can never both be on the member, so a
    # longer spacing adds nothing that the member length does not already give.
    hi = np.maximum(lo, np.minimum(hi, il.length))
    ranged = [g for g in range(lo.size) if hi[g] > lo[g]]
    if len(ranged) > MAX_RANGES:
        raise ValueError(f"at most {MAX_RANGES} spacings of one vehicle may be ranges")
    n_eff = il.n_effects
    out: dict[str, list[NDArray[np.float64]]] = {}
    for sense, key in ((1.0, "max"), (-1.0, "min")):
        best_v = np.zeros(n_eff)
        best_p = np.full(n_eff, np.nan)
        best_d = np.zeros(n_eff, dtype=np.int8)
        best_s = np.tile(lo, (n_eff, 1))
        for sigma in directions:
            for choice in itertools.product(("lo", "hi", "free"), repeat=len(ranged)):
                fixed = lo.copy()
                free = []
                for g, c in zip(ranged, choice, strict=False):
                    if c == "hi":
                        fixed[g] = hi[g]
                    elif c == "free":
                        free.append(g)
                starts = [0, *[g + 1 for g in free]]
                ends = [*[g + 1 for g in free], p.size]
                groups = []
                gaps = []
                for s, e in zip(starts, ends, strict=False):
                    offs = np.concatenate([[0.0], np.cumsum(fixed[s : e - 1])])
                    groups.append(_group_candidates(il, p[s:e], sigma * offs))
                    if e < p.size:
                        length = float(offs[-1])
                        gaps.append((length + lo[e - 1], length + hi[e - 1]))
                total, pos, dist = _best_chain(groups, gaps, sigma, sense)
                better = sense * total > sense * best_v
                if not np.any(better):
                    continue
                spacing = np.tile(fixed, (n_eff, 1))
                for k, g in enumerate(free):
                    length = gaps[k][0] - lo[g]
                    spacing[:, g] = dist[:, k] - length
                best_v = np.where(better, total, best_v)
                best_p = np.where(better, pos, best_p)
                best_d = np.where(better, np.int8(sigma), best_d).astype(np.int8)
                best_s = np.where(better[:, None], spacing, best_s)
        out[key] = [best_v, best_p, best_d, best_s]
    return AxleExtremes(
        max_value=out["max"][0],
        max_position=out["max"][1],
        max_direction=out["max"][2],
        max_spacing=out["max"][3],
        min_value=out["min"][0],
        min_position=out["min"][1],
        min_direction=out["min"][2],
        min_spacing=out["min"][3],
    )
