"""The layout of a member: where its supports, hinges and stations are, and whether it stands.

Positions are measured from the member's left end in the run's length unit.
Stations belong to spans: span k (from 1) has stations at the fractions 0, 1/n,
..., 1 of its length (n = Stations per span, the member's own or the setting),
so an interior support appears twice, as the end of span k and the start of
span k + 1. A rated section off that grid (a Capacities row given by x, or by a
fraction that is not a grid station) is added to its span as one more station,
at exactly its position.
"""

from __future__ import annotations

import itertools
from collections.abc import Sequence
from fractions import Fraction

import numpy as np
from numpy.typing import NDArray

from batch.model.exact import null_space

__all__ = [
    "POSITION_TOL",
    "STATION_TOL",
    "Section",
    "mechanism_parts",
    "section_of",
    "station_index",
    "station_positions",
    "support_positions",
]

#: Two positions closer than this fraction of the member length are the same point.
POSITION_TOL = 1e-10

#: Two stations of a span closer than this fraction of its length are one station.
STATION_TOL = 1e-6


def mechanism_parts(
    spans: tuple[float, ...] | list[float], hinges: tuple[float, ...] | list[float]
) -> list[tuple[float, float]]:
    """Parts of a member that can move as a rigid-body mechanism.

    The member between consecutive hinges (and its ends) is a set of rigid
    segments, each with a vertical translation and a rotation; every support
    fixes the deflection at its point and every hinge joins the deflections of
    its two segments. The member is stable when only the zero motion satisfies
    these constraints. Returns the (start, end) of every segment that can move;
    an empty list means the member is stable.
    """
    supports = support_positions(spans)
    length = float(supports[-1])
    tol = POSITION_TOL * length
    cuts = np.concatenate([[0.0], np.sort(np.asarray(hinges, dtype=float)), [length]])
    n_seg = cuts.size - 1
    zero = Fraction(0)
    rows: list[list[Fraction]] = []
    # Exact arithmetic: hinges very close together must not look like a mechanism.
    for xs in supports:
        for s in range(n_seg):
            if cuts[s] - tol <= xs <= cuts[s + 1] + tol:
                row = [zero] * (2 * n_seg)
                row[2 * s], row[2 * s + 1] = Fraction(1), Fraction(xs) - Fraction(cuts[s])
                rows.append(row)
    for s in range(1, n_seg):
        row = [zero] * (2 * n_seg)
        row[2 * (s - 1)] = Fraction(1)
        row[2 * (s - 1) + 1] = Fraction(cuts[s]) - Fraction(cuts[s - 1])
        row[2 * s] = Fraction(-1)
        rows.append(row)
    free = null_space(rows, 2 * n_seg)
    moving = {s for x in free for s in range(n_seg) if x[2 * s] != 0 or x[2 * s + 1] != 0}
    return [(float(cuts[s]), float(cuts[s + 1])) for s in sorted(moving)]


def support_positions(spans: tuple[float, ...] | list[float]) -> NDArray[np.float64]:
    """The supports' positions: 0, then each running sum of the spans.

    Each is the double nearest the exact sum of the spans as typed (each span read
    as the shortest decimal that gives its double), so spans of 10.1 and 20.2 put
    the third support at 30.3, not at 30.299999999999997 as adding the doubles does.
    """
    return np.array([float(x) for x in _exact_supports(spans)])


def _exact_supports(spans: tuple[float, ...] | list[float]) -> list[Fraction]:
    """The supports' exact positions: 0, then each running sum of the spans as typed.

    A span is read as the shortest decimal that rounds to its double (``repr``), the
    number the engineer typed; that decimal and the double differ by less than half a
    unit in the last place, so the positions stay exact to the double's precision.
    """
    exact = [Fraction(0)]
    for span in spans:
        exact.append(exact[-1] + Fraction(repr(float(span))))
    return exact


def station_positions(
    spans: tuple[float, ...] | list[float],
    stations_per_span: int,
    extra: Sequence[Section] = (),
) -> tuple[NDArray[np.int64], NDArray[np.float64], NDArray[np.float64]]:
    """Every station of a member: its span (from 1), fraction of the span and position.

    Span k's stations are at the fractions 0, 1/n, ..., 1 (n = ``stations_per_span``),
    span by span. Each fraction and each position is the double nearest its exact
    value (a support's own position at the fractions 0 and 1), so a station a tenth of
    the way along a 24 ft span is at 2.4, the decimal an engineer would type, not at
    2.4000000000000004 as ``0 + 0.1 * 24`` rounds twice. The ``extra`` sections
    (span, x) off that grid are added to their spans in order, each at exactly its x;
    one within :data:`STATION_TOL` of a span of a station already there is that station.
    """
    n = int(stations_per_span)
    exact = _exact_supports(spans)
    steps = [Fraction(k, n) for k in range(n + 1)]
    span_no: list[int] = []
    fraction: list[float] = []
    xs: list[float] = []
    for k, (a, b) in enumerate(itertools.pairwise(exact), start=1):
        here = [(float(f), float(a + f * (b - a))) for f in steps]
        length = float(b - a)
        for sk, sx in extra:
            f = (sx - float(a)) / length
            if sk == k and all(abs(f - g) > STATION_TOL for g, _ in here):
                here.append((min(max(f, 0.0), 1.0), float(sx)))
        here.sort()
        span_no += [k] * len(here)
        fraction += [f for f, _ in here]
        xs += [x for _, x in here]
    return np.array(span_no, dtype=np.int64), np.array(fraction), np.array(xs)


#: A station of a member: (span from 1, distance from the member's left end).
Section = tuple[int, float]


def section_of(
    spans: Sequence[float], span: int | None, station: float | None, x: float | None
) -> Section | None:
    """The station a Capacities row names: by span and fraction, or by x.

    ``x`` (from the member's left end) wins when given; ``span`` then only says
    which side of an interior support x is on (required there). Returns None
    when the row does not name a point of the member (validation explains why).
    """
    supports = support_positions(list(spans))
    n_spans = supports.size - 1
    if x is not None:
        tol = POSITION_TOL * float(supports[-1])
        if x < -tol or x > supports[-1] + tol:
            return None
        inside = [k + 1 for k in range(n_spans) if supports[k] - tol <= x <= supports[k + 1] + tol]
        if span is None:
            return (inside[0], float(x)) if len(inside) == 1 else None
        return (span, float(x)) if span in inside else None
    if span is None or station is None or not 1 <= span <= n_spans or not 0 <= station <= 1:
        return None
    exact = _exact_supports(list(spans))
    a, b = exact[span - 1], exact[span]
    return span, float(a + Fraction(repr(float(station))) * (b - a))


def station_index(
    station_span: NDArray[np.int64], station_x: NDArray[np.float64], section: Section
) -> int | None:
    """Row of ``section`` among a member's stations (as :func:`station_positions` gives them)."""
    span, x = section
    rows = np.flatnonzero(station_span == span)
    if rows.size < 2:
        return None
    length = float(station_x[rows[-1]] - station_x[rows[0]])
    near = rows[np.abs(station_x[rows] - x) <= STATION_TOL * length]
    return int(near[0]) if near.size else None
