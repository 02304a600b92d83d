"""Rating and screening inside a run: every way of running a member gives the same bits.

The laws checked are the tool's own promises (issue "Overnight scale" and the
rating issue): a member is rated and screened in the worker that computed its
envelope, so serial, parallel and resumed runs must agree exactly; and the run's
rating of a member is the pure rating of :mod:`batch.rating.lrfr` applied to the
engine's effects of that member (checked here against the published LRFR
equation through :func:`batch.rating.lrfr.rating_factor`, MBE 6A.4.2.1, from memory).
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from tolerances import REL_TOL_FLOAT

import batch.running.executor
from batch.demo.synthetic import synthetic_case
from batch.engine.envelope import member_envelope, member_influence
from batch.loads.fleet import fleet_cases
from batch.model import Capacity, Case, Settings
from batch.rating.assess import MemberAssessment
from batch.rating.lrfr import RATED_EFFECTS, RatingFactors, dead_load_effects, rating_factor
from batch.running.executor import RunOptions, RunResult, run_case


def _rated_case(reference: str = "HL-93") -> Case:
    case = synthetic_case(8, 4, 7, Settings(stations_per_span=4, reference_vehicle=reference))
    capacities = tuple(
        Capacity(
            member=m.id,
            span=1,
            station=station,
            resistance_m_pos=2500.0,
            resistance_m_neg=1800.0 if station == 1.0 else None,
            resistance_v=260.0,
        )
        for m in case.members[::2]
        for station in (0.0, 0.5, 1.0)
    )
    return dataclasses.replace(case, capacities=capacities)


def _arrays(assessment: MemberAssessment) -> list[np.ndarray]:
    out: list[np.ndarray] = []
    for part in (assessment.rating, assessment.screening, assessment.dead):
        out += [] if part is None else list(vars(part).values())
    return out


def _same_assessments(a: RunResult, b: RunResult) -> None:
    assert len(a.assessments) == len(b.assessments) == a.n_members
    for x, y in zip(a.assessments, b.assessments, strict=True):
        assert (x.rating is None) == (y.rating is None)
        assert (x.screening is None) == (y.screening is None)
        for u, v in zip(_arrays(x), _arrays(y), strict=True):
            assert np.array_equal(u, v, equal_nan=u.dtype.kind == "f")


def test_only_members_with_capacities_are_rated_and_all_are_screened() -> None:
    case = _rated_case()
    result = run_case(case)
    rated = {c.member for c in case.capacities}
    for member, assessment in zip(case.members, result.assessments, strict=True):
        assert (assessment.rating is not None) == (member.id in rated)
        assert assessment.screening is not None


def test_no_assessments_without_capacities_or_reference() -> None:
    case = dataclasses.replace(_rated_case(reference=""), capacities=())
    assert run_case(case).assessments == ()


def test_worker_processes_rate_bit_for_bit_like_one_process(monkeypatch) -> None:
    case = _rated_case()
    serial = run_case(case, options=RunOptions(jobs=1))
    monkeypatch.setattr(batch.running.executor, "PARALLEL_MIN_PAIRS", 0)
    parallel = run_case(case, options=RunOptions(jobs=2))
    assert parallel.workers == 2
    _same_assessments(serial, parallel)


def test_a_resumed_run_gives_back_the_stored_ratings(tmp_path) -> None:
    case = _rated_case(reference=_rated_case().vehicles[1].id)
    store = tmp_path / "book.spanfleet.sqlite"
    first = run_case(case, options=RunOptions(store=store, key="rated"))
    again = run_case(case, options=RunOptions(store=store, key="rated"))
    assert again.resumed == len(case.members)
    _same_assessments(first, again)


def test_the_run_rates_by_the_general_equation() -> None:
    # Independent of batch.rating.lrfr.rate_member: each vehicle's envelope from the engine,
    # dead loads from the exact influence areas, and the general equation element-wise.
    case = _rated_case(reference="")
    result = run_case(case)
    factors = RatingFactors.of(case.settings)
    cases = fleet_cases(case.vehicles, case.settings)
    for member, assessment in zip(case.members, result.assessments, strict=True):
        if assessment.rating is None:
            continue
        rows = [c for c in case.capacities if c.member == member.id]
        for v, vehicle in enumerate(case.vehicles):
            env = member_envelope(member, [c for c in cases if c.vehicle == v], 4)
            il = member_influence(member, 4)
            dc, dw = dead_load_effects(il, member.dc_load), dead_load_effects(il, member.dw_load)
            gamma = factors.live(vehicle.category)
            phi_m = max(member.condition_factor * member.system_factor, 0.85)
            candidates = []
            for cap in rows:
                i = (cap.span - 1) * 5 + round(cap.station * 4)
                s = il.n_stations + i
                tries = [
                    (phi_m * (cap.resistance_m_pos or np.nan), dc[i], dw[i], env.m_max.value[i]),
                    (phi_m * (cap.resistance_m_neg or np.nan), -dc[i], -dw[i], -env.m_min.value[i]),
                    (member.condition_factor * cap.resistance_v, dc[s], dw[s], env.v_max.value[i]),
                    (
                        member.condition_factor * cap.resistance_v,
                        -dc[s],
                        -dw[s],
                        -env.v_min.value[i],
                    ),
                ]
                candidates += [float(rating_factor(*t, gamma, factors)) for t in tries]
            expected = min(candidates)
            assert assessment.rating.rf[v] == pytest.approx(expected, rel=REL_TOL_FLOAT)
            effect = RATED_EFFECTS[assessment.rating.effect[v]][0]
            assert effect in ("M+", "M-", "V+", "V-")
