"""LRFR service limit states by hand: steel (Service II), prestressed (III), reinforced (I).

Sources:
* RF = (fR - fD) / (gL * fLL), the capacity of a service limit state being the allowable
  stress fR: AASHTO Manual for Bridge Evaluation (MBE) 6A.4.2.1 (C = fR for service
  limit states secondary in M. A. Khan, Bridge and Highway Structure Rehabilitation and
  Repair, McGraw-Hill 2010, p. 187; the ratio's layout from memory);
* live-load factors, MBE Table 6A.4.2.2-1 (from memory): Service II steel 1.30 inventory,
  1.00 operating, 1.30 legal, 1.00 permit; Service III prestressed 1.00 legal; Service I
  reinforced concrete 1.00 permits only; dead-load factors 1.0;
* Service III prestressed inventory: 0.8, or 1.0 with refined losses and elastic gains, MBE
  Table 6A.4.2.2-2 of the 3rd edition's errata (October 2018; verified in the errata);
* stress limits (from memory): steel flanges 0.95 Rh Fyf composite, 0.80 Rh Fyf
  non-composite (AASHTO LRFD 6.10.4.2.2); reinforced concrete under permits 0.9 fy (MBE
  6A.5.4.2.2); prestressed concrete: the engineer's allowable tension (e.g. 0.19 sqrt(f'c)
  ksi, AASHTO LRFD Table 5.9.2.3.2b-1) plus the effective prestress compression;
* section stresses f = M / S, DC1 on the non-composite section and DC2 + DW on the
  long-term composite one, live load on the short-term composite one (common practice of
  composite girder design; AASHTO LRFD 6.10.1.1.1);
* statics (common practice): a simple span L under a uniform w has wL^2/8 at midspan, under
  one axle P at midspan PL/4; 1 kip-ft = 12 kip-in, so 12 M / S is in ksi (exact).
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from tolerances import REL_TOL_EXACT

from batch.engine.envelope import case_effects
from batch.interface import run
from batch.loads.fleet import fleet_cases
from batch.model import Capacity, Case, Member, ServiceSection, Settings, Vehicle
from batch.rating.lrfr import FR_RULES, RatingFactors, rate_member, stress_per_moment
from batch.rating.traffic import GAMMA_SOURCES, LIMIT_STATES, vehicle_terms

L = 80.0  # ft
RUN = Settings()  # IM 0.33 on axles; legal LL factor 1.45, permit 1.30 (Strength)
IM = RUN.impact
# Midspan: M_DC = 1.0 x 80^2 / 8 = 800 kip-ft, M_DW = 0.2 x 80^2 / 8 = 160 kip-ft; one 50 kip
# axle at midspan: 50 x 80 / 4 = 1000 kip-ft, x DF 0.6 = 600, x 1.33 = 798 kip-ft.
M_DC, M_DW = 800.0, 160.0
M_LL = 0.6 * 1000.0 * (1 + IM)
SHARE = 0.8


MEMBER = Member(id="KV-0507 G1", spans=(L,), df_moment=0.6, df_shear=0.6, dc_load=1.0, dw_load=0.2)


def _section(material: str, **kw: object) -> ServiceSection:
    """A Service row at midspan (the DC1 share 0.8 unless given)."""
    values: dict = {"dc1_share": SHARE} | kw
    return ServiceSection(
        member="KV-0507 G1",
        span=1,
        station=0.5,
        material=material,
        **values,  # type: ignore[arg-type]
    )


def _axle(category: str) -> Vehicle:
    return Vehicle(id=f"KV-{category}", axle_loads=(50.0,), category=category)  # type: ignore[arg-type]


VEHICLES = (_axle("design"), _axle("legal"), _axle("permit"))


def _rate(section: ServiceSection | None, cap: Capacity | None = None, vehicles=VEHICLES):
    """The rating of MEMBER with a Capacities row ``cap`` and a Service row ``section``."""
    cases = fleet_cases(vehicles, RUN)
    effects = case_effects(MEMBER, cases, stations_per_span=10)
    return rate_member(
        MEMBER,
        effects,
        cases,
        [] if cap is None else [cap],
        vehicle_terms(vehicles, None, RUN),
        tuple(v.category for v in vehicles),
        RatingFactors.of(RUN),
        (25.0,) * len(vehicles),
        sections=[] if section is None else [section],
    )


def _service(r) -> int:
    """The index of the (one) service check."""
    return int(np.flatnonzero(r.k_limit_state >= 0)[0])


MID = Capacity(member="KV-0507 G1", span=1, station=0.5)


def test_stress_of_a_unit_moment_on_a_unit_section_modulus() -> None:
    # 1 kip-ft = 12 kip-in, over 1 in3: 12 ksi; 1 kN-m = 1e6 N-mm, over 1 mm3: 1e6 MPa
    # (exact unit definitions).
    assert stress_per_moment("US") == pytest.approx(12.0, rel=REL_TOL_EXACT)
    assert stress_per_moment("SI") == pytest.approx(1e6, rel=REL_TOL_EXACT)


def test_composite_steel_at_service_ii_by_hand() -> None:
    """Composite steel girder, bottom flange at midspan (AASHTO LRFD 6.10.4.2.2, MBE 6A.6.4.2.1).

    S nc 600, S lt 800, S st 1000 in3; Fy 50 ksi, Rh 1: fR = 0.95 x 50 = 47.5 ksi.
    fDC = 12 x 800 x (0.8/600 + 0.2/800) = 15.2 ksi; fDW = 12 x 160 / 800 = 2.4 ksi;
    fLL = 12 x 798 / 1000 = 9.576 ksi.
    Inventory RF = (47.5 - 15.2 - 2.4) / (1.30 x 9.576) = 29.9 / 12.4488 = 2.40184;
    operating (1.00) 29.9 / 9.576 = 3.12239; legal (1.30) as inventory; permit (1.00) as
    operating.
    Strength I with Resistance M+ 5000 kip-ft: (5000 - 1.25 x 800 - 1.5 x 160) / (1.75 x 798)
    = 3760 / 1396.5 = 2.69245 > 2.40184, so Service II governs the design load.
    """
    steel = _section("steel", s_nc=600.0, s_lt=800.0, s_st=1000.0, fy=50.0)
    r = _rate(steel, dataclasses.replace(MID, resistance_m_pos=5000.0))
    k = _service(r)
    assert LIMIT_STATES[r.k_limit_state[k]] == "Service II"
    assert FR_RULES[r.k_fr_rule[k]].startswith("0.95 Rh Fy")
    assert r.k_capacity[k] == pytest.approx(47.5, rel=REL_TOL_EXACT)
    assert r.k_dc[k] == pytest.approx(15.2, rel=REL_TOL_EXACT)
    assert r.k_dw[k] == pytest.approx(2.4, rel=REL_TOL_EXACT)
    assert r.p_live[0, k] == pytest.approx(12 * M_LL / 1000.0, rel=REL_TOL_EXACT)
    assert (r.k_m_dc[k], r.k_m_dw[k]) == pytest.approx((M_DC, M_DW), rel=REL_TOL_EXACT)
    fll = 12 * M_LL / 1000.0
    inventory, operating = 29.9 / (1.3 * fll), 29.9 / fll
    assert r.p_rf[:, k] == pytest.approx([inventory, inventory, operating], rel=REL_TOL_EXACT)
    assert r.p_rf_operating[0, k] == pytest.approx(operating, rel=REL_TOL_EXACT)
    # Governing: Service II for every kind (strength: 2.69245 design, 3760 / (1.45 x 798)
    # legal, 3760 / (1.30 x 798) permit, all higher).
    assert list(r.check) == [k, k, k]
    assert r.rf == pytest.approx([inventory, inventory, operating], rel=REL_TOL_EXACT)
    assert r.rf_operating[0] == pytest.approx(operating, rel=REL_TOL_EXACT)
    v = np.arange(3)
    assert list(r.gamma(v, np.full(3, k))) == [1.3, 1.3, 1.0]
    assert LIMIT_STATES[r.limit_state(v, np.zeros(3, dtype=np.int64))[2]] == "Strength II"
    assert GAMMA_SOURCES[r.gamma_source(v, np.full(3, k))[0]].endswith("service limit state")
    strength = 3760.0 / (1.75 * M_LL)
    assert r.p_rf[0, 0] == pytest.approx(strength, rel=REL_TOL_EXACT)


def test_non_composite_steel_at_service_ii_by_hand() -> None:
    """Non-composite steel (no S lt, S st): fR = 0.80 Rh Fyf (AASHTO LRFD 6.10.4.2.2).

    Rh 0.95, Fy 50: fR = 0.80 x 0.95 x 50 = 38 ksi; every load on S nc 600 in3:
    fD = 12 x 960 / 600 = 19.2 ksi; fLL = 12 x 798 / 600 = 15.96 ksi;
    inventory RF = (38 - 19.2) / (1.30 x 15.96) = 18.8 / 20.748 = 0.906111.
    """
    r = _rate(_section("steel", s_nc=600.0, fy=50.0, rh=0.95))
    k = _service(r)
    assert r.k_effect.size == 1  # a service check alone: no strength resistance given
    assert FR_RULES[r.k_fr_rule[k]].startswith("0.80 Rh Fy")
    assert r.k_capacity[k] == pytest.approx(38.0, rel=REL_TOL_EXACT)
    assert r.k_dc[k] + r.k_dw[k] == pytest.approx(19.2, rel=REL_TOL_EXACT)
    assert r.rf[0] == pytest.approx(18.8 / (1.3 * 15.96), rel=REL_TOL_EXACT)


def test_prestressed_at_service_iii_by_hand() -> None:
    """Prestressed girder, tension at the bottom fibre under sagging (MBE 6A.5.4.1).

    S nc 10000, S lt 12000, S st 13000 in3 (bottom fibre). Allowable tension 0.465 ksi
    (0.19 sqrt(6) = 0.4654 for f'c 6 ksi, AASHTO LRFD Table 5.9.2.3.2b-1) and prestress
    compression 2.4 ksi: fR = 2.865 ksi.
    fDC = 12 x 800 x (0.8/10000 + 0.2/12000) = 0.928 ksi; fDW = 12 x 160 / 12000 = 0.16 ksi;
    fLL = 12 x 798 / 13000 = 0.7366154 ksi.
    Inventory (0.8, MBE Table 6A.4.2.2-2): (2.865 - 0.928 - 0.16) / (0.8 x 0.7366154) =
    1.777 / 0.5892923 = 3.015481; legal (1.0): 2.412385; permits are not checked at
    Service III (RF blank), nor the operating level.
    With refined losses and elastic gains the inventory factor is 1.0: 2.412385.
    """
    cap = _section(
        "prestressed concrete",
        s_nc=10000.0,
        s_lt=12000.0,
        s_st=13000.0,
        allowable_stress=0.465,
        prestress_stress=2.4,
    )
    r = _rate(cap)
    k = _service(r)
    assert LIMIT_STATES[r.k_limit_state[k]] == "Service III"
    assert r.k_capacity[k] == pytest.approx(2.865, rel=REL_TOL_EXACT)
    assert r.k_dc[k] == pytest.approx(0.928, rel=REL_TOL_EXACT)
    assert r.k_dw[k] == pytest.approx(0.16, rel=REL_TOL_EXACT)
    fll = 12 * M_LL / 13000.0
    assert r.p_rf[0, k] == pytest.approx(1.777 / (0.8 * fll), rel=REL_TOL_EXACT)
    assert r.p_rf[1, k] == pytest.approx(1.777 / fll, rel=REL_TOL_EXACT)
    assert np.isinf(r.p_rf[2, k]) and np.isinf(r.rf[2])
    assert np.isinf(r.p_rf_operating[0, k])
    refined = _rate(dataclasses.replace(cap, prestress_losses="refined with elastic gains"))
    assert refined.rf[0] == pytest.approx(1.777 / fll, rel=REL_TOL_EXACT)
    assert "refined" in GAMMA_SOURCES[refined.k_gamma_source[k, 0]]


def test_reinforced_concrete_at_service_i_under_permits_by_hand() -> None:
    """Reinforced concrete, reinforcement stress under permits (MBE 6A.5.4.2.2).

    The engineer's S = I_cr / (n (d - kd)) = 900 in3 for every stage (no composite action):
    fy 60 ksi, fR = 0.9 x 60 = 54 ksi; fD = 12 x 960 / 900 = 12.8 ksi; fLL = 12 x 798 /
    900 = 10.64 ksi; permit RF = (54 - 12.8) / (1.00 x 10.64) = 3.872180. Design and legal
    loads are not checked at Service I.
    """
    r = _rate(_section("reinforced concrete", s_nc=900.0, fy=60.0))
    k = _service(r)
    assert LIMIT_STATES[r.k_limit_state[k]] == "Service I"
    assert r.k_capacity[k] == pytest.approx(54.0, rel=REL_TOL_EXACT)
    assert r.rf[2] == pytest.approx(41.2 / 10.64, rel=REL_TOL_EXACT)
    assert np.isinf(r.rf[0]) and np.isinf(r.rf[1])


def test_the_engineers_allowable_stress_replaces_the_computed_limit() -> None:
    # Steel with its own limit 40 ksi (e.g. reduced for flange lateral bending): fR = 40.
    r = _rate(_section("steel", s_nc=600.0, s_st=1000.0, allowable_stress=40.0))
    k = _service(r)
    assert r.k_capacity[k] == 40.0
    assert FR_RULES[r.k_fr_rule[k]] == "Allowable stress, as given"


def test_a_capacities_row_typed_dead_load_moment_is_used_at_its_station() -> None:
    """DC M 900 and DW M 150 typed on the Capacities row at the same station (docs/rating.md).

    S nc = S lt = S st = 600 in3 (non-composite): fDC = 12 x 900 / 600 = 18 ksi, fDW = 12 x
    150 / 600 = 3 ksi.
    """
    cap = dataclasses.replace(MID, resistance_m_pos=5000.0, dc_m=900.0, dw_m=150.0)
    r = _rate(_section("steel", s_nc=600.0, fy=50.0), cap)
    k = _service(r)
    assert (r.k_m_dc[k], r.k_m_dw[k]) == (900.0, 150.0)
    assert r.k_dc[k] == pytest.approx(18.0, rel=REL_TOL_EXACT)
    assert r.k_dw[k] == pytest.approx(3.0, rel=REL_TOL_EXACT)
    assert r.k_dead_given[k]


def test_without_a_service_sheet_an_lrfr_rating_is_todays() -> None:
    # No Service rows: the strength checks alone, as before service checks existed; and
    # with one, the strength checks keep their numbers (the service check only adds).
    cap = dataclasses.replace(MID, resistance_m_pos=5000.0, resistance_v=300.0)
    today = _rate(None, cap)
    assert (today.k_limit_state < 0).all()
    r = _rate(_section("steel", s_nc=600.0, fy=50.0), cap)
    strength = r.k_limit_state < 0
    np.testing.assert_array_equal(r.p_rf[:, strength], today.p_rf)
    np.testing.assert_array_equal(r.p_rf_operating[:, strength], today.p_rf_operating)
    # A run of a case without a Service sheet: no service check anywhere.
    case = Case(members=(MEMBER,), vehicles=VEHICLES, capacities=(cap,))
    (a,) = run(case, jobs=1).result.assessments
    assert a.rating is not None
    np.testing.assert_array_equal(a.rating.rf, today.rf)


def test_the_rating_detail_sheet_shows_every_service_term() -> None:
    """A whole run: the service check's row of Rating Detail recomputes from its cells.

    The steel example above (C = fR = 47.5 ksi, 12 M / S in ksi): the row gives fR's rule,
    Fy, the moments, the section moduli and gamma LL, and RF = (C - DC - DW) / (gamma LL
    x LL+IM) with DC = 12 x (s M DC / S nc + (1 - s) M DC / S lt), DW = 12 M DW / S lt,
    LL+IM = 12 M LL+IM / S st.
    """
    case = Case(
        members=(MEMBER,),
        vehicles=VEHICLES,
        capacities=(dataclasses.replace(MID, resistance_m_pos=5000.0),),
        service=(_section("steel", s_nc=600.0, s_lt=800.0, s_st=1000.0, fy=50.0),),
    )
    results = run(case, jobs=1)
    detail = results.frame("Rating Detail")
    row = detail[(detail["Limit state"] == "Service II") & (detail["Category"] == "design")]
    assert len(row) == 1
    cells = row.iloc[0]

    def x_of(name: str):
        """The cell of the column headed ``name`` (with its unit, if any)."""
        return cells[next(c for c in cells.index if c == name or c.startswith(f"{name} ("))]

    x = {
        name: x_of(name)
        for name in (
            "Unit",
            "C used",
            "C",
            "Rh",
            "Fy",
            "DC1 share",
            "M DC",
            "M DW",
            "M LL+IM",
            "S nc",
            "S lt",
            "S st",
            "DC",
            "DW",
            "LL+IM",
            "gamma DC",
            "gamma DW",
            "gamma LL",
            "RF",
            "Governs",
        )
    }
    assert x["Unit"] == "ksi" and x["C used"] == "C = fR"
    assert x["C"] == pytest.approx(0.95 * x["Rh"] * x["Fy"], rel=REL_TOL_EXACT)
    share = x["DC1 share"]
    dc = 12 * (share * x["M DC"] / x["S nc"] + (1 - share) * x["M DC"] / x["S lt"])
    assert x["DC"] == pytest.approx(dc, rel=REL_TOL_EXACT)
    assert x["DW"] == pytest.approx(12 * x["M DW"] / x["S lt"], rel=REL_TOL_EXACT)
    assert x["LL+IM"] == pytest.approx(12 * x["M LL+IM"] / x["S st"], rel=REL_TOL_EXACT)
    rf = (x["C"] - x["gamma DC"] * x["DC"] - x["gamma DW"] * x["DW"]) / (x["gamma LL"] * x["LL+IM"])
    assert x["RF"] == pytest.approx(rf, rel=REL_TOL_EXACT)
    assert x["Governs"] == "yes"
    ratings = results.frame("Ratings")
    assert set(ratings["Limit state"]) == {"Service II"}


def test_a_metric_service_check_by_hand() -> None:
    """SI: kN-m over mm3, times 1e6, is MPa (exact units); non-composite steel at Service II.

    20 m span, DC 15 and DW 3 kN/m: M_DC = 15 x 400 / 8 = 750, M_DW = 150 kN-m; one 200 kN
    axle, DF 0.6, IM 0.33: 0.6 x 200 x 20 / 4 x 1.33 = 798 kN-m. S nc 5e6 mm3, Fy 345 MPa:
    fR = 0.80 x 345 = 276 MPa (AASHTO LRFD 6.10.4.2.2); fD = 900e6 / 5e6 = 180 MPa, fLL =
    798e6 / 5e6 = 159.6 MPa; inventory RF = (276 - 180) / (1.30 x 159.6) = 0.4626952.
    """
    member = Member(id="KV-M09 G1", spans=(20.0,), df_moment=0.6, df_shear=0.6, dc_load=15.0,
                    dw_load=3.0)  # fmt: skip
    run_si = Settings(units="SI")
    axle = Vehicle(id="KV-SI-D", axle_loads=(200.0,), category="design")
    cases = fleet_cases((axle,), run_si)
    effects = case_effects(member, cases, stations_per_span=10)
    section = ServiceSection(
        member="KV-M09 G1", span=1, station=0.5, material="steel", s_nc=5e6, fy=345.0
    )
    r = rate_member(
        member,
        effects,
        cases,
        [],
        vehicle_terms((axle,), None, run_si),
        ("design",),
        RatingFactors.of(run_si),
        (20.0,),
        units="SI",
        sections=[section],
    )
    assert r.k_capacity[0] == pytest.approx(276.0, rel=REL_TOL_EXACT)
    assert r.k_dc[0] + r.k_dw[0] == pytest.approx(180.0, rel=REL_TOL_EXACT)
    assert r.p_live[0, 0] == pytest.approx(159.6, rel=REL_TOL_EXACT)
    assert r.rf[0] == pytest.approx(96.0 / (1.3 * 159.6), rel=REL_TOL_EXACT)
