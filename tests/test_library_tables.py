"""Library trucks on simple spans, against tables of maximum moments and shears.

The H20 table is published (Khan 2010, below); the HS20 and HL-93 tables were
computed by hand from closed forms, which are checked as well.

The absolute maximum moment of a train on a simple span occurs under an axle
when the span's centre line bisects the distance between that axle and the
resultant of the axles on the span (Hicks, *Civil Engineering Formulas*, moving
concentrated loads; the worked note "Max M in simple span due to moving loads" on
Scribd; Kassimali, *Structural Analysis* 6th ed., Problem 9.22); a station is placed
exactly there (stations are at fractions k/n of the span, so n is the
denominator of x/L). The maximum end shear is at a support with the heavy end
of the train over it (Kassimali, Problem 9.18; Gere, Problem 4.5-30; a
civil-engineering board-exam review page on moving loads, ceboardexamgenerator.com).
Every value is the engine's exact extreme, compared to the table's printed precision.
"""

from __future__ import annotations

import dataclasses
import math
from fractions import Fraction

import pytest
from tolerances import REL_TOL_EXACT

from batch.engine.envelope import member_envelope
from batch.loads import library
from batch.model import Member

HALF_UNIT_1DP = 0.05  # a value printed with one decimal
HALF_UNIT_2DP = 0.005  # a value printed with two decimals


def _envelope(name: str, span: Fraction | int, stations: int, impact: float = 0.0):
    cases = library.model_cases(name, "US", impact)
    if cases[0].impact_formula is not None:
        # An H or HS loading: its truck alone, static (the tables are of the truck; the
        # lane loading and the impact are checked in test_standard_specifications.py).
        assert cases[0].label == f"{name} (truck)"
        cases = [dataclasses.replace(cases[0], impact_formula=None)]
    return member_envelope(Member(id="KV-S1", spans=(float(span),)), cases, stations)


def _moment_at(name: str, span: int, x: Fraction) -> tuple[float, float]:
    """Moment at a station exactly at ``x``, and the largest at any station of that grid."""
    where = x / span
    env = _envelope(name, span, where.denominator)
    return float(env.m_max.value[where.numerator]), float(env.m_max.value.max())


# HS20-44 (library model, rear spacing 14-30 ft: the engine finds 14 ft governs on a
# simple span), per lane, no impact. Values computed by hand from first principles
# (statics of a simple span, axles that leave the span dropped; the closed forms of
# test_hs20_closed_forms where all three axles are on), one decimal for M and two for V;
# the closed forms are checked as well.
HS20_ROWS = [
    # L, M_abs, V_end, position of the governing axle
    (10, 80.0, 32.00, Fraction(5)),  # one 32 kip axle at midspan
    (20, 160.0, 41.60, Fraction(10)),  # one 32 kip axle at midspan
    (30, 282.1, 49.60, Fraction(15) - Fraction(7, 2)),  # 8 kip axle off the span
    (40, 449.8, 55.20, Fraction(20) - Fraction(7, 3)),
    (50, 627.8, 58.56, Fraction(25) - Fraction(7, 3)),
    (60, 806.5, 60.80, Fraction(30) - Fraction(7, 3)),
    (80, 1164.9, 63.60, Fraction(40) - Fraction(7, 3)),
    (100, 1523.9, 65.28, Fraction(50) - Fraction(7, 3)),
    (120, 1883.3, 66.40, Fraction(60) - Fraction(7, 3)),
    (140, 2242.8, 67.20, Fraction(70) - Fraction(7, 3)),
    (150, 2422.6, 67.52, Fraction(75) - Fraction(7, 3)),
    (200, 3322.0, 68.64, Fraction(100) - Fraction(7, 3)),
]


@pytest.mark.parametrize(("span", "moment", "shear", "x"), HS20_ROWS)
def test_hs20_simple_span_maxima(span, moment, shear, x):
    at_x, anywhere = _moment_at("HS20", span, x)
    assert abs(at_x - moment) <= HALF_UNIT_1DP
    assert anywhere <= at_x * (1 + REL_TOL_EXACT)  # no station beats the rule's position
    env = _envelope("HS20", span, 1)
    assert abs(env.v_max.value[0] - shear) <= HALF_UNIT_2DP


@pytest.mark.parametrize("span", [40, 50, 100, 200])
def test_hs20_closed_forms(span):
    # All three axles on the span (L >~ 33 ft): M_abs = 72 (L/2 - 7/3)^2 / L - 112 and
    # V_end = 72 - 672 / L (L >= 28 ft). Derived here by statics: resultant 4.667 ft behind the
    # middle axle; moments of the 8 kip axle about the middle one, 8 x 14 = 112.
    x = Fraction(span, 2) - Fraction(7, 3)
    at_x, _ = _moment_at("HS20", span, x)
    assert math.isclose(at_x, 72 * (span / 2 - 7 / 3) ** 2 / span - 112, rel_tol=REL_TOL_EXACT)
    env = _envelope("HS20", span, 1)
    assert math.isclose(env.v_max.value[0], 72 - 672 / span, rel_tol=REL_TOL_EXACT)


# H20-44, per lane, no impact: Khan, Bridge and Highway Structure Rehabilitation and
# Repair (McGraw-Hill, 2010), Table 6.7, p. 276 (seen), printed to two decimals. For
# 20-26 ft the table prints 147.92, 167.56, 187.27, 207.02: the two-axle formula
# 40 (L/2 - 1.4)^2 / L, which for 20-24 ft counts the 8 kip axle after it has left the
# span (it would stand at L/2 + 12.6), and at 26 ft is a real position but not the
# worst. The maximum there is one 32 kip axle at midspan, 32 L / 4, checked instead.
H20_ROWS = [
    (20, 160.00, 147.92, Fraction(10)),
    (22, 176.00, 167.56, Fraction(11)),
    (24, 192.00, 187.27, Fraction(12)),
    (26, 208.00, 207.02, Fraction(13)),
    (30, 246.61, None, Fraction(15) - Fraction(7, 5)),  # both axles: 32 kip at L/2 - 1.4
    (40, 345.96, None, Fraction(20) - Fraction(7, 5)),
    (55, 495.43, None, Fraction(55, 2) - Fraction(7, 5)),
]


@pytest.mark.parametrize(("span", "moment", "misprint", "x"), H20_ROWS)
def test_h20_simple_span_maxima(span, moment, misprint, x):
    at_x, anywhere = _moment_at("H20", span, x)
    assert abs(at_x - moment) <= HALF_UNIT_2DP
    assert anywhere <= at_x * (1 + REL_TOL_EXACT)
    if misprint is not None:
        assert at_x > misprint + HALF_UNIT_2DP  # the printed value is not the maximum


# HL-93, per lane, IM = 0.33 on truck and tandem only: computed by hand from closed
# forms derived here (truck 18L - 280 for L >= 28 ft, tandem 12.5L - 50, lane 0.08L^2
# at midspan; truck 72 - 672/L, tandem 50 - 100/L, lane 0.32L end shear).
# Columns: L, (LL+IM) M_mid, governing part, (LL+IM) V_end, governing part.
HL93_ROWS = [
    (20, 298.0, "tandem", 66.25, "tandem"),
    (35, 613.4, "tandem", 81.42, "truck"),
    (40, 726.5, "tandem", 86.22, "truck"),
    (60, 1352.0, "truck", 100.06, "truck"),
    (80, 2054.8, "truck", 110.19, "truck"),
    (100, 2821.6, "truck", 118.82, "truck"),
    (120, 3652.4, "truck", 126.71, "truck"),
    (150, 5018.6, "truck", 137.80, "truck"),
    (200, 7615.6, "truck", 155.29, "truck"),
]


@pytest.mark.parametrize(("span", "moment", "m_part", "shear", "v_part"), HL93_ROWS)
def test_hl93_simple_span_midspan_moment_and_end_shear(span, moment, m_part, shear, v_part):
    env = _envelope("HL-93", span, 2, impact=0.33)
    mid = 1  # stations 0, 1/2, 1
    assert abs(env.m_max.value[mid] - moment) <= HALF_UNIT_1DP
    assert env.labels[env.m_max.case[mid]] == f"HL-93 ({m_part} + lane)"
    assert abs(env.v_max.value[0] - shear) <= HALF_UNIT_2DP
    assert env.labels[env.v_max.case[0]] == f"HL-93 ({v_part} + lane)"
    # A simple span has no hogging and no interior support: the two-truck part never governs.
    assert (env.m_min.value == 0).all()
    assert "two trucks" not in " ".join(env.labels[c] for c in env.r_max.case)
