"""Demo data: the Kestrel Valley Highway Authority (KVHA), an invented road owner.

Every bridge, member id, vehicle and number here is invented for demonstration
and testing; none describes a real structure or a real legal or permit load.
Two cases, both as :class:`batch.model.Case`:

* :data:`KVHA_INVENTORY`, US units (kip, ft): 29 girder lines (simple spans,
  two- to four-span continuous members with unequal spans and stiffnesses,
  hinged cantilever-and-suspended-span layouts, a plate girder with cover
  plates over its pier whose live-load deflection is checked and which is rated
  at sections off the grid, and a girder haunched over its piers) and 12 vehicles of 2 to
  9 axles, some with ranged spacings or lane loads; factored resistances at a
  few stations of ten members (Capacities), among them a deteriorated girder
  that legal loads must be posted for and a two-girder span that does not
  carry the heaviest permit; nine bridges (Bridges) with different truck
  traffic (ADTT) and riding surfaces; permits of every kind the MBE names
  (routine, single-trip escorted at crawl speed, single-trip, multiple-trip);
  and the KVHA design truck as the screening reference. Two older bridges are
  rated by LFR and ASR, and a composite steel plate girder and a prestressed
  girder are checked at the LRFR service limit states too (the Service sheet:
  Service II and Service III).
* :data:`KVHA_SI_DEMO`, SI units (kN, m): a few members and vehicles to show
  the metric path end to end, with resistances at a few stations of two members
  and the live-load deflection of one (in mm).

:data:`SAMPLE_WORKBOOKS` names the workbook file of each case (written by
``scripts/generate.py`` into ``sample_workbooks/``).
"""

from __future__ import annotations

from batch.loads.distribution import layout_factors
from batch.model import (
    Analysis,
    Bridge,
    Capacity,
    Case,
    Category,
    GirderLayout,
    Member,
    PermitType,
    RatingMethod,
    Segment,
    ServiceSection,
    Settings,
    Spacing,
    Vehicle,
)
from batch.model.units import UnitSystem

__all__ = ["KVHA_INVENTORY", "KVHA_SI_DEMO", "SAMPLE_WORKBOOKS"]

SpacingEntry = float | tuple[float, float]


def _member(
    id: str,
    spans: tuple[float, ...],
    description: str,
    *,
    df: tuple[float, float],
    dead: tuple[float, float],
    span_ei: tuple[float, ...] = (),
    hinges: tuple[float, ...] = (),
    factors: tuple[float, float] = (1.0, 1.0),
    bridge: str | None = None,
    one_lane: tuple[float, float] | None = None,
    segments: tuple[tuple[float, float, float, float | None, str], ...] = (),
    analysis: Analysis | None = None,
    method: RatingMethod = "LRFR",
    layout: GirderLayout | None = None,
    units: UnitSystem = "US",
) -> Member:
    """A member; ``df`` is (moment, shear), ``dead`` (DC, DW), ``factors`` (condition, system).

    ``bridge`` names its Bridges row; ``one_lane`` its one-lane DFs (moment, shear) as
    AASHTO LRFD gives them, 1.2 included; ``segments`` are Segments rows (From, To, EI,
    EI at To, Haunch); ``method`` its rating method. With a girder ``layout`` (in
    ``units``), ``df`` and ``one_lane`` are ignored: the member's four factors are the
    layout's, as a run computes them.
    """
    if layout is not None:
        computed = layout_factors(layout, spans, units)
        df = (computed.moment, computed.shear)
        one_lane = (computed.moment_single, computed.shear_single)
    return Member(
        id=id,
        spans=spans,
        hinges=hinges,
        span_ei=span_ei,
        df_moment=df[0],
        df_shear=df[1],
        dc_load=dead[0],
        dw_load=dead[1],
        condition_factor=factors[0],
        system_factor=factors[1],
        description=description,
        bridge=bridge,
        df_moment_single=None if one_lane is None else one_lane[0],
        df_shear_single=None if one_lane is None else one_lane[1],
        segments=tuple(
            Segment(member=id, start=a, end=b, ei=ei, ei_end=end, haunch=shape)  # type: ignore[arg-type]
            for a, b, ei, end, shape in segments
        ),
        analysis=analysis,
        rating_method=method,
        layout=layout,
    )


def _vehicle(
    id: str,
    axles: tuple[float, ...],
    spacings: tuple[SpacingEntry, ...],
    category: Category,
    description: str,
    *,
    lane: float = 0.0,
    factor: float = 1.0,
    permit: PermitType | None = None,
    crawl: bool = False,
) -> Vehicle:
    """A vehicle; a spacing given as (low, high) is a range; ``permit`` its kind of crossing."""
    gaps = tuple(
        Spacing(low=s[0], high=s[1]) if isinstance(s, tuple) else Spacing(low=s, high=s)
        for s in spacings
    )
    return Vehicle(
        id=id,
        axle_loads=axles,
        spacings=gaps,
        lane_load=lane,
        factor=factor,
        category=category,
        description=description,
        permit_type=permit,
        crawl="yes" if crawl else "no",
    )


def _capacities(
    member: str, *rows: tuple[int, float, float | None, float | None, float | None]
) -> tuple[Capacity, ...]:
    """Capacities rows of a member: (span, station, Resistance M+, M-, V) each."""
    return tuple(
        Capacity(
            member=member,
            span=span,
            station=station,
            resistance_m_pos=m_pos,
            resistance_m_neg=m_neg,
            resistance_v=v,
        )
        for span, station, m_pos, m_neg, v in rows
    )


_US_MEMBERS = (
    # Simple spans, short to long.
    _member("KV-0101 S1", (24.0,), "Tansy Brook slab bridge, 1 ft design strip",
            df=(0.52, 0.56), dead=(0.45, 0.06)),
    _member("KV-0102 G2", (36.0,), "Mill Race bridge, girder 2",
            df=(0.58, 0.66), dead=(0.82, 0.14)),
    _member("KV-0215 G1", (48.0,), "Harlow Creek overpass, girder 1 (exterior)",
            df=(0.71, 0.64), dead=(1.02, 0.16), factors=(0.95, 1.0), bridge="KV-0215",
            one_lane=(0.62, 0.55)),
    _member("KV-0215 G2", (48.0,), "Harlow Creek overpass, girder 2",
            df=(0.64, 0.74), dead=(0.96, 0.18), bridge="KV-0215"),
    _member("KV-0330 G3", (65.0,), "Alder Lane underpass, girder 3",
            df=(0.61, 0.72), dead=(1.08, 0.19)),
    _member("KV-0341 G2", (82.5,), "Fenwick Road overpass, girder 2",
            df=(0.63, 0.75), dead=(1.21, 0.2)),
    _member("KV-0412 G1", (100.0,), "Osprey Flats causeway, span 4, girder 1",
            df=(0.68, 0.62), dead=(1.3, 0.21), factors=(0.85, 1.0), bridge="KV-0412",
            one_lane=(0.5, 0.6)),
    _member("KV-0418 G4", (124.0,), "Quarry Spur bridge, girder 4",
            df=(0.6, 0.7), dead=(1.42, 0.22)),
    _member("KV-0522 G2", (150.0,), "Coldwater Draw bridge, plate girder 2",
            df=(0.57, 0.69), dead=(1.55, 0.24)),
    _member("KV-0610 G1", (175.0,), "Kestrel River east approach, two-girder span, girder 1",
            df=(0.79, 0.8), dead=(1.86, 0.26), factors=(1.0, 0.85), bridge="KV-0610",
            one_lane=(0.72, 0.74)),
    # Two-span continuous.
    _member("KV-0705 G2", (70.0, 70.0), "Lark Hill ramp B, girder 2 (equal spans)",
            df=(0.62, 0.7), dead=(1.12, 0.18), bridge="KV-0705", one_lane=(0.46, 0.62)),
    _member("KV-0706 G3", (55.0, 72.0), "Pike Hollow bridge, girder 3",
            df=(0.6, 0.71), dead=(1.05, 0.17)),
    _member("KV-0711 G1", (90.0, 110.0), "Sedge Marsh bridge, girder 1, deeper over the pier",
            df=(0.69, 0.63), dead=(1.38, 0.22), span_ei=(1.0, 1.25)),
    # As built: a plate girder with cover plates over the pier (Segments), its live-load
    # deflection checked (Analysis: E 29,000 ksi x I 62,000 in4; DF deflection = 3 lanes x
    # 0.85 / 6 girders), rated at the cover-plate end, a section off the grid (Capacities).
    _member("KV-0725 G3", (85.0, 85.0),
            "Bittern Creek bridge, plate girder 3: cover plates from 66.5 to 103.5 ft",
            df=(0.64, 0.7), dead=(1.25, 0.2), one_lane=(0.45, 0.58),
            segments=((66.5, 103.5, 1.45, None, "none"),),
            analysis=Analysis(member="KV-0725 G3", ei_scale=1.798e9, df_deflection=0.425,
                              description="E 29,000 ksi x I 62,000 in4 (bare girder)"),
            # Its distribution factors from the girder layout (Girder Layout sheet): steel
            # girders (type a), 6 at 8.5 ft, 8 in deck, Kg = n (I + A eg^2) from the bare
            # girder, square supports.
            layout=GirderLayout(member="KV-0725 G3", cross_section="a", position="interior",
                                girders=6, spacing=8.5, deck=8.0, modular_ratio=8.0,
                                inertia=62_000.0, area=60.0, eccentricity=32.0,
                                description="6 steel girders at 8.5 ft, 8 in deck")),
    # Three-span continuous.
    _member("KV-0803 G2", (40.0, 52.0, 40.0), "Orchard Road overpass, girder 2",
            df=(0.55, 0.65), dead=(0.9, 0.15)),
    _member("KV-0812 G1", (60.0, 80.0, 60.0), "Harlow Creek viaduct, haunched girder 1",
            df=(0.66, 0.61), dead=(1.15, 0.18), span_ei=(1.0, 1.5, 1.0)),
    _member("KV-0815 G3", (85.0, 120.0, 95.0), "Kestrel River bridge, girder 3",
            df=(0.58, 0.68), dead=(1.48, 0.23), span_ei=(1.0, 1.8, 1.1)),
    # As built: parabolic haunches over both piers, 1.4 times deeper there (EI 2.744 times),
    # cut into prismatic pieces (Segments); 15 stations per span (Analysis).
    _member("KV-0818 G2", (60.0, 75.0, 60.0),
            "Harlow Creek viaduct, girder 2: parabolic haunches over the piers",
            df=(0.66, 0.61), dead=(1.2, 0.18),
            segments=((46.0, 60.0, 1.0, 2.744, "parabolic"),
                      (60.0, 74.0, 2.744, 1.0, "parabolic"),
                      (121.0, 135.0, 1.0, 2.744, "parabolic"),
                      (135.0, 149.0, 2.744, 1.0, "parabolic")),
            analysis=Analysis(member="KV-0818 G2", stations_per_span=15)),
    # Four-span continuous.
    _member("KV-0902 G2", (45.0, 60.0, 60.0, 45.0), "Brackenfield interchange, girder 2",
            df=(0.6, 0.7), dead=(1.0, 0.17)),
    _member("KV-0907 G1", (70.0, 95.0, 95.0, 70.0), "Heron Bay bridge, girder 1",
            df=(0.72, 0.66), dead=(1.33, 0.21), span_ei=(1.0, 1.4, 1.4, 1.0)),
    _member("KV-0913 G4", (52.0, 68.0, 74.0, 58.0), "Thistle Gap viaduct, girder 4",
            df=(0.59, 0.7), dead=(1.1, 0.19), factors=(0.95, 1.0)),
    # Hinged layouts: cantilever arms carrying suspended pieces.
    _member("KV-1001 G2", (50.0, 120.0, 50.0),
            "Wren Ferry bridge, girder 2: 60 ft suspended span on 30 ft cantilever arms",
            df=(0.63, 0.72), dead=(1.25, 0.2), span_ei=(1.0, 1.3, 1.0), hinges=(80.0, 140.0),
            bridge="KV-1001", one_lane=(0.49, 0.63)),
    _member("KV-1002 G1", (60.0, 150.0, 60.0),
            "Stonechat Gorge bridge, girder 1: 70 ft suspended span",
            df=(0.7, 0.65), dead=(1.45, 0.22), hinges=(100.0, 170.0)),
    _member("KV-1005 G3", (40.0, 90.0, 40.0),
            "Millbrook flyover, girder 3: one hinge in the main span",
            df=(0.61, 0.7), dead=(1.08, 0.18), hinges=(110.0,)),
    _member("KV-1010 G2", (40.0, 100.0, 100.0, 40.0),
            "Kestrel Valley viaduct, girder 2: hinges either side of the centre pier",
            df=(0.6, 0.69), dead=(1.3, 0.2), hinges=(120.0, 160.0)),
    # Older bridges, designed by the Standard Specifications: rated by LFR and ASR.
    _member("KV-0118 G2", (70.0,),
            "Alder Creek bridge (1961), girder 2: load factor design for HS20, rated by LFR",
            df=(0.65, 0.72), dead=(1.05, 0.15), bridge="KV-0118", method="LFR"),
    _member("KV-0120 G1", (45.0,),
            "Rook Lane bridge (1948), steel stringer 1: rated by allowable stress (ASR)",
            df=(0.6, 0.7), dead=(0.75, 0.1), bridge="KV-0120", method="ASR"),
    # LRFR service limit states (the Service sheet): a composite steel plate girder and a
    # prestressed girder.
    _member("KV-0527 G2", (90.0,), "Marten Creek bridge, composite plate girder 2",
            df=(0.66, 0.72), dead=(1.18, 0.19), bridge="KV-0527", one_lane=(0.48, 0.62)),
    _member("KV-0531 G4", (100.0,), "Gannet Road overpass, prestressed girder 4",
            df=(0.62, 0.7), dead=(1.32, 0.2), bridge="KV-0531", one_lane=(0.45, 0.6)),
)  # fmt: skip

_US_VEHICLES = (
    _vehicle("KVHA-D1", (8.0, 32.0, 32.0), (14.0, (14.0, 30.0)), "design",
             "KVHA design truck with the KVHA design lane", lane=0.64),
    _vehicle("KVHA-D2", (25.0, 25.0), (4.0,), "design",
             "KVHA design lane: tandem with a 0.64 kip/ft lane", lane=0.64),
    _vehicle("KV-L2", (10.0, 20.0), (12.0,), "legal", "KVHA legal 2-axle delivery truck"),
    _vehicle("KV-L3", (14.0, 18.0, 18.0), (15.0, 4.5), "legal", "KVHA legal 3-axle dump truck"),
    _vehicle("KV-L4", (12.0, 10.0, 18.0, 18.0), (11.0, 4.0, 4.5), "legal",
             "KVHA legal 4-axle concrete mixer"),
    _vehicle("KV-L5S", (11.0, 16.0, 16.0, 16.0, 16.0), (12.0, 4.25, (14.0, 32.0), 4.25), "legal",
             "KVHA legal 5-axle semitrailer, kingpin setting varies"),
    _vehicle("KV-L6D", (10.0, 13.0, 13.0, 15.0, 14.5, 14.5), (13.0, 4.0, 15.0, 14.0, 4.0),
             "legal", "KVHA legal 6-axle double"),
    _vehicle("KV-L5T", (10.0, 12.0, 12.0, 12.0, 12.0), (12.0, 4.0, 20.0, 4.0), "legal",
             "KVHA legal twin-trailer train with a 0.2 kip/ft lane", lane=0.2),
    _vehicle("KV-P4", (14.0, 22.0, 22.0, 22.0), (13.0, (4.0, 6.0), 4.0), "permit",
             "KVHA annual permit 4-axle crane carrier, 10 % overload allowance", factor=1.1,
             permit="routine"),
    _vehicle("KV-P7", (20.0, 20.0, 24.0, 24.0, 24.0, 24.0, 24.0), (5.0, 13.0, 5.0, 5.0, 5.0, 5.0),
             "permit", "KVHA permit 7-axle mobile crane, a few trips a season",
             permit="multiple-trip"),
    _vehicle("KV-P8", (12.0, 18.0, 18.0, 20.0, 20.0, 20.0, 20.0, 20.0),
             (14.0, 4.5, (12.0, 30.0), 4.5, 4.5, 4.5, 4.5), "permit",
             "KVHA single-trip permit 8-axle lowboy in traffic, booster spacing varies",
             permit="single-trip"),
    _vehicle("KV-P9", (14.0, 24.0, 24.0, 27.0, 27.0, 27.0, 27.0, 24.0, 24.0),
             (12.0, 4.5, (18.0, 28.0), 5.0, 5.0, 5.0, 16.0, 4.5), "permit",
             "KVHA single-trip permit 9-axle transformer haul, escorted at crawl speed",
             permit="single-trip escorted", crawl=True),
    # Standard load models by name (the Library column): the axle columns stay empty.
    Vehicle(id="HL-93", library="HL-93", category="design",
            description="AASHTO LRFD design live load, for comparison with KVHA-D1"),
    Vehicle(id="Type 3S2", library="Type 3S2", category="legal",
            description="AASHTO legal load, tractor with semitrailer"),
    Vehicle(id="HS20", library="HS20", category="design",
            description="AASHTO Standard Specifications HS20-44 loading, truck or lane, for the "
            "older bridges"),
    Vehicle(id="SU7", library="SU7", category="legal",
            description="AASHTO specialized hauling vehicle, seven axles"),
)  # fmt: skip

# Invented factored resistances (phi Rn: kip-ft, kip), sized so that the fleet shows every
# outcome: comfortable ratings, thin margins, a design-level shortfall and posting.
_US_CAPACITIES = (
    *_capacities("KV-0215 G1", (1, 0.0, None, None, 160.0), (1, 0.5, 2000.0, None, 120.0)),
    # Osprey Flats causeway, condition poor: legal loads rate below 1 and are posted.
    *_capacities("KV-0412 G1", (1, 0.0, None, None, 260.0), (1, 0.5, 4450.0, None, None)),
    # Two-girder span (system factor 0.85): the heaviest permits are not carried.
    *_capacities("KV-0610 G1", (1, 0.0, None, None, 480.0), (1, 0.5, 23500.0, None, None)),
    *_capacities(
        "KV-0705 G2",
        (1, 0.4, 2400.0, None, 230.0),
        (1, 1.0, None, 2300.0, 230.0),
        (2, 0.0, None, 2300.0, 230.0),
        (2, 0.6, 2400.0, None, 230.0),
    ),
    *_capacities("KV-1001 G2", (1, 1.0, None, 7000.0, 300.0), (2, 0.5, 2700.0, None, 150.0)),
    # Sections off the grid, by x: the cover-plate end (the bare girder's resistances) and
    # the shear section 3.5 ft from the end support.
    Capacity(member="KV-0725 G3", x=66.5, resistance_m_pos=3300.0, resistance_m_neg=2900.0),
    Capacity(member="KV-0725 G3", x=3.5, resistance_v=260.0),
    # LFR: the load factor capacities C (kip-ft, kip) of the 1961 design.
    *_capacities("KV-0118 G2", (1, 0.0, None, None, 210.0), (1, 0.5, 2900.0, None, None)),
    # ASR: the inventory allowables, and the operating ones beside them.
    Capacity(member="KV-0120 G1", span=1, station=0.0, resistance_v=95.0, operating_v=130.0),
    Capacity(member="KV-0120 G1", span=1, station=0.5, resistance_m_pos=600.0,
             operating_m_pos=820.0),
    *_capacities("KV-0527 G2", (1, 0.0, None, None, 330.0), (1, 0.5, 5600.0, None, None)),
    *_capacities("KV-0531 G4", (1, 0.0, None, None, 360.0), (1, 0.5, 6200.0, None, None)),
)  # fmt: skip

# Invented sections for the LRFR service limit states (the Service sheet): section moduli in
# in3 at the checked fibre (non-composite, slab at 3n, slab at n) and stresses in ksi; DC1
# share: girder, deck and haunch on the bare girder, the rest on the composite section.
_US_SERVICE = (
    # Service II: the bottom flange at midspan, Fyf 50 ksi; composite, so fR = 0.95 Rh Fyf
    # (AASHTO LRFD 6.10.4.2.2).
    ServiceSection(member="KV-0527 G2", span=1, station=0.5, material="steel", dc1_share=0.85,
                   s_nc=820.0, s_lt=1010.0, s_st=1110.0, fy=50.0),
    # Service III: the bottom fibre at midspan, allowable tension 0.19 sqrt(6) = 0.465 ksi for
    # f'c 6 ksi (AASHTO LRFD Table 5.9.2.3.2b-1) and the effective prestress's compression
    # there, 3.10 ksi.
    ServiceSection(member="KV-0531 G4", span=1, station=0.5, material="prestressed concrete",
                   dc1_share=0.88, s_nc=11200.0, s_lt=13600.0, s_st=14900.0,
                   allowable_stress=0.465, prestress_stress=3.10),
)  # fmt: skip

# Invented traffic: each rated bridge has its own ADTT (one direction) and riding surface,
# so that the legal and permit live-load factors and the legal loads' dynamic allowance
# differ bridge by bridge; Wren Ferry's overlay thickness was measured (DW factor 1.25).
_US_BRIDGES = (
    Bridge(id="KV-0215", adtt=6200.0, riding_surface="smooth",
           description="Harlow Creek overpass: arterial, heavy truck traffic, new joints"),
    Bridge(id="KV-0412", adtt=850.0, riding_surface="major deviations",
           description="Osprey Flats causeway: rural route, spalled deck and worn joints"),
    Bridge(id="KV-0610", adtt=2400.0, riding_surface="minor deviations",
           description="Kestrel River east approach"),
    Bridge(id="KV-0705", adtt=3100.0,
           description="Lark Hill ramp B: riding surface not surveyed (Settings' allowance)"),
    Bridge(id="KV-1001", adtt=150.0, riding_surface="smooth", dw_factor=1.25,
           description="Wren Ferry bridge: overlay thickness measured in the field"),
    Bridge(id="KV-0118", adtt=400.0, riding_surface="major deviations",
           description="Alder Creek bridge, 1961"),
    Bridge(id="KV-0120", adtt=90.0, description="Rook Lane bridge, 1948"),
    Bridge(id="KV-0527", adtt=1800.0, riding_surface="smooth",
           description="Marten Creek bridge: composite steel plate girders"),
    Bridge(id="KV-0531", adtt=3500.0, riding_surface="minor deviations",
           description="Gannet Road overpass: prestressed concrete girders"),
)  # fmt: skip

#: The main demo inventory, US units; KVHA-D1 (design truck and lane) is the screening
#: reference.
KVHA_INVENTORY = Case(
    settings=Settings(
        units="US",
        directions="both",
        stations_per_span=10,
        impact=0.33,
        reference_vehicle="KVHA-D1",
    ),
    members=_US_MEMBERS,
    vehicles=_US_VEHICLES,
    capacities=_US_CAPACITIES,
    bridges=_US_BRIDGES,
    service=_US_SERVICE,
)

#: A small metric demo, SI units (kN, m, kN/m).
KVHA_SI_DEMO = Case(
    settings=Settings(units="SI", directions="both", stations_per_span=10, impact=0.33),
    members=(
        _member("KV-M01 G1", (18.0,), "Larchmere Lane bridge, girder 1",
                df=(0.6, 0.68), dead=(14.5, 2.4), bridge="KV-M01",
                # Precast bulb-tees (type k) on skewed piers: the exterior girder's factors
                # from the layout, in mm and mm4 (converted exactly to the formulas' units).
                layout=GirderLayout(member="KV-M01 G1", cross_section="k",
                                    position="exterior", girders=5, spacing=2.4, deck=200.0,
                                    stiffness=4.0e11, overhang=0.6, skew=35.0,
                                    description="5 bulb-tees at 2.4 m, skew 35 degrees"),
                units="SI"),
        _member("KV-M02 G2", (24.0, 30.0), "Redshank Lane bridge, girder 2",
                df=(0.62, 0.7), dead=(17.0, 2.8), bridge="KV-M02",
                analysis=Analysis(member="KV-M02 G2", ei_scale=7.0e6, df_deflection=0.45,
                                  description="E 200,000,000 kN/m2 x I 0.035 m4")),
        _member("KV-M03 G1", (20.0, 28.0, 20.0), "Kestrel River south approach, girder 1",
                df=(0.66, 0.63), dead=(16.2, 2.6), span_ei=(1.0, 1.4, 1.0)),
        _member("KV-M04 G3", (15.0, 36.0, 15.0),
                "Wren Ferry north arm, girder 3: 18 m suspended span",
                df=(0.6, 0.7), dead=(18.5, 3.0), hinges=(24.0, 42.0)),
    ),
    vehicles=(
        _vehicle("KVHA-SI-D1", (35.0, 145.0, 145.0), (4.3, (4.3, 9.0)), "design",
                 "KVHA metric design truck with a 9.3 kN/m lane", lane=9.3),
        _vehicle("KV-SI-L3", (70.0, 75.0, 75.0), (4.5, 1.3), "legal",
                 "KVHA metric legal 3-axle truck"),
        _vehicle("KV-SI-P5", (50.0, 120.0, 120.0, 110.0, 110.0), (3.6, 1.3, (6.0, 9.0), 1.3),
                 "permit", "KVHA metric annual permit 5-axle low loader", permit="routine"),
        Vehicle(id="CL-625", library="CL-625", category="design",
                description="CSA S6 truck and lane load, by name"),
    ),
    # Invented factored resistances (kN-m, kN). KV-M01 G1 is an old, weak girder: the
    # legal truck is posted (in tonnes).
    capacities=(
        *_capacities("KV-M01 G1", (1, 0.0, None, None, 800.0), (1, 0.5, 1500.0, None, None)),
        *_capacities(
            "KV-M02 G2",
            (1, 0.4, 3600.0, None, 600.0),
            (1, 1.0, None, 4600.0, 1100.0),
            (2, 0.5, 5200.0, None, 600.0),
        ),
    ),
    bridges=(
        Bridge(id="KV-M01", adtt=400.0, riding_surface="minor deviations",
               description="Larchmere Lane bridge: a quiet lane"),
        Bridge(id="KV-M02", adtt=5200.0, riding_surface="smooth",
               description="Redshank Lane bridge: a haul route"),
    ),
)  # fmt: skip

#: Sample workbook file name (in sample_workbooks/) of each demo case.
SAMPLE_WORKBOOKS: dict[str, Case] = {
    "kvha-inventory.xlsx": KVHA_INVENTORY,
    "kvha-si-demo.xlsx": KVHA_SI_DEMO,
}
