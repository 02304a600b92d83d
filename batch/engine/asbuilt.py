"""What a run computes for a member as built, beside its envelope (no numba here).

:class:`MemberAsBuilt` gathers the results that follow from the Segments,
Analysis and Capacities sheets: the live-load deflection envelope of a member
that gives its EI scale (:mod:`batch.engine.deflection`). Each is None when the
member does not ask for it. Units and signs are those of each result's module.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from batch.engine.effects import Governing

__all__ = ["DEFLECTION_DF_SOURCES", "MemberAsBuilt", "MemberDeflection"]


#: Where a member's deflection distribution factor comes from, by code.
DEFLECTION_DF_SOURCES = ("DF deflection", "girder layout", "DF moment")


@dataclass(frozen=True, kw_only=True)
class MemberDeflection:
    """A member's live-load deflection envelope and its check against the limit, span by span.

    ``down`` and ``up`` hold, per station (laid out as in the member's
    envelope), the largest downward (>= 0) and upward (<= 0) deflection, in the
    deflection unit, with the governing load case (indexing ``labels``), front
    axle position and direction. ``span_deflection`` is the largest downward
    deflection at the stations of each span (deflection unit), ``span_ratio``
    that span's length over it (both in one unit; inf when it does not deflect
    down), ``limit`` the least ratio
    accepted. ``df`` is the distribution factor used and ``df_source`` indexes
    :data:`DEFLECTION_DF_SOURCES`.
    """

    labels: tuple[str, ...]
    down: Governing
    up: Governing
    span_length: NDArray[np.float64]
    span_deflection: NDArray[np.float64]
    span_ratio: NDArray[np.float64]
    limit: float
    df: float
    df_source: int

    @property
    def passes(self) -> NDArray[np.bool_]:
        """Whether each span's ratio is at least the limit."""
        result: NDArray[np.bool_] = self.span_ratio >= self.limit
        return result


@dataclass(frozen=True, kw_only=True)
class MemberAsBuilt:
    """A member's deflection envelope (None: it gives no EI scale)."""

    deflection: MemberDeflection | None = None
