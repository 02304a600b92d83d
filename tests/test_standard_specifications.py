"""The AASHTO Standard Specifications' live loading, checked by hand and against a handbook.

Sources (AASHTO Standard Specifications for Highway Bridges, 17th ed. 2002):

* Lane loading, Art. 3.7.6 and Fig. 3.7.6B: 0.64 kip/ft with one concentrated load,
  18 kip for moment and 26 kip for shear (H20 and HS20); seen in Khan, *Bridge and
  Highway Structure Rehabilitation and Repair* (McGraw-Hill, 2010), Table 6.7, and in
  engineers' descriptions of the article (SEAINT mailing-list archive, 1996).
* For the largest negative moment of continuous spans, a second concentrated load of
  equal weight in one other span, at its worst (Art. 3.11.3): two loads for continuous
  spans seen in Galambos, *Highway bridge loadings* (FHWA); "one other span" and
  "negative moment only" from memory.

Two-span results are checked with the three-moment equation (Clapeyron; any
structural analysis textbook), for a unit load at distance ``a`` from the end support
of span 1 (length L1) and nothing in span 2 (length L2):

    M_B = -a (L1^2 - a^2) / (2 L1 (L1 + L2))

whose largest magnitude is at a = L1 / sqrt(3); and for a uniform load w on both
spans, M_B = -w (L1^3 + L2^3) / (8 (L1 + L2)). Units kip and ft.
"""

from __future__ import annotations

import dataclasses
import math
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from openpyxl import load_workbook
from tolerances import REL_TOL_EXACT, REL_TOL_FLOAT, REL_TOL_GRID, TABLE_TOL_2DP

from batch.engine.envelope import case_effects, member_envelope
from batch.engine.impact import impact_fraction, loaded_lengths
from batch.engine.influence import influence_lines
from batch.engine.moving import fleet_extremes_of
from batch.loads import library
from batch.loads.cases import LoadCase
from batch.loads.factors import STANDARD_SPECIFICATIONS_IMPACT
from batch.loads.fleet import fleet_cases
from batch.model import AxleTrain, Case, Member, Settings, Spacing, Vehicle
from batch.model.units import KN_PER_KIP, M_PER_FT
from batch.running.executor import RunOptions, run_case
from batch.writing.columns import IMPACT
from batch.writing.package.save import atomic_save
from batch.writing.package.splice import SourcePackage, empty_package
from batch.writing.results import result_package
from batch.writing.runlog import InputInfo

LANE = 0.64  # kip/ft, Fig. 3.7.6B (H20, HS20)
MOMENT_LOAD = 18.0  # kip, concentrated load for moment
SHEAR_LOAD = 26.0  # kip, concentrated load for shear


def _lane_cases() -> list[LoadCase]:
    """The HS20 lane loading as engine cases: moment, shear, and the second load."""
    one = AxleTrain.of((MOMENT_LOAD,))
    return [
        LoadCase(label="lane, moment", train=one, lane_load=LANE, scope="moments"),
        LoadCase(
            label="lane, shear",
            train=AxleTrain.of((SHEAR_LOAD,)),
            lane_load=LANE,
            scope="shears-reactions",
        ),
        LoadCase(
            label="lane, two loads",
            train=one,
            lane_load=LANE,
            scope="hogging",
            other_span_load=True,
        ),
    ]


def _pier_moment_peak(span: float, total: float) -> float:
    """Three-moment equation: the largest |M_B| of a unit load in a span of this length."""
    a = span / math.sqrt(3.0)
    return a * (span**2 - a**2) / (2.0 * span * total)


# ---------------------------------------------------------------- the second load


@pytest.mark.parametrize("spans", [(100.0, 100.0), (80.0, 120.0)])
def test_second_concentrated_load_over_the_pier_of_two_spans(spans) -> None:
    # Art. 3.11.3 (from memory): uniform load on both spans (both adverse), one 18 kip
    # load at its worst in one span and an equal one at its worst in the other.
    l1, l2 = spans
    total = l1 + l2
    uniform = -LANE * (l1**3 + l2**3) / (8.0 * total)
    one_load = -MOMENT_LOAD * max(_pier_moment_peak(l1, total), _pier_moment_peak(l2, total))
    two_loads = -MOMENT_LOAD * (_pier_moment_peak(l1, total) + _pier_moment_peak(l2, total))
    effects = case_effects(Member(id="KV-20 G2", spans=spans), _lane_cases(), 10)
    pier = 10  # station 1 of span 1: the interior support
    moment, _, two = effects.min_value[:, pier]
    assert math.isclose(moment, uniform + one_load, rel_tol=REL_TOL_EXACT)
    assert math.isclose(two, uniform + two_loads, rel_tol=REL_TOL_EXACT)
    if l1 == l2:  # the hand numbers for two 100 ft spans: -800 - 2 * 18 * 100 / (6 sqrt 3)
        assert math.isclose(two, -1146.4101615137754, rel_tol=REL_TOL_EXACT)
    # The worst span's load stands at L / sqrt(3) from its end support.
    longer = 0 if l1 >= l2 else 1
    where = l1 / math.sqrt(3.0) if longer == 0 else total - l2 / math.sqrt(3.0)
    assert math.isclose(effects.min_position[2, pier], where, rel_tol=REL_TOL_EXACT)
    assert effects.min_direction[2, pier] == 0  # placed, not moved: no direction


def test_second_load_on_one_span_is_the_single_load() -> None:
    # A simple span has no other span: the second load adds nothing, and a simple
    # span has no hogging moment.
    member = Member(id="KV-20 G1", spans=(60.0,))
    load = AxleTrain.of((MOMENT_LOAD,))
    placed = case_effects(member, [LoadCase(label="x", train=load, other_span_load=True)], 10)
    moved = case_effects(member, [LoadCase(label="x", train=load)], 10)
    scale = placed.lines.effect_scale * MOMENT_LOAD
    assert np.all(np.abs(placed.max_value - moved.max_value) <= REL_TOL_EXACT * scale)
    assert np.all(np.abs(placed.min_value - moved.min_value) <= REL_TOL_EXACT * scale)
    lane = case_effects(member, _lane_cases(), 10)
    assert np.all(lane.min_value[2] == 0.0)


def test_second_load_must_be_one_axle() -> None:
    case = LoadCase(label="KV-T2", train=AxleTrain.of((8.0, 32.0), (14.0,)), other_span_load=True)
    with pytest.raises(ValueError, match="a load placed again in another span must be one axle"):
        case_effects(Member(id="KV-20 G1", spans=(60.0, 60.0)), [case], 4)


# ---------------------------------------------------------------- scopes


def test_moment_and_shear_loads_act_only_on_their_effects() -> None:
    # Fig. 3.7.6B: the lighter load is for moment, the heavier for shear; a reaction
    # is the end shear of the girder, so the shear load applies to reactions
    # (common practice).
    effects = case_effects(Member(id="KV-20 G2", spans=(50.0, 70.0)), _lane_cases(), 8)
    il = effects.lines
    moment, shear, two = 0, 1, 2
    assert np.any(effects.max_value[moment, il.moment_rows] > 0)
    assert np.all(effects.max_value[moment, il.shear_rows.start :] == 0)
    assert np.all(effects.min_value[moment, il.shear_rows.start :] == 0)
    assert np.all(effects.max_value[shear, il.moment_rows] == 0)
    assert np.all(effects.min_value[shear, il.moment_rows] == 0)
    assert np.any(effects.max_value[shear, il.reaction_rows] > 0)
    # The two-load case governs hogging moment only.
    assert np.all(effects.max_value[two] == 0)
    assert np.all(effects.min_value[two, il.shear_rows.start :] == 0)
    hogging = effects.min_value[:, il.moment_rows]
    assert np.all(hogging[two] <= hogging[moment] + REL_TOL_EXACT * np.abs(hogging[moment]))


# ---------------------------------------------------------------- per-span extremes


def test_span_extremes_bound_a_dense_search_and_are_reached() -> None:
    # Exact extremes of piecewise cubics (ends and stationary points of each piece)
    # against a search over 200,000 points per span, both one-sided limits taken.
    il = influence_lines((60.0, 80.0, 45.0), (1.0, 1.5, 0.8), (150.0,), 7)
    largest, smallest = il.span_extremes
    for s in range(3):
        x = np.linspace(il.support_x[s], il.support_x[s + 1], 200_001)[1:-1]
        right, left = il.evaluate(x), il.evaluate(x, side="left")
        high = np.maximum(right, left).max(axis=1)
        low = np.minimum(right, left).min(axis=1)
        exact, grid = REL_TOL_FLOAT * il.effect_scale, REL_TOL_GRID * il.effect_scale
        assert np.all(high <= largest.value[:, s] + exact)
        assert np.all(high >= largest.value[:, s] - grid)
        assert np.all(low >= smallest.value[:, s] - exact)
        assert np.all(low <= smallest.value[:, s] + grid)
        inside = (largest.position[:, s] >= il.support_x[s]) & (
            largest.position[:, s] <= il.support_x[s + 1]
        )
        assert inside.all()


# ---------------------------------------------------------------- impact, Art. 3.8.2


def _three_moment_uniform(spans: tuple[float, float, float]) -> tuple[float, float]:
    """Moments over the two piers of three spans under a unit uniform load on all spans.

    Three-moment equation (equal EI): 2 M_B (L1 + L2) + M_C L2 = -(L1^3 + L2^3) / 4 and
    M_B L2 + 2 M_C (L2 + L3) = -(L2^3 + L3^3) / 4.
    """
    l1, l2, l3 = spans
    a = np.array([[2 * (l1 + l2), l2], [l2, 2 * (l2 + l3)]])
    b = -np.array([l1**3 + l2**3, l2**3 + l3**3]) / 4.0
    m_b, m_c = np.linalg.solve(a, b)
    return float(m_b), float(m_c)


def test_loaded_length_of_every_effect_on_three_spans() -> None:
    # Art. 3.8.2.2 (from memory) as batch/engine/impact.py reads it: M+ the span; M- in
    # the hogging region of an interior support the average of the spans beside it, else
    # the span; V+ the station to the span's far (right) end, V- the span's left end to
    # the station; reactions the span beside an end support, the average of the two
    # spans beside an interior one.
    spans = (50.0, 80.0, 60.0)
    n = 10
    lines = influence_lines(spans, stations_per_span=n)
    for_max, for_min = loaded_lengths(lines)
    m_b, m_c = _three_moment_uniform(spans)
    beside = (50.0, 65.0, 70.0, 60.0)  # supports 1 to 4
    row = 0
    for s, length in enumerate(spans):
        left_m = (0.0, m_b, m_c)[s]
        right_m = (m_b, m_c, 0.0)[s]
        for k in range(n + 1):
            t = k / n * length
            uniform = left_m * (1 - t / length) + right_m * t / length + t * (length - t) / 2
            near = s + 1 if (s == 0 or (s == 1 and t > length - t)) else s  # pier 1 or 2
            hog = uniform < 0
            assert for_max[row] == length
            assert math.isclose(for_min[row], beside[near] if hog else length)
            shear = lines.n_stations + row
            assert math.isclose(for_max[shear], length - t, abs_tol=1e-9 * length)
            assert math.isclose(for_min[shear], t, abs_tol=1e-9 * length)
            row += 1
    assert np.allclose(for_max[lines.reaction_rows], beside)
    assert np.allclose(for_min[lines.reaction_rows], beside)
    # At the first pier (station 1 of span 1, station 0 of span 2) M- uses (50 + 80) / 2.
    assert for_min[n] == 65.0 and for_min[n + 1] == 65.0
    # 8 ft into span 2 is hogging, near pier 1; 8 ft before its end, near pier 2.
    assert for_min[n + 2] == 65.0 and for_min[2 * n] == 70.0
    # Mid-span of span 2 is sagging under a uniform load: M- takes that span, 80 ft.
    assert for_min[n + 1 + n // 2] == 80.0


@pytest.mark.parametrize(
    ("length", "fraction"),
    [
        (100.0, 50.0 / 225.0),  # hand arithmetic: 0.2222
        (200.0, 50.0 / 325.0),  # 0.1538
        (41.0, 0.30),  # 50 / 166 = 0.301: capped
        (0.0, 0.30),  # 50 / 125 = 0.40: capped
    ],
)
def test_impact_fraction_and_its_cap(length: float, fraction: float) -> None:
    # Art. 3.8.2: I = 50 / (L + 125) <= 0.30, L in ft.
    value = impact_fraction(STANDARD_SPECIFICATIONS_IMPACT, np.array([length]))[0]
    assert math.isclose(value, fraction, rel_tol=REL_TOL_FLOAT)
    # The same loaded length in metres with the formula converted gives the same I.
    metric = STANDARD_SPECIFICATIONS_IMPACT.scaled(M_PER_FT)
    in_m = impact_fraction(metric, np.array([length * M_PER_FT]))[0]
    assert math.isclose(in_m, fraction, rel_tol=REL_TOL_FLOAT)


def test_impact_formula_applies_to_axles_and_lane_per_effect() -> None:
    # In this method the lane loading takes impact too (Art. 3.8.2, from memory): every
    # value is (1 + I) times the static one, I at the effect's own loaded length.
    member = Member(id="KV-20 G2", spans=(50.0, 80.0, 60.0))
    static = case_effects(member, _lane_cases(), 10)
    with_impact = [
        dataclasses.replace(c, impact_formula=STANDARD_SPECIFICATIONS_IMPACT) for c in _lane_cases()
    ]
    effects = case_effects(member, with_impact, 10)
    for value, base, length, allowance in (
        (effects.max_value, static.max_value, effects.max_loaded_length, effects.max_impact),
        (effects.min_value, static.min_value, effects.min_loaded_length, effects.min_impact),
    ):
        expected = np.minimum(50.0 / (length + 125.0), 0.30)
        assert np.allclose(allowance, expected[None, :], rtol=REL_TOL_FLOAT, atol=0.0)
        scale = np.abs(base) + np.abs(value)
        assert np.all(np.abs(value - (1 + expected) * base) <= REL_TOL_EXACT * scale)
    # A fixed allowance stays on the axles only, and is reported as such.
    assert np.all(static.max_impact == 0.0)


def test_cases_with_a_fixed_allowance_keep_todays_numbers_bit_for_bit() -> None:
    # A run without the Standard Specifications' impact computes what it always did:
    # factor * DF * ((1 + IM) * axles + lane * adverse area), here recomputed from the
    # engine's own parts (the README's Method) and compared bit for bit.
    member = Member(id="KV-20 G2", spans=(50.0, 80.0, 60.0), df_moment=0.62, df_shear=0.7)
    cases = library.model_cases("HL-93", "US", 0.33)
    effects = case_effects(member, cases, 10)
    il = effects.lines
    fleet = fleet_extremes_of(il, cases)
    positive, negative = il.areas()
    df = np.where(np.arange(il.n_effects) < il.n_stations, 0.62, 0.7)
    for value, axles, area in (
        (effects.max_value, fleet.max_value, positive),
        (effects.min_value, fleet.min_value, negative),
    ):
        for row, case in enumerate(cases):
            expected = case.factor * df * ((1 + 0.33) * axles[row] + case.lane_load * area)
            kept = value[row] != 0.0  # scopes and round-off zero some effects
            assert np.array_equal(value[row][kept], expected[kept])
    assert np.all(effects.max_impact == 0.33) and np.all(effects.min_impact == 0.33)


# ---------------------------------------------------------------- the library models

# Khan, Bridge and Highway Structure Rehabilitation and Repair (McGraw-Hill, 2010),
# Table 6.7, printed p. 251, p. 276 of the electronic copy (seen): "Lane loads of 0.64
# kips/ft (18 kips concentrated load for moment and 26 kips for shear) in lieu of H-20
# truck", per lane, no impact. Columns:
# span (ft), largest lane mid-span moment (kip-ft), governing moment (the larger of the
# H20 truck's largest moment and the lane's, kip-ft), shear (the lane's end shear, kip).
# H20 and HS20 have the same lane loading (Fig. 3.7.6B). Rows below 28 ft of the
# governing column are left out: there one 32 kip axle at mid-span gives more than the
# printed two-axle figure (see test_library_tables.py); the 120 ft shear is not legible.
KHAN_TABLE_6_7 = [
    (20, 122.0, None, 32.4),
    (22, 137.72, None, 33.04),
    (24, 154.08, None, 33.68),
    (26, 171.08, None, 34.32),
    (28, 188.72, 226.8, 34.96),
    (30, 207.0, 246.61, 35.6),
    (32, 225.92, 266.45, 36.24),
    (34, 245.48, 286.31, 36.88),
    (36, 265.68, 306.18, 37.52),
    (38, 286.52, 326.06, 38.16),
    (40, 308.0, 345.96, 38.8),
    (42, 330.12, 365.87, 39.44),
    (45, 364.5, 395.74, 40.4),
    (50, 425.0, 445.57, 42.0),
    (55, 489.5, 495.43, 43.6),
    (60, 558.0, 558.0, 45.2),
    (65, 630.5, 630.5, 46.8),
    (70, 707.0, 707.0, 48.4),
    (75, 787.5, 787.5, 50.0),
    (80, 872.0, 872.0, 51.6),
    (85, 960.5, 960.5, 53.2),
    (90, 1053.0, 1053.0, 54.8),
    (95, 1149.5, 1149.5, 56.4),
    (100, 1250.0, 1250.0, 58.0),
    (105, 1354.5, 1354.5, 59.6),
    (110, 1463.0, 1463.0, 61.2),
    (115, 1575.5, 1575.5, 62.8),
    (120, 1692.0, 1692.0, None),
]


def _static(name: str, scopes: tuple[str, ...] = ()) -> list[LoadCase]:
    """A library model's cases without their impact (the table is static), some scopes only."""
    return [
        dataclasses.replace(c, impact_formula=None)
        for c in library.model_cases(name, "US", 0.33)
        if not scopes or c.scope in scopes
    ]


@pytest.mark.parametrize("name", ["HS20", "H20"])
@pytest.mark.parametrize(("span", "lane_moment", "governing", "lane_shear"), KHAN_TABLE_6_7)
def test_lane_loading_on_simple_spans_against_khan_table_6_7(
    name, span, lane_moment, governing, lane_shear
) -> None:
    env = member_envelope(Member(id="KV-S1", spans=(float(span),)), _static(name), 2)
    labels = [env.labels[c] for c in env.m_max.case]
    mid = 1  # stations 0, 1/2, 1
    lane = case_effects(Member(id="KV-S1", spans=(float(span),)), _static(name), 2)
    moment_part, shear_part = 1, 2  # the parts "lane, moment" and "lane, shear"
    assert abs(lane.max_value[moment_part, mid] - lane_moment) <= TABLE_TOL_2DP
    if lane_shear is not None:
        end = lane.lines.n_stations  # the shear row of station 0
        assert abs(lane.max_value[shear_part, end] - lane_shear) <= TABLE_TOL_2DP
    if name == "H20" and governing == lane_moment:  # the lane governs the H20 at mid-span
        assert abs(env.m_max.value[mid] - governing) <= TABLE_TOL_2DP
        assert labels[mid] == f"{name} (lane, moment)"


@pytest.mark.parametrize(
    ("span", "governing"), [(s, g) for s, m, g, _ in KHAN_TABLE_6_7 if g is not None and g > m]
)
def test_h20_truck_governs_short_spans_as_khan_table_6_7_prints(span, governing) -> None:
    # Where the table's governing moment exceeds the lane's, it is the H20 truck's
    # largest moment, under the 32 kip axle at L/2 - 1.4 ft (a station there: tenths of
    # a foot). Only the parts that act on moments are moved.
    member = Member(id="KV-S1", spans=(float(span),))
    env = member_envelope(member, _static("H20", ("all", "moments")), 10 * span)
    row = int(np.argmax(env.m_max.value))
    assert abs(env.m_max.value[row] - governing) <= TABLE_TOL_2DP
    assert env.labels[env.m_max.case[row]] == "H20 (truck)"


def test_hs20_at_100_ft_with_impact_by_hand() -> None:
    # HS20 truck on a 100 ft simple span: the largest moment is under the middle axle at
    # 50 - 7/3 ft, 72 (L/2 - 7/3)^2 / L - 112 = 1523.92 kip-ft (statics; the closed form
    # of test_library_tables.py), times 1 + I, I = 50 / (100 + 125) = 0.2222 (Art. 3.8.2;
    # hand arithmetic). The lane's largest moment, 1250 kip-ft (Khan, Table 6.7), is less.
    # End shear: 72 - 672 / 100 = 65.28 kip, times the same 1 + I (loaded length 100 ft).
    env = member_envelope(
        Member(id="KV-S1", spans=(100.0,)), library.model_cases("HS20", "US", 0.33), 300
    )
    at = 143  # 143 / 300 of the span: 47.667 ft
    factor = 1 + 50 / 225
    assert math.isclose(
        env.m_max.value[at], (72 * (50 - 7 / 3) ** 2 / 100 - 112) * factor, rel_tol=REL_TOL_EXACT
    )
    assert math.isclose(env.m_max.value[at], 1523.92 * factor, rel_tol=REL_TOL_EXACT)
    assert env.labels[env.m_max.case[at]] == "HS20 (truck)"
    assert math.isclose(env.v_max.value[0], 65.28 * factor, rel_tol=REL_TOL_EXACT)
    assert env.labels[env.v_max.case[0]] == "HS20 (truck)"


def test_hs20_over_the_pier_of_two_spans_is_the_lane_with_two_loads() -> None:
    # Two 100 ft spans: at the pier the lane loading with its second load gives
    # -800 - 2 x 18 x 100 / (6 sqrt 3) = -1146.41 kip-ft (three-moment equation, above),
    # times 1 + I with L the average of the two spans, 100 ft. The truck cannot put its
    # two 32 kip axles near both worst points (57.7 ft from each end support) at once.
    env = member_envelope(
        Member(id="KV-S2", spans=(100.0, 100.0)), library.model_cases("HS20", "US", 0.33), 10
    )
    pier = 10
    expected = (-800.0 - 2 * MOMENT_LOAD * 100 / (6 * math.sqrt(3))) * (1 + 50 / 225)
    assert math.isclose(env.m_min.value[pier], expected, rel_tol=REL_TOL_EXACT)
    assert env.labels[env.m_min.case[pier]] == "HS20 (lane, two loads)"


def test_h_and_hs_parts_follow_the_specification() -> None:
    # Fig. 3.7.6B: 0.64 kip/ft, 18 kip (moment), 26 kip (shear); H15 and HS15 are 75 %
    # of H20 and HS20, lane loading too (AASHO 1941, as printed in Interregional
    # Highways, Appendix VI). Every part takes the Standard Specifications' impact.
    for name, scale in (("HS20", 1.0), ("H20", 1.0), ("HS15", 0.75), ("H15", 0.75)):
        model = library.model(name)
        labels = [p.label for p in model.parts]
        assert labels == ["truck", "lane, moment", "lane, shear", "lane, two loads"]
        truck, moment, shear, two = model.parts
        assert (truck.scope, moment.scope, shear.scope, two.scope) == (
            "all",
            "moments",
            "shears-reactions",
            "hogging",
        )
        assert moment.train.loads == two.train.loads == (18.0 * scale,)
        assert shear.train.loads == (26.0 * scale,)
        assert truck.lane_load == 0.0
        assert moment.lane_load == shear.lane_load == two.lane_load == 0.64 * scale
        assert two.other_span_load and not moment.other_span_load
        assert all(p.impact_formula == STANDARD_SPECIFICATIONS_IMPACT for p in model.parts)
        assert model.weight("US") == truck.weight  # posting weight: the truck


def test_hs20_in_an_si_run_is_the_us_one_converted() -> None:
    # Units converted exactly (0.3048 m per ft, 4.4482216152605 kN per kip): the same
    # loaded lengths in metres give the same impact, so every effect converts exactly.
    us = member_envelope(
        Member(id="KV-S2", spans=(100.0, 80.0)), library.model_cases("HS20", "US", 0.33), 10
    )
    si = member_envelope(
        Member(id="KV-S2", spans=(100.0 * M_PER_FT, 80.0 * M_PER_FT)),
        library.model_cases("HS20", "SI", 0.33),
        10,
    )
    for name in ("m_max", "m_min", "v_max", "v_min", "r_max", "r_min"):
        a, b = getattr(us, name), getattr(si, name)
        unit = KN_PER_KIP * (M_PER_FT if name.startswith("m") else 1.0)
        assert np.allclose(b.value, a.value * unit, rtol=REL_TOL_EXACT, atol=0.0)
        assert np.array_equal(a.case, b.case)


@pytest.mark.parametrize("units", ["US", "SI"])
def test_a_vehicles_row_may_follow_the_standard_specifications_impact(units) -> None:
    # Vehicles, Impact = Standard Specifications: I = 50/(L + 125) <= 0.30 (L in ft, or
    # the same length in m) on the row's axles and lane load alike, instead of the
    # Settings' allowance (0.33 here) on its axles only. A 100 ft simple span: the end
    # shear's loaded length is the span, I = 50 / 225 (hand arithmetic).
    ft = 1.0 if units == "US" else M_PER_FT
    kip = 1.0 if units == "US" else KN_PER_KIP
    row = Vehicle(
        id="KV-T3",
        axle_loads=(10.0 * kip, 30.0 * kip),
        spacings=(Spacing(low=14.0 * ft, high=14.0 * ft),),
        lane_load=0.2 * kip / ft,
    )
    settings = Settings(units=units, impact=0.33)
    member = Member(id="KV-S1", spans=(100.0 * ft,))
    plain = member_envelope(member, fleet_cases((row,), settings), 1)
    standard = dataclasses.replace(row, impact_rule="Standard Specifications")
    env = member_envelope(member, fleet_cases((standard,), settings), 1)
    axles = 40.0 - 10.0 * 14.0 / 100.0  # both axles on, the 30 kip one at the support
    lane = 0.2 * 100.0 / 2.0
    assert math.isclose(plain.v_max.value[0], (1.33 * axles + lane) * kip, rel_tol=REL_TOL_EXACT)
    expected = (1 + 50.0 / 225.0) * (axles + lane) * kip
    assert math.isclose(env.v_max.value[0], expected, rel_tol=REL_TOL_EXACT)


# ---------------------------------------------------------------- the Impact sheet


def _impact_sheet(tmp_path: Path, case: Case, options: RunOptions | None = None) -> list[dict]:
    result = run_case(case, options=options)
    info = InputInfo(name="case.json", digest="0" * 64, source="json", output="out.xlsx")
    path = tmp_path / "out.xlsx"
    atomic_save(result_package(SourcePackage(empty_package(), "out.xlsx"), result, info), path)
    wb = load_workbook(path, read_only=True)
    assert ("Impact" in wb.sheetnames) == any(
        c.impact_formula is not None for c in result.load_cases
    )
    if "Impact" not in wb.sheetnames:
        return []
    values = list(wb["Impact"].iter_rows(values_only=True))
    wb.close()
    # One header row, then records: pandas reads it with its default arguments.
    labels = case.settings.unit_labels
    frame = pd.read_excel(path, sheet_name="Impact")
    assert list(frame.columns) == [c.title(labels) for c in IMPACT.columns]
    assert len(frame) == len(values) - 1
    return [dict(zip(values[0], row, strict=True)) for row in values[1:]]


@pytest.mark.parametrize("stored", [False, True], ids=["in memory", "through the store"])
def test_impact_sheet_shows_the_loaded_length_and_impact_of_every_row(tmp_path, stored) -> None:
    # Art. 3.8.2 as spanfleet reads it (batch/engine/impact.py): at the first pier of
    # 50-80-60 ft spans, M min takes L = (50 + 80) / 2 = 65 ft, I = 50 / 190; an end
    # reaction L = 50 ft, I = 50 / 175; V max at the left end of span 1, L = 50 ft.
    member = Member(id="KV-20 G2", spans=(50.0, 80.0, 60.0))
    case = Case(
        settings=Settings(units="US", stations_per_span=10, impact=0.33),
        members=(member,),
        vehicles=(Vehicle(id="KV-HS20", library="HS20"), Vehicle(id="KV-T", axle_loads=(20.0,))),
    )
    options = RunOptions(store=tmp_path / "run.sqlite", key="KVHA test") if stored else None
    rows = _impact_sheet(tmp_path, case, options)
    il = influence_lines(member.spans, stations_per_span=10)
    assert len(rows) == 4 * il.n_stations + 2 * il.support_x.size
    by = {(r["Effect"], r["Span"], r["Station"], r["Support"]): r for r in rows}
    pier = by["M min", 1, 1.0, None]
    assert pier["Loaded length (ft)"] == 65.0
    assert math.isclose(pier["Impact"], 50 / 190, rel_tol=REL_TOL_FLOAT)
    end = by["R max", None, None, 1]
    assert end["Loaded length (ft)"] == 50.0 and math.isclose(end["Impact"], 50 / 175)
    shear = by["V max", 1, 0.0, None]
    assert shear["Loaded length (ft)"] == 50.0
    # Every row is the engine's own loaded length.
    for_max, for_min = loaded_lengths(il)
    m_min = [r["Loaded length (ft)"] for r in rows if r["Effect"] == "M min"]
    assert np.array_equal(m_min, for_min[il.moment_rows])
    r_max = [r["Loaded length (ft)"] for r in rows if r["Effect"] == "R max"]
    assert np.array_equal(r_max, for_max[il.reaction_rows])


def test_no_impact_sheet_without_the_standard_specifications(tmp_path) -> None:
    case = Case(
        settings=Settings(units="US", stations_per_span=4),
        members=(Member(id="KV-20 G1", spans=(60.0,)),),
        vehicles=(Vehicle(id="KV-HL", library="HL-93"),),
    )
    assert _impact_sheet(tmp_path, case) == []
