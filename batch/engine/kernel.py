"""Compiled inner loop of the moving-load sweep (numba).

For each influence line (on its own minimal partition, see
``InfluenceLines.reduced``) and each rigid group of axles, every candidate
front-axle position is considered: each position where some axle sits on a
break (both one-sided limits), and each stationary point of the cubic between
consecutive such positions. Candidates are evaluated exactly, except those a
bound proves cannot pass the extremes already found (the Bernstein hull of an
interval's cubic; see :func:`fleet_extremes` and :func:`chain_extremes`).
Groups separated by a free (ranged) gap are then joined by a dynamic programme
over their candidates that keeps the gap within its range. See
:mod:`batch.engine.moving` for why this is exact.

Lines with the same breaks (the moment and the shear at one station, or all
the lines whose only breaks are the supports and hinges) form a *bundle*: the
positions where an axle crosses a break are found once per bundle and the
lines are swept side by side. Everything here is plain loops over whole arrays
indexed by row (no array views in the loops: numba counts references to views
with atomic operations, which cost more than the arithmetic). The caller passes
a direction ``sigma`` and unsigned offsets, so one code path serves both
directions.
"""

from __future__ import annotations

import functools
from typing import NamedTuple

import numba as nb
import numpy as np
from numpy.typing import NDArray

__all__ = [
    "Governing",
    "SweepPlan",
    "chain_extremes",
    "chain_fleet",
    "cubic_crossings",
    "fleet_extremes",
    "sweep_plan",
]

#: Governing kept per row and effect: maximum, its front-axle position and
#: direction, then the same three for the minimum.
Governing = tuple[
    NDArray[np.float64],
    NDArray[np.float64],
    NDArray[np.int8],
    NDArray[np.float64],
    NDArray[np.float64],
    NDArray[np.int8],
]


class SweepPlan(NamedTuple):
    """Influence lines laid out for the sweep: bundles of lines with equal breaks.

    ``order[bundle_start[u]:bundle_start[u + 1]]`` are the effect rows of bundle
    u, ``breaks[u, :counts[u]]`` its breaks (ascending, padded). ``jumps[r, j]``
    is the change of the Taylor coefficients (value, slope, curvature/2,
    third derivative/6) of line ``order[r]`` as the load position passes break
    j of its bundle: the coefficients of the piece entered minus those of the
    piece left (zero outside the member).

    ``shared[0]`` are the breaks every bundle has (the supports, ends and
    hinges), at ``shared_at[u]`` among bundle u's breaks; its other breaks are
    ``extra[u, :n_extra[u]]``, at ``extra_at[u]``. The positions where axles
    cross the shared breaks are sorted once per train and direction, and only
    a bundle's own few are merged in.
    """

    order: NDArray[np.int64]
    bundle_start: NDArray[np.int64]
    breaks: NDArray[np.float64]
    counts: NDArray[np.int64]
    jumps: NDArray[np.float64]
    shared: NDArray[np.float64]
    shared_at: NDArray[np.int64]
    extra: NDArray[np.float64]
    extra_at: NDArray[np.int64]
    n_extra: NDArray[np.int64]


def sweep_plan(
    breaks: NDArray[np.float64], counts: NDArray[np.int64], coef: NDArray[np.float64]
) -> SweepPlan:
    """Bundle the lines of a partition (``InfluenceLines.reduced`` layout) for the sweep."""
    key = np.concatenate([counts[:, None].astype(float), breaks], axis=1)
    _, first, bundle = np.unique(key, axis=0, return_index=True, return_inverse=True)
    bundle = bundle.reshape(-1)
    order = np.argsort(bundle, kind="stable").astype(np.int64)
    sizes = np.bincount(bundle, minlength=first.size)
    h = np.diff(breaks, axis=1)[..., None]  # padded pieces have zero length and coefficients
    c0, c1, c2, c3 = (coef[..., n : n + 1] for n in range(4))
    value = ((c3 * h + c2) * h + c1) * h + c0
    slope = (3.0 * c3 * h + 2.0 * c2) * h + c1
    at_end = np.concatenate([value, slope, 3.0 * c3 * h + c2, c3], axis=-1)
    jumps = np.zeros((*breaks.shape, 4))
    jumps[:, :-1] += coef
    jumps[:, 1:] -= at_end
    rows = [breaks[e, : counts[e]] for e in first]
    shared = functools.reduce(np.intersect1d, rows)
    width = max(1, max(row.size for row in rows) - shared.size)
    shared_at = np.array([np.searchsorted(row, shared) for row in rows], dtype=np.int64)
    extra = np.zeros((len(rows), width))
    extra_at = np.zeros((len(rows), width), dtype=np.int64)
    n_extra = np.zeros(len(rows), dtype=np.int64)
    for u, row in enumerate(rows):
        own = np.flatnonzero(~np.isin(row, shared))
        n_extra[u] = own.size
        extra[u, : own.size] = row[own]
        extra_at[u, : own.size] = own
    return SweepPlan(
        order=order,
        bundle_start=np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64),
        breaks=np.ascontiguousarray(breaks[first]),
        counts=np.ascontiguousarray(counts[first]).astype(np.int64),
        jumps=np.ascontiguousarray(jumps[order]),
        shared=shared[None, :],
        shared_at=shared_at.reshape(len(rows), shared.size),
        extra=extra,
        extra_at=extra_at,
        n_extra=n_extra,
    )


@nb.njit(cache=True)
def _quad_roots(a0: float, a1: float, a2: float, h: float) -> tuple[int, float, float]:
    """Roots of a0 + a1 t + a2 t^2 strictly inside (0, h): (how many, first, second)."""
    # Most intervals hold no root: the ends have one sign and the vertex lies outside.
    end = a0 + h * (a1 + h * a2)
    if a0 * end > 0.0:
        twice = 2.0 * a2 * h
        vertex_inside = (0.0 < -a1 < twice) if a2 > 0.0 else (twice < -a1 < 0.0)
        if not vertex_inside:
            return 0, 0.0, 0.0
    scale = abs(a0) + abs(a1) * h + abs(a2) * h * h
    if abs(a2) * h * h > 1e-14 * scale:
        disc = a1 * a1 - 4.0 * a2 * a0
        if disc < 0.0:
            return 0, 0.0, 0.0
        sq = np.sqrt(disc)
        q = -0.5 * (a1 + sq) if a1 >= 0 else -0.5 * (a1 - sq)
        if q == 0.0:
            return 0, 0.0, 0.0
        r0 = q / a2
        r1 = a0 / q
        in0 = 0.0 < r0 < h
        in1 = 0.0 < r1 < h
        if in0 and in1:
            return 2, r0, r1
        if in0:
            return 1, r0, 0.0
        if in1:
            return 1, r1, 0.0
        return 0, 0.0, 0.0
    if a1 != 0.0:
        r = -a0 / a1
        if 0.0 < r < h:
            return 1, r, 0.0
    return 0, 0.0, 0.0


@nb.njit(cache=True)
def _shift(
    a0: float, a1: float, a2: float, a3: float, d: float
) -> tuple[float, float, float, float]:
    """Taylor coefficients of a cubic re-expanded a distance d further on."""
    return (
        a0 + d * (a1 + d * (a2 + d * a3)),
        a1 + d * (2.0 * a2 + 3.0 * d * a3),
        a2 + 3.0 * d * a3,
        a3,
    )


@nb.njit(cache=True)
def _events(
    breaks: np.ndarray,
    row: int,
    n: int,
    loads: np.ndarray,
    offsets: np.ndarray,
    s0: int,
    s1: int,
    sigma: float,
    event_q: np.ndarray,
    event_break: np.ndarray,
    event_load: np.ndarray,
    heads: np.ndarray,
) -> int:
    """Every axle-on-break position of axles s0:s1 over ``breaks[row, :n]``, in order.

    Axle k reaches break i when the front axle is at ``breaks[row, i] + sigma *
    offsets[k]``. The positions come as n lists (one per break) already sorted,
    because the offsets are monotone: an n-way merge sorts them. Fills
    ``event_q`` (front-axle position), ``event_break`` and ``event_load``;
    returns how many.
    """
    k_axles = s1 - s0
    total = n * k_axles
    for i in range(n):
        heads[i] = 0
    for t in range(total):
        pick = 0
        best = np.inf
        for i in range(n):
            j = heads[i]
            if j < k_axles:
                q = breaks[row, i] + sigma * offsets[s0 + (j if sigma > 0 else k_axles - 1 - j)]
                if q < best:
                    best = q
                    pick = i
        j = heads[pick]
        heads[pick] = j + 1
        event_q[t] = best
        event_break[t] = pick
        event_load[t] = loads[s0 + (j if sigma > 0 else k_axles - 1 - j)]
    return total


@nb.njit(cache=True)
def _merge(
    plan: SweepPlan,
    u: int,
    shared: tuple[np.ndarray, np.ndarray, np.ndarray, int],
    extra: tuple[np.ndarray, np.ndarray, np.ndarray, int],
    event_q: np.ndarray,
    event_break: np.ndarray,
    event_load: np.ndarray,
) -> int:
    """Bundle u's events: the shared breaks' (sorted once) merged with its own extra ones.

    Each event's break becomes its index among the bundle's breaks. Returns how many.
    """
    sq, sb, sl, n_s = shared
    xq, xb, xl, n_x = extra
    i = 0
    k = 0
    for t in range(n_s + n_x):
        if k >= n_x or (i < n_s and sq[i] <= xq[k]):
            event_q[t] = sq[i]
            event_break[t] = plan.shared_at[u, sb[i]]
            event_load[t] = sl[i]
            i += 1
        else:
            event_q[t] = xq[k]
            event_break[t] = plan.extra_at[u, xb[k]]
            event_load[t] = xl[k]
            k += 1
    return n_s + n_x


@nb.njit(cache=True)
def fleet_extremes(
    plan: SweepPlan,
    loads: np.ndarray,
    offsets: np.ndarray,
    case_start: np.ndarray,
    case_row: np.ndarray,
    sigmas: np.ndarray,
    tol: float,
    keep: tuple[bool, bool],
    out: Governing,
) -> None:
    """Governing of many rigid axle trains (fixed spacings) in one call, kept in ``out``.

    Train i has axles ``case_start[i]:case_start[i + 1]`` of ``loads`` with
    ``offsets`` behind its front axle; every train is swept in each direction
    of ``sigmas``. Row ``case_row[i]`` of ``out`` (arrays of shape (rows,
    n_effects)) keeps whichever is worse, the extreme held or the train's:
    the maximum, its front-axle position and direction, then the same for the
    minimum, each only if ``keep`` says so (maximum, minimum). Rows start from
    0 with position NaN and direction 0 (the train off the member).

    Each line is swept in two passes. The first carries the cubic E(q) from
    one axle-on-break position to the next by an exact Taylor shift, adding
    each crossing axle's jump, and keeps the largest and smallest one-sided
    limits. The second visits the cubic of every interval between those
    positions: by the convex-hull property of its Bernstein form it cannot
    pass the extremes found unless one of its two inner control points does,
    and only then are its stationary points solved for.
    """
    order, bundle_start, breaks, counts, jumps = plan[:5]
    n_cases = case_start.size - 1
    width = breaks.shape[1]
    most_lines = 1
    for u in range(counts.size):
        most_lines = max(most_lines, bundle_start[u + 1] - bundle_start[u])
    k_max = 1
    for i in range(n_cases):
        k_max = max(k_max, case_start[i + 1] - case_start[i])
    event_q = np.empty(width * k_max)
    event_break = np.empty(width * k_max, dtype=np.int64)
    event_load = np.empty(width * k_max)
    shared_q = np.empty(width * k_max)
    shared_break = np.empty(width * k_max, dtype=np.int64)
    shared_load = np.empty(width * k_max)
    extra_q = np.empty(width * k_max)
    extra_break = np.empty(width * k_max, dtype=np.int64)
    extra_load = np.empty(width * k_max)
    heads = np.empty(width, dtype=np.int64)
    span_q = np.empty((width * k_max, 2))  # start and length of each interval
    span_a = np.empty((most_lines, width * k_max, 4))  # each line's cubic on it
    a = np.empty((most_lines, 4))
    top = np.empty((most_lines, 2))  # largest value so far and its position
    bot = np.empty((most_lines, 2))
    max_v, max_p, max_d, min_v, min_p, min_d = out
    for case in range(n_cases):
        s0, s1 = case_start[case], case_start[case + 1]
        i = case_row[case]
        for si in range(sigmas.size):
            sigma = sigmas[si]
            n_shared = _events(
                plan.shared, 0, plan.shared.shape[1], loads, offsets, s0, s1, sigma,
                shared_q, shared_break, shared_load, heads,
            )  # fmt: skip
            shared = (shared_q, shared_break, shared_load, n_shared)
            for u in range(counts.size):
                r0 = bundle_start[u]
                n_lines = bundle_start[u + 1] - r0
                n_own = _events(
                    plan.extra, u, plan.n_extra[u], loads, offsets, s0, s1, sigma,
                    extra_q, extra_break, extra_load, heads,
                )  # fmt: skip
                own = (extra_q, extra_break, extra_load, n_own)
                total = _merge(plan, u, shared, own, event_q, event_break, event_load)
                for ln in range(n_lines):
                    e = order[r0 + ln]
                    # An extreme not kept is held at infinity: nothing passes it, so no
                    # interval is solved for it.
                    top[ln, 0] = max_v[i, e] if keep[0] else np.inf
                    top[ln, 1] = max_p[i, e]
                    bot[ln, 0] = min_v[i, e] if keep[1] else -np.inf
                    bot[ln, 1] = min_p[i, e]
                    for c in range(4):
                        a[ln, c] = 0.0
                m = 0
                idx = 0
                q_prev = event_q[0]
                while idx < total:
                    qg = event_q[idx]
                    for ln in range(n_lines):
                        a0, a1, a2, a3 = _shift(a[ln, 0], a[ln, 1], a[ln, 2], a[ln, 3], qg - q_prev)
                        a[ln, 0] = a0
                        a[ln, 1] = a1
                        a[ln, 2] = a2
                        if a0 > top[ln, 0]:  # limit from the left
                            top[ln, 0] = a0
                            top[ln, 1] = qg
                        if a0 < bot[ln, 0]:
                            bot[ln, 0] = a0
                            bot[ln, 1] = qg
                    while idx < total and event_q[idx] - qg <= tol:
                        brk = event_break[idx]
                        p = event_load[idx]
                        for ln in range(n_lines):
                            for c in range(4):
                                a[ln, c] += p * jumps[r0 + ln, brk, c]
                        idx += 1
                    for ln in range(n_lines):
                        # (written out as above: a helper taking the arrays, called here
                        # for every line and event, made the whole sweep four times slower)
                        a0 = a[ln, 0]
                        if a0 > top[ln, 0]:  # limit from the right
                            top[ln, 0] = a0
                            top[ln, 1] = qg
                        if a0 < bot[ln, 0]:
                            bot[ln, 0] = a0
                            bot[ln, 1] = qg
                    if idx < total:
                        span_q[m, 0] = qg
                        span_q[m, 1] = event_q[idx] - qg
                        for ln in range(n_lines):
                            for c in range(4):
                                span_a[ln, m, c] = a[ln, c]
                        m += 1
                    q_prev = qg
                for ln in range(n_lines):
                    high = top[ln, 0]
                    low = bot[ln, 0]
                    for s in range(m):
                        h = span_q[s, 1]
                        a0 = span_a[ln, s, 0]
                        a1 = span_a[ln, s, 1]
                        a2 = span_a[ln, s, 2]
                        third = h * (1.0 / 3.0)
                        inner1 = a0 + a1 * third
                        inner2 = a0 + (2.0 * a1 + a2 * h) * third
                        if max(inner1, inner2) <= high and min(inner1, inner2) >= low:
                            continue
                        a3 = span_a[ln, s, 3]
                        found, t0, t1 = _quad_roots(a1, 2.0 * a2, 3.0 * a3, h)
                        for r in range(found):
                            t = t0 if r == 0 else t1
                            v = ((a3 * t + a2) * t + a1) * t + a0
                            if v > high:
                                high = v
                                top[ln, 1] = span_q[s, 0] + t
                            if v < low:
                                low = v
                                bot[ln, 1] = span_q[s, 0] + t
                    e = order[r0 + ln]
                    if keep[0] and high > max_v[i, e]:
                        max_v[i, e] = high
                        max_p[i, e] = top[ln, 1]
                        max_d[i, e] = np.int8(sigma)
                    if keep[1] and low < min_v[i, e]:
                        min_v[i, e] = low
                        min_p[i, e] = bot[ln, 1]
                        min_d[i, e] = np.int8(sigma)


@nb.njit(cache=True)
def _carry(
    jumps: np.ndarray,
    row: int,
    event_q: np.ndarray,
    event_break: np.ndarray,
    event_load: np.ndarray,
    total: int,
    tol: float,
    g: int,
    at_q: np.ndarray,
    at_v: np.ndarray,
    span_a: np.ndarray,
) -> tuple[int, float, float]:
    """One line under one rigid axle group: its value at every event and its cubic between.

    Before the first event every axle is off the member (E = 0). The cubic of
    each interval is carried to the next event by an exact Taylor shift; its
    value there is the limit from the left, and after the crossing axles'
    jumps, the limit from the right. Writes, per event position k of group g,
    ``at_q[g, k]``, both limits ``at_v[g, k]`` and the cubic that starts there
    ``span_a[g, k]`` (its length is ``at_q[g, k + 1] - at_q[g, k]``). Returns
    the number of positions and bounds above and below every value the group
    can give (the limits and the Bernstein control points of every interval).
    """
    a0 = a1 = a2 = a3 = 0.0
    high = 0.0
    low = 0.0
    k = 0
    idx = 0
    q_prev = event_q[g, 0]
    while idx < total:
        qg = event_q[g, idx]
        a0, a1, a2, a3 = _shift(a0, a1, a2, a3, qg - q_prev)
        at_q[g, k] = qg
        at_v[g, k, 0] = a0  # limit from the left
        while idx < total and event_q[g, idx] - qg <= tol:
            brk = event_break[g, idx]
            p = event_load[g, idx]
            a0 += p * jumps[row, brk, 0]
            a1 += p * jumps[row, brk, 1]
            a2 += p * jumps[row, brk, 2]
            a3 += p * jumps[row, brk, 3]
            idx += 1
        at_v[g, k, 1] = a0  # limit from the right
        span_a[g, k, 0] = a0
        span_a[g, k, 1] = a1
        span_a[g, k, 2] = a2
        span_a[g, k, 3] = a3
        high = max(high, at_v[g, k, 0], a0)
        low = min(low, at_v[g, k, 0], a0)
        if idx < total:
            third = (event_q[g, idx] - qg) * (1.0 / 3.0)
            inner1 = a0 + a1 * third
            inner2 = a0 + (2.0 * a1 + 3.0 * a2 * third) * third
            high = max(high, inner1, inner2)
            low = min(low, inner1, inner2)
        k += 1
        q_prev = qg
    return k, high, low


@nb.njit(cache=True)
def _promising(
    at_q: np.ndarray,
    at_v: np.ndarray,
    span_a: np.ndarray,
    n_at: int,
    g: int,
    sense: float,
    floor: float,
    pos: np.ndarray,
    val: np.ndarray,
) -> int:
    """Group g's candidates whose ``sense * value`` passes ``floor``, in position order.

    Candidates are the better limit at each event position and the stationary
    points of each interval's cubic, solved only where a Bernstein control
    point passes the floor. Values are written multiplied by ``sense``.
    """
    count = 0
    for k in range(n_at):
        v = max(sense * at_v[g, k, 0], sense * at_v[g, k, 1])
        if v > floor:
            pos[g, count] = at_q[g, k]
            val[g, count] = v
            count += 1
        if k + 1 >= n_at:
            break
        h = at_q[g, k + 1] - at_q[g, k]
        a0 = span_a[g, k, 0]
        a1 = span_a[g, k, 1]
        a2 = span_a[g, k, 2]
        third = h * (1.0 / 3.0)
        inner1 = sense * (a0 + a1 * third)
        inner2 = sense * (a0 + (2.0 * a1 + a2 * h) * third)
        if max(inner1, inner2) <= floor:
            continue
        a3 = span_a[g, k, 3]
        found, t0, t1 = _quad_roots(a1, 2.0 * a2, 3.0 * a3, h)
        if found == 2 and t1 < t0:
            t0, t1 = t1, t0
        for r in range(found):
            t = t0 if r == 0 else t1
            v = sense * (((a3 * t + a2) * t + a1) * t + a0)
            if v > floor:
                pos[g, count] = at_q[g, k] + t
                val[g, count] = v
                count += 1
    return count


@nb.njit(cache=True)
def chain_extremes(
    plan: SweepPlan,
    loads: np.ndarray,
    offsets: np.ndarray,
    group_start: np.ndarray,
    gap_lo: np.ndarray,
    gap_hi: np.ndarray,
    sigma: float,
    tol: float,
    held_max: np.ndarray,
    held_min: np.ndarray,
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Largest and smallest effect of a chain of rigid axle groups, per influence line.

    ``offsets[k]`` is axle k's distance behind its group's front axle;
    ``group_start`` (G+1) delimits the groups in the axle arrays; the front of
    group g+1 is ``sigma * (gap_lo[g] .. gap_hi[g])`` behind the front of group g
    (distances that include group g's own length). Returns, per effect, the
    maximum value, the front axle position giving it and the front-to-front
    distances (E, G-1), then the same three for the minimum.

    Only values that pass ``held_max`` (or fall below ``held_min``), the extremes
    already known per effect, are sought: a candidate of one group whose value
    plus the other groups' upper bounds cannot pass them is dropped before the
    join, and where none can, the result is -inf (or +inf) with position NaN.
    """
    order, bundle_start, breaks, counts, jumps = plan[:5]
    n_eff = order.size
    n_groups = group_start.size - 1
    n_gaps = max(n_groups - 1, 0)
    width = breaks.shape[1]
    k_max = 1
    for g in range(n_groups):
        k_max = max(k_max, group_start[g + 1] - group_start[g])
    max_c = 3 * width * k_max + 2
    at_q = np.empty((n_groups, max_c))
    at_v = np.empty((n_groups, max_c, 2))
    span_a = np.empty((n_groups, max_c, 4))
    n_at = np.empty(n_groups, dtype=np.int64)
    bound = np.empty((n_groups, 2))
    pos = np.empty((n_groups, max_c))
    val = np.empty((n_groups, max_c))
    ncand = np.empty(n_groups, dtype=np.int64)
    best = np.empty(max_c)
    nxt = np.empty(max_c)
    choice = np.zeros((max(n_gaps, 1), max_c), dtype=np.int64)
    window = np.empty(max_c, dtype=np.int64)
    event_q = np.empty((n_groups, width * k_max))
    event_break = np.empty((n_groups, width * k_max), dtype=np.int64)
    event_load = np.empty((n_groups, width * k_max))
    n_events = np.empty(n_groups, dtype=np.int64)
    heads = np.empty(width, dtype=np.int64)
    out_v = np.empty((2, n_eff))
    out_p = np.full((2, n_eff), np.nan)
    out_d = np.zeros((2, n_eff, n_gaps))
    for u in range(counts.size):
        for g in range(n_groups):
            n_events[g] = _events(
                breaks, u, counts[u], loads, offsets, group_start[g], group_start[g + 1], sigma,
                event_q[g], event_break[g], event_load[g], heads,
            )  # fmt: skip
        for row in range(bundle_start[u], bundle_start[u + 1]):
            e = order[row]
            for g in range(n_groups):
                n_at[g], bound[g, 0], bound[g, 1] = _carry(
                    jumps, row, event_q, event_break, event_load, n_events[g], tol,
                    g, at_q, at_v, span_a,
                )  # fmt: skip
            for sense_i in range(2):
                sense = 1.0 if sense_i == 0 else -1.0
                out_v[sense_i, e] = -sense * np.inf
                # In the sense's own terms (maximise sense * value): what must be passed,
                # and the most all the groups together could give.
                held = sense * (held_max[e] if sense_i == 0 else held_min[e])
                reach = 0.0
                for g in range(n_groups):
                    reach += sense * bound[g, sense_i]
                if reach <= held:
                    continue
                for g in range(n_groups):
                    floor = held - (reach - sense * bound[g, sense_i])
                    ncand[g] = _promising(at_q, at_v, span_a, n_at[g], g, sense, floor, pos, val)
                last = n_groups - 1
                for j in range(ncand[last]):
                    nxt[j] = val[last, j]
                for g in range(n_groups - 2, -1, -1):
                    lo = gap_lo[g] - tol
                    hi = gap_hi[g] + tol
                    # Candidates are sorted by position, so the window of feasible
                    # partners slides one way: a monotonic deque gives each window's
                    # best in O(1) amortised (sliding-window maximum).
                    head = 0
                    tail = 0
                    j_next = 0
                    for i in range(ncand[g]):
                        if sigma > 0:
                            first = pos[g, i] - hi
                            last = pos[g, i] - lo
                        else:
                            first = pos[g, i] + lo
                            last = pos[g, i] + hi
                        while j_next < ncand[g + 1] and pos[g + 1, j_next] <= last:
                            while tail > head and nxt[window[tail - 1]] <= nxt[j_next]:
                                tail -= 1
                            window[tail] = j_next
                            tail += 1
                            j_next += 1
                        while tail > head and pos[g + 1, window[head]] < first:
                            head += 1
                        if tail > head:
                            best[i] = val[g, i] + nxt[window[head]]
                            choice[g, i] = window[head]
                        else:
                            best[i] = -np.inf
                            choice[g, i] = -1
                    for i in range(ncand[g]):
                        nxt[i] = best[i]
                top = -np.inf
                arg = -1
                for i in range(ncand[0]):
                    if nxt[i] > top:
                        top = nxt[i]
                        arg = i
                if arg < 0:
                    continue
                out_v[sense_i, e] = sense * top
                out_p[sense_i, e] = pos[0, arg]
                idx = arg
                for g in range(n_gaps):
                    nidx = choice[g, idx]
                    out_d[sense_i, e, g] = sigma * (pos[g, idx] - pos[g + 1, nidx])
                    idx = nidx
    return out_v[0], out_p[0], out_d[0], out_v[1], out_p[1], out_d[1]


@nb.njit(cache=True)
def chain_fleet(
    plan: SweepPlan,
    loads: np.ndarray,
    offsets: np.ndarray,
    job_start: np.ndarray,
    job_row: np.ndarray,
    group_start: np.ndarray,
    gap_lo: np.ndarray,
    gap_hi: np.ndarray,
    sigmas: np.ndarray,
    tol: float,
    keep: tuple[bool, bool],
    out: Governing,
) -> None:
    """:func:`chain_extremes` of many chains in one call, kept in ``out`` as :func:`fleet_extremes`.

    Chain j has axles ``job_start[j]:job_start[j + 1]``; ``group_start[j]``
    (padded with -1) delimits its groups relative to its first axle, and
    ``gap_lo[j]``/``gap_hi[j]`` bound its front-to-front distances.
    """
    max_v, max_p, max_d, min_v, min_p, min_d = out
    # An extreme not kept is held at infinity, so the join never seeks it.
    never_above = np.full(max_v.shape[1], np.inf)
    never_below = np.full(max_v.shape[1], -np.inf)
    for job in range(job_row.size):
        a0, a1 = job_start[job], job_start[job + 1]
        n_groups = 0
        while n_groups + 1 < group_start.shape[1] and group_start[job, n_groups + 1] >= 0:
            n_groups += 1
        i = job_row[job]
        for si in range(sigmas.size):
            sigma = sigmas[si]
            high, high_p, _, low, low_p, _ = chain_extremes(
                plan, loads[a0:a1], offsets[a0:a1], group_start[job, : n_groups + 1],
                gap_lo[job, : n_groups - 1], gap_hi[job, : n_groups - 1], sigma, tol,
                max_v[i] if keep[0] else never_above, min_v[i] if keep[1] else never_below,
            )  # fmt: skip
            for e in range(high.size):
                if keep[0] and high[e] > max_v[i, e]:
                    max_v[i, e] = high[e]
                    max_p[i, e] = high_p[e]
                    max_d[i, e] = np.int8(sigma)
                if keep[1] and low[e] < min_v[i, e]:
                    min_v[i, e] = low[e]
                    min_p[i, e] = low_p[e]
                    min_d[i, e] = np.int8(sigma)


@nb.njit(cache=True)
def _cubic_at(c0: float, c1: float, c2: float, c3: float, t: float) -> float:
    return ((c3 * t + c2) * t + c1) * t + c0


@nb.njit(cache=True)
def cubic_crossings(coef: np.ndarray, h: np.ndarray) -> np.ndarray:
    """Sign-changing roots of every cubic piece inside its own interval.

    ``coef`` has shape (..., 4) in the local coordinate t of a piece of length
    ``h`` (same leading shape). The stationary points split each piece into at
    most three monotone parts; a root is bracketed in each part whose ends
    differ in sign and bisected to machine precision. Returns the roots with
    shape (..., 3), NaN-padded. Touching (double) roots do not change sign and
    are not needed by the callers (areas of the positive and negative parts,
    and the split of a line into them).
    """
    flat = coef.reshape(-1, 4)
    hh = h.reshape(-1)
    out = np.full((flat.shape[0], 3), np.nan)
    edges = np.empty(4)
    for i in range(flat.shape[0]):
        c0, c1, c2, c3 = flat[i, 0], flat[i, 1], flat[i, 2], flat[i, 3]
        length = hh[i]
        nc, t0, t1 = _quad_roots(c1, 2.0 * c2, 3.0 * c3, length)
        edges[0] = 0.0
        edges[1] = min(t0, t1) if nc == 2 else t0
        edges[2] = max(t0, t1) if nc == 2 else length
        edges[nc + 1] = length
        found = 0
        for part in range(nc + 1):
            lo, hi = edges[part], edges[part + 1]
            flo = _cubic_at(c0, c1, c2, c3, lo)
            fhi = _cubic_at(c0, c1, c2, c3, hi)
            if not (hi > lo and flo * fhi < 0.0):
                continue
            rising = fhi > flo
            for _ in range(200):
                mid = 0.5 * (lo + hi)
                if mid <= lo or mid >= hi:
                    break
                if (_cubic_at(c0, c1, c2, c3, mid) > 0.0) == rising:
                    hi = mid
                else:
                    lo = mid
            out[i, found] = 0.5 * (lo + hi)
            found += 1
    return out.reshape((*coef.shape[:-1], 3))
