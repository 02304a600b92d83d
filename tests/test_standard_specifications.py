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

import numpy as np
import pytest
from tolerances import REL_TOL_EXACT, REL_TOL_FLOAT, REL_TOL_GRID

from batch.engine.envelope import case_effects
from batch.engine.impact import impact_fraction, loaded_lengths
from batch.engine.influence import influence_lines
from batch.engine.moving import fleet_extremes_of
from batch.loads import library
from batch.loads.cases import LoadCase
from batch.loads.factors import STANDARD_SPECIFICATIONS_IMPACT
from batch.model import AxleTrain, Member
from batch.model.units import M_PER_FT

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
