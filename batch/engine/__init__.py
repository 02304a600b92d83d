"""The numerical engine: exact influence lines and moving-load extremes.

Pure numpy/scipy; it knows nothing of workbooks. See :mod:`batch.engine.influence`
for the method and sign conventions.
"""

from batch.engine.envelope import Extremes, LoadCase, MemberEnvelope, member_envelope
from batch.engine.influence import InfluenceLines, UnstableMemberError, influence_lines
from batch.engine.moving import AxleExtremes, axle_extremes

__all__ = [
    "AxleExtremes",
    "Extremes",
    "InfluenceLines",
    "LoadCase",
    "MemberEnvelope",
    "UnstableMemberError",
    "axle_extremes",
    "influence_lines",
    "member_envelope",
]
