"""Compiled inner loop of the moving-load sweep (numba).

For each influence line (on its own minimal partition, see
``InfluenceLines.reduced``) and each rigid group of axles, every candidate
front-axle position is considered: each position where some axle sits on a
break (both one-sided limits), and each stationary point of the cubic between
consecutive such positions. Candidates are evaluated exactly, except those a
bound proves cannot pass the extremes already found (the Bernstein hull of an
interval's cubic; see :func:`_settle` and :func:`_candidates`). Groups
separated by a free (ranged) gap are then joined by a dynamic programme over
their candidates that keeps the gap within its range. See
:mod:`batch.engine.moving` for why this is exact.

Lines with the same breaks (the moment and the shear at one station, or all
the lines whose only breaks are the supports and hinges) form a *bundle*: the
positions where an axle crosses a break are found once per bundle. A *sweep*
(:func:`_sweep`) carries every line of a member under one rigid train in one
direction, two lines at a time in registers, and keeps each line's limits and
cubic at each of its events in an array laid out line by line across, so that
the tests of every candidate (limits, Bernstein hulls, stationary points) run
as loops across lines that the compiler vectorises. Everything here is plain
loops over whole arrays indexed by row (no array views in the loops: numba
counts references to views with atomic operations, which cost more than the
arithmetic). The caller passes a direction ``sigma`` and unsigned offsets, so
one code path serves both directions.
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
#: direction, then the same three for the minimum (each (rows, n_effects)); then the
#: spacings of the maximum and of the minimum ((rows, n_effects, W): the spacing of
#: each ranged gap of the train, W the most ranged gaps of any train kept, 0 when none).
Governing = tuple[
    NDArray[np.float64],
    NDArray[np.float64],
    NDArray[np.int8],
    NDArray[np.float64],
    NDArray[np.float64],
    NDArray[np.int8],
    NDArray[np.float64],
    NDArray[np.float64],
]


class SweepPlan(NamedTuple):
    """Influence lines laid out for the sweep: bundles of lines with equal breaks.

    ``order[bundle_start[u]:bundle_start[u + 1]]`` are the effect rows of bundle
    u, ``breaks[u, :counts[u]]`` its breaks (padded). ``jumps[r, j]``
    is the change of the Taylor coefficients (value, slope, curvature/2,
    third derivative/6) of line ``order[r]`` as the load position passes break
    j of its bundle: the coefficients of the piece entered minus those of the
    piece left (zero outside the member).

    Each bundle's breaks come in two runs: first ``shared[0]``, the breaks
    every bundle has (the supports, ends and hinges), then its own,
    ``extra[u, :n_extra[u]]`` (each run ascending). The positions where axles
    cross the shared breaks are sorted once per train and direction, and only
    a bundle's own few are merged in.

    Each line is swept once: of ``n_effects`` lines, one that equals an earlier
    one (the moment at a support, at the end of one span and the start of the
    next) is not swept but takes that line's extremes, ``copies[c]`` being
    (effect, effect it equals); a line that is zero everywhere (the moment at
    an end support) is neither swept nor copied: its extremes are zero.
    """

    order: NDArray[np.int64]
    bundle_start: NDArray[np.int64]
    breaks: NDArray[np.float64]
    counts: NDArray[np.int64]
    jumps: NDArray[np.float64]
    shared: NDArray[np.float64]
    extra: NDArray[np.float64]
    n_extra: NDArray[np.int64]
    copies: NDArray[np.int64]
    n_effects: int


def sweep_plan(
    breaks: NDArray[np.float64], counts: NDArray[np.int64], coef: NDArray[np.float64]
) -> SweepPlan:
    """Bundle the lines of a partition (``InfluenceLines.reduced`` layout) for the sweep."""
    n_effects = breaks.shape[0]
    same = np.concatenate([counts[:, None], breaks, coef.reshape(n_effects, -1)], axis=1)
    _, first_equal, equal = np.unique(same, axis=0, return_index=True, return_inverse=True)
    source = first_equal[equal.reshape(-1)]
    zero = ~coef.reshape(n_effects, -1).any(axis=1)
    swept = np.flatnonzero((source == np.arange(n_effects)) & ~zero)
    if swept.size == 0:
        swept = np.array([0])  # (no line but zeros: sweep one, which gives zeros)
    copied = np.flatnonzero((source != np.arange(n_effects)) & ~zero)
    breaks, counts, coef = breaks[swept], counts[swept], coef[swept]
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
    extra = np.zeros((len(rows), width))
    n_extra = np.zeros(len(rows), dtype=np.int64)
    runs = np.zeros(breaks.shape, dtype=np.int64)  # each line's breaks, shared ones first
    for u, row in enumerate(rows):
        own = np.flatnonzero(~np.isin(row, shared))
        n_extra[u] = own.size
        extra[u, : own.size] = row[own]
        runs[bundle == u] = np.arange(breaks.shape[1])
        runs[bundle == u, : row.size] = np.concatenate([np.searchsorted(row, shared), own])
    lines = np.arange(breaks.shape[0])[:, None]
    return SweepPlan(
        order=swept[order].astype(np.int64),
        bundle_start=np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64),
        breaks=np.ascontiguousarray(breaks[first[:, None], runs[first]]),
        counts=np.ascontiguousarray(counts[first]).astype(np.int64),
        jumps=np.ascontiguousarray(jumps[lines, runs][order]),
        shared=shared[None, :],
        extra=extra,
        n_extra=n_extra,
        copies=np.stack([copied, source[copied]], axis=1).astype(np.int64),
        n_effects=n_effects,
    )


@nb.njit(cache=True, inline="always")
def _copy(plan: SweepPlan, out: Governing) -> None:
    """Every line that equals an earlier one takes its extremes (see :class:`SweepPlan`)."""
    for c in range(plan.copies.shape[0]):
        e, source = plan.copies[c, 0], plan.copies[c, 1]
        for i in range(out[0].shape[0]):
            out[0][i, e] = out[0][i, source]
            out[1][i, e] = out[1][i, source]
            out[2][i, e] = out[2][i, source]
            out[3][i, e] = out[3][i, source]
            out[4][i, e] = out[4][i, source]
            out[5][i, e] = out[5][i, source]
            for g in range(out[6].shape[2]):
                out[6][i, e, g] = out[6][i, source, g]
                out[7][i, e, g] = out[7][i, source, g]


@nb.njit(cache=True, inline="always")
def _quad_roots(a0: float, a1: float, a2: float, h: float) -> tuple[int, float, float]:
    """Roots of a0 + a1 t + a2 t^2 strictly inside (0, h): (how many, first, second).

    Every case is worked out and the answer selected, without branches, so that
    the callers' loops across lines vectorise; a division by zero in a case not
    taken must then give infinity, not an error (the callers compile with
    ``error_model="numpy"``). Unused roots are 0.
    """
    # Most intervals hold no root: the ends have one sign and the vertex lies outside.
    end = a0 + h * (a1 + h * a2)
    twice = 2.0 * a2 * h
    vertex_inside = ((0.0 < -a1) & (-a1 < twice)) if a2 > 0.0 else ((twice < -a1) & (-a1 < 0.0))
    possible = (not a0 * end > 0.0) | vertex_inside
    scale = abs(a0) + abs(a1) * h + abs(a2) * h * h
    quadratic = abs(a2) * h * h > 1e-14 * scale
    disc = a1 * a1 - 4.0 * a2 * a0
    sq = np.sqrt(max(disc, 0.0))
    q = -0.5 * (a1 + sq) if a1 >= 0 else -0.5 * (a1 - sq)
    r0 = q / a2
    r1 = a0 / q
    solved = possible & quadratic & (disc >= 0.0) & (q != 0.0)
    in0 = solved & (0.0 < r0) & (r0 < h)
    in1 = solved & (0.0 < r1) & (r1 < h)
    r = -a0 / a1  # (linear)
    linear = possible & (not quadratic) & (a1 != 0.0) & (0.0 < r) & (r < h)
    found = 2 * (in0 & in1) + (in0 ^ in1) + linear
    first = r0 if in0 else (r1 if in1 else (r if linear else 0.0))
    second = r1 if in0 & in1 else 0.0
    return found, first, second


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


@nb.njit(cache=True, inline="always")
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
    start: int,
    heads: np.ndarray,
) -> int:
    """Every axle-on-break position of axles s0:s1 over ``breaks[row, :n]``, in order.

    Axle k reaches break i when the front axle is at ``breaks[row, i] + sigma *
    offsets[k]``. The positions come as n lists (one per break) already sorted,
    because the offsets are monotone: an n-way merge sorts them. Fills
    ``event_q`` (front-axle position), ``event_break`` and ``event_load`` from
    index ``start`` on; returns how many.
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
        event_q[start + t] = best
        event_break[start + t] = pick
        event_load[start + t] = loads[s0 + (j if sigma > 0 else k_axles - 1 - j)]
    return total


@nb.njit(cache=True, inline="always")
def _merge(
    shared: tuple[np.ndarray, np.ndarray, np.ndarray, int],
    own: tuple[np.ndarray, np.ndarray, np.ndarray, int, int],
    first_own: int,
    event_q: np.ndarray,
    su: tuple[int, int],
    event_break: np.ndarray,
    event_load: np.ndarray,
    before: np.ndarray,
) -> int:
    """A bundle's events: the shared breaks' (sorted once) merged with its own.

    ``own`` holds the bundle's own events (positions, breaks, loads) from index
    ``start`` on, ``n`` of them, sorted; an own event's break is counted from
    ``first_own``. At equal positions the shared event comes first. Fills
    ``event_q[su]`` (positions), ``event_break`` and ``event_load``; returns
    how many events. Each event's place is counted, not searched for (which way a
    merge goes is unpredictable, and a count has no branches and vectorises):
    an own event goes after the shared events at or before it and the own
    events before it, a shared event after the own events before it.
    """
    sq, sb, sl, n_s = shared
    oq, ob, ol, start, n_o = own
    for i in range(n_s):
        before[i] = 0
    for k in range(n_o):
        x = oq[start + k]
        later = 0
        for i in range(n_s):
            passed = x < sq[i]
            before[i] += passed
            later += passed
        t = n_s - later + k
        event_q[su[0], su[1], t] = x
        event_break[t] = first_own + ob[start + k]
        event_load[t] = ol[start + k]
    for i in range(n_s):
        t = i + before[i]
        event_q[su[0], su[1], t] = sq[i]
        event_break[t] = sb[i]
        event_load[t] = sl[i]
    return n_s + n_o


@nb.njit(cache=True, inline="always")
def _positions(event_q: np.ndarray, su: tuple[int, int], total: int, tol: float) -> None:
    """Put events within ``tol`` of each other at one position, in ``event_q[su]``, in place.

    An event within ``tol`` of the first event of the position before it joins
    that position (its front-axle position becomes that event's). Most event
    lists have no such pair; a loop without branches finds that out, and only
    then is the list walked. Sets ``event_q[su + (total,)]`` to infinity (no event).
    """
    s, u = su
    close = 0
    for t in range(1, total):
        close += event_q[s, u, t] - event_q[s, u, t - 1] <= tol
    if close:
        qg = event_q[s, u, 0]
        for t in range(1, total):
            if event_q[s, u, t] - qg <= tol:
                event_q[s, u, t] = qg
            else:
                qg = event_q[s, u, t]
    event_q[s, u, total] = np.inf


#: Float64 lanes of one vector (AVX-512): the loops over lines run over whole vectors.
LANES = 8


class Sweep(NamedTuple):
    """Workspace of :func:`_sweep`, made once per call by :func:`_sweeps`.

    ``state[s, :, t, r]`` and ``event_q[s, u, t]`` hold sweep s (of the rigid
    train, or of each group of a chain) of line r (bundle u) at its event t (see
    :func:`_carry_pair`); ``n_events[s, u]`` how many events bundle u has. The
    rest is scratch.
    """

    state: NDArray[np.float64]
    event_q: NDArray[np.float64]
    n_events: NDArray[np.int64]
    event_break: NDArray[np.int64]
    event_load: NDArray[np.float64]
    shared_q: NDArray[np.float64]
    shared_break: NDArray[np.int64]
    shared_load: NDArray[np.float64]
    own_q: NDArray[np.float64]
    own_break: NDArray[np.int64]
    own_load: NDArray[np.float64]
    heads: NDArray[np.int64]
    before: NDArray[np.int64]


@nb.njit(cache=True, inline="always")
def _sweeps(plan: SweepPlan, k_max: int, n_sweeps: int, rows: int) -> Sweep:
    """Workspace for ``n_sweeps`` sweeps of trains of up to ``k_max`` axles over ``plan``.

    ``rows`` per line and event: 6 for a sweep, 11 with its stationary points
    (:func:`_stationary_points`).
    """
    n_bundles = plan.counts.size
    # Whole vectors (no scalar remainder loops), and a lane after the last line.
    n_lanes = (plan.order.size // LANES + 1) * LANES
    width = plan.breaks.shape[1]
    n_max = width * k_max
    own_max = plan.extra.shape[1] * k_max
    return Sweep(
        state=np.zeros((n_sweeps, rows, n_max, n_lanes)),
        event_q=np.empty((n_sweeps, n_bundles, n_max + 1)),
        n_events=np.zeros((n_sweeps, n_bundles), dtype=np.int64),
        event_break=np.empty(n_max, dtype=np.int64),
        event_load=np.empty(n_max),
        shared_q=np.empty(n_max),
        shared_break=np.empty(n_max, dtype=np.int64),
        shared_load=np.empty(n_max),
        own_q=np.empty(n_bundles * own_max),
        own_break=np.empty(n_bundles * own_max, dtype=np.int64),
        own_load=np.empty(n_bundles * own_max),
        heads=np.empty(width, dtype=np.int64),
        before=np.empty(n_max, dtype=np.int64),
    )


@nb.njit(cache=True, inline="always")
def _carry_pair(
    jumps: np.ndarray,
    ra: int,
    rb: int,
    events: tuple[np.ndarray, int, int, np.ndarray, np.ndarray, int],
    n_steps: int,
    state: np.ndarray,
) -> None:
    """Lines ``ra`` and ``rb`` of ``jumps`` under one rigid train, at each of its events.

    ``events`` are the train's events: their front-axle positions
    ``event_q[s, u]`` (those at one position adjacent, see :func:`_positions`),
    breaks and loads, and how many. Each cubic E(q) is carried from one
    position to the next by an exact Taylor shift (by zero within a position)
    and each crossing axle's jump is added. Writes, for event t and line r,
    ``state[s, :, t, r]``: the limits from the left and from the right at its
    position, the slope, curvature/2 and third derivative/6 of the cubic that
    starts there, and the length of the interval to the next position (zero if
    the next event shares this one's position, and at the last). Where events
    share a position, both limits of all but its last are the limit from the
    left, so that no value with only some of the axles across is ever a
    candidate. Events from the last to ``n_steps`` get zeros (the train off the
    member: nothing passes an extreme held, which is never below zero or above
    it).

    Two lines go side by side, in registers, so that their arithmetic
    overlaps; the rest is left to loops that run across lines and vectorise.
    Line rb is written in lane ra + 1 even when it is ra itself (an odd line
    out): one address for both, and the lane after is carried later or unused.
    """
    event_q, s, u, event_break, event_load, total = events
    a0 = a1 = a2 = a3 = 0.0
    b0 = b1 = b2 = b3 = 0.0
    left_a = left_b = 0.0  # the train off the member, before any event
    q_prev = event_q[s, u, 0]
    for t in range(total):
        qg = event_q[s, u, t]
        d = qg - q_prev  # (> 0 at a new position, 0 within one)
        a0, a1, a2, a3 = _shift(a0, a1, a2, a3, d)
        b0, b1, b2, b3 = _shift(b0, b1, b2, b3, d)
        left_a = a0 if d > 0.0 else left_a
        left_b = b0 if d > 0.0 else left_b
        brk = event_break[t]
        p = event_load[t]
        a0 += p * jumps[ra, brk, 0]
        a1 += p * jumps[ra, brk, 1]
        a2 += p * jumps[ra, brk, 2]
        a3 += p * jumps[ra, brk, 3]
        b0 += p * jumps[rb, brk, 0]
        b1 += p * jumps[rb, brk, 1]
        b2 += p * jumps[rb, brk, 2]
        b3 += p * jumps[rb, brk, 3]
        h = event_q[s, u, t + 1] - qg
        last = h > 0.0
        h = h if t + 1 < total else 0.0
        state[s, 0, t, ra] = left_a
        state[s, 1, t, ra] = a0 if last else left_a
        state[s, 2, t, ra] = a1
        state[s, 3, t, ra] = a2
        state[s, 4, t, ra] = a3
        state[s, 5, t, ra] = h
        state[s, 0, t, ra + 1] = left_b
        state[s, 1, t, ra + 1] = b0 if last else left_b
        state[s, 2, t, ra + 1] = b1
        state[s, 3, t, ra + 1] = b2
        state[s, 4, t, ra + 1] = b3
        state[s, 5, t, ra + 1] = h
        q_prev = qg
    for t in range(total, n_steps):
        for c in range(6):
            state[s, c, t, ra] = 0.0
            state[s, c, t, ra + 1] = 0.0


@nb.njit(cache=True, inline="always")
def _sweep(
    plan: SweepPlan,
    loads: np.ndarray,
    offsets: np.ndarray,
    s0: int,
    s1: int,
    sigma: float,
    tol: float,
    work: Sweep,
    s: int,
) -> int:
    """Sweep s: every line under the rigid train of axles s0:s1, in direction ``sigma``.

    The positions where axles cross the breaks every bundle has are sorted
    once, each bundle's own are merged in (:func:`_merge`, :func:`_positions`)
    and its lines are carried two at a time (:func:`_carry_pair`). Fills
    ``work.state[s]``, ``work.event_q[s]`` and ``work.n_events[s]``; returns
    the most events of any bundle (the others' lines are padded to it).
    """
    bundle_start, counts, jumps = plan.bundle_start, plan.counts, plan.jumps
    n_common = plan.shared.shape[1]
    stride = plan.extra.shape[1] * (s1 - s0)
    n_shared = _events(
        plan.shared, 0, n_common, loads, offsets, s0, s1, sigma,
        work.shared_q, work.shared_break, work.shared_load, 0, work.heads,
    )  # fmt: skip
    shared = (work.shared_q, work.shared_break, work.shared_load, n_shared)
    n_steps = 0
    for u in range(counts.size):
        work.n_events[s, u] = n_shared + _events(
            plan.extra, u, plan.n_extra[u], loads, offsets, s0, s1, sigma,
            work.own_q, work.own_break, work.own_load, u * stride, work.heads,
        )  # fmt: skip
        n_steps = max(n_steps, work.n_events[s, u])
    for u in range(counts.size):
        n_own = work.n_events[s, u] - n_shared
        own = (work.own_q, work.own_break, work.own_load, u * stride, n_own)
        total = _merge(
            shared, own, n_common, work.event_q, (s, u), work.event_break, work.event_load,
            work.before,
        )  # fmt: skip
        _positions(work.event_q, (s, u), total, tol)
        events = (work.event_q, s, u, work.event_break, work.event_load, total)
        r1 = bundle_start[u + 1]
        for ra in range(bundle_start[u], r1, 2):
            rb = min(ra + 1, r1 - 1)  # an odd line out goes twice
            _carry_pair(jumps, ra, rb, events, n_steps, work.state)
    return n_steps


@nb.njit(cache=True, inline="always")
def _settle(work: Sweep, n_steps: int, at: np.ndarray, line: np.ndarray, index: np.ndarray) -> None:
    """Every line's extremes from sweep 0 (see :func:`_carry_pair`).

    Line r is in bundle ``at[r]``. ``line[0:4, r]`` hold its largest value and
    position, then its smallest and position, known so far (from other trains
    or the other direction); they are updated where this train passes them:
    first by the one-sided limits (at the first position in sweep order that
    passes, as a scan with strict comparisons keeps), then by the stationary
    points of the intervals between events. ``index`` is workspace.

    A cubic lies inside the hull of its four Bernstein control points, so an
    interval whose two inner points do not pass the extremes held cannot hold a
    better stationary point; only the intervals from the first to the last that
    does pass (for the largest value, and for the smallest) are solved, in
    position order, each tested again against the extremes as they grow. The
    loops over events run across all lines at once, without branches, so the
    compiler vectorises them.
    """
    state = work.state
    n = line.shape[1]
    for r in range(n):
        index[0, r] = -1  # where the limits pass the largest value held
        index[1, r] = -1  # ... and the smallest
    for t in range(n_steps):
        for r in range(n):
            left = state[0, 0, t, r]
            right = state[0, 1, t, r]
            v = max(left, right)
            up = v > line[0, r]
            index[0, r] = t if up else index[0, r]
            line[0, r] = v if up else line[0, r]
            v = min(left, right)
            down = v < line[2, r]
            index[1, r] = t if down else index[1, r]
            line[2, r] = v if down else line[2, r]
    for r in range(n):
        index[2, r] = n_steps  # the first and last interval that can pass the largest value
        index[3, r] = -1
        index[4, r] = n_steps  # ... and the smallest
        index[5, r] = -1
    for t in range(n_steps):
        for r in range(n):
            h = state[0, 5, t, r]
            third = h * (1.0 / 3.0)
            a0 = state[0, 1, t, r]
            a1 = state[0, 2, t, r]
            inner1 = a0 + a1 * third
            inner2 = a0 + (2.0 * a1 + state[0, 3, t, r] * h) * third
            up = (h > 0.0) & ((inner1 > line[0, r]) | (inner2 > line[0, r]))
            down = (h > 0.0) & ((inner1 < line[2, r]) | (inner2 < line[2, r]))
            index[2, r] = min(index[2, r], t if up else n_steps)
            index[3, r] = max(index[3, r], t if up else -1)
            index[4, r] = min(index[4, r], t if down else n_steps)
            index[5, r] = max(index[5, r], t if down else -1)
    for r in range(n):
        u = at[r]
        top = line[0, r]
        top_p = line[1, r] if index[0, r] < 0 else work.event_q[0, u, index[0, r]]
        bottom = line[2, r]
        bottom_p = line[3, r] if index[1, r] < 0 else work.event_q[0, u, index[1, r]]
        # The intervals that can pass the largest value and those for the smallest:
        # both runs in position order, each interval once, none between the runs.
        a_from, a_to, b_from, b_to = index[2, r], index[3, r], index[4, r], index[5, r]
        if a_to < a_from:
            a_from, a_to = b_from, b_to
        if b_to < b_from:
            b_from, b_to = a_from, a_to
        gap_from = min(a_to, b_to)
        gap_to = max(a_from, b_from)
        for t in range(min(a_from, b_from), max(a_to, b_to) + 1):
            if gap_from < t < gap_to:
                continue
            h = state[0, 5, t, r]
            a0 = state[0, 1, t, r]
            a1 = state[0, 2, t, r]
            a2 = state[0, 3, t, r]
            third = h * (1.0 / 3.0)
            inner1 = a0 + a1 * third
            inner2 = a0 + (2.0 * a1 + a2 * h) * third
            if h == 0.0 or (max(inner1, inner2) <= top and min(inner1, inner2) >= bottom):
                continue
            a3 = state[0, 4, t, r]
            found, t0, t1 = _quad_roots(a1, 2.0 * a2, 3.0 * a3, h)
            for k in range(found):
                x = t0 if k == 0 else t1
                v = ((a3 * x + a2) * x + a1) * x + a0
                if v > top:
                    top = v
                    top_p = work.event_q[0, u, t] + x
                if v < bottom:
                    bottom = v
                    bottom_p = work.event_q[0, u, t] + x
        line[0, r] = top
        line[1, r] = top_p
        line[2, r] = bottom
        line[3, r] = bottom_p


@nb.njit(cache=True, inline="always")
def _bundle_of(plan: SweepPlan, n_lanes: int) -> np.ndarray:
    """The bundle of each line (0 for the lanes after the last)."""
    at = np.zeros(n_lanes, dtype=np.int64)
    for u in range(plan.counts.size):
        at[plan.bundle_start[u] : plan.bundle_start[u + 1]] = u
    return at


@nb.njit(cache=True, error_model="numpy")
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
    gaps: np.ndarray,
    ranged: np.ndarray,
) -> None:
    """The governing extremes of many rigid axle trains (fixed spacings), kept in ``out``.

    Train i has axles ``case_start[i]:case_start[i + 1]`` of ``loads`` with
    ``offsets`` behind its front axle; every train is swept in each direction
    of ``sigmas``. Row ``case_row[i]`` of ``out`` (arrays of shape (rows,
    n_effects)) keeps whichever is worse, the extreme held or the train's:
    the maximum, its front-axle position and direction, then the same for the
    minimum, each only if ``keep`` says so (maximum, minimum). Rows start from
    0 with position NaN and direction 0 (the train off the member). Where a
    train's extreme is kept, so are the spacings of its ranged gaps (see
    :data:`Governing`): train i's gaps are ``gaps[case_start[i] - i:]`` (one
    fewer than its axles), ``ranged[i]`` (W, padded with -1) says which of
    them were given as ranges.

    Each train and direction is one sweep of every line (:func:`_sweep`),
    then every line is settled at once (:func:`_settle`).
    """
    order = plan.order
    n_rows = order.size
    k_max = 1
    for case in range(case_start.size - 1):
        k_max = max(k_max, case_start[case + 1] - case_start[case])
    work = _sweeps(plan, k_max, 1, 6)
    n_lanes = work.state.shape[3]
    at = _bundle_of(plan, n_lanes)
    line = np.zeros((4, n_lanes))
    index = np.empty((6, n_lanes), dtype=np.int64)
    max_v, max_p, max_d, min_v, min_p, min_d, max_s, min_s = out
    width = ranged.shape[1]
    for case in range(case_start.size - 1):
        i = case_row[case]
        first_gap = case_start[case] - case
        for si in range(sigmas.size):
            sigma = sigmas[si]
            n_steps = _sweep(
                plan, loads, offsets, case_start[case], case_start[case + 1], sigma, tol, work, 0
            )
            for r in range(n_rows):
                e = order[r]
                # An extreme not kept is held at infinity: nothing passes it, so no
                # interval is solved for it.
                line[0, r] = max_v[i, e] if keep[0] else np.inf
                line[1, r] = max_p[i, e]
                line[2, r] = min_v[i, e] if keep[1] else -np.inf
                line[3, r] = min_p[i, e]
            _settle(work, n_steps, at, line, index)
            for r in range(n_rows):
                e = order[r]
                if keep[0] and line[0, r] > max_v[i, e]:
                    max_v[i, e] = line[0, r]
                    max_p[i, e] = line[1, r]
                    max_d[i, e] = np.int8(sigma)
                    for w in range(width):
                        g = ranged[case, w]
                        max_s[i, e, w] = gaps[first_gap + g] if g >= 0 else np.nan
                if keep[1] and line[2, r] < min_v[i, e]:
                    min_v[i, e] = line[2, r]
                    min_p[i, e] = line[3, r]
                    min_d[i, e] = np.int8(sigma)
                    for w in range(width):
                        g = ranged[case, w]
                        min_s[i, e, w] = gaps[first_gap + g] if g >= 0 else np.nan
    _copy(plan, out)


@nb.njit(cache=True, inline="always")
def _bounds(work: Sweep, s: int, n_steps: int, bound: np.ndarray) -> None:
    """``bound[s, 0, r]`` and ``bound[s, 1, r]``: above and below every value of sweep s's line r.

    The limits and the inner Bernstein control points of every interval (a
    cubic lies within the hull of its control points). One loop across all
    lines at once, without branches, so the compiler vectorises it.
    """
    state = work.state
    n = state.shape[3]
    for r in range(n):
        bound[s, 0, r] = 0.0  # the train off the member
        bound[s, 1, r] = 0.0
    for t in range(n_steps):
        for r in range(n):
            h = state[s, 5, t, r]
            third = h * (1.0 / 3.0)
            a0 = state[s, 1, t, r]
            a1 = state[s, 2, t, r]
            inner1 = a0 + a1 * third
            inner2 = a0 + (2.0 * a1 + 3.0 * state[s, 3, t, r] * third) * third
            high = max(state[s, 0, t, r], a0)
            low = min(state[s, 0, t, r], a0)
            high = max(high, max(inner1, inner2)) if h > 0.0 else high
            low = min(low, min(inner1, inner2)) if h > 0.0 else low
            bound[s, 0, r] = max(bound[s, 0, r], high)
            bound[s, 1, r] = min(bound[s, 1, r], low)


@nb.njit(cache=True, error_model="numpy")
def _stationary_points(state: np.ndarray, s: int, n_steps: int) -> None:
    """The stationary points of every interval of sweep s, of every line at once.

    Writes, per event t and line r, ``state[s, 6:11, t, r]``: how many
    stationary points the cubic of the interval that starts there has strictly
    inside it (0, 1 or 2, by :func:`_quad_roots`), their distances from the
    event in ascending order, and the cubic's values there. The loop runs
    across lines without branches and vectorises.
    """
    n = state.shape[3]
    for t in range(n_steps):
        for r in range(n):
            h = state[s, 5, t, r]
            a0 = state[s, 1, t, r]
            a1 = state[s, 2, t, r]
            a2 = state[s, 3, t, r]
            a3 = state[s, 4, t, r]
            found, x0, x1 = _quad_roots(a1, 2.0 * a2, 3.0 * a3, h)
            x1 = x1 if found == 2 else x0
            low = min(x0, x1)
            high = max(x0, x1)
            state[s, 6, t, r] = found
            state[s, 7, t, r] = low
            state[s, 8, t, r] = high
            state[s, 9, t, r] = ((a3 * low + a2) * low + a1) * low + a0
            state[s, 10, t, r] = ((a3 * high + a2) * high + a1) * high + a0


@nb.njit(cache=True, inline="always")
def _candidates(
    work: Sweep,
    s: int,
    r: int,
    u: int,
    sense: float,
    floor: float,
    pos: np.ndarray,
    val: np.ndarray,
) -> int:
    """Sweep s's candidates for line r (bundle u) whose ``sense * value`` passes ``floor``.

    Candidates are the better limit at each event position and the stationary
    points of each interval's cubic (found by :func:`_stationary_points`),
    taken only where a Bernstein control point passes the floor; they go to
    ``pos[s]`` and ``val[s]`` (values multiplied by ``sense``) in position
    order. Returns how many. Every slot is written and kept or not by a
    select, not a branch (whether a candidate passes is unpredictable).
    """
    state = work.state
    n = work.n_events[s, u]
    count = 0
    for t in range(n):
        q = work.event_q[s, u, t]
        h = state[s, 5, t, r]
        # The limits, at the last event of each position (the others share it).
        v = max(sense * state[s, 0, t, r], sense * state[s, 1, t, r])
        pos[s, count] = q
        val[s, count] = v
        count += ((h > 0.0) | (t == n - 1)) & (v > floor)
        a0 = state[s, 1, t, r]
        a1 = state[s, 2, t, r]
        third = h * (1.0 / 3.0)
        inner1 = sense * (a0 + a1 * third)
        inner2 = sense * (a0 + (2.0 * a1 + state[s, 3, t, r] * h) * third)
        passes = (h > 0.0) & (max(inner1, inner2) > floor)
        found = state[s, 6, t, r]
        for k in range(2):
            v = sense * state[s, 9 + k, t, r]
            pos[s, count] = q + state[s, 7 + k, t, r]
            val[s, count] = v
            count += passes & (k < found) & (v > floor)
    return count


class Join(NamedTuple):
    """Workspace of the join of a chain's groups (see :func:`_chain`)."""

    bound: NDArray[np.float64]
    pos: NDArray[np.float64]
    val: NDArray[np.float64]
    ncand: NDArray[np.int64]
    best: NDArray[np.float64]
    nxt: NDArray[np.float64]
    choice: NDArray[np.int64]
    window: NDArray[np.int64]


@nb.njit(cache=True, inline="always")
def _joins(work: Sweep, n_groups: int) -> Join:
    """Workspace to join up to ``n_groups`` groups swept in ``work``."""
    max_c = 3 * work.state.shape[2] + 2
    return Join(
        bound=np.empty((n_groups, 2, work.state.shape[3])),
        pos=np.empty((n_groups, max_c)),
        val=np.empty((n_groups, max_c)),
        ncand=np.empty(n_groups, dtype=np.int64),
        best=np.empty(max_c),
        nxt=np.empty(max_c),
        choice=np.zeros((max(n_groups - 1, 1), max_c), dtype=np.int64),
        window=np.empty(max_c, dtype=np.int64),
    )


@nb.njit(cache=True, inline="always")
def _chain(
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
    work: Sweep,
    join: Join,
    out: tuple[np.ndarray, np.ndarray, np.ndarray],
) -> None:
    """:func:`chain_extremes` into ``out`` (values, positions, distances), with workspace."""
    order, bundle_start = plan.order, plan.bundle_start
    n_groups = group_start.size - 1
    n_gaps = max(n_groups - 1, 0)
    out_v, out_p, out_d = out
    for g in range(n_groups):
        n_steps = _sweep(
            plan, loads, offsets, group_start[g], group_start[g + 1], sigma, tol, work, g
        )
        _bounds(work, g, n_steps, join.bound)
        _stationary_points(work.state, g, n_steps)
    pos, val, ncand, nxt, best, choice, window = (
        join.pos, join.val, join.ncand, join.nxt, join.best, join.choice, join.window
    )  # fmt: skip
    for u in range(plan.counts.size):
        for row in range(bundle_start[u], bundle_start[u + 1]):
            e = order[row]
            for sense_i in range(2):
                sense = 1.0 if sense_i == 0 else -1.0
                out_v[sense_i, e] = -sense * np.inf
                out_p[sense_i, e] = np.nan
                # In the sense's own terms (maximise sense * value): what must be passed,
                # and the most all the groups together could give.
                held = sense * (held_max[e] if sense_i == 0 else held_min[e])
                reach = 0.0
                for g in range(n_groups):
                    reach += sense * join.bound[g, sense_i, row]
                if reach <= held:
                    continue
                for g in range(n_groups):
                    floor = held - (reach - sense * join.bound[g, sense_i, row])
                    ncand[g] = _candidates(work, g, row, u, sense, floor, pos, val)
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

    Each group is swept as a rigid train (:func:`_sweep`). Only values that
    pass ``held_max`` (or fall below ``held_min``), the extremes already known
    per effect, are sought: a candidate of one group whose value plus the other
    groups' upper bounds cannot pass them is dropped before the join, and where
    none can, the result is -inf (or +inf) with position NaN.
    """
    n_groups = group_start.size - 1
    k_max = 1
    for g in range(n_groups):
        k_max = max(k_max, group_start[g + 1] - group_start[g])
    work = _sweeps(plan, k_max, n_groups, 11)
    join = _joins(work, n_groups)
    n_eff = plan.n_effects
    out_v = np.empty((2, n_eff))
    out_v[0] = -np.inf  # (what a line that is zero everywhere gives: nothing passes)
    out_v[1] = np.inf
    out = (out_v, np.full((2, n_eff), np.nan), np.zeros((2, n_eff, n_groups - 1)))
    _chain(
        plan, loads, offsets, group_start, gap_lo, gap_hi, sigma, tol, held_max, held_min,
        work, join, out,
    )  # fmt: skip
    out_p, out_d = out[1], out[2]
    for c in range(plan.copies.shape[0]):
        e, source = plan.copies[c, 0], plan.copies[c, 1]
        out_v[:, e] = out_v[:, source]
        out_p[:, e] = out_p[:, source]
        out_d[:, e] = out_d[:, source]
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
    gaps: np.ndarray,
    ranged: np.ndarray,
) -> None:
    """:func:`chain_extremes` of many chains in one call, kept in ``out`` as :func:`fleet_extremes`.

    Chain j has axles ``job_start[j]:job_start[j + 1]``; ``group_start[j]``
    (padded with -1) delimits its groups relative to its first axle, and
    ``gap_lo[j]``/``gap_hi[j]`` bound its front-to-front distances. Where a
    chain's extreme is kept, so are the spacings of its ranged gaps, given as in
    :func:`fleet_extremes` (``gaps``, ``ranged``): a gap between two groups is
    the front-to-front distance the join found less the length of the group in
    front of it. The workspace is made once, for the largest.
    """
    max_v, max_p, max_d, min_v, min_p, min_d, max_s, min_s = out
    n_eff = max_v.shape[1]
    # An extreme not kept is held at infinity, so the join never seeks it.
    never_above = np.full(n_eff, np.inf)
    never_below = np.full(n_eff, -np.inf)
    most_groups = group_start.shape[1] - 1
    k_max = 1
    for job in range(job_row.size):
        for g in range(most_groups):
            if group_start[job, g + 1] >= 0:
                k_max = max(k_max, group_start[job, g + 1] - group_start[job, g])
    work = _sweeps(plan, k_max, most_groups, 11)
    join = _joins(work, most_groups)
    found_v = np.empty((2, n_eff))
    found_v[0] = -np.inf  # (lines not swept: nothing passes)
    found_v[1] = np.inf
    found = (found_v, np.full((2, n_eff), np.nan), np.zeros((2, n_eff, most_groups)))
    for job in range(job_row.size):
        a0 = job_start[job]
        n_groups = 0
        while n_groups + 1 < group_start.shape[1] and group_start[job, n_groups + 1] >= 0:
            n_groups += 1
        i = job_row[job]
        for si in range(sigmas.size):
            sigma = sigmas[si]
            _chain(
                plan, loads[a0:], offsets[a0:], group_start[job, : n_groups + 1],
                gap_lo[job], gap_hi[job], sigma, tol,
                max_v[i] if keep[0] else never_above, min_v[i] if keep[1] else never_below,
                work, join, found,
            )  # fmt: skip
            high, low = found[0][0], found[0][1]
            for e in range(n_eff):
                if keep[0] and high[e] > max_v[i, e]:
                    max_v[i, e] = high[e]
                    max_p[i, e] = found[1][0, e]
                    max_d[i, e] = np.int8(sigma)
                    _chain_spacing(max_s, i, e, 0, found[2], gaps, ranged, job, a0, offsets,
                                   group_start, n_groups)  # fmt: skip
                if keep[1] and low[e] < min_v[i, e]:
                    min_v[i, e] = low[e]
                    min_p[i, e] = found[1][1, e]
                    min_d[i, e] = np.int8(sigma)
                    _chain_spacing(min_s, i, e, 1, found[2], gaps, ranged, job, a0, offsets,
                                   group_start, n_groups)  # fmt: skip
    _copy(plan, out)


@nb.njit(cache=True, inline="always")
def _chain_spacing(
    kept: np.ndarray,
    i: int,
    e: int,
    sense: int,
    distance: np.ndarray,
    gaps: np.ndarray,
    ranged: np.ndarray,
    job: int,
    a0: int,
    offsets: np.ndarray,
    group_start: np.ndarray,
    n_groups: int,
) -> None:
    """``kept[i, e]``: the spacing of each ranged gap of chain ``job`` where it governs.

    A gap between groups k and k + 1 (the gap before the first axle of group
    k + 1) is the front-to-front ``distance[sense, e, k]`` less group k's own
    length (the offset of its last axle); any other is the chain's own.
    """
    for w in range(ranged.shape[1]):
        g = ranged[job, w]
        value = gaps[a0 - job + g] if g >= 0 else np.nan
        for k in range(n_groups - 1):
            if g >= 0 and group_start[job, k + 1] - 1 == g:
                value = distance[sense, e, k] - offsets[a0 + g]
        kept[i, e, w] = value


@nb.njit(cache=True)
def _cubic_at(c0: float, c1: float, c2: float, c3: float, t: float) -> float:
    return ((c3 * t + c2) * t + c1) * t + c0


@nb.njit(cache=True, error_model="numpy")
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
