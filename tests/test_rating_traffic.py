"""Per-bridge traffic and per-vehicle crossings: hand examples with every term, and laws.

One simple span rated by hand, every term written out beside its source:

* LRFR general equation RF = (C - gDC*DC - gDW*DW) / (gLL*(LL + IM)), C = phi_c*phi_s*phi*Rn:
  AASHTO Manual for Bridge Evaluation (MBE) 6A.4.2.1 (the terms verified in M. A. Khan,
  Bridge and Highway Structure Rehabilitation and Repair, McGraw-Hill 2010, p. 187; the
  equation's layout from memory);
* legal-load factor by ADTT: 1.30 at ADTT <= 1000, 1.45 at ADTT >= 5000, linear between,
  1.45 where unknown: MBE 2nd/3rd ed. Table 6A.4.4.2.3a-1, from memory;
* permit factors by permit type and ADTT: MBE 2nd/3rd ed. Table 6A.4.5.4.2a-1, from memory
  (routine 1.10/1.20/1.30 at ADTT < 100 / 1000 / > 5000; single-trip escorted 1.10;
  single-trip mixed 1.10/1.15/1.20; multiple-trip 1.30/1.35/1.40);
* one-lane DF with the multiple presence factor 1.2 divided out for special permits: MBE
  6A.4.5.4.2 (verified in the TRB record of NCHRP 20-07/Task 285); 1.2 is AASHTO LRFD Table
  3.6.1.1.2-1;
* dynamic load allowance of legal loads by riding surface, 10 % / 20 % / 33 %: MBE
  C6A.4.4.3, from memory; none for an escorted permit at crawl speed: MBE 6A.4.5.5, from
  memory;
* relieving dead loads 0.90 (DC) and 0.65 (DW): AASHTO LRFD Table 3.4.1-2 minimums (seen in
  a published transcription of the table; the rating use from memory);
* statics (common practice): on a simple span L under a uniform w, M(L/2) = wL^2/8 and
  V(x) = w(L/2 - x); one axle P gives M(L/2) = PL/4 and, just left of a section at x
  (axle at x), V = -P x/L.
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from tolerances import REL_TOL_EXACT

from batch.demo.kvha import KVHA_INVENTORY
from batch.engine.envelope import case_effects, member_envelope, member_influence
from batch.loads.fleet import fleet_cases
from batch.model import Bridge, Capacity, Case, Member, Settings, Vehicle
from batch.rating.assess import AssessmentPlan, assess_member
from batch.rating.lrfr import (
    RATED_EFFECTS,
    RatingFactors,
    dead_load_effects,
    rate_member,
    rating_factor,
)
from batch.rating.posting import rounded_down
from batch.rating.traffic import DF_SOURCES, GAMMA_SOURCES, LIMIT_STATES, vehicle_terms
from batch.running.executor import run_case

L, P = 60.0, 40.0  # ft, kip: a simple span and one axle
W_DC, W_DW = 1.2, 0.2  # kip/ft
DF_M, DF_V = 0.6, 0.7
DF_M1, DF_V1 = 0.48, 0.66  # one-lane DFs as AASHTO LRFD gives them (1.2 included)
RUN = Settings()  # the Settings' defaults: IM 0.33, DC 1.25, DW 1.50, legal 1.45, permit 1.30

# Midspan M+ by hand: DC M = 1.2 x 60^2 / 8 = 540, DW M = 0.2 x 60^2 / 8 = 90 kip-ft;
# C = 1.00 x 1500; numerator = 1500 - 1.25 x 540 - 1.50 x 90 = 690 kip-ft.
# LL axles = DF x PL/4 = 0.6 x 600 = 360 kip-ft (multi-lane); 0.4 x 600 = 240 one lane / 1.2.
NUMERATOR = 690.0
LL_MULTI = 360.0
LL_ONE = 240.0


def _member(**kw: object) -> Member:
    values: dict[str, object] = {
        "df_moment": DF_M,
        "df_shear": DF_V,
        "df_moment_single": DF_M1,
        "df_shear_single": DF_V1,
        "dc_load": W_DC,
        "dw_load": W_DW,
    }
    return Member(id="KV-0330 G3", spans=(L,), **(values | kw))  # type: ignore[arg-type]


def _vehicle(category: str, **kw: object) -> Vehicle:
    return Vehicle(id="KV-A", axle_loads=(P,), category=category, **kw)  # type: ignore[arg-type]


MIDSPAN = Capacity(member="KV-0330 G3", span=1, station=0.5, resistance_m_pos=1500.0)


def _rate(vehicle: Vehicle, bridge: Bridge | None, member: Member | None = None, cap=MIDSPAN):
    """The member's rating for one vehicle on ``bridge``, through the run's own functions."""
    member = member or _member()
    cases = fleet_cases((vehicle,), RUN)
    effects = case_effects(member, cases, stations_per_span=10)
    terms = vehicle_terms((vehicle,), bridge, RUN)
    factors = RatingFactors.of(RUN, bridge)
    return rate_member(member, effects, cases, [cap], terms, (vehicle.category,), factors, (20.0,))


def _check(rating, effect: str) -> int:
    names = [RATED_EFFECTS[k][0] for k in rating.k_effect]
    return names.index(effect)


# ---------------------------------------------------------------- legal loads


@pytest.mark.parametrize(
    ("adtt", "gamma"),
    [
        (3000.0, 1.30 + 0.15 * 2000 / 4000),  # interpolated: 1.375
        (1000.0, 1.30),
        (400.0, 1.30),  # below the table: its lowest entry
        (5000.0, 1.45),
        (9000.0, 1.45),
        (None, 1.45),  # not known: the conservative value
    ],
)
def test_legal_factor_by_adtt_by_hand(adtt, gamma):
    # Minor deviations: IM = 0.20, LL+IM = 1.20 x 360 = 432 kip-ft; RF = 690 / (gamma x 432).
    bridge = Bridge(id="KV-0330", adtt=adtt, riding_surface="minor deviations")
    rating = _rate(_vehicle("legal"), bridge)
    k = _check(rating, "M+")
    assert rating.v_gamma[0] == pytest.approx(gamma, rel=REL_TOL_EXACT)
    assert rating.k_capacity[k] == pytest.approx(1500.0, rel=REL_TOL_EXACT)
    assert rating.k_dc[k] == pytest.approx(540.0, rel=REL_TOL_EXACT)
    assert rating.k_dw[k] == pytest.approx(90.0, rel=REL_TOL_EXACT)
    assert (rating.k_gamma_dc[k], rating.k_gamma_dw[k]) == (1.25, 1.5)
    assert rating.p_axle[0, k] == pytest.approx(LL_MULTI, rel=REL_TOL_EXACT)
    assert rating.p_lane[0, k] == 0.0
    assert rating.p_impact[0, k] == pytest.approx(0.20, rel=REL_TOL_EXACT)
    assert rating.p_live[0, k] == pytest.approx(432.0, rel=REL_TOL_EXACT)
    assert rating.p_rf[0, k] == pytest.approx(NUMERATOR / (gamma * 432.0), rel=REL_TOL_EXACT)
    assert LIMIT_STATES[rating.v_limit_state[0]] == "Strength I"
    source = GAMMA_SOURCES[rating.v_gamma_source[0]]
    assert ("ADTT not known" in source) == (adtt is None)


@pytest.mark.parametrize(
    ("surface", "impact"),
    [("smooth", 0.10), ("minor deviations", 0.20), ("major deviations", 0.33), (None, 0.33)],
)
def test_legal_dynamic_allowance_by_riding_surface_by_hand(surface, impact):
    # ADTT 3000: gamma 1.375. LL+IM = (1 + IM) x 360; no riding surface: the run's 0.33.
    bridge = Bridge(id="KV-0330", adtt=3000.0, riding_surface=surface)
    rating = _rate(_vehicle("legal"), bridge)
    k = _check(rating, "M+")
    live = (1 + impact) * LL_MULTI
    assert rating.p_impact[0, k] == pytest.approx(impact, rel=REL_TOL_EXACT)
    assert rating.p_live[0, k] == pytest.approx(live, rel=REL_TOL_EXACT)
    assert rating.rf[0] == pytest.approx(NUMERATOR / (1.375 * live), rel=REL_TOL_EXACT)


def test_a_design_load_keeps_its_dynamic_allowance_whatever_the_riding_surface():
    bridge = Bridge(id="KV-0330", adtt=3000.0, riding_surface="smooth")
    rating = _rate(_vehicle("design"), bridge)
    # LRFR design inventory: 690 / (1.75 x 1.33 x 360); operating 1.35 (MBE Table 6A.4.2.2-1).
    assert rating.rf[0] == pytest.approx(NUMERATOR / (1.75 * 1.33 * LL_MULTI), rel=REL_TOL_EXACT)
    assert rating.rf_operating[0] == pytest.approx(
        NUMERATOR / (1.35 * 1.33 * LL_MULTI), rel=REL_TOL_EXACT
    )


# ---------------------------------------------------------------- permits

# ADTT 550: routine 1.10 + 0.10 x 450/900 = 1.15; single-trip 1.10 + 0.05 x 0.5 = 1.125;
# multiple-trip 1.30 + 0.05 x 0.5 = 1.325; single-trip escorted 1.10 whatever the ADTT.
PERMITS = [
    ("routine", False, 1.15, 0.33, LL_MULTI, "multi-lane", "Strength II"),
    ("single-trip escorted", True, 1.10, 0.0, LL_ONE, "one lane / 1.2", "Strength II"),
    ("single-trip escorted", False, 1.10, 0.33, LL_ONE, "one lane / 1.2", "Strength II"),
    ("single-trip", False, 1.125, 0.33, LL_ONE, "one lane / 1.2", "Strength II"),
    ("multiple-trip", False, 1.325, 0.33, LL_ONE, "one lane / 1.2", "Strength II"),
]


@pytest.mark.parametrize(("kind", "crawl", "gamma", "impact", "axles", "lanes", "limit"), PERMITS)
def test_each_permit_type_by_hand(kind, crawl, gamma, impact, axles, lanes, limit):
    bridge = Bridge(id="KV-0330", adtt=550.0, riding_surface="smooth")
    vehicle = _vehicle("permit", permit_type=kind, crawl="yes" if crawl else "no")
    rating = _rate(vehicle, bridge)
    k = _check(rating, "M+")
    live = (1 + impact) * axles
    assert rating.v_gamma[0] == pytest.approx(gamma, rel=REL_TOL_EXACT)
    assert DF_SOURCES[rating.v_df_source[0]] == lanes
    assert rating.v_df_moment[0] == pytest.approx(axles / 600.0, rel=REL_TOL_EXACT)
    assert rating.p_axle[0, k] == pytest.approx(axles, rel=REL_TOL_EXACT)
    assert rating.p_impact[0, k] == pytest.approx(impact, abs=1e-15)
    assert rating.p_live[0, k] == pytest.approx(live, rel=REL_TOL_EXACT)
    assert rating.rf[0] == pytest.approx(NUMERATOR / (gamma * live), rel=REL_TOL_EXACT)
    assert LIMIT_STATES[rating.v_limit_state[0]] == limit


def test_permit_factors_without_an_adtt_or_a_permit_type():
    # A routine permit with no ADTT: the table's > 5000 value 1.30; a permit with no
    # Permit type: the Settings' LL factor permit (1.30 by default); no bridge: the same.
    routine = _vehicle("permit", permit_type="routine")
    assert _rate(routine, Bridge(id="KV-0330")).v_gamma[0] == 1.30
    assert _rate(routine, None).v_gamma[0] == 1.30
    untyped = dataclasses.replace(RUN, ll_factor_permit=1.22)
    assert vehicle_terms((_vehicle("permit"),), None, untyped).gamma[0] == 1.22


def test_a_bridges_own_factors_prevail():
    # DC factor 1.10, DW factor 1.25 (overlay measured), legal 1.60: the numerator becomes
    # 1500 - 1.10 x 540 - 1.25 x 90 = 793.5; RF = 793.5 / (1.60 x 1.10 x 360).
    bridge = Bridge(
        id="KV-0330",
        adtt=3000.0,
        riding_surface="smooth",
        dc_factor=1.10,
        dw_factor=1.25,
        ll_factor_legal=1.60,
    )
    rating = _rate(_vehicle("legal"), bridge)
    assert rating.rf[0] == pytest.approx(793.5 / (1.60 * 1.10 * LL_MULTI), rel=REL_TOL_EXACT)
    assert GAMMA_SOURCES[rating.v_gamma_source[0]] == "the bridge's own factor"


def test_a_relieving_dead_load_by_hand():
    # Station 0.3 (x = 18 ft), negative shear V-: DC V = 1.2 x (30 - 18) = 14.4, DW V = 2.4
    # kip, in the V- sense -14.4 and -2.4: they relieve it and take 0.90 and 0.65.
    # numerator = 100 + 0.90 x 14.4 + 0.65 x 2.4 = 114.52 kip. LL: the axle just left of the
    # section, V = -40 x 18/60 = -12; 0.7 x 12 = 8.4 kip, smooth: LL+IM = 1.10 x 8.4 = 9.24.
    # Legal, ADTT 3000: RF = 114.52 / (1.375 x 9.24).
    cap = Capacity(member="KV-0330 G3", span=1, station=0.3, resistance_v=100.0)
    bridge = Bridge(id="KV-0330", adtt=3000.0, riding_surface="smooth")
    rating = _rate(_vehicle("legal"), bridge, cap=cap)
    k = _check(rating, "V-")
    assert rating.k_dc[k] == pytest.approx(-14.4, rel=REL_TOL_EXACT)
    assert rating.k_dw[k] == pytest.approx(-2.4, rel=REL_TOL_EXACT)
    assert (rating.k_gamma_dc[k], rating.k_gamma_dw[k]) == (0.9, 0.65)
    assert rating.k_phi_s[k] == 1.0  # no system factor on shear (MBE 6A.4.2.4, from memory)
    assert rating.p_axle[0, k] == pytest.approx(8.4, rel=REL_TOL_EXACT)
    assert rating.p_live[0, k] == pytest.approx(9.24, rel=REL_TOL_EXACT)
    assert rating.p_rf[0, k] == pytest.approx(114.52 / (1.375 * 9.24), rel=REL_TOL_EXACT)


def test_the_capacity_factor_floor_is_shown_where_it_applies():
    # Condition 0.85 x system 0.90 = 0.765 < 0.85: C = 0.85 x 1500 (MBE Eq. 6A.4.2.1-3).
    member = _member(condition_factor=0.85, system_factor=0.9)
    rating = _rate(_vehicle("legal"), None, member=member)
    k = _check(rating, "M+")
    assert rating.k_floored[k] and rating.k_phi[k] == 0.85
    assert rating.k_capacity[k] == pytest.approx(0.85 * 1500.0, rel=REL_TOL_EXACT)


# ---------------------------------------------------------------- laws


@settings(max_examples=30, deadline=None, derandomize=True)
@given(
    low=st.floats(min_value=0.0, max_value=8000.0),
    step=st.floats(min_value=1.0, max_value=4000.0),
)
def test_the_legal_rating_factor_falls_as_the_adtt_rises(low, step):
    vehicle = _vehicle("legal")
    quiet = _rate(vehicle, Bridge(id="KV-0330", adtt=low)).rf[0]
    busy = _rate(vehicle, Bridge(id="KV-0330", adtt=low + step)).rf[0]
    assert busy <= quiet
    if 1000.0 <= low and low + step <= 5000.0:
        assert busy < quiet


@settings(max_examples=20, deadline=None, derandomize=True)
@given(
    df=st.floats(min_value=0.2, max_value=1.2),
    k=st.floats(min_value=0.3, max_value=0.99),
    kind=st.sampled_from(["single-trip escorted", "single-trip", "multiple-trip"]),
)
def test_a_lower_one_lane_df_raises_a_special_permits_rf_by_their_ratio(df, k, kind):
    vehicle = _vehicle("permit", permit_type=kind)
    bridge = Bridge(id="KV-0330", adtt=2000.0)
    base = _rate(vehicle, bridge, member=_member(df_moment_single=df)).rf[0]
    lower = _rate(vehicle, bridge, member=_member(df_moment_single=k * df)).rf[0]
    assert lower == pytest.approx(base / k, rel=REL_TOL_EXACT)


# ---------------------------------------------------------------- today's numbers


def _today(case: Case) -> Case:
    """``case`` without bridges, permit kinds, rating methods and service checks: a workbook
    written before they existed (every member LRFR, no Service sheet)."""
    return dataclasses.replace(
        case,
        bridges=(),
        service=(),
        members=tuple(
            dataclasses.replace(m, bridge=None, rating_method="LRFR") for m in case.members
        ),
        vehicles=tuple(dataclasses.replace(v, permit_type=None, crawl="no") for v in case.vehicles),
    )


def test_without_bridges_or_permit_types_the_run_rates_as_before():
    # The general equation element by element on the engine's envelopes, with the Settings'
    # factors by category: what spanfleet gave before bridges and permit kinds existed.
    case = _today(KVHA_INVENTORY)
    result = run_case(case)
    factors = RatingFactors.of(case.settings)
    cases = fleet_cases(case.vehicles, case.settings)
    n = case.settings.stations_per_span
    for member, assessment in zip(case.members, result.assessments, strict=True):
        if assessment.rating is None:
            continue
        rows = [c for c in case.capacities if c.member == member.id]
        sections = [s for c in rows if (s := c.section(member.spans)) is not None]
        il = member_influence(member, n, sections)  # rated sections off the grid included
        dc, dw = dead_load_effects(il, member.dc_load), dead_load_effects(il, member.dw_load)
        for v, vehicle in enumerate(case.vehicles):
            env = member_envelope(member, [c for c in cases if c.vehicle == v], n, il=il)
            phi_m = max(member.condition_factor * member.system_factor, 0.85)
            phi_v = member.condition_factor
            found = []
            for cap in rows:
                i = il.station_index(cap.section(member.spans))
                s = il.n_stations + i
                tries = [
                    (phi_m * (cap.resistance_m_pos or np.nan), dc[i], dw[i], env.m_max.value[i]),
                    (phi_m * (cap.resistance_m_neg or np.nan), -dc[i], -dw[i], -env.m_min.value[i]),
                    (phi_v * (cap.resistance_v or np.nan), dc[s], dw[s], env.v_max.value[i]),
                    (phi_v * (cap.resistance_v or np.nan), -dc[s], -dw[s], -env.v_min.value[i]),
                ]
                gamma = factors.live(vehicle.category)
                found += [float(rating_factor(*t, gamma, factors)) for t in tries]
            assert assessment.rating.rf[v] == pytest.approx(min(found), rel=REL_TOL_EXACT)


def test_a_bridge_with_nothing_to_say_changes_no_design_rating():
    # Bridges with no ADTT, surface or factors of their own: design loads rate bit for bit
    # as with no Bridges sheet at all.
    plain = _today(KVHA_INVENTORY)
    design = tuple(v for v in plain.vehicles if v.category == "design")
    before = dataclasses.replace(plain, vehicles=design)
    with_bridges = dataclasses.replace(
        before,
        bridges=(Bridge(id="KV-X"),),
        members=tuple(dataclasses.replace(m, bridge="KV-X") for m in before.members),
    )
    plans = [AssessmentPlan.of(c) for c in (before, with_bridges)]
    cases = fleet_cases(design, before.settings)
    for m0, m1 in zip(before.members, with_bridges.members, strict=True):
        il = member_influence(m0, 10, plans[0].sections(m0) if plans[0] else ())
        effects = case_effects(m0, cases, 10, il=il)
        a, b = (assess_member(m, effects, cases, p) for m, p in zip((m0, m1), plans, strict=True))
        if a.rating is not None and b.rating is not None:
            assert np.array_equal(a.rating.rf, b.rating.rf)
            assert np.array_equal(a.rating.rf_operating, b.rating.rf_operating, equal_nan=True)


# ---------------------------------------------------------------- postings


def test_rounding_down_by_the_owners_rule():
    assert rounded_down(22.758, 1.0) == 22.0
    assert rounded_down(22.758, 0.5) == 22.5
    assert rounded_down(22.758, 5.0) == 20.0
    assert rounded_down(22.758, 0.0) == 22.758
    assert np.isnan(rounded_down(np.nan, 1.0))


def test_postings_per_bridge_take_the_smallest_over_its_members():
    # Two members of one bridge and one legal axle of 40 kip (W = 20 tons): the bridge's
    # posting is the weaker member's, (W/0.7)(RF - 0.3) (MBE 6A.8.3; verified in Khan 2010,
    # p. 187), rounded down to whole tons (Settings' default, the owner's rule).
    # Weak member (condition 0.85): numerator = 0.85 x 1340 - 675 - 135 = 329 kip-ft;
    # smooth surface, LL+IM = 1.10 x 360 = 396; ADTT 3000: RF = 329 / (1.375 x 396).
    weak = _member(condition_factor=0.85, bridge="KV-0330")
    strong = dataclasses.replace(weak, id="KV-0330 G4", condition_factor=1.0)
    caps = (
        Capacity(member=weak.id, span=1, station=0.5, resistance_m_pos=1340.0),
        Capacity(member=strong.id, span=1, station=0.5, resistance_m_pos=2000.0),
    )
    bridge = Bridge(id="KV-0330", adtt=3000.0, riding_surface="smooth")
    case = Case(
        members=(weak, strong), vehicles=(_vehicle("legal"),), capacities=caps, bridges=(bridge,)
    )
    (row,) = run_case(case).rated.postings
    rf = 329.0 / (1.375 * 396.0)
    posting = 20.0 / 0.7 * (rf - 0.3)
    assert row.bridge == "KV-0330" and row.members == 2
    assert row.member == (weak.id,)
    assert row.rf[0] == pytest.approx(rf, rel=REL_TOL_EXACT)
    assert row.posting[0] == pytest.approx(posting, rel=REL_TOL_EXACT)
    assert row.rounded[0] == np.floor(posting)
    assert "post at the posting load" in row.note[0]
