"""Turn the fleet's vehicles into the engine's load cases."""

from __future__ import annotations

from batch.loads import library
from batch.loads.cases import LoadCase
from batch.model import Settings, Vehicle

__all__ = ["fleet_cases"]


def _vehicle_cases(vehicle: Vehicle, index: int, settings: Settings) -> list[LoadCase]:
    if vehicle.library:
        parts = library.model_cases(vehicle.library, settings.units, settings.impact)
        return [
            LoadCase(
                label=part.label
                if part.label.startswith(vehicle.id)
                else f"{vehicle.id}: {part.label}",
                axle_loads=part.axle_loads,
                spacing_low=part.spacing_low,
                spacing_high=part.spacing_high,
                lane_load=part.lane_load,
                impact=part.impact,
                factor=part.factor * vehicle.factor,
                scope=part.scope,
                drop_adverse_axles=part.drop_adverse_axles,
                vehicle=index,
            )
            for part in parts
        ]
    return [
        LoadCase(
            label=vehicle.id,
            axle_loads=vehicle.axle_loads,
            spacing_low=tuple(s.low for s in vehicle.spacings),
            spacing_high=tuple(s.high for s in vehicle.spacings),
            lane_load=vehicle.lane_load,
            impact=settings.impact,
            factor=vehicle.factor,
            vehicle=index,
        )
    ]


def fleet_cases(vehicles: tuple[Vehicle, ...], settings: Settings) -> list[LoadCase]:
    """Every load case of the fleet, in vehicle order; ``LoadCase.vehicle`` indexes ``vehicles``."""
    return [case for i, v in enumerate(vehicles) for case in _vehicle_cases(v, i, settings)]
