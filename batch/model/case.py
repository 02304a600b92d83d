"""The typed input of a run: settings, members (girder lines), vehicles and capacities.

Each field that is read from the input is declared here, once, as an input column
(:func:`batch.model.declare.column`): its header, kind, unit, rules, meaning and
example. The sheets, the JSON Schema, the reader and the template are generated
from these declarations.

Everything here is a frozen, keyword-only dataclass holding validated values in
one consistent unit system, named once on :class:`Settings`:

* ``US``: kip, ft, kip-ft, kip/ft
* ``SI``: kN, m, kN-m, kN/m

Positions are measured in the length unit from the member's left end. Loads are
positive downward (gravity). The engine (``batch.engine``) uses the sign
conventions of docs/workbook.md: sagging moment positive, shear V = dM/dx
(the sum of the upward forces left of the section), reactions upward positive.
"""

from __future__ import annotations

import functools
import itertools
import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Literal, get_args

from batch.model.declare import column
from batch.model.layout import Section, section_of
from batch.model.units import UNIT_LABELS, UnitSystem

Directions = Literal["both", "left-to-right", "right-to-left"]
Category = Literal["design", "legal", "permit"]
Haunch = Literal["none", "linear", "parabolic"]
ImpactRule = Literal["Settings", "Standard Specifications"]

DIRECTIONS: tuple[str, ...] = get_args(Directions)
CATEGORIES: tuple[str, ...] = get_args(Category)
HAUNCHES: tuple[str, ...] = get_args(Haunch)
IMPACT_RULES: tuple[str, ...] = get_args(ImpactRule)

# Per-bridge traffic and per-vehicle crossings (rating): the MBE's categories, in its words.
#: Riding surface of a bridge, for the dynamic load allowance of legal loads (MBE C6A.4.4.3).
RidingSurface = Literal["smooth", "minor deviations", "major deviations"]
#: Kind of permit crossing (MBE Table 6A.4.5.4.2a-1): routine (annual), or a special permit:
#: single trip escorted with no other vehicle on the bridge, single trip mixed with traffic,
#: multiple trips (fewer than 100 crossings) mixed with traffic.
PermitType = Literal["routine", "single-trip escorted", "single-trip", "multiple-trip"]
#: How a member is rated (AASHTO MBE): load and resistance factor rating (Section 6A), or,
#: for bridges designed by the Standard Specifications, load factor rating or allowable
#: stress rating (Section 6B).
RatingMethod = Literal["LRFR", "LFR", "ASR"]
RATING_METHODS: tuple[RatingMethod, ...] = get_args(RatingMethod)
#: The material of a member checked at a service limit state, which decides the LRFR limit
#: state (MBE Table 6A.4.2.2-1): Service II for steel, Service III for prestressed concrete,
#: Service I (permits) for reinforced concrete.
Material = Literal["steel", "prestressed concrete", "reinforced concrete"]
MATERIALS: tuple[Material, ...] = get_args(Material)
#: How a prestressed member's losses were estimated, which sets its Service III inventory
#: live-load factor (MBE Table 6A.4.2.2-2, added by the 3rd edition's errata).
PrestressLosses = Literal["approximate", "refined with elastic gains"]
PRESTRESS_LOSSES: tuple[PrestressLosses, ...] = get_args(PrestressLosses)
#: The moment sense a Capacities row's service stresses are checked in.
ServiceEffect = Literal["M+", "M-"]
SERVICE_EFFECTS: tuple[ServiceEffect, ...] = get_args(ServiceEffect)
RIDING_SURFACES: tuple[RidingSurface, ...] = get_args(RidingSurface)
PERMIT_TYPES: tuple[PermitType, ...] = get_args(PermitType)

#: Most spacing ranges in one vehicle (the engine sweeps 3**n combinations).
MAX_RANGES = 4


#: Member id used by the example rows of Members and Capacities (they must agree).
_EXAMPLE_MEMBER = "KV-0412 G1"
#: Bridge id used by the example rows of Bridges and Members (they must agree).
_EXAMPLE_BRIDGE = "KV-0412"

# Rating settings: the published values quoted in their meanings are those of the MBE
# (AASHTO Manual for Bridge Evaluation, 2nd ed. 2011 onward) and of AASHTO LRFD Table
# 3.4.1-2 for the relieving (minimum) dead-load factors; batch/loads/factors.py keeps
# the same values, with their status, beside the checks that use them.


def _load_factor(header: str, default: float, meaning: str) -> float:
    """A rating load factor setting: 1.0 to 2.5."""
    return column(  # type: ignore[no-any-return]
        header, "number", default=default, minimum=1.0, maximum=2.5, meaning=meaning
    )


def _relieving_factor(header: str, default: float, meaning: str) -> float:
    """A dead-load factor used where the dead load relieves the rated effect: 0 to 1."""
    return column(  # type: ignore[no-any-return]
        header, "number", default=default, minimum=0.0, maximum=1.0, meaning=meaning
    )


@dataclass(frozen=True, kw_only=True)
class Settings:
    """Run settings: one row of the Settings sheet per field.

    ``impact`` is the dynamic load allowance IM as a fraction (0.33 = 33 %),
    applied to axle loads only, never to lane loads.

    Rating (see :mod:`batch.rating`): ``dc_factor`` and ``dw_factor`` are the
    dead-load factors, ``dc_factor_relieving`` and ``dw_factor_relieving`` the
    ones used where a dead load relieves the rated effect; ``ll_factor_*`` the
    live-load factors by vehicle category (design: inventory and operating).
    Screening: ``reference_vehicle`` names a Vehicles row or a library model
    ("" for none); ``screening_floor`` is the share of the reference's largest
    effect below which an effect is not compared.
    """

    units: UnitSystem = column(
        "Units",
        "choice",
        default="US",
        choices=("US", "SI"),
        meaning="US: kip, ft, kip-ft, kip/ft. SI: kN, m, kN-m, kN/m.",
    )
    directions: Directions = column(
        "Directions",
        "choice",
        default="both",
        choices=DIRECTIONS,
        meaning="Directions of travel to consider.",
    )
    stations_per_span: int = column(
        "Stations per span",
        "number",
        default=10,
        whole=True,
        minimum=1,
        maximum=100,
        meaning="Whole number n >= 1: stations at 0, 1/n, ..., 1 of every span.",
    )
    impact: float = column(
        "Dynamic load allowance",
        "number",
        default=0.33,
        minimum=0.0,
        maximum=1.0,
        meaning="Fraction added to axle loads only (0.33 = 33 %); never to lane loads.",
    )
    chart_members: int = column(
        "Chart members",
        "number",
        default=50,
        whole=True,
        minimum=0,
        meaning="How many members get a moment-envelope chart (the first n).",
    )
    dc_factor: float = _load_factor(
        "DC factor",
        1.25,
        "Rating: load factor on component dead load DC, Strength I (MBE Table "
        "6A.4.2.2-1: 1.25). Allowed 1.0 to 2.5.",
    )
    dw_factor: float = _load_factor(
        "DW factor",
        1.5,
        "Rating: load factor on wearing-surface dead load DW, Strength I (MBE: 1.50; "
        "1.25 where the overlay thickness is measured in the field). Allowed 1.0 to 2.5.",
    )
    dc_factor_relieving: float = _relieving_factor(
        "DC factor relieving",
        0.9,
        "Rating: factor on DC where the dead load relieves the rated effect (opposite "
        "sign), so that relief is not overstated (LRFD Table 3.4.1-2 minimum: 0.90). "
        "Allowed 0 to 1.",
    )
    dw_factor_relieving: float = _relieving_factor(
        "DW factor relieving",
        0.65,
        "Rating: factor on DW where it relieves the rated effect (LRFD Table 3.4.1-2 "
        "minimum: 0.65). Allowed 0 to 1.",
    )
    ll_factor_design: float = _load_factor(
        "LL factor design",
        1.75,
        "Rating: live-load factor for design loads at the inventory level (MBE Table "
        "6A.4.2.2-1: 1.75). Allowed 1.0 to 2.5.",
    )
    ll_factor_operating: float = _load_factor(
        "LL factor design operating",
        1.35,
        "Rating: live-load factor for design loads at the operating level (MBE: 1.35). "
        "Design loads report both levels. Allowed 1.0 to 2.5.",
    )
    ll_factor_legal: float = _load_factor(
        "LL factor legal",
        1.45,
        "Rating: live-load factor for legal loads, routine commercial traffic. 1.45 is "
        "the MBE value for ADTT >= 5000 (Table 6A.4.4.2.3a-1), the highest of that table and "
        "the conservative choice when the ADTT is not known; 1.30 for ADTT <= 1000, "
        "interpolate between. "
        "Allowed 1.0 to 2.5.",
    )
    ll_factor_permit: float = _load_factor(
        "LL factor permit",
        1.3,
        "Rating: live-load factor for permit loads. 1.30 is the MBE value for routine "
        "(annual) permits mixed with traffic, ADTT > 5000, with the multi-lane distribution "
        "factor (MBE 6A.4.5.4.2; 1.20 at ADTT 1000, 1.10 below 100). Single-trip permits "
        "take other values and a one-lane distribution factor. Allowed 1.0 to 2.5.",
    )
    reference_vehicle: str = column(
        "Reference vehicle",
        "text",
        default="",
        meaning="Screening: a Vehicles row id or a built-in load model (e.g. HL-93), such as "
        "the load the members were designed for. When given, every vehicle's effects are "
        "compared with this one's (Screening sheet). Blank: no screening.",
    )
    screening_floor: float = column(
        "Screening floor",
        "number",
        default=0.1,
        minimum=0.0,
        below=1.0,
        meaning="Screening compares effects only where the reference's effect is at least this "
        "fraction of its largest effect of the same kind on the member (0.1 = 10 %), so that "
        "near-zero effects do not give meaningless ratios. spanfleet's choice, not a published "
        "value; 0 compares wherever the reference gives any effect.",
    )

    posting_step: float = column(
        "Posting rounded down to",
        "number",
        default=1.0,
        minimum=0.0,
        maximum=10.0,
        meaning="Postings sheet: each bridge's posting load is rounded down to a multiple of "
        "this weight (US tons or tonnes; 1 = whole tons), the owner's rounding rule; 0 leaves it "
        "unrounded. Rounding down keeps the posted value on the safe side.",
    )

    @property
    def unit_labels(self) -> dict[str, str]:
        """Unit labels of this run's unit system, keyed by quantity."""
        return UNIT_LABELS[self.units]


# ---------------------------------------------------------------- members as built: stiffness
# along a member (the Segments sheet).


@dataclass(frozen=True, kw_only=True)
class Segment:
    """One stretch of a member whose flexural stiffness is not its span's Span EI.

    ``start`` and ``end`` are measured from the member's left end (length unit);
    the stretch may cross supports. ``ei`` is on the same scale as Span EI
    (relative, or absolute through the member's EI scale). A haunch (``haunch``
    linear or parabolic) has ``ei`` at ``start`` and ``ei_end`` at ``end``; its
    depth varies linearly, or along a parabola whose vertex is at the shallower
    end, EI is taken proportional to the cube of the depth (a solid section),
    and the stretch is modelled as ``pieces`` prismatic pieces of equal length,
    each with the EI at its middle (see :meth:`prismatic`).
    """

    member: str = column(
        "Member",
        "id",
        required=True,
        meaning="Id of a member listed on the Members sheet.",
        example=_EXAMPLE_MEMBER,
    )
    start: float = column(
        "From",
        "number",
        required=True,
        quantity="length",
        minimum=0.0,
        meaning="Start of the stretch, measured from the member's left end.",
        example=52,
    )
    end: float = column(
        "To",
        "number",
        required=True,
        quantity="length",
        above=0.0,
        meaning="End of the stretch, measured from the member's left end; it may cross supports.",
        example=68,
    )
    ei: float = column(
        "EI",
        "number",
        required=True,
        above=0.0,
        meaning="Flexural stiffness over the stretch, on the scale of Span EI (e.g. 1.4 where "
        "cover plates stiffen a girder of Span EI 1); for a haunch, the value at From. It "
        "replaces Span EI over the stretch.",
        example=1.4,
    )
    ei_end: float | None = column(
        "EI at To",
        "number",
        default=None,
        above=0.0,
        meaning="For a haunch only: the stiffness at To (EI is then the value at From).",
    )
    haunch: Haunch = column(
        "Haunch",
        "choice",
        default="none",
        choices=HAUNCHES,
        meaning="none: prismatic (EI throughout). linear or parabolic: the depth varies so "
        "from From to To (a parabola's vertex at the shallower end), EI as the cube of the "
        "depth; modelled as Pieces prismatic pieces, each with the EI at its middle (an "
        "approximation: more pieces, smaller error).",
    )
    pieces: int = column(
        "Pieces",
        "number",
        default=12,
        whole=True,
        minimum=1,
        maximum=200,
        meaning="Haunch only: prismatic pieces of equal length the stretch is cut into.",
    )
    description: str = column(
        "Description",
        "text",
        default="",
        meaning="Free text.",
        example="EXAMPLE, replace or delete: cover plates over pier 1",
    )

    def stiffness_at(self, x: float) -> float:
        """EI at ``x`` inside the stretch (the haunch law; ``ei`` when prismatic)."""
        if self.haunch == "none" or self.ei_end is None:
            return self.ei
        t = (x - self.start) / (self.end - self.start)
        # Depths relative to the depth at From: EI ~ depth**3.
        d0, d1 = 1.0, float((self.ei_end / self.ei) ** (1.0 / 3.0))
        if self.haunch == "linear":
            depth = d0 + (d1 - d0) * t
        elif d1 >= d0:  # parabola, vertex (zero slope) at the shallower end From
            depth = d0 + (d1 - d0) * t * t
        else:  # vertex at To
            depth = d1 + (d0 - d1) * (1.0 - t) ** 2
        return float(self.ei * depth**3)

    def prismatic(self) -> tuple[tuple[float, float, float], ...]:
        """The stretch as prismatic pieces ``(start, end, EI)``: one, or ``pieces`` for a haunch.

        A haunch piece takes the EI at its middle (the midpoint rule), so the
        error in the effects shrinks as the square of the piece length.
        """
        if self.haunch == "none" or self.ei_end is None:
            return ((self.start, self.end, self.ei),)
        cuts = [self.start + (self.end - self.start) * k / self.pieces for k in range(self.pieces)]
        cuts.append(self.end)
        return tuple((a, b, self.stiffness_at(0.5 * (a + b))) for a, b in itertools.pairwise(cuts))


# ---------------------------------------------------------------- members as built: a member's
# own analysis options (the Analysis sheet).

#: Span/deflection limit used when a member asks for deflections and gives none (AASHTO
#: LRFD 2.5.2.6.2, vehicular load: L/800).
DEFAULT_DEFLECTION_LIMIT = 800.0


@dataclass(frozen=True, kw_only=True)
class Analysis:
    """One row of the Analysis sheet: how one member is analysed, where not as the settings say.

    ``stations_per_span`` replaces the setting for this member. Deflection is
    computed when ``ei_scale`` is given: the absolute flexural rigidity (rigidity
    unit, kip-in2 or kN-m2) that a stiffness of 1 on Span EI and Segments stands
    for; ``deflection_limit`` is the least span/deflection ratio accepted;
    ``df_deflection`` the distribution factor of the deflection loading (None:
    from the girder layout, else DF moment).
    """

    member: str = column(
        "Member",
        "id",
        required=True,
        meaning="Id of a member listed on the Members sheet.",
        example=_EXAMPLE_MEMBER,
    )
    stations_per_span: int | None = column(
        "Stations per span",
        "number",
        default=None,
        whole=True,
        minimum=1,
        maximum=100,
        meaning="This member's own number of stations per span, instead of the setting.",
        example=20,
    )
    ei_scale: float | None = column(
        "EI scale",
        "number",
        default=None,
        quantity="rigidity",
        above=0.0,
        meaning="Give it for live-load deflections: the absolute flexural rigidity E*I that a "
        "stiffness of 1 on Span EI and Segments stands for. E.g. the girder's E*I with Span "
        "EI 1; or, in US units, E in ksi with Span EI and Segments giving I in in4 "
        "(ksi x in4 = kip-in2); in SI, E in kN/m2 with I in m4.",
        example=2.9e9,
    )
    deflection_limit: float | None = column(
        "Deflection limit",
        "number",
        default=None,
        above=1.0,
        meaning="Least span/deflection ratio accepted, e.g. 800 for L/800 (AASHTO LRFD "
        "2.5.2.6.2: 800 for vehicular load, 1000 with pedestrians). Blank: 800.",
        example=800,
    )
    df_deflection: float | None = column(
        "DF deflection",
        "number",
        default=None,
        above=0.0,
        meaning="Distribution factor of the deflection loading. AASHTO LRFD 2.5.2.6.2 loads "
        "every design lane and takes all girders to deflect equally: lanes x multiple presence "
        "factor / girders. Blank: from the girder layout when the member has one, else DF "
        "moment (a warning says so).",
        example=0.45,
    )
    description: str = column(
        "Description",
        "text",
        default="",
        meaning="Free text.",
        example="EXAMPLE, replace or delete: deflection check",
    )


# ---------------------------------------------------------------- distribution factors from
# the girder layout (the Girder Layout sheet).

#: Cross-sections of AASHTO LRFD Table 4.6.2.2.1-1 whose factors spanfleet computes.
CrossSection = Literal["a", "e", "k"]
GirderPosition = Literal["interior", "exterior"]
CROSS_SECTIONS: tuple[str, ...] = get_args(CrossSection)
GIRDER_POSITIONS: tuple[str, ...] = get_args(GirderPosition)


@dataclass(frozen=True, kw_only=True)
class GirderLayout:
    """One row of the Girder Layout sheet: a girder's place in its cross-section.

    From it spanfleet computes the member's live-load distribution factors by
    AASHTO LRFD 4.6.2.2 (:mod:`batch.loads.distribution`). ``spacing`` and
    ``overhang`` are in the length unit (ft or m); ``deck`` and ``eccentricity``
    in the thickness unit (in or mm); ``stiffness`` (K_g) and ``inertia`` in in4
    or mm4, ``area`` in in2 or mm2; ``skew`` in degrees. K_g is given, or
    computed as n (I + A e_g^2) from ``modular_ratio``, ``inertia``, ``area`` and
    ``eccentricity``. ``overhang`` d_e is positive when the roadway edge (the
    barrier's inside face) is outboard of the exterior girder's web.
    """

    member: str = column(
        "Member",
        "id",
        required=True,
        meaning="Id of a member listed on the Members sheet.",
        example=_EXAMPLE_MEMBER,
    )
    cross_section: CrossSection = column(
        "Cross-section",
        "choice",
        required=True,
        choices=CROSS_SECTIONS,
        meaning="Letter of AASHTO LRFD Table 4.6.2.2.1-1: a steel beams with a concrete deck; "
        "e cast-in-place concrete T-beams; k precast concrete I or bulb-tee girders with a "
        "cast-in-place deck.",
        example="a",
    )
    position: GirderPosition = column(
        "Girder",
        "choice",
        required=True,
        choices=GIRDER_POSITIONS,
        meaning="interior or exterior: which of the member's girders the factors are for.",
        example="interior",
    )
    girders: int = column(
        "Girders",
        "number",
        required=True,
        whole=True,
        minimum=3,
        maximum=100,
        meaning="Nb, the number of girders in the cross-section (at least 3; the formulas are "
        "for 4 or more, 3 takes the lever rule where the specification says so).",
        example=5,
    )
    spacing: float = column(
        "Spacing",
        "number",
        required=True,
        quantity="length",
        above=0.0,
        meaning="S, centre-to-centre spacing of the girders (an exterior girder: to the first "
        "interior one).",
        example=8.5,
    )
    deck: float = column(
        "Deck thickness",
        "number",
        required=True,
        quantity="thickness",
        above=0.0,
        meaning="ts, structural thickness of the concrete deck.",
        example=8,
    )
    stiffness: float | None = column(
        "Kg",
        "number",
        default=None,
        quantity="inertia",
        above=0.0,
        meaning="Longitudinal stiffness parameter Kg = n (I + A eg^2) (LRFD Eq. 4.6.2.2.1-1); "
        "blank: computed from n, Girder I, Girder A and eg.",
    )
    modular_ratio: float | None = column(
        "n",
        "number",
        default=None,
        above=0.0,
        meaning="Modular ratio E girder / E deck, for Kg (e.g. about 8 for steel on normal "
        "concrete).",
        example=8,
    )
    inertia: float | None = column(
        "Girder I",
        "number",
        default=None,
        quantity="inertia",
        above=0.0,
        meaning="Second moment of area of the girder alone (non-composite), for Kg.",
        example=24000,
    )
    area: float | None = column(
        "Girder A",
        "number",
        default=None,
        quantity="area",
        above=0.0,
        meaning="Area of the girder alone, for Kg.",
        example=52,
    )
    eccentricity: float | None = column(
        "eg",
        "number",
        default=None,
        quantity="thickness",
        above=0.0,
        meaning="Distance between the centroid of the girder alone and mid-depth of the deck, "
        "for Kg.",
        example=26,
    )
    overhang: float | None = column(
        "Overhang de",
        "number",
        default=None,
        quantity="length",
        meaning="Exterior girder only, required there: de, from the web centreline of the "
        "exterior girder to the inside face of the barrier or curb; positive when the roadway "
        "extends outboard of the web, negative inboard.",
    )
    skew: float = column(
        "Skew",
        "number",
        default=0.0,
        quantity="angle",
        minimum=0.0,
        below=90.0,
        meaning="Skew angle of the supports, from the normal to the girders (0: square). "
        "Reduces the moment factors (LRFD Table 4.6.2.2.2e-1, from 30 degrees) and raises the "
        "shear ones (Table 4.6.2.2.3c-1).",
        example=0,
    )
    description: str = column(
        "Description",
        "text",
        default="",
        meaning="Free text.",
        example="EXAMPLE, replace or delete",
    )


def _override(header: str, meaning: str) -> float | None:
    """A bridge's own value of a rating load factor (blank: the table's or the Settings')."""
    return column(  # type: ignore[no-any-return]
        header, "number", default=None, minimum=1.0, maximum=2.5, meaning=meaning
    )


@dataclass(frozen=True, kw_only=True)
class Bridge:
    """One row of the Bridges sheet: a bridge's traffic and riding surface, for rating.

    ``adtt`` is the average daily truck traffic in one direction (None: not
    known); ``riding_surface`` sets the dynamic load allowance of legal loads
    (None: the run's). The ``*_factor*`` fields are the bridge's own load
    factors, which prevail over the MBE tables and the Settings (None: not
    overridden).
    """

    id: str = column(
        "Bridge",
        "id",
        required=True,
        meaning="Unique id of the bridge; members name it in their Bridge column.",
        example=_EXAMPLE_BRIDGE,
    )
    adtt: float | None = column(
        "ADTT",
        "number",
        default=None,
        minimum=0.0,
        meaning="Average daily truck traffic, one direction. Sets the legal and permit live-load "
        "factors (MBE Tables 6A.4.4.2.3a-1 and 6A.4.5.4.2a-1, interpolated). Blank: not known; "
        "the tables' conservative values are used, with a warning.",
        example=2500,
    )
    riding_surface: RidingSurface | None = column(
        "Riding surface",
        "choice",
        default=None,
        choices=RIDING_SURFACES,
        meaning="Condition of approaches, deck and joints, for the dynamic load allowance of "
        "legal loads (MBE C6A.4.4.3): smooth 10 %, minor deviations 20 %, major deviations "
        "33 %. Blank: the Settings' Dynamic load allowance.",
        example="minor deviations",
    )
    dc_factor: float | None = _override("DC factor", "The bridge's own DC factor; blank: Settings.")
    dw_factor: float | None = _override("DW factor", "The bridge's own DW factor; blank: Settings.")
    ll_factor_design: float | None = _override(
        "LL factor design", "The bridge's own inventory LL factor for design loads."
    )
    ll_factor_operating: float | None = _override(
        "LL factor design operating", "The bridge's own operating LL factor for design loads."
    )
    ll_factor_legal: float | None = _override(
        "LL factor legal", "The bridge's own LL factor for legal loads, instead of the MBE table."
    )
    ll_factor_permit: float | None = _override(
        "LL factor permit", "The bridge's own LL factor for permits, instead of the MBE table."
    )
    description: str = column(
        "Description",
        "text",
        default="",
        meaning="Free text.",
        example="EXAMPLE, replace or delete: Osprey Flats causeway (KVHA)",
    )


@dataclass(frozen=True, kw_only=True)
class Member:
    """One girder line: consecutive spans supported at both ends of every span.

    Lengths in the run's length unit; ``span_ei`` is relative flexural stiffness
    (only ratios matter), one value per span. ``hinges`` are internal moment
    releases measured from the left end. Distribution factors multiply the
    live-load effects (``df_moment`` moments; ``df_shear`` shears and reactions);
    ``df_moment_single`` and ``df_shear_single`` are the single-lane factors as
    tabulated (with the one-lane multiple presence factor), used by fatigue loads
    and special permits (None: not given).
    ``dc_load`` and ``dw_load`` are uniform dead loads per unit length. ``bridge``
    names the member's row of the Bridges sheet (None: none).

    As built (filled in from the other input sheets, not Members columns):
    ``segments`` are the member's rows of the Segments sheet, stretches whose
    stiffness replaces Span EI; ``analysis`` its row of the Analysis sheet;
    ``layout`` its row of the Girder Layout sheet, from which its distribution
    factors were computed where the Members row gives none.
    """

    id: str = column(
        "Member",
        "id",
        required=True,
        meaning="Unique id of the girder line.",
        example=_EXAMPLE_MEMBER,
    )
    spans: tuple[float, ...] = column(
        "Spans",
        "list",
        required=True,
        quantity="length",
        above=0.0,
        min_items=1,
        meaning="Span lengths, left to right; supports at both ends of every span.",
        example="60, 80, 60",
    )
    hinges: tuple[float, ...] = column(
        "Hinges",
        "list",
        default=(),
        quantity="length",
        above=0.0,
        meaning="Internal moment releases, measured from the member's left end.",
    )
    span_ei: tuple[float, ...] = column(
        "Span EI",
        "list",
        default=(),
        above=0.0,
        min_items=1,
        meaning="Relative flexural stiffness, one per span (default all 1).",
        example="1, 1.5, 1",
    )
    df_moment: float = column(
        "DF moment",
        "number",
        default=1.0,
        above=0.0,
        meaning="Live-load distribution factor on moments (default 1, or from the member's "
        "Girder Layout row when it has one; a value typed here prevails).",
    )
    df_shear: float = column(
        "DF shear",
        "number",
        default=1.0,
        above=0.0,
        meaning="Live-load distribution factor on shears and reactions (default 1, or from the "
        "member's Girder Layout row when it has one; a value typed here prevails).",
    )
    dc_load: float = column(
        "DC load",
        "number",
        default=0.0,
        quantity="line_load",
        minimum=0.0,
        meaning="Uniform dead load of components on the whole member, for rating.",
        example=1.15,
    )
    dw_load: float = column(
        "DW load",
        "number",
        default=0.0,
        quantity="line_load",
        minimum=0.0,
        meaning="Uniform dead load of the wearing surface on the whole member, for rating.",
        example=0.18,
    )
    condition_factor: float = column(
        "Condition factor",
        "number",
        default=1.0,
        above=0.0,
        maximum=1.0,
        meaning="Rating condition factor (default 1).",
        example=1,
    )
    system_factor: float = column(
        "System factor",
        "number",
        default=1.0,
        above=0.0,
        maximum=1.0,
        meaning="Rating system factor (default 1).",
        example=1,
    )
    description: str = column(
        "Description",
        "text",
        default="",
        meaning="Free text.",
        example="EXAMPLE",  # short: Members (with Bridge) prints to one page width
    )
    df_moment_single: float | None = column(
        "DF moment single lane",
        "number",
        default=None,
        above=0.0,
        meaning="Single-lane live-load distribution factor on moments, as tabulated (AASHTO "
        "LRFD 4.6.2.2), that is WITH the one-lane multiple presence factor 1.2 in it; "
        "spanfleet divides it by 1.2 where a load asks for it without (fatigue loads; "
        "special permits, MBE 6A.4.5.4.2). Needed when the fleet has a fatigue load or a "
        "special permit.",
    )
    df_shear_single: float | None = column(
        "DF shear single lane",
        "number",
        default=None,
        above=0.0,
        meaning="Single-lane live-load distribution factor on shears and reactions, as "
        "tabulated, WITH the one-lane multiple presence factor 1.2 in it (divided out as for "
        "DF moment single lane). Needed when the fleet has a fatigue load or a special permit.",
    )
    bridge: str | None = column(
        "Bridge",
        "id",
        default=None,
        meaning="Id of the member's bridge on the Bridges sheet, whose traffic and riding "
        "surface set the rating factors; blank: the Settings' factors.",
        example=_EXAMPLE_BRIDGE,
    )
    rating_method: RatingMethod = column(
        "Rating method",
        "choice",
        default="LRFR",
        choices=RATING_METHODS,
        meaning="LRFR (default; MBE Section 6A), or, for a bridge designed by the Standard "
        "Specifications, LFR (load factor rating) or ASR (allowable stress rating; MBE Section "
        "6B). LFR and ASR take the Standard Specifications' impact 50/(L + 125) at each "
        "effect's loaded length; the Capacities row gives their capacities.",
    )
    # As built: filled in from the Segments and Analysis sheets (not columns of Members).
    segments: tuple[Segment, ...] = ()
    analysis: Analysis | None = None
    layout: GirderLayout | None = None

    @property
    def stiffness(self) -> tuple[float, ...]:
        """Relative EI per span (all 1 when none was given)."""
        return self.span_ei if self.span_ei else (1.0,) * len(self.spans)

    @property
    def length(self) -> float:
        """Total length of the member."""
        return float(sum(self.spans))

    @property
    def stations_per_span(self) -> int | None:
        """The member's own number of stations per span (None: the setting's)."""
        return None if self.analysis is None else self.analysis.stations_per_span

    @property
    def stiffness_pieces(self) -> tuple[tuple[float, float, float], ...]:
        """Prismatic ``(start, end, EI)`` pieces that replace Span EI (haunches cut up)."""
        return tuple(piece for s in self.segments for piece in s.prismatic())


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
class AxleTrain:
    """A train of axles, front axle first: the one shape of an axle train in spanfleet.

    ``loads`` are axle loads (force unit, downward positive); ``spacings`` has
    one :class:`Spacing` per gap between consecutive axles (length unit), a
    range where the worst spacing within it is to be found. A Vehicles row, a
    part of a library load model and an engine load case all hold one.
    """

    loads: tuple[float, ...]
    spacings: tuple[Spacing, ...] = ()

    @classmethod
    def of(
        cls,
        loads: Sequence[float],
        low: Sequence[float] = (),
        high: Sequence[float] | None = None,
    ) -> AxleTrain:
        """The train of ``loads``, gaps from ``low`` to ``high`` (fixed when ``high`` is None)."""
        high = low if high is None else high
        return cls(
            loads=tuple(float(p) for p in loads),
            spacings=tuple(
                Spacing(low=float(a), high=float(b)) for a, b in zip(low, high, strict=True)
            ),
        )

    @property
    def low(self) -> tuple[float, ...]:
        """The lower end of every gap."""
        return tuple(s.low for s in self.spacings)

    @property
    def high(self) -> tuple[float, ...]:
        """The upper end of every gap (equal to the lower end for a fixed spacing)."""
        return tuple(s.high for s in self.spacings)

    @property
    def weight(self) -> float:
        """The sum of the axle loads."""
        return math.fsum(self.loads)

    @functools.cached_property
    def ranged(self) -> tuple[int, ...]:
        """The gaps given as ranges (index from 0 at the front), front to rear.

        Kept once per train: the engine asks it of every train on every member.
        """
        return tuple(g for g, s in enumerate(self.spacings) if s.is_range)

    def scaled(self, force: float, length: float) -> AxleTrain:
        """The same train with loads times ``force`` and spacings times ``length``."""
        return AxleTrain(
            loads=tuple(p * force for p in self.loads),
            spacings=tuple(
                Spacing(low=s.low * length, high=s.high * length) for s in self.spacings
            ),
        )


@dataclass(frozen=True, kw_only=True)
class Vehicle:
    """One row of the Vehicles sheet: an axle train, or a library model by name.

    ``axle_loads`` front axle first (force unit); ``spacings`` has one entry per
    gap between consecutive axles. ``lane_load`` (force per length) is placed on
    the adverse parts of each influence line, with no dynamic allowance.
    ``factor`` multiplies every effect of the row. ``library`` names a built-in
    load model instead of the axle columns. ``impact_rule`` picks the row's impact
    (None: the Settings' allowance, or the library model's own).
    """

    id: str = column(
        "Vehicle",
        "id",
        required=True,
        meaning="Unique id of the vehicle.",
        example="KV-P3",
    )
    axle_loads: tuple[float, ...] = column(
        "Axle loads",
        "list",
        default=(),
        quantity="force",
        above=0.0,
        min_items=1,
        meaning="Axle loads, front axle first (required unless Library is given).",
        example="12, 34, 34",
    )
    spacings: tuple[Spacing, ...] = column(
        "Axle spacings",
        "spacing-list",
        default=(),
        quantity="length",
        above=0.0,
        meaning="Distances between consecutive axles; an entry may be a range 14-30 "
        "(the worst spacing within it is used).",
        example="14, 14-30",
    )
    lane_load: float = column(
        "Lane load",
        "number",
        default=0.0,
        quantity="line_load",
        minimum=0.0,
        meaning="Uniform load placed on the adverse parts of the member, no dynamic allowance "
        "(unless Impact is Standard Specifications).",
    )
    factor: float = column(
        "Load multiplier",
        "number",
        default=1.0,
        above=0.0,
        meaning="Multiplies the row's whole load, axles and lane alike, and so its effects "
        "and its weight (default 1), e.g. 1.1 for a 10 % overload allowance. Not a load "
        "factor of the rating: those are settings.",
        example=1,
        former=("Factor",),
    )
    library: str | None = column(
        "Library",
        "id",
        default=None,
        meaning="Name of a built-in load model; leave the axle columns empty.",
    )
    category: Category = column(
        "Category",
        "choice",
        default="design",
        choices=CATEGORIES,
        meaning="Which live-load factor rating uses (default design).",
        example="permit",
    )
    description: str = column(
        "Description",
        "text",
        default="",
        meaning="Free text.",
        example="EXAMPLE, replace or delete: KVHA 3-axle permit truck",
    )
    impact_rule: ImpactRule | None = column(
        "Impact",
        "choice",
        default=None,
        choices=IMPACT_RULES,
        meaning="The row's impact. Blank or Settings: the Settings' Dynamic load allowance, on "
        "the axles only. Standard Specifications: I = 50/(L + 125) <= 0.30, L in ft the "
        "loaded length spanfleet finds for each station and effect, on the axles and the lane "
        "load alike (AASHTO Standard Specifications, Art. 3.8; the Impact sheet shows L and "
        "I). A Library row takes its model's own: leave it blank.",
    )

    permit_type: PermitType | None = column(
        "Permit type",
        "choice",
        default=None,
        choices=PERMIT_TYPES,
        meaning="Permits only, the kind of crossing (MBE Table 6A.4.5.4.2a-1): routine (annual "
        "permit, unlimited crossings, mixed with traffic); single-trip escorted (no other "
        "vehicle on the bridge); single-trip (mixed with traffic); multiple-trip (fewer than 100 "
        "crossings, mixed with traffic). Sets the live-load factor by the bridge's ADTT and, "
        "for the three special kinds, the one-lane DF. Blank: LL factor permit of Settings.",
        example="routine",
    )
    crawl: Literal["yes", "no"] = column(
        "Crawl speed",
        "choice",
        default="no",
        choices=("yes", "no"),
        meaning="Single-trip escorted permits: yes where the crossing is escorted at crawl speed "
        "(10 mph or less), rated with no dynamic load allowance (MBE 6A.4.5.5). Default no.",
    )

    @property
    def train(self) -> AxleTrain:
        """The row's axles as a train (empty for a row that names a library model)."""
        return AxleTrain(loads=self.axle_loads, spacings=self.spacings)


@dataclass(frozen=True, kw_only=True)
class Capacity:
    """One row of the Capacities sheet: a station of a member to be rated.

    ``span`` counts from 1 at the member's left end; ``station`` is the
    fraction of that span, or ``x`` the distance from the member's left end
    (see :meth:`section`); a point off the grid of stations becomes a station
    of its own. Resistances
    are factored resistances phi*Rn (moment unit for ``resistance_m_pos``
    sagging and ``resistance_m_neg`` hogging, a positive magnitude; force unit
    for ``resistance_v``), ``None`` where that effect is not rated. The dead-load
    effects ``dc_m``, ``dw_m`` (sagging positive) and ``dc_v``, ``dw_v`` (V = sum
    of the upward forces left of the section, the section as in Envelopes) are
    ``None`` where they are to be computed from the member's uniform dead loads.
    """

    member: str = column(
        "Member",
        "id",
        required=True,
        meaning="Id of a member listed on the Members sheet.",
        example=_EXAMPLE_MEMBER,
    )
    span: int | None = column(
        "Span",
        "number",
        default=None,
        whole=True,
        minimum=1,
        meaning="Span number, counted from 1 at the member's left end. With x, needed only "
        "at an interior support, to say which side (span k ends there, span k + 1 starts).",
        example=1,
    )
    station: float | None = column(
        "Station",
        "number",
        default=None,
        minimum=0.0,
        maximum=1.0,
        meaning="Fraction of the span (0 to 1). A fraction between the stations of the "
        "Envelopes sheet adds a station there. Give Span and Station, or x.",
        example=0.4,
    )
    resistance_m_pos: float | None = column(
        "Resistance M+",
        "number",
        default=None,
        quantity="moment",
        minimum=0.0,
        meaning="Capacity for sagging moment: the factored resistance phi Rn (LRFR), the "
        "capacity C (LFR), or the inventory allowable moment (ASR); blank: not rated.",
        example=4100,
    )
    resistance_m_neg: float | None = column(
        "Resistance M-",
        "number",
        default=None,
        quantity="moment",
        minimum=0.0,
        meaning="Capacity for hogging moment, as a positive magnitude (as Resistance M+); "
        "blank: not rated.",
    )
    resistance_v: float | None = column(
        "Resistance V",
        "number",
        default=None,
        quantity="force",
        minimum=0.0,
        meaning="Capacity for shear (as Resistance M+); blank: not rated.",
        example=380,
    )
    dc_m: float | None = column(
        "DC M",
        "number",
        default=None,
        quantity="moment",
        meaning="Signed component dead-load moment here; blank: from the member's DC load.",
    )
    dw_m: float | None = column(
        "DW M",
        "number",
        default=None,
        quantity="moment",
        meaning="Signed wearing-surface moment here; blank: from the member's DW load.",
    )
    dc_v: float | None = column(
        "DC V",
        "number",
        default=None,
        quantity="force",
        meaning="Signed component dead-load shear here; blank: from the member's DC load.",
    )
    dw_v: float | None = column(
        "DW V",
        "number",
        default=None,
        quantity="force",
        meaning="Signed wearing-surface shear here; blank: from the member's DW load.",
    )
    # Allowable stress rating: the operating level's capacities.
    operating_m_pos: float | None = column(
        "Operating M+",
        "number",
        default=None,
        quantity="moment",
        minimum=0.0,
        meaning="ASR members only: the operating allowable sagging moment (Resistance M+ is "
        "the inventory one); required where Resistance M+ is given.",
    )
    operating_m_neg: float | None = column(
        "Operating M-",
        "number",
        default=None,
        quantity="moment",
        minimum=0.0,
        meaning="ASR members only: the operating allowable hogging moment, a magnitude.",
    )
    operating_v: float | None = column(
        "Operating V",
        "number",
        default=None,
        quantity="force",
        minimum=0.0,
        meaning="ASR members only: the operating allowable shear.",
    )
    # Members as built: a rated section anywhere (instead of Span and Station).
    x: float | None = column(
        "x",
        "number",
        default=None,
        quantity="length",
        minimum=0.0,
        meaning="Instead of Station: the section's distance from the member's left end "
        "(e.g. a cover-plate end or the shear section near a support); spanfleet adds a "
        "station exactly there.",
    )

    def section(self, spans: Sequence[float]) -> Section | None:
        """The station this row names on a member of ``spans`` (None: no point of it)."""
        return section_of(spans, self.span, self.station, self.x)


@dataclass(frozen=True, kw_only=True)
class ServiceSection:
    """One row of the Service sheet: a station of a member checked at an LRFR service limit state.

    The station as on Capacities (``span`` and ``station``, or ``x``). ``material``
    decides the limit state (Service II steel, III prestressed, I reinforced
    concrete); the row is checked in the moment sense ``service_effect`` with the
    section moduli ``s_nc``, ``s_lt``, ``s_st`` (in3 or mm3, at the checked fibre)
    against the allowable stress from ``fy``, ``rh``, ``allowable_stress`` and
    ``prestress_stress`` (ksi or MPa); ``dc1_share`` is the part of DC on the
    non-composite section. See :mod:`batch.rating.lrfr`.
    """

    member: str = column(
        "Member",
        "id",
        required=True,
        meaning="Id of a member listed on the Members sheet, rated by LRFR.",
        example=_EXAMPLE_MEMBER,
    )
    span: int | None = column(
        "Span",
        "number",
        default=None,
        whole=True,
        minimum=1,
        meaning="Span number, from 1 at the member's left end (as on Capacities).",
        example=1,
    )
    station: float | None = column(
        "Station",
        "number",
        default=None,
        minimum=0.0,
        maximum=1.0,
        meaning="Fraction of the span (0 to 1), as on Capacities. Give Span and Station, or x.",
        example=0.5,
    )
    x: float | None = column(
        "x",
        "number",
        default=None,
        quantity="length",
        minimum=0.0,
        meaning="Instead of Station: the section's distance from the member's left end.",
    )
    material: Material = column(
        "Material",
        "choice",
        required=True,
        choices=MATERIALS,
        meaning="The member's material, which names its service check (MBE Table "
        "6A.4.2.2-1): steel at Service II, prestressed concrete at Service III, reinforced "
        "concrete at Service I (permits only). One material per member.",
        example="steel",
    )
    service_effect: ServiceEffect = column(
        "Service effect",
        "choice",
        default="M+",
        choices=SERVICE_EFFECTS,
        meaning="The moment sense the service stresses below are checked in: M+ (sagging, the "
        "default) or M- (hogging; steel and reinforced concrete only).",
    )
    s_nc: float = column(
        "S nc",
        "number",
        required=True,
        quantity="section_modulus",
        above=0.0,
        meaning="Section modulus of the non-composite section at the checked fibre: the "
        "flange of a steel girder, the bottom of a prestressed girder, or for reinforced "
        "concrete I_cr/(n*c) at the reinforcement (so that M/S is the steel stress).",
        example=820,
    )
    s_lt: float | None = column(
        "S lt",
        "number",
        default=None,
        quantity="section_modulus",
        above=0.0,
        meaning="Section modulus of the long-term composite section (slab transformed with "
        "3n) at the same fibre, for DC2 and DW; blank: S nc (a non-composite section).",
    )
    s_st: float | None = column(
        "S st",
        "number",
        default=None,
        quantity="section_modulus",
        above=0.0,
        meaning="Section modulus of the short-term composite section (slab transformed with "
        "n) at the same fibre, for the live load; blank: S lt.",
    )
    fy: float | None = column(
        "Fy",
        "number",
        default=None,
        quantity="stress",
        above=0.0,
        meaning="Steel: the yield strength Fyf of the checked flange (limit 0.95 Rh Fyf "
        "composite, 0.80 Rh Fyf non-composite, AASHTO LRFD 6.10.4.2.2); reinforced concrete: "
        "fy of the reinforcement (limit 0.9 fy). Or give Allowable stress instead.",
        example=50,
    )
    rh: float | None = column(
        "Rh",
        "number",
        default=None,
        above=0.0,
        maximum=1.0,
        meaning="Steel: the hybrid factor Rh (AASHTO LRFD 6.10.1.10.1); blank: 1.",
    )
    allowable_stress: float | None = column(
        "Allowable stress",
        "number",
        default=None,
        quantity="stress",
        minimum=0.0,
        meaning="Prestressed concrete: the allowable tension at the checked fibre, a positive "
        "magnitude, e.g. 0.19 sqrt(f'c) ksi (AASHTO LRFD Table 5.9.2.3.2b-1); steel and "
        "reinforced concrete: the engineer's own stress limit, instead of Fy.",
    )
    prestress_stress: float | None = column(
        "Prestress stress",
        "number",
        default=None,
        quantity="stress",
        minimum=0.0,
        meaning="Prestressed concrete: the compression the effective prestress (after losses) "
        "gives at the checked fibre, a positive magnitude; it adds to the allowable tension.",
    )

    dc1_share: float = column(
        "DC1 share",
        "number",
        default=1.0,
        minimum=0.0,
        maximum=1.0,
        meaning="The share of the component dead load DC (the member's DC load, or DC M on "
        "Capacities) carried by the non-composite section (DC1: girder, deck and haunch cast "
        "on the bare girder); the rest (DC2, e.g. barriers) and DW act on the long-term "
        "composite section. Default 1: all DC on the non-composite section.",
    )
    prestress_losses: PrestressLosses = column(
        "Prestress losses",
        "choice",
        default="approximate",
        choices=PRESTRESS_LOSSES,
        meaning="Prestressed concrete: refined with elastic gains where the Prestress stress "
        "comes from refined time-dependent losses (AASHTO LRFD 5.9.3.4) with the elastic gains "
        "taken: Service III then takes the inventory LL factor 1.0, else 0.8 (MBE Table "
        "6A.4.2.2-2).",
    )

    def section(self, spans: Sequence[float]) -> Section | None:
        """The station this row names on a member of ``spans`` (None: no point of it)."""
        return section_of(spans, self.span, self.station, self.x)


@dataclass(frozen=True, kw_only=True)
class Case:
    """A whole validated input: settings, the inventory, the fleet, capacities and bridges."""

    settings: Settings = field(default_factory=Settings)
    members: tuple[Member, ...] = ()
    vehicles: tuple[Vehicle, ...] = ()
    capacities: tuple[Capacity, ...] = ()
    bridges: tuple[Bridge, ...] = ()
    service: tuple[ServiceSection, ...] = ()

    @property
    def rates(self) -> bool:
        """Whether the run rates anything: Capacities rows or Service rows."""
        return bool(self.capacities or self.service)
