"""Benchmark: a seeded synthetic inventory against a seeded fleet, end to end.

    python scripts/benchmark.py                    # 1,000 members x 300 vehicles
    python scripts/benchmark.py --members 200 --vehicles 50   # a quick look

The synthetic members are rated (:func:`batch.demo.synthetic.rated`: bridges, dead
loads, resistances at three stations of every member, a fleet of legal loads and
permits of every kind); ``--no-rating`` runs envelopes only.
It writes an input workbook, runs ``spanfleet run`` on it as a user would
(a separate process, timed from start to finish), and prints the time per
member-vehicle pair, effects per second and the run's peak memory, then runs a
quarter of the inventory to show that peak memory does not grow with members. In
the same run it times a naive baseline on a sample of the same pairs — the front
axle stepped every 0.5 ft in both directions with numpy, ranged spacings stepped
every 1 ft — and prints the speed ratio, because shared computers are noisy and
only a ratio measured side by side means anything. It also times the compiled
kernel alone (best of five rounds): on the scale issue's reference case (a
60-80-60 ft member, a three-axle truck) and on the three-span members against the
whole benchmark fleet, and reports how far below the exact extremes the
baseline's stepping falls (its unsafe-side error).

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

import numpy as np

from batch.demo.synthetic import rated, synthetic_case
from batch.engine.envelope import member_influence
from batch.engine.influence import InfluenceLines, influence_lines
from batch.engine.moving import fleet_extremes_of
from batch.loads.cases import LoadCase
from batch.loads.fleet import fleet_cases
from batch.model import AxleTrain, Case, Vehicle
from batch.writing.template import write_case_workbook

STEP = 0.5  # ft, the baseline's front-axle step
RANGE_STEP = 1.0  # ft, the baseline's step through a ranged spacing


def baseline_extremes(il: InfluenceLines, vehicle: Vehicle) -> tuple[np.ndarray, np.ndarray]:
    """Naive stepping: front axle every STEP in both directions, ranges every RANGE_STEP."""
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


def _end_to_end(case: Case, jobs: int | None) -> tuple[float, float]:
    """Seconds and peak memory (MB) of ``spanfleet run`` on ``case``, as a user runs it."""
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
    return elapsed, usage.ru_maxrss / 1024


def _best_time(work: Callable[[], object], rounds: int = 5) -> float:
    """Fastest of a few timed rounds of ``work``, in microseconds (the machine is shared)."""
    work()  # compile and warm the caches outside the timing
    best = np.inf
    for _ in range(rounds):
        start = time.perf_counter()
        work()
        best = min(best, time.perf_counter() - start)
    return best * 1e6


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--members", type=int, default=1000)
    parser.add_argument("--vehicles", type=int, default=300)
    parser.add_argument("--seed", type=int, default=2026)
    parser.add_argument("--sample", type=int, default=40, help="pairs timed for the baseline")
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
    elapsed, peak_mb = _end_to_end(case, args.jobs)
    # The same fleet on a quarter of the inventory: peak memory should not grow with members.
    small = inventory(max(1, args.members // 4))
    _, small_peak_mb = _end_to_end(small, args.jobs)

    # Kernel alone, three-span members, every vehicle (fixed and ranged), both directions,
    # the whole fleet in one call per member as in a run.
    cases = fleet_cases(case.vehicles, settings)
    three = [m for m in case.members if len(m.spans) == 3][:20]
    ils = [member_influence(m, settings.stations_per_span) for m in three]
    kernel_us = _best_time(lambda: [fleet_extremes_of(il, cases) for il in ils]) / (
        len(ils) * len(cases)
    )
    axles = np.mean([len(c.train.loads) for c in cases])
    ranged = np.mean([c.train.high != c.train.low for c in cases])
    effects_3 = ils[0].n_effects
    # The reference case of the scale issue: a 60-80-60 ft member and a three-axle truck
    # (8, 32, 32 kip at 14 ft), both directions, at the run's stations per span; 100 such
    # pairs per call, as a run hands a member's whole fleet to the kernel at once.
    reference = influence_lines([60.0, 80.0, 60.0], stations_per_span=settings.stations_per_span)
    truck = [LoadCase(label="", train=AxleTrain.of((8.0, 32.0, 32.0), (14.0, 14.0), (14.0, 14.0)))]
    reference_us = _best_time(lambda: fleet_extremes_of(reference, truck * 100)) / 100

    # Baseline on a sample of pairs, with the exact extremes of the same pairs.
    rng = np.random.default_rng(args.seed + 1)
    sample = [
        (
            case.members[int(rng.integers(len(case.members)))],
            case.vehicles[int(rng.integers(len(case.vehicles)))],
        )
        for _ in range(args.sample)
    ]
    shortfall = 0.0
    base_time = 0.0
    for member, vehicle in sample:
        il = member_influence(member, settings.stations_per_span)
        start = time.perf_counter()
        best, worst = baseline_extremes(il, vehicle)
        base_time += time.perf_counter() - start
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
        scale = np.maximum(np.abs(exact.max_value[0]), np.abs(exact.min_value[0])).max()
        low = np.concatenate([exact.max_value[0] - best, worst - exact.min_value[0]])
        shortfall = max(shortfall, float(low.max() / scale))
    base_per_pair = base_time / len(sample)
    per_pair = elapsed / pairs
    effects = sum(
        2 * member_influence(m, settings.stations_per_span).n_effects for m in case.members
    ) * len(case.vehicles)

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
        f"peak memory          {peak_mb:.0f} MB (the spanfleet process); "
        f"{small_peak_mb:.0f} MB with a quarter of the members"
    )
    print(
        f"kernel, 60-80-60 ft  {reference_us:.1f} us per pair with a 3-axle truck "
        f"({reference.n_effects} lines, both directions; target <= 35)"
    )
    print(
        f"kernel, three spans  {kernel_us:.0f} us per pair with the benchmark fleet "
        f"({effects_3} lines, both directions; {axles:.1f} axles on average, "
        f"{ranged:.0%} with ranged spacings)"
    )
    print(
        f"baseline (0.5 ft)    {base_per_pair * 1e3:.1f} ms per pair on {len(sample)} sampled pairs"
    )
    print(f"speed ratio          {base_per_pair / per_pair:.0f} x the baseline's speed, end to end")
    print(f"baseline shortfall   up to {shortfall:.2%} of the effect below the exact extreme")
    estimate = per_pair * 10_000 * 500 / 60
    print(f"10,000 x 500 at this rate: about {estimate:.0f} min")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
