"""The loaded length of every effect, and an impact allowance that depends on it.

The AASHTO Standard Specifications (17th ed. 2002, Art. 3.8.2) give the impact
fraction I = 50 / (L + 125) <= 0.30, L in feet, where L is the loaded length,
which the specification prescribes by effect (Art. 3.8.2.2; its wording is from
memory, not checked against the specification's text):

* positive moment: the span length, for continuous spans the span under
  consideration;
* negative moment of continuous spans: the average of the two adjacent loaded spans;
* shear: the length of the loaded portion of the span from the point under
  consideration to the far reaction.

spanfleet computes L for every station and effect of a member exactly as follows
(sagging moment positive; V = sum of the upward forces left of the section):

* ``M max`` at a station: the length of the station's span.
* ``M min`` at a station *near an interior support*: the average of the two spans
  beside that support. "Near" is the hogging region of the support: the stations
  between it and its point of contraflexure under a uniform load on every span (the
  same region as the HL-93 rule for two trucks, AASHTO LRFD 3.6.1.3.1). There the
  negative moment comes from loading both spans beside the support, which is what
  the average describes. Such a station belongs to the nearer of its span's ends
  that is an interior support. Elsewhere ``M min`` takes the station's span, as
  positive moment does: there the hogging region of no support reaches the
  station, and the specification names no other length.
* ``V max`` (the loads right of the section raise V): from the station to the far
  (right) end of its span; ``V min``: from the near (left) end of its span to the
  station. Where that length is 0 (V max at the right end of a span, V min at its
  left end) I is at its cap.
* Reactions: at an end support, the span beside it (the end shear of that span);
  at an interior support, the average of the two spans beside it. The
  specification gives no loaded length for reactions (from memory); spanfleet
  treats an interior reaction like the negative moment over the same support (both
  come from loading the two spans beside it). The sum of the two spans is also used
  in practice; the average gives the shorter length and so the larger I.

Lengths are in the member's length unit, positions from its left end.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import NDArray

from batch.engine.influence import InfluenceLines
from batch.loads.cases import ImpactFormula

__all__ = ["impact_fraction", "loaded_lengths"]


def loaded_lengths(il: InfluenceLines) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """The loaded length of every effect, for its largest and for its smallest value.

    Returns ``(for_max, for_min)``, each of shape (n_effects,), effects laid out
    as in :class:`~batch.engine.influence.InfluenceLines` (see the module
    docstring for the rule of each effect).
    """
    supports = il.support_x
    spans = np.diff(supports)
    n_spans = spans.size
    span = il.station_span - 1  # 0-based span of each station
    x = il.station_x
    left, right = supports[span], supports[span + 1]
    # Average of the two spans beside each support (end supports: the one span).
    beside = np.concatenate([spans[:1], 0.5 * (spans[:-1] + spans[1:]), spans[-1:]])
    left_interior, right_interior = span > 0, span < n_spans - 1
    nearer_right = right_interior & (~left_interior | (x - left > right - x))
    nearer = np.where(nearer_right, span + 1, span)
    near_interior = left_interior | right_interior
    hogging = il.hogging_stations() & near_interior
    for_max = np.empty(il.n_effects)
    for_min = np.empty(il.n_effects)
    for_max[il.moment_rows] = spans[span]
    for_min[il.moment_rows] = np.where(hogging, beside[nearer], spans[span])
    for_max[il.shear_rows] = right - x
    for_min[il.shear_rows] = x - left
    for_max[il.reaction_rows] = beside
    for_min[il.reaction_rows] = beside
    return for_max, for_min


def impact_fraction(formula: ImpactFormula, length: NDArray[np.float64]) -> NDArray[np.float64]:
    """The allowance of ``formula`` at each loaded length: numerator / (L + added) <= cap."""
    fraction: NDArray[np.float64] = np.minimum(
        formula.numerator / (length + formula.added), formula.cap
    )
    return fraction
