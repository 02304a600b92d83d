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

from batch.model.units import UNIT_LABELS, UnitSystem

Directions = Literal["both", "left-to-right", "right-to-left"]
Category = Literal["design", "legal", "permit"]

DIRECTIONS: tuple[str, ...] = ("both", "left-to-right", "right-to-left")
CATEGORIES: tuple[str, ...] = ("design", "legal", "permit")

#: Most spacing ranges in one vehicle (the engine sweeps 3**n combinations).
MAX_RANGES = 4


@dataclass(frozen=True, kw_only=True)
class Settings:
    """Run settings (the Settings sheet).

    ``impact`` is the dynamic load allowance IM as a fraction (0.33 = 33 %),
    applied to axle loads only, never to lane loads.

    Rating (see :mod:`batch.rating.lrfr`): ``dc_factor`` and ``dw_factor`` are the
    dead-load factors, ``dc_factor_relieving`` and ``dw_factor_relieving`` the
    ones used where a dead load relieves the rated effect; ``ll_factor_*`` the
    live-load factors by vehicle category (design: inventory and operating).
    Screening: ``reference_vehicle`` names a Vehicles row or a library model
    ("" for none); ``screening_floor`` is the share of the reference's largest
    effect below which an effect is not compared.
    """

    units: UnitSystem = "US"
    directions: Directions = "both"
    stations_per_span: int = 10
    impact: float = 0.33
    chart_members: int = 50
    dc_factor: float = 1.25
    dw_factor: float = 1.5
    dc_factor_relieving: float = 0.9
    dw_factor_relieving: float = 0.65
    ll_factor_design: float = 1.75
    ll_factor_operating: float = 1.35
    ll_factor_legal: float = 1.45
    ll_factor_permit: float = 1.3
    reference_vehicle: str = ""
    screening_floor: float = 0.1

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
class Capacity:
    """One row of the Capacities sheet: a station of a member to be rated.

    ``span`` counts from 1 at the member's left end; ``station`` is the
    fraction of that span (one of the stations 0, 1/n, ..., 1). Resistances
    are factored resistances phi*Rn (moment unit for ``resistance_m_pos``
    sagging and ``resistance_m_neg`` hogging, a positive magnitude; force unit
    for ``resistance_v``), ``None`` where that effect is not rated. The dead-load
    effects ``dc_m``, ``dw_m`` (sagging positive) and ``dc_v``, ``dw_v`` (V = sum
    of the upward forces left of the section, the section as in Envelopes) are
    ``None`` where they are to be computed from the member's uniform dead loads.
    """

    member: str
    span: int
    station: float
    resistance_m_pos: float | None = None
    resistance_m_neg: float | None = None
    resistance_v: float | None = None
    dc_m: float | None = None
    dw_m: float | None = None
    dc_v: float | None = None
    dw_v: float | None = None


@dataclass(frozen=True, kw_only=True)
class Case:
    """A whole validated input: settings, the inventory, the fleet and any capacities."""

    settings: Settings = field(default_factory=Settings)
    members: tuple[Member, ...] = ()
    vehicles: tuple[Vehicle, ...] = ()
    capacities: tuple[Capacity, ...] = ()
