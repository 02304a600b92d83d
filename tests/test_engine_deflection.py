"""Live-load deflection: influence lines of deflection and the deflection envelope.

Sources, check by check:

* a simple span under a point load at mid-span: deflection P x (3L^2 - 4x^2)/(48 EI)
  for x <= L/2, PL^3/(48 EI) under the load (the standard beam formula, e.g.
  piping-designer.com "Simple Beam - Concentrated Load at Center");
* two equal spans under a uniform load on both: w (L^3 x - 3 L x^3 + 2 x^4)/(48 EI)
  in either span, largest 0.00541 wL^4/EI at 0.4215 L (Lindeburg, Civil
  Engineering Reference Manual, 15th ed., as tabulated by engineersedge.com,
  "Continuous beam of two equal spans - uniformly distributed load");
* Maxwell's reciprocal theorem (any structural analysis text): the deflection at
  a due to a unit load at b equals that at b due to a unit load at a;
* the independent finite-element library PyNiteFEA, for a stepped, hinged member;
* the deflection envelope of a simple span against a brute-force search over truck
  positions and rear spacings with the closed form above (superposition), with the
  deflection loading of AASHTO LRFD 3.6.1.3.2 (from memory: the design truck alone,
  or 25 % of it with the lane load; the lane load's own deflection 5wL^4/(384 EI),
  the same beam formula tables);
* exact unit conversion (1 ft = 0.3048 m, 1 kip = 4.4482216152605 kN): the same
  bridge in SI deflects the same, in mm.

Tolerance: 1e-9 of L^3/EI for exact lines; 1e-6 for searches stepped at 0.01 ft.
"""

from __future__ import annotations

import numpy as np
import pytest

from batch.engine.deflection import member_deflection
from batch.engine.influence import influence_lines
from batch.model import Analysis, Member, Segment, Settings
from batch.model.units import KN_PER_KIP, M_PER_FT

REL_TOL_EXACT = 1e-9
REL_TOL_SEARCH = 1e-6


def test_simple_span_point_load_at_mid_span() -> None:
    span = 40.0
    il = influence_lines([span], stations_per_span=8, deflection=True)
    got = il.evaluate(np.array([span / 2]))[il.deflection_rows][:, 0]
    x = np.minimum(il.station_x, span - il.station_x)
    expected = x * (3 * span**2 - 4 * x**2) / 48.0
    np.testing.assert_allclose(got, expected, rtol=0, atol=REL_TOL_EXACT * span**3)
    assert got[4] == pytest.approx(span**3 / 48.0, rel=REL_TOL_EXACT)


def test_two_equal_spans_uniform_load_on_both() -> None:
    span, w = 50.0, 1.0
    il = influence_lines([span, span], stations_per_span=10, deflection=True)
    positive, negative = il.areas()
    got = w * (positive + negative)[il.deflection_rows]
    x = np.where(il.station_span == 1, il.station_x, 2 * span - il.station_x)
    expected = w * (span**3 * x - 3 * span * x**3 + 2 * x**4) / 48.0
    np.testing.assert_allclose(got, expected, rtol=0, atol=REL_TOL_EXACT * span**4)
    # The table's largest deflection, 0.00541 wL^4/EI at 0.4215 L, at a station added
    # there: 0.005416, which the table prints cut to three digits.
    there = influence_lines(
        [span, span], stations_per_span=10, sections=[(1, 0.4215 * span)], deflection=True
    )
    p, n = there.areas()
    row = there.station_index((1, 0.4215 * span))
    assert row is not None
    top = w * (p + n)[there.deflection_rows][row]
    assert 0.00541 <= top / (w * span**4) < 0.00542


MEMBER = Member(
    id="KV-T2",
    spans=(40.0, 90.0, 40.0),
    span_ei=(1.0, 1.3, 0.9),
    hinges=(110.0,),
    segments=(Segment(member="KV-T2", start=30.0, end=52.0, ei=1.8),),
)


def _lines():
    return influence_lines(
        MEMBER.spans,
        MEMBER.span_ei,
        MEMBER.hinges,
        stations_per_span=6,
        pieces=MEMBER.stiffness_pieces,
        deflection=True,
    )


def test_deflection_lines_are_reciprocal_maxwell() -> None:
    il = _lines()
    table = il.evaluate(il.station_x)[il.deflection_rows]  # [a, b]: at station a, load at b
    np.testing.assert_allclose(table, table.T, rtol=0, atol=REL_TOL_EXACT * il.deflection_scale)


def test_deflection_lines_match_the_fe_library() -> None:
    pynite = pytest.importorskip("Pynite")
    il = _lines()
    supports = il.support_x
    for load_x in (17.3, 61.0, 100.0, 140.2):
        points = np.unique(np.concatenate([il.nodes, il.station_x, [load_x]]))
        model = pynite.FEModel3D()
        model.add_material("unit", 1.0, 1.0, 0.3, 0.0)
        for i, x in enumerate(points):
            model.add_node(f"N{i}", float(x), 0.0, 0.0)
            model.def_support(
                f"N{i}",
                support_DX=i == 0,
                support_DY=bool(np.any(np.abs(supports - x) < 1e-9)),
                support_DZ=True,
                support_RX=True,
                support_RY=True,
            )
        for i in range(points.size - 1):
            mid = 0.5 * (points[i] + points[i + 1])
            ei = next(
                (v for a, b, v in MEMBER.stiffness_pieces if a < mid < b),
                MEMBER.span_ei[int(np.searchsorted(supports, mid)) - 1],
            )
            model.add_section(f"S{i}", 1.0, 1.0, float(ei), 1.0)
            model.add_member(f"E{i}", f"N{i}", f"N{i + 1}", "unit", f"S{i}")
            if np.any(np.abs(np.asarray(MEMBER.hinges) - points[i + 1]) < 1e-9):
                model.def_releases(f"E{i}", Rzj=True)
        model.add_node_load(f"N{int(np.argmin(np.abs(points - load_x)))}", "FY", -1.0)
        model.analyze_linear(check_statics=False)
        at = [int(np.argmin(np.abs(points - x))) for x in il.station_x]
        fe = np.array([-model.nodes[f"N{i}"].DY["Combo 1"] for i in at])  # downward +
        got = il.evaluate(np.array([load_x]))[il.deflection_rows][:, 0]
        np.testing.assert_allclose(got, fe, rtol=0, atol=REL_TOL_EXACT * il.deflection_scale)


# --- the envelope under the deflection loading ------------------------------------------

SPAN = 100.0  # ft
EI = 29000.0 * 120000.0  # kip-in2: E 29,000 ksi, I 120,000 in4 (an invented girder)
IMPACT = 0.33
DF = 0.55


def _midspan(a: np.ndarray, loads: tuple[float, ...], offsets: np.ndarray) -> np.ndarray:
    """Mid-span deflection (ft, EI in kip-ft2) of axles with the front one at ``a``."""
    ei_ft = EI / 144.0
    total = np.zeros_like(a)
    for p, d in zip(loads, offsets, strict=True):
        b = a - d
        x = np.minimum(b, SPAN - b)  # load's distance from its nearer end
        on = (b >= 0) & (b <= SPAN)
        # By Maxwell: the deflection at mid-span from P at b is that at b from P at mid-span.
        total += np.where(on, p * x * (3 * SPAN**2 - 4 * x**2) / (48 * ei_ft), 0.0)
    return total


def test_simple_span_envelope_against_a_brute_force_search() -> None:
    member = Member(
        id="KV-0412 G1",
        spans=(SPAN,),
        analysis=Analysis(member="KV-0412 G1", ei_scale=EI, df_deflection=DF),
    )
    result = member_deflection(member, Settings(stations_per_span=10, impact=IMPACT))
    assert result is not None
    truck = (8.0, 32.0, 32.0)
    a = np.arange(0.0, SPAN + 60.0, 0.01)
    best = 0.0
    for rear in np.arange(14.0, 30.01, 0.5):
        offsets = np.array([0.0, 14.0, 14.0 + rear])
        best = max(best, float(_midspan(a, truck, offsets).max()))
    lane = 5 * 0.64 * SPAN**4 / (384 * EI / 144.0)
    truck_alone = (1 + IMPACT) * best
    quarter = 0.25 * (1 + IMPACT) * best + lane
    expected = DF * max(truck_alone, quarter) * 12.0  # in
    assert result.down.value[5] == pytest.approx(expected, rel=REL_TOL_SEARCH)
    governs = "design truck" if truck_alone >= quarter else "25 % truck + lane"
    assert governs in result.labels[int(result.down.case[5])]
    assert result.span_ratio[0] == pytest.approx(SPAN * 12.0 / expected, rel=REL_TOL_SEARCH)
    assert bool(result.passes[0]) == (SPAN * 12.0 / expected >= 800.0)
    assert result.up.value.max() == 0.0  # a simple span never deflects upward


def test_the_same_bridge_in_si_deflects_the_same() -> None:
    us = Member(
        id="A",
        spans=(70.0, 90.0),
        span_ei=(1.0, 1.2),
        analysis=Analysis(member="A", ei_scale=EI, df_deflection=DF),
    )
    si = Member(
        id="A",
        spans=(70.0 * M_PER_FT, 90.0 * M_PER_FT),
        span_ei=(1.0, 1.2),
        analysis=Analysis(
            member="A", ei_scale=EI * KN_PER_KIP * (0.0254**2), df_deflection=DF
        ),  # kip-in2 to kN-m2
    )
    a = member_deflection(us, Settings(units="US", impact=IMPACT))
    b = member_deflection(si, Settings(units="SI", impact=IMPACT))
    assert a is not None and b is not None
    np.testing.assert_allclose(b.down.value, a.down.value * 25.4, rtol=1e-9, atol=1e-12)
    np.testing.assert_allclose(b.up.value, a.up.value * 25.4, rtol=1e-9, atol=1e-12)
    np.testing.assert_allclose(b.span_ratio, a.span_ratio, rtol=1e-9)


def test_no_ei_scale_no_deflection() -> None:
    assert member_deflection(Member(id="A", spans=(50.0,)), Settings()) is None
