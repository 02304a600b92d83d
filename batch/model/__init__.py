"""The model: the typed, validated input of a run and the declarations it is read by.

Every stage imports from here and nothing here imports a later stage. See
:mod:`batch.model.case` for the dataclasses and their units and sign conventions.
"""

from batch.model.case import (
    CATEGORIES,
    DIRECTIONS,
    MAX_RANGES,
    PERMIT_TYPES,
    RATING_METHODS,
    RIDING_SURFACES,
    Analysis,
    AxleTrain,
    Bridge,
    Capacity,
    Case,
    Category,
    Directions,
    GirderLayout,
    Member,
    PermitType,
    RatingMethod,
    RidingSurface,
    Segment,
    Settings,
    Spacing,
    Vehicle,
)
from batch.model.units import UNIT_LABELS, UNIT_SYSTEMS, UnitSystem

__all__ = [
    "CATEGORIES",
    "DIRECTIONS",
    "MAX_RANGES",
    "PERMIT_TYPES",
    "RATING_METHODS",
    "RIDING_SURFACES",
    "UNIT_LABELS",
    "UNIT_SYSTEMS",
    "Analysis",
    "AxleTrain",
    "Bridge",
    "Capacity",
    "Case",
    "Category",
    "Directions",
    "GirderLayout",
    "Member",
    "PermitType",
    "RatingMethod",
    "RidingSurface",
    "Segment",
    "Settings",
    "Spacing",
    "UnitSystem",
    "Vehicle",
]
