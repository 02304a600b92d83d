"""Run a validated case: the fleet's load cases over every member, one member at a time.

The fleet is expanded to load cases once (:func:`batch.loadcases.fleet_cases`);
each member's envelope is then computed by :func:`batch.engine.member_envelope`
with the run's stations per span and directions. :func:`member_results` yields
members one by one (so a caller may stream them); :func:`run_case` collects
them with timing and counts. Units and sign conventions are those of the engine
and the workbook contract (sagging moment positive, V = sum of the upward forces
left of the section, reactions upward positive).
"""

from __future__ import annotations

import time
import warnings
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from datetime import datetime, timezone

import numpy as np

from batch.engine import LoadCase, MemberEnvelope, member_envelope
from batch.loadcases import fleet_cases
from batch.model import Case, Member
from batch.results import EFFECTS

__all__ = ["MemberResult", "ProgressFn", "RunError", "RunResult", "member_results", "run_case"]

#: Called after each member: (members done, members in all, id of the member just done).
ProgressFn = Callable[[int, int, str], None]


class RunError(Exception):
    """A member could not be computed; the message names the member and the next step."""

    def __init__(self, member: str, reason: str) -> None:
        self.member = member
        self.reason = reason
        super().__init__(
            f"Members: member {member!r} could not be analysed: {reason}; "
            "check its spans, hinges and Span EI"
        )


@dataclass(frozen=True, kw_only=True)
class MemberResult:
    """One member's envelope and any numerical warnings raised while computing it."""

    envelope: MemberEnvelope
    warnings: tuple[str, ...] = ()


@dataclass(frozen=True, kw_only=True)
class RunResult:
    """Everything a run computed, in member order, with its timing.

    ``started`` is the UTC start time, ``seconds`` the wall-clock compute time.
    """

    case: Case
    load_cases: tuple[LoadCase, ...]
    envelopes: tuple[MemberEnvelope, ...]
    warnings: tuple[str, ...]
    started: datetime
    seconds: float

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


def _analyse(member: Member, cases: list[LoadCase], case: Case) -> MemberResult:
    settings = case.settings
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            env = member_envelope(member, cases, settings.stations_per_span, settings.directions)
        except ValueError as exc:  # includes UnstableMemberError
            raise RunError(member.id, str(exc)) from exc
    for effect in EFFECTS:
        if not np.all(np.isfinite(effect.extremes(env).value)):
            raise RunError(member.id, f"{effect.name} is not a finite number")
    notes = tuple(
        dict.fromkeys(f"member {member.id!r}: numerical warning: {w.message}" for w in caught)
    )
    return MemberResult(envelope=env, warnings=notes)


def member_results(
    case: Case, cases: list[LoadCase], progress: ProgressFn | None = None
) -> Iterator[MemberResult]:
    """Yield each member's result in input order, calling ``progress`` after each.

    Raises :class:`RunError` for a member the engine cannot analyse.
    """
    total = len(case.members)
    for done, member in enumerate(case.members, start=1):
        result = _analyse(member, cases, case)
        if progress is not None:
            progress(done, total, member.id)
        yield result


def run_case(case: Case, progress: ProgressFn | None = None) -> RunResult:
    """Envelopes of every member of ``case`` under its whole fleet.

    Serial, one member at a time. Raises :class:`RunError` for a member the
    engine cannot analyse (validation should have caught it).
    """
    started = datetime.now(timezone.utc)
    clock = time.perf_counter()
    cases = fleet_cases(case.vehicles, case.settings)
    envelopes: list[MemberEnvelope] = []
    notes: list[str] = []
    for result in member_results(case, cases, progress):
        envelopes.append(result.envelope)
        notes.extend(result.warnings)
    return RunResult(
        case=case,
        load_cases=tuple(cases),
        envelopes=tuple(envelopes),
        warnings=tuple(notes),
        started=started,
        seconds=time.perf_counter() - clock,
    )
