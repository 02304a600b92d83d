"""Turn the fleet's vehicles into the engine's load cases."""

from __future__ import annotations

import dataclasses

from batch.loads import library
from batch.loads.cases import LoadCase
from batch.model import Settings, Vehicle

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
    return [
        LoadCase(
            label=vehicle.id,
            train=vehicle.train,
            lane_load=vehicle.lane_load,
            impact=settings.impact,
            factor=vehicle.factor,
            vehicle=index,
        )
    ]


def fleet_cases(vehicles: tuple[Vehicle, ...], settings: Settings) -> list[LoadCase]:
    """Every load case of the fleet, in vehicle order; ``LoadCase.vehicle`` indexes ``vehicles``."""
    return [case for i, v in enumerate(vehicles) for case in _vehicle_cases(v, i, settings)]
