"""Load rating and screening (batch/rating/) against the published equations.

Sources:
* LRFR general equation RF = (C - gDC*DC - gDW*DW)/(gLL*(LL + IM)) with
  C = phi_c*phi_s*phi*Rn, phi_c*phi_s >= 0.85, phi_s = 1 for shear: AASHTO Manual
  for Bridge Evaluation (MBE) 6A.4.2.1, from memory;
* load factors 1.25 (DC), 1.50 (DW), 1.75 / 1.35 (design inventory / operating):
  MBE Table 6A.4.2.2-1, from memory; relieving (minimum) factors 0.90 / 0.65:
  AASHTO LRFD Table 3.4.1-2, from memory;
* a synthetic example that checks the equation's wiring only, computed by hand
  with the MBE 6A.4.2.1 equation and factors (from memory): C = 5000, DC = 1500,
  DW = 200, LL+IM = 1200 kip-ft gives RF_inv = 2825/2100 = 1.345 and
  RF_op = 2825/1620 = 1.744;
* posting load (W/0.7)(RF - 0.3) for legal loads, 0.3 <= RF < 1: MBE 6A.8.3, from
  memory, with a value computed by hand from it: Type 3 (25 t) at RF 0.80 gives
  25/0.7 x 0.5 = 17.86 t;
* dead-load effects of a uniform load w: simple span M = wL^2/8 at midspan and
  end shear wL/2 (statics, common practice); two equal spans M_B = -wL^2/8 and
  R_B = 5wL/4 (Hicks, *Civil Engineering Formulas*, Table 2.1; checked by hand
  with the three-moment equation);
* one moving axle P on a simple span: midspan moment PL/4 and shear P just right
  of the left support (statics, common practice).
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from tolerances import REL_TOL_FIXTURE, REL_TOL_FLOAT

from batch.engine.envelope import case_effects
from batch.engine.influence import influence_lines
from batch.loads.cases import LoadCase
from batch.loads.factors import MIN_CAPACITY_FACTOR
from batch.model import AxleTrain, Capacity, Member, Settings, Vehicle
from batch.rating.lrfr import (
    RATED_EFFECTS,
    RatingFactors,
    capacity_factor,
    dead_load_effects,
    posting_load,
    rate_member,
    rating_factor,
    rating_flag,
    vehicle_effects,
    weight_in_tons,
)
from batch.rating.screening import SCREEN_EFFECTS, screen_member
from batch.rating.traffic import vehicle_terms

MBE = RatingFactors()  # the published defaults (see the module docstring)


def _grid_row(span: int, station: float, n: int) -> int:
    """Row of a grid station: stations 0, 1/n, ..., 1 span by span (docs/workbook.md)."""
    return (span - 1) * (n + 1) + round(station * n)


def test_published_fixture_by_the_general_equation():
    # Synthetic example, computed by hand (MBE 6A.4.2.1, from memory): C = 5000,
    # DC = 1500, DW = 200, LL+IM = 1200 (kip-ft).
    # Inventory: (5000 - 1.25 x 1500 - 1.50 x 200) / (1.75 x 1200) = 2825 / 2100.
    # Operating: 2825 / (1.35 x 1200) = 2825 / 1620.
    inventory = rating_factor(5000.0, 1500.0, 200.0, 1200.0, MBE.design, MBE)
    operating = rating_factor(5000.0, 1500.0, 200.0, 1200.0, MBE.operating, MBE)
    assert float(inventory) == pytest.approx(2825 / 2100, rel=REL_TOL_FLOAT)
    assert float(operating) == pytest.approx(2825 / 1620, rel=REL_TOL_FLOAT)
    assert float(inventory) == pytest.approx(1.345, rel=REL_TOL_FIXTURE)
    assert float(operating) == pytest.approx(1.744, rel=REL_TOL_FIXTURE)


def test_a_relieving_dead_load_takes_the_minimum_factor():
    # LRFD Table 3.4.1-2 (from memory): where DC and DW reduce the rated effect their
    # factors are 0.90 and 0.65. DC = -100, DW = -20 in the rated sense:
    # (1000 + 0.90 x 100 + 0.65 x 20) / (1.75 x 400) = 1103 / 700.
    rf = rating_factor(1000.0, -100.0, -20.0, 400.0, MBE.design, MBE)
    assert float(rf) == pytest.approx(1103 / 700, rel=REL_TOL_FLOAT)


def test_nothing_to_rate_where_the_live_load_is_zero():
    assert float(rating_factor(1000.0, 100.0, 0.0, 0.0, MBE.design, MBE)) == np.inf
    assert float(rating_factor(np.nan, 100.0, 0.0, 50.0, MBE.design, MBE)) == np.inf


def test_capacity_factor_floor_and_shear():
    # MBE 6A.4.2.1-3 (from memory): phi_c phi_s >= 0.85; phi_s = 1 for shear.
    poor_two_girder = Member(id="KV-X", spans=(80.0,), condition_factor=0.85, system_factor=0.85)
    assert capacity_factor(poor_two_girder, flexure=True) == MIN_CAPACITY_FACTOR
    assert capacity_factor(poor_two_girder, flexure=False) == 0.85
    fair = Member(id="KV-Y", spans=(80.0,), condition_factor=0.95, system_factor=1.0)
    assert capacity_factor(fair, flexure=True) == 0.95


# ---------------------------------------------------------------- through the engine

L = 60.0  # ft, a simple span
P = 40.0  # kip, one axle
IM = 0.33
DF_M, DF_V = 0.6, 0.7
W_DC, W_DW = 1.2, 0.2  # kip/ft


def _simple_member(**kw: float) -> Member:
    values = {
        "df_moment": DF_M,
        "df_shear": DF_V,
        "dc_load": W_DC,
        "dw_load": W_DW,
        "condition_factor": 0.95,
    }
    return Member(id="KV-0330 G3", spans=(L,), **(values | kw))


def _axle(vehicle: int = 0, load: float = P) -> LoadCase:
    return LoadCase(label=f"KV-A{vehicle}", train=AxleTrain.of((load,)), impact=IM, vehicle=vehicle)


def _rate(member: Member, capacities: list[Capacity], cases: list[LoadCase], categories):
    effects = case_effects(member, cases, stations_per_span=10)
    weights = [25.0] * len(categories)  # tons; posting loads are checked in test_posting_*
    fleet = [Vehicle(id=f"KV-A{i}", axle_loads=(P,), category=c) for i, c in enumerate(categories)]
    terms = vehicle_terms(fleet, None, Settings())  # the Settings' factors, as MBE
    rating = rate_member(member, effects, cases, capacities, terms, categories, MBE, weights)
    return rating, effects


def test_dead_load_effects_simple_span():
    il = influence_lines((L,), (1.0,), (), stations_per_span=10)
    dc = dead_load_effects(il, W_DC)
    mid = _grid_row(1, 0.5, 10)
    assert dc[il.moment_rows][mid] == pytest.approx(W_DC * L**2 / 8, rel=REL_TOL_FLOAT)
    assert dc[il.shear_rows][0] == pytest.approx(W_DC * L / 2, rel=REL_TOL_FLOAT)
    assert dc[il.shear_rows][-1] == pytest.approx(-W_DC * L / 2, rel=REL_TOL_FLOAT)


def test_dead_load_effects_two_equal_spans():
    # Hicks, Civil Engineering Formulas, Table 2.1: M_B = -wL^2/8, R_B = 5wL/4, R_A = 3wL/8.
    il = influence_lines((L, L), (1.0, 1.0), (), stations_per_span=4)
    dc = dead_load_effects(il, W_DC)
    support_b = _grid_row(1, 1.0, 4)
    assert dc[il.moment_rows][support_b] == pytest.approx(-W_DC * L**2 / 8, rel=REL_TOL_FLOAT)
    reactions = dc[il.reaction_rows]
    assert reactions[1] == pytest.approx(5 * W_DC * L / 4, rel=REL_TOL_FLOAT)
    assert reactions[0] == pytest.approx(3 * W_DC * L / 8, rel=REL_TOL_FLOAT)


def test_rating_worked_by_hand_on_a_simple_span():
    # Midspan, sagging. DC M = 1.2 x 60^2 / 8 = 540; DW M = 0.2 x 60^2 / 8 = 90 kip-ft.
    # LL + IM = DF x (1 + IM) x P L / 4 = 0.6 x 1.33 x 600 = 478.8 kip-ft.
    # C = phi_c phi_s phi Rn = 0.95 x 1.00 x 3000 = 2850 kip-ft.
    # RF = (2850 - 1.25 x 540 - 1.50 x 90) / (1.75 x 478.8) = 2040 / 837.9.
    # Operating: 2040 / (1.35 x 478.8) = 2040 / 646.38.
    member = _simple_member()
    rating, _ = _rate(
        member, [Capacity(member=member.id, span=1, station=0.5, resistance_m_pos=3000.0)],
        [_axle()], ["design"],
    )  # fmt: skip
    assert rating.rf[0] == pytest.approx(2040 / 837.9, rel=REL_TOL_FLOAT)
    assert rating.rf_operating[0] == pytest.approx(2040 / 646.38, rel=REL_TOL_FLOAT)
    assert RATED_EFFECTS[rating.effect[0]][0] == "M+"
    assert rating.station[0] == _grid_row(1, 0.5, 10)


def test_shear_rating_by_hand_uses_the_condition_factor_alone():
    # Station 0 (section just right of the left support). DC V = 1.2 x 60 / 2 = 36,
    # DW V = 6 kip. LL + IM: the axle just right of the section, V = P:
    # 0.7 x 1.33 x 40 = 37.24 kip. C = 0.95 x 150 = 142.5 (phi_s does not apply to
    # shear, even at 0.85). RF = (142.5 - 45 - 9) / (1.45 x 37.24) for a legal load.
    # Negative shear: no position of the axle gives any, so it is not rated.
    member = _simple_member(system_factor=0.85)
    rating, _ = _rate(
        member, [Capacity(member=member.id, span=1, station=0.0, resistance_v=150.0)],
        [_axle()], ["legal"],
    )  # fmt: skip
    assert rating.rf[0] == pytest.approx(88.5 / (1.45 * 37.24), rel=REL_TOL_FLOAT)
    assert RATED_EFFECTS[rating.effect[0]][0] == "V+"
    assert np.isnan(rating.rf_operating[0])  # only design loads have an operating RF


def test_capacity_row_dead_loads_replace_the_computed_ones():
    # DC M and DW M typed on the row: 600 and 0 kip-ft.
    # RF = (2850 - 1.25 x 600 - 0) / (1.75 x 478.8) = 2100 / 837.9.
    member = _simple_member()
    cap = Capacity(member=member.id, span=1, station=0.5, resistance_m_pos=3000.0, dc_m=600.0,
                   dw_m=0.0)  # fmt: skip
    rating, _ = _rate(member, [cap], [_axle()], ["design"])
    assert rating.rf[0] == pytest.approx(2100 / 837.9, rel=REL_TOL_FLOAT)


def test_governing_rating_is_the_smallest_over_stations_and_effects():
    member = _simple_member()
    caps = [
        Capacity(member=member.id, span=1, station=0.5, resistance_m_pos=3000.0),
        Capacity(member=member.id, span=1, station=0.0, resistance_v=70.0),  # weak in shear
        Capacity(member=member.id, span=1, station=1.0, resistance_m_neg=10.0),  # no LL: skip
    ]
    rating, _ = _rate(member, caps, [_axle(0), _axle(1, 2 * P)], ["design", "permit"])
    for v, gamma, load in ((0, MBE.design, P), (1, MBE.permit, 2 * P)):
        shear = (0.95 * 70.0 - 1.25 * 36 - 1.5 * 6) / (gamma * DF_V * (1 + IM) * load)
        assert rating.rf[v] == pytest.approx(shear, rel=REL_TOL_FLOAT)
        assert RATED_EFFECTS[rating.effect[v]][0] == "V+"
        assert rating.station[v] == 0


def test_a_vehicle_that_loads_no_rated_effect_is_not_rated():
    member = _simple_member()
    caps = [Capacity(member=member.id, span=1, station=0.5, resistance_m_neg=500.0)]
    rating, _ = _rate(member, caps, [_axle()], ["legal"])
    assert rating.rf[0] == np.inf and rating.effect[0] == -1 and rating.station[0] == -1


@settings(max_examples=25, deadline=None, derandomize=True)
@given(
    factor=st.floats(min_value=0.05, max_value=20.0),
    capacity=st.floats(min_value=0.0, max_value=1e5),
    dc=st.floats(min_value=-1e4, max_value=1e4),
    dw=st.floats(min_value=-1e3, max_value=1e3),
    live=st.floats(min_value=1.0, max_value=1e4),
)
def test_rf_scales_inversely_with_the_live_load(factor, capacity, dc, dw, live):
    base = float(rating_factor(capacity, dc, dw, live, MBE.design, MBE))
    scaled = float(rating_factor(capacity, dc, dw, factor * live, MBE.design, MBE))
    assert scaled == pytest.approx(base / factor, rel=REL_TOL_FLOAT, abs=1e-12)


@settings(max_examples=25, deadline=None, derandomize=True)
@given(
    dc=st.floats(min_value=-1e4, max_value=1e4),
    dw=st.floats(min_value=-1e3, max_value=1e3),
    live=st.floats(min_value=1.0, max_value=1e4),
    gamma=st.sampled_from([MBE.design, MBE.operating, MBE.legal, MBE.permit]),
)
def test_rf_is_one_when_the_capacity_equals_the_factored_demand(dc, dw, live, gamma):
    demand = float(
        (MBE.dc if dc >= 0 else MBE.dc_relieving) * dc
        + (MBE.dw if dw >= 0 else MBE.dw_relieving) * dw
        + gamma * live
    )
    rf = float(rating_factor(demand, dc, dw, live, gamma, MBE))
    # Forming C - dead loses at most a few ulps of the largest term.
    scale = abs(demand) + abs(dc) * MBE.dc + abs(dw) * MBE.dw + gamma * live
    assert rf == pytest.approx(1.0, abs=8 * np.finfo(float).eps * scale / (gamma * live))


@settings(max_examples=10, deadline=None, derandomize=True)
@given(
    df=st.floats(min_value=0.2, max_value=1.5),
    k=st.floats(min_value=0.25, max_value=4.0),
    station=st.sampled_from([0.2, 0.5, 0.7]),
)
def test_rf_scales_inversely_with_the_distribution_factor(df, k, station):
    caps = [Capacity(member="KV-0330 G3", span=1, station=station, resistance_m_pos=4000.0)]
    hs = AxleTrain.of((8.0, 32.0, 32.0), (14.0, 14.0))
    truck = [LoadCase(label="KV-T", train=hs, impact=IM)]
    base, _ = _rate(_simple_member(df_moment=df), caps, truck, ["design"])
    scaled, _ = _rate(_simple_member(df_moment=k * df), caps, truck, ["design"])
    assert scaled.rf[0] == pytest.approx(base.rf[0] / k, rel=REL_TOL_FLOAT)


# ---------------------------------------------------------------- posting and flags


@pytest.mark.parametrize(
    ("rf", "expected"),
    [
        (0.3, 0.0),  # 25/0.7 x 0 — at the closing threshold
        (0.5, 25 / 0.7 * 0.2),
        (0.8, 25 / 0.7 * 0.5),  # 17.86 t, computed by hand
        (0.99, 25 / 0.7 * 0.69),
    ],
)
def test_posting_load_by_the_posting_equation(rf, expected):
    # MBE 6A.8.3 (from memory): posting = (W/0.7)(RF - 0.3); Type 3, W = 50 kip = 25 tons.
    weight = weight_in_tons(50.0, "US")
    assert weight == 25.0
    assert posting_load(rf, weight) == pytest.approx(expected, rel=REL_TOL_FLOAT, abs=1e-12)


def test_posting_worked_value():
    # (W/0.7)(RF - 0.3) computed by hand: 25/0.7 x 0.5 = 17.86 t (MBE 6A.8.3, from memory).
    assert posting_load(0.8, 25.0) == pytest.approx(17.86, abs=0.005)


@pytest.mark.parametrize("rf", [0.29, -0.4, 1.0, 1.3, np.inf])
def test_no_posting_outside_the_equation(rf):
    assert posting_load(rf, 25.0) is None


def test_tonnes_from_kilonewtons():
    # 1 tonne = 1000 kg x 9.80665 m/s2 (standard gravity, ISO 80000-3) = 9.80665 kN.
    assert weight_in_tons(9.80665 * 36, "SI") == pytest.approx(36, rel=REL_TOL_FLOAT)


def test_flags():
    assert rating_flag("legal", 0.2, np.nan).startswith("RF below 0.3")
    assert "consider" in rating_flag("legal", 0.2, np.nan)
    assert rating_flag("legal", 0.5, np.nan) == "RF below 1: post at the posting load"
    assert rating_flag("legal", 1.0, np.nan) is None
    assert rating_flag("design", 0.9, 1.2) == "below the inventory level"
    assert rating_flag("design", 0.7, 0.9) == "below the operating level"
    assert rating_flag("permit", 0.9, np.nan) == "RF below 1: the permit load is not carried"
    assert rating_flag("design", -0.1, -0.2) == "factored dead load alone exceeds the capacity"


# ---------------------------------------------------------------- screening


@settings(max_examples=15, deadline=None, derandomize=True)
@given(
    spans=st.lists(st.floats(min_value=20.0, max_value=120.0), min_size=1, max_size=3),
    loads=st.lists(st.floats(min_value=2.0, max_value=40.0), min_size=1, max_size=4),
    floor=st.sampled_from([0.0, 0.1, 0.5]),
)
def test_screening_a_vehicle_against_itself_gives_one(spans, loads, floor):
    member = Member(id="KV-S", spans=tuple(spans), df_moment=0.6, df_shear=0.7)
    train = AxleTrain.of(loads, (5.0,) * (len(loads) - 1))
    case = LoadCase(label="KV-V", train=train, impact=IM)
    effects = case_effects(member, [case], stations_per_span=4)
    live = vehicle_effects(effects, [case], 1)
    result = screen_member(effects.lines, live, live.max_value[0], live.min_value[0], floor)
    assert result.ratio[0] == 1.0


def test_screening_ratio_by_hand():
    # A 60 ft simple span; reference: one 40 kip axle; vehicle: two 40 kip axles 14 ft
    # apart. Midspan moment: reference PL/4 = 600; vehicle 40 x 15 + 40 x 8 = 920
    # (influence ordinate (L/2 - d)/2 at d = 14 ft from midspan: 8). End shear:
    # reference 40; vehicle 40 + 40 x 46/60. The largest ratio over all stations is at
    # station 0.1 or nearer the end; check it against the brute-force ratio of the two
    # envelopes and that the midspan ratio is below it.
    member = _simple_member()
    cases = [
        LoadCase(label="KV-REF", train=AxleTrain.of((P,)), vehicle=0),
        LoadCase(label="KV-2", train=AxleTrain.of((P, P), (14.0,)), vehicle=1),
    ]
    effects = case_effects(member, cases, stations_per_span=10)
    live = vehicle_effects(effects, cases, 2)
    il = effects.lines
    result = screen_member(il, live, live.max_value[0], live.min_value[0], floor=0.0)
    mid = _grid_row(1, 0.5, 10)
    m_ref, m_veh = live.max_value[:, il.moment_rows][:, mid]
    assert m_ref == pytest.approx(DF_M * 600, rel=REL_TOL_FLOAT)
    assert m_veh == pytest.approx(DF_M * 920, rel=REL_TOL_FLOAT)
    v_ref, v_veh = live.max_value[:, il.shear_rows][:, 0]
    assert v_veh / v_ref == pytest.approx(1 + 46 / 60, rel=REL_TOL_FLOAT)
    ratios = []
    for _, family, sense in SCREEN_EFFECTS:
        rows = {"moment": il.moment_rows, "shear": il.shear_rows, "reaction": il.reaction_rows}
        extreme = live.max_value if sense > 0 else live.min_value
        ref, veh = sense * extreme[0, rows[family]], sense * extreme[1, rows[family]]
        ratios += [b / a for a, b in zip(ref, veh, strict=True) if a > 0]
    assert result.ratio[0] == 1.0
    assert result.ratio[1] == pytest.approx(max(ratios), rel=REL_TOL_FLOAT)
    assert result.ratio[1] > 920 / 600


def test_screening_floor_leaves_out_small_reference_effects():
    # Two spans: the reference's negative moment near the left end is a small share of its
    # largest; a floor of 0.5 leaves those stations out, so the largest ratio cannot grow.
    member = Member(id="KV-C", spans=(50.0, 50.0))
    cases = [
        LoadCase(label="KV-REF", train=AxleTrain.of((P,)), vehicle=0),
        LoadCase(label="KV-LONG", train=AxleTrain.of((P,) * 4, (20.0,) * 3), vehicle=1),
    ]
    effects = case_effects(member, cases, stations_per_span=10)
    live = vehicle_effects(effects, cases, 2)
    args = (effects.lines, live, live.max_value[0], live.min_value[0])
    assert screen_member(*args, floor=0.5).ratio[1] <= screen_member(*args, floor=0.0).ratio[1]
