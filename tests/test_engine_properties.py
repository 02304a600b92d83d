"""Laws that every influence line and every moving-load extreme must obey (hypothesis).

* Superposition (linear elasticity; common practice): coincident axles act as
  one, a weightless axle changes nothing, the extreme of a two-axle train is no
  more than the sum of its axles' own extremes, and loads scale the effects.
* Mirror symmetry (common practice): the mirrored member crossed the other way
  gives the mirrored results; shears change sign and swap max and min.
* Scaling (dimensional analysis; common practice): all lengths times k scale
  moments by k and leave shears and reactions; EI times c changes nothing.
* Maxwell-Betti reciprocity, through the Muller-Breslau principle (Betti's
  theorem applied to a released member): every influence line is the elastic
  line of the unloaded member under a unit release displacement at its section.
  So between breaks it is a cubic, and across every break the ordinate, the slope,
  the bending moment EI*v'' and (away from supports) the shear EI*v''' are
  continuous, except the unit jump of a shear line and the unit kink (-1) of a
  moment line at its own station, and a free slope at a hinge, where EI*v'' = 0.
* Equilibrium (statics; common practice): the reaction ordinates sum to 1 and
  their moment about the left end is x; between two stations with no load
  between them the moment changes by the shear times the distance (dM/dx = V).
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from tolerances import REL_TOL_EXACT

from batch.engine.influence import InfluenceLines, influence_lines
from batch.engine.kernel import chain_extremes
from batch.engine.moving import AxleExtremes, axle_extremes
from batch.model import AxleTrain
from batch.model.layout import POSITION_TOL, mechanism_parts

EXAMPLES = settings(max_examples=30, deadline=None, derandomize=True)

Member = tuple[list[float], list[float], list[float], int]
#: Where hinges may sit, as fractions of a span (see ``members``).
HINGE_FRACTIONS = (
    0.05,
    0.15,
    0.1999,
    0.2,
    0.2001,
    0.35,
    0.45,
    0.55,
    0.65,
    0.7999,
    0.8,
    0.8001,
    0.85,
    0.95,
)


@st.composite
def members(draw: st.DrawFn, max_spans: int = 4) -> Member:
    """Spans 10-150, EI 0.5-2, sometimes one or two stable hinges, 1-5 stations per span.

    Hinges sit at odd multiples of 5 % of a span, on the 0.2 and 0.8 points (a
    station whenever the stations per span are 5), or a hair's breadth either side
    of them (slivers next to a station). A hinge 5 % from a support makes a layout
    close to a mechanism (stiffness condition number near 1e8), which the engine
    solves in exact arithmetic.
    """
    n = draw(st.integers(1, max_spans))
    spans = [draw(st.integers(1_000, 15_000)) / 100 for _ in range(n)]
    ei = [draw(st.integers(50, 200)) / 100 for _ in range(n)]
    hinges: list[float] = []
    if n >= 2:
        ends = np.concatenate([[0.0], np.cumsum(spans)])
        for _ in range(draw(st.integers(0, 2))):
            k = draw(st.integers(0, n - 1))
            fraction = draw(st.sampled_from(HINGE_FRACTIONS))
            hinge = float(ends[k] + fraction * spans[k])
            if not mechanism_parts(spans, sorted([*hinges, hinge])):
                hinges = sorted([*hinges, hinge])
    return spans, ei, hinges, draw(st.integers(1, 5))


def _lines(member: Member) -> InfluenceLines:
    spans, ei, hinges, n = member
    return influence_lines(spans, ei, hinges, n)


axle_loads = st.lists(st.integers(2, 40).map(float), min_size=1, max_size=5)
spacing = st.integers(400, 3_000).map(lambda v: v / 100)


def _assert_same(a: np.ndarray, b: np.ndarray, scale: np.ndarray | float) -> None:
    """a == b to REL_TOL_EXACT of the natural size ``scale`` (broadcast)."""
    excess = np.abs(a - b) - REL_TOL_EXACT * np.asarray(scale)
    assert np.all(excess <= 0.0), f"largest excess {excess.max():.3g}\n{a}\n{b}"


# --- superposition ------------------------------------------------------------------------


@EXAMPLES
@given(member=members(), p1=st.integers(2, 40), p2=st.integers(2, 40), gap=spacing)
def test_superposition_of_axles(member: Member, p1: int, p2: int, gap: float) -> None:
    il = _lines(member)
    scale = il.effect_scale * (p1 + p2)
    together = axle_extremes(il, AxleTrain.of([p1, p2], [0.0]))
    single = axle_extremes(il, AxleTrain.of([p1 + p2]))
    _assert_same(together.max_value, single.max_value, scale)
    _assert_same(together.min_value, single.min_value, scale)
    # A weightless middle axle changes nothing.
    train = axle_extremes(il, AxleTrain.of([p1, p2], [gap + 3.0]))
    padded = axle_extremes(il, AxleTrain.of([p1, 0.0, p2], [gap, 3.0]))
    _assert_same(train.max_value, padded.max_value, scale)
    _assert_same(train.min_value, padded.min_value, scale)
    # The train's extreme is at most the sum of its axles' own extremes.
    a, b = axle_extremes(il, AxleTrain.of([p1])), axle_extremes(il, AxleTrain.of([p2]))
    assert np.all(train.max_value <= a.max_value + b.max_value + REL_TOL_EXACT * scale)
    assert np.all(train.min_value >= a.min_value + b.min_value - REL_TOL_EXACT * scale)
    # The effect at the reported position is the sum of the axles' ordinates there.
    for value, q, sigma in (
        (train.max_value, train.max_position, train.max_direction),
        (train.min_value, train.min_position, train.min_direction),
    ):
        for e in np.flatnonzero(value != 0.0):
            x = np.array([q[e], q[e] - sigma[e] * (gap + 3.0)])
            sums = _one_sided_sums(il, e, np.array([p1, p2], float), x)
            assert np.min(np.abs(sums - value[e])) <= REL_TOL_EXACT * scale[e]


def _one_sided_sums(il: InfluenceLines, e: int, loads: np.ndarray, x: np.ndarray) -> np.ndarray:
    """Every sum of the axles' one-sided ordinates of effect e (an axle may sit on a jump).

    Off the member an axle carries nothing; on an end support the limit from
    outside the member (0) is one of its two one-sided values. Positions within
    round-off (POSITION_TOL of the length) of a break are put on it, as the engine does.
    """
    near = il.breaks[np.abs(il.breaks[None, :] - x[:, None]).argmin(axis=1)]
    x = np.where(np.abs(near - x) <= POSITION_TOL * il.length, near, x)
    inside = (x >= 0.0) & (x <= il.length)
    right = np.where(inside & (x < il.length), il.evaluate(x, "right")[e], 0.0)
    left = np.where(inside & (x > 0.0), il.evaluate(x, "left")[e], 0.0)
    at_end = inside & ((x == 0.0) | (x == il.length))
    right = np.where(at_end & (x == 0.0), il.evaluate(x, "right")[e], right)
    left = np.where(at_end & (x == il.length), il.evaluate(x, "left")[e], left)
    choices = np.stack([right, left])  # (2, axles)
    picks = np.array(np.meshgrid(*[[0, 1]] * x.size, indexing="ij")).reshape(x.size, -1)
    return (loads[:, None] * choices[picks, np.arange(x.size)[:, None]]).sum(axis=0)


@EXAMPLES
@given(member=members(), loads=axle_loads, factor=st.sampled_from([0.5, 1.35, 3.0]))
def test_effects_scale_with_the_loads(member: Member, loads: list[float], factor: float) -> None:
    il = _lines(member)
    gaps = [14.0] * (len(loads) - 1)
    base = axle_extremes(il, AxleTrain.of(loads, gaps))
    scaled = axle_extremes(il, AxleTrain.of([factor * p for p in loads], gaps))
    scale = il.effect_scale * factor * sum(loads)
    _assert_same(scaled.max_value, factor * base.max_value, scale)
    _assert_same(scaled.min_value, factor * base.min_value, scale)


# --- mirror symmetry -----------------------------------------------------------------------


def _mirror(member: Member) -> Member:
    spans, ei, hinges, n = member
    length = float(np.sum(spans))
    return spans[::-1], ei[::-1], sorted(length - h for h in hinges), n


def _mirrored_values(il: InfluenceLines, ax: AxleExtremes) -> tuple[np.ndarray, np.ndarray]:
    """(max, min) of every effect as the mirrored member must report them."""
    ms, vs, rs = il.moment_rows, il.shear_rows, il.reaction_rows
    mx = np.concatenate([ax.max_value[ms][::-1], -ax.min_value[vs][::-1], ax.max_value[rs][::-1]])
    mn = np.concatenate([ax.min_value[ms][::-1], -ax.max_value[vs][::-1], ax.min_value[rs][::-1]])
    return mx, mn


@EXAMPLES
@given(member=members(), loads=axle_loads, data=st.data())
def test_mirror_symmetry(member: Member, loads: list[float], data: st.DataObject) -> None:
    gaps = data.draw(st.lists(spacing, min_size=len(loads) - 1, max_size=len(loads) - 1))
    il, il_m = _lines(member), _lines(_mirror(member))
    scale = il.effect_scale * sum(loads)
    for direction in (1, -1):
        ax = axle_extremes(il, AxleTrain.of(loads, gaps), directions=(direction,))
        ax_m = axle_extremes(il_m, AxleTrain.of(loads, gaps), directions=(-direction,))
        expected_max, expected_min = _mirrored_values(il, ax)
        _assert_same(ax_m.max_value, expected_max, scale)
        _assert_same(ax_m.min_value, expected_min, scale)
        moved = ax_m.max_value != 0.0
        assert np.all(ax_m.max_direction[moved] == -direction)
    # Ordinates: M and R mirror, V changes sign (x -> L - x, away from jumps).
    x = np.linspace(0.0, il.length, 23)[1:-1] + 0.013
    a, b = il.evaluate(x), il_m.evaluate(il.length - x)
    _assert_same(b[il.moment_rows], a[il.moment_rows][::-1], il.length)
    _assert_same(b[il.shear_rows], -a[il.shear_rows][::-1], 1.0)
    _assert_same(b[il.reaction_rows], a[il.reaction_rows][::-1], 1.0)


# --- scaling -------------------------------------------------------------------------------


@EXAMPLES
@given(
    member=members(),
    loads=axle_loads,
    k=st.sampled_from([0.3048, 2.0, 3.5]),
    c=st.sampled_from([0.01, 7.0]),
)
def test_scaling_of_lengths_and_stiffness(
    member: Member, loads: list[float], k: float, c: float
) -> None:
    spans, ei, hinges, n = member
    gaps = [4.0 + 3.0 * i for i in range(len(loads) - 1)]
    il = _lines(member)
    il_k = influence_lines([k * s for s in spans], ei, [k * h for h in hinges], n)
    il_c = influence_lines(spans, [c * e for e in ei], hinges, n)
    ax = axle_extremes(il, AxleTrain.of(loads, gaps))
    ax_k = axle_extremes(il_k, AxleTrain.of(loads, [k * g for g in gaps]))
    ax_c = axle_extremes(il_c, AxleTrain.of(loads, gaps))
    size = np.ones(il.n_effects)
    size[il.moment_rows] = k
    scale = il.effect_scale * size * sum(loads)
    _assert_same(ax_k.max_value, size * ax.max_value, scale)
    _assert_same(ax_k.min_value, size * ax.min_value, scale)
    _assert_same(ax_c.max_value, ax.max_value, scale)
    _assert_same(ax_c.min_value, ax.min_value, scale)
    x = np.linspace(0.0, il.length, 17) + 0.011
    x = x[x < il.length]
    _assert_same(il_k.evaluate(k * x), size[:, None] * il.evaluate(x), scale[:, None])


# --- Maxwell-Betti / Muller-Breslau: each line is an elastic line ---------------------------


@EXAMPLES
@given(member=members())
def test_lines_are_elastic_lines_of_the_released_member(member: Member) -> None:
    spans, ei, hinges, _ = member
    il = _lines(member)
    supports = il.support_x
    tol = 1e-9 * il.length
    b = il.breaks
    h = np.diff(b)
    c = il.coef
    span_of_piece = np.searchsorted(supports, 0.5 * (b[:-1] + b[1:])) - 1
    ei_piece = np.asarray(ei)[span_of_piece]
    # Derivatives 0..3 at the right end of each piece and at the left end of each piece.
    t = h[None, :]
    end = np.stack(
        [
            ((c[..., 3] * t + c[..., 2]) * t + c[..., 1]) * t + c[..., 0],
            (3 * c[..., 3] * t + 2 * c[..., 2]) * t + c[..., 1],
            6 * c[..., 3] * t + 2 * c[..., 2],
            6 * c[..., 3],
        ]
    )
    start = np.stack([c[..., 0], c[..., 1], 2 * c[..., 2], 6 * c[..., 3]])
    # Moments and shears (EI v'', EI v''') of the released member, left and right of breaks.
    lo = 1.0 / min(spans)
    scale = il.effect_scale[:, None]
    jump = start[:, :, 1:] - end[:, :, :-1]  # (4, E, interior breaks)
    m_left, m_right = ei_piece[:-1] * end[2, :, :-1], ei_piece[1:] * start[2, :, 1:]
    s_left, s_right = ei_piece[:-1] * end[3, :, :-1], ei_piece[1:] * start[3, :, 1:]
    inner = b[1:-1]
    at_hinge = np.array([np.any(np.abs(np.asarray(hinges) - x) <= tol) for x in inner], bool)
    at_support = np.array([np.any(np.abs(supports - x) <= tol) for x in inner], bool)
    own = np.concatenate([il.station_x, il.station_x, np.full(supports.size, np.nan)])
    at_own = np.abs(inner[None, :] - own[:, None]) <= tol  # (E, interior breaks)
    moment_row = np.zeros(il.n_effects, bool)
    moment_row[il.moment_rows] = True
    shear_row = np.zeros(il.n_effects, bool)
    shear_row[il.shear_rows] = True
    expected_value_jump = np.where(at_own & shear_row[:, None], 1.0, 0.0)
    expected_slope_jump = np.where(at_own & moment_row[:, None], -1.0, 0.0)
    ei_max = max(ei)
    np.testing.assert_allclose(jump[0], expected_value_jump, rtol=0, atol=REL_TOL_EXACT)
    slope_ok = np.abs(jump[1] - expected_slope_jump) <= REL_TOL_EXACT * scale * lo
    assert np.all(slope_ok | at_hinge[None, :])
    curvature_tol = REL_TOL_EXACT * scale * lo**2 * ei_max
    assert np.all(np.abs(m_right - m_left) <= curvature_tol)
    assert np.all(np.abs(m_left[:, at_hinge]) <= curvature_tol)
    shear_ok = np.abs(s_right - s_left) <= REL_TOL_EXACT * scale * lo**3 * ei_max
    assert np.all(shear_ok | at_support[None, :])
    # Pinned ends: no moment in the released member.
    assert np.all(np.abs(start[2, :, 0]) <= REL_TOL_EXACT * scale[:, 0] * lo**2)
    assert np.all(np.abs(end[2, :, -1]) <= REL_TOL_EXACT * scale[:, 0] * lo**2)
    # The released member does not move at the supports (except the released one).
    at = il.evaluate(supports)
    expected = np.zeros_like(at)
    expected[il.reaction_rows] = np.eye(supports.size)
    rows = np.ones(il.n_effects, bool)
    rows[il.shear_rows] = False  # a shear line's jump may sit on a support
    _assert_same(at[rows], expected[rows], il.effect_scale[rows, None])


# --- equilibrium ---------------------------------------------------------------------------


@EXAMPLES
@given(member=members(), fractions=st.lists(st.floats(0.0, 1.0), min_size=1, max_size=20))
def test_equilibrium_of_the_unit_load(member: Member, fractions: list[float]) -> None:
    il = _lines(member)
    x = np.asarray(fractions) * il.length
    ordinates = il.evaluate(x)
    r = ordinates[il.reaction_rows]
    _assert_same(r.sum(axis=0), np.ones_like(x), 1.0)
    _assert_same(il.support_x @ r, x, il.length)
    # dM/dx = V between consecutive stations of a span when the load is outside them.
    m, v = ordinates[il.moment_rows], ordinates[il.shear_rows]
    for s in range(il.n_stations - 1):
        if il.station_span[s] != il.station_span[s + 1]:
            continue
        a, b = il.station_x[s], il.station_x[s + 1]
        outside = (x < a) | (x > b)
        _assert_same(m[s + 1, outside] - m[s, outside], v[s, outside] * (b - a), il.length)


# --- the sweep's representation -----------------------------------------------------------


@EXAMPLES
@given(member=members(), fractions=st.lists(st.floats(0.001, 0.999), min_size=1, max_size=20))
def test_the_sweep_plan_rebuilds_every_line(member: Member, fractions: list[float]) -> None:
    # A piecewise cubic is the sum, over its breaks b <= x, of the jump of its Taylor
    # coefficients at b as a polynomial in (x - b) (truncated powers; common practice).
    # The kernel sweeps lines in that form, bundled by shared breaks; summed back here
    # they must give the influence lines themselves, for the whole lines and their parts.
    il = _lines(member)
    x = np.asarray(fractions) * il.length
    whole = il.evaluate(x)
    high, low = il.clipped_plans
    parts = ((il.plan, whole), (high, np.maximum(whole, 0.0)), (low, np.minimum(whole, 0.0)))
    for plan, expected in parts:
        rebuilt = np.zeros_like(expected)
        for u in range(plan.counts.size):
            breaks = plan.breaks[u, : plan.counts[u]]
            for r in range(plan.bundle_start[u], plan.bundle_start[u + 1]):
                t = x[None, :] - breaks[:, None]
                jump = plan.jumps[r, : breaks.size]
                terms = sum(jump[:, [c]] * t**c for c in range(4))
                rebuilt[plan.order[r]] = np.where(t >= 0.0, terms, 0.0).sum(axis=0)
        # A line equal to one swept takes its values; one not swept nor copied is zero.
        for e, source in plan.copies:
            rebuilt[e] = rebuilt[source]
        _assert_same(rebuilt, expected, il.effect_scale[:, None])


@EXAMPLES
@given(
    member=members(),
    loads=st.lists(st.integers(2, 40).map(float), min_size=2, max_size=5),
    data=st.data(),
)
def test_seeking_only_what_passes_the_held_extremes_changes_nothing_else(
    member: Member, loads: list[float], data: st.DataObject
) -> None:
    # Branch and bound (common practice): the join of a ranged train's groups drops what
    # cannot pass the extremes already held. For any held level, the result must be the
    # unbounded search's own wherever that passes the level, and nothing elsewhere.
    il = _lines(member)
    cut = data.draw(st.integers(1, len(loads) - 1))
    offsets = np.concatenate(
        [
            [0.0],
            np.cumsum(
                data.draw(st.lists(spacing, min_size=len(loads) - 1, max_size=len(loads) - 1))
            ),
        ]
    )
    offsets[cut:] -= offsets[cut]
    own = offsets[cut - 1] + data.draw(spacing)
    gap = (np.array([own]), np.array([own + data.draw(spacing)]))
    sigma = float(data.draw(st.sampled_from([1, -1])))
    tol = POSITION_TOL * il.length
    groups = np.array([0, cut, len(loads)], dtype=np.int64)
    args = (il.plan, np.array(loads), offsets, groups, *gap, sigma, tol)
    free = chain_extremes(*args, np.full(il.n_effects, -np.inf), np.full(il.n_effects, np.inf))
    level = data.draw(st.sampled_from([0.0, 0.5, 0.9, 0.999, 1.0, 1.2]))
    # (-inf where no two candidates of the groups fit the range: the range ends cover it)
    held = tuple(level * np.where(np.isfinite(v), v, 0.0) for v in (free[0], free[3]))
    bounded = chain_extremes(*args, *held)
    for k, (unbounded, limit, sense) in enumerate(
        ((free[0], held[0], 1.0), (free[3], held[1], -1.0))
    ):
        got = bounded[3 * k]
        passes = sense * unbounded > sense * limit
        _assert_same(got[passes], unbounded[passes], (il.effect_scale * sum(loads))[passes])
        assert np.all(sense * got[~passes] <= sense * limit[~passes])
