"""Stiffness that changes along a member: stepped EI and haunches.

* Stepped (piecewise-constant) EI against the independent finite-element library
  PyNiteFEA (imported as ``Pynite``), a general 3D frame solver: each member is a
  chain of frame elements with a node at every support, station, change of EI and
  load position, so its nodal answers are exact for Euler-Bernoulli beams. Signs as
  in tests/test_engine_fea.py: M = -Mz, V = Fy, reactions RxnFY upward.
* Haunches, approximated by prismatic pieces, against the force (flexibility)
  method with the exact, continuously varying EI, integrated by adaptive quadrature
  (scipy.integrate.quad): for two spans with the interior support released, the
  redundant reaction is X = -d10/d11, d = integral of m_i m_j / EI dx (virtual work;
  any structural analysis text, e.g. Hibbeler, Structural Analysis, ch. 10). The
  error of the prismatic model must shrink as the pieces get shorter.

Tolerance: 1e-9 of each effect's natural size (member length L for moments, 1 for
shears and reactions).
"""

from __future__ import annotations

import itertools
from collections.abc import Callable

import numpy as np
import pytest
from numpy.typing import NDArray

from batch.engine.envelope import member_influence
from batch.engine.influence import influence_lines
from batch.model import Member, Segment

Pynite = pytest.importorskip("Pynite")
integrate = pytest.importorskip("scipy.integrate")

#: FE library against the exact engine, relative to the natural size of each effect.
REL_TOL_EXACT = 1e-9
#: Two positions closer than this (length units) are one node.
SAME_NODE = 1e-9


def _fe_effects(
    supports: NDArray[np.float64],
    ei_at: Callable[[float], float],
    station_x: NDArray[np.float64],
    station_fraction: NDArray[np.float64],
    breaks: NDArray[np.float64],
    load_x: float,
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]:
    """PyNite moments and shears at the stations and the reactions, unit load at ``load_x``.

    ``ei_at(x)`` is the EI of the element whose middle is x; ``breaks`` are the
    points where EI changes (each a node).
    """
    points = np.sort(np.concatenate([supports, station_x, breaks, [load_x]]))
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
        ei = ei_at(0.5 * (xs[i] + xs[i + 1]))
        model.add_section(f"S{i}", 1.0, 1.0, float(ei), 1.0)
        model.add_member(f"E{i}", names[i], names[i + 1], "unit", f"S{i}")
    model.add_node_load(names[int(np.argmin(np.abs(xs - load_x)))], "FY", -1.0)
    model.analyze_linear(check_statics=False)
    moment, shear = [], []
    for x, frac in zip(station_x, station_fraction, strict=True):
        i = int(np.argmin(np.abs(xs - x)))
        if frac == 1.0:  # section just left of the station
            member, at = model.members[f"E{i - 1}"], float(xs[i] - xs[i - 1])
        else:
            member, at = model.members[f"E{i}"], 0.0
        moment.append(-member.moment("Mz", at))
        shear.append(member.shear("Fy", at))
    reaction = [
        model.nodes[names[int(np.argmin(np.abs(xs - s)))]].RxnFY["Combo 1"] for s in supports
    ]
    return np.array(moment), np.array(shear), np.array(reaction)


#: Three spans with cover plates over both piers (each crossing its support) and a weaker
#: end stretch (an invented girder, ft). Every change of EI is kept a few feet from the
#: stations: a very short element beside a long one makes the FE library's stiffness
#: matrix ill-conditioned, and it loses digits (the engine solves such systems exactly).
STEPPED = Member(
    id="KV-T1 G2",
    spans=(50.0, 70.0, 55.0),
    span_ei=(1.0, 1.2, 1.0),
    segments=(
        Segment(member="KV-T1 G2", start=0.0, end=5.0, ei=0.65),
        Segment(member="KV-T1 G2", start=37.5, end=65.0, ei=1.55),
        Segment(member="KV-T1 G2", start=104.0, end=134.0, ei=1.9),
    ),
)


def _stepped_ei(member: Member) -> Callable[[float], float]:
    supports = np.concatenate([[0.0], np.cumsum(member.spans)])

    def ei_at(x: float) -> float:
        for start, end, value in member.stiffness_pieces:
            if start < x < end:
                return value
        span = min(int(np.searchsorted(supports, x)) - 1, len(member.spans) - 1)
        return member.stiffness[span]

    return ei_at


@pytest.mark.parametrize("load_x", [0.0, 3.1, 25.0, 44.37, 50.0, 77.7, 121.9, 140.0, 175.0])
def test_stepped_ei_matches_the_fe_library(load_x: float) -> None:
    il = member_influence(STEPPED, 6)
    supports = il.support_x
    breaks = np.array([b for s in STEPPED.segments for b in (s.start, s.end)])
    fe_m, fe_v, fe_r = _fe_effects(
        supports, _stepped_ei(STEPPED), il.station_x, il.station_fraction, breaks, load_x
    )
    engine = il.evaluate(np.array([load_x]))[:, 0]
    tol = REL_TOL_EXACT * il.length
    np.testing.assert_allclose(engine[il.moment_rows], fe_m, rtol=0, atol=tol)
    np.testing.assert_allclose(engine[il.reaction_rows], fe_r, rtol=0, atol=REL_TOL_EXACT)
    away = np.abs(il.station_x - load_x) > SAME_NODE  # a load on a station sits on its jump
    np.testing.assert_allclose(engine[il.shear_rows][away], fe_v[away], rtol=0, atol=REL_TOL_EXACT)


def test_stepped_ei_changes_continuity_moments() -> None:
    # Stiffer regions over the piers draw moment to them (common practice): the hogging
    # influence at pier 1 under a load in span 2 grows against the prismatic member.
    plain = influence_lines(STEPPED.spans, STEPPED.span_ei, stations_per_span=2)
    stepped = member_influence(STEPPED, 2)
    pier = 2  # station rows: span 1 at 0, 0.5, 1 -> row 2 is pier 1
    at = np.array([85.0])
    assert stepped.evaluate(at)[pier, 0] < plain.evaluate(at)[pier, 0] < 0


def test_a_segment_equal_to_its_span_changes_nothing() -> None:
    # The same EI given twice is the same member (definition).
    base = influence_lines((40.0, 60.0), (1.0, 1.5), stations_per_span=5)
    same = member_influence(
        Member(
            id="A",
            spans=(40.0, 60.0),
            span_ei=(1.0, 1.5),
            segments=(Segment(member="A", start=40.0, end=100.0, ei=1.5),),
        ),
        5,
    )
    x = np.linspace(0.0, 100.0, 401)
    np.testing.assert_allclose(same.evaluate(x), base.evaluate(x), rtol=0, atol=1e-12 * 100)


# --- haunches: prismatic pieces against the exact varying EI ------------------------------

SPAN = 80.0
#: A parabolic haunch over the pier of two equal spans: EI 1 at 56 ft rising to 3.375 (depth
#: 1.5 times) at the pier, and the mirror image in span 2 (invented proportions).
HAUNCH_START, HAUNCH_EI_END = 56.0, 3.375


def _haunched(pieces: int, shape: str) -> Member:
    return Member(
        id="KV-H1",
        spans=(SPAN, SPAN),
        segments=(
            Segment(
                member="KV-H1",
                start=HAUNCH_START,
                end=SPAN,
                ei=1.0,
                ei_end=HAUNCH_EI_END,
                haunch=shape,  # type: ignore[arg-type]
                pieces=pieces,
            ),
            Segment(
                member="KV-H1",
                start=SPAN,
                end=2 * SPAN - HAUNCH_START,
                ei=HAUNCH_EI_END,
                ei_end=1.0,
                haunch=shape,  # type: ignore[arg-type]
                pieces=pieces,
            ),
        ),
    )


def _haunch_ei(shape: str) -> Callable[[float], float]:
    """The exact, continuously varying EI of the haunched member."""
    member = _haunched(1, shape)

    def ei(x: float) -> float:
        for s in member.segments:
            if s.start <= x <= s.end:
                return s.stiffness_at(x)
        return 1.0

    return ei


def _exact_pier_reaction(load_x: float, ei: Callable[[float], float]) -> float:
    """Force method: the pier reaction of two spans under a unit load at ``load_x``."""
    length = 2 * SPAN

    def m0(x: float) -> float:  # simple beam over 2L, unit load at load_x, sagging +
        return (length - load_x) / length * x - max(0.0, x - load_x)

    def m1(x: float) -> float:  # unit upward force at the pier: hogging
        return -0.5 * x if x <= SPAN else -0.5 * (length - x)

    cuts = sorted({0.0, HAUNCH_START, SPAN, length - HAUNCH_START, load_x, length})

    def integral(f: Callable[[float], float]) -> float:
        return sum(
            integrate.quad(f, a, b, epsabs=0, epsrel=1e-13)[0] for a, b in itertools.pairwise(cuts)
        )

    return -integral(lambda x: m0(x) * m1(x) / ei(x)) / integral(lambda x: m1(x) ** 2 / ei(x))


def test_the_force_method_reference_on_a_prismatic_member() -> None:
    # The reference itself, on a case with a hand answer: two equal prismatic spans, a
    # load at mid-span 1 gives the pier reaction 11P/16 (AISC Beam Diagrams and Formulas,
    # two equal spans, concentrated load at the centre of one span).
    assert _exact_pier_reaction(SPAN / 2, lambda _x: 1.0) == pytest.approx(11 / 16, rel=1e-12)
    il = member_influence(Member(id="KV-H0", spans=(SPAN, SPAN)), 2)
    assert il.evaluate(np.array([SPAN / 2]))[il.reaction_rows][1, 0] == pytest.approx(11 / 16)


@pytest.mark.parametrize("shape", ["linear", "parabolic"])
def test_haunch_error_shrinks_with_the_number_of_pieces(shape: str) -> None:
    loads = (20.0, 40.0, 70.0, 100.0)
    exact = np.array([_exact_pier_reaction(x, _haunch_ei(shape)) for x in loads])
    errors = []
    for pieces in (1, 2, 4, 8, 16, 32):
        il = member_influence(_haunched(pieces, shape), 2)
        got = il.evaluate(np.array(loads))[il.reaction_rows][1]
        errors.append(float(np.max(np.abs(got - exact))))
    # The midpoint rule errs as the square of the piece length: halving the pieces cuts
    # the error about four times; every halving must at least halve it.
    assert all(b < 0.5 * a for a, b in itertools.pairwise(errors)), errors
    assert errors[-1] / errors[-2] == pytest.approx(0.25, abs=0.05), errors
    # The default number of pieces is within 0.1 % of the exact reaction here.
    pieces = Segment(member="KV-H1", start=0.0, end=1.0, ei=1.0).pieces
    default = member_influence(_haunched(pieces, shape), 2)
    got = default.evaluate(np.array(loads))[default.reaction_rows][1]
    assert np.max(np.abs(got - exact) / np.abs(exact)) < 1e-3
