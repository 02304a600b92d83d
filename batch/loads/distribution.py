"""Live-load distribution factors of beam-slab bridges from the girder layout (AASHTO LRFD 4.6.2.2).

Pure arithmetic on one girder's layout: the approximate formulas of AASHTO LRFD
Article 4.6.2.2 for the cross-sections of Table 4.6.2.2.1-1 that have a
concrete deck on separate girders:

* (a) steel beams with a concrete deck;
* (e) cast-in-place concrete T-beams;
* (k) precast concrete I or bulb-tee sections with a cast-in-place deck.

Every factor is in design lanes per girder and is "as tabulated": the formulas
include the multiple presence factors; the lever rule applies them
explicitly (Table 3.6.1.1.2-1: 1.2 for one lane). The formulas are in US
customary units (S, L and d_e in ft, t_s in in, K_g in in4): :func:`member_factors`
takes its inputs in those units, and a caller with SI values converts them
exactly first (1 ft = 0.3048 m, 1 in = 25.4 mm; :func:`to_us`). The SI edition's
own constants (S/4300 and so on) are rounded conversions and are not used.

What the member gets (:func:`member_factors`):

* moment: a factor for positive moment in every span (L the span), and for
  negative moment over every interior support (L the average of the two
  adjacent spans; LRFD C4.6.2.2.1, from memory); shear: one per span (L the
  span); each for one lane and for two or more lanes;
* interior girders: Tables 4.6.2.2.2b-1 (moment) and 4.6.2.2.3a-1 (shear);
  exterior girders: the lever rule for one lane, and e times the interior
  factor for two or more lanes, e = 0.77 + d_e/9.1 for moment (Table
  4.6.2.2.2d-1) and 0.6 + d_e/10 for shear (Table 4.6.2.2.3b-1);
* beam spacing beyond 16 ft: the lever rule (Art. 4.6.2.2.1); three girders:
  the lesser of the formula and the lever rule for moment, the lever rule for
  shear (the tables' rows for N_b = 3, from memory);
* skew: the moment factors times 1 - c1 (tan theta)^1.5 (Table 4.6.2.2.2e-1),
  the shear factors times 1 + 0.20 (12 L t_s^3 / K_g)^0.3 tan theta (Table
  4.6.2.2.3c-1). The specification asks for the shear correction at the obtuse
  corner of the exterior girder and, for end shear, of every girder; spanfleet
  applies it to the member's whole shear factor, for interior and exterior
  girders alike (conservative).

A parameter outside a formula's range of applicability is not clamped: the
factor is computed with the formula as it stands, and a note names the limit
and the table (the specification then calls for a refined analysis, Art.
4.6.3). The member's factor for the run is the largest of its factors, one
lane or several, over all its spans and supports (conservative where the
spans differ); its single-lane factor the largest one-lane factor.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Literal, NamedTuple

from batch.loads.sourced import Sourced
from batch.model.case import CrossSection, GirderLayout, GirderPosition
from batch.model.units import M_PER_FT, UnitSystem

__all__ = [
    "DISTRIBUTION_SOURCES",
    "LAYOUT_DFS",
    "MM_PER_IN",
    "Factor",
    "Girder",
    "MemberFactors",
    "Note",
    "layout_factors",
    "layout_girder",
    "layout_stiffness",
    "lever_rule_exterior",
    "lever_rule_interior",
    "member_factors",
    "multiple_presence",
    "number",
    "stiffness_parameter",
]

#: Millimetres in one inch (exact, by the definition of the inch: 25.4 mm).
MM_PER_IN = 25.4

_LRFD = "AASHTO LRFD Bridge Design Specifications"
_FHWA_PSC = (
    "FHWA, Comprehensive Design Example for Prestressed Concrete Girder Superstructure "
    "Bridge, Design Step 5.1"
)
_TXDOT = (
    "TxDOT Bridge Division, LRFD Live Load Distribution Factors calculation sheets "
    "(8th ed. 2017 specifications, rev. 10/18), p. 1"
)
_EXTERIOR_EXAMPLE = (
    "a worked example of exterior-beam factors by Tables S4.6.2.2.2d-1 and S4.6.2.2.3b-1 "
    "(e = 1.09 and 0.90 at d_e = 2.95 ft; lever rule 0.79, x 1.2 = 0.950)"
)

MOMENT_INTERIOR = Sourced(
    what="interior moment, types a, e, k: one lane 0.06 + (S/14)^0.4 (S/L)^0.3 "
    "(Kg/(12 L ts^3))^0.1; two or more 0.075 + (S/9.5)^0.6 (S/L)^0.2 (Kg/(12 L ts^3))^0.1",
    value=(0.06, 14.0, 0.075, 9.5),
    source=f"{_LRFD}, Table 4.6.2.2.2b-1",
    status="secondary",
    seen=f"{_TXDOT} (0.635 and 0.614 reproduced); {_FHWA_PSC} (0.796, 0.542)",
)
SHEAR_INTERIOR = Sourced(
    what="interior shear, types a, e, k: one lane 0.36 + S/25; two or more 0.2 + S/12 - (S/35)^2",
    value=(0.36, 25.0, 0.2, 12.0, 35.0),
    source=f"{_LRFD}, Table 4.6.2.2.3a-1",
    status="secondary",
    seen=f"{_TXDOT} (0.712 and, with skew, 0.775 reproduced)",
)
EXTERIOR_MOMENT = Sourced(
    what="exterior moment, two or more lanes: e x interior, e = 0.77 + de/9.1 (de in ft); "
    "one lane: the lever rule",
    value=(0.77, 9.1),
    source=f"{_LRFD}, Table 4.6.2.2.2d-1",
    status="secondary",
    seen=_EXTERIOR_EXAMPLE,
)
EXTERIOR_SHEAR = Sourced(
    what="exterior shear, two or more lanes: e x interior, e = 0.6 + de/10 (de in ft); "
    "one lane: the lever rule",
    value=(0.6, 10.0),
    source=f"{_LRFD}, Table 4.6.2.2.3b-1",
    status="secondary",
    seen=_EXTERIOR_EXAMPLE,
)
SKEW_MOMENT = Sourced(
    what="skew, moment: 1 - c1 (tan theta)^1.5, c1 = 0.25 (Kg/(12 L ts^3))^0.25 (S/L)^0.5; "
    "c1 = 0 below 30 degrees, theta = 60 degrees above 60",
    value=(0.25, 30.0, 60.0),
    source=f"{_LRFD}, Table 4.6.2.2.2e-1",
    status="from memory",
)
SKEW_SHEAR = Sourced(
    what="skew, shear: 1 + 0.20 (12 L ts^3 / Kg)^0.3 tan theta",
    value=(0.20,),
    source=f"{_LRFD}, Table 4.6.2.2.3c-1",
    status="secondary",
    seen=f"{_TXDOT}: 0.775 at 15 degrees reproduced",
)
LEVER_RULE = Sourced(
    what="lever rule: deck hinged over the interior girders; wheel lines 6 ft apart, the "
    "outer one 2 ft from the barrier face; the multiple presence factor applied",
    value=(6.0, 2.0),
    unit="ft",
    source=f"{_LRFD}, Art. 3.6.1.3.1, C4.6.2.2.1 and Table 4.6.2.2.2d-1",
    status="secondary",
    seen=_EXTERIOR_EXAMPLE,
)
MULTIPLE_PRESENCE = Sourced(
    what="multiple presence factors, 1, 2, 3 and more than 3 loaded lanes",
    value=(1.2, 1.0, 0.85, 0.65),
    source=f"{_LRFD}, Table 3.6.1.1.2-1",
    status="secondary",
    seen=f"{_EXTERIOR_EXAMPLE}, which uses 1.20, 1.00 and 0.85; 0.65 from memory",
)
WIDE_SPACING = Sourced(
    what="beam spacing beyond the range of applicability: the lever rule",
    source=f"{_LRFD}, Art. 4.6.2.2.1",
    status="secondary",
    seen=_FHWA_PSC,
)
THREE_GIRDERS = Sourced(
    what="three girders: moment the lesser of the formula and the lever rule; shear the lever rule",
    source=f"{_LRFD}, Tables 4.6.2.2.2b-1, 4.6.2.2.2d-1, 4.6.2.2.3a-1 and 4.6.2.2.3b-1",
    status="from memory",
)
NEGATIVE_MOMENT_LENGTH = Sourced(
    what="L in the formulas: the span for positive moment and shear; the average of the two "
    "adjacent spans for negative moment near an interior support",
    source=f"{_LRFD}, C4.6.2.2.1 (table of L for use in the distribution factor equations)",
    status="from memory",
)
STIFFNESS_PARAMETER = Sourced(
    what="longitudinal stiffness parameter Kg = n (I + A eg^2), n = E_beam / E_deck",
    source=f"{_LRFD}, Eq. 4.6.2.2.1-1",
    status="secondary",
    seen=f"{_TXDOT} (Kg = 1,132,028 in4 from I, A and eg)",
)

#: Ranges of applicability: (symbol, low, high, unit) per parameter; high None: open.
RANGE_S = ("S", 3.5, 16.0, "ft")
#: Beyond this spacing (ft) the lever rule replaces the formulas (Art. 4.6.2.2.1).
RANGE_WIDEST = RANGE_S[2]
RANGE_TS = ("ts", 4.5, 12.0, "in")
RANGE_L = ("L", 20.0, 240.0, "ft")
RANGE_KG = ("Kg", 10_000.0, 7_000_000.0, "in4")
RANGE_NB = ("Nb", 4.0, None, "")
RANGE_DE = ("de", -1.0, 5.5, "ft")
RANGE_SKEW = ("theta", 0.0, 60.0, "deg")
RANGES = Sourced(
    what="ranges of applicability: 3.5 <= S <= 16.0 ft, 4.5 <= ts <= 12.0 in, "
    "20 <= L <= 240 ft, 10,000 <= Kg <= 7,000,000 in4, Nb >= 4, -1.0 <= de <= 5.5 ft, "
    "skew at most 60 degrees",
    value=(3.5, 16.0, 4.5, 12.0, 20.0, 240.0, 10_000.0, 7_000_000.0, 4.0, -1.0, 5.5, 60.0),
    source=f"{_LRFD}, Tables 4.6.2.2.2b-1, 4.6.2.2.2d-1, 4.6.2.2.2e-1, 4.6.2.2.3a-1, "
    "4.6.2.2.3b-1, 4.6.2.2.3c-1",
    status="from memory",
    seen="",
)

#: Every published value and rule this module uses, for the docs.
DISTRIBUTION_SOURCES: tuple[Sourced, ...] = (
    MOMENT_INTERIOR,
    SHEAR_INTERIOR,
    EXTERIOR_MOMENT,
    EXTERIOR_SHEAR,
    SKEW_MOMENT,
    SKEW_SHEAR,
    LEVER_RULE,
    MULTIPLE_PRESENCE,
    WIDE_SPACING,
    THREE_GIRDERS,
    NEGATIVE_MOMENT_LENGTH,
    STIFFNESS_PARAMETER,
    RANGES,
)

Range = tuple[str, float, float | None, str]


def multiple_presence(lanes: int) -> float:
    """The multiple presence factor m of ``lanes`` loaded lanes (LRFD Table 3.6.1.1.2-1)."""
    if lanes < 1:
        raise ValueError("at least one loaded lane")
    return float(MULTIPLE_PRESENCE.value[min(lanes, 4) - 1])  # type: ignore[arg-type]


def _wheel_sum(positions: Sequence[float], ordinate: Callable[[float], float]) -> float:
    """Lanes carried: half a lane per wheel line times the girder's share of it."""
    return math.fsum(0.5 * ordinate(p) for p in positions)


def lever_rule_exterior(spacing: float, overhang: float, lanes: int) -> float:
    """Exterior-girder factor by the lever rule, ``lanes`` loaded lanes, times m (lanes/girder).

    ``spacing`` S (ft) to the first interior girder, where the deck is taken as
    hinged; ``overhang`` d_e (ft) from the exterior girder's web to the barrier
    face, positive when the roadway is outboard of the web. Each truck is two
    wheel lines 6 ft apart, the outer one of the first 2 ft from the barrier
    face and the trucks of the next lanes pushed towards the barrier in their
    12-ft lanes, so that the wheel lines lie every 6 ft from there; a wheel
    line beyond the hinge carries nothing to the exterior girder.
    """
    outer = spacing + overhang - LEVER_RULE.value[1]  # type: ignore[operator]
    wheels = [outer - 6.0 * k for k in range(2 * lanes)]
    reaction = _wheel_sum(wheels, lambda d: max(d, 0.0) / spacing)
    return multiple_presence(lanes) * reaction


def lever_rule_interior(spacing: float, lanes: int) -> float:
    """Interior-girder factor by the lever rule, ``lanes`` loaded lanes, times m (lanes/girder).

    The deck is hinged over the neighbouring girders, ``spacing`` S (ft) each
    side, so the girder's share of a wheel at distance d is 1 - d/S. The
    trucks (wheel lines 6 ft apart) sit in adjacent 12-ft lanes as close as the
    2-ft edge distance lets them (4 ft between the wheel lines of neighbouring
    trucks); the pattern is slid across the girder and the largest reaction
    kept, found exactly at the positions where a wheel line meets the girder or
    the end of its influence (a piecewise linear sum is largest at a kink).
    """
    pattern = _truck_pattern(lanes)

    def share(d: float) -> float:
        return max(0.0, 1.0 - abs(d) / spacing)

    shifts = {kink - w for w in pattern for kink in (-spacing, 0.0, spacing)}
    best = max(_wheel_sum([w + s for w in pattern], share) for s in shifts)
    return multiple_presence(lanes) * best


def _truck_pattern(lanes: int) -> list[float]:
    """Wheel-line offsets (ft) of ``lanes`` trucks packed in adjacent lanes: 0, 6, 10, 16, ..."""
    out: list[float] = []
    for k in range(lanes):
        start = 10.0 * k
        out += [start, start + 6.0]
    return out


def stiffness_parameter(ratio: float, inertia: float, area: float, eccentricity: float) -> float:
    """K_g = n (I + A e_g^2) (LRFD Eq. 4.6.2.2.1-1): in4 from in4, in2 and in (or mm alike).

    ``ratio`` n is the modular ratio E_beam / E_deck; ``inertia`` I and ``area``
    A are the girder's own (non-composite); ``eccentricity`` e_g the distance
    between the girder's centroid and the deck's mid-depth.
    """
    return ratio * (inertia + area * eccentricity**2)


def layout_stiffness(layout: GirderLayout) -> float | None:
    """K_g of a layout row in its own units (in4 or mm4): as given, or n (I + A e_g^2)."""
    if layout.stiffness is not None:
        return layout.stiffness
    parts = (layout.modular_ratio, layout.inertia, layout.area, layout.eccentricity)
    if any(p is None for p in parts):
        return None
    n, i, a, e = (float(p) for p in parts)  # type: ignore[arg-type]
    return stiffness_parameter(n, i, a, e)


def layout_girder(layout: GirderLayout, units: UnitSystem) -> Girder:
    """A Girder Layout row in the formulas' US customary units, converted exactly from SI.

    SI: lengths m / 0.3048 = ft, thicknesses mm / 25.4 = in, K_g mm4 / 25.4^4 =
    in4 (the foot and the inch are exact in metres and millimetres).
    """
    stiffness = layout_stiffness(layout)
    if stiffness is None:
        raise ValueError(f"member {layout.member!r}: give Kg, or n, Girder I, Girder A and eg")
    length, thickness, inertia = (1.0, 1.0, 1.0) if units == "US" else _SI_TO_US
    return Girder(
        cross_section=layout.cross_section,
        position=layout.position,
        girders=layout.girders,
        spacing=layout.spacing * length,
        deck=layout.deck * thickness,
        stiffness=stiffness * inertia,
        overhang=None if layout.overhang is None else layout.overhang * length,
        skew=layout.skew,
    )


def layout_factors(
    layout: GirderLayout, spans: Sequence[float], units: UnitSystem
) -> MemberFactors:
    """The factors of a member of ``spans`` (the run's length unit) with ``layout``."""
    length = 1.0 if units == "US" else _SI_TO_US[0]
    return member_factors(layout_girder(layout, units), [s * length for s in spans])


#: The Members columns a girder layout fills in when they are blank, by MemberFactors name.
LAYOUT_DFS = {
    "df_moment": "moment",
    "df_shear": "shear",
    "df_moment_single": "moment_single",
    "df_shear_single": "shear_single",
}

#: Multipliers from SI to the formulas' units: m to ft, mm to in, mm4 to in4 (exact).
_SI_TO_US = (1.0 / M_PER_FT, 1.0 / MM_PER_IN, 1.0 / MM_PER_IN**4)


@dataclass(frozen=True, kw_only=True)
class Girder:
    """One girder's layout, in the formulas' US customary units.

    ``cross_section`` is its letter in LRFD Table 4.6.2.2.1-1; ``position``
    interior or exterior; ``girders`` N_b, the number of girders in the cross
    section; ``spacing`` S (ft) between girder centrelines (for an exterior
    girder, to the first interior one); ``deck`` t_s (in), the structural
    deck thickness; ``stiffness`` K_g (in4); ``overhang`` d_e (ft), from the
    exterior girder's web centreline to the inside face of the barrier or curb,
    positive when the roadway is outboard of the web (exterior girders only);
    ``skew`` theta (degrees), the angle between the support line and the
    normal to the girders.
    """

    cross_section: CrossSection
    position: GirderPosition
    girders: int
    spacing: float
    deck: float
    stiffness: float
    overhang: float | None = None
    skew: float = 0.0


Effect = Literal["positive moment", "negative moment", "shear"]


@dataclass(frozen=True, kw_only=True)
class Factor:
    """One distribution factor of a member (design lanes per girder).

    ``effect`` and ``where`` (span k or support k, counted from the member's
    left end) say what it is for; ``lanes`` 1 for one loaded lane, 2 for two or
    more; ``length`` the L (ft) in its formulas; ``base`` the factor before the
    skew correction ``skew`` (1 where none); ``method`` how it was found and
    ``source`` the article or table; ``notes`` each limit of a range of
    applicability it is outside (empty: within every range).
    """

    effect: Effect
    where: str
    lanes: int
    length: float
    base: float
    skew: float
    method: str
    source: str
    notes: tuple[Note, ...] = ()

    @property
    def value(self) -> float:
        """The factor with its skew correction."""
        return self.base * self.skew

    @property
    def is_moment(self) -> bool:
        """True for a moment factor (positive or negative)."""
        return self.effect != "shear"


@dataclass(frozen=True, kw_only=True)
class MemberFactors:
    """All the factors of one member, and the four the run uses.

    ``moment`` and ``shear`` are the largest factors, one lane or several, over
    all spans and supports; ``moment_single`` and ``shear_single`` the largest
    one-lane factors (with the multiple presence factor 1.2 in them).
    """

    factors: tuple[Factor, ...]

    def largest(self, moment: bool, single: bool) -> Factor:
        """The largest moment (or shear) factor: one-lane ones only when ``single``."""
        return max(
            (f for f in self.factors if f.is_moment == moment and (f.lanes == 1 or not single)),
            key=lambda f: f.value,
        )

    @property
    def moment(self) -> float:
        """The governing moment factor."""
        return self.largest(True, False).value

    @property
    def shear(self) -> float:
        """The governing shear factor."""
        return self.largest(False, False).value

    @property
    def moment_single(self) -> float:
        """The governing one-lane moment factor."""
        return self.largest(True, True).value

    @property
    def shear_single(self) -> float:
        """The governing one-lane shear factor."""
        return self.largest(False, True).value


class Note(NamedTuple):
    """A parameter outside a formula's range of applicability.

    ``symbol`` names the parameter (S, ts, L, Kg, Nb, de, theta), ``value`` its
    value and ``bound`` the range it is outside, in the formulas' units;
    ``table`` the table whose range it is.
    """

    symbol: str
    value: float
    bound: str
    table: str

    @property
    def text(self) -> str:
        """The note in words."""
        return (
            f"{self.symbol} = {number(self.value)} is outside {self.bound} of LRFD {self.table}: "
            "the specification calls for a refined analysis (Art. 4.6.3); computed with the "
            "formula"
        )


def number(value: float) -> str:
    """A parameter as the notes show it: 13, 9.667, 2,984,704."""
    return f"{value:,.0f}" if abs(value) >= 10_000 else f"{value:.4g}"


def _outside(value: float, limit: Range, table: str) -> tuple[Note, ...]:
    """A note when ``value`` is outside ``limit`` of ``table`` (empty when within)."""
    symbol, low, high, unit = limit
    if value >= low and (high is None or value <= high):
        return ()
    bound = f"{number(low)} <= {symbol}" + (f" <= {number(high)}" if high is not None else "")
    return (Note(symbol, value, f"{bound} {unit}".strip(), table),)


def _ranges(g: Girder, length: float, table: str, *, stiffness: bool = True) -> tuple[Note, ...]:
    notes = _outside(g.spacing, RANGE_S, table)
    notes += _outside(g.deck, RANGE_TS, table)
    notes += _outside(length, RANGE_L, table)
    if stiffness:
        notes += _outside(g.stiffness, RANGE_KG, table)
    return notes


def _lever_many(g: Girder) -> float:
    """The largest lever-rule factor with two or more loaded lanes."""
    if g.position == "exterior":
        return max(lever_rule_exterior(g.spacing, g.overhang or 0.0, n) for n in (2, 3, 4))
    return max(lever_rule_interior(g.spacing, n) for n in (2, 3, 4))


def _lever(g: Girder, lanes: int) -> float:
    if lanes == 1:
        if g.position == "exterior":
            return lever_rule_exterior(g.spacing, g.overhang or 0.0, 1)
        return lever_rule_interior(g.spacing, 1)
    return _lever_many(g)


_Found = tuple[float, str, str, tuple[Note, ...]]

_LEVER_WIDE = f"lever rule (S > 16.0 ft, {WIDE_SPACING.source})"
_LEVER = "lever rule"


def _formula_moment(g: Girder, length: float, lanes: int) -> tuple[float, tuple[Note, ...]]:
    """Table 4.6.2.2.2b-1's interior moment formula, and its range notes."""
    kg = (g.stiffness / (12.0 * length * g.deck**3)) ** 0.1
    s = g.spacing
    if lanes == 1:
        value = 0.06 + (s / 14.0) ** 0.4 * (s / length) ** 0.3 * kg
    else:
        value = 0.075 + (s / 9.5) ** 0.6 * (s / length) ** 0.2 * kg
    return value, _ranges(g, length, "Table 4.6.2.2.2b-1")


def _moment(g: Girder, length: float, lanes: int) -> _Found:
    """A moment factor: formula, e x interior, lever rule, or the lesser (Nb = 3)."""
    table = "Table 4.6.2.2.2b-1" if g.position == "interior" else "Table 4.6.2.2.2d-1"
    if g.spacing > RANGE_WIDEST:
        return _lever(g, lanes), _LEVER_WIDE, WIDE_SPACING.source, ()
    if g.position == "exterior" and lanes == 1:
        return _lever(g, 1), "lever rule, one lane x m 1.2", f"{_LRFD}, {table}", ()
    value, notes = _formula_moment(g, length, lanes)
    how = "formula"
    if g.position == "exterior":
        de = g.overhang or 0.0
        e = 0.77 + de / 9.1
        notes += _outside(de, RANGE_DE, table)
        value *= e
        how = f"e x interior, e = 0.77 + de/9.1 = {e:.4f}"
    if g.girders == 3:
        lever = _lever(g, lanes)
        source = f"{_LRFD}, {table} (Nb = 3)"
        if lever < value:
            return (
                lever,
                f"lesser of {how.split(',')[0]} and lever rule (Nb = 3): lever rule",
                source,
                (),
            )
        return value, f"lesser of {how} and lever rule (Nb = 3)", source, notes
    return value, how, f"{_LRFD}, {table}", notes


def _shear(g: Girder, length: float, lanes: int) -> _Found:
    interior_table = "Table 4.6.2.2.3a-1"
    table = interior_table if g.position == "interior" else "Table 4.6.2.2.3b-1"
    if g.spacing > RANGE_WIDEST:
        return _lever(g, lanes), _LEVER_WIDE, WIDE_SPACING.source, ()
    if g.girders == 3:
        return _lever(g, lanes), "lever rule (Nb = 3)", f"{_LRFD}, {table} (Nb = 3)", ()
    if g.position == "exterior" and lanes == 1:
        return _lever(g, 1), "lever rule, one lane x m 1.2", f"{_LRFD}, {table}", ()
    s = g.spacing
    notes = _ranges(g, length, interior_table, stiffness=False)
    if lanes == 1:
        return 0.36 + s / 25.0, "formula", f"{_LRFD}, {table}", notes
    interior = 0.2 + s / 12.0 - (s / 35.0) ** 2
    if g.position == "interior":
        return interior, "formula", f"{_LRFD}, {table}", notes
    de = g.overhang or 0.0
    e = 0.6 + de / 10.0
    notes += _outside(de, RANGE_DE, table)
    return e * interior, f"e x interior, e = 0.6 + de/10 = {e:.4f}", f"{_LRFD}, {table}", notes


def _skew_ranges(g: Girder, length: float, table: str) -> tuple[Note, ...]:
    notes = _outside(g.spacing, RANGE_S, table)
    notes += _outside(length, RANGE_L, table)
    notes += _outside(float(g.girders), RANGE_NB, table)
    return notes


def skew_moment(g: Girder, length: float) -> tuple[float, tuple[Note, ...]]:
    """The moment factors' skew reduction 1 - c1 (tan theta)^1.5 and its range notes.

    c1 = 0.25 (K_g / (12 L t_s^3))^0.25 (S/L)^0.5; no reduction below 30
    degrees; theta is taken as 60 degrees above 60 (LRFD Table 4.6.2.2.2e-1).
    """
    if g.skew < SKEW_MOMENT.value[1]:  # type: ignore[operator]
        return 1.0, ()
    theta = math.radians(min(g.skew, 60.0))
    c1 = 0.25 * (g.stiffness / (12.0 * length * g.deck**3)) ** 0.25 * (g.spacing / length) ** 0.5
    return 1.0 - c1 * math.tan(theta) ** 1.5, _skew_ranges(g, length, "Table 4.6.2.2.2e-1")


def skew_shear(g: Girder, length: float) -> tuple[float, tuple[Note, ...]]:
    """The shear factors' skew correction 1 + 0.20 (12 L t_s^3 / K_g)^0.3 tan theta, and notes.

    LRFD Table 4.6.2.2.3c-1, for 0 <= theta <= 60 degrees (beyond: computed
    with the formula, and a note).
    """
    if g.skew <= 0.0:
        return 1.0, ()
    table = "Table 4.6.2.2.3c-1"
    term = (12.0 * length * g.deck**3 / g.stiffness) ** 0.3
    notes = _skew_ranges(g, length, table) + _outside(g.skew, RANGE_SKEW, table)
    return 1.0 + 0.20 * term * math.tan(math.radians(g.skew)), notes


def member_factors(g: Girder, spans: Sequence[float]) -> MemberFactors:
    """Every distribution factor of a girder of ``spans`` (ft), and the ones the run uses."""
    if not spans or any(s <= 0 for s in spans):
        raise ValueError("spans must be positive lengths")
    if g.girders < 3:
        raise ValueError("the formulas need at least three girders")
    if g.position == "exterior" and g.overhang is None:
        raise ValueError("an exterior girder needs its overhang d_e")
    places: list[tuple[Effect, str, float]] = []
    for k, span in enumerate(spans, 1):
        places.append(("positive moment", f"span {k}", span))
    for k in range(1, len(spans)):
        places.append(("negative moment", f"support {k + 1}", 0.5 * (spans[k - 1] + spans[k])))
    for k, span in enumerate(spans, 1):
        places.append(("shear", f"span {k}", span))
    out = []
    for effect, where, length in places:
        moment = effect != "shear"
        skew, skew_notes = skew_moment(g, length) if moment else skew_shear(g, length)
        for lanes in (1, 2):
            base, method, source, notes = (_moment if moment else _shear)(g, length, lanes)
            if skew != 1.0:
                table = "4.6.2.2.2e-1" if moment else "4.6.2.2.3c-1"
                method += f"; skew x {skew:.4f} (Table {table})"
                notes += skew_notes
            out.append(
                Factor(
                    effect=effect,
                    where=where,
                    lanes=lanes,
                    length=length,
                    base=base,
                    skew=skew,
                    method=method,
                    source=source,
                    notes=tuple(dict.fromkeys(notes)),
                )
            )
    return MemberFactors(factors=tuple(out))
