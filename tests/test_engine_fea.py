"""Engine influence lines against an independent finite-element library (PyNiteFEA).

PyNite (``pip install PyNiteFEA``, imported as ``Pynite``) is a general 3D frame
solver. Each member is modelled as a chain of frame elements with a node at every
support, hinge, station and load position, so its answers at nodes are exact for
Euler-Bernoulli beams; a hinge is a moment release at the end of the element left
of it. The library is first checked on cases with hand answers (statics and the
AISC two-span formulas) before it is trusted.

PyNite's own signs: global Y up, so a downward unit load is FY = -1 and RxnFY is
upward; its member moment Mz is negative for sagging and its shear Fy equals
the sum of the upward forces left of the section. Hence M = -Mz, V = Fy.

Tolerance: 1e-9 of the effect's natural size (member length L for moments, 1 for
shears and reactions).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pytest
from numpy.typing import NDArray
from tolerances import REL_TOL_EXACT, REL_TOL_LIBRARY

from batch.engine.influence import InfluenceLines, influence_lines
from batch.model.layout import mechanism_parts

Pynite = pytest.importorskip("Pynite")

#: Two positions closer than this (length units) are the same node.
SAME_NODE = 1e-9


@dataclass(frozen=True)
class Layout:
    """One member: spans, relative EI per span, hinges, stations per span."""

    spans: tuple[float, ...]
    span_ei: tuple[float, ...]
    hinges: tuple[float, ...] = ()
    stations_per_span: int = 10

    @property
    def supports(self) -> NDArray[np.float64]:
        return np.concatenate([[0.0], np.cumsum(self.spans)])

    def lines(self) -> InfluenceLines:
        return influence_lines(self.spans, self.span_ei, self.hinges, self.stations_per_span)


@dataclass(frozen=True)
class FeResults:
    """Effects at every station and support for one unit load (or imposed displacement)."""

    moment: NDArray[np.float64]  # per station, sagging positive
    shear: NDArray[np.float64]  # per station, section as in docs/workbook.md
    reaction: NDArray[np.float64]  # per support, upward positive
    deflection: NDArray[np.float64]  # per model node, upward positive
    node_x: NDArray[np.float64]


def _fe_solve(
    layout: Layout,
    station_x: NDArray[np.float64],
    station_fraction: NDArray[np.float64],
    extra_x: NDArray[np.float64],
    load_x: float | None = None,
    settle_support: int | None = None,
) -> FeResults:
    """PyNite analysis of the member with a unit downward load at ``load_x``, or a unit
    upward displacement of support ``settle_support`` (others held)."""
    supports = layout.supports
    points = np.concatenate(
        [supports, layout.hinges, station_x, extra_x, [] if load_x is None else [load_x]]
    )
    points = np.sort(points)
    xs = points[np.concatenate([[True], np.diff(points) > SAME_NODE])]
    model = Pynite.FEModel3D()
    model.add_material("unit", 1.0, 1.0, 0.3, 0.0)
    names = []
    for i, x in enumerate(xs):
        name = f"N{i}"
        model.add_node(name, float(x), 0.0, 0.0)
        on_support = bool(np.any(np.abs(supports - x) <= SAME_NODE))
        model.def_support(
            name,
            support_DX=i == 0,
            support_DY=on_support,
            support_DZ=True,
            support_RX=True,
            support_RY=True,
        )
        names.append(name)
    for i in range(xs.size - 1):
        mid = 0.5 * (xs[i] + xs[i + 1])
        span = int(np.searchsorted(supports, mid)) - 1
        model.add_section(f"S{i}", 1.0, 1.0, float(layout.span_ei[span]), 1.0)
        model.add_member(f"E{i}", names[i], names[i + 1], "unit", f"S{i}")
        if np.any(np.abs(np.asarray(layout.hinges) - xs[i + 1]) <= SAME_NODE):
            model.def_releases(f"E{i}", Rzj=True)
    if load_x is not None:
        at = int(np.argmin(np.abs(xs - load_x)))
        model.add_node_load(names[at], "FY", -1.0)
    if settle_support is not None:
        at = int(np.argmin(np.abs(xs - supports[settle_support])))
        model.def_node_disp(names[at], "DY", 1.0)
        # A model without loads still needs a load case to be analysed.
        model.add_node_load(names[0], "FY", 0.0)
    model.analyze_linear(check_statics=False)

    def element(x: float, ending: bool) -> tuple[object, float]:
        i = int(np.argmin(np.abs(xs - x)))
        if ending:
            return model.members[f"E{i - 1}"], float(xs[i] - xs[i - 1])
        return model.members[f"E{i}"], 0.0

    moment, shear = [], []
    for x, frac in zip(station_x, station_fraction, strict=True):
        ending = frac == 1.0  # section just left of the station
        member, at = element(float(x), ending)
        moment.append(-member.moment("Mz", at))
        shear.append(member.shear("Fy", at))
    reaction = [
        model.nodes[names[int(np.argmin(np.abs(xs - s)))]].RxnFY["Combo 1"] for s in supports
    ]
    deflection = [model.nodes[n].DY["Combo 1"] for n in names]
    return FeResults(
        moment=np.array(moment),
        shear=np.array(shear),
        reaction=np.array(reaction),
        deflection=np.array(deflection),
        node_x=xs,
    )


# --- the library itself against hand answers -------------------------------------------


def test_library_two_equal_spans_matches_aisc_formulas() -> None:
    # AISC Manual, Beam Diagrams and Formulas (two-span case), as reproduced at
    # piping-designer.com: P at L/2 of span 1 of two equal spans gives
    # R = 13P/32, 11P/16, -3P/32 and M_B = -3PL/32; M under the load = 13PL/64.
    length = 20.0
    layout = Layout(spans=(length, length), span_ei=(1.0, 1.0), stations_per_span=2)
    x = np.array([0.0, length / 2, length, length, 1.5 * length, 2 * length])
    frac = np.array([0.0, 0.5, 1.0, 0.0, 0.5, 1.0])
    fe = _fe_solve(layout, x, frac, np.empty(0), load_x=length / 2)
    np.testing.assert_allclose(fe.reaction, [13 / 32, 11 / 16, -3 / 32], atol=REL_TOL_LIBRARY)
    tol = REL_TOL_LIBRARY * length
    assert fe.moment[2] == pytest.approx(-3 * length / 32, abs=tol)
    assert fe.moment[1] == pytest.approx(13 * length / 64, abs=tol)
    # Shear just left of B = R_A - P; just right of B = R_A + R_B - P (statics).
    assert fe.shear[2] == pytest.approx(13 / 32 - 1, abs=REL_TOL_LIBRARY)
    assert fe.shear[3] == pytest.approx(13 / 32 + 11 / 16 - 1, abs=REL_TOL_LIBRARY)


def test_library_cantilever_suspended_span_matches_statics() -> None:
    # Statics of a determinate cantilever-and-suspended-span girder (common practice):
    # spans 50, 120, 50 with hinges at 80 and 140; a unit load at 110 (middle of the
    # 60 ft suspended span) puts 0.5 on each cantilever tip (30 ft arms), so
    # R = -0.3, 0.8, 0.8, -0.3; M at the interior supports -15; M at 110 = 60/4 = 15.
    layout = Layout(spans=(50.0, 120.0, 50.0), span_ei=(1.0, 1.0, 1.0), hinges=(80.0, 140.0))
    x = np.array([50.0, 80.0, 110.0, 170.0])
    frac = np.array([1.0, 0.25, 0.5, 1.0])
    fe = _fe_solve(layout, x, frac, np.empty(0), load_x=110.0)
    np.testing.assert_allclose(fe.reaction, [-0.3, 0.8, 0.8, -0.3], atol=REL_TOL_LIBRARY)
    np.testing.assert_allclose(fe.moment, [-15.0, 0.0, 15.0, -15.0], atol=REL_TOL_LIBRARY * 220)


# --- the engine against the library -------------------------------------------------------

LAYOUTS = {
    "three spans, unequal spans and EI": Layout(spans=(50.0, 70.0, 55.0), span_ei=(1.0, 1.6, 0.8)),
    "three spans, one hinge": Layout(
        spans=(40.0, 90.0, 40.0), span_ei=(1.0, 1.3, 0.9), hinges=(110.0,)
    ),
    "cantilever and suspended span": Layout(
        spans=(50.0, 120.0, 50.0),
        span_ei=(1.0, 1.0, 1.0),
        hinges=(80.0, 140.0),
        stations_per_span=8,
    ),
    "four spans, hinge, unequal EI": Layout(
        spans=(36.0, 64.0, 64.0, 36.0), span_ei=(0.7, 1.2, 1.5, 0.6), hinges=(150.0,)
    ),
}

#: Load positions as fractions of each span: on supports, on a station, and inside
#: pieces (kept at least about a foot from any station: a very short element next to
#: a long one makes the FE stiffness matrix ill-conditioned, and the library loses digits).
LOAD_SPAN_FRACTIONS = (0.0, 0.137, 0.4427, 0.5, 0.7371)


def _load_positions(layout: Layout) -> NDArray[np.float64]:
    """LOAD_SPAN_FRACTIONS of every span, plus the member's right end and its hinges."""
    starts, spans = layout.supports[:-1], np.asarray(layout.spans)
    inside = (starts[:, None] + np.outer(spans, LOAD_SPAN_FRACTIONS)).ravel()
    return np.concatenate([inside, layout.supports[-1:], layout.hinges])


@pytest.fixture(params=list(LAYOUTS), ids=list(LAYOUTS))
def layout(request: pytest.FixtureRequest) -> Layout:
    chosen = LAYOUTS[request.param]
    assert not mechanism_parts(chosen.spans, chosen.hinges)  # stable, as intended
    return chosen


def test_influence_ordinates_match_fe(layout: Layout) -> None:
    il = layout.lines()
    length = il.length
    for load_x in _load_positions(layout):
        fe = _fe_solve(layout, il.station_x, il.station_fraction, np.empty(0), load_x=load_x)
        engine = il.evaluate(np.array([load_x]))[:, 0]
        np.testing.assert_allclose(
            engine[il.moment_rows], fe.moment, rtol=0, atol=REL_TOL_EXACT * length
        )
        np.testing.assert_allclose(
            engine[il.reaction_rows], fe.reaction, rtol=0, atol=REL_TOL_EXACT
        )
        # Shear: a load exactly on a station sits on its jump; compare the others.
        away = np.abs(il.station_x - load_x) > SAME_NODE
        np.testing.assert_allclose(
            engine[il.shear_rows][away], fe.shear[away], rtol=0, atol=REL_TOL_EXACT
        )


def test_moment_is_zero_at_hinges_and_determinate_lines_are_linear() -> None:
    # A hinge carries no moment (definition); with as many hinges as degrees of
    # indeterminacy the member is determinate and every line is piecewise linear
    # (Muller-Breslau: rigid-body motions of the released member; common practice).
    layout = LAYOUTS["cantilever and suspended span"]
    il = layout.lines()
    at_hinge = np.isin(il.station_x, layout.hinges)
    assert at_hinge.sum() == 2
    x = np.linspace(0.0, il.length, 441)
    np.testing.assert_allclose(
        il.evaluate(x)[il.moment_rows][at_hinge], 0.0, atol=REL_TOL_EXACT * il.length
    )
    h = np.diff(il.breaks)
    curvature = np.abs(il.coef[..., 2]) * h**2 + np.abs(il.coef[..., 3]) * h**3
    assert np.all(curvature <= REL_TOL_EXACT * il.effect_scale[:, None])


def test_reaction_lines_are_settlement_shapes_maxwell_betti(layout: Layout) -> None:
    # Betti's reciprocal theorem (Maxwell-Betti; Muller-Breslau principle): the reaction
    # at support i due to a unit load at x equals the deflection at x when support i is
    # raised by one unit with the other supports held. The deflections come from the FE
    # library under an imposed displacement, an analysis independent of the loads.
    il = layout.lines()
    probe = _load_positions(layout)
    for i in range(layout.supports.size):
        fe = _fe_solve(layout, il.station_x, il.station_fraction, probe, settle_support=i)
        engine = il.evaluate(fe.node_x)[il.reaction_rows][i]
        np.testing.assert_allclose(engine, fe.deflection, rtol=0, atol=REL_TOL_EXACT)
