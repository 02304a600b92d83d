"""Brute-force check of the exact moving-load extremes on randomised members and vehicles.

The engine finds extremes exactly from candidate positions (axles on breaks,
stationary points of the cubic pieces). This test knows nothing of that: it
steps the front axle across the member on a fine grid (both directions), steps a
ranged spacing on the same grid, then polishes the best grid points with
``scipy.optimize.minimize_scalar`` (bounded) in a window of one step either
side. Only ``il.evaluate`` (the influence ordinates, themselves checked against
closed forms and an independent FE library in the other engine tests) is taken
from the engine. Method: direct search plus local polishing, common practice.

The same search checks the compiled kernel as a run uses it: a random member against
a random fleet in one call (rigid trains swept together, ranged ones by their range
ends and free chains), each vehicle's row against its own search.

Checks, per effect and sense:

* the engine's extreme is never exceeded by any stepped or polished position
  (beyond ``REL_TOL_EXACT`` of the effect's natural size);
* the polished search reaches the engine's extreme to the same tolerance;
* putting the vehicle where the engine says (front-axle position, direction,
  spacing) reproduces the engine's value (one-sided limits at shear jumps).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pytest
from numpy.typing import NDArray
from scipy.optimize import minimize_scalar
from tolerances import REL_TOL_EXACT

from batch.engine.influence import InfluenceLines, influence_lines
from batch.engine.moving import AxleExtremes, axle_extremes, fleet_extremes_of
from batch.loads.cases import LoadCase
from batch.model import AxleTrain
from batch.model.layout import POSITION_TOL, mechanism_parts

#: Grid step of the front axle and of a ranged spacing (length units, ft).
STEP = 0.05
#: Local polishing tolerance on the offset from a grid point (length units).
POLISH_XATOL = 1e-12
#: Grid peaks polished per effect, sense, direction and spacing case.
MAX_PEAKS = 8
N_CASES = 30
#: Random members, each against a random fleet of FLEET_SIZE vehicles in one kernel call.
N_FLEETS = 8
FLEET_SIZE = 6
SEED = 20_251_202


@dataclass(frozen=True)
class Vehicle:
    """Axle train: loads front first, spacing bounds per gap (equal when fixed)."""

    loads: NDArray[np.float64]
    lo: NDArray[np.float64]
    hi: NDArray[np.float64]

    def offsets(self, spacing: NDArray[np.float64]) -> NDArray[np.float64]:
        """Distance of each axle behind the front axle for the given spacings."""
        return np.concatenate([[0.0], np.cumsum(spacing)])


def _random_case(index: int) -> tuple[dict, Vehicle]:
    """A seeded random member (1-4 spans, maybe hinges) and vehicle (1-7 axles, maybe a range)."""
    rng = np.random.default_rng([SEED, index])
    return _random_member(rng), _random_vehicle(rng)


def _random_member(rng: np.random.Generator) -> dict:
    """Spans, EI, hinges (never a mechanism) and stations per span of a random member."""
    n_spans = int(rng.integers(1, 5))
    spans = np.round(rng.uniform(10.0, 150.0, n_spans), 2)
    member = {
        "spans": spans.tolist(),
        "span_ei": np.round(rng.uniform(0.5, 2.0, n_spans), 3).tolist(),
        "hinges": [],
        "stations_per_span": int(rng.integers(2, 5)),
    }
    if n_spans >= 2 and rng.random() < 0.5:
        ends = np.concatenate([[0.0], np.cumsum(spans)])
        for _ in range(int(rng.integers(1, 3))):
            k = int(rng.integers(0, n_spans))
            hinge = round(float(ends[k] + rng.uniform(0.1, 0.9) * spans[k]), 2)
            if not mechanism_parts(member["spans"], sorted([*member["hinges"], hinge])):
                member["hinges"] = sorted([*member["hinges"], hinge])
    return member


def _random_vehicle(rng: np.random.Generator) -> Vehicle:
    """1-7 axles of 2-40 kip at 4-30 ft; with two or more axles, a ranged gap four times in ten."""
    n_axles = int(rng.integers(1, 8))
    loads = np.round(rng.uniform(2.0, 40.0, n_axles), 1)
    lo = np.round(rng.uniform(4.0, 30.0, n_axles - 1), 2)
    hi = lo.copy()
    if n_axles >= 2 and rng.random() < 0.4:
        g = int(rng.integers(0, n_axles - 1))
        lo[g] = round(float(rng.uniform(4.0, 20.0)), 2)
        hi[g] = round(float(lo[g] + rng.uniform(2.0, 25.0)), 2)
    return Vehicle(loads=loads, lo=lo, hi=hi)


def _group_values(
    il: InfluenceLines, loads: NDArray[np.float64], offsets: NDArray[np.float64], q: NDArray
) -> NDArray[np.float64]:
    """Effects (n_effects, len(q)) of a rigid group whose front axle is at each q.

    ``offsets`` are signed (sigma times the distance behind the front axle);
    axles off the member carry nothing.
    """
    return sum(p * _ordinates(il, q - d) for p, d in zip(loads, offsets, strict=True))


def _ordinates(il: InfluenceLines, x: NDArray[np.float64]) -> NDArray[np.float64]:
    """``il.evaluate`` with exactly nothing off [0, L].

    (``il.evaluate`` accepts positions up to ``POSITION_TOL * L`` outside the
    member and extends the end pieces there; a polished search would exploit it.)
    """
    return np.where((x >= 0.0) & (x <= il.length), il.evaluate(x), 0.0)


def _slope_bound(il: InfluenceLines) -> NDArray[np.float64]:
    """Largest |dIL/dx| of each effect over the member (bounds the grid's sampling error)."""
    h = np.diff(il.breaks)
    c = np.abs(il.coef)
    return (c[..., 1] + 2 * c[..., 2] * h + 3 * c[..., 3] * h * h).max(axis=1)


def _peaks(values: NDArray[np.float64], margin: float) -> NDArray[np.int64]:
    """Grid local maxima within ``margin`` of the best, best first (at most MAX_PEAKS).

    A plateau counts once (its last point).
    """
    padded = np.concatenate([[-np.inf], values, [-np.inf]])
    local = (values >= padded[:-2]) & (values > padded[2:])
    near = local & (values >= values.max() - margin)
    idx = np.flatnonzero(near)
    return idx[np.argsort(-values[idx], kind="stable")][:MAX_PEAKS]


def _point_value(
    il: InfluenceLines,
    e: int,
    loads: NDArray[np.float64],
    offsets: NDArray[np.float64],
    q: float,
) -> float:
    """Effect ``e`` of a rigid group with its front axle at ``q``.

    Evaluates row ``e`` alone, as ``il.evaluate`` does (right limits, cubic in
    ``x - breaks[j]``), because the polishing calls this many thousand times.
    """
    x = q - offsets
    j = np.clip(np.searchsorted(il.breaks, x, side="right") - 1, 0, il.breaks.size - 2)
    t = x - il.breaks[j]
    c = il.coef[e, j]
    y = ((c[:, 3] * t + c[:, 2]) * t + c[:, 1]) * t + c[:, 0]
    return float(loads @ np.where((x >= 0.0) & (x <= il.length), y, 0.0))


def _argpolish(func, q0: float) -> float:
    """Position of the largest value of ``func`` within one step of ``q0`` (bounded Brent).

    The search runs on the offset from ``q0`` so that its relative tolerance acts
    on a small number: the position is found to about 1e-9 of a step.
    """
    res = minimize_scalar(
        lambda u: -func(q0 + u),
        bounds=(-STEP, STEP),
        method="bounded",
        options={"xatol": POLISH_XATOL},
    )
    return q0 + float(res.x) if -float(res.fun) >= func(q0) else q0


def _polish(func, q0: float) -> float:
    """Largest value of ``func`` within one step of ``q0``."""
    return func(_argpolish(func, q0))


def _window_max(values: NDArray[np.float64], width: int) -> NDArray[np.float64]:
    """``out[..., i] = max(values[..., i : i + width])`` (doubling trick, width >= 1)."""
    k, m = 1, values
    while 2 * k <= width:
        m = np.maximum(m[..., :-k], m[..., k:])
        k *= 2
    n_out = values.shape[-1] - width + 1
    return np.maximum(m[..., :n_out], m[..., width - k : width - k + n_out])


class BruteForce:
    """Stepped and polished extremes of one vehicle on one member, one direction at a time."""

    def __init__(self, il: InfluenceLines, vehicle: Vehicle) -> None:
        self.il = il
        self.v = vehicle
        self.length_max = float(np.sum(vehicle.hi))
        self.q = np.arange(
            -self.length_max - 2 * STEP, il.length + self.length_max + 2 * STEP, STEP
        )
        self.margin = 2.5 * STEP * _slope_bound(il)

    def _rigid(self, sigma: int, spacing: NDArray[np.float64], sense: float) -> NDArray:
        """Best of a rigid train, per effect: grid then polish."""
        offsets = sigma * self.v.offsets(spacing)
        loads = self.v.loads
        grid = sense * _group_values(self.il, loads, offsets, self.q)
        best = grid.max(axis=1)
        for e in range(self.il.n_effects):

            def f(q: float, e: int = e) -> float:
                return sense * _point_value(self.il, e, loads, offsets, q)

            for i in _peaks(grid[e], self.margin[e] * loads.sum()):
                best[e] = max(best[e], _polish(f, self.q[i]))
        return best

    def _free(self, sigma: int, gap: int, sense: float) -> NDArray:
        """Best with the ranged gap strictly inside its range: the two groups move apart freely."""
        il, v = self.il, self.v
        front_loads, rear_loads = v.loads[: gap + 1], v.loads[gap + 1 :]
        front_off = sigma * v.offsets(v.lo[:gap])
        rear_off = sigma * v.offsets(v.lo[gap + 1 :])
        own = float(np.sum(v.lo[:gap]))  # front group's own length
        near = int(np.ceil((own + v.lo[gap]) / STEP))
        far = int(np.floor((own + v.hi[gap]) / STEP))
        width = far - near + 1
        best = np.full(il.n_effects, -np.inf)
        if width < 1:
            return best
        f_grid = sense * _group_values(il, front_loads, front_off, self.q)
        g_grid = sense * _group_values(il, rear_loads, rear_off, self.q)
        g_win = _window_max(g_grid, width)  # g_win[:, j] = max g_grid[:, j : j + width]
        n = self.q.size
        # Window of rear-front positions for front index i: [i - far, i - near] (sigma = +1)
        # or [i + near, i + far] (sigma = -1); start index of the window:
        start = np.arange(n) - far if sigma > 0 else np.arange(n) + near
        ok = (start >= 0) & (start < g_win.shape[1])
        total = np.full_like(f_grid, -np.inf)
        total[:, ok] = f_grid[:, ok] + g_win[:, start[ok]]
        for e in range(il.n_effects):

            def front(q: float, e: int = e) -> float:
                return sense * _point_value(il, e, front_loads, front_off, q)

            def rear(q: float, e: int = e) -> float:
                return sense * _point_value(il, e, rear_loads, rear_off, q)

            polished: dict[int, float] = {}  # rear grid index -> polished rear position
            for i in _peaks(total[e], self.margin[e] * v.loads.sum()):
                q1 = _argpolish(front, self.q[i])
                window = g_grid[e, start[i] : start[i] + width]
                for j in _peaks(window, self.margin[e] * rear_loads.sum()):
                    k = int(start[i] + j)
                    if k not in polished:
                        polished[k] = _argpolish(rear, self.q[k])
                    q2 = polished[k]
                    spacing = sigma * (q1 - q2) - own
                    if v.lo[gap] - 1e-9 <= spacing <= v.hi[gap] + 1e-9:
                        best[e] = max(best[e], front(q1) + rear(q2))
        return best

    def extreme(self, sense: float) -> NDArray[np.float64]:
        """Largest (sense=+1) or smallest (sense=-1) value of every effect."""
        v = self.v
        best = np.zeros(self.il.n_effects)  # the train can always be off the member
        ranged = np.flatnonzero(v.hi > v.lo)
        for sigma in (1, -1):
            for spacing in (v.lo, v.hi) if ranged.size else (v.lo,):
                best = np.maximum(best, self._rigid(sigma, spacing, sense))
            for gap in ranged:
                best = np.maximum(best, self._free(sigma, int(gap), sense))
        return sense * best


def _value_at_reported(
    il: InfluenceLines, v: Vehicle, ax: AxleExtremes, sense: float
) -> NDArray[np.float64]:
    """Vehicle effect where the engine says, closest of the one-sided limits to its value."""
    pos = ax.max_position if sense > 0 else ax.min_position
    direction = ax.max_direction if sense > 0 else ax.min_direction
    spacing = ax.max_spacing if sense > 0 else ax.min_spacing
    value = ax.max_value if sense > 0 else ax.min_value
    tol = POSITION_TOL * il.length
    out = np.zeros(il.n_effects)
    for e in range(il.n_effects):
        if value[e] == 0.0:
            continue
        x = pos[e] - direction[e] * v.offsets(spacing[e])
        near = il.breaks[np.abs(il.breaks[None, :] - x[:, None]).argmin(axis=1)]
        x = np.where(np.abs(near - x) <= tol, near, x)  # round-off in x: put it on the break
        right = v.loads * il.evaluate(x, "right")[e]
        left = v.loads * il.evaluate(x, "left")[e]
        # il.evaluate counts a load on an end support as on the member; the limit from
        # outside the member (the axle just leaving it) is 0.
        sides = [np.where(x >= il.length - tol, 0.0, right), np.where(x <= tol, 0.0, left)]
        # Each axle may sit on a jump; the engine's value is one of its one-sided limits.
        options = [
            sum(sides[(mask >> k) & 1][k] for k in range(x.size))
            for mask in range(2 ** min(x.size, 8))
        ]
        out[e] = options[int(np.argmin(np.abs(np.array(options) - value[e])))]
    return out


@pytest.mark.slow
@pytest.mark.parametrize("index", range(N_CASES))
def test_exact_extremes_match_brute_force(index: int) -> None:
    member, vehicle = _random_case(index)
    il = influence_lines(**member)
    ax = axle_extremes(il, AxleTrain.of(vehicle.loads, vehicle.lo, vehicle.hi))
    brute = BruteForce(il, vehicle)
    scale = il.effect_scale * vehicle.loads.sum()
    for sense, engine in ((1.0, ax.max_value), (-1.0, ax.min_value)):
        found = brute.extreme(sense)
        # Never exceeded by any stepped or polished position ...
        assert np.all(sense * (found - engine) <= REL_TOL_EXACT * scale), (member, vehicle)
        # ... and reached by the polished search.
        assert np.all(np.abs(found - engine) <= REL_TOL_EXACT * scale), (member, vehicle)
        reproduced = _value_at_reported(il, vehicle, ax, sense)
        assert np.all(np.abs(reproduced - engine) <= REL_TOL_EXACT * scale), (member, vehicle)
        spacing = ax.max_spacing if sense > 0 else ax.min_spacing
        assert np.all(spacing >= vehicle.lo - 1e-9)
        assert np.all(spacing <= vehicle.hi + 1e-9)


def test_single_axle_extreme_with_a_hinge_just_left_of_a_station() -> None:
    # One unit axle: its extreme is the influence line's own extreme (definition), here
    # found by the stepped and polished search. Spans 10, 10, 11.16, 10 (EI 0.5), hinge
    # at 22.23, 5 stations per span: station 22.232 lies 0.002 ft right of the hinge.
    il = influence_lines([10.0, 10.0, 11.16, 10.0], [0.5] * 4, [22.23], 5)
    one = Vehicle(loads=np.array([1.0]), lo=np.empty(0), hi=np.empty(0))
    ax = axle_extremes(il, AxleTrain.of([1.0]))
    brute = BruteForce(il, one)
    scale = il.effect_scale
    assert np.all(np.abs(brute.extreme(1.0) - ax.max_value) <= REL_TOL_EXACT * scale)
    assert np.all(np.abs(brute.extreme(-1.0) - ax.min_value) <= REL_TOL_EXACT * scale)


@pytest.mark.slow
@pytest.mark.parametrize("index", range(N_FLEETS))
def test_a_whole_fleet_in_one_call_matches_brute_force(index: int) -> None:
    # A run hands a member's whole fleet to the compiled kernel at once: the rigid trains
    # swept together, then every ranged train's rigid range ends and free chains. Each
    # vehicle's row must hold the extremes the brute-force search finds for it alone
    # (stepped and polished, see the module docstring; common practice), and its vehicle
    # at the reported position, direction and (for a ranged train) spacing must give the
    # reported value, evaluated axle by axle from the influence line (_value_at_reported).
    # A ranged vehicle's row must also equal the one-vehicle sweep's.
    rng = np.random.default_rng([SEED, N_CASES + index])
    member = _random_member(rng)
    fleet = [_random_vehicle(rng) for _ in range(FLEET_SIZE)]
    il = influence_lines(**member)
    cases = [
        LoadCase(label=f"vehicle {i}", train=AxleTrain.of(v.loads, v.lo, v.hi))
        for i, v in enumerate(fleet)
    ]
    found = fleet_extremes_of(il, cases)
    width = max(int(np.sum(v.hi > v.lo)) for v in fleet)
    assert found.max_spacing.shape == found.min_spacing.shape == (*found.max_value.shape, width)
    for row, vehicle in enumerate(fleet):
        brute = BruteForce(il, vehicle)
        scale = il.effect_scale * vehicle.loads.sum()
        alone = axle_extremes(il, AxleTrain.of(vehicle.loads, vehicle.lo, vehicle.hi))
        ranged = np.flatnonzero(vehicle.hi > vehicle.lo)
        spacings = {}
        for name, reported in (("max", found.max_spacing[row]), ("min", found.min_spacing[row])):
            # A ranged gap's row holds its spacing (within its range) wherever an axle
            # gives the extreme; past the train's own ranged gaps, and for a fixed train,
            # NaN.
            assert np.all(np.isnan(reported[:, ranged.size :]))
            value = getattr(found, f"{name}_value")[row]
            moved = getattr(found, f"{name}_direction")[row] != 0
            used = np.tile(vehicle.lo, (il.n_effects, 1))
            used[:, ranged] = reported[:, : ranged.size]
            assert np.all(np.isfinite(used[moved])), row
            assert np.all(used[moved] >= vehicle.lo - 1e-9), row
            assert np.all(used[moved] <= vehicle.hi + 1e-9), row
            assert np.all(moved | (value == 0.0)), row
            spacings[name] = used
        row_extremes = AxleExtremes(
            max_value=found.max_value[row],
            max_position=found.max_position[row],
            max_direction=found.max_direction[row],
            max_spacing=spacings["max"],
            min_value=found.min_value[row],
            min_position=found.min_position[row],
            min_direction=found.min_direction[row],
            min_spacing=spacings["min"],
        )
        for sense, engine, one in (
            (1.0, row_extremes.max_value, alone.max_value),
            (-1.0, row_extremes.min_value, alone.min_value),
        ):
            assert np.all(np.abs(brute.extreme(sense) - engine) <= REL_TOL_EXACT * scale), row
            assert np.all(np.abs(one - engine) <= REL_TOL_EXACT * scale), row
            reproduced = _value_at_reported(il, vehicle, row_extremes, sense)
            assert np.all(np.abs(reproduced - engine) <= REL_TOL_EXACT * scale), row


def test_a_fleet_reports_the_spacing_of_each_ranged_gap() -> None:
    # Two ranged gaps with a fixed one between them (a permit-like train), beside an
    # HL-93-like truck (AASHTO LRFD 3.6.1.2.2: 14 ft, then 14 to 30 ft) and a fixed train,
    # on three unequal spans. Each extreme's row of spacings holds one place per ranged
    # gap, front to rear; the train placed at the reported position, direction and
    # spacings gives the reported value, evaluated axle by axle (_value_at_reported).
    il = influence_lines([60.0, 80.0, 60.0], [1.0, 1.0, 1.0], (), 10)
    fleet = [
        Vehicle(loads=np.array([8.0, 32.0, 32.0]), lo=np.array([14.0, 14.0]),
                hi=np.array([14.0, 30.0])),
        Vehicle(loads=np.array([12.0, 30.0, 30.0, 25.0]), lo=np.array([10.0, 4.0, 12.0]),
                hi=np.array([24.0, 4.0, 40.0])),
        Vehicle(loads=np.array([10.0, 20.0]), lo=np.array([12.0]), hi=np.array([12.0])),
    ]  # fmt: skip
    cases = [
        LoadCase(label=f"vehicle {i}", train=AxleTrain.of(v.loads, v.lo, v.hi))
        for i, v in enumerate(fleet)
    ]
    found = fleet_extremes_of(il, cases)
    assert found.max_spacing.shape == (3, il.n_effects, 2)
    assert np.all(np.isnan(found.max_spacing[0, :, 1]))
    assert np.all(np.isnan(found.max_spacing[2])) and np.all(np.isnan(found.min_spacing[2]))
    for row, vehicle in enumerate(fleet):
        ranged = np.flatnonzero(vehicle.hi > vehicle.lo)
        used = {}
        for name in ("max", "min"):
            full = np.tile(vehicle.lo, (il.n_effects, 1))
            full[:, ranged] = getattr(found, f"{name}_spacing")[row][:, : ranged.size]
            used[name] = full
        row_extremes = AxleExtremes(
            max_value=found.max_value[row],
            max_position=found.max_position[row],
            max_direction=found.max_direction[row],
            max_spacing=used["max"],
            min_value=found.min_value[row],
            min_position=found.min_position[row],
            min_direction=found.min_direction[row],
            min_spacing=used["min"],
        )
        scale = il.effect_scale * vehicle.loads.sum()
        for sense, engine in ((1.0, found.max_value[row]), (-1.0, found.min_value[row])):
            reproduced = _value_at_reported(il, vehicle, row_extremes, sense)
            assert np.all(np.abs(reproduced - engine) <= REL_TOL_EXACT * scale), row
    # The free spacing is used: somewhere a ranged gap governs strictly inside its range
    # (here the first gap of the permit-like train, for some hogging moments and shears).
    both = np.concatenate([found.max_spacing[1], found.min_spacing[1]])
    inside = (both > fleet[1].lo[[0, 2]] + 1e-6) & (both < fleet[1].hi[[0, 2]] - 1e-6)
    assert inside.any()


def test_one_fleet_on_many_members_is_packed_once_and_answers_as_if_fresh() -> None:
    # A run hands every member the same tuple of load cases, and the trains are laid out
    # for the kernel once: a member shorter than a range's upper end caps that range at
    # its length and gets its own layout. Every member's extremes, whichever way they
    # were laid out, must equal those of the same cases handed over afresh (a list).
    fleet = (
        LoadCase(label="ranged", train=AxleTrain.of((8.0, 32.0, 32.0), (14.0, 14.0), (14.0, 30.0))),
        LoadCase(label="long range", train=AxleTrain.of((20.0, 20.0), (4.0,), (45.0,))),
        LoadCase(label="fixed", train=AxleTrain.of((10.0, 20.0), (12.0,))),
        LoadCase(label="one axle", train=AxleTrain.of((25.0,), ())),
    )
    members = [([60.0, 80.0, 60.0], 10), ([30.0], 8), ([40.0, 40.0], 6), ([90.0], 12)]
    for spans, stations in members + members[::-1]:
        il = influence_lines(spans, [1.0] * len(spans), (), stations)
        shared = fleet_extremes_of(il, fleet)
        fresh = fleet_extremes_of(il, list(fleet))
        for name in ("value", "position", "direction", "spacing"):
            for sense in ("max", "min"):
                got = getattr(shared, f"{sense}_{name}")
                want = getattr(fresh, f"{sense}_{name}")
                assert np.array_equal(got, want, equal_nan=True), (spans, sense, name)
