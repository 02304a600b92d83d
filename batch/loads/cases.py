"""Load cases: what the engine moves across a member.

A *load case* is an axle train (with fixed or ranged spacings), an optional
uniform lane load, a dynamic load allowance on the axles and a multiplier. A
workbook vehicle is one load case; a library load model may expand to several
(its parts), each with its own label (:mod:`batch.loads.fleet`). Forces, lengths
and loads per length are in the run's units; loads act downward.
"""

from __future__ import annotations

from dataclasses import dataclass

from batch.model import AxleTrain

__all__ = ["SCOPES", "LoadCase"]

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
#: * ``hogging``: hogging moment only, at every station.
SCOPES = ("all", "interior-hogging", "moments", "shears-reactions", "hogging")


@dataclass(frozen=True, kw_only=True)
class LoadCase:
    """One train of axles (and lane load) moved across the member.

    ``train`` is the axle train (force, length); ``lane_load`` force per length; ``impact`` the
    dynamic load allowance on axles (fraction); ``factor`` multiplies all.
    ``scope`` limits the effects the case may govern (see :data:`SCOPES`);
    ``drop_adverse_axles`` leaves out axles that would lessen an effect
    (AASHTO LRFD 3.6.1.3.1). ``other_span_load`` places the train, which must be
    one axle (a concentrated load), twice: at its worst in one span and again, with
    the same weight, at its worst in one other span (the second concentrated load of
    the Standard Specifications' lane loading for the largest negative moment of
    continuous spans, Art. 3.11.3). ``vehicle`` indexes the fleet vehicle it belongs to.
    """

    label: str
    train: AxleTrain
    lane_load: float = 0.0
    impact: float = 0.0
    factor: float = 1.0
    scope: str = "all"
    drop_adverse_axles: bool = False
    other_span_load: bool = False
    vehicle: int = 0  # index of the fleet vehicle this case belongs to
