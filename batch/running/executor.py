"""Run a validated case: the fleet's load cases over every member, in chunks.

The fleet is expanded to load cases once (:func:`batch.loads.fleet.fleet_cases`).
Members are then analysed in chunks — serially, on local worker processes, or on
a Dask cluster — and each member's result is identical whichever way it ran. A
member's result is its envelope (:func:`batch.engine.envelope_of`), its
per-vehicle peaks (for every vehicle, the extreme M max, M min, V max, V min,
R max and R min over all stations and supports) and, when the case asks for it,
its load rating and screening (:mod:`batch.rating.assess`), computed in the same worker
from the same load-case effects, and, when the fleet has a fatigue load, its moment
ranges (:mod:`batch.engine.fatigue`).

With a :class:`~batch.running.store.CheckpointStore`, every finished member is written to
it as soon as its chunk returns, and members already there from an interrupted
run of the same input are not computed again.

Units and sign conventions are those of the engine and docs/workbook.md
(sagging moment positive, V = sum of the upward forces left of the section,
reactions upward positive).
"""

from __future__ import annotations

import math
import multiprocessing
import os
import time
import warnings
from collections.abc import Callable, Iterator, Sequence
from concurrent.futures import FIRST_COMPLETED, Future, ProcessPoolExecutor, wait
from dataclasses import dataclass, field
from datetime import datetime, timezone
from pathlib import Path

import numpy as np
from numpy.typing import NDArray

from batch.engine.asbuilt import MemberAsBuilt
from batch.engine.deflection import member_deflection
from batch.engine.effects import EFFECTS, MemberEnvelope
from batch.engine.envelope import case_effects, envelope_of, member_influence
from batch.engine.fatigue import FatigueRanges, fatigue_ranges
from batch.engine.influence import InfluenceLines
from batch.loads.cases import LoadCase
from batch.loads.fleet import fleet_cases
from batch.model import Case, Member, Settings
from batch.rating.assess import AssessmentPlan, MemberAssessment, assess_member
from batch.rating.lrfr import VehicleEffects, vehicle_effects
from batch.rating.posting import RatingSummary, summarise
from batch.running.store import CheckpointStore

__all__ = [
    "ClusterError",
    "MemberResult",
    "ProgressFn",
    "RunError",
    "RunOptions",
    "RunResult",
    "analyse_member",
    "run_case",
]

#: Called as members finish: (members done, members in all, id of the member just done).
ProgressFn = Callable[[int, int, str], None]

#: Below this many member-vehicle pairs, worker processes cost more than they save.
PARALLEL_MIN_PAIRS = 20_000

#: Rows a sheet holds below its header; a larger per-vehicle summary stays in the store only.
SHEET_ROWS = 1_048_575


class RunError(Exception):
    """A member could not be computed; the message names the member and the next step."""

    def __init__(self, member: str, reason: str) -> None:
        self.member = member
        self.reason = reason
        super().__init__(
            f"Members: member {member!r} could not be analysed: {reason}; "
            "check its spans, hinges and Span EI"
        )

    def __reduce__(self) -> tuple[type[RunError], tuple[str, str]]:
        return (RunError, (self.member, self.reason))  # survives the trip from a worker


class ClusterError(Exception):
    """The Dask cluster cannot be used; the message says why and what to do."""


@dataclass(frozen=True, kw_only=True)
class MemberResult:
    """One member's results: envelope, per-vehicle peaks (n_vehicles, 6), warnings.

    ``assessment`` holds its rating and screening (see
    :class:`~batch.rating.assess.MemberAssessment`); ``fatigue`` its moment
    ranges under the fleet's fatigue loads (None: the fleet has none); ``asbuilt``
    its deflections (:class:`~batch.engine.asbuilt.MemberAsBuilt`).
    """

    index: int
    envelope: MemberEnvelope
    peaks: NDArray[np.float64]
    warnings: tuple[str, ...] = ()
    assessment: MemberAssessment = field(default_factory=MemberAssessment)
    fatigue: FatigueRanges | None = None
    asbuilt: MemberAsBuilt = field(default_factory=MemberAsBuilt)


@dataclass(frozen=True, kw_only=True)
class RunOptions:
    """How to run: worker processes (None: all local cores), a Dask cluster, a store."""

    jobs: int | None = 1
    cluster: str | None = None
    cluster_timeout: float = 30.0  # seconds to wait for the cluster to answer
    store: Path | None = None
    key: str = ""  # identifies the input (and version) for the store


@dataclass(frozen=True, kw_only=True)
class RunResult:
    """Everything a run computed, in member order, with its timing.

    ``started`` is the UTC start time, ``seconds`` the wall-clock compute time.
    ``peaks`` holds every member's per-vehicle peaks (members, vehicles, 6) when
    they fit on one sheet, else None (they are in the store). ``resumed`` counts
    the members taken from the store of an interrupted run. ``assessments``
    holds each member's rating and screening, in member order (empty when the
    case asks for neither). With a store, ``envelopes`` and ``assessments`` are
    read from it as they are iterated (:class:`~batch.running.store.StoredMembers`).
    ``fatigue`` holds each member's moment ranges under the fleet's fatigue loads
    (:class:`~batch.engine.fatigue.FatigueRanges`), in member order; empty when
    the fleet has no fatigue load. ``asbuilt`` holds each member's deflections
    (:class:`~batch.engine.asbuilt.MemberAsBuilt`), in member order; empty when no
    member asks for them.
    ``rated`` counts the rated members and checks and holds each bridge's
    postings of legal loads (:func:`batch.rating.posting.summarise`).
    """

    case: Case
    load_cases: tuple[LoadCase, ...]
    envelopes: Sequence[MemberEnvelope]
    warnings: tuple[str, ...]
    started: datetime
    seconds: float
    peaks: NDArray[np.float64] | None = None
    workers: int = 1
    resumed: int = 0
    store: Path | None = None
    assessments: Sequence[MemberAssessment] = ()
    fatigue: Sequence[FatigueRanges | None] = ()
    asbuilt: Sequence[MemberAsBuilt] = ()
    rated: RatingSummary = field(default_factory=RatingSummary)

    @property
    def n_members(self) -> int:
        """Members analysed."""
        return len(self.envelopes)

    @property
    def n_vehicles(self) -> int:
        """Rows of the Vehicles sheet."""
        return len(self.case.vehicles)

    @property
    def n_load_cases(self) -> int:
        """Load cases after library models are expanded into their parts."""
        return len(self.load_cases)

    @property
    def n_stations(self) -> int:
        """Station rows over all members (an interior support counts twice)."""
        return sum(int(env.station_x.size) for env in self.envelopes)

    @property
    def n_supports(self) -> int:
        """Support rows over all members."""
        return sum(int(env.support_x.size) for env in self.envelopes)


def _vehicle_peaks(live: VehicleEffects, il: InfluenceLines) -> NDArray[np.float64]:
    """Per vehicle, the extreme of each enveloped effect over its load cases and rows."""
    out = np.zeros((live.max_value.shape[0], 6))
    for col, (rows, sense) in enumerate(
        (
            (il.moment_rows, 1),
            (il.moment_rows, -1),
            (il.shear_rows, 1),
            (il.shear_rows, -1),
            (il.reaction_rows, 1),
            (il.reaction_rows, -1),
        )
    ):
        values = (live.max_value if sense > 0 else live.min_value)[:, rows]
        out[:, col] = values.max(axis=1) if sense > 0 else values.min(axis=1)
    return out


def analyse_member(
    index: int,
    member: Member,
    cases: tuple[LoadCase, ...],
    settings: Settings,
    n_vehicles: int,
    plan: AssessmentPlan | None = None,
) -> MemberResult:
    """Envelope, per-vehicle peaks and (with a ``plan``) rating and screening of one member.

    Raises :class:`RunError` if the member cannot be analysed.
    """
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            sections = () if plan is None else plan.sections(member)
            il = member_influence(member, settings.stations_per_span, sections)
            effects = case_effects(
                member, cases, settings.stations_per_span, settings.directions, il=il
            )
            asbuilt = MemberAsBuilt(deflection=member_deflection(member, settings, sections))
        except ValueError as exc:  # includes UnstableMemberError
            raise RunError(member.id, str(exc)) from exc
        env = envelope_of(member.id, effects, tuple(c.label for c in cases))
        peaks = _vehicle_peaks(vehicle_effects(effects, cases, n_vehicles), effects.lines)
        assessment = (
            MemberAssessment() if plan is None else assess_member(member, effects, cases, plan)
        )
        fatigue = fatigue_ranges(effects, cases)
    for effect in EFFECTS:
        if not np.all(np.isfinite(effect.extremes(env).value)):
            raise RunError(member.id, f"{effect.name} is not a finite number")
    notes = tuple(
        dict.fromkeys(f"member {member.id!r}: numerical warning: {w.message}" for w in caught)
    )
    return MemberResult(
        index=index,
        envelope=env,
        peaks=peaks,
        warnings=notes,
        assessment=assessment,
        fatigue=fatigue,
        asbuilt=asbuilt,
    )


@dataclass(frozen=True)
class _Chunk:
    members: tuple[tuple[int, Member], ...]
    cases: tuple[LoadCase, ...]
    settings: Settings
    n_vehicles: int
    plan: AssessmentPlan | None = None


def _analyse_chunk(chunk: _Chunk) -> list[MemberResult]:
    return [
        analyse_member(i, m, chunk.cases, chunk.settings, chunk.n_vehicles, chunk.plan)
        for i, m in chunk.members
    ]


def _workers(options: RunOptions, pairs: int) -> int:
    wanted = options.jobs if options.jobs is not None else (os.cpu_count() or 1)
    return 1 if pairs < PARALLEL_MIN_PAIRS else max(1, wanted)


def _local(chunks: list[_Chunk], workers: int) -> Iterator[list[MemberResult]]:
    if workers <= 1:
        for chunk in chunks:
            yield _analyse_chunk(chunk)
        return
    # spawn: workers start clean (no copied locks or threads) and load the compiled kernel
    # from numba's cache.
    pool = ProcessPoolExecutor(workers, mp_context=multiprocessing.get_context("spawn"))
    try:
        pending: set[Future[list[MemberResult]]] = {pool.submit(_analyse_chunk, c) for c in chunks}
        while pending:
            done, pending = wait(pending, return_when=FIRST_COMPLETED)
            for future in done:
                yield future.result()
    finally:
        pool.shutdown(wait=True, cancel_futures=True)


def _cluster(chunks: list[_Chunk], address: str, timeout: float) -> Iterator[list[MemberResult]]:
    """Each chunk's results from the Dask cluster at ``address``, as they finish.

    Connecting may take at most ``timeout`` seconds. Raises :class:`ClusterError`
    when the cluster cannot be reached or stops answering; a member the engine
    cannot analyse still raises :class:`RunError`.
    """
    try:
        from dask.distributed import Client, as_completed
    except ImportError as exc:  # the optional extra is missing
        raise ClusterError(
            f"--cluster {address}: running on a cluster needs dask.distributed; install it "
            "with pip install 'spanfleet[cluster]', or run without --cluster"
        ) from exc
    try:
        client = Client(address, timeout=timeout)
    except Exception as exc:  # refused, timed out, a bad address, or no Dask scheduler there
        raise ClusterError(
            f"--cluster {address}: no Dask scheduler answered within {timeout:g} s ({exc}); "
            "check the address and that the scheduler is running, or run without --cluster"
        ) from exc
    with client:
        futures = [client.submit(_analyse_chunk, c, pure=False) for c in chunks]
        try:
            for future in as_completed(futures):
                yield future.result()
        except (OSError, TimeoutError) as exc:  # the scheduler or a worker went away
            raise ClusterError(
                f"--cluster {address}: the cluster stopped answering ({exc}); run the same "
                "command again to carry on from the members already finished"
            ) from exc


def _open_store(
    options: RunOptions, case: Case, cases: tuple[LoadCase, ...]
) -> CheckpointStore | None:
    if options.store is None:
        return None
    return CheckpointStore(
        options.store,
        options.key,
        tuple(c.label for c in cases),
        tuple(v.id for v in case.vehicles),
    )


def _chunks(
    todo: list[tuple[int, Member]],
    cases: tuple[LoadCase, ...],
    case: Case,
    plan: AssessmentPlan | None,
    workers: int,
) -> list[_Chunk]:
    """The members to compute, in chunks small enough to keep every worker busy."""
    size = max(1, min(64, math.ceil(len(todo) / (4 * max(workers, 1)))))
    return [
        _Chunk(tuple(todo[k : k + size]), cases, case.settings, len(case.vehicles), plan)
        for k in range(0, len(todo), size)
    ]


@dataclass
class _Gathered:
    """What came back from the workers (in memory only when there is no store)."""

    envelopes: dict[int, MemberEnvelope] = field(default_factory=dict)
    notes: dict[int, tuple[str, ...]] = field(default_factory=dict)
    assessed: dict[int, MemberAssessment] = field(default_factory=dict)
    fatigue: dict[int, FatigueRanges | None] = field(default_factory=dict)
    asbuilt: dict[int, MemberAsBuilt] = field(default_factory=dict)


def _gather(
    source: Iterator[list[MemberResult]],
    store: CheckpointStore | None,
    peaks: NDArray[np.float64] | None,
    progress: ProgressFn | None,
    done: int,
    n_members: int,
) -> _Gathered:
    """Every member's result from ``source``: into the store, or kept in memory."""
    gathered = _Gathered()
    for results in source:
        for r in results:
            if store is not None:
                store.put(
                    r.index, r.envelope, r.warnings, r.peaks, r.assessment, r.fatigue, r.asbuilt
                )
            else:
                gathered.envelopes[r.index] = r.envelope
                gathered.notes[r.index] = r.warnings
                gathered.assessed[r.index] = r.assessment
                gathered.fatigue[r.index] = r.fatigue
                gathered.asbuilt[r.index] = r.asbuilt
            if peaks is not None:
                peaks[r.index] = r.peaks
            done += 1
            if progress is not None:
                progress(done, n_members, r.envelope.member)
    return gathered


def run_case(
    case: Case, progress: ProgressFn | None = None, options: RunOptions | None = None
) -> RunResult:
    """Envelopes and per-vehicle peaks of every member of ``case`` under its whole fleet.

    Raises :class:`RunError` for a member the engine cannot analyse (validation
    should have caught it).
    """
    options = options or RunOptions()
    started = datetime.now(timezone.utc)
    clock = time.perf_counter()
    cases = tuple(fleet_cases(case.vehicles, case.settings))
    n_members, n_vehicles = len(case.members), len(case.vehicles)
    plan = AssessmentPlan.of(case)
    store = _open_store(options, case, cases)
    try:
        # Without a store every result stays in memory; with one, each finished member
        # goes to the store and the results are read back from it as they are written
        # out, so memory stays flat however many members there are.
        fits = n_members * n_vehicles <= SHEET_ROWS
        peaks = np.zeros((n_members, n_vehicles, 6)) if fits else None
        ids = tuple(m.id for m in case.members)
        finished = store.finished(ids) if store is not None else set()
        todo = [(i, m) for i, m in enumerate(case.members) if i not in finished]
        workers = 1 if options.cluster else _workers(options, len(todo) * len(cases))
        chunks = _chunks(todo, cases, case, plan, workers)
        source = (
            _cluster(chunks, options.cluster, options.cluster_timeout)
            if options.cluster
            else _local(chunks, workers)
        )
        gathered = _gather(source, store, peaks, progress, len(finished), n_members)
        if store is None:
            envelopes: Sequence[MemberEnvelope] = tuple(
                gathered.envelopes[i] for i in range(n_members)
            )
            assessments: Sequence[MemberAssessment] = tuple(
                gathered.assessed[i] for i in range(n_members)
            )
            notes = tuple(w for i in range(n_members) for w in gathered.notes[i])
            fatigue: Sequence[FatigueRanges | None] = tuple(
                gathered.fatigue[i] for i in range(n_members)
            )
            asbuilt: Sequence[MemberAsBuilt] = tuple(gathered.asbuilt[i] for i in range(n_members))
        else:
            store.check_complete(n_members)
            envelopes = store.stored_envelopes(n_members)
            assessments = store.stored_assessments(n_members)
            notes = tuple(store.warnings())
            fatigue = store.stored_fatigue(n_members)
            asbuilt = store.stored_asbuilt(n_members)
            if peaks is not None and finished:
                for row in store.peak_rows():
                    if row.member_index in finished:
                        peaks[row.member_index, row.vehicle_index] = row.values
    finally:
        if store is not None:
            store.close()
    return RunResult(
        case=case,
        load_cases=cases,
        envelopes=envelopes,
        warnings=notes,
        started=started,
        seconds=time.perf_counter() - clock,
        peaks=peaks,
        workers=workers,
        resumed=len(finished),
        store=options.store,
        assessments=() if plan is None else assessments,
        fatigue=fatigue if any(c.fatigue for c in cases) else (),
        asbuilt=asbuilt if _asks_as_built(case) else (),
        rated=summarise(case, assessments) if case.rates else RatingSummary(),
    )


def _asks_as_built(case: Case) -> bool:
    """Whether any member asks for a result as built (deflections)."""
    return any(m.analysis is not None and m.analysis.ei_scale is not None for m in case.members)
