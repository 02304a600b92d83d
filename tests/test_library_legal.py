"""The lane-type legal load: its span rule, its two-truck model and its posting weight.

Source: AASHTO Manual for Bridge Evaluation, 3rd ed. (2018), Art. 6A.4.4.2.1a and
Appendix D6A (from memory: the text was not found in published text), as the library
records it (docs/load-models.md):
* for spans of 200 ft and greater, 0.75 x Type 3-3 (12, 12, 12, 16, 14, 14 kip at 15, 4,
  15, 16, 4 ft) with a 0.2 kip/ft lane load; for shorter spans the legal vehicles alone;
* for negative moment and reactions at interior supports, at any span, two 0.75 x Type 3-3
  trucks heading the same way, 30 ft clear between them, with 0.2 kip/ft;
* MBE 6A.8.3: W = 80 kip for posting when the lane-type model governs.

A member meets the 200 ft rule by its longest span (spanfleet's reading, written beside
the value). Hand calculations use the simple-span midspan influence line (x/2, (L - x)/2)
and the two-span closed forms of the AISC beam diagrams (common practice):
R_B(a) = a [2 L^2 + (L - a)(L + a)] / (2 L^3) for a unit load at a from an end support,
and R_B = 5 w L / 4 under a uniform load on both spans.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from tolerances import REL_TOL_EXACT, REL_TOL_GRID

from batch.engine.envelope import case_effects, member_envelope
from batch.loads import library
from batch.loads.cases import SPAN_RULE_REL_TOL
from batch.model import Member
from batch.model.units import M_PER_FT

STEP = 0.1  # ft

TRUCK = tuple(0.75 * p for p in (12.0, 12.0, 12.0, 16.0, 14.0, 14.0))  # 9, 9, 9, 12, 10.5, 10.5
OFFSETS = (0.0, 15.0, 19.0, 34.0, 50.0, 54.0)  # ft behind the front axle
LANE = 0.2  # kip/ft
SINGLE, DOUBLE = "Legal lane (75 % Type 3-3 + lane)", "Legal lane (two 75 % Type 3-3 + lane)"

# Midspan moment on a simple span of 200 ft, no impact, by hand. With an axle at midspan
# every axle is on the span (the truck is 54 ft long), so M = (100 x sum P - sum P |d - d_k|)
# / 2, least when axle k is the weighted median of the offsets: cumulative loads 9, 18, 27,
# 39 of 60 put it at the 12 kip axle (34 ft). sum P |d - 34| = 9 x 34 + 9 x 19 + 9 x 15 + 0
# + 10.5 x 16 + 10.5 x 20 = 990, so M = (6000 - 990) / 2 = 2505; the lane adds
# 0.2 x 200^2 / 8 = 1000.
HAND_200 = (
    100 * sum(TRUCK) - sum(p * abs(d - 34.0) for p, d in zip(TRUCK, OFFSETS, strict=True))
) / 2
assert math.isclose(HAND_200, 2505.0, rel_tol=REL_TOL_EXACT)
HAND_200_LANE = LANE * 200.0**2 / 8


def _legal(spans: tuple[float, ...], stations: int = 2, units: str = "US"):
    return member_envelope(
        Member(id="KV-0900 G1", spans=spans),
        library.model_cases("Legal lane", units, 0.0),
        stations,
    )


@pytest.mark.parametrize("span", [199.0, 199.99])
def test_simple_spans_under_200_ft_take_no_lane_type_load(span: float) -> None:
    env = _legal((span,))
    for family in ("m_max", "m_min", "v_max", "v_min", "r_max", "r_min"):
        assert (getattr(env, family).value == 0).all(), family
        assert (getattr(env, family).case == -1).all(), family


@pytest.mark.parametrize("span", [200.0, 250.0])
def test_simple_spans_of_200_ft_or_more_take_the_single_truck_with_lane(span: float) -> None:
    env = _legal((span,))
    if span == 200.0:
        assert math.isclose(env.m_max.value[1], HAND_200 + HAND_200_LANE, rel_tol=REL_TOL_EXACT)
    assert env.m_max.value[1] > 0
    assert env.labels[env.m_max.case[1]] == SINGLE
    assert (env.m_min.value == 0).all()  # no hogging on a simple span: no two-truck part


def test_the_limit_converted_to_metres_still_admits_a_200_ft_span() -> None:
    """200 ft = 60.96 m exactly (NIST SP 811); a span typed as 60.96 m meets the rule."""
    assert SPAN_RULE_REL_TOL < 1e-6
    env = _legal((200 * M_PER_FT,), units="SI")
    assert env.m_max.value[1] > 0
    assert (_legal((60.9,), units="SI").m_max.value == 0).all()


def test_a_continuous_member_qualifies_by_its_longest_span() -> None:
    cases = library.model_cases("Legal lane", "US", 0.0)
    long_member = Member(id="KV-0901 G1", spans=(150.0, 210.0, 150.0))
    short_member = Member(id="KV-0902 G1", spans=(190.0, 190.0))
    long_effects = case_effects(long_member, cases, 4)
    short_effects = case_effects(short_member, cases, 4)
    assert long_effects.max_value[0].max() > 0  # the single-truck part applies
    assert (short_effects.max_value[0] == 0).all() and (short_effects.min_value[0] == 0).all()
    assert short_effects.min_value[1].min() < 0  # the two-truck part applies at any span


def _reaction_pier(a: np.ndarray, span: float) -> np.ndarray:
    return a * (2 * span**2 + (span - a) * (span + a)) / (2 * span**3)


def test_two_trucks_govern_the_interior_reaction_of_two_100_ft_spans() -> None:
    span = 100.0
    env = _legal((span, span), stations=10)
    # Brute force on the closed-form reaction line: two trucks 30 ft clear, both ways.
    loads = TRUCK * 2
    offsets = np.array([*OFFSETS, *(54.0 + 30.0 + d for d in OFFSETS)])
    front = np.arange(0.0, 2 * span + offsets[-1] + STEP, STEP)
    total = np.zeros_like(front)
    for p, d in zip(loads, offsets, strict=True):
        x = front - d
        a = np.where(x <= span, x, 2 * span - x)
        on = (x >= 0) & (x <= 2 * span)
        total += p * np.where(on, _reaction_pier(np.clip(a, 0, span), span), 0.0)
    expected = total.max() + LANE * 5 * span / 4
    assert math.isclose(env.r_max.value[1], expected, rel_tol=REL_TOL_GRID)
    assert env.r_max.value[1] >= expected * (1 - REL_TOL_EXACT)  # the grid never beats it
    assert env.labels[env.r_max.case[1]] == DOUBLE
    # End supports are not interior: no lane-type load acts there on spans under 200 ft.
    assert env.r_max.case[0] == -1 and env.r_max.case[2] == -1


def test_two_trucks_act_on_negative_moment_at_every_station() -> None:
    """Not only between the points of contraflexure (the HL-93 rule): the MBE says
    negative moment. At 0.2 L of span 1 a uniform load on both spans sags (M = wx(3L/8 -
    x/2) > 0), yet trucks in span 2 hog it; the lane-type model's two trucks count there,
    HL-93's do not."""
    span = 100.0
    member = Member(id="KV-0903 G1", spans=(span, span))
    legal = member_envelope(member, library.model_cases("Legal lane", "US", 0.0), 10)
    hl93 = member_envelope(member, library.model_cases("HL-93", "US", 0.0), 10)
    station = 2  # x = 20 ft
    assert legal.station_x[station] == 20.0
    assert legal.m_min.value[station] < 0
    assert legal.labels[legal.m_min.case[station]] == DOUBLE
    assert hl93.labels[hl93.m_min.case[station]] != "HL-93 (two trucks + lane, 90 %)"
    assert (legal.m_max.value == 0).all()  # sagging: only the single truck, spans < 200 ft


def test_posting_uses_w_of_80_kip() -> None:
    # MBE 6A.8.3 (from memory): W = 80 kip (40 t) when the lane-type model governs.
    assert library.model("Legal lane").weight("US") == 80.0
