"""Load factor rating (LFR) and allowable stress rating (ASR) by hand, every term shown.

Sources:
* LFR: RF = (C - A1 D) / (A2 L (1 + I)), A1 = 1.3, A2 = 2.17 (inventory) and 1.3
  (operating): AASHTO Manual for Bridge Evaluation (MBE) 6B.4; A2 secondary in NCHRP
  Synthesis 359 (2006), p. 7, quoting the Manual for Condition Evaluation (2000); the
  equation's layout and A1 from memory (the Standard Specifications' load factor design
  group 1.3 D + 2.17 (L + I) is its design analogue);
* ASR: the same equation with A1 = A2 = 1 and allowable capacities, inventory and
  operating (MBE 6B.4, from memory);
* LFR and ASR rate legal loads and permits at the operating level and post a legal load
  at its operating rating RF x W (MBE 6B.7, from memory);
* impact I = 50 / (L + 125) <= 0.30, L the loaded length in ft, on truck and lane alike
  (AASHTO Standard Specifications, 17th ed. 2002, Art. 3.8.2; the formula and cap
  secondary, the loaded-length rules from memory; batch/engine/impact.py states them);
* statics (common practice): on a simple span L, a load P at a gives M(L/2) = P a / 2 for
  a <= L/2; a uniform w gives wL^2/8 at midspan and w(L/2 - x) shear at x.
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from tolerances import REL_TOL_EXACT

from batch.engine.envelope import case_effects
from batch.loads.factors import STANDARD_SPECIFICATIONS_IMPACT
from batch.loads.fleet import fleet_cases
from batch.model import Capacity, Case, Member, Settings, Vehicle
from batch.rating.lrfr import RATED_EFFECTS, RatingFactors, operating_rating, rate_member
from batch.rating.traffic import GAMMA_SOURCES, IMPACT_SOURCES, LIMIT_STATES, vehicle_terms
from batch.running.executor import run_case

L = 70.0  # ft
W_DC, W_DW = 1.05, 0.15  # kip/ft
DF_M, DF_V = 0.65, 0.72
RUN = Settings()

# Midspan: D = (1.05 + 0.15) x 70^2 / 8 = 735 kip-ft. HS20 truck with its middle axle at
# midspan, 14 ft spacings: 8 x 21/2 + 32 x 35/2 + 32 x 21/2 = 84 + 560 + 336 = 980 kip-ft
# (the lane loading gives 0.64 x 70^2/8 + 18 x 35/2 = 707, less); DF: 0.65 x 980 = 637.
# I = 50 / (70 + 125) = 0.25641 (L = the span for positive moment).
D_MID = 735.0
LL_MID = DF_M * 980.0
I_SPAN = 50.0 / (L + 125.0)


def _member(method: str) -> Member:
    return Member(
        id="KV-0118 G2",
        spans=(L,),
        df_moment=DF_M,
        df_shear=DF_V,
        dc_load=W_DC,
        dw_load=W_DW,
        condition_factor=0.85,  # LFR and ASR take no condition or system factor
        system_factor=0.9,
        rating_method=method,  # type: ignore[arg-type]
    )


def _rate(member: Member, vehicles: tuple[Vehicle, ...], cap: Capacity):
    cases = fleet_cases(vehicles, RUN)
    effects = case_effects(member, cases, stations_per_span=10)
    terms = vehicle_terms(vehicles, None, RUN)  # replaced by the method's own
    return rate_member(
        member,
        effects,
        cases,
        [cap],
        terms,
        tuple(v.category for v in vehicles),
        RatingFactors.of(RUN),
        (20.0,) * len(vehicles),
        formula=STANDARD_SPECIFICATIONS_IMPACT,
    )


HS20 = Vehicle(id="HS20", library="HS20", category="design")
MIDSPAN = Capacity(member="KV-0118 G2", span=1, station=0.5, resistance_m_pos=2900.0)


def test_lfr_by_hand_with_hs20() -> None:
    # RF inventory = (2900 - 1.3 x 735) / (2.17 x 637 x 1.25641) = 1944.5 / 1736.72;
    # operating: A2 = 1.3.
    r = _rate(_member("LFR"), (HS20,), MIDSPAN)
    k = 0
    live = LL_MID * (1 + I_SPAN)
    assert r.p_impact[0, k] == pytest.approx(I_SPAN, rel=REL_TOL_EXACT)
    assert r.p_live[0, k] == pytest.approx(live, rel=REL_TOL_EXACT)
    assert r.k_dc[k] + r.k_dw[k] == pytest.approx(D_MID, rel=REL_TOL_EXACT)
    assert (r.k_gamma_dc[k], r.k_gamma_dw[k]) == (1.3, 1.3)
    assert (r.k_phi[k], r.k_capacity[k]) == (1.0, 2900.0)
    assert r.rf[0] == pytest.approx((2900 - 1.3 * D_MID) / (2.17 * live), rel=REL_TOL_EXACT)
    assert r.rf_operating[0] == pytest.approx(
        (2900 - 1.3 * D_MID) / (1.3 * live), rel=REL_TOL_EXACT
    )
    assert LIMIT_STATES[r.v_limit_state[0]] == "Load factor (LFR)"
    assert "inventory" in GAMMA_SOURCES[r.v_gamma_source[0]]


def test_a_typed_truck_takes_the_standard_impact_on_an_lfr_member() -> None:
    # One 40 kip axle, a legal load: L(1 + I) = 0.65 x 40 x 70/4 x (1 + 50/195); operating
    # level, A2 = 1.3: RF = (2900 - 955.5) / (1.3 x L(1 + I)). The Settings' 33 % is not used.
    axle = Vehicle(id="KV-A", axle_loads=(40.0,), category="legal")
    r = _rate(_member("LFR"), (axle,), MIDSPAN)
    live = DF_M * 40.0 * L / 4 * (1 + I_SPAN)
    assert r.p_live[0, 0] == pytest.approx(live, rel=REL_TOL_EXACT)
    assert IMPACT_SOURCES[r.v_impact_source[0]].startswith("Standard Specifications")
    assert r.rf[0] == pytest.approx((2900 - 1.3 * D_MID) / (1.3 * live), rel=REL_TOL_EXACT)
    assert r.v_operating[0] and np.isnan(r.rf_operating[0])


def test_the_loaded_length_of_shear_sets_the_impact() -> None:
    # V+ at station 0.3: loaded from the section to the far support, 0.7 L = 49 ft, I =
    # 50/174; V-: from the near support, 0.3 L = 21 ft, I = 50/146 > 0.30, so 0.30.
    axle = Vehicle(id="KV-A", axle_loads=(40.0,), category="legal")
    cap = Capacity(member="KV-0118 G2", span=1, station=0.3, resistance_v=200.0)
    r = _rate(_member("LFR"), (axle,), cap)
    names = [RATED_EFFECTS[k][0] for k in r.k_effect]
    assert r.p_impact[0, names.index("V+")] == pytest.approx(50 / 174, rel=REL_TOL_EXACT)
    assert r.p_impact[0, names.index("V-")] == pytest.approx(0.30, rel=REL_TOL_EXACT)
    # V+ just right of the section, axle there: 40 x 0.7 = 28 kip; x DF 0.72 x (1 + I).
    assert r.p_live[0, names.index("V+")] == pytest.approx(
        DF_V * 28.0 * (1 + 50 / 174), rel=REL_TOL_EXACT
    )


def test_asr_by_hand_inventory_and_operating() -> None:
    # ASR, A1 = A2 = 1: the inventory (2400 kip-ft) and operating (3300) allowables.
    # Design load: RF = (2400 - 735) / (637 x 1.25641); operating (3300 - 735) / (same).
    cap = dataclasses.replace(MIDSPAN, resistance_m_pos=2400.0, operating_m_pos=3300.0)
    r = _rate(_member("ASR"), (HS20,), cap)
    live = LL_MID * (1 + I_SPAN)
    assert r.rf[0] == pytest.approx((2400 - D_MID) / live, rel=REL_TOL_EXACT)
    assert r.rf_operating[0] == pytest.approx((3300 - D_MID) / live, rel=REL_TOL_EXACT)
    assert (r.k_gamma_dc[0], r.v_gamma[0]) == (1.0, 1.0)
    assert r.k_capacity_operating[0] == 3300.0


def test_asr_legal_load_rated_and_posted_at_the_operating_level() -> None:
    # A legal axle of 40 kip (W = 20 tons): RF = (C_op - D) / L(1 + I) with C_op = 1000:
    # (1000 - 735) / (0.65 x 700 x 1.25641) = 0.46355...; posted at RF x W = 9.27 tons.
    axle = Vehicle(id="KV-A", axle_loads=(40.0,), category="legal")
    cap = dataclasses.replace(MIDSPAN, resistance_m_pos=900.0, operating_m_pos=1000.0)
    r = _rate(_member("ASR"), (axle,), cap)
    rf = (1000.0 - D_MID) / (DF_M * 700.0 * (1 + I_SPAN))
    assert r.rf[0] == pytest.approx(rf, rel=REL_TOL_EXACT)
    assert r.posting[0] == pytest.approx(rf * 20.0, rel=REL_TOL_EXACT)
    assert operating_rating(0.2, 20.0) == pytest.approx(4.0)
    assert operating_rating(1.0, 20.0) is None


def test_one_run_rates_lrfr_and_lfr_members_side_by_side() -> None:
    lrfr, lfr = _member("LRFR"), dataclasses.replace(_member("LFR"), id="KV-0118 G3")
    case = Case(
        members=(lrfr, lfr),
        vehicles=(HS20,),
        capacities=(MIDSPAN, dataclasses.replace(MIDSPAN, member="KV-0118 G3")),
    )
    a, b = run_case(case).assessments
    assert a.rating is not None and b.rating is not None
    # LRFR: phi_c phi_s = 0.85 x 0.9 floored at 0.85 (MBE Eq. 6A.4.2.1-3); LFR: no condition
    # or system factor, A1 and A2 as by hand above.
    assert a.rating.k_capacity[0] == pytest.approx(0.85 * 2900.0, rel=REL_TOL_EXACT)
    assert b.rating.rf[0] == pytest.approx(
        (2900 - 1.3 * D_MID) / (2.17 * LL_MID * (1 + I_SPAN)), rel=REL_TOL_EXACT
    )
