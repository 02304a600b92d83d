"""Vectorised real roots of quadratics and cubics on an interval.

Used to find the stationary points of a load train's effect (roots of a
quadratic derivative) and the zero crossings of influence-line pieces (roots of
a cubic), both to machine precision and without any stepping.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import NDArray

__all__ = ["cubic_roots_in", "quadratic_roots_in"]

_BISECTIONS = 64


def quadratic_roots_in(
    a0: NDArray[np.float64],
    a1: NDArray[np.float64],
    a2: NDArray[np.float64],
    h: NDArray[np.float64],
) -> NDArray[np.float64]:
    """Real roots of ``a0 + a1 t + a2 t^2`` strictly inside ``(0, h)``.

    Works element-wise on broadcast arrays; returns shape ``(..., 2)`` with NaN
    where there is no such root. Uses the cancellation-free form of the
    quadratic formula; a vanishing ``a2`` falls back to the linear root.
    """
    a0, a1, a2, h = np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in (a0, a1, a2, h)))
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        scale = np.abs(a0) + np.abs(a1) * h + np.abs(a2) * h * h
        quad = np.abs(a2) * h * h > 1e-14 * scale
        disc = a1 * a1 - 4.0 * a2 * a0
        sq = np.sqrt(np.where(disc >= 0, disc, np.nan))
        q = -0.5 * (a1 + np.copysign(sq, a1))
        r1 = np.where(quad, q / a2, -a0 / a1)
        r2 = np.where(quad, a0 / q, np.nan)
        roots = np.stack([r1, r2], axis=-1)
    inside = (roots > 0) & (roots < h[..., None])
    return np.where(inside, roots, np.nan)


def _cubic(c: tuple[NDArray[np.float64], ...], t: NDArray[np.float64]) -> NDArray[np.float64]:
    return ((c[3] * t + c[2]) * t + c[1]) * t + c[0]


def cubic_roots_in(
    c0: NDArray[np.float64],
    c1: NDArray[np.float64],
    c2: NDArray[np.float64],
    c3: NDArray[np.float64],
    h: NDArray[np.float64],
) -> NDArray[np.float64]:
    """Sign-changing real roots of ``c0 + c1 t + c2 t^2 + c3 t^3`` inside ``(0, h)``.

    The stationary points split ``[0, h]`` into at most three monotone parts;
    a root is bracketed in each part whose ends differ in sign and refined by
    bisection to machine precision. Returns shape ``(..., 3)``, NaN-padded.
    Touching (double) roots do not change sign and are not needed by callers.
    """
    c = tuple(np.asarray(v, dtype=float) for v in np.broadcast_arrays(c0, c1, c2, c3, h))
    hh = c[4]
    coefs = c[:4]
    crit = quadratic_roots_in(coefs[1], 2.0 * coefs[2], 3.0 * coefs[3], hh)
    crit = np.sort(np.where(np.isnan(crit), hh[..., None], crit), axis=-1)
    edges = np.concatenate([np.zeros((*hh.shape, 1)), crit, hh[..., None]], axis=-1)
    lo, hi = edges[..., :-1], edges[..., 1:]
    cb = tuple(v[..., None] for v in coefs)
    flo, fhi = _cubic(cb, lo), _cubic(cb, hi)
    bracket = (hi > lo) & (np.sign(flo) * np.sign(fhi) < 0)
    rising = fhi > flo
    for _ in range(_BISECTIONS):
        mid = 0.5 * (lo + hi)
        above = _cubic(cb, mid) > 0
        go_low = above == rising  # root lies in the lower half
        hi = np.where(go_low, mid, hi)
        lo = np.where(go_low, lo, mid)
    return np.where(bracket, 0.5 * (lo + hi), np.nan)
