"""Concurrent forces: the shear acting with each governing moment and the moment with each shear.

Checked against a brute-force search that knows nothing of the engine: on a simple span the
influence lines are the handbook's (AISC Steel Construction Manual, Table 3-23, "Simple beam
- concentrated load at any point", table number from memory; the formulas are the statics
of a simple beam: for a load P at a, R1 = P(L - a)/L and the moment at x is
P a (L - x)/L for a <= x, P x (L - a)/L for a >= x). With V the sum of the
upward forces left of the section, a unit load at a gives V = (L - a)/L for a right of
the section and -a/L for a left of it (statics, common practice); the lines are straight
between their breaks (0, x, L), so the sum of P*IL over the axles is piecewise linear in
the train's position and its ranged spacing and takes its extremes at a vertex: a
spacing at an end of its range or an axle on a break, each axle on a break from either
side (a vertex search, exact; common practice). Every placement that reaches the
extreme is kept; the engine's concurrent value must be that of one of them.

A lane load w on the parts adverse to the governing line gives the integrals of the lines
above over those parts (computed by hand): with V max (load right of x) the moment
w x (L - x)^2/(2L); with V min (load left of x) w (L - x) x^2/(2L); with M max (load
everywhere) the shear w (L - 2x)/2; M min has no adverse part on a simple span.

Axles that lessen the governing effect are left out with ``drop_adverse_axles`` (AASHTO
LRFD 3.6.1.3.1: axles that do not contribute to the extreme force effect are neglected;
from memory, as docs/load-models.md lists it), and then from the concurrent effect too:
the same axles stand on the bridge.
"""

from __future__ import annotations

import itertools

import numpy as np
import pytest
from numpy.typing import NDArray
from tolerances import REL_TOL_EXACT, REL_TOL_LIBRARY

from batch.engine.envelope import member_envelope, member_influence
from batch.loads.cases import LoadCase
from batch.model import AxleTrain, Member

SEED = 20_261_205


def _moment(L: float, x: float, a: NDArray[np.float64]) -> NDArray[np.float64]:
    """AISC Table 3-23: moment at x for a unit load at a (continuous in a)."""
    return np.where(a <= x, a * (L - x) / L, x * (L - a) / L)


def _shear(
    L: float, x: float, a: NDArray[np.float64], right: NDArray[np.bool_]
) -> NDArray[np.float64]:
    """Shear just right of the station x (just left at x = L) for a unit load at a.

    ``right`` says, for a load on the station itself, whether it is taken just right of
    it (then right of the section) or just left.
    """
    section = L if x >= L else x  # at fraction 1 the section is just left of x
    past = (a > section) | ((a == section) & right) if x < L else (a >= L) & right
    return np.where(past, (L - a) / L, -a / L)


def _line(
    L: float, x: float, kind: str, a: NDArray[np.float64], right: NDArray[np.bool_]
) -> NDArray[np.float64]:
    """A unit load's effect, 0 off the span (from outside: just left of 0, just right of L)."""
    on = ((a > 0) | ((a == 0) & right)) & ((a < L) | ((a == L) & ~right))
    value = _moment(L, x, a) if kind == "M" else _shear(L, x, a, right)
    return np.where(on, value, 0.0)


def _placements(
    L: float, x: float, loads: NDArray[np.float64], lo: NDArray[np.float64], hi: NDArray[np.float64]
) -> list[tuple[float, int, NDArray[np.float64]]]:
    """Every vertex (front-axle position, direction, gaps) of the piecewise-linear search."""
    ranged = np.flatnonzero(hi > lo)
    ends = [lo.copy()]
    for g in ranged:  # each ranged gap at either end (at most one in these tests)
        ends = [np.where(np.arange(lo.size) == g, v, e) for e in ends for v in (lo[g], hi[g])]
    breaks = (0.0, x, L)
    out = []
    for sigma in (1, -1):
        for gaps in ends:
            d = np.concatenate([[0.0], np.cumsum(gaps)])
            for i, b in itertools.product(range(loads.size), breaks):
                out.append((b + sigma * d[i], sigma, gaps))
        for g in ranged:  # a free spacing: one axle of each group on a break
            for i, j in itertools.product(range(g + 1), range(g + 1, loads.size)):
                for b1, b2 in itertools.product(breaks, breaks):
                    d = np.concatenate([[0.0], np.cumsum(lo)])
                    # front group: b1 = q - sigma d_i; rear: b2 = q - sigma (d_j + s - lo_g)
                    s = sigma * (b1 - b2) - d[j] + d[i] + lo[g]
                    if lo[g] <= s <= hi[g]:
                        gaps = lo.copy()
                        gaps[g] = s
                        out.append((b1 + sigma * d[i], sigma, gaps))
    return out


def _brute(
    L: float,
    x: float,
    kind: str,
    sense: float,
    case: LoadCase,
    df: tuple[float, float],
) -> tuple[float, list[float]]:
    """The governing value of one effect and the concurrent values of every placement of it.

    ``kind`` "M" or "V" is the governing effect, ``sense`` +1/-1; ``df`` the (moment,
    shear) distribution factors. Returns (value, concurrent values of the placements
    that reach it within round-off).
    """
    other = "V" if kind == "M" else "M"
    loads = np.asarray(case.train.loads)
    lo, hi = np.asarray(case.train.low), np.asarray(case.train.high)
    df_of = {"M": df[0], "V": df[1]}
    # the lane load's parts, hand-integrated (see the module docstring)
    if kind == "V":
        area = (L - x) ** 2 / (2 * L) if sense > 0 else -(x**2) / (2 * L)
        with_it = x * (L - x) ** 2 / (2 * L) if sense > 0 else (L - x) * x**2 / (2 * L)
    else:
        area = x * (L - x) / 2 if sense > 0 else 0.0
        with_it = (L - 2 * x) / 2 if sense > 0 else 0.0
    lane_value = case.factor * case.lane_load * area
    lane_with = case.factor * case.lane_load * with_it
    best, found = 0.0, []
    for q, sigma, gaps in _placements(L, x, loads, lo, hi):
        a = q - sigma * np.concatenate([[0.0], np.cumsum(gaps)])
        for b in (0.0, x, L):  # an axle placed on a break is on it, round-off aside
            a = np.where(np.abs(a - b) <= 1e-12 * L, b, a)
        on_break = np.flatnonzero(np.isin(a, (0.0, x, L)))
        for mask in range(2**on_break.size):
            right = np.ones(a.size, dtype=bool)
            right[on_break] = [(mask >> k) & 1 == 1 for k in range(on_break.size)]
            own = _line(L, x, kind, a, right)
            counted = sense * own > 0 if case.drop_adverse_axles else np.ones(a.size, bool)
            axles = case.factor * float(np.sum(loads * own * counted))
            if sense * axles <= 0.0:
                continue  # the train off the member gives 0, and so does the lane alone
            value = df_of[kind] * ((1 + case.impact) * axles + lane_value)
            comp = case.factor * float(np.sum(loads * _line(L, x, other, a, right) * counted))
            conc = df_of[other] * ((1 + case.impact) * comp + lane_with)
            found.append((value, conc))
    lane_alone = df_of[kind] * lane_value
    found.append((lane_alone, df_of[other] * lane_with))  # the train off the member
    best = max(sense * v for v, _ in found)
    scale = (L if kind == "M" else 1.0) * (loads.sum() + case.lane_load * L)
    return sense * best, [c for v, c in found if sense * v >= best - REL_TOL_EXACT * scale]


def _cases(rng: np.random.Generator) -> list[LoadCase]:
    """A fixed train and a ranged one (one gap a range), with lane load, factor, impact."""
    out = []
    for ranged in (False, True):
        n = int(rng.integers(2, 5))
        loads = np.round(rng.uniform(5.0, 35.0, n), 1)
        lo = np.round(rng.uniform(4.0, 16.0, n - 1), 1)
        hi = lo.copy()
        if ranged:
            g = int(rng.integers(0, n - 1))
            hi[g] = lo[g] + round(float(rng.uniform(4.0, 16.0)), 1)
        out.append(
            LoadCase(
                label=f"truck {len(out)}",
                train=AxleTrain.of(loads, lo, hi),
                lane_load=round(float(rng.uniform(0.0, 0.8)), 2),
                impact=0.33,
                factor=round(float(rng.uniform(0.8, 1.3)), 2),
                drop_adverse_axles=bool(rng.random() < 0.5),
            )
        )
    return out


@pytest.mark.parametrize("index", range(12))
def test_concurrent_forces_match_a_brute_force_search_on_a_simple_span(index: int) -> None:
    rng = np.random.default_rng([SEED, index])
    L = round(float(rng.uniform(20.0, 120.0)), 1)
    df = (round(float(rng.uniform(0.4, 0.9)), 3), round(float(rng.uniform(0.5, 1.0)), 3))
    member = Member(id="KVHA S1", spans=(L,), df_moment=df[0], df_shear=df[1])
    for case in _cases(rng):  # each case alone governs every effect
        env = member_envelope(member, [case], 8)
        for kind, sense, ext in (
            ("V", 1.0, env.v_max),
            ("V", -1.0, env.v_min),
            ("M", 1.0, env.m_max),
            ("M", -1.0, env.m_min),
        ):
            weight = sum(case.train.loads) + case.lane_load * L
            size = (L if kind == "M" else 1.0) * weight  # the natural size of each effect
            with_size = (L if kind == "V" else 1.0) * weight
            for i, x in enumerate(env.station_x):
                value, concurrent = _brute(L, float(x), kind, sense, case, df)
                assert abs(ext.value[i] - value) <= REL_TOL_EXACT * size, (kind, sense, x)
                if ext.case[i] < 0:
                    assert np.isnan(ext.concurrent[i])
                    continue
                miss = min(abs(ext.concurrent[i] - c) for c in concurrent)
                assert miss <= REL_TOL_EXACT * with_size, (kind, sense, x, ext.concurrent[i])


@pytest.mark.parametrize(("L", "P"), [(40.0, 20.0), (73.5, 32.0), (12.0, 8.0)])
def test_with_one_axle_the_moment_with_v_max_is_the_axle_just_right_of_the_station(
    L: float, P: float
) -> None:
    # One axle P on a simple span: V max at x is R1 = P(L - a)/L with a just right of x,
    # and the moment at x with it is P x (L - x)/L (AISC Table 3-23, load at a = x+).
    member = Member(id="KVHA S1", spans=(L,))
    env = member_envelope(member, [LoadCase(label="one axle", train=AxleTrain.of([P]))], 10)
    x = env.station_x
    acting = env.v_max.case >= 0
    assert acting[:-1].all()  # every station but the right end, where V max is 0
    expected = P * x * (L - x) / L
    assert np.allclose(env.v_max.concurrent[acting], expected[acting], rtol=REL_TOL_EXACT, atol=0)
    # and with V min (the axle just left of x), the same moment
    acting = env.v_min.case >= 0
    assert np.allclose(env.v_min.concurrent[acting], expected[acting], rtol=REL_TOL_EXACT, atol=0)


def test_the_lane_integral_is_the_area_over_the_governing_lines_adverse_parts() -> None:
    # On three continuous spans the integral of a line over the parts where it is itself
    # positive (negative) is its own positive (negative) area; and the integral of the
    # companion line over the parts where the governing one is positive plus the parts
    # where it is negative is the companion's whole integral (computed by hand: the two
    # parts cover the member; the numerical integral by scipy's quad, an independent
    # library, over the pieces).
    from scipy.integrate import quad

    il = member_influence(Member(id="KVHA C3", spans=(50.0, 70.0, 50.0)), 10)
    lines = np.arange(il.n_effects)
    positive, negative = il.areas_where(lines, lines)
    own_positive, own_negative = il.areas()
    assert np.allclose(positive, own_positive, rtol=0, atol=REL_TOL_EXACT * il.length**2)
    assert np.allclose(negative, own_negative, rtol=0, atol=REL_TOL_EXACT * il.length**2)
    n = il.n_stations
    moments, shears = np.arange(n), np.arange(n, 2 * n)
    up, down = il.areas_where(shears, moments)
    for i in (3, 12, 25):

        def line(a: float, i: int = i) -> float:
            return float(il.ordinates(np.array(i), np.array(a)))

        whole = sum(
            quad(line, b0, b1)[0] for b0, b1 in zip(il.breaks[:-1], il.breaks[1:], strict=True)
        )
        assert up[i] + down[i] == pytest.approx(whole, rel=1e-9, abs=1e-9 * il.length**2)


def _fe_moments(
    spans: tuple[float, ...], ei: tuple[float, ...], stations: NDArray[np.float64], loads: dict
) -> NDArray[np.float64]:
    """Moments (sagging positive) at ``stations`` under point loads {x: P}, by PyNite.

    A chain of frame elements with a node at every support, station and load; PyNite's
    member moment Mz is negative for sagging (its sign convention), hence the minus.
    """
    import Pynite

    supports = np.concatenate([[0.0], np.cumsum(spans)])
    points = np.sort(np.concatenate([supports, stations, list(loads)]))
    xs = points[np.concatenate([[True], np.diff(points) > 1e-9])]
    model = Pynite.FEModel3D()
    model.add_material("unit", 1.0, 1.0, 0.3, 0.0)
    for i, x in enumerate(xs):
        model.add_node(f"N{i}", float(x), 0.0, 0.0)
        on_support = bool(np.any(np.abs(supports - x) <= 1e-9))
        model.def_support(f"N{i}", i == 0, on_support, True, True, True)
    for i in range(xs.size - 1):
        span = int(np.searchsorted(supports, 0.5 * (xs[i] + xs[i + 1]))) - 1
        model.add_section(f"S{i}", 1.0, 1.0, float(ei[span]), 1.0)
        model.add_member(f"E{i}", f"N{i}", f"N{i + 1}", "unit", f"S{i}")
    for x, p in loads.items():
        model.add_node_load(f"N{int(np.argmin(np.abs(xs - x)))}", "FY", -p)
    model.analyze_linear(check_statics=False)
    out = []
    for x in stations:
        i = int(np.argmin(np.abs(xs - x)))
        member = model.members[f"E{min(i, xs.size - 2)}"]
        at = 0.0 if i < xs.size - 1 else float(xs[i] - xs[i - 1])
        out.append(-member.moment("Mz", at))
    return np.array(out)


def test_the_moment_with_a_governing_shear_on_continuous_spans_matches_fe() -> None:
    # Three continuous spans with unequal EI: the moment acting with V max and with V min
    # at every station equals an independent finite-element model (PyNiteFEA, a general
    # frame solver; tests/test_engine_fea.py checks it against hand answers) loaded with
    # the governing truck's axles where the engine says they stand. The moment is
    # continuous in the load's position, so an axle on the station needs no side.
    pytest.importorskip("Pynite")
    spans, ei = (50.0, 70.0, 55.0), (1.0, 1.6, 1.2)
    member = Member(id="KVHA C3", spans=spans, span_ei=ei, df_moment=0.7, df_shear=0.8)
    truck = LoadCase(
        label="haul",
        train=AxleTrain.of([12.0, 30.0, 30.0, 18.0], [11.0, 4.5, 16.0], [11.0, 4.5, 30.0]),
        factor=1.1,
    )
    env = member_envelope(member, [truck], 6)
    x = env.station_x
    for ext in (env.v_max, env.v_min):
        for i in np.flatnonzero(ext.case >= 0):
            gaps = np.array([11.0, 4.5, ext.spacing[i][0]])
            axles = ext.position[i] - ext.direction[i] * np.concatenate([[0.0], np.cumsum(gaps)])
            on = (axles >= 0.0) & (axles <= sum(spans))
            loads = dict(zip(axles[on].tolist(), np.array(truck.train.loads)[on], strict=True))
            fe = _fe_moments(spans, ei, x[i : i + 1], loads)[0]
            expected = 0.7 * 1.1 * fe  # DF moment and the case's factor, no allowance
            assert ext.concurrent[i] == pytest.approx(
                expected, rel=REL_TOL_LIBRARY, abs=REL_TOL_EXACT * sum(spans) * 90.0
            )
