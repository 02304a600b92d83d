"""A member's envelope, the six enveloped effects declared once, and where each governs.

An effect is one quantity and sense of a member's envelope: the largest
sagging moment ``M max``, the largest hogging moment ``M min``, the largest and
smallest shear ``V max`` and ``V min`` at every station, and the largest and
smallest reaction ``R max`` and ``R min`` at every support. Sign conventions
are the engine's: sagging moment positive; V = sum of the upward forces left of
the section; reactions upward positive.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

import numpy as np
from numpy.typing import NDArray

from batch.model.units import Quantity

__all__ = [
    "EFFECTS",
    "TIE_REL_TOL",
    "Effect",
    "Governing",
    "ImpactRows",
    "MemberEnvelope",
    "governing_row",
]

Rows = Literal["station", "support"]


@dataclass(frozen=True, kw_only=True)
class Governing:
    """The governing value of one effect and sense (e.g. ``M max``), row by row.

    One row per station (moments, shears) or per support (reactions). ``case``
    indexes the load cases (-1 where no case gives a value of that sign, in which
    case ``value`` is 0); ``position`` is the governing front axle's x (NaN when
    only a lane load acts); ``direction`` is +1 left to right, -1 right to left,
    0 none. ``spacing`` (rows, W) is the spacing the governing train used for
    each of its ranged gaps, front to rear (length unit; W the most ranged gaps
    of any of the load cases, 0 when none has one); NaN past the train's own
    ranged gaps, for a train of fixed spacings and where ``position`` is NaN.
    ``concurrent`` is the effect that acts with the governing value, the same
    load case standing in the same place (:func:`batch.engine.envelope.envelope_of`):
    for a moment, the shear at its station; for a shear, the moment at its
    station (force and moment units, same signs); NaN for a reaction or a deflection, where no
    case governs and for a load placed again in another span.
    """

    value: NDArray[np.float64]
    case: NDArray[np.int64]
    position: NDArray[np.float64]
    direction: NDArray[np.int8]
    spacing: NDArray[np.float64]
    concurrent: NDArray[np.float64]


@dataclass(frozen=True, kw_only=True)
class ImpactRows:
    """The Standard Specifications' impact of one effect and sense, row by row.

    ``loaded_length`` is the loaded length L of the effect at each station or
    support (length unit, :func:`batch.engine.impact.loaded_lengths`);
    ``fraction`` the impact I = 50/(L + 125) <= 0.30 there (L in ft; the same
    formula converted in an SI run), which every load case following that rule
    includes in its value of the effect, on axles and lane load alike.
    """

    loaded_length: NDArray[np.float64]
    fraction: NDArray[np.float64]


@dataclass(frozen=True, kw_only=True)
class MemberEnvelope:
    """Envelopes of one member: station rows (M, V) and support rows (R).

    ``labels`` names the load cases that ``Governing.case`` indexes. Station
    rows: ``station_span`` (from 1), ``station_fraction`` of the span and
    ``station_x`` from the left end; support rows: ``support_x``. ``impact``
    holds the Standard Specifications' impact of every effect, one
    :class:`ImpactRows` per :data:`EFFECTS` entry in that order; None when no
    load case of the run follows that rule.
    """

    member: str
    labels: tuple[str, ...]
    station_span: NDArray[np.int64]
    station_fraction: NDArray[np.float64]
    station_x: NDArray[np.float64]
    support_x: NDArray[np.float64]
    m_max: Governing
    m_min: Governing
    v_max: Governing
    v_min: Governing
    r_max: Governing
    r_min: Governing
    impact: tuple[ImpactRows, ...] | None = None


#: Two candidate governing values (load cases at one station, or stations of one member)
#: within this fraction of the extreme are a tie, and the first wins: round-off is not a
#: difference, so a symmetric member names the same vehicle and station every time.
TIE_REL_TOL = 1e-12


@dataclass(frozen=True, kw_only=True)
class Effect:
    """One enveloped effect and sense, e.g. the largest sagging moment ``M max``.

    ``sense`` is +1 for the largest (max) and -1 for the smallest (min) value;
    ``attr`` names the :class:`MemberEnvelope` field; ``rows`` says whether it
    is given at stations or at supports.
    """

    name: str
    attr: str
    quantity: Quantity
    sense: int
    rows: Rows
    meaning: str

    def extremes(self, env: MemberEnvelope) -> Governing:
        """The extremes of this effect in ``env``."""
        result: Governing = getattr(env, self.attr)
        return result


EFFECTS: tuple[Effect, ...] = (
    Effect(
        name="M max",
        attr="m_max",
        quantity="moment",
        sense=1,
        rows="station",
        meaning="Largest sagging (positive) live-load moment.",
    ),
    Effect(
        name="M min",
        attr="m_min",
        quantity="moment",
        sense=-1,
        rows="station",
        meaning="Largest hogging live-load moment (the most negative).",
    ),
    Effect(
        name="V max",
        attr="v_max",
        quantity="force",
        sense=1,
        rows="station",
        meaning="Largest live-load shear (V = sum of upward forces left of the section).",
    ),
    Effect(
        name="V min",
        attr="v_min",
        quantity="force",
        sense=-1,
        rows="station",
        meaning="Smallest (most negative) live-load shear.",
    ),
    Effect(
        name="R max",
        attr="r_max",
        quantity="force",
        sense=1,
        rows="support",
        meaning="Largest live-load support reaction, upward positive.",
    ),
    Effect(
        name="R min",
        attr="r_min",
        quantity="force",
        sense=-1,
        rows="support",
        meaning="Smallest live-load support reaction; below 0 is uplift.",
    ),
)


def governing_row(effect: Effect, env: MemberEnvelope) -> int | None:
    """Row of the member's governing (extreme) value of ``effect``, or None.

    None when no load case gives a value of the effect's sign anywhere on the
    member. Values within :data:`TIE_REL_TOL` of the extreme tie; the first row
    (the leftmost station or support) wins, so symmetric members resolve the
    same way every time.
    """
    ext = effect.extremes(env)
    signed = effect.sense * ext.value
    if signed.size == 0:
        return None
    best = float(np.max(signed))
    if best <= 0.0 or not np.any(ext.case >= 0):
        return None
    return int(np.flatnonzero(signed >= best * (1.0 - TIE_REL_TOL))[0])
