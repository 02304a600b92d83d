"""The plain data model: settings, members (girder lines) and vehicles.

Everything here is a frozen, keyword-only dataclass holding validated values in
one consistent unit system, named once on :class:`Settings`:

* ``US``: kip, ft, kip-ft, kip/ft
* ``SI``: kN, m, kN-m, kN/m

Positions are measured in the length unit from the member's left end. Loads are
positive downward (gravity). The engine (``batch.engine``) uses the sign
conventions of the workbook contract: sagging moment positive, shear V = dM/dx
(the sum of the upward forces left of the section), reactions upward positive.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Literal

UnitSystem = Literal["US", "SI"]
Directions = Literal["both", "left-to-right", "right-to-left"]
Category = Literal["design", "legal", "permit"]

DIRECTIONS: tuple[str, ...] = ("both", "left-to-right", "right-to-left")
CATEGORIES: tuple[str, ...] = ("design", "legal", "permit")
UNIT_SYSTEMS: tuple[str, ...] = ("US", "SI")

#: Unit labels of each system, by quantity, as shown in result headers.
UNIT_LABELS: dict[str, dict[str, str]] = {
    "US": {"force": "kip", "length": "ft", "moment": "kip-ft", "line_load": "kip/ft"},
    "SI": {"force": "kN", "length": "m", "moment": "kN-m", "line_load": "kN/m"},
}


@dataclass(frozen=True, kw_only=True)
class Settings:
    """Run settings (the Settings sheet).

    ``impact`` is the dynamic load allowance IM as a fraction (0.33 = 33 %),
    applied to axle loads only, never to lane loads.
    """

    units: UnitSystem = "US"
    directions: Directions = "both"
    stations_per_span: int = 10
    impact: float = 0.33
    chart_members: int = 50

    @property
    def unit_labels(self) -> dict[str, str]:
        """Unit labels of this run's unit system, keyed by quantity."""
        return UNIT_LABELS[self.units]


@dataclass(frozen=True, kw_only=True)
class Member:
    """One girder line: consecutive spans supported at both ends of every span.

    Lengths in the run's length unit; ``span_ei`` is relative flexural stiffness
    (only ratios matter), one value per span. ``hinges`` are internal moment
    releases measured from the left end. Distribution factors multiply the
    live-load effects (``df_moment`` moments; ``df_shear`` shears and reactions).
    ``dc_load`` and ``dw_load`` are uniform dead loads per unit length.
    """

    id: str
    spans: tuple[float, ...]
    hinges: tuple[float, ...] = ()
    span_ei: tuple[float, ...] = ()
    df_moment: float = 1.0
    df_shear: float = 1.0
    dc_load: float = 0.0
    dw_load: float = 0.0
    condition_factor: float = 1.0
    system_factor: float = 1.0
    description: str = ""

    @property
    def stiffness(self) -> tuple[float, ...]:
        """Relative EI per span (all 1 when none was given)."""
        return self.span_ei if self.span_ei else (1.0,) * len(self.spans)

    @property
    def length(self) -> float:
        """Total length of the member."""
        return float(sum(self.spans))


@dataclass(frozen=True, kw_only=True)
class Spacing:
    """Distance between two consecutive axles; a range when ``low < high``.

    For a range the engine finds the spacing within ``[low, high]`` that gives
    the worst effect.
    """

    low: float
    high: float

    @property
    def is_range(self) -> bool:
        """True when the spacing may vary."""
        return self.high > self.low


@dataclass(frozen=True, kw_only=True)
class Vehicle:
    """One row of the Vehicles sheet: an axle train, or a library model by name.

    ``axle_loads`` front axle first (force unit); ``spacings`` has one entry per
    gap between consecutive axles. ``lane_load`` (force per length) is placed on
    the adverse parts of each influence line, with no dynamic allowance.
    ``factor`` multiplies every effect of the row. ``library`` names a built-in
    load model instead of the axle columns.
    """

    id: str
    axle_loads: tuple[float, ...] = ()
    spacings: tuple[Spacing, ...] = ()
    lane_load: float = 0.0
    factor: float = 1.0
    library: str | None = None
    category: Category = "design"
    description: str = ""


@dataclass(frozen=True, kw_only=True)
class Case:
    """A whole validated input: settings, the inventory and the fleet."""

    settings: Settings = field(default_factory=Settings)
    members: tuple[Member, ...] = ()
    vehicles: tuple[Vehicle, ...] = ()
