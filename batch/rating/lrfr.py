"""Load rating (LRFR, LFR, ASR) and fleet screening of one member, from its effects.

Pure numpy: no workbook code here. Units are the run's (kip, ft, kip-ft or kN,
m, kN-m); the sign conventions are the engine's (sagging moment positive;
V = sum of the upward forces left of the section; reactions upward).

Rating
------
At every station of a member listed on the Capacities sheet, every vehicle is
rated. An LRFR member (the default) with the general equation of the AASHTO
Manual for Bridge Evaluation (MBE 6A.4.2.1; the terms secondary in Khan 2010,
the layout from memory)::

    RF = (C - gDC*DC - gDW*DW) / (gLL*(LL + IM)),    C = phi_c*phi_s*(phi*Rn)

where phi*Rn is the factored resistance typed in the Capacities sheet; an LFR or
ASR member (its Rating method; MBE Section 6B) with::

    RF = (C - A1*(DC + DW)) / (A2*L*(1 + I))

C the capacity typed (ASR: the inventory and the operating allowable), A1 = 1.3
and A2 = 2.17 (inventory) or 1.3 (operating) for LFR, A1 = A2 = 1 for ASR, and I
the Standard Specifications' impact at the effect's loaded length, on axles and
lane loads (batch/loads/factors.py has each value with its status). Design loads
are rated at the inventory level with the operating level beside it; under LFR
and ASR legal loads and permits are rated at the operating level.

A *check* is one station and effect in its sense, each rated with every term
kept (:class:`MemberRating`):

* ``M+`` (sagging): LL is the vehicle's largest sagging moment, DC and DW the
  dead-load moments with sagging positive, C from ``Resistance M+``;
* ``M-`` (hogging): LL is the vehicle's largest hogging moment as a magnitude,
  DC and DW with hogging positive, C from ``Resistance M-``;
* ``V+`` and ``V-``: shear in both senses against ``Resistance V``: positive
  shear with the dead-load shear as signed, negative shear with its sign reversed.

LRFR: a dead-load effect that opposes the rated sense (negative in that sense)
relieves it; it is then taken with the relieving factors (Settings ``DC factor
relieving`` 0.90 and ``DW factor relieving`` 0.65, the minimum factors of AASHTO
LRFD Table 3.4.1-2), so that the relief is not overstated. phi_s applies to
flexure only; shear takes phi_s = 1 (MBE 6A.4.2.4, from memory). For flexure
phi_c*phi_s is not taken below :data:`MIN_CAPACITY_FACTOR` (MBE Eq. 6A.4.2.1-3).

Service limit states (LRFR)
---------------------------
Each row of the Service sheet (an LRFR member's station) is checked at the service
limit state of its Material (MBE Table 6A.4.2.2-1): steel at Service II, prestressed
concrete at Service III, reinforced concrete at Service I (permits only). The check is
one more check of the member, after its strength checks, in the moment sense of the
row's ``Service effect``, rated in stresses at the checked fibre (MBE 6A.4.2.1, C =
fR)::

    RF = (fR - fD) / (gL * fLL)
    fD  = s*M_DC / S_nc + (1 - s)*M_DC / S_lt + M_DW / S_lt
    fLL = M_(LL+IM) / S_st

M the moments in the checked sense (positive where they add to it; DC M and DW M of a
Capacities row at the same station where it gives them), s the row's DC1 share, S
the section moduli (S_lt blank: S_nc; S_st blank: S_lt), dead-load factors 1.0.
fR is 0.95*Rh*Fy for a composite steel section (S lt or S st given) and
0.80*Rh*Fy for a non-composite one (AASHTO LRFD 6.10.4.2.2, flange lateral bending not
included), 0.9*fy for reinforced concrete, the engineer's allowable tension plus the
effective prestress compression for prestressed concrete (tension at the fibre
positive: the bottom fibre under sagging moment), or the engineer's Allowable stress.
Stresses are in ksi (US: M in kip-ft, S in in3, so f = 12*M/S) or MPa (SI: kN-m and
mm3, f = 1e6*M/S). gL is the service factor of the load's kind (design inventory and
operating, legal, permit); where the manual does not check a kind at that limit
state the check is not rated for it (RF = inf). batch/loads/factors.py holds each
value with its status.

LL + IM = (1 + IM)*LL axles + (1 + IM on lane)*LL lane is the vehicle's largest
effect over its load cases (a library model's parts), recomputed from the
engine's static parts with the live-load factor, dynamic allowance and
distribution factor the bridge's traffic and the vehicle's kind of crossing set
(:mod:`batch.rating.traffic`). Where a vehicle produces no effect of the rated
sense (LL + IM = 0) that check is not rated for it (RF = inf). The member's
rating factor for a vehicle is the smallest over its checks, strength and service
alike, and the governing check names its limit state. A design load's operating RF is
the one at the governing check, or, where that check has no operating level (Service
III), the smallest operating RF over the checks.

Posting and screening
---------------------
For a legal load with 0.3 <= RF < 1 the posting load is ``(W/0.7)*(RF - 0.3)``
(MBE 6A.8.3; secondary, Khan 2010), W the vehicle's gross weight in tons (US, 2
kip) or tonnes (SI, 9.80665 kN); below RF 0.3 the MBE recommends considering
closing the bridge to that load. An LFR or ASR member is posted at its operating
rating RF*W (MBE 6B.7, from memory). A legal load is posted on its governing RF, which
may be a service one where the engineer gave the section (``SERVICE_POSTING``).

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
from typing import TYPE_CHECKING, Any

import numpy as np
from numpy.typing import NDArray

from batch.engine.impact import impact_fraction
from batch.engine.influence import InfluenceLines
from batch.loads import library
from batch.loads.cases import ImpactFormula, LoadCase
from batch.loads.factors import (
    ASR_FACTOR,
    KIP_PER_TON,
    KN_PER_TONNE,
    LFR_A1,
    MIN_CAPACITY_FACTOR,
    POSTING_DIVISOR,
    POSTING_FLOOR,
    SERVICE_CHECKS,
    SERVICE_DEAD_LOAD,
    SERVICE_III_INVENTORY,
    SERVICE_LEVELS,
)
from batch.model import (
    CATEGORIES,
    RATING_METHODS,
    Bridge,
    Capacity,
    Category,
    Member,
    ServiceSection,
    Settings,
    Vehicle,
)
from batch.model.units import IN_CONSISTENT_UNITS, UnitSystem
from batch.rating.traffic import (
    GAMMA_SOURCES,
    LIMIT_STATES,
    VehicleTerms,
    member_df,
    standard_terms,
)

if TYPE_CHECKING:  # the compiled engine is not needed to read ratings
    from batch.engine.envelope import CaseEffects

__all__ = [
    "FLAGS",
    "FR_RULES",
    "RATED_EFFECTS",
    "MemberDeadLoads",
    "MemberRating",
    "RatingFactors",
    "VehicleEffects",
    "by_check",
    "capacity_factor",
    "dead_load_effects",
    "dead_load_factors",
    "factored_dead_load",
    "gross_weight",
    "member_dead_loads",
    "operating_rating",
    "posting_load",
    "rate_member",
    "rated_live",
    "rating_factor",
    "rating_flag",
    "stress_per_moment",
    "vehicle_effects",
    "weight_in_tons",
]

#: The rated senses: (name, effect family, sense). Both senses of shear are rated against
#: Resistance V: V+ with the dead-load shear as signed, V- with its sign reversed.
RATED_EFFECTS: tuple[tuple[str, str, int], ...] = (
    ("M+", "moment", 1),
    ("M-", "moment", -1),
    ("V+", "shear", 1),
    ("V-", "shear", -1),
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
    def of(cls, settings: Settings, bridge: Bridge | None = None) -> RatingFactors:
        """The factors of a run's settings, with a bridge's own ones where it gives them.

        The legal and permit factors here are the Settings' (or the bridge's own);
        :func:`batch.rating.traffic.vehicle_terms` takes them from the MBE tables.
        """

        def own(value: float | None, default: float) -> float:
            return default if value is None else value

        b = bridge or Bridge(id="")
        return cls(
            dc=own(b.dc_factor, settings.dc_factor),
            dw=own(b.dw_factor, settings.dw_factor),
            dc_relieving=settings.dc_factor_relieving,
            dw_relieving=settings.dw_factor_relieving,
            design=own(b.ll_factor_design, settings.ll_factor_design),
            operating=own(b.ll_factor_operating, settings.ll_factor_operating),
            legal=own(b.ll_factor_legal, settings.ll_factor_legal),
            permit=own(b.ll_factor_permit, settings.ll_factor_permit),
        )

    def live(self, category: Category) -> float:
        """The live-load factor of a vehicle category (design: inventory)."""
        return {"design": self.design, "legal": self.legal, "permit": self.permit}[category]


def capacity_factor(member: Member, flexure: bool) -> float:
    """phi_c * phi_s for flexure (not below :data:`MIN_CAPACITY_FACTOR`), phi_c for shear."""
    if not flexure:
        return member.condition_factor
    return max(member.condition_factor * member.system_factor, MIN_CAPACITY_FACTOR)


def dead_load_factors(
    dc: FloatArray | float, dw: FloatArray | float, factors: RatingFactors
) -> tuple[FloatArray, FloatArray]:
    """The factors gDC and gDW of dead loads in the rated sense (relieving ones: the minimum)."""
    dc_a, dw_a = np.asarray(dc, dtype=float), np.asarray(dw, dtype=float)
    gamma_dc: FloatArray = np.where(dc_a >= 0, factors.dc, factors.dc_relieving)
    gamma_dw: FloatArray = np.where(dw_a >= 0, factors.dw, factors.dw_relieving)
    return gamma_dc, gamma_dw


def factored_dead_load(
    dc: FloatArray | float, dw: FloatArray | float, factors: RatingFactors
) -> FloatArray:
    """The factored dead load gDC*DC + gDW*DW, effects in the rated sense.

    A dead load that is negative in the rated sense relieves it and takes the
    relieving factor.
    """
    gamma_dc, gamma_dw = dead_load_factors(dc, dw, factors)
    factored: FloatArray = gamma_dc * np.asarray(dc, dtype=float) + gamma_dw * np.asarray(
        dw, dtype=float
    )
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


# ---------------------------------------------------------------- service limit states

_STEEL = SERVICE_CHECKS["steel"].limit.numbers
#: How a service check's allowable stress fR was found, by code (``MemberRating.k_fr_rule``).
FR_RULES: tuple[str, ...] = (
    f"{_STEEL[0]:.2f} Rh Fy: composite section (AASHTO LRFD 6.10.4.2.2)",
    f"{_STEEL[1]:.2f} Rh Fy: non-composite section (AASHTO LRFD 6.10.4.2.2)",
    f"{SERVICE_CHECKS['reinforced concrete'].limit.number:g} fy (MBE 6A.5.4.2.2)",
    "Allowable stress + Prestress stress (tension positive)",
    "Allowable stress, as given",
)
#: Column of ``MemberRating.k_gamma`` of each vehicle category (design: inventory).
_LEVEL_OF: dict[str, int] = {
    "design": SERVICE_LEVELS.index("inventory"),
    "legal": SERVICE_LEVELS.index("legal"),
    "permit": SERVICE_LEVELS.index("permit"),
}
_OPERATING_LEVEL = SERVICE_LEVELS.index("operating")


def stress_per_moment(units: UnitSystem) -> float:
    """The stress (ksi or MPa) of a unit moment (kip-ft or kN-m) on a unit S (in3 or mm3).

    12 in the US system (12 in per ft), 1e6 in SI (1e6 N-mm per kN-m).
    """
    scale = IN_CONSISTENT_UNITS[units]
    return 1.0 / (scale["section_modulus"] * scale["stress"])


@dataclass(frozen=True, kw_only=True)
class _ServiceRow:
    """The service check a Service row asks for (see the module docstring)."""

    effect: int
    limit_state: int
    s_nc: float
    s_lt: float
    s_st: float
    fy: float
    rh: float
    allowable: float
    prestress: float
    fr: float
    rule: int
    dc1_share: float
    gamma: tuple[float, ...]
    gamma_source: tuple[int, ...]


def _service_row(c: ServiceSection) -> _ServiceRow:
    """The check a Service row asks for (validated: the member is rated by LRFR)."""
    check = SERVICE_CHECKS[c.material]
    s_lt = c.s_nc if c.s_lt is None else c.s_lt
    rh = 1.0 if c.rh is None else c.rh
    if c.material == "prestressed concrete":
        fr = (c.allowable_stress or 0.0) + (c.prestress_stress or 0.0)
        rule = 3
    elif c.allowable_stress is not None:
        fr, rule = c.allowable_stress, 4
    elif c.material == "steel":
        composite = c.s_lt is not None or c.s_st is not None
        fr = (_STEEL[0] if composite else _STEEL[1]) * rh * (c.fy or 0.0)
        rule = 0 if composite else 1
    else:
        fr, rule = check.limit.number * (c.fy or 0.0), 2
    factors = dict(check.factors)
    table = GAMMA_SOURCES.index("MBE Table 6A.4.2.2-1, service limit state")
    sources = [table] * len(SERVICE_LEVELS)
    if c.material == "prestressed concrete":
        factors["inventory"] = SERVICE_III_INVENTORY[c.prestress_losses]
        sources[0] = GAMMA_SOURCES.index(
            "MBE Table 6A.4.2.2-2 (3rd ed. errata): "
            + (
                "approximate losses"
                if c.prestress_losses == "approximate"
                else "refined losses with elastic gains"
            )
        )
    return _ServiceRow(
        effect=0 if c.service_effect == "M+" else 1,
        limit_state=LIMIT_STATES.index(check.limit_state),
        s_nc=c.s_nc,
        s_lt=s_lt,
        s_st=s_lt if c.s_st is None else c.s_st,
        fy=np.nan if c.fy is None else c.fy,
        rh=rh if c.material == "steel" else np.nan,
        allowable=np.nan if c.allowable_stress is None else c.allowable_stress,
        prestress=np.nan if c.prestress_stress is None else c.prestress_stress,
        fr=fr,
        rule=rule,
        dc1_share=c.dc1_share,
        gamma=tuple(
            factors[level].number if level in factors else np.nan for level in SERVICE_LEVELS
        ),
        gamma_source=tuple(sources),
    )


def by_check(
    k_service: NDArray[np.bool_],
    k_table: NDArray[Any],
    v_category: NDArray[np.int8],
    v_values: NDArray[Any],
    v: NDArray[np.int64],
    k: NDArray[np.int64],
    operating: bool = False,
) -> NDArray[Any]:
    """Per (vehicle ``v``, check ``k``) pair: the vehicle's strength value, or the check's own.

    ``k_table`` (n_checks, 4) holds each service check's value per level of
    :data:`~batch.loads.factors.SERVICE_LEVELS` (live-load factors or their source
    codes); ``v_values`` the vehicles' own (strength) values; ``v_category`` their
    categories (index of :data:`batch.model.CATEGORIES`). ``operating``: the
    operating level of design loads (NaN for other kinds at a service check).
    ``v`` and ``k`` are index arrays that broadcast together.
    """
    design = np.asarray(CATEGORIES)[v_category] == "design"
    level = np.array([_LEVEL_OF[c] for c in CATEGORIES], dtype=np.int64)[v_category]
    if operating:
        level = np.full(level.shape, _OPERATING_LEVEL)
    own = k_table[k, level[v]]
    if operating:
        own = np.where(design[v], own, np.nan)
    return np.where(k_service[k], own, v_values[v])


@dataclass(frozen=True, kw_only=True)
class MemberDeadLoads:
    """A member's dead-load effects, one value per effect row (moments, shears, reactions).

    Computed from the member's uniform DC and DW loads on the same model as the
    live load, in the engine's sign conventions (the Dead Loads sheet).
    """

    dc: FloatArray
    dw: FloatArray


def member_dead_loads(member: Member, il: InfluenceLines) -> MemberDeadLoads:
    """DC and DW effects of ``member`` at every station and support."""
    return MemberDeadLoads(
        dc=dead_load_effects(il, member.dc_load), dw=dead_load_effects(il, member.dw_load)
    )


@dataclass(frozen=True, kw_only=True)
class MemberRating:
    """One member's rating, every term of it, as arrays (everything a sheet shows).

    A *check* is one rated station and effect in its sense (k, arrays ``k_*`` of
    n_checks): a Capacities row gives one check per resistance it gives (M+,
    M-, and both senses of V). Per vehicle (``v_*``, n_vehicles) the terms set
    by the bridge's traffic and the vehicle's kind; per vehicle and check
    (``p_*``, (n_vehicles, n_checks)) the live load and the rating factor.

    Governing, per vehicle: ``rf`` the smallest RF over the checks (inventory
    level for design loads; ``inf`` where the vehicle loads none), ``check``
    its check (-1: none), ``effect`` and ``station`` its effect (index of
    :data:`RATED_EFFECTS`) and station row (-1: none), ``rf_operating`` the
    operating RF of design loads there (NaN for other kinds), ``posting`` the
    posting load of a legal load with 0.3 <= RF < 1 in US tons or tonnes (NaN
    otherwise), ``flag`` the code of its note in :data:`FLAGS`.

    Checks: ``k_resistance`` phi*Rn; ``k_phi_c``, ``k_phi_s`` the condition and
    system factors as used (phi_s = 1 for shear), ``k_phi`` their product as used
    (floored at 0.85 for flexure, ``k_floored``); ``k_capacity`` C = k_phi *
    k_resistance; ``k_dc``, ``k_dw`` the dead-load effects in the rated sense
    (``k_dead_given``: typed on the Capacities row) with ``k_gamma_dc``,
    ``k_gamma_dw``; ``k_capacity_operating`` the capacity of the operating level
    (the ASR operating allowable; C itself for LRFR and LFR).

    Vehicles: ``v_gamma`` (and ``v_gamma_operating``) the live-load factor and
    ``v_gamma_source`` its origin; ``v_df_moment``, ``v_df_shear`` the
    distribution factors used and ``v_df_source`` which; ``v_impact_source``
    where the dynamic allowance came from; ``v_limit_state`` (codes of the
    tables of :mod:`batch.rating.traffic`: small integers, so that a member's
    stored rating stays small however large the fleet); ``v_operating`` marks the
    vehicles rated at the operating level with ``k_capacity_operating`` (legal loads
    and permits of an LFR or ASR member). ``method`` (one value) is the member's
    rating method, the index of :data:`batch.model.RATING_METHODS`; ``v_category``
    each vehicle's category (index of :data:`batch.model.CATEGORIES`).

    Service checks (see the module docstring; NaN or -1 on strength checks):
    ``k_limit_state`` the check's limit state (code of
    :data:`~batch.rating.traffic.LIMIT_STATES`; -1: the vehicle's strength one);
    ``k_gamma`` (n_checks, 4) its live-load factor per level of
    :data:`~batch.loads.factors.SERVICE_LEVELS` (NaN: not checked) and
    ``k_gamma_source`` the codes of :data:`~batch.rating.traffic.GAMMA_SOURCES`;
    ``k_fr_rule`` how fR (``k_capacity``) was found (:data:`FR_RULES`); ``k_fy``,
    ``k_rh``, ``k_allowable``, ``k_prestress`` the Service row's inputs; ``k_dc1_share``
    its DC1 share; ``k_m_dc``, ``k_m_dw`` the dead-load moments in the checked
    sense; ``k_s_nc``, ``k_s_lt``, ``k_s_st`` the section moduli used;
    ``k_per_moment`` the stress of a unit moment on S st. On a service check
    ``k_dc``, ``k_dw`` are the dead-load stresses fDC and fDW and the live-load
    terms (``p_axle``, ``p_lane``, ``p_live``) are stresses on S st. :meth:`gamma`,
    :meth:`gamma_source` and :meth:`limit_state` give each pair's own.

    Pairs: ``p_axle`` and ``p_lane`` the axle and lane parts of the governing
    load case's effect, distribution factor and case factor included, without
    dynamic allowance; ``p_impact`` the dynamic allowance on the axles and
    ``p_impact_lane`` on the lane load (0 but for an impact formula's case);
    ``p_live`` = (1 + p_impact) * p_axle + (1 + p_impact_lane) * p_lane, the LL + IM;
    ``p_rf``, ``p_rf_operating``; ``p_case`` the governing load case (-1:
    none), ``p_position`` its front axle's x, ``p_direction`` +1/-1 and
    ``p_spacing`` ((n_vehicles, n_checks, W)) the spacing it used for each of
    its ranged gaps, front to rear (length unit; NaN for a train of fixed
    spacings, see :class:`~batch.engine.envelope.CaseEffects`).
    """

    rf: FloatArray
    rf_operating: FloatArray
    check: NDArray[np.int64]
    effect: NDArray[np.int64]
    station: NDArray[np.int64]
    posting: FloatArray
    flag: NDArray[np.int64]
    k_station: NDArray[np.int64]
    k_effect: NDArray[np.int64]
    k_resistance: FloatArray
    k_phi_c: FloatArray
    k_phi_s: FloatArray
    k_phi: FloatArray
    k_floored: NDArray[np.bool_]
    k_capacity: FloatArray
    k_capacity_operating: FloatArray
    k_dc: FloatArray
    k_dw: FloatArray
    k_dead_given: NDArray[np.bool_]
    k_gamma_dc: FloatArray
    k_gamma_dw: FloatArray
    v_gamma: FloatArray
    v_gamma_operating: FloatArray
    v_gamma_source: NDArray[np.int8]
    v_df_moment: FloatArray
    v_df_shear: FloatArray
    v_df_source: NDArray[np.int8]
    v_impact_source: NDArray[np.int8]
    v_limit_state: NDArray[np.int8]
    v_operating: NDArray[np.bool_]
    p_axle: FloatArray
    p_lane: FloatArray
    p_impact: FloatArray
    p_impact_lane: FloatArray
    p_live: FloatArray
    p_rf: FloatArray
    p_rf_operating: FloatArray
    p_case: NDArray[np.int64]
    p_position: FloatArray
    p_direction: NDArray[np.int8]
    p_spacing: FloatArray
    method: NDArray[np.int8]
    v_category: NDArray[np.int8]
    k_limit_state: NDArray[np.int8]
    k_gamma: FloatArray
    k_gamma_source: NDArray[np.int8]
    k_fr_rule: NDArray[np.int8]
    k_fy: FloatArray
    k_rh: FloatArray
    k_allowable: FloatArray
    k_prestress: FloatArray
    k_dc1_share: FloatArray
    k_m_dc: FloatArray
    k_m_dw: FloatArray
    k_s_nc: FloatArray
    k_s_lt: FloatArray
    k_s_st: FloatArray
    k_per_moment: FloatArray

    def gamma(
        self, v: NDArray[np.int64], k: NDArray[np.int64], operating: bool = False
    ) -> FloatArray:
        """The live-load factor of each (vehicle, check) pair (``operating``: design loads')."""
        own = self.v_gamma_operating if operating else self.v_gamma
        values: FloatArray = by_check(
            self.k_limit_state >= 0, self.k_gamma, self.v_category, own, v, k, operating
        )
        return values

    def gamma_source(self, v: NDArray[np.int64], k: NDArray[np.int64]) -> NDArray[np.int8]:
        """Where each pair's live-load factor came from (codes of GAMMA_SOURCES)."""
        codes = by_check(
            self.k_limit_state >= 0, self.k_gamma_source, self.v_category, self.v_gamma_source, v, k
        )
        return np.asarray(codes, dtype=np.int8)

    def limit_state(self, v: NDArray[np.int64], k: NDArray[np.int64]) -> NDArray[np.int8]:
        """The limit state of each pair (codes of LIMIT_STATES)."""
        service = self.k_limit_state[k]
        return np.asarray(np.where(service >= 0, service, self.v_limit_state[v]), dtype=np.int8)


@dataclass(frozen=True, kw_only=True)
class _Checks:
    """The checks of one member: station row, effect, resistance, dead loads (see MemberRating)."""

    station: NDArray[np.int64]
    effect: NDArray[np.int64]
    resistance: FloatArray
    operating: FloatArray
    dc: FloatArray
    dw: FloatArray
    given: NDArray[np.bool_]
    service: tuple[_ServiceRow | None, ...]
    m_dc: FloatArray
    m_dw: FloatArray


def _checks(
    member: Member,
    capacities: Sequence[Capacity],
    dead: MemberDeadLoads,
    il: InfluenceLines,
    units: UnitSystem,
    sections: Sequence[ServiceSection] = (),
) -> _Checks:
    """One check per Capacities row and rated effect it gives a resistance for, in row order.

    Then one service check per Service row (:func:`_service_row`): its ``dc`` and ``dw``
    are the dead-load stresses, ``m_dc`` and ``m_dw`` the moments (DC M and DW M of a
    Capacities row at the same station where it gives them, else the member's own).
    """
    station, effect, resistance, operating, dc, dw, given = [], [], [], [], [], [], []
    service: list[_ServiceRow | None] = []
    m_dc: list[float] = []
    m_dw: list[float] = []
    typed_moments: dict[int, tuple[float | None, float | None]] = {}
    for c in capacities:
        row = _station_row(member, c, il)
        typed_moments[row] = (c.dc_m, c.dw_m)
        for k, (_, family, sense) in enumerate(RATED_EFFECTS):
            rn = (c.resistance_m_pos, c.resistance_m_neg, c.resistance_v, c.resistance_v)[k]
            op = (c.operating_m_pos, c.operating_m_neg, c.operating_v, c.operating_v)[k]
            if rn is None:
                continue
            line = (il.moment_rows if family == "moment" else il.shear_rows).start + row
            typed = (c.dc_m, c.dw_m) if family == "moment" else (c.dc_v, c.dw_v)
            station.append(row)
            effect.append(k)
            resistance.append(rn)
            operating.append(np.nan if op is None else op)
            dc.append(sense * (dead.dc[line] if typed[0] is None else typed[0]))
            dw.append(sense * (dead.dw[line] if typed[1] is None else typed[1]))
            given.append(typed[0] is not None or typed[1] is not None)
            service.append(None)
            m_dc.append(np.nan)
            m_dw.append(np.nan)
    per = stress_per_moment(units)
    for section in sections:
        row = _station_row(member, section, il)
        check = _service_row(section)
        sense = RATED_EFFECTS[check.effect][2]
        line = il.moment_rows.start + row
        typed_dc, typed_dw = typed_moments.get(row, (None, None))
        moments = (
            sense * (dead.dc[line] if typed_dc is None else typed_dc),
            sense * (dead.dw[line] if typed_dw is None else typed_dw),
        )
        share = section.dc1_share
        station.append(row)
        effect.append(check.effect)
        resistance.append(np.nan)
        operating.append(np.nan)
        dc.append(moments[0] * per * (share / check.s_nc + (1.0 - share) / check.s_lt))
        dw.append(moments[1] * per / check.s_lt)
        given.append(typed_dc is not None or typed_dw is not None)
        service.append(check)
        m_dc.append(moments[0])
        m_dw.append(moments[1])
    if not station:
        raise ValueError(f"member {member.id!r}: give at least one resistance to rate")
    return _Checks(
        station=np.array(station, dtype=np.int64),
        effect=np.array(effect, dtype=np.int64),
        resistance=np.array(resistance, dtype=float),
        operating=np.array(operating, dtype=float),
        dc=np.array(dc, dtype=float),
        dw=np.array(dw, dtype=float),
        given=np.array(given, dtype=bool),
        service=tuple(service),
        m_dc=np.array(m_dc, dtype=float),
        m_dw=np.array(m_dw, dtype=float),
    )


def _station_row(member: Member, row: Capacity | ServiceSection, il: InfluenceLines) -> int:
    """The station row of the influence lines that a Capacities or Service row names."""
    at = row.section(member.spans)
    found = None if at is None else il.station_index(at)
    if found is None:
        raise ValueError(f"member {member.id!r}: give capacities at the member's own stations")
    return found


@dataclass(frozen=True, kw_only=True)
class _RatedLive:
    """LL + IM of every vehicle at every check, with its parts (arrays (n_vehicles, n_checks))."""

    axle: FloatArray
    lane: FloatArray
    impact: FloatArray
    impact_lane: FloatArray
    live: FloatArray
    case: NDArray[np.int64]
    position: FloatArray
    direction: NDArray[np.int8]
    spacing: FloatArray  # (n_vehicles, n_checks, W)


def rated_live(
    effects: CaseEffects,
    cases: Sequence[LoadCase],
    lines: NDArray[np.int64],
    senses: NDArray[np.int64],
    impact: FloatArray,
    df: FloatArray,
    multi_lane: NDArray[np.bool_],
    formula: ImpactFormula | None = None,
) -> _RatedLive:
    """Each vehicle's LL + IM at the effect rows ``lines``, in the rated ``senses``.

    Per case the effect is ``DF * ((1 + IM) * axle + (1 + IM lane) * lane)`` from
    the engine's static parts, IM the allowance the engine applied (a case's fixed
    one on its axles, or an impact formula's at the loaded length on axles and lane
    alike, :class:`~batch.engine.envelope.CaseEffects`). ``impact`` (n_vehicles)
    replaces the fixed allowance of every case of a vehicle (NaN: the case's own);
    a case with an impact formula keeps the formula's. ``df`` (n_vehicles, n_lines)
    is the distribution factor each vehicle uses at each line. A vehicle with its
    cases' own allowance and the multi-lane factor (``multi_lane``) takes the
    engine's value itself, so that such a rating is exactly the envelope's. With an
    impact ``formula`` (an LFR or ASR member: the Standard Specifications' impact in
    the run's length unit) every case takes the formula at each line's loaded length
    instead, on its axles and its lane load alike. The vehicle's effect is its
    largest case's (the first on ties), with its position, direction and spacing.
    """
    up = senses[None, :] > 0
    side = {
        name: np.where(
            up, getattr(effects, f"max_{name}")[:, lines], getattr(effects, f"min_{name}")[:, lines]
        )
        for name in ("value", "axle", "lane", "impact", "position", "direction")
    }
    spacing = np.where(up[:, :, None], effects.max_spacing[:, lines], effects.min_spacing[:, lines])
    sign = np.where(up, 1.0, -1.0)
    axle, lane, value = sign * side["axle"], sign * side["lane"], sign * side["value"]
    vehicle = np.array([c.vehicle for c in cases], dtype=np.int64)
    if formula is not None:
        length = np.where(up[0], effects.max_loaded_length[lines], effects.min_loaded_length[lines])
        standard = impact_fraction(formula, length)[None, :]
        im = np.broadcast_to(standard, axle.shape)
        im_lane = im
        replaced = np.ones(axle.shape, dtype=bool)
    else:
        on_lane = np.array([c.impact_formula is not None for c in cases], dtype=bool)[:, None]
        replaced = ~np.isnan(impact[vehicle])[:, None] & ~on_lane
        im = np.where(replaced, impact[vehicle][:, None], side["impact"])
        im_lane = np.where(on_lane, im, 0.0)
    d = df[vehicle]
    own = (multi_lane[vehicle][:, None]) & ~replaced
    live = np.where(own, value, d * ((1 + im) * axle + (1 + im_lane) * lane))
    n_vehicles = df.shape[0]
    starts = np.searchsorted(vehicle, np.arange(n_vehicles))
    best = np.maximum.reduceat(live, starts, axis=0)
    index = np.broadcast_to(np.arange(len(cases))[:, None], live.shape)
    first = np.minimum.reduceat(np.where(live == best[vehicle], index, len(cases)), starts, axis=0)
    columns = np.arange(lines.size)[None, :]
    acts = best > 0
    return _RatedLive(
        axle=np.where(acts, df * axle[first, columns], 0.0),
        lane=np.where(acts, df * lane[first, columns], 0.0),
        impact=np.where(acts, im[first, columns], np.nan),
        impact_lane=np.where(acts, im_lane[first, columns], np.nan),
        live=np.where(acts, best, 0.0),
        case=np.where(acts, first, -1),
        position=np.where(acts, side["position"][first, columns], np.nan),
        direction=np.where(acts, side["direction"][first, columns], 0).astype(np.int8),
        spacing=np.where(acts[:, :, None], spacing[first, columns], np.nan),
    )


def rate_member(
    member: Member,
    effects: CaseEffects,
    cases: Sequence[LoadCase],
    capacities: Sequence[Capacity],
    terms: VehicleTerms,
    categories: Sequence[Category],
    factors: RatingFactors,
    weights: Sequence[float],
    dead: MemberDeadLoads | None = None,
    formula: ImpactFormula | None = None,
    units: UnitSystem = "US",
    sections: Sequence[ServiceSection] = (),
) -> MemberRating:
    """Rate every vehicle at the member's ``capacities`` stations (see the module docstring).

    ``effects`` are the member's factored load-case effects (``cases`` in vehicle
    order); ``terms`` the vehicles' factors on the member's bridge
    (:func:`batch.rating.traffic.vehicle_terms`) and ``factors`` its dead-load
    factors; ``weights`` the vehicles' gross weights in US tons or tonnes, for
    the posting loads. ``capacities`` are the Capacities rows of this member, at
    least one (validated: each on one of the member's stations). An LFR or ASR
    member (its Rating method) is rated by MBE Section 6B instead: see
    :func:`_standard_method`; ``formula`` is then the Standard Specifications'
    impact in the run's length unit. ``sections`` are the member's Service rows (LRFR
    only), ``units`` the run's unit system, for their stresses.
    """
    il = effects.lines
    dead = dead if dead is not None else member_dead_loads(member, il)
    ck = _checks(member, capacities, dead, il, units, sections)
    flexure = ck.effect < 2
    service = np.array([row is not None for row in ck.service], dtype=bool)

    def per_check(get: Any, blank: float = np.nan) -> FloatArray:
        """A service term per check (``blank`` on strength checks)."""
        return np.array([blank if row is None else get(row) for row in ck.service], dtype=float)

    if member.rating_method == "LRFR":
        phi_c = np.full(ck.effect.shape, member.condition_factor)
        phi_s = np.where(flexure, member.system_factor, 1.0)
        floored = flexure & (phi_c * phi_s < MIN_CAPACITY_FACTOR)
        phi = np.where(floored, MIN_CAPACITY_FACTOR, phi_c * phi_s)
        capacity = phi * ck.resistance
        capacity_operating = capacity
        gamma_dc, gamma_dw = dead_load_factors(ck.dc, ck.dw, factors)
        formula = None
    else:
        if formula is None:
            raise ValueError(
                f"member {member.id!r}: {member.rating_method} needs the impact formula"
            )
        terms = standard_terms(categories, member.rating_method)
        phi_c = phi_s = phi = np.ones(ck.effect.shape)
        floored = np.zeros(ck.effect.shape, dtype=bool)
        capacity = ck.resistance
        capacity_operating = ck.resistance if member.rating_method == "LFR" else ck.operating
        a1 = LFR_A1.number if member.rating_method == "LFR" else ASR_FACTOR.number
        gamma_dc = gamma_dw = np.full(ck.effect.shape, a1)
    # Service checks: C = fR, dead-load factors 1, no capacity factors.
    fr = per_check(lambda row: row.fr)
    phi_c, phi_s, phi = (np.where(service, np.nan, x) for x in (phi_c, phi_s, phi))
    capacity = np.where(service, fr, capacity)
    capacity_operating = np.where(service, fr, capacity_operating)
    gamma_dc = np.where(service, SERVICE_DEAD_LOAD.number, gamma_dc)
    gamma_dw = np.where(service, SERVICE_DEAD_LOAD.number, gamma_dw)
    dead_part = gamma_dc * ck.dc + gamma_dw * ck.dw
    numerator = capacity - dead_part
    numerator_operating = capacity_operating - dead_part
    family_rows = np.where(flexure, il.moment_rows.start, il.shear_rows.start)
    senses = np.array([RATED_EFFECTS[k][2] for k in ck.effect], dtype=np.int64)
    # Fatigue loads take the one-lane DF / 1.2 in the engine; rating shows the same.
    fatigue = np.zeros(terms.one_lane.size, dtype=bool)
    fatigue[[c.vehicle for c in cases if c.fatigue]] = True
    one_lane = terms.one_lane | fatigue
    dfs = [member_df(member, bool(one)) for one in one_lane]
    df = np.array([[m if f else v for f in flexure] for m, v, _ in dfs]).reshape(
        len(dfs), ck.effect.size
    )
    live = rated_live(
        effects,
        cases,
        family_rows + ck.station,
        senses,
        terms.impact,
        df,
        ~one_lane,
        formula,
    )
    # A service check's live load is the stress on S st.
    per_moment = per_check(lambda row: stress_per_moment(units) / row.s_st)
    scale = np.where(service, per_moment, 1.0)[None, :]
    p_axle, p_lane, p_live = live.axle * scale, live.lane * scale, live.live * scale
    v_category = np.array([CATEGORIES.index(c) for c in categories], dtype=np.int8)
    k_limit_state = np.array(
        [-1 if row is None else row.limit_state for row in ck.service], dtype=np.int8
    )
    k_gamma = np.array(
        [(np.nan,) * len(SERVICE_LEVELS) if row is None else row.gamma for row in ck.service],
        dtype=float,
    ).reshape(-1, len(SERVICE_LEVELS))
    pairs = np.arange(len(categories))[:, None], np.arange(ck.effect.size)[None, :]
    gamma = by_check(service, k_gamma, v_category, terms.gamma, *pairs)
    gamma_op = by_check(service, k_gamma, v_category, terms.gamma_operating, *pairs, True)
    level = np.where(terms.operating[:, None], numerator_operating[None, :], numerator[None, :])
    rf = _ratio(level, p_live * gamma)
    design = np.array(categories) == "design"
    rf_op = np.where(
        design[:, None], _ratio(numerator_operating[None, :], p_live * gamma_op), np.nan
    )
    n = np.arange(len(categories))
    best = rf.argmin(axis=1)
    governing = rf[n, best]
    found = np.isfinite(governing)
    operating = np.where(found, rf_op[n, best], np.nan)
    # A governing check with no operating level (Service III): the smallest operating RF.
    lowest = np.min(np.where(np.isfinite(rf_op), rf_op, np.inf), axis=1, initial=np.inf)
    operating = np.where(found & design & ~np.isfinite(operating), lowest, operating)
    lrfr = member.rating_method == "LRFR"
    posted = posting_load if lrfr else operating_rating
    posting = [
        posted(float(r), w) if c == "legal" else None
        for r, w, c in zip(governing, weights, categories, strict=True)
    ]
    flags = [
        rating_flag(c, float(r), float(op), lrfr)
        for r, op, c in zip(governing, operating, categories, strict=True)
    ]
    return MemberRating(
        rf=governing,
        rf_operating=operating,
        check=np.where(found, best, -1),
        effect=np.where(found, ck.effect[best], -1),
        station=np.where(found, ck.station[best], -1),
        posting=np.array([np.nan if p is None else p for p in posting], dtype=float),
        flag=np.array([0 if f is None else FLAGS.index(f) for f in flags], dtype=np.int64),
        k_station=ck.station,
        k_effect=ck.effect,
        k_resistance=ck.resistance,
        k_phi_c=phi_c,
        k_phi_s=phi_s,
        k_phi=phi,
        k_floored=floored,
        k_capacity=capacity,
        k_capacity_operating=capacity_operating,
        k_dc=ck.dc,
        k_dw=ck.dw,
        k_dead_given=ck.given,
        k_gamma_dc=gamma_dc,
        k_gamma_dw=gamma_dw,
        v_gamma=terms.gamma,
        v_gamma_operating=terms.gamma_operating,
        v_gamma_source=terms.gamma_source,
        v_df_moment=np.array([m for m, _, _ in dfs], dtype=float),
        v_df_shear=np.array([v for _, v, _ in dfs], dtype=float),
        v_df_source=np.array([w for _, _, w in dfs], dtype=np.int8),
        v_impact_source=terms.impact_source,
        v_limit_state=terms.limit_state,
        v_operating=terms.operating,
        p_axle=p_axle,
        p_lane=p_lane,
        p_impact=live.impact,
        p_impact_lane=live.impact_lane,
        p_live=p_live,
        p_rf=rf,
        p_rf_operating=rf_op,
        p_case=live.case,
        p_position=live.position,
        p_direction=live.direction,
        p_spacing=live.spacing,
        method=np.array([RATING_METHODS.index(member.rating_method)], dtype=np.int8),
        v_category=v_category,
        k_limit_state=k_limit_state,
        k_gamma=k_gamma,
        k_gamma_source=np.array(
            [
                (-1,) * len(SERVICE_LEVELS) if row is None else row.gamma_source
                for row in ck.service
            ],
            dtype=np.int8,
        ).reshape(-1, len(SERVICE_LEVELS)),
        k_fr_rule=np.array([-1 if row is None else row.rule for row in ck.service], dtype=np.int8),
        k_fy=per_check(lambda row: row.fy),
        k_rh=per_check(lambda row: row.rh),
        k_allowable=per_check(lambda row: row.allowable),
        k_prestress=per_check(lambda row: row.prestress),
        k_dc1_share=per_check(lambda row: row.dc1_share),
        k_m_dc=ck.m_dc,
        k_m_dw=ck.m_dw,
        k_s_nc=per_check(lambda row: row.s_nc),
        k_s_lt=per_check(lambda row: row.s_lt),
        k_s_st=per_check(lambda row: row.s_st),
        k_per_moment=per_moment,
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


def operating_rating(rf: float, weight: float) -> float | None:
    """LFR and ASR: the operating rating RF x W of a legal load rating below 1, else None.

    The posting of MBE 6B.7 (from memory; batch/loads/factors.py, ``LFR_POSTING``):
    ``rf`` at the operating level, ``weight`` W and the result in tons or tonnes.
    """
    if not 0.0 <= rf < 1.0:
        return None
    return rf * weight


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


def rating_flag(
    category: Category, rf: float, rf_operating: float, lrfr: bool = True
) -> str | None:
    """A short note on a governing RF (one of :data:`FLAGS`; None when there is nothing to say).

    ``rf`` is ``inf`` where the vehicle loads none of the rated effects. The closure
    note below RF 0.3 is the LRFR posting rule's (MBE 6A.8.3); an LFR or ASR member
    (``lrfr`` False) is posted at its operating rating down to RF 0.
    """
    if np.isinf(rf) and rf > 0:
        return FLAGS[1]
    if not np.isfinite(rf) or rf >= 1.0:
        return None
    if rf < 0:
        return FLAGS[2]
    if category == "legal":
        return FLAGS[3] if lrfr and rf < POSTING_FLOOR else FLAGS[4]
    if category == "permit":
        return FLAGS[5]
    if np.isfinite(rf_operating) and rf_operating < 1.0:
        return FLAGS[6]
    return FLAGS[7]
