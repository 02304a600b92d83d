"""Stage 5, the engine: exact influence lines and moving-load extremes.

Pure numpy/scipy; it knows nothing of workbooks. See :mod:`batch.engine.influence`
for the method and sign conventions.
"""

from batch.engine.envelope import (
    CaseEffects,
    Extremes,
    MemberEnvelope,
    case_effects,
    envelope_of,
    member_envelope,
)
from batch.engine.influence import InfluenceLines, UnstableMemberError, influence_lines
from batch.engine.moving import AxleExtremes, axle_extremes

__all__ = [
    "AxleExtremes",
    "CaseEffects",
    "Extremes",
    "InfluenceLines",
    "MemberEnvelope",
    "UnstableMemberError",
    "axle_extremes",
    "case_effects",
    "envelope_of",
    "influence_lines",
    "member_envelope",
]
