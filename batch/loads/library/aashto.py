"""The AASHTO and FHWA load models, defined in kip, ft and kip/ft.

Where a value was seen in a published source it says so; where it could not
be checked against the standard's text it is marked "from memory", here and in
the model's ``source`` text. Sources seen, besides the standards named:

* HL-93 and the fatigue truck: an HL-93 article from engineeringcivil.org (posted
  on Scribd), an HL-93 loading page at aboutcivil.org, an engineers' forum thread
  at engineerboards.com quoting LRFD Table 3.6.2.1-1, and an excerpt of AASHTO
  LRFD (2014) Art. 3.6.1.4.1 posted on Scribd;
* the H and HS family and the alternate military load: structural engineers'
  mailing-list posts (SEAINT archive, 1999 and 2000), an HS20-44 explainer at
  knowledgewow.com, the AASHO 1941 loadings (H15 = 75 % of H20) as printed in
  *Interregional Highways* (on Wikisource), and the TxDOT Bridge Inspection
  Manual, ch. 6 (HS scaling);
* the specialized hauling and emergency vehicles: the FHWA memorandum on
  specialized hauling vehicles (fhwa.dot.gov/bridge/loadrating/131115.cfm), FHWA's
  questions and answers on the FAST Act emergency vehicles (2016, as reported by
  J. J. Keller) and the FHWA FAST Act truck size and weight fact sheet.
"""

from __future__ import annotations

from batch.loads.library.models import UNBOUNDED, LoadModel, part

__all__ = ["US_MODELS"]

# HL-93 design truck: 8, 32, 32 kip at 14 ft then 14-30 ft; tandem 2 x 25 kip at
# 4 ft; lane 0.64 kip/ft; IM on truck and tandem only (LRFD 3.6.1.2.2-3.6.1.2.4,
# 3.6.2.1; seen in the HL-93 article, the aboutcivil.org page and the forum thread
# named above).
_TRUCK = (8.0, 32.0, 32.0)
_TANDEM = (25.0, 25.0)
_LANE = 0.64
# Two design trucks with 14 ft rear spacings, at least 50 ft from the lead axle of
# one to the rear axle of the other, 90 % of trucks and lane (LRFD 3.6.1.3.1; the
# 90 %, 50 ft and 14 ft were seen quoted from that article in a search result).
_TWO_TRUCKS = (*_TRUCK, *_TRUCK)
_TWO_TRUCK_SPACINGS = (14.0, 14.0, (50.0, UNBOUNDED), 14.0, 14.0)

_DROP_NOTE = (
    " Axles that would lessen an effect are left out (LRFD 3.6.1.3.1: axles that do not"
    " contribute to the extreme force effect are neglected)."
)

HS20 = LoadModel(
    name="HS20",
    aliases=("HS20-44",),
    units="US",
    category="design",
    source="AASHTO Standard Specifications for Highway Bridges, 17th ed. (2002), Art. 3.7"
    " (HS20-44 truck); axle loads and spacings seen in published summaries",
    description="Standard truck 8, 32, 32 kip; 14 ft, then 14 to 30 ft (the worst spacing in"
    " that range is used). Truck loading only: the equivalent lane loading is not included."
    " The run's dynamic load allowance applies; the Standard Specifications' span-dependent"
    " impact 50/(L + 125) <= 0.30 is not computed.",
    parts=(part("", _TRUCK, (14.0, (14.0, 30.0))),),  # seen: SEAINT post, knowledgewow.com
)

H20 = LoadModel(
    name="H20",
    aliases=("H20-44",),
    units="US",
    category="design",
    source="AASHTO Standard Specifications for Highway Bridges, 17th ed. (2002), Art. 3.7"
    " (H20-44 truck); seen in published summaries",
    description="Two-axle standard truck 8, 32 kip at 14 ft. Truck loading only. The run's"
    " dynamic load allowance applies.",
    parts=(part("", (8.0, 32.0), (14.0,)),),  # seen: SEAINT post; AASHO 1941
)

HS15 = LoadModel(
    name="HS15",
    aliases=("HS15-44",),
    units="US",
    category="design",
    source="AASHTO Standard Specifications for Highway Bridges, 17th ed. (2002), Art. 3.7"
    " (HS15-44 = 75 % of HS20-44); seen in published summaries",
    description="75 % of HS20: 6, 24, 24 kip; 14 ft, then 14 to 30 ft. Truck loading only.",
    parts=(part("", (6.0, 24.0, 24.0), (14.0, (14.0, 30.0))),),  # 75 % rule seen: AASHO 1941
)

H15 = LoadModel(
    name="H15",
    aliases=("H15-44",),
    units="US",
    category="design",
    source="AASHTO Standard Specifications for Highway Bridges, 17th ed. (2002), Art. 3.7"
    " (H15-44 = 75 % of H20-44); seen in published summaries",
    description="75 % of H20: 6, 24 kip at 14 ft. Truck loading only.",
    parts=(part("", (6.0, 24.0), (14.0,)),),  # 75 % rule seen: AASHO 1941
)

ALTERNATE_MILITARY = LoadModel(
    name="Alternate military",
    aliases=("Alt military", "Military"),
    units="US",
    category="design",
    source="AASHTO Standard Specifications for Highway Bridges, 17th ed. (2002), Art. 3.7.4"
    " (alternate military loading); seen in published summaries",
    description="Two 24 kip axles 4 ft apart.",
    parts=(part("", (24.0, 24.0), (4.0,)),),  # seen: SEAINT post (2000)
)

HL93 = LoadModel(
    name="HL-93",
    units="US",
    category="design",
    source="AASHTO LRFD Bridge Design Specifications (7th ed. 2014 and later), Art. 3.6.1.2"
    " (design truck, tandem, lane), 3.6.1.3.1 (application, 90 % two-truck rule) and Table"
    " 3.6.2.1-1 (IM); values seen in published excerpts",
    description="Envelope of design truck + lane and design tandem + lane, and, for hogging"
    " moment between the points of contraflexure under uniform load and for interior"
    " reactions only, 90 % of two design trucks (14 ft rear spacings, at least 50 ft from"
    " the lead axle of one to the rear axle of the other) with 90 % of the lane load. The"
    " run's dynamic load allowance applies to trucks and tandem, never to the lane"
    " load." + _DROP_NOTE,
    parts=(
        part(
            "truck + lane",
            _TRUCK,
            (14.0, (14.0, 30.0)),
            lane_load=_LANE,
            drop_adverse_axles=True,
        ),
        part("tandem + lane", _TANDEM, (4.0,), lane_load=_LANE, drop_adverse_axles=True),
        part(
            "two trucks + lane, 90 %",
            _TWO_TRUCKS,
            _TWO_TRUCK_SPACINGS,
            lane_load=_LANE,
            factor=0.90,
            scope="interior-hogging",
            drop_adverse_axles=True,
        ),
    ),
)

FATIGUE = LoadModel(
    name="Fatigue truck",
    aliases=("LRFD fatigue", "HL-93 fatigue", "Fatigue"),
    units="US",
    category="design",
    source="AASHTO LRFD Bridge Design Specifications (7th ed. 2014 and later), Art."
    " 3.6.1.4.1 and Table 3.6.2.1-1 (IM 15 %); seen in published excerpts",
    description="One design truck 8, 32, 32 kip with a fixed 30 ft spacing between the"
    " 32 kip axles, or axles thereof; no lane load. IM is fixed at 0.15 whatever the run's"
    " setting. The fatigue load factor (Fatigue I or II) is not included: put it in the"
    " row's Factor.",
    # "one design truck or axles thereof": axles that lessen an effect are left out (seen in the
    # LRFD 3.6.1.4.1 excerpt).
    parts=(part("", _TRUCK, (14.0, 30.0), impact=0.15, drop_adverse_axles=True),),
)

_MBE = "AASHTO Manual for Bridge Evaluation, 3rd ed. (2018), Art. 6A.4.4.2.1 and Appendix D6A"
_LEGAL_NOTE = (
    " The run's dynamic load allowance applies (the MBE's standard IM for legal loads is"
    " 33 %, from memory). Every axle counts wherever it stands."
)

# The AASHTO legal trucks (MBE 6A.4.4.2.1, Appendix D6A): axle loads and spacings
# from memory.
_TYPE_33 = (12.0, 12.0, 12.0, 16.0, 14.0, 14.0)
_TYPE_33_SPACINGS = (15.0, 4.0, 15.0, 16.0, 4.0)

TYPE_3 = LoadModel(
    name="Type 3",
    units="US",
    category="legal",
    source=_MBE + " (AASHTO legal loads); axle loads and spacings from memory",
    description="AASHTO legal Type 3 unit: 16, 17, 17 kip at 15, 4 ft (50 kip, 25 t)."
    + _LEGAL_NOTE,
    parts=(part("", (16.0, 17.0, 17.0), (15.0, 4.0)),),  # from memory
)

TYPE_3S2 = LoadModel(
    name="Type 3S2",
    aliases=("3S2",),
    units="US",
    category="legal",
    source=_MBE + " (AASHTO legal loads); axle loads and spacings from memory",
    description="AASHTO legal Type 3S2 semi: 10, 15.5, 15.5, 15.5, 15.5 kip at 11, 4, 22, 4 ft"
    " (72 kip, 36 t)." + _LEGAL_NOTE,
    parts=(part("", (10.0, 15.5, 15.5, 15.5, 15.5), (11.0, 4.0, 22.0, 4.0)),),  # from memory
)

TYPE_33 = LoadModel(
    name="Type 3-3",
    aliases=("3-3",),
    units="US",
    category="legal",
    source=_MBE + " (AASHTO legal loads); axle loads and spacings from memory",
    description="AASHTO legal Type 3-3 train: 12, 12, 12, 16, 14, 14 kip at 15, 4, 15, 16, 4 ft"
    " (80 kip, 40 t)." + _LEGAL_NOTE,
    parts=(part("", _TYPE_33, _TYPE_33_SPACINGS),),  # from memory
)

# Lane-type legal load: 75 % of Type 3-3 with 0.2 kip/ft; and two 75 % Type 3-3
# heading the same way, 30 ft clear (rear axle of one to front axle of the other),
# with 0.2 kip/ft for negative moment and interior reactions. The 75 % is on the
# trucks only, so it is in the axle loads, not the part factor. From memory
# (MBE 6A.4.4.2.1).
_TYPE_33_75 = tuple(0.75 * p for p in _TYPE_33)

LEGAL_LANE = LoadModel(
    name="Legal lane",
    aliases=("Lane-type legal", "Legal lane load", "Type 3-3 lane"),
    units="US",
    category="legal",
    source=_MBE + " (lane-type legal load model); values and span rule from memory",
    description="75 % of Type 3-3 with 0.2 kip/ft; and, for hogging moment between the"
    " points of contraflexure under uniform load and for interior reactions, two 75 % Type"
    " 3-3 trucks heading the same way, 30 ft clear between them, with 0.2 kip/ft. The MBE"
    " asks for the first part on spans of 200 ft or more (from memory) and for the"
    " two-truck part at any span; the engine applies both to every member it is run on, which"
    " on shorter spans can only add to the fleet's envelope: leave the row out for members"
    " whose spans are all under 200 ft if the single-truck part should not apply. The"
    " two-truck part uses the HL-93 region (between the points of contraflexure) for"
    " hogging." + _LEGAL_NOTE,
    parts=(
        part("75 % Type 3-3 + lane", _TYPE_33_75, _TYPE_33_SPACINGS, lane_load=0.2),
        part(
            "two 75 % Type 3-3 + lane",
            (*_TYPE_33_75, *_TYPE_33_75),
            (*_TYPE_33_SPACINGS, 30.0, *_TYPE_33_SPACINGS),
            lane_load=0.2,
            scope="interior-hogging",
        ),
    ),
)

# Specialized hauling vehicles (NCHRP Report 575; adopted by AASHTO in 2005, names
# seen in the FHWA memorandum on specialized hauling vehicles). Axle loads and spacings
# from memory (MBE Appendix D6A).
_SHV = {
    "SU4": ((12.0, 8.0, 17.0, 17.0), (10.0, 4.0, 4.0)),
    "SU5": ((12.0, 8.0, 8.0, 17.0, 17.0), (10.0, 4.0, 4.0, 4.0)),
    "SU6": ((11.5, 8.0, 8.0, 17.0, 17.0, 8.0), (10.0, 4.0, 4.0, 4.0, 4.0)),
    "SU7": ((11.5, 8.0, 8.0, 17.0, 17.0, 8.0, 8.0), (10.0, 4.0, 4.0, 4.0, 4.0, 4.0)),
}

SHVS = tuple(
    LoadModel(
        name=name,
        units="US",
        category="legal",
        source=_MBE + " (specialized hauling vehicles, from NCHRP Report 575, 2007);"
        " axle loads and spacings from memory",
        description=f"Specialized hauling single-unit truck {name}: "
        + ", ".join(f"{p:g}" for p in loads)
        + " kip at "
        + ", ".join(f"{s:g}" for s in spacings)
        + f" ft ({sum(loads):g} kip)."
        + _LEGAL_NOTE,
        parts=(part("", loads, spacings),),
    )
    for name, (loads, spacings) in _SHV.items()
)

NRL = LoadModel(
    name="NRL",
    aliases=("Notional rating load",),
    units="US",
    category="legal",
    source=_MBE + " (notional rating load, from NCHRP Report 575, 2007); axle loads and"
    " spacings from memory: the first spacing is taken as a fixed 6 ft, not checked"
    " against the MBE figure",
    description="Notional rating load: 6, 8, 8, 17, 17, 8, 8, 8 kip at 6 ft, then 4 ft"
    " (80 kip). A screening load: RF >= 1 for NRL means SU4 to SU7 need not be rated."
    " Axles that would lessen an effect are left out (the MBE's note on the NRL, from"
    " memory), which is what lets it envelope the SU trucks. The run's dynamic load"
    " allowance applies.",
    parts=(
        part(
            "",
            (6.0, 8.0, 8.0, 17.0, 17.0, 8.0, 8.0, 8.0),
            (6.0, 4.0, 4.0, 4.0, 4.0, 4.0, 4.0),
            drop_adverse_axles=True,
        ),
    ),
)

_EV_SOURCE = (
    "FHWA memorandum on load rating for the FAST Act's emergency vehicles (2016-11-03) and"
    " MBE 6A.4.4.2.1 (2019 interim): axle limits and gross weight seen in FHWA material;"
    " axle spacings from memory"
)

EV2 = LoadModel(
    name="EV2",
    units="US",
    category="legal",
    source=_EV_SOURCE,
    description="Emergency vehicle, single rear axle: 24 kip steer and 33.5 kip drive axle at"
    " 15 ft (57.5 kip). The run's dynamic load allowance applies.",
    parts=(part("", (24.0, 33.5), (15.0,)),),  # loads seen (FHWA EV Q&A); 15 ft from memory
)

EV3 = LoadModel(
    name="EV3",
    units="US",
    category="legal",
    source=_EV_SOURCE,
    description="Emergency vehicle, tandem rear axle: 24 kip steer and 2 x 31 kip (62 kip"
    " tandem) at 15 ft, then 4 ft (86 kip). The run's dynamic load allowance applies.",
    parts=(part("", (24.0, 31.0, 31.0), (15.0, 4.0)),),  # loads seen (FHWA); spacings from memory
)

US_MODELS: tuple[LoadModel, ...] = (
    HL93,
    FATIGUE,
    HS20,
    H20,
    HS15,
    H15,
    ALTERNATE_MILITARY,
    TYPE_3,
    TYPE_3S2,
    TYPE_33,
    LEGAL_LANE,
    *SHVS,
    NRL,
    EV2,
    EV3,
)
