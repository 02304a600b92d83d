"""Turn the fleet's vehicles into the engine's load cases."""

from __future__ import annotations

import dataclasses

from batch.loads import library
from batch.loads.cases import LoadCase
from batch.loads.factors import STANDARD_SPECIFICATIONS_IMPACT
from batch.model import Settings, Vehicle
from batch.model.units import conversion

__all__ = ["fleet_cases"]


def _vehicle_cases(vehicle: Vehicle, index: int, settings: Settings) -> list[LoadCase]:
    if vehicle.library:
        parts = library.model_cases(vehicle.library, settings.units, settings.impact)
        return [
            dataclasses.replace(
                part,
                label=part.label
                if part.label.startswith(vehicle.id)
                else f"{vehicle.id}: {part.label}",
                factor=part.factor * vehicle.factor,
                vehicle=index,
            )
            for part in parts
        ]
    standard = vehicle.impact_rule == "Standard Specifications"
    return [
        LoadCase(
            label=vehicle.id,
            train=vehicle.train,
            lane_load=vehicle.lane_load,
            impact=0.0 if standard else settings.impact,
            # The formula's lengths are in ft: scaled exactly to the run's length unit.
            impact_formula=STANDARD_SPECIFICATIONS_IMPACT.scaled(
                conversion("US", settings.units).length
            )
            if standard
            else None,
            factor=vehicle.factor,
            vehicle=index,
        )
    ]


def fleet_cases(vehicles: tuple[Vehicle, ...], settings: Settings) -> list[LoadCase]:
    """Every load case of the fleet, in vehicle order; ``LoadCase.vehicle`` indexes ``vehicles``."""
    return [case for i, v in enumerate(vehicles) for case in _vehicle_cases(v, i, settings)]
