"""Compiled inner loop of the moving-load sweep (numba).

For each influence line (on its own minimal partition, see
``InfluenceLines.reduced``) and each rigid group of axles, every candidate
front-axle position is evaluated exactly: each position where some axle sits
on a break (both one-sided limits), and each stationary point of the cubic
between consecutive such positions. Groups separated by a free (ranged) gap are
then joined by a dynamic programme over their candidates that keeps the gap
within its range. See :mod:`batch.engine.moving` for why this is exact.

Everything here is plain loops over small arrays; the caller passes signed
offsets (``sigma * d_k``) so one code path serves both directions.
"""

from __future__ import annotations

import numba as nb
import numpy as np

__all__ = ["chain_extremes", "cubic_crossings", "fleet_extremes"]


@nb.njit(cache=True)
def _piece_ends(breaks: np.ndarray, counts: np.ndarray, coef: np.ndarray) -> np.ndarray:
    """Taylor coefficients of every piece about its right end (value, slope, ...)."""
    ends = np.zeros(coef.shape)
    for e in range(coef.shape[0]):
        for j in range(counts[e] - 1):
            h = breaks[e, j + 1] - breaks[e, j]
            c0, c1, c2, c3 = coef[e, j, 0], coef[e, j, 1], coef[e, j, 2], coef[e, j, 3]
            ends[e, j, 0] = ((c3 * h + c2) * h + c1) * h + c0
            ends[e, j, 1] = (3.0 * c3 * h + 2.0 * c2) * h + c1
            ends[e, j, 2] = 3.0 * c3 * h + c2
            ends[e, j, 3] = c3
    return ends


@nb.njit(cache=True)
def _quad_roots(a0: float, a1: float, a2: float, h: float, out: np.ndarray) -> int:
    """Roots of a0 + a1 t + a2 t^2 strictly inside (0, h); returns how many were written."""
    # Most intervals hold no root: the ends have one sign and the vertex lies outside.
    end = a0 + h * (a1 + h * a2)
    if a0 * end > 0.0:
        twice = 2.0 * a2 * h
        vertex_inside = (0.0 < -a1 < twice) if a2 > 0.0 else (twice < -a1 < 0.0)
        if not vertex_inside:
            return 0
    scale = abs(a0) + abs(a1) * h + abs(a2) * h * h
    count = 0
    if abs(a2) * h * h > 1e-14 * scale:
        disc = a1 * a1 - 4.0 * a2 * a0
        if disc < 0.0:
            return 0
        sq = np.sqrt(disc)
        q = -0.5 * (a1 + sq) if a1 >= 0 else -0.5 * (a1 - sq)
        if q != 0.0:
            r = q / a2
            if 0.0 < r < h:
                out[count] = r
                count += 1
            r = a0 / q
            if 0.0 < r < h:
                out[count] = r
                count += 1
        return count
    if a1 != 0.0:
        r = -a0 / a1
        if 0.0 < r < h:
            out[0] = r
            count = 1
    return count


@nb.njit(cache=True)
def _group_candidates(
    b: np.ndarray,
    n: int,
    c: np.ndarray,
    ends: np.ndarray,
    loads: np.ndarray,
    offs: np.ndarray,
    tol: float,
    pos: np.ndarray,
    val: np.ndarray,
    event_q: np.ndarray,
    event_break: np.ndarray,
    event_load: np.ndarray,
    roots: np.ndarray,
    heads: np.ndarray,
) -> int:
    """Fill pos/val with every candidate of one rigid group; returns the count.

    An *event* is axle k reaching break i, at front position q = b[i] + offs[k].
    Before the first event every axle is off the member (E = 0). Sweeping the
    events in order, the cubic E(q) of the current interval is carried along by
    an exact Taylor shift, and at each event only the crossing axle's piece
    changes: its old piece's expansion about its right end is removed and its
    new piece's expansion about its left end is added. The shifted cubic's
    value at an event is the limit from the left; after the crossings, the
    limit from the right. ``event_q``, ``event_break``, ``event_load`` (n*K), ``roots`` (2) and
    ``heads`` (n) are scratch. ``offs`` must be monotone (a train's offsets are).
    """
    k_axles = loads.size
    total = n * k_axles
    # Events come as n lists (one per break) already sorted by axle, because the
    # offsets are monotone: an n-way merge sorts them in O(n * total).
    ascending = offs[0] <= offs[k_axles - 1]
    for i in range(n):
        heads[i] = 0
    for t in range(total):
        pick = -1
        best = np.inf
        for i in range(n):
            j = heads[i]
            if j < k_axles:
                q = b[i] + offs[j if ascending else k_axles - 1 - j]
                if q < best:
                    best = q
                    pick = i
        j = heads[pick]
        heads[pick] = j + 1
        event_q[t] = best
        event_break[t] = pick
        event_load[t] = loads[j if ascending else k_axles - 1 - j]
    a0 = 0.0
    a1 = 0.0
    a2 = 0.0
    a3 = 0.0
    count = 0
    idx = 0
    q_prev = event_q[0]
    while idx < total:
        qg = event_q[idx]
        d = qg - q_prev
        a0 += d * (a1 + d * (a2 + d * a3))
        a1 += d * (2.0 * a2 + 3.0 * d * a3)
        a2 += 3.0 * d * a3
        pos[count] = qg
        val[count] = a0  # limit from the left
        while idx < total and event_q[idx] - qg <= tol:
            brk = event_break[idx]
            p = event_load[idx]
            if brk >= 1:  # the axle leaves piece brk - 1 at its right end
                a0 -= p * ends[brk - 1, 0]
                a1 -= p * ends[brk - 1, 1]
                a2 -= p * ends[brk - 1, 2]
                a3 -= p * ends[brk - 1, 3]
            if brk <= n - 2:  # and enters piece brk at its left end
                a0 += p * c[brk, 0]
                a1 += p * c[brk, 1]
                a2 += p * c[brk, 2]
                a3 += p * c[brk, 3]
            idx += 1
        pos[count + 1] = qg
        val[count + 1] = a0  # limit from the right
        count += 2
        if idx < total:
            nr = _quad_roots(a1, 2.0 * a2, 3.0 * a3, event_q[idx] - qg, roots)
            for r in range(nr):
                t = roots[r]
                pos[count] = qg + t
                val[count] = ((a3 * t + a2) * t + a1) * t + a0
                count += 1
        q_prev = qg
    return count


@nb.njit(cache=True)
def chain_extremes(
    breaks: np.ndarray,
    counts: np.ndarray,
    coef: np.ndarray,
    loads: np.ndarray,
    offsets: np.ndarray,
    group_start: np.ndarray,
    gap_lo: np.ndarray,
    gap_hi: np.ndarray,
    sigma: float,
    tol: float,
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Largest and smallest effect of a chain of rigid axle groups, per influence line.

    ``offsets[k]`` is axle k's distance behind its group's front axle;
    ``group_start`` (G+1) delimits the groups in the axle arrays; the front of
    group g+1 is ``sigma * (gap_lo[g] .. gap_hi[g])`` behind the front of group g
    (distances that include group g's own length). Returns, per effect, the
    maximum value, the front axle position giving it and the front-to-front
    distances (E, G-1), then the same three for the minimum.
    """
    n_eff = breaks.shape[0]
    n_groups = group_start.size - 1
    n_gaps = max(n_groups - 1, 0)
    width = breaks.shape[1]
    max_c = 0
    for g in range(n_groups):
        kg = group_start[g + 1] - group_start[g]
        max_c = max(max_c, 4 * width * kg + 2)
    pos = np.empty((n_groups, max_c))
    val = np.empty((n_groups, max_c))
    ncand = np.empty(n_groups, dtype=np.int64)
    best = np.empty(max_c)
    nxt = np.empty(max_c)
    choice = np.zeros((max(n_gaps, 1), max_c), dtype=np.int64)
    window = np.empty(max_c, dtype=np.int64)
    event_q = np.empty(width * loads.size)
    event_break = np.empty(width * loads.size, dtype=np.int64)
    event_load = np.empty(width * loads.size)
    root_scratch = np.empty(2)
    heads = np.empty(width, dtype=np.int64)
    signed = sigma * offsets
    ends = _piece_ends(breaks, counts, coef)
    out_v = np.empty((2, n_eff))
    out_p = np.empty((2, n_eff))
    out_d = np.zeros((2, n_eff, n_gaps))
    for e in range(n_eff):
        for g in range(n_groups):
            s0, s1 = group_start[g], group_start[g + 1]
            ncand[g] = _group_candidates(
                breaks[e],
                counts[e],
                coef[e],
                ends[e],
                loads[s0:s1],
                signed[s0:s1],
                tol,
                pos[g],
                val[g],
                event_q,
                event_break,
                event_load,
                root_scratch,
                heads,
            )
        for sense_i in range(2):
            sense = 1.0 if sense_i == 0 else -1.0
            last = n_groups - 1
            for j in range(ncand[last]):
                nxt[j] = sense * val[last, j]
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
                        best[i] = sense * val[g, i] + nxt[window[head]]
                        choice[g, i] = window[head]
                    else:
                        best[i] = -np.inf
                        choice[g, i] = -1
                for i in range(ncand[g]):
                    nxt[i] = best[i]
            top = -np.inf
            arg = 0
            for i in range(ncand[0]):
                if nxt[i] > top:
                    top = nxt[i]
                    arg = i
            out_v[sense_i, e] = sense * top
            out_p[sense_i, e] = pos[0, arg]
            idx = arg
            for g in range(n_gaps):
                nidx = choice[g, idx]
                if nidx < 0:
                    break
                out_d[sense_i, e, g] = sigma * (pos[g, idx] - pos[g + 1, nidx])
                idx = nidx
    return out_v[0], out_p[0], out_d[0], out_v[1], out_p[1], out_d[1]


@nb.njit(cache=True)
def fleet_extremes(
    breaks: np.ndarray,
    counts: np.ndarray,
    coef: np.ndarray,
    loads: np.ndarray,
    offsets: np.ndarray,
    case_start: np.ndarray,
    sigmas: np.ndarray,
    tol: float,
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Extremes of many rigid axle trains (fixed spacings) in one call.

    Train i has axles ``case_start[i]:case_start[i + 1]`` of ``loads`` with
    ``offsets`` behind its front axle; every train is swept in each direction
    of ``sigmas``. Returns, with shape (n_cases, n_effects): the maximum, its
    front-axle position and direction, then the same for the minimum. The
    maximum starts from 0 with position NaN and direction 0 (the train off the
    member), and likewise the minimum.
    """
    n_eff = breaks.shape[0]
    n_cases = case_start.size - 1
    width = breaks.shape[1]
    k_max = 1
    for i in range(n_cases):
        k_max = max(k_max, case_start[i + 1] - case_start[i])
    pos = np.empty(4 * width * k_max + 2)
    val = np.empty(4 * width * k_max + 2)
    event_q = np.empty(width * k_max)
    event_break = np.empty(width * k_max, dtype=np.int64)
    event_load = np.empty(width * k_max)
    root_scratch = np.empty(2)
    heads = np.empty(width, dtype=np.int64)
    ends = _piece_ends(breaks, counts, coef)
    max_v = np.zeros((n_cases, n_eff))
    max_p = np.full((n_cases, n_eff), np.nan)
    max_d = np.zeros((n_cases, n_eff), dtype=np.int8)
    min_v = np.zeros((n_cases, n_eff))
    min_p = np.full((n_cases, n_eff), np.nan)
    min_d = np.zeros((n_cases, n_eff), dtype=np.int8)
    for i in range(n_cases):
        s0, s1 = case_start[i], case_start[i + 1]
        for sigma in sigmas:
            signed = sigma * offsets[s0:s1]
            for e in range(n_eff):
                count = _group_candidates(
                    breaks[e],
                    counts[e],
                    coef[e],
                    ends[e],
                    loads[s0:s1],
                    signed,
                    tol,
                    pos,
                    val,
                    event_q,
                    event_break,
                    event_load,
                    root_scratch,
                    heads,
                )
                for c in range(count):
                    v = val[c]
                    if v > max_v[i, e]:
                        max_v[i, e] = v
                        max_p[i, e] = pos[c]
                        max_d[i, e] = np.int8(sigma)
                    if v < min_v[i, e]:
                        min_v[i, e] = v
                        min_p[i, e] = pos[c]
                        min_d[i, e] = np.int8(sigma)
    return max_v, max_p, max_d, min_v, min_p, min_d


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
    crit = np.empty(2)
    edges = np.empty(4)
    for i in range(flat.shape[0]):
        c0, c1, c2, c3 = flat[i, 0], flat[i, 1], flat[i, 2], flat[i, 3]
        length = hh[i]
        nc = _quad_roots(c1, 2.0 * c2, 3.0 * c3, length, crit)
        if nc == 2 and crit[1] < crit[0]:
            crit[0], crit[1] = crit[1], crit[0]
        edges[0] = 0.0
        for r in range(nc):
            edges[r + 1] = crit[r]
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
