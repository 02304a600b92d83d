"""Load models as data: parts in the model's own units, turned into engine load cases.

A *load model* is a published live load that engineers name rather than type
(HL-93, Type 3S2, CL-625, ...). It has one or more *parts*; the engine
envelopes every part like a separate vehicle, and results name the part that
governs, e.g. ``HL-93 (tandem + lane)``. Each part is an axle train (fixed or
ranged spacings), an optional lane load on the adverse parts of each influence
line, a dynamic load allowance on the axles (fixed by the standard, or the
run's), a multiplier and a scope (see :data:`batch.engine.envelope.SCOPES`).

Loads are downward; axle loads are listed front axle first.
"""

from __future__ import annotations

from dataclasses import dataclass

from batch.loads.cases import SCOPES, LoadCase
from batch.model import CATEGORIES, UNIT_SYSTEMS, AxleTrain, Category
from batch.model.units import UnitSystem, conversion

__all__ = ["UNBOUNDED", "LoadModel", "Part", "part"]

#: Upper end of a spacing that the standard leaves open ("at least 50 ft"), in the
#: model's length unit. The engine caps a range at the member length, so any
#: value longer than every member gives the same result.
UNBOUNDED = 10_000.0


@dataclass(frozen=True, kw_only=True)
class Part:
    """One part of a load model, in the model's own units.

    ``label`` names the part in results (shown after the model name, in
    parentheses; empty for a model with one part). ``train`` is in kip or kN
    and ft or m, front axle first; ``lane_load`` kip/ft or kN/m on the adverse parts, with no
    dynamic allowance. ``impact`` is the dynamic load allowance the standard
    fixes for this part, or ``None`` to use the run's. ``factor`` multiplies
    axles and lane alike. ``drop_adverse_axles`` leaves out axles that would
    lessen an effect, where the standard says so.
    """

    label: str
    train: AxleTrain
    lane_load: float = 0.0
    impact: float | None = None
    factor: float = 1.0
    scope: str = "all"
    drop_adverse_axles: bool = False

    def __post_init__(self) -> None:
        loads, spacings = self.train.loads, self.train.spacings
        if not loads or any(p <= 0 for p in loads):
            raise ValueError(f"part {self.label!r}: give one or more axle loads above zero")
        if len(spacings) != len(loads) - 1:
            raise ValueError(f"part {self.label!r}: give one spacing per gap between axles")
        if any(s.low <= 0 or s.high < s.low for s in spacings):
            raise ValueError(f"part {self.label!r}: spacings must be above zero, low <= high")
        if self.scope not in SCOPES:
            raise ValueError(f"part {self.label!r}: scope must be one of {SCOPES}")

    @property
    def weight(self) -> float:
        """Sum of the axle loads (kip or kN), before ``factor``."""
        return self.train.weight


def part(
    label: str,
    axle_loads: tuple[float, ...],
    spacings: tuple[float | tuple[float, float], ...] = (),
    *,
    lane_load: float = 0.0,
    impact: float | None = None,
    factor: float = 1.0,
    scope: str = "all",
    drop_adverse_axles: bool = False,
) -> Part:
    """Build a :class:`Part`; a spacing is a number, or ``(low, high)`` for a range."""
    return Part(
        label=label,
        train=AxleTrain.of(
            axle_loads,
            [s[0] if isinstance(s, tuple) else s for s in spacings],
            [s[1] if isinstance(s, tuple) else s for s in spacings],
        ),
        lane_load=lane_load,
        impact=impact,
        factor=factor,
        scope=scope,
        drop_adverse_axles=drop_adverse_axles,
    )


@dataclass(frozen=True, kw_only=True)
class LoadModel:
    """A published load model: its parts, where it comes from and what it is.

    ``units`` is the system the model is defined in ("US": kip, ft, kip/ft;
    "SI": kN, m, kN/m); :meth:`cases` converts exactly. ``category`` is the
    rating category it usually belongs to. ``source`` names the standard,
    edition and article or table, and says which values are from memory.
    """

    name: str
    units: UnitSystem
    category: Category
    source: str
    description: str
    parts: tuple[Part, ...]
    aliases: tuple[str, ...] = ()

    def __post_init__(self) -> None:
        if self.units not in UNIT_SYSTEMS or self.category not in CATEGORIES:
            raise ValueError(f"model {self.name!r}: unknown unit system or category")
        if not self.parts:
            raise ValueError(f"model {self.name!r}: give at least one part")

    @property
    def axles(self) -> int:
        """Axle count of the model's first (principal) part."""
        return len(self.parts[0].train.loads)

    def weight(self, units: UnitSystem) -> float:
        """Total axle load of the first part, in kip ("US") or kN ("SI")."""
        return self.parts[0].weight * conversion(self.units, units).force

    def label(self, item: Part) -> str:
        """Result label of one part, e.g. ``HL-93 (tandem + lane)``."""
        return f"{self.name} ({item.label})" if item.label else self.name

    def cases(self, units: UnitSystem, impact: float) -> list[LoadCase]:
        """Every part as an engine load case in ``units``.

        ``impact`` is the run's dynamic load allowance, used by parts whose
        standard does not fix one. ``LoadCase.vehicle`` is left 0 for the caller.
        """
        c = conversion(self.units, units)
        return [
            LoadCase(
                label=self.label(item),
                train=item.train.scaled(c.force, c.length),
                lane_load=item.lane_load * c.line_load,
                impact=impact if item.impact is None else item.impact,
                factor=item.factor,
                scope=item.scope,
                drop_adverse_axles=item.drop_adverse_axles,
            )
            for item in self.parts
        ]
