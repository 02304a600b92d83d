"""HL-93 by hand: which part governs, and why, on a simple span and two-span members.

The rules are AASHTO LRFD 3.6.1.3.1 (seen in an HL-93 article from
engineeringcivil.org and an HL-93 loading page at aboutcivil.org; the two-truck rule
from memory): per lane, the
larger of design truck + lane and design tandem + lane; for hogging moment between
the points of contraflexure under uniform load and for interior reactions, also
90 % of two design trucks (14 ft rear spacings, at least 50 ft from the lead axle of
one to the rear axle of the other) with 90 % of the lane. IM = 0.33 on the axles only
(Table 3.6.2.1-1, seen quoted in an engineers' forum thread at engineerboards.com).
Units kip, ft.

Two-span influence lines are the closed forms for two equal spans L with a unit load
at distance a from the end support of the span it is in (AISC Manual, Beam Diagrams
and Formulas, two-span case, as reproduced at piping-designer.com; checked by hand
with the three-moment equation):

    M_B(a) = -a (L^2 - a^2) / (4 L^2)            moment over the interior support
    R_B(a) = a [2 L^2 + (L - a)(L + a)] / (2 L^3) interior reaction

and the uniform-load results M_B = -wL^2/8, R_B = 5wL/4 with both spans loaded (Hicks,
*Civil Engineering Formulas*, Table 2.1).
The axle parts are checked against an independent brute-force search over positions
and spacings on those closed forms.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from tolerances import REL_TOL_EXACT, REL_TOL_GRID

from batch.engine.envelope import member_envelope
from batch.loads import library
from batch.model import Member

IM = 0.33
LANE = 0.64  # kip/ft
TRUCK = (8.0, 32.0, 32.0)
STEP = 0.1  # ft, brute-force position step


def _hl93(spans: tuple[float, ...], stations: int):
    return member_envelope(
        Member(id="KV-12 G3", spans=spans), library.model_cases("HL-93", "US", IM), stations
    )


def _moment_pier(a: np.ndarray, span: float) -> np.ndarray:
    return -a * (span**2 - a**2) / (4 * span**2)


def _reaction_pier(a: np.ndarray, span: float) -> np.ndarray:
    return a * (2 * span**2 + (span - a) * (span + a)) / (2 * span**3)


def _two_span(line, span: float):
    """A two-span influence line as a function of x from the left end (0 off the member)."""

    def at(x: np.ndarray) -> np.ndarray:
        a = np.where(x <= span, x, 2 * span - x)  # distance from the nearer end support
        return np.where((x >= 0) & (x <= 2 * span), line(np.clip(a, 0, span), span), 0.0)

    return at


def _brute(line, loads, gaps, span: float, sense: float) -> float:
    """Worst (sense * value largest) effect of a train over positions and one ranged gap.

    ``gaps`` lists every gap; one may be an array of trial values. The member is
    symmetric, so one direction of travel covers both.
    """
    ranged = next((i for i, g in enumerate(gaps) if np.ndim(g)), None)
    trials = gaps[ranged] if ranged is not None else [None]
    best = 0.0
    for value in trials:
        fixed = [value if i == ranged else g for i, g in enumerate(gaps)]
        offsets = np.concatenate([[0.0], np.cumsum(fixed)])
        front = np.arange(0.0, 2 * span + offsets[-1] + STEP, STEP)
        effect = sum(p * line(front - d) for p, d in zip(loads, offsets, strict=True))
        best = max(best, float((sense * effect).max()))
    return sense * best


def test_simple_span_40_ft_tandem_governs_moment_truck_governs_shear():
    span = 40.0
    env = _hl93((span,), 2)  # stations 0, L/2, L
    # Midspan moment, influence ordinate x/2 left of midspan and (L - x)/2 right of it.
    tandem = 25 * 9 + 25 * 9  # axles at 18 and 22 ft: 450
    truck = 8 * 3 + 32 * 10 + 32 * 3  # 8 kip at 6 ft, 32 at 20, 32 at 34 (14 ft spacing): 440
    lane = LANE * span**2 / 8  # 128
    assert (tandem, truck, lane) == (450, 440, 128)
    # Why: two 25 kip axles 4 ft apart both stand near the peak; the truck's 32 kip axles
    # are 14 ft apart, so its 72 kip do less on a span this short.
    assert math.isclose(env.m_max.value[1], (1 + IM) * tandem + lane, rel_tol=REL_TOL_EXACT)
    assert env.labels[env.m_max.case[1]] == "HL-93 (tandem + lane)"
    # End shear: 32 kip at the support, 32 kip 14 ft in, 8 kip 28 ft in.
    truck_v = 32 * 1 + 32 * 26 / 40 + 8 * 12 / 40  # 55.2
    tandem_v = 25 * 1 + 25 * 36 / 40  # 47.5
    lane_v = LANE * span / 2  # 12.8
    assert math.isclose(env.v_max.value[0], (1 + IM) * truck_v + lane_v, rel_tol=REL_TOL_EXACT)
    assert (1 + IM) * truck_v > (1 + IM) * tandem_v
    assert env.labels[env.v_max.case[0]] == "HL-93 (truck + lane)"
    # No hogging and no interior support: the two-truck part has nothing to govern.
    assert (env.m_min.value == 0).all()


@pytest.fixture(scope="module")
def two_spans_60():
    return _hl93((60.0, 60.0), 10)


def test_two_spans_60_ft_hogging_over_the_pier_is_governed_by_two_trucks(two_spans_60):
    span = 60.0
    pier = 10  # station 1 of span 1
    line = _two_span(_moment_pier, span)
    # Two trucks travelling left to right, headway at its 50 ft minimum: the rear truck's
    # axles 32, 32, 8 kip at 35/3, 77/3, 119/3 ft from A; the front truck's 32, 32, 8 kip
    # at 91/3, 49/3, 7/3 ft from C (its rear axle at x = 89.67, 50 ft ahead of 39.67).
    two = sum(
        p * _moment_pier(a, span)
        for p, a in (
            (32, 35 / 3),
            (32, 77 / 3),
            (8, 119 / 3),
            (32, 91 / 3),
            (32, 49 / 3),
            (8, 7 / 3),
        )
    )
    assert math.isclose(two, -608.51, rel_tol=REL_TOL_EXACT)
    brute_two = _brute(line, TRUCK * 2, [14, 14, np.arange(50, 120.5, 0.5), 14, 14], span, -1)
    # The grid search comes within its step of the hand value and never beats it.
    assert math.isclose(brute_two, two, rel_tol=REL_TOL_GRID)
    assert brute_two >= two * (1 + REL_TOL_EXACT)
    one = _brute(line, TRUCK, [14, np.arange(14, 30.5, 0.5)], span, -1)  # about -373.29
    tandem = _brute(line, (25.0, 25.0), [4], span, -1)  # about -287.23
    lane = -LANE * span**2 / 8  # -288
    two_trucks = 0.90 * ((1 + IM) * two + lane)  # -987.59
    truck_lane = (1 + IM) * one + lane  # about -784.5
    tandem_lane = (1 + IM) * tandem + lane  # about -670.0
    # Why: each truck stands near the peak of the pier-moment line in its own span, so the
    # pair nearly doubles the axle effect, far more than the 10 % it gives up.
    assert two_trucks < truck_lane < tandem_lane
    got = two_spans_60.m_min
    assert math.isclose(got.value[pier], two_trucks, rel_tol=REL_TOL_EXACT)
    assert two_spans_60.labels[got.case[pier]] == "HL-93 (two trucks + lane, 90 %)"


def test_two_spans_60_ft_interior_reaction_is_governed_by_one_truck(two_spans_60):
    span = 60.0
    line = _two_span(_reaction_pier, span)
    one = _brute(line, TRUCK, [14, np.arange(14, 30.5, 0.5)], span, 1)  # about 69.58
    two = _brute(line, TRUCK * 2, [14, 14, np.arange(50, 120.5, 0.5), 14, 14], span, 1)
    lane = LANE * 5 * span / 4  # 48
    truck_lane = (1 + IM) * one + lane  # about 140.53
    two_trucks = 0.90 * ((1 + IM) * two + lane)  # about 127.8
    # Why: 50 ft behind the first truck, the second one reaches only the low ends of the
    # reaction line (it adds about 1 kip), so 90 % of the pair is less than one truck.
    assert truck_lane > two_trucks
    got = two_spans_60.r_max
    assert math.isclose(got.value[1], truck_lane, rel_tol=REL_TOL_GRID)
    assert got.value[1] >= truck_lane * (1 - REL_TOL_EXACT)
    assert two_spans_60.labels[got.case[1]] == "HL-93 (truck + lane)"


def test_two_spans_60_ft_sagging_and_end_regions_never_use_two_trucks(two_spans_60):
    # The two-truck part is scoped to hogging between the points of contraflexure under
    # uniform load (x from 3L/4 = 45 ft to 75 ft here, M = wx(3L/8 - x/2), Hicks Table
    # 2.1) and to
    # interior reactions.
    env = two_spans_60
    two = env.labels.index("HL-93 (two trucks + lane, 90 %)")
    assert (env.m_max.case != two).all()
    x = env.station_x
    outside = (x < 45.0 - 1e-9) | (x > 75.0 + 1e-9)
    assert (env.m_min.case[outside] != two).all()
    assert (env.m_min.case[~outside] == two).any()  # and it does govern inside
    assert env.labels[env.m_max.case[4]] == "HL-93 (truck + lane)"  # 0.4 L, sagging
    assert env.r_max.case[0] != two and env.r_max.case[2] != two


def test_two_spans_100_ft_two_trucks_govern_hogging_and_interior_reaction():
    span = 100.0
    env = _hl93((span, span), 10)
    # Interior reaction, two trucks left to right at the 50 ft minimum headway: rear truck
    # 32, 32, 8 kip at 155/3, 197/3, 239/3 ft from A; front truck 8, 32, 32 kip at 127/3,
    # 169/3, 211/3 ft from C.
    two = sum(
        p * _reaction_pier(a, span)
        for p, a in (
            (32, 155 / 3),
            (32, 197 / 3),
            (8, 239 / 3),
            (8, 127 / 3),
            (32, 169 / 3),
            (32, 211 / 3),
        )
    )
    assert math.isclose(two, 114.269592, rel_tol=REL_TOL_EXACT)
    line = _two_span(_reaction_pier, span)
    brute_two = _brute(line, TRUCK * 2, [14, 14, np.arange(50, 200.5, 0.5), 14, 14], span, 1)
    assert math.isclose(brute_two, two, rel_tol=REL_TOL_GRID)
    assert brute_two <= two * (1 + REL_TOL_EXACT)
    one = _brute(line, TRUCK, [14, np.arange(14, 30.5, 0.5)], span, 1)  # about 71.10
    lane = LANE * 5 * span / 4  # 80
    two_trucks = 0.90 * ((1 + IM) * two + lane)  # 208.78
    truck_lane = (1 + IM) * one + lane  # about 174.6
    # Why: on 100 ft spans the second truck, 50 ft back, still stands where the reaction
    # line is about 0.6 to 0.7 (R_B(50) = 0.6875), so the pair adds 60 % to the axles.
    assert math.isclose(_reaction_pier(np.float64(50.0), span), 0.6875, rel_tol=REL_TOL_EXACT)
    assert two_trucks > truck_lane
    assert math.isclose(env.r_max.value[1], two_trucks, rel_tol=REL_TOL_EXACT)
    assert env.labels[env.r_max.case[1]] == "HL-93 (two trucks + lane, 90 %)"
    # Hogging over the pier: lane -wL^2/8 = -800; two trucks again govern.
    pier = _brute(
        _two_span(_moment_pier, span),
        TRUCK * 2,
        [14, 14, np.arange(50, 200.5, 0.5), 14, 14],
        span,
        -1,
    )
    expected = 0.90 * ((1 + IM) * pier - LANE * span**2 / 8)
    assert math.isclose(env.m_min.value[10], expected, rel_tol=REL_TOL_GRID)
    assert env.m_min.value[10] <= expected * (1 - REL_TOL_EXACT)
    assert env.labels[env.m_min.case[10]] == "HL-93 (two trucks + lane, 90 %)"
