"""The fatigue moment range of a member: at every station, under each fatigue load.

A fatigue load (a load case with ``fatigue`` set, e.g. the AASHTO LRFD fatigue
truck, Art. 3.6.1.4.1) crosses the member once; the moment at a station then
swings between its largest and its smallest value, and the *moment range* is
the difference (the live-load stress range of a detail, AASHTO LRFD 6.6.1.2,
comes from it). Both extremes are those of the case's own envelope: the same
factor, single-lane distribution factor and dynamic load allowance as in
:func:`batch.engine.envelope.case_effects`. Sagging moment is positive, so the
range is ``M max - M min >= 0``; on a simple span ``M min`` is 0 and the range is
the largest moment.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np
from numpy.typing import NDArray

from batch.loads.cases import LoadCase

if TYPE_CHECKING:  # the writer imports this module and must not load the compiled kernel
    from batch.engine.envelope import CaseEffects

__all__ = ["FatigueRanges", "fatigue_ranges"]


@dataclass(frozen=True, kw_only=True)
class FatigueRanges:
    """Moment extremes and range of each fatigue load case at every station of a member.

    ``cases`` indexes the run's load cases (one row per fatigue case);
    ``m_max``, ``m_min`` and ``m_range`` are (n_fatigue_cases, n_stations) in
    the moment unit, stations laid out as in the member's envelope.
    """

    cases: NDArray[np.int64]
    m_max: NDArray[np.float64]
    m_min: NDArray[np.float64]

    @property
    def m_range(self) -> NDArray[np.float64]:
        """Largest minus smallest moment at each station (>= 0)."""
        return self.m_max - self.m_min


def fatigue_ranges(effects: CaseEffects, cases: Sequence[LoadCase]) -> FatigueRanges | None:
    """The moment range under each fatigue case of ``cases``, or None when there is none."""
    rows = np.array([i for i, c in enumerate(cases) if c.fatigue], dtype=np.int64)
    if rows.size == 0:
        return None
    moments = effects.lines.moment_rows
    return FatigueRanges(
        cases=rows,
        m_max=effects.max_value[rows][:, moments],
        m_min=effects.min_value[rows][:, moments],
    )
