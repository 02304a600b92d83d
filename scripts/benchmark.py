"""Benchmark: a seeded synthetic inventory against a seeded fleet, end to end.

    python scripts/benchmark.py                    # 1,000 members x 300 vehicles
    python scripts/benchmark.py --members 200 --vehicles 50   # a quick look

The synthetic members are rated (:func:`batch.demo.synthetic.rated`: bridges, dead
loads, resistances at three stations of every member, a fleet of legal loads and
permits of every kind); ``--no-rating`` runs envelopes only.
It writes an input workbook, runs ``spanfleet run`` on it as a user would
(a separate process, timed from start to finish), and prints the time per
member-vehicle pair, effects per second and the run's peak memory, then runs a
quarter of the inventory to show that peak memory does not grow with members.
The run's CPU time (its worker processes' included) is set against the kernel's
alone on the same members and fleet (timed here on a sample of the members), to
show how much of a run is spent outside the kernel.

Shared computers are noisy and only a ratio measured side by side means
anything, so two baselines are timed in the same run, on a sample of the same
pairs, and each one's shortfall below the exact extremes is printed:

* the quick script: a Python loop over front-axle positions every 0.5 ft, in
  both directions, numpy for each position, ranged spacings stepped every 1 ft;
* a competent vectorised one: each member's influence lines sampled once on a
  0.5 ft grid, each axle's contribution a shifted copy of the samples (spacings
  to the nearest 0.5 ft) added with numpy for every front-axle position of a
  vehicle at once, both directions, ranged spacings every 0.5 ft.

It also times the compiled kernel alone (best of five rounds): on the scale
issue's reference case (a 60-80-60 ft member, a three-axle truck) and on the
three-span members against the whole benchmark fleet (CPU time of one core).
Beside each it prints a bound: the time the kernel's essential work (see
``kernel_work`` and ``OPS_PER_LINE_EVENT``) would take at this machine's
arithmetic throughput, measured in the same run with two small compiled loops
(``throughput``): one the compiler cannot vectorise (each line's sweep is a
recurrence along its events) and one it does (the lines are independent, so a
sweep could hold them in vector lanes). The kernel cannot beat the first; the
second is the floor no code on this machine could go below.

Nothing here is a test: it prints figures and asserts nothing.
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable
from pathlib import Path

import numba as nb
import numpy as np

from batch.demo.synthetic import rated, synthetic_case
from batch.engine.envelope import member_influence
from batch.engine.influence import InfluenceLines, influence_lines
from batch.engine.moving import FleetExtremes, fleet_extremes_of
from batch.loads.cases import LoadCase
from batch.loads.fleet import fleet_cases
from batch.model import AxleTrain, Case, Vehicle
from batch.model.layout import POSITION_TOL
from batch.rating.assess import AssessmentPlan
from batch.writing.template import write_case_workbook

STEP = 0.5  # ft, the baselines' front-axle step (the vectorised one's grid)
RANGE_STEP = 1.0  # ft, the quick baseline's step through a ranged spacing

#: Floating-point operations a sweep cannot do without, per line and axle crossing a
#: break: the Taylor shift of the line's cubic to the event (value 6, slope 5,
#: curvature 1), the crossing axle's jump (4 multiply-adds, 8) and the comparison of
#: the two one-sided limits there with the largest and smallest value so far (4).
OPS_PER_LINE_EVENT = 24
#: ... per stationary point solved: the derivative's quadratic (about 12, with a square
#: root and two divisions) and the cubic's value there (6), counted at 20.
OPS_PER_SOLVE = 20


def quick_baseline(il: InfluenceLines, vehicle: Vehicle) -> tuple[np.ndarray, np.ndarray]:
    """The quick script: front axle every STEP in both directions, ranges every RANGE_STEP."""
    lows = np.array([s.low for s in vehicle.spacings])
    highs = np.array([s.high for s in vehicle.spacings])
    choices = [
        np.arange(lo, hi + 1e-9, RANGE_STEP) if hi > lo else [lo]
        for lo, hi in zip(lows, highs, strict=True)
    ]
    grids = np.meshgrid(*choices, indexing="ij") if choices else []
    best = np.zeros(il.n_effects)
    worst = np.zeros(il.n_effects)
    for combo in zip(*(g.ravel() for g in grids), strict=True) if choices else [()]:
        offsets = np.concatenate([[0.0], np.cumsum(combo)])
        front = np.arange(-offsets[-1], il.length + offsets[-1] + STEP, STEP)
        for sigma in (1.0, -1.0):
            total = np.zeros((il.n_effects, front.size))
            for p, d in zip(vehicle.axle_loads, offsets, strict=True):
                total += p * il.evaluate(front - sigma * d)
            best = np.maximum(best, total.max(axis=1))
            worst = np.minimum(worst, total.min(axis=1))
    return best, worst


def grid_samples(il: InfluenceLines) -> np.ndarray:
    """Every influence line sampled every STEP from the left end (n_effects, points)."""
    return il.evaluate(np.arange(int(il.length / STEP) + 1) * STEP)


def grid_baseline(samples: np.ndarray, vehicle: Vehicle) -> tuple[np.ndarray, np.ndarray]:
    """The vectorised baseline on a member's ``grid_samples``: shifted copies, all positions.

    Axle k of a train whose front axle is at grid point m stands at grid point
    m - sigma * s_k, s_k its offset in grid steps (rounded); the samples padded
    with zeros on both sides (off the member) give every front-axle position of
    a direction as one weighted sum of shifted copies.
    """
    n_eff, n = samples.shape
    lows = [s.low for s in vehicle.spacings]
    highs = [s.high for s in vehicle.spacings]
    choices = [
        np.arange(lo, hi + 1e-9, STEP) if hi > lo else np.array([lo])
        for lo, hi in zip(lows, highs, strict=True)
    ]
    grids = np.meshgrid(*choices, indexing="ij") if choices else []
    best = np.zeros(n_eff)
    worst = np.zeros(n_eff)
    for combo in zip(*(g.ravel() for g in grids), strict=True) if choices else [()]:
        shifts = np.rint(np.concatenate([[0.0], np.cumsum(combo)]) / STEP).astype(int)
        span = int(shifts[-1])
        padded = np.zeros((n_eff, n + 2 * span))
        padded[:, span : span + n] = samples
        width = n + span  # front-axle positions with some axle on the member
        for starts in (span - shifts, shifts):  # left to right, then right to left
            total = np.zeros((n_eff, width))
            for p, a in zip(vehicle.axle_loads, starts, strict=True):
                total += p * padded[:, a : a + width]
            best = np.maximum(best, total.max(axis=1))
            worst = np.minimum(worst, total.min(axis=1))
    return best, worst


@nb.njit(cache=True)
def _scalar_loop(x: np.ndarray, rounds: int) -> float:
    # Twelve independent multiply-add chains (each a recurrence: not vectorised), enough
    # to keep the multiply and add units busy through their latency.
    a0 = a1 = a2 = a3 = a4 = a5 = a6 = a7 = a8 = a9 = a10 = a11 = 1.0
    for _ in range(rounds):
        for i in range(x.size):
            v = x[i]
            a0 = a0 * 0.999999 + v
            a1 = a1 * 0.999998 + v
            a2 = a2 * 0.999997 + v
            a3 = a3 * 0.999996 + v
            a4 = a4 * 0.999995 + v
            a5 = a5 * 0.999994 + v
            a6 = a6 * 0.999993 + v
            a7 = a7 * 0.999992 + v
            a8 = a8 * 0.999991 + v
            a9 = a9 * 0.999990 + v
            a10 = a10 * 0.999989 + v
            a11 = a11 * 0.999988 + v
    return a0 + a1 + a2 + a3 + a4 + a5 + a6 + a7 + a8 + a9 + a10 + a11


@nb.njit(cache=True)
def _vector_loop(x: np.ndarray, y: np.ndarray, rounds: int) -> float:
    # Four multiply-adds per element of contiguous arrays (vectorised by the compiler;
    # independent across elements, so the units stay busy).
    for _ in range(rounds):
        for i in range(x.size):
            v = x[i]
            y[i] = (((y[i] * 0.999999 + v) * 0.999998 + v) * 0.999997 + v) * 0.999996 + v
    return y[0]


def throughput() -> tuple[float, float]:
    """This machine's floating-point operations per nanosecond: scalar, then vector.

    Each loop runs on arrays that stay in the first-level cache; best of five.
    """
    x = np.full(1024, 1e-3)
    y = np.zeros(1024)
    rounds = 4000
    scalar = _best_time(lambda: _scalar_loop(x, rounds)) * 1e3
    vector = _best_time(lambda: _vector_loop(x, y, rounds)) * 1e3
    return 24 * x.size * rounds / scalar, 8 * x.size * rounds / vector


def kernel_work(il: InfluenceLines, cases: list[LoadCase], found: FleetExtremes) -> tuple[int, int]:
    """The essential work of the kernel on one member and fleet: (line-events, solves).

    A line-event is one line and one axle crossing one of that line's breaks,
    in one direction, for every rigid way the kernel sweeps a train (a train
    with n ranged spacings is swept 3**n ways, each end of each range and
    free; a free one as its groups, which together have the train's axles).
    Only the lines that need a sweep count: not one that is zero everywhere or
    equals another (see ``SweepPlan``).
    Solves are the extremes ``found`` that lie between events, where a
    stationary point must be solved for at least once: a lower bound, counted
    for the rigid trains only.
    """
    breaks, counts, _ = il.reduced
    plan = il.plan
    swept_breaks = int((np.diff(plan.bundle_start) * plan.counts).sum())
    tol = POSITION_TOL * il.length
    line_events = 0
    solves = 0
    for row, case in enumerate(cases):
        train = case.train
        ranged = sum(hi > lo for lo, hi in zip(train.low, train.high, strict=True))
        line_events += 2 * 3**ranged * len(train.loads) * swept_breaks
        if ranged:
            continue
        offsets = np.concatenate([[0.0], np.cumsum(train.low)])
        for position, direction in (
            (found.max_position[row], found.max_direction[row]),
            (found.min_position[row], found.min_direction[row]),
        ):
            for e in np.flatnonzero(np.isfinite(position)):
                events = breaks[e, : counts[e], None] + direction[e] * offsets[None, :]
                solves += bool(np.abs(events - position[e]).min() > tol)
    return line_events, solves


def _end_to_end(case: Case, jobs: int | None) -> tuple[float, float, float]:
    """Seconds, CPU seconds (its workers' too) and peak memory (MB) of ``spanfleet run``.

    Run on ``case`` as a user runs it.
    """
    with tempfile.TemporaryDirectory() as tmp:
        book = Path(tmp) / "synthetic-inventory.xlsx"
        write_case_workbook(case, book)
        command = [sys.executable, "-m", "batch", "run", str(book)]
        command += ["--out", str(Path(tmp) / "out.xlsx")]
        if jobs is not None:
            command += ["--jobs", str(jobs)]
        log = Path(tmp) / "run.log"
        with log.open("w") as out:
            start = time.perf_counter()
            child = subprocess.Popen(command, stdout=out, stderr=subprocess.STDOUT)
            # wait4 gives this child's own peak (with its worker processes), not the
            # largest of every child so far.
            _, status, usage = os.wait4(child.pid, 0)
            elapsed = time.perf_counter() - start
            child.returncode = os.waitstatus_to_exitcode(status)
        if child.returncode != 0:
            raise SystemExit(f"spanfleet run failed:\n{log.read_text()}")
    return elapsed, usage.ru_utime + usage.ru_stime, usage.ru_maxrss / 1024


def kernel_seconds(case: Case, cases: list[LoadCase], every: int) -> float:
    """CPU seconds the kernel would take on the whole inventory, from every ``every``-th member.

    Each sampled member's stations are those of the run (its rated sections added) and its
    whole fleet goes in one call, as in a run.
    """
    plan = AssessmentPlan.of(case)
    settings = case.settings
    sampled = case.members[::every]
    ils = [
        member_influence(m, settings.stations_per_span, () if plan is None else plan.sections(m))
        for m in sampled
    ]
    fleet_extremes_of(ils[0], cases)  # compiled and warm outside the timing
    start = time.process_time()
    for il in ils:
        fleet_extremes_of(il, cases)
    return (time.process_time() - start) * len(case.members) / len(sampled)


def _best_time(work: Callable[[], object], rounds: int = 5) -> float:
    """Fastest of a few timed rounds of ``work``, in microseconds of this process's CPU time.

    (The machine is shared: CPU time leaves out the time other processes hold the core.)
    """
    work()  # compile and warm the caches outside the timing
    best = np.inf
    for _ in range(rounds):
        start = time.process_time()
        work()
        best = min(best, time.process_time() - start)
    return best * 1e6


def _shortfall(exact: FleetExtremes, best: np.ndarray, worst: np.ndarray) -> float:
    """How far a baseline's extremes fall below the exact ones, relative to the largest."""
    scale = np.maximum(np.abs(exact.max_value[0]), np.abs(exact.min_value[0])).max()
    low = np.concatenate([exact.max_value[0] - best, worst - exact.min_value[0]])
    return float(low.max() / scale)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--members", type=int, default=1000)
    parser.add_argument("--vehicles", type=int, default=300)
    parser.add_argument("--seed", type=int, default=2026)
    parser.add_argument("--sample", type=int, default=40, help="pairs timed for the baselines")
    parser.add_argument("--jobs", type=int, default=None, help="passed to spanfleet run")
    parser.add_argument(
        "--no-rating", action="store_true", help="envelopes only: no bridges, capacities"
    )
    args = parser.parse_args(argv)

    def inventory(members: int) -> Case:
        case = synthetic_case(members, args.vehicles, args.seed)
        return case if args.no_rating else rated(case, args.seed)

    case = inventory(args.members)
    pairs = len(case.members) * len(case.vehicles)
    settings = case.settings
    elapsed, cpu, peak_mb = _end_to_end(case, args.jobs)
    # The same fleet on a quarter of the inventory: peak memory should not grow with members.
    small = inventory(max(1, args.members // 4))
    _, _, small_peak_mb = _end_to_end(small, args.jobs)

    # Kernel alone, three-span members, every vehicle (fixed and ranged), both directions,
    # the whole fleet in one call per member as in a run.
    cases = tuple(fleet_cases(case.vehicles, settings))  # as a run hands them over
    every = max(1, len(case.members) // 100)
    in_kernel = kernel_seconds(case, cases, every)
    three = [m for m in case.members if len(m.spans) == 3][:20]
    ils = [member_influence(m, settings.stations_per_span) for m in three]
    kernel_us = _best_time(lambda: [fleet_extremes_of(il, cases) for il in ils]) / (
        len(ils) * len(cases)
    )
    work = np.sum([kernel_work(il, cases, fleet_extremes_of(il, cases)) for il in ils], axis=0)
    work = work / (len(ils) * len(cases))
    axles = np.mean([len(c.train.loads) for c in cases])
    ranged = np.mean([c.train.high != c.train.low for c in cases])
    effects_3 = ils[0].n_effects
    # The reference case of the scale issue: a 60-80-60 ft member and a three-axle truck
    # (8, 32, 32 kip at 14 ft), both directions, at the run's stations per span; 100 such
    # pairs per call, as a run hands a member's whole fleet to the kernel at once.
    # The vectorised baseline on the same members, every tenth vehicle: one core each.
    grid_members = [grid_samples(il) for il in ils]  # once per member: not timed
    start = time.process_time()
    for samples in grid_members:
        for vehicle in case.vehicles[::10]:
            grid_baseline(samples, vehicle)
    grid_three_us = (time.process_time() - start) * 1e6 / (len(ils) * len(case.vehicles[::10]))
    reference = influence_lines([60.0, 80.0, 60.0], stations_per_span=settings.stations_per_span)
    truck = [LoadCase(label="", train=AxleTrain.of((8.0, 32.0, 32.0), (14.0, 14.0)))]
    reference_us = _best_time(lambda: fleet_extremes_of(reference, truck * 100)) / 100
    reference_work = np.array(kernel_work(reference, truck, fleet_extremes_of(reference, truck)))
    scalar_rate, vector_rate = throughput()

    # Baselines on a sample of pairs, with the exact extremes of the same pairs.
    rng = np.random.default_rng(args.seed + 1)
    sample = [
        (
            case.members[int(rng.integers(len(case.members)))],
            case.vehicles[int(rng.integers(len(case.vehicles)))],
        )
        for _ in range(args.sample)
    ]
    quick_time = grid_time = 0.0
    quick_short = grid_short = 0.0
    for member, vehicle in sample:
        il = member_influence(member, settings.stations_per_span)
        samples = grid_samples(il)  # once per member, for all its vehicles: not timed
        exact = fleet_extremes_of(
            il,
            [
                LoadCase(
                    label="",
                    train=AxleTrain.of(
                        vehicle.axle_loads,
                        tuple(s.low for s in vehicle.spacings),
                        tuple(s.high for s in vehicle.spacings),
                    ),
                )
            ],
        )
        start = time.process_time()
        found = quick_baseline(il, vehicle)
        quick_time += time.process_time() - start
        quick_short = max(quick_short, _shortfall(exact, *found))
        start = time.process_time()
        found = grid_baseline(samples, vehicle)
        grid_time += time.process_time() - start
        grid_short = max(grid_short, _shortfall(exact, *found))
    quick_per_pair = quick_time / len(sample)
    grid_per_pair = grid_time / len(sample)
    per_pair = elapsed / pairs
    effects = sum(
        2 * member_influence(m, settings.stations_per_span).n_effects for m in case.members
    ) * len(case.vehicles)

    def bound(line_events: float, solves: float) -> str:
        """The essential work's time at vector and at scalar throughput, in microseconds."""
        ops = line_events * OPS_PER_LINE_EVENT
        solve_us = solves * OPS_PER_SOLVE / scalar_rate / 1e3
        return (
            f"{line_events:,.0f} line-events, {solves:.1f} solves: "
            f"{ops / vector_rate / 1e3 + solve_us:.1f} us at vector throughput, "
            f"{ops / scalar_rate / 1e3 + solve_us:.1f} us at scalar"
        )

    print(
        f"inventory            {len(case.members)} members, "
        f"{len(case.vehicles)} vehicles, {pairs} pairs"
    )
    print(
        "rating               off (envelopes only)"
        if args.no_rating
        else f"rating               on: {len(case.capacities)} Capacities rows, "
        f"{len(case.bridges)} bridges, legal loads and permits of every kind"
    )
    print(f"end to end           {elapsed:.1f} s  ({per_pair * 1e6:.0f} us per pair)")
    print(f"effects per second   {effects / elapsed:,.0f}  (max and min of every line)")
    print(
        f"outside the kernel   {1 - in_kernel / cpu:.0%} of the run's CPU time "
        f"({cpu:.1f} s, workers included; the kernel's {in_kernel:.1f} s timed apart on one "
        f"member in {every}; target <= 25%)"
    )
    print(
        f"peak memory          {peak_mb:.0f} MB (the spanfleet process); "
        f"{small_peak_mb:.0f} MB with a quarter of the members"
    )
    print(
        f"kernel, 60-80-60 ft  {reference_us:.1f} us per pair with a 3-axle truck "
        f"({reference.n_effects} lines, both directions; target <= 15)"
    )
    print(f"  its bound          {bound(*reference_work)}")
    print(
        f"kernel, three spans  {kernel_us:.0f} us per pair with the benchmark fleet "
        f"({effects_3} lines, both directions; {axles:.1f} axles on average, "
        f"{ranged:.0%} with ranged spacings; target <= 50)"
    )
    print(f"  its bound          {bound(*work)} (per pair)")
    print(
        f"  same pairs         {grid_three_us / 1e3:.2f} ms per pair by the vectorised baseline "
        f"(every tenth vehicle): the kernel {grid_three_us / kernel_us:.0f} x faster"
    )
    print(
        f"arithmetic           {scalar_rate:.1f} operations per ns scalar, "
        f"{vector_rate:.1f} vectorised (this machine, this run)"
    )
    print(
        f"quick baseline       {quick_per_pair * 1e3:.1f} ms per pair on {len(sample)} sampled "
        f"pairs, up to {quick_short:.2%} below the exact extremes; spanfleet "
        f"{quick_per_pair / per_pair:,.0f} x faster end to end (target >= 1,000)"
    )
    print(
        f"vectorised baseline  {grid_per_pair * 1e3:.2f} ms per pair on the same pairs, "
        f"up to {grid_short:.2%} below the exact extremes; spanfleet "
        f"{grid_per_pair / per_pair:,.0f} x faster end to end (target >= 20)"
    )
    estimate = per_pair * 10_000 * 500 / 60
    print(f"10,000 x 500 at this rate: about {estimate:.0f} min")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
