"""Exact influence lines of a continuous girder line with internal hinges.

Method
------
The member is a line of Euler–Bernoulli beam elements between *nodes* (supports,
hinges, the two ends and the ends of stretches of other stiffness), each element
with one constant EI (its span's, or that of the stretch that holds it). For a unit
downward load at a point of an element, the consistent (Hermite) nodal load
vector is the exact fixed-end action, so the direct stiffness method gives exact
nodal displacements and exact support reactions. The reactions are therefore
cubic polynomials of the load position within each element:

    R_i(x) = -sum_l T[i, g_l] * s_l * N_l(xi),   xi = (x - a) / h

with N_l the cubic Hermite shape functions, s = (1, h, 1, h) and T the matrix
that maps nodal loads to support reactions (``K_rf K_ff^-1`` on free degrees of
freedom, ``-I`` on restrained ones). Moment and shear influence lines at a
station then follow from the statics of the part left of the section, so they
are exact piecewise cubics too (piecewise linear where the member is
statically determinate), with their kink or unit jump at the station.

Sign conventions (those of docs/workbook.md)
-------------------------------------------------
* load: a unit force acting downward at position x (from the left end);
* moment: sagging positive;
* shear: V = sum of the upward forces on the part left of the section
  (V = dM/dx); the section is just right of the station, except at station
  fraction 1 of a span, where it is just left;
* reactions: upward positive.

All influence lines are stored on one common partition of [0, L] (nodes and
stations), as power-basis cubic coefficients in the local coordinate
t = x - breaks[j] of each piece.
"""

from __future__ import annotations

import functools
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING, Any

import numpy as np
from numpy.typing import NDArray

from batch.model.exact import Matrix, solve
from batch.model.layout import (
    POSITION_TOL,
    Section,
    mechanism_parts,
    station_index,
    station_positions,
    support_positions,
)

if TYPE_CHECKING:
    from batch.engine.kernel import SweepPlan

__all__ = ["InfluenceLines", "SpanExtremes", "UnstableMemberError", "influence_lines"]

#: Above this condition number (of the diagonally scaled stiffness matrix) the
#: double-precision solve could lose more than about six of its sixteen digits,
#: so it is refined against residuals in exact rational arithmetic (see _Stiffness).
COND_LIMIT = 1e6
#: Above it, the double solution is refined against exact residuals, at most this many
#: times, until a step changes it by less than REFINED of its size.
REFINE_STEPS = 4
REFINED = 1e-15

# Cubic Hermite shape functions in power basis of xi (rows N1..N4, columns xi^0..xi^3).
_HERMITE = np.array(
    [
        [1.0, 0.0, -3.0, 2.0],
        [0.0, 1.0, -2.0, 1.0],
        [0.0, 0.0, 3.0, -2.0],
        [0.0, 0.0, -1.0, 1.0],
    ]
)


@dataclass(frozen=True, kw_only=True)
class SpanExtremes:
    """One extreme ordinate of every line within each span, shape (n_effects, n_spans).

    ``value`` is the ordinate (per unit load), ``position`` where it is reached,
    from the member's left end.
    """

    value: NDArray[np.float64]
    position: NDArray[np.float64]


class UnstableMemberError(ValueError):
    """The supports and hinges of a member leave part of it free to move."""


@dataclass(frozen=True, eq=False)
class InfluenceLines:
    """Influence lines of every effect of one member on a common partition.

    Effects are laid out in rows: first the moment at each station, then the
    shear at each station, then the reaction at each support (left to right),
    and, when asked for, the deflection at each station (downward positive, in
    length cubed per unit load and unit EI: divide by the EI that a stiffness of
    1 stands for). ``coef[e, j, n]`` is the coefficient of t**n on piece j (t = x
    - breaks[j]). Lengths in the member's length unit; moment ordinates in length
    units per unit load, shear and reaction ordinates dimensionless.
    """

    length: float
    breaks: NDArray[np.float64]
    coef: NDArray[np.float64]
    station_span: NDArray[np.int64]
    station_fraction: NDArray[np.float64]
    station_x: NDArray[np.float64]
    support_x: NDArray[np.float64]
    nodes: NDArray[np.float64]
    deflection_scale: float = 0.0

    @property
    def n_stations(self) -> int:
        """Number of station rows (an interior support counts twice)."""
        return int(self.station_x.size)

    def station_index(self, section: Section) -> int | None:
        """Row of a station (span from 1, x from the left end), or None if it is not one."""
        return station_index(self.station_span, self.station_x, section)

    @property
    def n_effects(self) -> int:
        """Number of influence lines (moments, shears, reactions)."""
        return int(self.coef.shape[0])

    @property
    def moment_rows(self) -> slice:
        """Rows of the moment influence lines, one per station."""
        return slice(0, self.n_stations)

    @property
    def shear_rows(self) -> slice:
        """Rows of the shear influence lines, one per station."""
        return slice(self.n_stations, 2 * self.n_stations)

    @property
    def reaction_rows(self) -> slice:
        """Rows of the reaction influence lines, one per support."""
        return slice(2 * self.n_stations, 2 * self.n_stations + self.support_x.size)

    @property
    def deflection_rows(self) -> slice:
        """Rows of the deflection influence lines, one per station (empty unless asked for)."""
        return slice(self.reaction_rows.stop, self.n_effects)

    @property
    def effect_scale(self) -> NDArray[np.float64]:
        """Natural size of each effect's ordinates.

        L for moments, L^3/EI for deflections (:attr:`deflection_scale`, with the
        least EI), 1 otherwise.
        """
        scale = np.ones(self.n_effects)
        scale[self.moment_rows] = self.length
        scale[self.deflection_rows] = self.deflection_scale
        return scale

    def evaluate(self, x: NDArray[np.float64] | float, side: str = "right") -> NDArray[np.float64]:
        """Ordinates of every effect for a unit load at each position ``x``.

        ``side`` picks the one-sided limit at a jump ("right": load just right of
        x; "left": just left). A load on the member's end supports counts as on
        the member; positions outside [0, L] give 0. Returns shape
        (n_effects, len(x)).
        """
        xs = np.atleast_1d(np.asarray(x, dtype=float))
        return self.ordinates(np.arange(self.n_effects)[:, None], xs[None, :], side)

    def ordinates(
        self, lines: NDArray[np.int64], x: NDArray[np.float64], side: str = "right"
    ) -> NDArray[np.float64]:
        """Ordinate of line ``lines[...]`` for a unit load at ``x[...]``, element by element.

        ``lines`` and ``x`` broadcast together; ``side`` and the member's ends as
        in :meth:`evaluate`, which is this for every line at every x.
        """
        tol = POSITION_TOL * self.length
        n_pieces = self.breaks.size - 1
        if side not in ("right", "left"):
            raise ValueError("side must be 'right' or 'left'")
        j = np.searchsorted(self.breaks, x, side="left" if side == "left" else "right") - 1
        on = (x >= -tol) & (x <= self.length + tol)
        j = np.clip(j, 0, n_pieces - 1)
        t = x - self.breaks[j]
        c = self.coef[lines, j, :]
        out = ((c[..., 3] * t + c[..., 2]) * t + c[..., 1]) * t + c[..., 0]
        return np.where(on, out, 0.0)

    @functools.cached_property
    def reduced(self) -> tuple[NDArray[np.float64], NDArray[np.int64], NDArray[np.float64]]:
        """Each line on its own minimal partition: the nodes plus its own station.

        Returns ``(breaks, count, coef)``: ``breaks[e, :count[e]]`` are effect
        e's breaks (padded with the member length), ``coef[e, j]`` the cubic on
        its piece j in ``t = x - breaks[e, j]``. The moving-load kernel sweeps
        these, which have far fewer breaks than the common partition.
        """
        tol = POSITION_TOL * self.length
        stations = np.concatenate([self.station_x, self.station_x])
        n_eff = self.n_effects
        width = self.nodes.size + 1
        breaks = np.full((n_eff, width), self.length)
        count = np.empty(n_eff, dtype=np.int64)
        coef = np.zeros((n_eff, width - 1, 4))
        for e in range(n_eff):
            own = self.nodes
            if e < stations.size:
                own = _merge(np.concatenate([self.nodes, stations[e : e + 1]]), tol)
                own[np.abs(own - stations[e]) <= tol] = stations[e]
            first = np.searchsorted(self.breaks, own[:-1] + tol) - 1
            count[e] = own.size
            breaks[e, : own.size] = own
            coef[e, : own.size - 1] = self.coef[e, first]
        return breaks, count, coef

    @functools.cached_property
    def clipped(
        self,
    ) -> tuple[
        tuple[NDArray[np.float64], NDArray[np.int64], NDArray[np.float64]],
        tuple[NDArray[np.float64], NDArray[np.int64], NDArray[np.float64]],
    ]:
        """The positive and the negative parts of each line, as :attr:`reduced` partitions.

        ``max(IL, 0)`` and ``min(IL, 0)`` are piecewise cubics once the zero
        crossings of every piece are added as breaks. Sweeping an axle train
        over them gives its extremes when axles that would lessen the effect
        are left out (AASHTO LRFD 3.6.1.3.1: axles that do not contribute to
        the extreme force effect are neglected).
        """
        from batch.engine.kernel import cubic_crossings

        breaks, count, coef = self.reduced
        tol = POSITION_TOL * self.length
        h = np.diff(breaks, axis=1)
        roots = cubic_crossings(coef, np.ascontiguousarray(h))
        parts = []
        for sign in (1.0, -1.0):
            width = breaks.shape[1] + 3 * (breaks.shape[1] - 1)
            out_b = np.full((self.n_effects, width), self.length)
            out_c = np.zeros((self.n_effects, width - 1, 4))
            out_n = np.empty(self.n_effects, dtype=np.int64)
            for e in range(self.n_effects):
                n = int(count[e])
                starts = [breaks[e, 0]]
                piece = []
                for j in range(n - 1):
                    r = roots[e, j]
                    # A crossing within tol of a break is that break (the kernel needs
                    # breaks further apart than tol).
                    cuts = np.sort(r[(r > tol) & (r < h[e, j] - tol)])
                    for t0, t1 in zip(
                        np.concatenate([[0.0], cuts]),
                        np.concatenate([cuts, [h[e, j]]]),
                        strict=True,
                    ):
                        c = _shift(coef[e, j], np.float64(t0))
                        mid = 0.5 * (t1 - t0)
                        inside = ((c[3] * mid + c[2]) * mid + c[1]) * mid + c[0]
                        piece.append(c if sign * inside > 0 else np.zeros(4))
                        starts.append(breaks[e, j] + t1)
                starts[-1] = breaks[e, n - 1]
                out_n[e] = len(starts)
                out_b[e, : len(starts)] = starts
                out_c[e, : len(piece)] = piece
            parts.append((out_b, out_n, out_c))
        return parts[0], parts[1]

    @functools.cached_property
    def plan(self) -> SweepPlan:
        """:attr:`reduced`, bundled for the moving-load sweep (see :func:`sweep_plan`)."""
        from batch.engine.kernel import sweep_plan

        return sweep_plan(*self.reduced)

    @functools.cached_property
    def clipped_plans(self) -> tuple[SweepPlan, SweepPlan]:
        """:attr:`clipped` (positive part, negative part), bundled for the sweep."""
        from batch.engine.kernel import sweep_plan

        return sweep_plan(*self.clipped[0]), sweep_plan(*self.clipped[1])

    @functools.cached_property
    def span_extremes(self) -> tuple[SpanExtremes, SpanExtremes]:
        """The largest and the smallest ordinate of every line within each span, exactly.

        Returns ``(largest, smallest)``, each a :class:`SpanExtremes` of shape
        (n_effects, n_spans). A cubic piece takes its extremes at an end of
        its interval (both one-sided limits at a break are taken, so the unit
        jump of a shear line counts) or at a root of its quadratic derivative
        inside it; every piece of a line's own partition (:attr:`reduced`) lies in
        one span (the supports are breaks), so the extremes of a span are the
        extremes of its pieces. Ordinates as in
        :meth:`evaluate`; positions from the member's left end.
        """
        breaks, _, c = self.reduced  # each line on its own few pieces: (E, W) and (E, W-1, 4)
        start = breaks[:, :-1]
        h = np.diff(breaks, axis=1)  # padded pieces have zero length
        a, b, k = 3.0 * c[..., 3], 2.0 * c[..., 2], c[..., 1]
        disc = b * b - 4.0 * a * k
        root = np.sqrt(np.where(disc >= 0.0, disc, 0.0))
        # The numerically stable pair of roots of a t^2 + b t + k (or the one root of b t + k).
        q = -0.5 * (b + np.copysign(root, b))
        with np.errstate(divide="ignore", invalid="ignore"):
            t1 = np.where(a != 0.0, q / a, np.where(b != 0.0, -k / b, np.nan))
            t2 = np.where((a != 0.0) & (q != 0.0), k / q, np.nan)
        t = np.stack([np.zeros_like(t1), h, t1, t2], axis=-1)
        inside = (disc[..., None] >= 0.0) & (t > 0.0) & (t < h[..., None])
        inside[..., :2] = True  # the ends of the piece are always candidates
        t = np.where(inside, t, 0.0)
        value = ((c[..., 3:4] * t + c[..., 2:3]) * t + c[..., 1:2]) * t + c[..., 0:1]
        x = start[..., None] + t
        span = np.searchsorted(self.support_x, start + 0.5 * h) - 1  # span of each piece
        span[h <= 0.0] = -1  # padding belongs to no span
        rows = np.arange(c.shape[0])
        n_spans = self.support_x.size - 1
        out = []
        for sense in (1.0, -1.0):
            best = np.empty((c.shape[0], n_spans))
            where = np.empty((c.shape[0], n_spans))
            for s in range(n_spans):
                mine = inside & (span == s)[..., None]
                cand = np.where(mine, sense * value, -np.inf).reshape(c.shape[0], -1)
                pick = cand.argmax(axis=1)  # the first of equal candidates wins
                best[:, s] = sense * cand[rows, pick]
                where[:, s] = x.reshape(c.shape[0], -1)[rows, pick]
            out.append(SpanExtremes(value=best, position=where))
        return out[0], out[1]

    def hogging_stations(self) -> NDArray[np.bool_]:
        """Which stations are in hogging under a uniform load on every span, per station.

        These are the stations between an interior support and its points of
        contraflexure under that load (the region of AASHTO LRFD 3.6.1.3.1).
        """
        positive, negative = self.areas()
        hogging: NDArray[np.bool_] = (positive + negative)[self.moment_rows] < 0
        return hogging

    def areas(self) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
        """Exact integrals of the positive and the negative parts of each line.

        Returns ``(positive, negative)``, each of shape (n_effects,), with
        ``negative <= 0``. Multiplied by a uniform load per unit length they give
        the effect of that load placed on the adverse parts only; their sum is
        the effect of the load on the whole member. Zero crossings inside each
        cubic piece are found to machine precision.
        """
        return self._areas

    @functools.cached_property
    def _areas(self) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
        from batch.engine.kernel import cubic_crossings

        breaks, _, c = self.reduced
        h = np.diff(breaks, axis=1)  # padded pieces have zero length and add nothing
        roots = cubic_crossings(c, np.ascontiguousarray(h))  # (E, P, 3)
        cuts = np.concatenate([np.zeros((*h.shape, 1)), roots, h[..., None]], axis=-1)
        cuts = np.sort(np.where(np.isnan(cuts), h[..., None], cuts), axis=-1)
        lo, hi = cuts[..., :-1], cuts[..., 1:]

        def antiderivative(t: NDArray[np.float64]) -> NDArray[np.float64]:
            k = c[..., None, :]
            return t * (k[..., 0] + t * (k[..., 1] / 2 + t * (k[..., 2] / 3 + t * k[..., 3] / 4)))

        part = antiderivative(hi) - antiderivative(lo)
        positive = np.where(part > 0, part, 0.0).sum(axis=(1, 2))
        negative = np.where(part < 0, part, 0.0).sum(axis=(1, 2))
        return positive, negative

    def areas_where(
        self, governing: NDArray[np.int64], companion: NDArray[np.int64]
    ) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
        """Exact integrals of each companion line where its governing line is positive, negative.

        For each pair ``(governing[r], companion[r])``, the integral of the
        companion line over the parts of the member where the governing line is
        above 0, and over those where it is below 0: multiplied by a uniform
        load per unit length, the companion effect of that load placed on the
        parts adverse to the governing effect. ``areas_where(e, e)`` is
        :meth:`areas` of e. Zero crossings as in :meth:`areas`.
        """
        from batch.engine.kernel import cubic_crossings

        h = np.diff(self.breaks)  # the common partition: both lines' pieces coincide
        g = np.ascontiguousarray(self.coef[governing])  # (R, P, 4)
        c = self.coef[companion][..., None, :]
        spans = np.ascontiguousarray(np.broadcast_to(h, g.shape[:2]))
        roots = cubic_crossings(g, spans)  # (R, P, 3)
        cuts = np.concatenate([np.zeros((*g.shape[:2], 1)), roots, spans[..., None]], axis=-1)
        cuts = np.sort(np.where(np.isnan(cuts), spans[..., None], cuts), axis=-1)
        lo, hi = cuts[..., :-1], cuts[..., 1:]
        mid = 0.5 * (lo + hi)
        k = g[..., None, :]
        sign = ((k[..., 3] * mid + k[..., 2]) * mid + k[..., 1]) * mid + k[..., 0]

        def antiderivative(t: NDArray[np.float64]) -> NDArray[np.float64]:
            return t * (c[..., 0] + t * (c[..., 1] / 2 + t * (c[..., 2] / 3 + t * c[..., 3] / 4)))

        part = antiderivative(hi) - antiderivative(lo)
        positive = np.where(sign > 0, part, 0.0).sum(axis=(1, 2))
        negative = np.where(sign < 0, part, 0.0).sum(axis=(1, 2))
        return positive, negative


def _merge(points: NDArray[np.float64], tol: float) -> NDArray[np.float64]:
    p = np.sort(points)
    keep = np.concatenate([[True], np.diff(p) > tol])
    merged: NDArray[np.float64] = p[keep]
    return merged


def _element_stiffness(
    nodes: NDArray[np.float64],
    supports: NDArray[np.float64],
    span_ei: NDArray[np.float64],
    pieces: NDArray[np.float64],
) -> NDArray[np.float64]:
    """EI of each element: that of the piece holding its middle, else its span's Span EI."""
    mid = 0.5 * (nodes[:-1] + nodes[1:])
    span = np.minimum(np.searchsorted(supports, mid) - 1, span_ei.size - 1)
    ei = span_ei[span].astype(float)
    for start, end, value in pieces:
        ei[(mid > start) & (mid < end)] = value
    return ei


def _checked_pieces(
    pieces: Sequence[tuple[float, float, float]], length: float, tol: float
) -> NDArray[np.float64]:
    """Stiffness pieces as an (n, 3) array sorted by start; ValueError when malformed."""
    out = np.asarray(pieces, dtype=float).reshape(-1, 3)
    if not np.all(np.isfinite(out)):
        raise ValueError("stiffness pieces must be finite numbers")
    out = out[np.argsort(out[:, 0], kind="stable")]
    if np.any(out[:, 2] <= 0):
        raise ValueError("the EI of a stiffness piece must be greater than zero")
    if np.any(out[:, 1] - out[:, 0] <= tol) or np.any(out[:, 0] < -tol):
        raise ValueError("a stiffness piece must run forwards from 0 or more")
    if np.any(out[:, 1] > length + tol):
        raise ValueError("a stiffness piece must end on the member")
    if np.any(out[1:, 0] < out[:-1, 1] - tol):
        raise ValueError("two stiffness pieces overlap; give each part of the member once")
    return out


def _assemble(
    elements: list[tuple[float, float, float, NDArray[np.int64]]],
    number: type[float] | type[Fraction],
) -> dict[tuple[int, int], Any]:
    """Global stiffness matrix of Euler-Bernoulli elements (a, b, EI, dofs), in ``number``.

    Sparse: a dict of the nonzero entries by (row, column). With ``Fraction``
    every entry is exact (the float inputs are exact rationals).
    """
    k: dict[tuple[int, int], Any] = {}
    for a, b, ei, g in elements:
        h = number(b) - number(a)
        c = number(ei) / (h * h * h)
        ke = [
            [12, 6 * h, -12, 6 * h],
            [6 * h, 4 * h * h, -6 * h, 2 * h * h],
            [-12, -6 * h, 12, -6 * h],
            [6 * h, 2 * h * h, -6 * h, 4 * h * h],
        ]
        for r in range(4):
            for q in range(4):
                key = (int(g[r]), int(g[q]))
                k[key] = k.get(key, number(0)) + c * ke[r][q]
    return k


@dataclass(frozen=True)
class _Stiffness:
    """The stiffness system of a member's elements, solved for its free degrees of freedom.

    Ordinary members are solved in double precision. When the diagonally scaled
    free-free matrix is ill-conditioned (hinges close to a mechanism, or many
    short elements beside long ones, e.g. a finely cut haunch), the double
    solution is refined against residuals computed in exact rational arithmetic
    until it no longer changes (iterative refinement); only if that fails is the
    whole system solved exactly.
    """

    elements: list[tuple[float, float, float, NDArray[np.int64]]]
    n_dof: int
    free: NDArray[np.int64]

    @functools.cached_property
    def matrix(self) -> NDArray[np.float64]:
        """The whole stiffness matrix, dense, in double precision."""
        k = np.zeros((self.n_dof, self.n_dof))
        for (i, j), value in _assemble(self.elements, float).items():
            k[i, j] = value
        return k

    @functools.cached_property
    def exact(self) -> dict[tuple[int, int], Fraction]:
        """The nonzero entries of the stiffness matrix, exact."""
        return _assemble(self.elements, Fraction)

    def exact_block(self, rows: NDArray[np.int64], cols: NDArray[np.int64]) -> Matrix:
        """The block of the stiffness matrix at ``rows`` and ``cols``, exact."""
        zero = Fraction(0)
        return [[self.exact.get((int(i), int(j)), zero) for j in cols] for i in rows]

    def solve(
        self, rhs: NDArray[np.float64], rhs_exact: Callable[[], Matrix]
    ) -> NDArray[np.float64]:
        """X with K_ff X = rhs; ``rhs_exact()`` gives the same right-hand side, exact."""
        free = self.free
        k_ff = self.matrix[np.ix_(free, free)]
        scale = 1.0 / np.sqrt(np.diag(k_ff))
        x = np.asarray(np.linalg.solve(k_ff, rhs), dtype=np.float64)
        if np.linalg.cond(k_ff * scale[:, None] * scale[None, :]) < COND_LIMIT:
            return x
        where = {int(dof): i for i, dof in enumerate(free)}
        rows: list[list[tuple[int, Fraction]]] = [[] for _ in free]
        for (i, j), value in self.exact.items():
            if i in where and j in where and value != 0:
                rows[where[i]].append((where[j], value))
        exact_rhs = rhs_exact()
        for _ in range(REFINE_STEPS):
            xs = [[Fraction(float(v)) for v in row] for row in x]
            residual = np.array(
                [
                    [
                        float(exact_rhs[i][c] - sum(v * xs[j][c] for j, v in rows[i]))
                        for c in range(x.shape[1])
                    ]
                    for i in range(len(rows))
                ]
            )
            step = np.linalg.solve(k_ff, residual)
            x = np.add(x, step)
            if np.max(np.abs(step), initial=0.0) <= REFINED * np.max(np.abs(x), initial=0.0):
                return x
        # Refinement did not settle (nearly a mechanism): solve the system exactly.
        solution = solve(self.exact_block(free, free), exact_rhs)
        return np.array(solution, dtype=float)


def _element_cubics(
    nodes: NDArray[np.float64],
    supports: NDArray[np.float64],
    hinges: NDArray[np.float64],
    element_ei: NDArray[np.float64],
    tol: float,
    deflect_at: NDArray[np.int64] | None = None,
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """Reaction and deflection influence cubics per element, basis (x - a)^n.

    Returns ``(reactions, deflections)`` of shapes (n_supports, n_elements, 4)
    and (len(deflect_at), n_elements, 4). ``element_ei`` is the EI of each element
    between consecutive nodes; ``deflect_at`` indexes the nodes whose downward
    deflection is wanted. For a unit downward load at a point of an element, the
    consistent (Hermite) nodal loads give the exact nodal displacements, so the
    deflection of a node is F sN: F the flexibility (K_ff^-1) row of its
    deflection, s N the load's consistent nodal loads.
    """
    n_nodes = nodes.size
    is_hinge = np.array([np.any(np.abs(hinges - x) <= tol) for x in nodes])
    # Degrees of freedom: v at every node; one rotation, or two at a hinge (left, right).
    v_dof = np.arange(n_nodes)
    rot_left = np.empty(n_nodes, dtype=int)
    rot_right = np.empty(n_nodes, dtype=int)
    nxt = n_nodes
    for i in range(n_nodes):
        rot_left[i] = nxt
        nxt += 1
        if is_hinge[i]:
            rot_right[i] = nxt
            nxt += 1
        else:
            rot_right[i] = rot_left[i]
    n_dof = nxt
    elements = []
    for e in range(n_nodes - 1):
        g = np.array([v_dof[e], rot_right[e], v_dof[e + 1], rot_left[e + 1]])
        elements.append((nodes[e], nodes[e + 1], float(element_ei[e]), g))
    restrained = np.array([v_dof[int(np.argmin(np.abs(nodes - s)))] for s in supports], dtype=int)
    free = np.setdiff1d(np.arange(n_dof), restrained)
    system = _Stiffness(elements, n_dof, free)
    transfer = np.zeros((restrained.size, n_dof))
    k_fr = system.matrix[np.ix_(free, restrained)]
    if free.size:
        transfer[:, free] = system.solve(k_fr, lambda: system.exact_block(free, restrained)).T
    transfer[np.arange(restrained.size), restrained] = -1.0
    flexibility = np.zeros((0 if deflect_at is None else deflect_at.size, n_dof))
    if deflect_at is not None and free.size:
        where = {int(dof): i for i, dof in enumerate(free)}
        wanted = [
            (row, where[int(v_dof[d])]) for row, d in enumerate(deflect_at) if v_dof[d] in where
        ]
        unit = np.zeros((free.size, len(wanted)))
        for col, (_, i) in enumerate(wanted):
            unit[i, col] = 1.0

        def unit_exact() -> Matrix:
            return [[Fraction(int(v)) for v in row] for row in unit]

        columns = system.solve(unit, unit_exact)  # (n_free, n_wanted): rows of K_ff^-1
        for col, (row, _) in enumerate(wanted):
            flexibility[row, free] = columns[:, col]
    return _per_element(-transfer, elements), _per_element(flexibility, elements)


def _per_element(
    weights: NDArray[np.float64], elements: list[tuple[float, float, float, NDArray[np.int64]]]
) -> NDArray[np.float64]:
    """Cubics in (x - a) on every element of a unit downward load's effect ``weights @ sN``.

    ``weights`` (n_lines, n_dof) multiply the load's consistent nodal loads.
    """
    out = np.empty((weights.shape[0], len(elements), 4))
    for e, (a, b, _, g) in enumerate(elements):
        h = b - a
        xi_coef = (weights[:, g] * np.array([1.0, h, 1.0, h])) @ _HERMITE  # coefficients of xi^n
        out[:, e, :] = xi_coef / h ** np.arange(4)
    return out


def _shift(coef: NDArray[np.float64], d: NDArray[np.float64]) -> NDArray[np.float64]:
    """Re-expand cubics sum c_n u^n about u = d: coefficients of (u - d)^m."""
    c0, c1, c2, c3 = (coef[..., n] for n in range(4))
    return np.stack(
        [
            c0 + d * (c1 + d * (c2 + d * c3)),
            c1 + d * (2 * c2 + 3 * d * c3),
            c2 + 3 * d * c3,
            c3,
        ],
        axis=-1,
    )


def influence_lines(
    spans: tuple[float, ...] | list[float],
    span_ei: tuple[float, ...] | list[float] | None = None,
    hinges: tuple[float, ...] | list[float] = (),
    stations_per_span: int = 10,
    pieces: Sequence[tuple[float, float, float]] = (),
    sections: Sequence[Section] = (),
    deflection: bool = False,
) -> InfluenceLines:
    """Exact influence lines of moment and shear at every station and of every reaction.

    ``spans`` are the span lengths left to right (any consistent length unit);
    ``span_ei`` the relative EI of each span (default all 1); ``hinges`` the
    internal moment releases, measured from the left end, strictly inside the
    member. ``pieces`` are prismatic stretches ``(start, end, EI)`` (from the
    left end; they may cross supports, must not overlap) whose EI replaces the
    span's: each of their ends becomes a node, so every element keeps one EI and
    the lines stay exact piecewise cubics. Stations are at fractions 0, 1/n,
    ..., 1 of every span, plus the ``sections`` (span from 1, x from the left
    end) off that grid, each at exactly its x. With ``deflection``, the
    stations become nodes too and the lines of their deflections follow the
    reactions. Raises :class:`UnstableMemberError` when the layout is a mechanism
    and ``ValueError`` for malformed geometry.
    """
    spans_a = np.asarray(spans, dtype=float)
    if (
        spans_a.ndim != 1
        or spans_a.size == 0
        or np.any(~np.isfinite(spans_a))
        or np.any(spans_a <= 0)
    ):
        raise ValueError("span lengths must be one or more finite numbers greater than zero")
    ei = (
        np.ones(spans_a.size)
        if span_ei is None or len(span_ei) == 0
        else np.asarray(span_ei, dtype=float)
    )
    if ei.shape != spans_a.shape or np.any(~np.isfinite(ei)) or np.any(ei <= 0):
        raise ValueError("give one relative EI greater than zero for each span")
    if (
        not np.isfinite(stations_per_span)
        or int(stations_per_span) != stations_per_span
        or stations_per_span < 1
    ):
        raise ValueError("stations per span must be a whole number of at least 1")
    stations_per_span = int(stations_per_span)
    supports = support_positions(spans_a.tolist())
    length = float(supports[-1])
    tol = POSITION_TOL * length
    hinge_a = np.sort(np.asarray(hinges, dtype=float).reshape(-1))
    if np.any(~np.isfinite(hinge_a)):
        raise ValueError("hinge positions must be finite numbers")
    if np.any(hinge_a <= tol) or np.any(hinge_a >= length - tol):
        raise ValueError("hinges must lie strictly inside the member")
    if np.any(np.diff(hinge_a) <= tol):
        raise ValueError("two hinges are at the same place; give each hinge once")
    moving = mechanism_parts(spans_a.tolist(), hinge_a.tolist())
    if moving:
        where = ", ".join(f"{a:g} to {b:g}" for a, b in moving)
        raise UnstableMemberError(
            f"the hinges make the member a mechanism: the part from {where} can move "
            "without resistance; remove a hinge or move it so that every part between "
            "hinges rests on at least two supports, or on one support and a neighbouring part"
        )
    piece_a = _checked_pieces(pieces, length, tol)
    cuts = piece_a[:, :2].reshape(-1)
    cuts = cuts[(cuts > tol) & (cuts < length - tol)]
    span_no, fraction, sx = station_positions(spans_a.tolist(), stations_per_span, sections)
    nodes = _merge(np.concatenate([supports, hinge_a, cuts, sx if deflection else []]), tol)
    element_ei = _element_stiffness(nodes, supports, ei, piece_a)
    at_nodes = np.abs(sx[:, None] - nodes[None, :]).argmin(axis=1) if deflection else None
    element_cubics, deflections = _element_cubics(
        nodes, supports, hinge_a, element_ei, tol, at_nodes
    )
    # A station on a node (a support or a hinge typed at a station) takes the node's
    # exact position, so that the node's element boundary stays where it is.
    on_node = np.abs(sx[:, None] - nodes[None, :]) <= tol
    sx = np.where(on_node.any(axis=1), nodes[on_node.argmax(axis=1)], sx)
    breaks = _merge(np.concatenate([nodes, sx]), tol)
    breaks[-1] = length
    # Snap stations onto the merged partition so that jumps sit exactly on breaks.
    sx = breaks[np.abs(breaks[None, :] - sx[:, None]).argmin(axis=1)]
    elem = np.clip(np.searchsorted(nodes, breaks[:-1] + tol, side="right") - 1, 0, nodes.size - 2)
    reactions = _shift(element_cubics[:, elem, :], breaks[:-1] - nodes[elem])  # (S, J, 4)

    piece_start = breaks[:-1]
    piece_end = breaks[1:]
    just_left = fraction == 1.0
    # Moment at station s: sum over supports left of s of R_i (s - x_i), minus (s - x) for x < s.
    lever = np.clip(sx[:, None] - supports[None, :], 0.0, None)  # (N, S)
    moment = np.einsum("ns,sjk->njk", lever, reactions)
    left_of = piece_end[None, :] <= sx[:, None] + tol  # (N, J) piece lies left of the station
    moment[..., 0] -= np.where(left_of, sx[:, None] - piece_start[None, :], 0.0)
    moment[..., 1] += np.where(left_of, 1.0, 0.0)
    # Shear: supports at the station belong to the left part when the section is just right.
    inside = np.where(
        just_left[:, None],
        supports[None, :] < sx[:, None] - tol,
        supports[None, :] <= sx[:, None] + tol,
    ).astype(float)
    shear = np.einsum("ns,sjk->njk", inside, reactions)
    shear[..., 0] -= left_of
    lines = [moment, shear, reactions]
    if deflection:
        lines.append(_shift(deflections[:, elem, :], breaks[:-1] - nodes[elem]))
    coef = np.concatenate(lines, axis=0)
    # A term below 1e-12 of an effect's natural size over the whole member is
    # round-off (e.g. the moment at a hinge). It is measured with the member length,
    # not the piece length: on a sliver piece a real cubic term looks tiny, and the
    # same cubic continues over the neighbouring pieces of its element.
    scale = np.ones(coef.shape[0])
    scale[: sx.size] = length
    deflection_scale = length**3 / float(element_ei.min()) if deflection else 0.0
    scale[2 * sx.size + supports.size :] = deflection_scale
    size = np.abs(coef) * (length ** np.arange(4))
    coef = np.where(size < 1e-12 * scale[:, None, None], 0.0, coef)
    return InfluenceLines(
        length=length,
        breaks=breaks,
        coef=coef,
        station_span=span_no,
        station_fraction=fraction,
        station_x=sx,
        support_x=supports,
        nodes=nodes,
        deflection_scale=deflection_scale,
    )
