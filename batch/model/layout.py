"""The layout of a member: where its supports, hinges and stations are, and whether it stands.

Positions are measured from the member's left end in the run's length unit.
Stations belong to spans: span k (from 1) has stations at the fractions 0, 1/n,
..., 1 of its length (n = Stations per span), so an interior support appears
twice, as the end of span k and the start of span k + 1.
"""

from __future__ import annotations

import itertools
from fractions import Fraction

import numpy as np
from numpy.typing import NDArray

from batch.model.exact import null_space

__all__ = [
    "POSITION_TOL",
    "STATION_TOL",
    "mechanism_parts",
    "station_positions",
    "station_row",
    "support_positions",
]

#: Two positions closer than this fraction of the member length are the same point.
POSITION_TOL = 1e-10

#: A Capacities station matches a station of the member within this fraction of a span.
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
    spans: tuple[float, ...] | list[float], stations_per_span: int
) -> tuple[NDArray[np.int64], NDArray[np.float64], NDArray[np.float64]]:
    """Every station of a member: its span (from 1), fraction of the span and position.

    Span k's stations are at the fractions 0, 1/n, ..., 1 (n = ``stations_per_span``),
    span by span. Each fraction and each position is the double nearest its exact
    value (a support's own position at the fractions 0 and 1), so a station a tenth of
    the way along a 24 ft span is at 2.4, the decimal an engineer would type, not at
    2.4000000000000004 as ``0 + 0.1 * 24`` rounds twice.
    """
    n = int(stations_per_span)
    exact = _exact_supports(spans)
    steps = [Fraction(k, n) for k in range(n + 1)]
    x = [float(a + f * (b - a)) for a, b in itertools.pairwise(exact) for f in steps]
    count = len(exact) - 1
    span_no = np.repeat(np.arange(1, count + 1, dtype=np.int64), n + 1)
    fraction = np.tile(np.array([float(f) for f in steps]), count)
    return span_no, fraction, np.array(x)


def station_row(span: int, station: float, n_spans: int, stations_per_span: int) -> int | None:
    """Index of the station (span from 1, fraction of the span) among a member's stations.

    Stations are 0, 1/n, ..., 1 of every span, span by span (as in Envelopes);
    ``station`` matches within :data:`STATION_TOL`. None when there is no such
    station.
    """
    if not 1 <= span <= n_spans:
        return None
    j = round(station * stations_per_span)
    if abs(station - j / stations_per_span) > STATION_TOL:
        return None
    return (span - 1) * (stations_per_span + 1) + j
