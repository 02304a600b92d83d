"""Fleet screening: each vehicle's effects against a reference load's, member by member.

Screening compares every vehicle with a reference load (e.g. the design load
the members were designed for): for each member and vehicle, the largest ratio
of the vehicle's effect to the reference's effect of the same kind and sense at
the same station or support, over M+, M-, V+, V-, R+ and R-, where the
reference's effect is at least ``Screening floor`` times its largest effect of
that kind on the member. Pure numpy; sign conventions are the engine's.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from batch.engine.influence import InfluenceLines
from batch.loads import library
from batch.loads.cases import LoadCase
from batch.model import Case
from batch.rating.lrfr import FloatArray, VehicleEffects

__all__ = ["SCREEN_EFFECTS", "MemberScreening", "reference_of", "screen_member"]


def _rows(il: InfluenceLines, family: str) -> slice:
    return {"moment": il.moment_rows, "shear": il.shear_rows, "reaction": il.reaction_rows}[family]


#: The screened effects: (name, effect family, sense).
SCREEN_EFFECTS: tuple[tuple[str, str, int], ...] = (
    ("M+", "moment", 1),
    ("M-", "moment", -1),
    ("V+", "shear", 1),
    ("V-", "shear", -1),
    ("R+", "reaction", 1),
    ("R-", "reaction", -1),
)


def reference_of(case: Case) -> int | list[LoadCase] | None:
    """The screening reference of a case: a vehicle index, a library model's load cases, or None.

    A Vehicles row id (ignoring case and outer spaces) is preferred to a
    library model of the same name. The library cases are in the run's units
    with the run's dynamic load allowance where the model takes it.
    """
    name = case.settings.reference_vehicle.strip()
    if not name:
        return None
    for i, vehicle in enumerate(case.vehicles):
        if vehicle.id.strip().casefold() == name.casefold():
            return i
    return library.model_cases(name, case.settings.units, case.settings.impact)


@dataclass(frozen=True, kw_only=True)
class MemberScreening:
    """One member's largest effect ratio per vehicle against the reference (n_vehicles).

    ``ratio`` is NaN where no effect could be compared; ``effect`` indexes
    :data:`SCREEN_EFFECTS` (-1: none); ``row`` is the station (M, V) or the
    support (R) among the member's, from 0 (-1: none).
    """

    ratio: FloatArray
    effect: NDArray[np.int64]
    row: NDArray[np.int64]


def screen_member(
    il: InfluenceLines,
    live: VehicleEffects,
    reference_max: FloatArray,
    reference_min: FloatArray,
    floor: float,
) -> MemberScreening:
    """Largest ratio of each vehicle's effect to the reference's (see the module docstring).

    ``reference_max``/``reference_min`` are the reference's extremes of every
    effect (n_effects). Ties keep the first effect of :data:`SCREEN_EFFECTS`,
    then the first station or support.
    """
    n_vehicles = live.max_value.shape[0]
    best = np.full(n_vehicles, -np.inf)
    effect = np.full(n_vehicles, -1, dtype=np.int64)
    row = np.full(n_vehicles, -1, dtype=np.int64)
    for k, (_, family, sense) in enumerate(SCREEN_EFFECTS):
        rows = _rows(il, family)
        reference = sense * (reference_max if sense > 0 else reference_min)[rows]
        if reference.size == 0 or reference.max() <= 0:
            continue
        compared = (reference > 0) & (reference >= floor * reference.max())
        vehicle = sense * (live.max_value if sense > 0 else live.min_value)[:, rows]
        with np.errstate(divide="ignore", invalid="ignore"):
            ratio = np.where(compared, vehicle / np.where(compared, reference, 1.0), -np.inf)
        at = ratio.argmax(axis=1)
        value = ratio[np.arange(n_vehicles), at]
        better = value > best
        best = np.where(better, value, best)
        effect = np.where(better, k, effect)
        row = np.where(better, at, row)
    return MemberScreening(ratio=np.where(effect >= 0, best, np.nan), effect=effect, row=row)
