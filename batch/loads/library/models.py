"""Load models as data: parts in the model's own units, turned into engine load cases.

A *load model* is a published live load that engineers name rather than type
(HL-93, Type 3S2, CL-625, ...). It has one or more *parts*; the engine
envelopes every part like a separate vehicle, and results name the part that
governs, e.g. ``HL-93 (tandem + lane)``. Each part is an axle train (fixed or
ranged spacings), an optional lane load on the adverse parts of each influence
line, a dynamic load allowance on the axles (fixed by the standard, or the
run's), a multiplier, a scope (see :data:`batch.loads.cases.SCOPES`) and a span
rule.

Every number of a part is a :class:`~batch.loads.sourced.Sourced` value, so the
model knows where each of its values comes from and whether it was seen in
published text; :attr:`LoadModel.values` lists them and :attr:`LoadModel.status`
sums them up.

Loads are downward; axle loads are listed front axle first.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from batch.loads.cases import SCOPES, ImpactFormula, LoadCase
from batch.loads.sourced import UNBOUNDED, Number, Sourced
from batch.model import CATEGORIES, UNIT_SYSTEMS, AxleTrain, Category
from batch.model.units import UnitSystem, conversion

__all__ = ["UNBOUNDED", "LoadModel", "Part", "part"]


@dataclass(frozen=True, kw_only=True)
class Part:
    """One part of a load model, in the model's own units.

    ``label`` names the part in results (shown after the model name, in
    parentheses; empty for a model with one part). ``train`` is in kip or kN
    and ft or m, front axle first; ``lane_load`` kip/ft or kN/m on the adverse parts, with no
    dynamic allowance unless ``impact_formula`` says so. ``impact`` is the dynamic load
    allowance the standard
    fixes for this part, or ``None`` to use the run's; ``impact_formula``, where
    the standard's allowance depends on the loaded length (the Standard
    Specifications), replaces both and applies to axles and lane load alike
    (lengths in the model's unit). ``factor`` multiplies
    axles and lane alike. ``min_span`` (ft or m; 0: none) limits the part to
    members with a span at least that long. ``drop_adverse_axles`` leaves out
    axles that would lessen an effect, where the standard says so; ``fatigue``
    marks a fatigue load and ``other_span_load`` places the part's one axle again in
    another span (see :class:`~batch.loads.cases.LoadCase`). ``sources`` are the
    published values and rules the part is built from.
    """

    label: str
    train: AxleTrain
    lane_load: float = 0.0
    impact: float | None = None
    impact_formula: ImpactFormula | None = None
    factor: float = 1.0
    scope: str = "all"
    min_span: float = 0.0
    drop_adverse_axles: bool = False
    fatigue: bool = False
    other_span_load: bool = False
    sources: tuple[Sourced, ...] = ()

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


def _joined(values: Sourced | Sequence[Sourced]) -> tuple[tuple[Number, ...], list[Sourced]]:
    """The entries of one value, or of several values one after the other."""
    items = [values] if isinstance(values, Sourced) else list(values)
    return tuple(n for v in items for n in v.value), items


def part(
    label: str,
    axle_loads: Sourced | Sequence[Sourced],
    spacings: Sourced | Sequence[Sourced] = (),
    *,
    lane_load: Sourced | None = None,
    impact: Sourced | None = None,
    impact_formula: ImpactFormula | None = None,
    factor: Sourced | None = None,
    scope: str = "all",
    min_span: Sourced | None = None,
    drop_adverse_axles: bool = False,
    fatigue: bool = False,
    other_span_load: bool = False,
    rules: Sequence[Sourced] = (),
) -> Part:
    """Build a :class:`Part` from published values only.

    ``axle_loads`` and ``spacings`` are one value or several joined in order
    (e.g. two trucks and the headway between them); a spacing entry is a number
    or a ``(low, high)`` range. ``rules`` are the published rules the part
    follows (its scope, the axles it leaves out, ...), kept with its sources.
    """
    loads, load_sources = _joined(axle_loads)
    gaps, gap_sources = _joined(spacings)
    if any(isinstance(p, tuple) for p in loads):
        raise ValueError(f"part {label!r}: an axle load cannot be a range")
    single = [v for v in (lane_load, impact, factor, min_span) if v is not None]
    return Part(
        label=label,
        train=AxleTrain.of(
            [float(p) for p in loads],  # type: ignore[arg-type]
            [s[0] if isinstance(s, tuple) else s for s in gaps],
            [s[1] if isinstance(s, tuple) else s for s in gaps],
        ),
        lane_load=0.0 if lane_load is None else lane_load.number,
        impact=None if impact is None else impact.number,
        impact_formula=impact_formula,
        factor=1.0 if factor is None else factor.number,
        scope=scope,
        min_span=0.0 if min_span is None else min_span.number,
        drop_adverse_axles=drop_adverse_axles,
        fatigue=fatigue,
        other_span_load=other_span_load,
        sources=tuple(dict.fromkeys([*load_sources, *gap_sources, *single, *rules])),
    )


@dataclass(frozen=True, kw_only=True)
class LoadModel:
    """A published load model: its parts, where it comes from and what it is.

    ``units`` is the system the model is defined in ("US": kip, ft, kip/ft;
    "SI": kN, m, kN/m); :meth:`cases` converts exactly. ``category`` is the
    rating category it usually belongs to. ``source`` names the standard,
    edition and articles; each value's own source and status are in
    :attr:`values`. ``gross_weight`` is the weight W the posting equation uses
    when it is not the principal part's axle total (e.g. the lane-type legal
    load). ``notes`` are published rules of the model as a whole. ``caution`` is
    a warning given with every run that rates a vehicle naming the model (e.g.
    a value the rating cannot yet honour); empty for none.
    """

    name: str
    units: UnitSystem
    category: Category
    source: str
    description: str
    parts: tuple[Part, ...]
    aliases: tuple[str, ...] = ()
    gross_weight: Sourced | None = None
    notes: tuple[Sourced, ...] = ()
    caution: str = ""

    def __post_init__(self) -> None:
        if self.units not in UNIT_SYSTEMS or self.category not in CATEGORIES:
            raise ValueError(f"model {self.name!r}: unknown unit system or category")
        if not self.parts:
            raise ValueError(f"model {self.name!r}: give at least one part")

    @property
    def fatigue(self) -> bool:
        """Whether the model has a fatigue load part (single-lane distribution factors)."""
        return any(p.fatigue for p in self.parts)

    @property
    def axles(self) -> int:
        """Axle count of the model's first (principal) part."""
        return len(self.parts[0].train.loads)

    def weight(self, units: UnitSystem) -> float:
        """Gross weight W for posting, in kip ("US") or kN ("SI").

        The model's ``gross_weight`` where it has one, else the total axle load
        of its first (principal) part.
        """
        own = self.parts[0].weight if self.gross_weight is None else self.gross_weight.number
        return own * conversion(self.units, units).force

    @property
    def values(self) -> tuple[Sourced, ...]:
        """Every published value and rule of the model, each once, parts first.

        A computed value (e.g. 75 % of a truck) is listed as the published
        values it is computed from.
        """
        extra = [] if self.gross_weight is None else [self.gross_weight]
        every = (*(s for p in self.parts for s in p.sources), *extra, *self.notes)
        return tuple(dict.fromkeys(p for s in every for p in s.published))

    @property
    def status(self) -> str:
        """The status of the model's values taken together.

        ``verified``, ``verified (secondary)``, ``partly from memory`` or ``from memory``.
        """
        found = {v.status for v in self.values}
        if found == {"from memory"}:
            return "from memory"
        if "from memory" in found:
            return "partly from memory"
        return "verified (secondary)" if "secondary" in found else "verified"

    def label(self, item: Part) -> str:
        """Result label of one part, e.g. ``HL-93 (tandem + lane)``."""
        return f"{self.name} ({item.label})" if item.label else self.name

    def cases(self, units: UnitSystem, impact: float) -> list[LoadCase]:
        """Every part as an engine load case in ``units``.

        ``impact`` is the run's dynamic load allowance, used by parts whose
        standard does not fix one. ``LoadCase.vehicle`` is left 0 for the caller.
        """
        c = conversion(self.units, units)

        def impact_of(item: Part) -> float:
            if item.impact_formula is not None:
                return 0.0
            return impact if item.impact is None else item.impact

        return [
            LoadCase(
                label=self.label(item),
                train=item.train.scaled(c.force, c.length),
                lane_load=item.lane_load * c.line_load,
                impact=impact_of(item),
                impact_formula=None
                if item.impact_formula is None
                else item.impact_formula.scaled(c.length),
                factor=item.factor,
                scope=item.scope,
                min_span=item.min_span * c.length,
                drop_adverse_axles=item.drop_adverse_axles,
                fatigue=item.fatigue,
                other_span_load=item.other_span_load,
            )
            for item in self.parts
        ]
