"""Load rating (LRFR) and fleet screening of one member, from its live-load effects.

Pure numpy: no workbook code here. Units are the run's (kip, ft, kip-ft or kN,
m, kN-m); the sign conventions are the engine's (sagging moment positive;
V = sum of the upward forces left of the section; reactions upward).

Rating
------
At every station of a member listed on the Capacities sheet, every vehicle is
rated with the LRFR general equation (AASHTO Manual for Bridge Evaluation,
MBE 6A.4.2.1, from memory)::

    RF = (C - gDC*DC - gDW*DW) / (gLL*(LL + IM)),    C = phi_c*phi_s*(phi*Rn)

where phi*Rn is the factored resistance typed in the Capacities sheet. Each
effect is rated in its own sense, and every quantity of the equation is taken
in that sense:

* ``M+`` (sagging): LL is the vehicle's largest sagging moment, DC and DW the
  dead-load moments with sagging positive, C from ``Resistance M+``;
* ``M-`` (hogging): LL is the vehicle's largest hogging moment as a magnitude,
  DC and DW with hogging positive, C from ``Resistance M-``;
* ``V``: shear is rated in both senses against ``Resistance V``: positive
  shear with the dead-load shear as signed, and negative shear with the
  dead-load shear's sign reversed; the smaller RF is the shear rating.

A dead-load effect that opposes the rated sense (negative in that sense)
relieves it; it is then taken with the relieving factors (Settings ``DC factor
relieving`` 0.90 and ``DW factor relieving`` 0.65, the minimum factors of
AASHTO LRFD Table 3.4.1-2, from memory), so that the relief is not overstated.

phi_s applies to flexure only; shear takes phi_s = 1 (MBE 6A.4.2.4, from
memory), so C = phi_c*(phi*Rn) for shear. For flexure phi_c*phi_s is not taken
below :data:`MIN_CAPACITY_FACTOR` (MBE Eq. 6A.4.2.1-3, from memory).

LL + IM is the vehicle's envelope over its load cases (a library model's
parts) with the distribution factor, the row's Load multiplier and the dynamic load
allowance, exactly as in Envelopes. Where a vehicle produces no effect of the
rated sense (LL + IM = 0) that effect is not rated for it (RF = inf). The
member's rating factor for a vehicle is the smallest over its rated stations
and effects.

Posting and screening
---------------------
For a legal load with 0.3 <= RF < 1 the posting load is ``(W/0.7)*(RF - 0.3)``
(MBE 6A.8.3, from memory), W the vehicle's gross weight in tons (US, 2 kip) or
tonnes (SI, 9.80665 kN); below RF 0.3 the MBE recommends considering closing
the bridge to that load.

Screening compares every vehicle with a reference load (e.g. the design load
the members were designed for): for each member and vehicle, the largest ratio
of the vehicle's effect to the reference's effect of the same kind and sense at
the same station or support, over M+, M-, V+, V-, R+ and R-, where the
reference's effect is at least ``Screening floor`` times its largest effect of
that kind on the member.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np
from numpy.typing import NDArray

from batch.engine.influence import InfluenceLines
from batch.loads import library
from batch.loads.cases import LoadCase
from batch.loads.factors import (
    KIP_PER_TON,
    KN_PER_TONNE,
    MIN_CAPACITY_FACTOR,
    POSTING_DIVISOR,
    POSTING_FLOOR,
)
from batch.model import Capacity, Category, Member, Settings, Vehicle
from batch.model.units import UnitSystem

if TYPE_CHECKING:  # the compiled engine is not needed to read ratings
    from batch.engine.envelope import CaseEffects

__all__ = [
    "FLAGS",
    "RATED_EFFECTS",
    "MemberRating",
    "RatingFactors",
    "VehicleEffects",
    "capacity_factor",
    "dead_load_effects",
    "factored_dead_load",
    "gross_weight",
    "posting_load",
    "rate_member",
    "rating_factor",
    "rating_flag",
    "vehicle_effects",
    "weight_in_tons",
]

#: The rated senses: (name, effect family, sense). Both shear senses are shown as ``V``.
RATED_EFFECTS: tuple[tuple[str, str, int], ...] = (
    ("M+", "moment", 1),
    ("M-", "moment", -1),
    ("V", "shear", 1),
    ("V", "shear", -1),
)

FloatArray = NDArray[np.float64]


# ---------------------------------------------------------------- live and dead loads


@dataclass(frozen=True, kw_only=True)
class VehicleEffects:
    """Each vehicle's largest (>= 0) and smallest (<= 0) value of every effect of a member.

    Arrays (n_vehicles, n_effects), effects laid out as in
    :class:`~batch.engine.influence.InfluenceLines`; the envelope over the
    vehicle's load cases, factored as in :class:`~batch.engine.envelope.CaseEffects`.
    """

    max_value: FloatArray
    min_value: FloatArray


def vehicle_effects(
    effects: CaseEffects, cases: Sequence[LoadCase], n_vehicles: int
) -> VehicleEffects:
    """Per vehicle, the envelope of ``effects`` over its load cases (``LoadCase.vehicle``).

    ``cases`` must be in vehicle order, every vehicle with at least one case (as
    :func:`batch.loads.fleet.fleet_cases` gives them).
    """
    starts = np.searchsorted([c.vehicle for c in cases], np.arange(n_vehicles))
    return VehicleEffects(
        max_value=np.maximum.reduceat(effects.max_value, starts, axis=0),
        min_value=np.minimum.reduceat(effects.min_value, starts, axis=0),
    )


def dead_load_effects(il: InfluenceLines, load: float) -> FloatArray:
    """Effects of a uniform load (force per length, downward) on the whole member.

    One value per effect row (moments, shears, reactions), in the engine's
    sign conventions: the load times the exact area under each influence line.
    """
    positive, negative = il.areas()
    return load * (positive + negative)


# ---------------------------------------------------------------- the rating equation


@dataclass(frozen=True, kw_only=True)
class RatingFactors:
    """Load factors of the rating equation (see the Settings sheet)."""

    dc: float = 1.25
    dw: float = 1.5
    dc_relieving: float = 0.9
    dw_relieving: float = 0.65
    design: float = 1.75
    operating: float = 1.35
    legal: float = 1.45
    permit: float = 1.3

    @classmethod
    def of(cls, settings: Settings) -> RatingFactors:
        """The factors of a run's settings."""
        return cls(
            dc=settings.dc_factor,
            dw=settings.dw_factor,
            dc_relieving=settings.dc_factor_relieving,
            dw_relieving=settings.dw_factor_relieving,
            design=settings.ll_factor_design,
            operating=settings.ll_factor_operating,
            legal=settings.ll_factor_legal,
            permit=settings.ll_factor_permit,
        )

    def live(self, category: Category) -> float:
        """The live-load factor of a vehicle category (design: inventory)."""
        return {"design": self.design, "legal": self.legal, "permit": self.permit}[category]


def capacity_factor(member: Member, flexure: bool) -> float:
    """phi_c * phi_s for flexure (not below :data:`MIN_CAPACITY_FACTOR`), phi_c for shear."""
    if not flexure:
        return member.condition_factor
    return max(member.condition_factor * member.system_factor, MIN_CAPACITY_FACTOR)


def factored_dead_load(
    dc: FloatArray | float, dw: FloatArray | float, factors: RatingFactors
) -> FloatArray:
    """The factored dead load gDC*DC + gDW*DW, effects in the rated sense.

    A dead load that is negative in the rated sense relieves it and takes the
    relieving factor.
    """
    dc_a, dw_a = np.asarray(dc, dtype=float), np.asarray(dw, dtype=float)
    gamma_dc = np.where(dc_a >= 0, factors.dc, factors.dc_relieving)
    gamma_dw = np.where(dw_a >= 0, factors.dw, factors.dw_relieving)
    factored: FloatArray = gamma_dc * dc_a + gamma_dw * dw_a
    return factored


def _ratio(numerator: FloatArray, demand: FloatArray) -> FloatArray:
    """The ratio where the demand is positive and the numerator a number, else inf."""
    rated = (demand > 0) & np.isfinite(numerator)
    return np.where(rated, numerator / np.where(rated, demand, 1.0), np.inf)


def rating_factor(
    capacity: FloatArray | float,
    dc: FloatArray | float,
    dw: FloatArray | float,
    live: FloatArray | float,
    gamma_live: FloatArray | float,
    factors: RatingFactors,
) -> FloatArray:
    """The LRFR general equation, element by element (arrays broadcast).

    All effects are in the rated sense (positive where they add to it);
    ``capacity`` is C = phi_c*phi_s*phi*Rn (NaN: not rated); ``live`` is LL + IM.
    RF is ``inf`` where the live load is 0 (or C is NaN): nothing to rate.
    """
    numerator = np.asarray(capacity, dtype=float) - factored_dead_load(dc, dw, factors)
    return _ratio(numerator, np.asarray(live, dtype=float) * np.asarray(gamma_live, dtype=float))


@dataclass(frozen=True, kw_only=True)
class MemberRating:
    """One member's governing rating per vehicle (arrays of n_vehicles).

    ``rf`` is the smallest RF over the rated stations and effects (inventory
    level for design loads; ``inf`` where the vehicle loads no rated effect);
    ``rf_operating`` the operating-level RF of design loads at the same place
    (NaN for other categories); ``effect`` indexes :data:`RATED_EFFECTS` (-1:
    none); ``station`` is the governing station's row among the member's
    stations (-1: none). ``posting`` is the posting load of a legal load with
    0.3 <= RF < 1 in US tons or tonnes (NaN otherwise), ``flag`` the code of its
    note in :data:`FLAGS`.
    """

    rf: FloatArray
    rf_operating: FloatArray
    effect: NDArray[np.int64]
    station: NDArray[np.int64]
    posting: FloatArray
    flag: NDArray[np.int64]


def _given_or(values: Sequence[float | None], computed: FloatArray) -> FloatArray:
    return np.array([c if v is None else v for v, c in zip(values, computed, strict=True)])


def rate_member(
    member: Member,
    il: InfluenceLines,
    capacities: Sequence[Capacity],
    live: VehicleEffects,
    categories: Sequence[Category],
    factors: RatingFactors,
    weights: Sequence[float],
) -> MemberRating:
    """Rate every vehicle at the member's ``capacities`` stations (see the module docstring).

    ``weights`` are the vehicles' gross weights in US tons or tonnes, for the
    posting loads. ``capacities`` are the Capacities rows of this member, at least one
    (validated: each on one of the member's stations); ``live`` the vehicles'
    effects on the member and ``categories`` their categories, in vehicle order.
    """
    found_rows = [
        None if (at := c.section(member.spans)) is None else il.station_index(at)
        for c in capacities
    ]
    if not capacities or None in found_rows:
        raise ValueError(f"member {member.id!r}: give capacities at the member's own stations")
    rows = np.array(found_rows, dtype=np.int64)
    moment, shear = il.moment_rows.start + rows, il.shear_rows.start + rows
    dc_all, dw_all = dead_load_effects(il, member.dc_load), dead_load_effects(il, member.dw_load)
    dead = {
        "moment": (
            _given_or([c.dc_m for c in capacities], dc_all[moment]),
            _given_or([c.dw_m for c in capacities], dw_all[moment]),
        ),
        "shear": (
            _given_or([c.dc_v for c in capacities], dc_all[shear]),
            _given_or([c.dw_v for c in capacities], dw_all[shear]),
        ),
    }
    resistance = {
        "M+": [c.resistance_m_pos for c in capacities],
        "M-": [c.resistance_m_neg for c in capacities],
        "V": [c.resistance_v for c in capacities],
    }
    numerators, lives = [], []
    for name, family, sense in RATED_EFFECTS:
        phi = capacity_factor(member, flexure=family == "moment")
        rn = np.array([np.nan if r is None else r for r in resistance[name]], dtype=float)
        dc, dw = dead[family]
        numerators.append(phi * rn - factored_dead_load(sense * dc, sense * dw, factors))
        extreme = live.max_value if sense > 0 else live.min_value
        lives.append(sense * extreme[:, moment if family == "moment" else shear])
    # (n_vehicles, n_capacities, n_effects), flattened station-major: ties go to the first
    # station, then to the first effect of RATED_EFFECTS.
    numerator = np.broadcast_to(np.stack(numerators, axis=-1), (len(categories), *rows.shape, 4))
    ll = np.stack(lives, axis=-1)
    gamma = np.array([factors.live(c) for c in categories])
    rf = _ratio(numerator, ll * gamma[:, None, None]).reshape(len(categories), -1)
    best = rf.argmin(axis=1)
    n = np.arange(len(categories))
    governing = rf[n, best]
    found = np.isfinite(governing)
    at, effect = np.divmod(best, len(RATED_EFFECTS))
    design = found & (np.array(categories) == "design")
    operating = np.where(
        design, _ratio(numerator[n, at, effect], ll[n, at, effect] * factors.operating), np.nan
    )
    posting = [
        posting_load(float(rf), w) if c == "legal" else None
        for rf, w, c in zip(governing, weights, categories, strict=True)
    ]
    flags = [
        rating_flag(c, float(rf), float(op))
        for rf, op, c in zip(governing, operating, categories, strict=True)
    ]
    return MemberRating(
        rf=governing,
        rf_operating=operating,
        effect=np.where(found, effect, -1),
        station=np.where(found, rows[at], -1),
        posting=np.array([np.nan if p is None else p for p in posting], dtype=float),
        flag=np.array([0 if f is None else FLAGS.index(f) for f in flags], dtype=np.int64),
    )


# ---------------------------------------------------------------- posting


def gross_weight(vehicle: Vehicle, units: UnitSystem) -> float:
    """Gross weight of a vehicle in the force unit, times the row's Load multiplier.

    The sum of its axle loads, or for a library model that of its principal
    (first) part; lane loads do not count.
    """
    if vehicle.library:
        return library.model(vehicle.library).weight(units) * vehicle.factor
    return vehicle.train.weight * vehicle.factor


def weight_in_tons(force: float, units: UnitSystem) -> float:
    """A weight in US tons (from kip) or tonnes (from kN)."""
    return force / (KIP_PER_TON if units == "US" else KN_PER_TONNE)


def posting_load(rf: float, weight: float) -> float | None:
    """The MBE posting load (W/0.7)(RF - 0.3) for 0.3 <= RF < 1, else None.

    ``weight`` W and the result in the same unit (tons or tonnes).
    """
    if not POSTING_FLOOR <= rf < 1.0:
        return None
    return weight / POSTING_DIVISOR * (rf - POSTING_FLOOR)


#: The notes a governing rating may carry, by code (``MemberRating.flag``); 0 is none.
FLAGS: tuple[str, ...] = (
    "",
    "loads none of the rated effects at the rated stations",
    "factored dead load alone exceeds the capacity",
    f"RF below {POSTING_FLOOR}: the MBE recommends considering closing the bridge to this load",
    "RF below 1: post at the posting load",
    "RF below 1: the permit load is not carried",
    "below the operating level",
    "below the inventory level",
)


def rating_flag(category: Category, rf: float, rf_operating: float) -> str | None:
    """A short note on a governing RF (one of :data:`FLAGS`; None when there is nothing to say).

    ``rf`` is ``inf`` where the vehicle loads none of the rated effects.
    """
    if np.isinf(rf) and rf > 0:
        return FLAGS[1]
    if not np.isfinite(rf) or rf >= 1.0:
        return None
    if rf < 0:
        return FLAGS[2]
    if category == "legal":
        return FLAGS[3] if rf < POSTING_FLOOR else FLAGS[4]
    if category == "permit":
        return FLAGS[5]
    if np.isfinite(rf_operating) and rf_operating < 1.0:
        return FLAGS[6]
    return FLAGS[7]
