"""Load cases: what the engine moves across a member.

A *load case* is an axle train (with fixed or ranged spacings), an optional
uniform lane load, a dynamic load allowance on the axles and a multiplier. A
workbook vehicle is one load case; a library load model may expand to several
(its parts), each with its own label (:mod:`batch.loads.fleet`). Forces, lengths
and loads per length are in the run's units; loads act downward.

A case may be limited to some effects (its *scope*) and to some members (its
*span rule*, :meth:`LoadCase.applies_to`): the engine gives it no effect
elsewhere, exactly as if it were not in the fleet there.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from batch.model import AxleTrain

__all__ = ["SCOPES", "SPAN_RULE_REL_TOL", "ImpactFormula", "LoadCase"]

#: Where a load case applies (the effects it may govern):
#:
#: * ``all``: every effect;
#: * ``interior-hogging``: the HL-93 rule for two trucks (AASHTO LRFD 3.6.1.3.1): hogging
#:   moment between the points of contraflexure under a uniform load on every span, and
#:   reactions at interior supports;
#: * ``moments``: moments only (both senses), e.g. a lane loading's concentrated load for
#:   moment (AASHTO Standard Specifications, Fig. 3.7.6B);
#: * ``shears-reactions``: shears and reactions only, e.g. a lane loading's concentrated load
#:   for shear;
#: * ``hogging``: hogging moment only, at every station;
#: * ``hogging-interior-reactions``: hogging moment at every station and reactions at
#:   interior supports (the lane-type legal load's two-truck model, MBE 6A.4.4.2.1).
SCOPES = (
    "all",
    "interior-hogging",
    "moments",
    "shears-reactions",
    "hogging",
    "hogging-interior-reactions",
)

#: A member's span equal to a span rule's limit within this fraction meets the rule (a
#: limit converted exactly between unit systems may differ from the typed span in the
#: last bits).
SPAN_RULE_REL_TOL = 1e-9


@dataclass(frozen=True, kw_only=True)
class ImpactFormula:
    """An impact allowance that depends on the loaded length: I = numerator / (L + added) <= cap.

    ``numerator`` and ``added`` are lengths in the unit L is measured in; ``cap`` a
    fraction. The engine finds L for every effect (:mod:`batch.engine.impact`).
    """

    numerator: float
    added: float
    cap: float

    def text(self, length_unit: str) -> str:
        """The formula as text, e.g. ``50/(L + 125) <= 0.3, L in ft``."""
        return (
            f"{self.numerator:.6g}/(L + {self.added:.6g}) <= {self.cap:g}, L in {length_unit}"
            " (per effect, on axles and lane)"
        )

    def scaled(self, length: float) -> ImpactFormula:
        """The same formula for L measured in a unit ``length`` times smaller (e.g. ft to m)."""
        return ImpactFormula(
            numerator=self.numerator * length, added=self.added * length, cap=self.cap
        )


@dataclass(frozen=True, kw_only=True)
class LoadCase:
    """One train of axles (and lane load) moved across the member.

    ``train`` is the axle train (force, length); ``lane_load`` force per length; ``impact`` the
    dynamic load allowance on axles (fraction); ``impact_formula``, when given, replaces
    it: the allowance is then computed for every effect from its loaded length and
    applies to the axles and the lane load alike (the Standard Specifications' impact,
    Art. 3.8), and ``impact`` is 0. ``factor`` multiplies all.
    ``scope`` limits the effects the case may govern (see :data:`SCOPES`);
    ``min_span`` limits the members it applies to: only members with a span at
    least this long (length unit; 0: every member). ``drop_adverse_axles`` leaves
    out axles that would lessen an effect (AASHTO LRFD 3.6.1.3.1). ``other_span_load``
    places the train, which must be one axle (a concentrated load), twice: at its
    worst in one span and again, with the same weight, at its worst in one other span
    (the second concentrated load of the Standard Specifications' lane loading for the
    largest negative moment of continuous spans, Art. 3.11.3). ``fatigue`` marks a
    fatigue load: its effects use the member's single-lane distribution factors with
    the one-lane multiple presence factor divided out, and its moment range is kept
    (:mod:`batch.engine.fatigue`). ``vehicle`` indexes the fleet vehicle it belongs to.
    """

    label: str
    train: AxleTrain
    lane_load: float = 0.0
    impact: float = 0.0
    impact_formula: ImpactFormula | None = None
    factor: float = 1.0
    scope: str = "all"
    min_span: float = 0.0
    drop_adverse_axles: bool = False
    other_span_load: bool = False
    fatigue: bool = False
    vehicle: int = 0  # index of the fleet vehicle this case belongs to

    def applies_to(self, spans: Sequence[float]) -> bool:
        """Whether the case applies to a member with these span lengths (its span rule)."""
        return self.min_span <= 0.0 or max(spans) >= self.min_span * (1.0 - SPAN_RULE_REL_TOL)
