"""Engine against closed forms and published handbook values.

Sources (full references in docs/validation.md):

* statics of a simply supported beam: common practice;
* AISC Manual, "Beam Diagrams and Formulas", two equal spans, concentrated load
  at any point (as reproduced at piping-designer.com) and two equal spans with a
  load at the centre of each span (the same pages, and Lindeburg, *Civil
  Engineering Reference Manual* 15th ed., as reproduced at engineersedge.com);
* Karnovsky & Lebed, *Advanced Methods of Structural Analysis* (Springer 2010),
  Table A.13, two equal spans, ordinates to four decimals, and its worked example;
* Hicks, *Civil Engineering Formulas* (McGraw-Hill), Table 2.1, and the AISC
  beam diagrams as reproduced at piping-designer.com: continuous beams of equal
  spans under uniform load;
* the classical absolute-maximum-moment rule for a series of concentrated loads
  on a simple span (Hicks, *Civil Engineering Formulas*, moving concentrated
  loads; Kassimali, *Structural Analysis* 6th ed., solution to Problem 9.22):
  the span centreline lies midway between the resultant and the nearest heavy load;
* Khan, *Bridge and Highway Structure Rehabilitation and Repair* (McGraw-Hill
  2010), Table 6.7, p. 276: H20 truck maximum moments on simple spans;
* values computed by hand from first principles (statics, the three-moment
  equation), each with its formula beside the check.
"""

from __future__ import annotations

import numpy as np
import pytest
from numpy.typing import NDArray
from tolerances import REL_TOL_EXACT, TABLE_TOL_2DP, TABLE_TOL_4DP

from batch.engine.influence import InfluenceLines, influence_lines
from batch.engine.moving import axle_extremes
from batch.model import AxleTrain

#: HS20 truck (AASHTO Standard Specifications 3.7.4): axles front first (kip), spacings (ft).
HS20_LOADS = (8.0, 32.0, 32.0)
HS20_SPACING = (14.0, 14.0)
#: H20 truck (AASHTO Standard Specifications 3.7.4).
H20_LOADS = (8.0, 32.0)
H20_SPACING = (14.0,)


def _row_at_station(il: InfluenceLines, span: int, fraction: float) -> int:
    """Index of the station (span from 1, fraction of the span) in the station rows."""
    hit = np.flatnonzero(
        (il.station_span == span) & np.isclose(il.station_fraction, fraction, atol=1e-12)
    )
    assert hit.size == 1, (span, fraction)
    return int(hit[0])


def _moment(il: InfluenceLines, span: int, fraction: float, x: NDArray) -> NDArray:
    return il.evaluate(x)[il.moment_rows][_row_at_station(il, span, fraction)]


def _shear(il: InfluenceLines, span: int, fraction: float, x: NDArray, side: str) -> NDArray:
    return il.evaluate(x, side)[il.shear_rows][_row_at_station(il, span, fraction)]


def _reactions(il: InfluenceLines, x: NDArray) -> NDArray:
    return il.evaluate(x)[il.reaction_rows]


def _integral(il: InfluenceLines, row: int, a: float, b: float) -> float:
    """Exact integral of one influence line over [a, b] (a and b on breaks of the partition)."""
    lo = int(np.argmin(np.abs(il.breaks - a)))
    hi = int(np.argmin(np.abs(il.breaks - b)))
    h = np.diff(il.breaks)[lo:hi]
    c = il.coef[row, lo:hi]
    return float(np.sum(c[:, 0] * h + c[:, 1] * h**2 / 2 + c[:, 2] * h**3 / 3 + c[:, 3] * h**4 / 4))


# --- simple span: statics (common practice) -------------------------------------------


@pytest.mark.parametrize("length", [10.0, 37.5, 120.0])
def test_simple_span_influence_lines_are_the_statics_triangles(length: float) -> None:
    # Statics of a simply supported beam, unit load at x (common practice):
    # M_s(x) = x (L - s) / L for x <= s, s (L - x) / L for x >= s;
    # V_s(x) = -x / L left of the section, 1 - x / L right of it;
    # R_A = 1 - x / L, R_B = x / L.
    n = 8
    il = influence_lines([length], stations_per_span=n)
    x = np.linspace(0.0, length, 97)[1:-1] + 0.0123 * length / 97  # inside the pieces
    for k in range(n + 1):
        s = k * length / n
        expected_m = np.where(x <= s, x * (length - s) / length, s * (length - x) / length)
        np.testing.assert_allclose(
            _moment(il, 1, k / n, x), expected_m, rtol=0, atol=REL_TOL_EXACT * length
        )
        # Section just right of the station (just left at fraction 1): loads at x > s
        # (x >= s at fraction 1) are right of it.
        right_of = x > s if k < n else x >= s
        expected_v = np.where(right_of, 1.0 - x / length, -x / length)
        np.testing.assert_allclose(
            _shear(il, 1, k / n, x, "right"), expected_v, rtol=0, atol=REL_TOL_EXACT
        )
    r = _reactions(il, x)
    np.testing.assert_allclose(r[0], 1.0 - x / length, rtol=0, atol=REL_TOL_EXACT)
    np.testing.assert_allclose(r[1], x / length, rtol=0, atol=REL_TOL_EXACT)


def test_simple_span_shear_has_its_unit_jump_at_the_station() -> None:
    # Statics (common practice): V_s jumps from -s/L to 1 - s/L as the load crosses s.
    length, n = 48.0, 6
    il = influence_lines([length], stations_per_span=n)
    for k in range(1, n):
        s = k * length / n
        left = _shear(il, 1, k / n, np.array([s]), "left")[0]
        right = _shear(il, 1, k / n, np.array([s]), "right")[0]
        assert left == pytest.approx(-s / length, abs=REL_TOL_EXACT)
        assert right == pytest.approx(1.0 - s / length, abs=REL_TOL_EXACT)


def test_simple_span_lines_are_piecewise_linear() -> None:
    # A statically determinate member has piecewise-linear influence lines
    # (Muller-Breslau: the released structure moves as rigid bodies; common practice).
    il = influence_lines([73.0], stations_per_span=10)
    h = np.diff(il.breaks)
    curvature = np.abs(il.coef[..., 2]) * h**2 + np.abs(il.coef[..., 3]) * h**3
    assert np.all(curvature <= REL_TOL_EXACT * il.effect_scale[:, None])


# --- two equal spans, point load (AISC beam formulas) ----------------------------------


@pytest.mark.parametrize("k", range(1, 8))
def test_two_equal_spans_point_load_matches_aisc_formulas(k: int) -> None:
    # AISC Manual, Beam Diagrams and Formulas, "Continuous beam - two equal spans -
    # concentrated load at any point" (as reproduced at piping-designer.com): with b = L - a,
    # R_A = P b [4L^2 - a(L + a)] / (4L^3), R_B = P a [2L^2 + b(L + a)] / (2L^3),
    # R_C = -P a b (L + a) / (4L^3), M_B = -P a b (L + a) / (4L^2), M under load = R_A a.
    length, n = 30.0, 8
    il = influence_lines([length, length], stations_per_span=n)
    a = k * length / n
    b = length - a
    x = np.array([a])
    r = _reactions(il, x)[:, 0]
    scale = length**3
    assert r[0] == pytest.approx(b * (4 * length**2 - a * (length + a)) / (4 * scale), abs=1e-12)
    assert r[1] == pytest.approx(a * (2 * length**2 + b * (length + a)) / (2 * scale), abs=1e-12)
    assert r[2] == pytest.approx(-a * b * (length + a) / (4 * scale), abs=1e-12)
    m_b = -a * b * (length + a) / (4 * length**2)
    tol = REL_TOL_EXACT * 2 * length
    assert _moment(il, 1, 1.0, x)[0] == pytest.approx(m_b, abs=tol)
    assert _moment(il, 2, 0.0, x)[0] == pytest.approx(m_b, abs=tol)
    assert _moment(il, 1, k / n, x)[0] == pytest.approx(r[0] * a, abs=tol)
    # The same load in span 2, mirrored: R_C and R_A swap (symmetry of the member).
    mirrored = _reactions(il, np.array([2 * length - a]))[:, 0]
    np.testing.assert_allclose(mirrored, r[::-1], rtol=0, atol=1e-12)


def test_two_equal_spans_load_at_midspan() -> None:
    # AISC beam diagrams (piping-designer.com), checked by hand: a = L/2 gives
    # R_A = 13P/32, R_B = 11P/16, R_C = -3P/32, M_B = -3PL/32, M under the load 13PL/64.
    length = 40.0
    il = influence_lines([length, length], stations_per_span=2)
    x = np.array([length / 2])
    np.testing.assert_allclose(
        _reactions(il, x)[:, 0], [13 / 32, 11 / 16, -3 / 32], rtol=0, atol=REL_TOL_EXACT
    )
    tol = REL_TOL_EXACT * 2 * length
    assert _moment(il, 1, 1.0, x)[0] == pytest.approx(-3 * length / 32, abs=tol)
    assert _moment(il, 1, 0.5, x)[0] == pytest.approx(13 * length / 64, abs=tol)


def test_two_equal_spans_loads_at_both_midspans() -> None:
    # AISC beam diagrams (piping-designer.com); Lindeburg, CERM 15th ed. (as reproduced
    # at engineersedge.com): P at the centre of both spans gives
    # R_A = R_C = 5P/16, R_B = 11P/8, M_B = -3PL/16, M under each load 5PL/32.
    length = 25.0
    il = influence_lines([length, length], stations_per_span=2)
    both = il.evaluate(np.array([length / 2, 1.5 * length])).sum(axis=1)
    np.testing.assert_allclose(
        both[il.reaction_rows], [5 / 16, 11 / 8, 5 / 16], rtol=0, atol=REL_TOL_EXACT
    )
    m = both[il.moment_rows]
    tol = REL_TOL_EXACT * 2 * length
    assert m[_row_at_station(il, 1, 1.0)] == pytest.approx(-3 * length / 16, abs=tol)
    assert m[_row_at_station(il, 1, 0.5)] == pytest.approx(5 * length / 32, abs=tol)
    assert m[_row_at_station(il, 2, 0.5)] == pytest.approx(5 * length / 32, abs=tol)


def test_two_equal_spans_center_moment_minimum() -> None:
    # Two-span influence line, computed by hand from the three-moment equation:
    # M_B(x) = -x (L^2 - x^2) / (4 L^2) in span 1, least -L / (6 sqrt 3) at L/sqrt 3.
    length = 60.0
    il = influence_lines([length, length], stations_per_span=4)
    x = np.linspace(0.0, length, 61) + 0.37
    x = x[x < length]
    expected = -x * (length**2 - x**2) / (4 * length**2)
    np.testing.assert_allclose(
        _moment(il, 1, 1.0, x), expected, rtol=0, atol=REL_TOL_EXACT * 2 * length
    )
    ax = axle_extremes(il, AxleTrain.of([1.0]))
    row = _row_at_station(il, 1, 1.0)
    assert ax.min_value[row] == pytest.approx(-length / (6 * np.sqrt(3)), abs=1e-9 * length)
    assert ax.min_position[row] in (
        pytest.approx(length / np.sqrt(3), abs=1e-6),
        pytest.approx(2 * length - length / np.sqrt(3), abs=1e-6),
    )


# Karnovsky & Lebed (2010), Table A.13: two equal spans, unit load at x/L = 1/6 ... 5/6.
KARNOVSKY_X = (1 / 6, 2 / 6, 3 / 6, 4 / 6, 5 / 6)
KARNOVSKY_MB = (-0.0405, -0.0740, -0.0938, -0.0926, -0.0636)  # times L
KARNOVSKY_RA = (0.7928, 0.5927, 0.4062, 0.2407, 0.1031)


@pytest.mark.parametrize(
    ("xi", "m_b", "r_a"), list(zip(KARNOVSKY_X, KARNOVSKY_MB, KARNOVSKY_RA, strict=True))
)
def test_two_span_ordinates_match_karnovsky_lebed_table_a13(
    xi: float, m_b: float, r_a: float
) -> None:
    # Karnovsky & Lebed, Advanced Methods of Structural Analysis (Springer 2010), Table A.13.
    length = 18.0
    il = influence_lines([length, length], stations_per_span=6)
    x = np.array([xi * length])
    assert _moment(il, 1, 1.0, x)[0] / length == pytest.approx(m_b, abs=TABLE_TOL_4DP)
    assert _reactions(il, x)[0, 0] == pytest.approx(r_a, abs=TABLE_TOL_4DP)


def test_karnovsky_lebed_worked_example_load_in_second_span() -> None:
    # Karnovsky & Lebed (2010), worked example with Table A.13: P at L/3 into span 2 gives
    # R_A = -0.0926P, R_B = 0.8519P, R_C = 0.2407P, M_B = -0.0926PL.
    length = 12.0
    il = influence_lines([length, length], stations_per_span=3)
    x = np.array([length + length / 3])
    np.testing.assert_allclose(
        _reactions(il, x)[:, 0], [-0.0926, 0.8519, 0.2407], rtol=0, atol=TABLE_TOL_4DP
    )
    assert _moment(il, 2, 0.0, x)[0] / length == pytest.approx(-0.0926, abs=TABLE_TOL_4DP)


# --- uniform load: exact areas of the influence lines ----------------------------------


def test_two_spans_uniform_load() -> None:
    # Both spans loaded (Hicks, Civil Engineering Formulas, Table 2.1): R_A = 3wL/8,
    # R_B = 5wL/4, M_B = -wL^2/8, +M max = 9wL^2/128 at 3L/8.
    # One span loaded (computed by hand: three-moment equation):
    # R_A = 7wL/16, R_B = 5wL/8, R_C = -wL/16, M_B = -wL^2/16.
    length = 32.0
    il = influence_lines([length, length], stations_per_span=8)
    positive, negative = il.areas()
    full = positive + negative
    r = il.reaction_rows
    np.testing.assert_allclose(
        full[r], [3 * length / 8, 5 * length / 4, 3 * length / 8], rtol=REL_TOL_EXACT
    )
    b = _row_at_station(il, 1, 1.0)
    assert full[b] == pytest.approx(-(length**2) / 8, rel=REL_TOL_EXACT)
    assert full[_row_at_station(il, 1, 3 / 8)] == pytest.approx(
        9 * length**2 / 128, rel=REL_TOL_EXACT
    )
    # R_C is negative exactly over span 1, so its adverse (negative) area is span 1 loaded.
    assert negative[r][2] == pytest.approx(-length / 16, rel=REL_TOL_EXACT)
    one = [_integral(il, row, 0.0, length) for row in range(il.n_effects)]
    assert one[r.start] == pytest.approx(7 * length / 16, rel=REL_TOL_EXACT)
    assert one[r.start + 1] == pytest.approx(5 * length / 8, rel=REL_TOL_EXACT)
    assert one[b] == pytest.approx(-(length**2) / 16, rel=REL_TOL_EXACT)


def test_three_equal_spans_uniform_load() -> None:
    # All spans loaded (AISC beam diagrams, piping-designer.com; Hicks Table 2.1): end reaction
    # 0.400wL, interior 1.100wL, M_B = -0.100wL^2, end-span +0.080wL^2 at 0.4L,
    # centre +0.025wL^2.
    # Adverse parts only (computed by hand: three-moment equation; R_B for spans 1+2
    # also in the AISC beam diagrams, piping-designer.com):
    # centre moment: spans 1+3 loaded -0.050wL^2, span 2 only +0.075wL^2;
    # M_B: spans 1+2 loaded -7/60 wL^2, R_B: spans 1+2 loaded 1.200wL.
    length = 45.0
    il = influence_lines([length] * 3, stations_per_span=10)
    positive, negative = il.areas()
    full = positive + negative
    r = full[il.reaction_rows] / length
    np.testing.assert_allclose(r, [0.4, 1.1, 1.1, 0.4], rtol=REL_TOL_EXACT)
    w_l2 = length**2
    b = _row_at_station(il, 1, 1.0)
    assert full[b] / w_l2 == pytest.approx(-0.100, rel=REL_TOL_EXACT)
    assert full[_row_at_station(il, 1, 0.4)] / w_l2 == pytest.approx(0.080, rel=REL_TOL_EXACT)
    centre = _row_at_station(il, 2, 0.5)
    assert full[centre] / w_l2 == pytest.approx(0.025, rel=REL_TOL_EXACT)
    assert negative[centre] / w_l2 == pytest.approx(-0.050, rel=REL_TOL_EXACT)
    assert positive[centre] / w_l2 == pytest.approx(0.075, rel=REL_TOL_EXACT)
    assert negative[b] / w_l2 == pytest.approx(-7 / 60, rel=REL_TOL_EXACT)
    r_b = il.reaction_rows.start + 1
    assert positive[r_b] / length == pytest.approx(1.2, rel=REL_TOL_EXACT)


# --- moving loads on simple spans: the classical rules ----------------------------------

# (L, n, k): station k of n lies at L/2 + 7/3, where the absolute-maximum rule puts the
# HS20 middle axle (resultant 7/3 * 2 = 4.667 ft behind it).
HS20_RULE_STATIONS = [(42.0, 9, 5), (56.0, 24, 13), (70.0, 15, 8), (98.0, 21, 11), (126.0, 27, 14)]


@pytest.mark.parametrize(("length", "n", "k"), HS20_RULE_STATIONS)
def test_hs20_absolute_maximum_moment_rule(length: float, n: int, k: int) -> None:
    # Absolute maximum moment under a series of loads on a simple span (Hicks, Civil
    # Engineering Formulas; Kassimali, Structural Analysis 6th ed., Problem 9.22): the
    # centreline bisects the distance between the resultant and the nearest heavy load.
    # HS20 (8, 32, 32 kip at 14 ft): M = 72 (L/2 - 7/3)^2 / L - 112 kip-ft under the
    # middle axle at L/2 + 7/3 (closed form derived here by statics, L >= 34 ft).
    expected = 72 * (length / 2 - 7 / 3) ** 2 / length - 112
    il = influence_lines([length], stations_per_span=n)
    assert il.station_x[k] == pytest.approx(length / 2 + 7 / 3, abs=1e-12)
    ax = axle_extremes(il, AxleTrain.of(HS20_LOADS, HS20_SPACING))
    m_max = ax.max_value[il.moment_rows]
    assert m_max[k] == pytest.approx(expected, rel=REL_TOL_EXACT)
    # Where: the middle axle on the station, the 8 kip axle ahead of it.
    ahead = il.station_x[k] + ax.max_direction[k] * HS20_SPACING[0]
    assert ax.max_position[k] == pytest.approx(ahead, abs=1e-9 * length)
    # The mirror station (travel the other way) gives the same value.
    assert m_max[n - k] == pytest.approx(expected, rel=REL_TOL_EXACT)
    # No station anywhere beats the rule's absolute maximum.
    fine = influence_lines([length], stations_per_span=240)
    fine_max = axle_extremes(fine, AxleTrain.of(HS20_LOADS, HS20_SPACING)).max_value[
        fine.moment_rows
    ]
    assert fine_max.max() <= expected * (1 + REL_TOL_EXACT)


def test_hs20_at_100_ft_matches_the_published_table_value() -> None:
    # HS20 M_abs at 100 ft = 1523.9 kip-ft (computed by hand: the closed form above);
    # AASHTO Standard Specifications Appendix A lists 1,524.0 (from memory). The rule's station at
    # L/2 + 7/3 = 52.333 ft is station 157 of 300.
    il = influence_lines([100.0], stations_per_span=300)
    m_max = axle_extremes(il, AxleTrain.of(HS20_LOADS, HS20_SPACING)).max_value[il.moment_rows]
    assert m_max.max() == pytest.approx(1523.92, abs=0.01)
    assert m_max[157] == pytest.approx(m_max.max(), rel=REL_TOL_EXACT)


def test_hs20_variable_rear_spacing_governs_at_14_ft_on_simple_spans() -> None:
    # HS20 rear spacing V = 14-30 ft, "the V that gives the maximum" (AASHTO Std Spec
    # 3.7.6, seen in a structural engineers' mailing-list post, SEAINT archive 2000); on
    # simple spans it is 14 ft for moments and shears (SEAINT archive, 1999).
    length = 70.0
    il = influence_lines([length], stations_per_span=15)
    fixed = axle_extremes(il, AxleTrain.of(HS20_LOADS, HS20_SPACING))
    ranged = axle_extremes(il, AxleTrain.of(HS20_LOADS, (14.0, 14.0), (14.0, 30.0)))
    np.testing.assert_allclose(ranged.max_value, fixed.max_value, rtol=REL_TOL_EXACT, atol=1e-9)
    np.testing.assert_allclose(ranged.min_value, fixed.min_value, rtol=REL_TOL_EXACT, atol=1e-9)
    assert ranged.max_spacing[8, 1] == pytest.approx(14.0)


@pytest.mark.parametrize(
    ("length", "published"),
    [(28.0, None), (40.0, 55.20), (60.0, 60.80), (100.0, 65.28), (150.0, 67.52)],
)
def test_hs20_end_shear(length: float, published: float | None) -> None:
    # End shear of a simple span with the heavy end at the support (Kassimali, Structural
    # Analysis 6th ed., Problem 9.18; Gere, Problem 4.5-30): HS20 V = R = 72 - 672/L for
    # L >= 28 ft (closed form derived here by statics). The two-decimal values listed
    # above were computed by hand from it, as a printed table would give them.
    expected = 72 - 672 / length
    il = influence_lines([length], stations_per_span=4)
    ax = axle_extremes(il, AxleTrain.of(HS20_LOADS, HS20_SPACING))
    assert ax.max_value[il.shear_rows][0] == pytest.approx(expected, rel=REL_TOL_EXACT)
    assert ax.max_value[il.reaction_rows][0] == pytest.approx(expected, rel=REL_TOL_EXACT)
    assert ax.min_value[il.shear_rows][-1] == pytest.approx(-expected, rel=REL_TOL_EXACT)
    assert ax.max_value[il.reaction_rows][1] == pytest.approx(expected, rel=REL_TOL_EXACT)
    if published is not None:
        assert expected == pytest.approx(published, abs=TABLE_TOL_2DP)


@pytest.mark.parametrize(
    ("length", "n", "k", "published"), [(30.0, 75, 41, 246.61), (40.0, 200, 107, 345.96)]
)
def test_h20_absolute_maximum_matches_khan_table(
    length: float, n: int, k: int, published: float
) -> None:
    # Khan (2010), Table 6.7, p. 276: H20 truck maximum moment, one lane, no impact.
    # The absolute-maximum rule puts the 32 kip axle at L/2 + 1.4 ft (resultant 2.8 ft
    # ahead of it): M = 40 (L/2 - 1.4)^2 / L, which is station k of n.
    il = influence_lines([length], stations_per_span=n)
    assert il.station_x[k] == pytest.approx(length / 2 + 1.4, abs=1e-12)
    m_max = axle_extremes(il, AxleTrain.of(H20_LOADS, H20_SPACING)).max_value[il.moment_rows]
    assert m_max[k] == pytest.approx(40 * (length / 2 - 1.4) ** 2 / length, rel=REL_TOL_EXACT)
    assert m_max.max() == pytest.approx(published, abs=TABLE_TOL_2DP)


@pytest.mark.parametrize("length", [20.0, 22.0, 24.0, 26.0])
def test_h20_short_spans_drop_the_axle_that_left_the_span(length: float) -> None:
    # Computed by hand (statics): below 28 ft the H20 maximum is one 32 kip axle at midspan,
    # 8L kip-ft (160, 176, 192, 208); a table that keeps the 8 kip axle after it has
    # left the span lists 147.92, 167.56, 187.27, 207.02 (Khan 2010, Table 6.7).
    il = influence_lines([length], stations_per_span=40)
    m_max = axle_extremes(il, AxleTrain.of(H20_LOADS, H20_SPACING)).max_value[il.moment_rows]
    assert m_max[20] == pytest.approx(8 * length, rel=REL_TOL_EXACT)
    assert m_max.max() == pytest.approx(8 * length, rel=REL_TOL_EXACT)


def test_hs20_on_30_ft_span_drops_the_front_axle() -> None:
    # Computed by hand (statics): at 30 ft the 8 kip axle is off the span; the two 32 kip
    # axles give 64 (15 - 3.5)^2 / 30 = 282.13 kip-ft, under an axle at L/2 + 3.5 ft
    # (station 37 of 60).
    il = influence_lines([30.0], stations_per_span=60)
    m_max = axle_extremes(il, AxleTrain.of(HS20_LOADS, HS20_SPACING)).max_value[il.moment_rows]
    assert m_max[37] == pytest.approx(64 * 11.5**2 / 30, rel=REL_TOL_EXACT)
    assert m_max.max() == pytest.approx(m_max[37], rel=REL_TOL_EXACT)


def test_hinge_at_a_station_gives_the_statics_of_the_suspended_part() -> None:
    # Statics of a determinate girder (common practice): two 20.2 ft spans, hinge at
    # 35.35 ft (the 3/4 point of span 2, where a station falls). The part right of the
    # hinge rests on the hinge and support C, so R_C(x) = (x - 35.35) / (40.4 - 35.35).
    il = influence_lines([20.2, 20.2], hinges=[35.35], stations_per_span=4)
    x = np.linspace(35.35, 40.4, 11)
    r_c = il.evaluate(x)[il.reaction_rows][2]
    np.testing.assert_allclose(r_c, (x - 35.35) / (40.4 - 35.35), rtol=0, atol=REL_TOL_EXACT)
    assert axle_extremes(il, AxleTrain.of([1.0])).max_value[il.reaction_rows][2] == pytest.approx(
        1.0
    )
