"""Rate and screen one member inside a run: what to do (the plan) and doing it.

A run makes one :class:`AssessmentPlan` from its case; every member then gets
:func:`assess_member` from the same load-case effects that give its envelope, in
the worker that computed them, so that a member is rated identically whichever
way the run is spread over processes. The equations are those of
:mod:`batch.rating.lrfr`; the factors each bridge's traffic and each vehicle's
kind of crossing set are those of :mod:`batch.rating.traffic`.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

from batch.engine.envelope import CaseEffects, case_effects
from batch.loads.cases import ImpactFormula, LoadCase
from batch.loads.factors import STANDARD_SPECIFICATIONS_IMPACT
from batch.model import Capacity, Case, Category, Member, ServiceSection
from batch.model.layout import Section
from batch.model.units import UnitSystem, conversion
from batch.rating.lrfr import (
    FloatArray,
    MemberDeadLoads,
    MemberRating,
    RatingFactors,
    VehicleEffects,
    gross_weight,
    member_dead_loads,
    rate_member,
    vehicle_effects,
    weight_in_tons,
)
from batch.rating.screening import MemberScreening, reference_of, screen_member
from batch.rating.traffic import VehicleTerms, vehicle_terms

__all__ = ["AssessmentPlan", "BridgeTerms", "MemberAssessment", "assess_member"]


@dataclass(frozen=True, kw_only=True)
class BridgeTerms:
    """The factors of one bridge (or of the Settings, for members with no bridge)."""

    factors: RatingFactors
    vehicles: VehicleTerms


@dataclass(frozen=True, kw_only=True)
class AssessmentPlan:
    """What to rate and screen in a run, the same for every member.

    ``capacities`` holds each rated member's Capacities rows by member id, ``service``
    its Service rows;
    ``bridges`` the factors of each bridge by id ("" for members with no bridge);
    ``reference`` is the screening reference: a vehicle index, the load cases
    of a library model, or None for no screening. ``weights`` are the vehicles'
    gross weights in US tons or tonnes (for posting loads); ``impact`` the Standard
    Specifications' impact formula in the run's length unit (LFR and ASR members);
    ``units`` the run's unit system (the stresses of service checks).
    """

    categories: tuple[Category, ...]
    weights: tuple[float, ...]
    stations_per_span: int
    directions: str
    bridges: dict[str, BridgeTerms] = field(default_factory=dict)
    capacities: dict[str, tuple[Capacity, ...]] = field(default_factory=dict)
    service: dict[str, tuple[ServiceSection, ...]] = field(default_factory=dict)
    reference: int | tuple[LoadCase, ...] | None = None
    floor: float = 0.1
    impact: ImpactFormula = STANDARD_SPECIFICATIONS_IMPACT
    units: UnitSystem = "US"

    @classmethod
    def of(cls, case: Case) -> AssessmentPlan | None:
        """The plan of a case; None when it has neither capacities nor a reference."""
        reference = reference_of(case)
        if not case.rates and reference is None:
            return None
        capacities: dict[str, list[Capacity]] = {}
        for row in case.capacities:
            capacities.setdefault(row.member, []).append(row)
        service: dict[str, list[ServiceSection]] = {}
        for section in case.service:
            service.setdefault(section.member, []).append(section)
        settings = case.settings
        bridges = {
            b.id: BridgeTerms(
                factors=RatingFactors.of(settings, b),
                vehicles=vehicle_terms(case.vehicles, b, settings),
            )
            for b in case.bridges
        }
        bridges[""] = BridgeTerms(
            factors=RatingFactors.of(settings),
            vehicles=vehicle_terms(case.vehicles, None, settings),
        )
        return cls(
            categories=tuple(v.category for v in case.vehicles),
            weights=tuple(
                weight_in_tons(gross_weight(v, settings.units), settings.units)
                for v in case.vehicles
            ),
            stations_per_span=settings.stations_per_span,
            directions=settings.directions,
            bridges=bridges if case.rates else {},
            capacities={member: tuple(rows) for member, rows in capacities.items()},
            service={member: tuple(rows) for member, rows in service.items()},
            reference=reference if isinstance(reference, int | None) else tuple(reference),
            floor=settings.screening_floor,
            impact=STANDARD_SPECIFICATIONS_IMPACT.scaled(conversion("US", settings.units).length),
            units=settings.units,
        )

    def sections(self, member: Member) -> tuple[Section, ...]:
        """The stations ``member``'s Capacities and Service rows name, as (span from 1, x).

        Any off the member's grid must be added to its stations (see
        :func:`~batch.engine.envelope.member_influence`) before it is rated.
        """
        rows: tuple[Capacity | ServiceSection, ...] = (
            *self.capacities.get(member.id, ()),
            *self.service.get(member.id, ()),
        )
        found = (c.section(member.spans) for c in rows)
        return tuple(s for s in found if s is not None)


@dataclass(frozen=True, kw_only=True)
class MemberAssessment:
    """A member's rating, screening and dead-load effects.

    ``rating`` is None for a member with no Capacities rows, ``screening`` when
    none is asked, ``dead`` when the run rates nothing.
    """

    rating: MemberRating | None = None
    screening: MemberScreening | None = None
    dead: MemberDeadLoads | None = None


def _reference(
    member: Member, effects: CaseEffects, live: VehicleEffects, plan: AssessmentPlan
) -> tuple[FloatArray, FloatArray] | None:
    """The screening reference's largest and smallest value of every effect, or None."""
    if plan.reference is None:
        return None
    if isinstance(plan.reference, int):
        return live.max_value[plan.reference], live.min_value[plan.reference]
    ref = case_effects(
        member, plan.reference, plan.stations_per_span, plan.directions, il=effects.lines
    )
    return ref.max_value.max(axis=0), ref.min_value.min(axis=0)


def assess_member(
    member: Member, effects: CaseEffects, cases: Sequence[LoadCase], plan: AssessmentPlan
) -> MemberAssessment:
    """Rate and screen ``member`` from the factored effects of the run's load ``cases``."""
    live = vehicle_effects(effects, cases, len(plan.categories))
    dead = member_dead_loads(member, effects.lines) if plan.bridges else None
    rating = None
    if member.id in plan.capacities or member.id in plan.service:
        terms = plan.bridges[member.bridge or ""]
        rating = rate_member(
            member,
            effects,
            cases,
            plan.capacities.get(member.id, ()),
            terms.vehicles,
            plan.categories,
            terms.factors,
            plan.weights,
            dead,
            plan.impact,
            plan.units,
            plan.service.get(member.id, ()),
        )
    reference = _reference(member, effects, live, plan)
    screening = (
        None if reference is None else screen_member(effects.lines, live, *reference, plan.floor)
    )
    return MemberAssessment(rating=rating, screening=screening, dead=dead)
