"""The AASHTO and FHWA load models, defined in kip, ft and kip/ft.

Every value is a :class:`~batch.loads.sourced.Sourced`: its source (standard,
edition, article), its status (``verified`` in the standard's own text,
``secondary`` in a published text that states it, or ``from memory``) and
where it was seen. docs/load-models.md lists them all, generated from here.
"""

from __future__ import annotations

from batch.loads.factors import (
    FATIGUE_I,
    FATIGUE_II,
    FATIGUE_NO_MULTIPLE_PRESENCE,
    STANDARD_IMPACT_RULES,
    STANDARD_SPECIFICATIONS_IMPACT,
)
from batch.loads.library.models import LoadModel, part
from batch.loads.sourced import UNBOUNDED, Sourced

__all__ = ["DEFLECTION_LOADING", "US_MODELS"]

_STD = "AASHTO Standard Specifications for Highway Bridges, 17th ed. (2002)"
_LRFD = "AASHTO LRFD Bridge Design Specifications, 7th ed. (2014) and later"
_MBE = "AASHTO Manual for Bridge Evaluation, 3rd ed. (2018)"
_SEAINT = "engineers' descriptions of the article in the SEAINT mailing-list archive"

# ---------------------------------------------------------------- Standard Specifications

_HS20_AXLES = Sourced(
    what="HS20-44 axle loads",
    value=(8.0, 32.0, 32.0),
    unit="kip",
    source=f"{_STD}, Art. 3.7.7, Fig. 3.7.7A",
    status="secondary",
    seen=f"{_SEAINT} (1996, 2004): 4 and 16 tons, rear spacing 14 to 30 ft",
)
_HS_SPACINGS = Sourced(
    what="HS truck spacings (the rear one varied for the worst effect)",
    value=(14.0, (14.0, 30.0)),
    unit="ft",
    source=f"{_STD}, Art. 3.7.7, Fig. 3.7.7A",
    status="secondary",
    seen=f"{_SEAINT} (1996, 2004)",
)
_H20_AXLES = Sourced(
    what="H20-44 axle loads",
    value=(8.0, 32.0),
    unit="kip",
    source=f"{_STD}, Art. 3.7.6, Fig. 3.7.6A",
    status="secondary",
    seen=f"{_SEAINT} (2004); Khan, Bridge and Highway Structure Rehabilitation and Repair"
    " (McGraw-Hill, 2010), Table 6.7",
)
_H_SPACING = Sourced(
    what="H truck axle spacing",
    value=(14.0,),
    unit="ft",
    source=f"{_STD}, Art. 3.7.6, Fig. 3.7.6A",
    status="secondary",
    seen=f"{_SEAINT} (2004)",
)
_SEVENTY_FIVE = "the 1941 AASHO loadings as printed in Interregional Highways (1944), Appendix 6"
_HS15_AXLES = Sourced(
    what="HS15-44 axle loads (75 % of HS20-44)",
    value=(6.0, 24.0, 24.0),
    unit="kip",
    source=f"{_STD}, Art. 3.7.7",
    status="secondary",
    seen=f"{_SEVENTY_FIVE} (H15-S12 is 75 % of H20-S16, spacings unchanged)",
)
_H15_AXLES = Sourced(
    what="H15-44 axle loads (75 % of H20-44)",
    value=(6.0, 24.0),
    unit="kip",
    source=f"{_STD}, Art. 3.7.6",
    status="secondary",
    seen=f"{_SEVENTY_FIVE} (H15 is 75 % of H20); {_SEAINT} (2004): 3 and 12 tons",
)
_MILITARY_AXLES = Sourced(
    what="alternate military loading: two axles",
    value=(24.0, 24.0),
    unit="kip",
    source=f"{_STD}, Art. 3.7.4",
    status="secondary",
    seen=f"{_SEAINT} (2000, 2004)",
)
_MILITARY_SPACING = Sourced(
    what="alternate military loading: axle spacing",
    value=(4.0,),
    unit="ft",
    source=f"{_STD}, Art. 3.7.4",
    status="secondary",
    seen=f"{_SEAINT} (2000, 2004)",
)
_KHAN = (
    "Khan, Bridge and Highway Structure Rehabilitation and Repair (McGraw-Hill, 2010), Table"
    " 6.7 (lane loads of 0.64 kips/ft, 18 kips for moment and 26 kips for shear, in lieu of"
    " the H-20 truck)"
)
_STD_LANE = Sourced(
    what="H20 and HS20 lane loading: uniform load",
    value=(0.64,),
    unit="kip/ft",
    source=f"{_STD}, Art. 3.7.6, Fig. 3.7.6B",
    status="secondary",
    seen=f"{_KHAN}; {_SEAINT} (1996): 640 lb per linear foot of lane",
)
_STD_MOMENT_LOAD = Sourced(
    what="H20 and HS20 lane loading: concentrated load for moment",
    value=(18.0,),
    unit="kip",
    source=f"{_STD}, Art. 3.7.6, Fig. 3.7.6B",
    status="secondary",
    seen=f"{_KHAN}; {_SEAINT} (1996): 18,000 lb for moment",
)
_STD_SHEAR_LOAD = Sourced(
    what="H20 and HS20 lane loading: concentrated load for shear",
    value=(26.0,),
    unit="kip",
    source=f"{_STD}, Art. 3.7.6, Fig. 3.7.6B",
    status="secondary",
    seen=f"{_KHAN}; {_SEAINT} (1996): 26,000 lb for shear",
)
_SEVENTY_FIVE_LANE = Sourced(
    what="H15 and HS15 are 75 % of H20 and HS20, truck and lane loading alike",
    value=(0.75,),
    source=f"{_STD}, Art. 3.7.6 and 3.7.7",
    status="secondary",
    seen=f"{_SEVENTY_FIVE} (other loadings by changing the weights of both the standard truck"
    " and the corresponding lane loads in proportion)",
)
_TRUCK_OR_LANE = Sourced(
    what="the design loading is the standard truck or the lane loading, whichever is worse;"
    " one truck per lane on the whole structure",
    source=f"{_STD}, Art. 3.7.1 and 3.11.3",
    status="secondary",
    seen=f"{_SEVENTY_FIVE} (standard trucks or lane loads equivalent to truck trains);"
    f" {_SEAINT} (1999): only one standard truck on the structure",
)
_LANE_ONE_LOAD = Sourced(
    what="lane loading: one concentrated load per lane, the lighter for moment and the heavier"
    " for shear, where it is worst, with the uniform load on the adverse parts; the load for"
    " shear also for reactions (a reaction being an end shear)",
    source=f"{_STD}, Art. 3.7.6 and 3.11.3",
    status="from memory",
)
_TWO_LOADS_CONTINUOUS = Sourced(
    what="continuous spans: the lane loading's uniform load with one concentrated load, or two",
    source=f"{_STD}, Art. 3.11.3",
    status="secondary",
    seen="Galambos, Highway bridge loadings (FHWA): the uniform load is supplemented by one"
    " concentrated load (or two for continuous spans)",
)
_SECOND_LOAD = Sourced(
    what="for the largest negative moment of continuous spans, a second concentrated load of"
    " equal weight in one other span, placed where it is worst; not for positive moment, not"
    " for shear or reactions",
    source=f"{_STD}, Art. 3.11.3",
    status="from memory",
)


def _standard(
    name: str,
    axles: Sourced,
    spacings: Sourced,
    lane: tuple[Sourced, Sourced, Sourced],
    description: str,
    source: str,
) -> LoadModel:
    """An H or HS loading: the envelope of its truck and its lane loading, with impact.

    ``lane`` is the uniform load and the concentrated loads for moment and for shear.
    """
    uniform, for_moment, for_shear = lane
    impact = STANDARD_SPECIFICATIONS_IMPACT
    rules = (*STANDARD_IMPACT_RULES, _TRUCK_OR_LANE)
    lane_rules = (*rules, _LANE_ONE_LOAD)
    return LoadModel(
        name=name,
        aliases=(f"{name}-44",),
        units="US",
        category="design",
        source=source,
        description=description
        + " Design loading: the worse of the truck and the lane loading (uniform load with"
        " one concentrated load, the lighter for moment and the heavier for shear and"
        " reactions, and for negative moment a second equal load for moment in one other span)."
        " Impact I = 50/(L + 125) <= 0.30 on truck and lane loading alike, L the loaded length"
        " of each effect (Standard Specifications Art. 3.8; the run's dynamic load allowance is"
        " not used).",
        parts=(
            part("truck", axles, spacings, rules=rules, impact_formula=impact),
            part(
                "lane, moment",
                for_moment,
                lane_load=uniform,
                scope="moments",
                rules=lane_rules,
                impact_formula=impact,
            ),
            part(
                "lane, shear",
                for_shear,
                lane_load=uniform,
                scope="shears-reactions",
                rules=lane_rules,
                impact_formula=impact,
            ),
            part(
                "lane, two loads",
                for_moment,
                lane_load=uniform,
                scope="hogging",
                other_span_load=True,
                rules=(*lane_rules, _TWO_LOADS_CONTINUOUS, _SECOND_LOAD),
                impact_formula=impact,
            ),
        ),
    )


def _seventy_five(value: Sourced, what: str) -> Sourced:
    """75 % of an H20/HS20 lane value (H15, HS15)."""
    return Sourced.derived(
        what, tuple(0.75 * n for n in value.numbers), value.unit, value, _SEVENTY_FIVE_LANE
    )


_LANE_20 = (_STD_LANE, _STD_MOMENT_LOAD, _STD_SHEAR_LOAD)
_LANE_15 = (
    _seventy_five(_STD_LANE, "H15 and HS15 lane loading: uniform load"),
    _seventy_five(_STD_MOMENT_LOAD, "H15 and HS15 lane loading: concentrated load for moment"),
    _seventy_five(_STD_SHEAR_LOAD, "H15 and HS15 lane loading: concentrated load for shear"),
)

HS20 = _standard(
    "HS20",
    _HS20_AXLES,
    _HS_SPACINGS,
    _LANE_20,
    "Standard truck 8, 32, 32 kip; 14 ft, then 14 to 30 ft (the worst spacing in that range"
    " is used). Lane loading 0.64 kip/ft with 18 kip for moment, 26 kip for shear.",
    f"{_STD}, Art. 3.7 (HS20-44 truck and lane loading), 3.8 (impact), 3.11.3 (application)",
)

H20 = _standard(
    "H20",
    _H20_AXLES,
    _H_SPACING,
    _LANE_20,
    "Two-axle standard truck 8, 32 kip at 14 ft. Lane loading 0.64 kip/ft with 18 kip for"
    " moment, 26 kip for shear.",
    f"{_STD}, Art. 3.7 (H20-44 truck and lane loading), 3.8 (impact), 3.11.3 (application)",
)

HS15 = _standard(
    "HS15",
    _HS15_AXLES,
    _HS_SPACINGS,
    _LANE_15,
    "75 % of HS20: 6, 24, 24 kip; 14 ft, then 14 to 30 ft. Lane loading 0.48 kip/ft with"
    " 13.5 kip for moment, 19.5 kip for shear.",
    f"{_STD}, Art. 3.7 (HS15-44 = 75 % of HS20-44, truck and lane loading), 3.8, 3.11.3",
)

H15 = _standard(
    "H15",
    _H15_AXLES,
    _H_SPACING,
    _LANE_15,
    "75 % of H20: 6, 24 kip at 14 ft. Lane loading 0.48 kip/ft with 13.5 kip for moment,"
    " 19.5 kip for shear.",
    f"{_STD}, Art. 3.7 (H15-44 = 75 % of H20-44, truck and lane loading), 3.8, 3.11.3",
)

ALTERNATE_MILITARY = LoadModel(
    name="Alternate military",
    aliases=("Alt military", "Military"),
    units="US",
    category="design",
    source=f"{_STD}, Art. 3.7.4 (alternate military loading)",
    description="Two 24 kip axles 4 ft apart. The run's dynamic load allowance applies.",
    parts=(part("", _MILITARY_AXLES, _MILITARY_SPACING),),
)

# ---------------------------------------------------------------- LRFD: HL-93, fatigue

_HL93_SUMMARIES = (
    "published summaries of the article giving the SI values beside them (an HL-93 article"
    " of EngineeringCivil.org; aboutcivil.org's HL-93 page)"
)
_TRUCK = Sourced(
    what="design truck axle loads",
    value=(8.0, 32.0, 32.0),
    unit="kip",
    source=f"{_LRFD}, Art. 3.6.1.2.2, Fig. 3.6.1.2.2-1",
    status="secondary",
    seen=_HL93_SUMMARIES,
)
_TRUCK_SPACINGS = Sourced(
    what="design truck spacings (the rear one varied for the worst effect)",
    value=(14.0, (14.0, 30.0)),
    unit="ft",
    source=f"{_LRFD}, Art. 3.6.1.2.2, Fig. 3.6.1.2.2-1",
    status="secondary",
    seen=_HL93_SUMMARIES,
)
_TANDEM = Sourced(
    what="design tandem axle loads",
    value=(25.0, 25.0),
    unit="kip",
    source=f"{_LRFD}, Art. 3.6.1.2.3",
    status="secondary",
    seen=_HL93_SUMMARIES,
)
_TANDEM_SPACING = Sourced(
    what="design tandem axle spacing",
    value=(4.0,),
    unit="ft",
    source=f"{_LRFD}, Art. 3.6.1.2.3",
    status="secondary",
    seen=_HL93_SUMMARIES,
)
_LANE = Sourced(
    what="design lane load",
    value=(0.64,),
    unit="kip/ft",
    source=f"{_LRFD}, Art. 3.6.1.2.4",
    status="secondary",
    seen=_HL93_SUMMARIES,
)
_NO_IM_ON_LANE = Sourced(
    what="the dynamic load allowance applies to the truck and tandem, never to the lane load",
    source=f"{_LRFD}, Art. 3.6.1.2.4 and 3.6.2.1",
    status="verified",
    seen="a reproduced page of Art. 3.6.1.2.4 of the SI edition (lane force effects 'shall"
    " not be subject to a dynamic load allowance')",
)
_DROP_AXLES = Sourced(
    what="axles that do not contribute to the extreme force effect are neglected",
    source=f"{_LRFD}, Art. 3.6.1.3.1",
    status="from memory",
)
_TWO_TRUCK_FACTOR = Sourced(
    what="two-truck load: fraction of the trucks and lane load",
    value=(0.90,),
    source=f"{_LRFD}, Art. 3.6.1.3.1",
    status="secondary",
    seen="an engineer's restatement of the article in the SEAINT mailing-list archive"
    " (2003); an HL-93 article of EngineeringCivil.org",
)
_TWO_TRUCK_HEADWAY = Sourced(
    what="two-truck load: lead axle of one truck to rear axle of the other",
    value=((50.0, UNBOUNDED),),
    unit="ft",
    source=f"{_LRFD}, Art. 3.6.1.3.1",
    status="secondary",
    seen="an engineer's restatement of the article in the SEAINT mailing-list archive"
    " (2003); an HL-93 article of EngineeringCivil.org",
)
_TWO_TRUCK_SPACINGS = Sourced(
    what="two-truck load: spacings of each truck (rear spacing fixed)",
    value=(14.0, 14.0),
    unit="ft",
    source=f"{_LRFD}, Art. 3.6.1.3.1",
    status="from memory",
)
_TWO_TRUCK_SCOPE = Sourced(
    what="two-truck load only for hogging moment between the points of contraflexure under"
    " a uniform load on all spans, and for reactions at interior piers",
    source=f"{_LRFD}, Art. 3.6.1.3.1",
    status="from memory",
)

HL93 = LoadModel(
    name="HL-93",
    aliases=("HL-93 (US edition)",),
    units="US",
    category="design",
    source=f"{_LRFD}, Art. 3.6.1.2 (design truck, tandem, lane), 3.6.1.3.1 (application,"
    " two-truck rule) and 3.6.2.1 (IM); US customary values, converted exactly in SI runs",
    description="HL-93 of the US customary edition (in an SI run its exact conversion; the SI"
    " edition's own values are 'HL-93 (SI edition)'). Envelope of design truck + lane and"
    " design tandem + lane, and, for hogging moment between the points of contraflexure"
    " under uniform load and for interior reactions only, 90 % of two design trucks (14 ft"
    " rear spacings, at least 50 ft from the lead axle of one to the rear axle of the other)"
    " with 90 % of the lane load. The run's dynamic load allowance applies to trucks and"
    " tandem, never to the lane load. Axles that would lessen an effect are left out.",
    parts=(
        part(
            "truck + lane",
            _TRUCK,
            _TRUCK_SPACINGS,
            lane_load=_LANE,
            drop_adverse_axles=True,
            rules=(_NO_IM_ON_LANE, _DROP_AXLES),
        ),
        part(
            "tandem + lane",
            _TANDEM,
            _TANDEM_SPACING,
            lane_load=_LANE,
            drop_adverse_axles=True,
            rules=(_NO_IM_ON_LANE, _DROP_AXLES),
        ),
        part(
            "two trucks + lane, 90 %",
            (_TRUCK, _TRUCK),
            (_TWO_TRUCK_SPACINGS, _TWO_TRUCK_HEADWAY, _TWO_TRUCK_SPACINGS),
            lane_load=_LANE,
            factor=_TWO_TRUCK_FACTOR,
            scope="interior-hogging",
            drop_adverse_axles=True,
            rules=(_TWO_TRUCK_SCOPE, _NO_IM_ON_LANE, _DROP_AXLES),
        ),
    ),
)

_FATIGUE_SPACINGS = Sourced(
    what="fatigue truck spacings (constant 30 ft between the 32 kip axles)",
    value=(14.0, 30.0),
    unit="ft",
    source=f"{_LRFD}, Art. 3.6.1.4.1",
    status="verified",
    seen="a reproduced page of Art. 3.6.1.4.1 of the 7th ed. (2014): one design truck 'or"
    " axles thereof' with a constant 30.0 ft spacing between the 32.0 kip axles, the dynamic"
    " load allowance applied",
)
_FATIGUE_AXLES = Sourced(
    what="fatigue load: one design truck or axles thereof (axles that lessen an effect left out)",
    source=f"{_LRFD}, Art. 3.6.1.4.1",
    status="verified",
    seen="a reproduced page of Art. 3.6.1.4.1 of the 7th ed. (2014)",
)
_FATIGUE_IM = Sourced(
    what="dynamic load allowance, fatigue and fracture limit state",
    value=(0.15,),
    source=f"{_LRFD}, Table 3.6.2.1-1",
    status="secondary",
    seen="an engineer's answer listing Table 3.6.2.1-1 (75 % deck joints, 15 % fatigue, 33 %"
    " otherwise) on engineerboards.com",
)


def _fatigue(name: str, aliases: tuple[str, ...], factor: Sourced | None, what: str) -> LoadModel:
    return LoadModel(
        name=name,
        aliases=aliases,
        units="US",
        category="design",
        source=f"{_LRFD}, Art. 3.6.1.4.1 (fatigue load), 3.6.1.1.2 (no multiple presence),"
        " Tables 3.6.2.1-1 (IM 15 %) and 3.4.1-1 (fatigue load factors)",
        description=f"One design truck 8, 32, 32 kip with a fixed 30 ft spacing between the"
        f" 32 kip axles, or axles thereof; no lane load; IM fixed at 0.15 whatever the run's"
        f" setting; {what} Its effects use each member's single-lane distribution factors"
        " (DF moment single lane, DF shear single lane) divided by 1.2, the one-lane"
        " multiple presence factor. The Fatigue sheet gives its moment range at every"
        " station (largest minus smallest moment).",
        parts=(
            part(
                "",
                _TRUCK,
                _FATIGUE_SPACINGS,
                impact=_FATIGUE_IM,
                factor=factor,
                drop_adverse_axles=True,
                fatigue=True,
                rules=(_FATIGUE_AXLES, FATIGUE_NO_MULTIPLE_PRESENCE),
            ),
        ),
        caution="a fatigue load is not rated by the strength equation: its rating factors"
        " (with the design live-load factor) mean nothing; use its moment range (Fatigue"
        " sheet) and leave it out of the rated fleet",
    )


FATIGUE = _fatigue(
    "Fatigue truck",
    ("LRFD fatigue", "HL-93 fatigue", "Fatigue"),
    None,
    "no load factor (put Fatigue I or II's in the row's Load multiplier, or use those models).",
)
FATIGUE_I_MODEL = _fatigue(
    "Fatigue I", ("Fatigue I truck",), FATIGUE_I, "times the Fatigue I load factor 1.75."
)
FATIGUE_II_MODEL = _fatigue(
    "Fatigue II", ("Fatigue II truck",), FATIGUE_II, "times the Fatigue II load factor 0.80."
)

# ---------------------------------------------------------------- MBE legal loads

_LEGAL_NOTE = (
    " The run's dynamic load allowance applies (the MBE's standard IM for legal loads is"
    " 33 %, from memory). Every axle counts wherever it stands."
)
_D6A = f"{_MBE}, Art. 6A.4.4.2.1a and Appendix D6A"


def _legal(what: str, value: tuple[float, ...], unit: str) -> Sourced:
    return Sourced(what=what, value=value, unit=unit, source=_D6A, status="from memory")


_TYPE_3 = _legal("Type 3 axle loads", (16.0, 17.0, 17.0), "kip")
_TYPE_3_SPACINGS = _legal("Type 3 spacings", (15.0, 4.0), "ft")
_TYPE_3S2 = _legal("Type 3S2 axle loads", (10.0, 15.5, 15.5, 15.5, 15.5), "kip")
_TYPE_3S2_SPACINGS = _legal("Type 3S2 spacings", (11.0, 4.0, 22.0, 4.0), "ft")
_TYPE_33 = _legal("Type 3-3 axle loads", (12.0, 12.0, 12.0, 16.0, 14.0, 14.0), "kip")
_TYPE_33_SPACINGS = _legal("Type 3-3 spacings", (15.0, 4.0, 15.0, 16.0, 4.0), "ft")

TYPE_3 = LoadModel(
    name="Type 3",
    units="US",
    category="legal",
    source=f"{_D6A} (AASHTO legal loads)",
    description="AASHTO legal Type 3 unit: 16, 17, 17 kip at 15, 4 ft (50 kip, 25 t)."
    + _LEGAL_NOTE,
    parts=(part("", _TYPE_3, _TYPE_3_SPACINGS),),
)

TYPE_3S2 = LoadModel(
    name="Type 3S2",
    aliases=("3S2",),
    units="US",
    category="legal",
    source=f"{_D6A} (AASHTO legal loads)",
    description="AASHTO legal Type 3S2 semi: 10, 15.5, 15.5, 15.5, 15.5 kip at 11, 4, 22, 4 ft"
    " (72 kip, 36 t)." + _LEGAL_NOTE,
    parts=(part("", _TYPE_3S2, _TYPE_3S2_SPACINGS),),
)

TYPE_33 = LoadModel(
    name="Type 3-3",
    aliases=("3-3",),
    units="US",
    category="legal",
    source=f"{_D6A} (AASHTO legal loads)",
    description="AASHTO legal Type 3-3 train: 12, 12, 12, 16, 14, 14 kip at 15, 4, 15, 16, 4 ft"
    " (80 kip, 40 t)." + _LEGAL_NOTE,
    parts=(part("", _TYPE_33, _TYPE_33_SPACINGS),),
)

# The lane-type legal load. The 75 % is on the trucks only, so it is in the axle loads,
# not the part factor.
_LANE_TYPE_FRACTION = _legal("lane-type model: fraction of the Type 3-3 axle loads", (0.75,), "")
_TYPE_33_75 = Sourced.derived(
    "0.75 x Type 3-3 axle loads",
    tuple(0.75 * p for p in _TYPE_33.numbers),
    "kip",
    _TYPE_33,
    _LANE_TYPE_FRACTION,
)
_LEGAL_LANE_LOAD = _legal("lane-type model: lane load", (0.2,), "kip/ft")
_LANE_TYPE_SPAN = Sourced(
    what="lane-type model: the single truck with lane load applies to spans this long or"
    " longer (only the vehicles below); a member qualifies by its longest span",
    value=(200.0,),
    unit="ft",
    source=_D6A,
    status="from memory",
)
_LEGAL_CLEAR = _legal(
    "two-truck model: clear distance, rear axle of the lead truck to front axle of the next",
    (30.0,),
    "ft",
)
_LEGAL_TWO_TRUCK_SCOPE = Sourced(
    what="two-truck model, at any span: negative moment and reactions at interior supports,"
    " the trucks heading the same way",
    source=_D6A,
    status="from memory",
)
_LANE_TYPE_W = Sourced(
    what="posting: gross weight W when the lane-type model governs",
    value=(80.0,),
    unit="kip",
    source=f"{_MBE}, Art. 6A.8.3",
    status="from memory",
)

LEGAL_LANE = LoadModel(
    name="Legal lane",
    aliases=("Lane-type legal", "Legal lane load", "Type 3-3 lane"),
    units="US",
    category="legal",
    source=f"{_D6A} (lane-type legal load models) and 6A.8.3 (posting weight)",
    description="Lane-type legal load. On members with a span of 200 ft or more: 75 % of"
    " Type 3-3 with 0.2 kip/ft (on shorter members this part gives nothing: the legal trucks"
    " alone apply there). On every member, for hogging moment at every station and for"
    " reactions at interior supports: two 75 % Type 3-3 trucks heading the same way, 30 ft"
    " clear between them, with 0.2 kip/ft. Posting uses W = 80 kip (40 t), the Type 3-3's"
    " weight, not the 60 kip of the reduced truck." + _LEGAL_NOTE,
    parts=(
        part(
            "75 % Type 3-3 + lane",
            _TYPE_33_75,
            _TYPE_33_SPACINGS,
            lane_load=_LEGAL_LANE_LOAD,
            min_span=_LANE_TYPE_SPAN,
        ),
        part(
            "two 75 % Type 3-3 + lane",
            (_TYPE_33_75, _TYPE_33_75),
            (_TYPE_33_SPACINGS, _LEGAL_CLEAR, _TYPE_33_SPACINGS),
            lane_load=_LEGAL_LANE_LOAD,
            scope="hogging-interior-reactions",
            rules=(_LEGAL_TWO_TRUCK_SCOPE,),
        ),
    ),
    gross_weight=_LANE_TYPE_W,
)

# ---------------------------------------------------------------- SHVs and the NRL

_SHV_SOURCE = f"{_MBE}, Art. 6A.4.4.2.1b and Appendix D6A, from NCHRP Report 575 (2007)"
_SHV = {
    "SU4": ((12.0, 8.0, 17.0, 17.0), (10.0, 4.0, 4.0)),
    "SU5": ((12.0, 8.0, 8.0, 17.0, 17.0), (10.0, 4.0, 4.0, 4.0)),
    "SU6": ((11.5, 8.0, 8.0, 17.0, 17.0, 8.0), (10.0, 4.0, 4.0, 4.0, 4.0)),
    "SU7": ((11.5, 8.0, 8.0, 17.0, 17.0, 8.0, 8.0), (10.0, 4.0, 4.0, 4.0, 4.0, 4.0)),
}


def _shv(name: str, loads: tuple[float, ...], spacings: tuple[float, ...]) -> LoadModel:
    return LoadModel(
        name=name,
        units="US",
        category="legal",
        source=f"{_SHV_SOURCE} (specialized hauling vehicles)",
        description=f"Specialized hauling single-unit truck {name}: "
        + ", ".join(f"{p:g}" for p in loads)
        + " kip at "
        + ", ".join(f"{s:g}" for s in spacings)
        + f" ft ({sum(loads):g} kip)."
        + _LEGAL_NOTE,
        parts=(
            part(
                "",
                Sourced(
                    what=f"{name} axle loads",
                    value=loads,
                    unit="kip",
                    source=_SHV_SOURCE,
                    status="from memory",
                ),
                Sourced(
                    what=f"{name} spacings",
                    value=spacings,
                    unit="ft",
                    source=_SHV_SOURCE,
                    status="from memory",
                ),
            ),
        ),
    )


SHVS = tuple(_shv(name, loads, spacings) for name, (loads, spacings) in _SHV.items())

_NRL_AXLES = Sourced(
    what="NRL axle loads",
    value=(6.0, 8.0, 8.0, 17.0, 17.0, 8.0, 8.0, 8.0),
    unit="kip",
    source=_SHV_SOURCE,
    status="from memory",
)
_NRL_SPACINGS = Sourced(
    what="NRL spacings (the first varies, for the worst effect)",
    value=((6.0, 14.0), 4.0, 4.0, 4.0, 4.0, 4.0, 4.0),
    unit="ft",
    source=_SHV_SOURCE,
    status="from memory",
)
_NRL_DROP = Sourced(
    what="NRL: axles that do not contribute to the maximum load effect are neglected",
    source=_SHV_SOURCE,
    status="from memory",
)

NRL = LoadModel(
    name="NRL",
    aliases=("Notional rating load",),
    units="US",
    category="legal",
    source=f"{_SHV_SOURCE} (notional rating load)",
    description="Notional rating load: 6, 8, 8, 17, 17, 8, 8, 8 kip (80 kip); the first"
    " spacing varies from 6 to 14 ft (the worst is used), then six of 4 ft. A screening"
    " load: RF >= 1 for NRL means SU4 to SU7 need not be rated. Axles that would lessen an"
    " effect are left out, which is what lets it envelope the SU trucks. The run's dynamic"
    " load allowance applies.",
    parts=(part("", _NRL_AXLES, _NRL_SPACINGS, drop_adverse_axles=True, rules=(_NRL_DROP,)),),
)

# ---------------------------------------------------------------- emergency vehicles

_EV_SOURCE = (
    "FHWA memorandum 'Load Rating for the FAST Act's Emergency Vehicles' (2016-11-03) and"
    f" {_MBE} with its 2019 interim revisions, Art. 6A.4.4.2.1"
)
_FAST_ACT = (
    "FHWA's notice of February 2016 on the FAST Act's size and weight provisions, as"
    " summarised by J. J. Keller (2016-03-02); Kentucky Transportation Cabinet, 'Know Your"
    " Limits' (86,000 lb gross)"
)
_EV2_AXLES = Sourced(
    what="EV2 axle loads: steering axle and single drive axle (the FAST Act limits)",
    value=(24.0, 33.5),
    unit="kip",
    source=f"{_EV_SOURCE}; 23 U.S.C. 127 as amended by the FAST Act",
    status="secondary",
    seen=_FAST_ACT,
)
_EV2_SPACING = Sourced(
    what="EV2 axle spacing", value=(15.0,), unit="ft", source=_EV_SOURCE, status="from memory"
)
_EV3_AXLES = Sourced(
    what="EV3 axle loads: steering axle and a 62 kip tandem (the FAST Act limits, 86 kip)",
    value=(24.0, 31.0, 31.0),
    unit="kip",
    source=f"{_EV_SOURCE}; 23 U.S.C. 127 as amended by the FAST Act",
    status="secondary",
    seen=_FAST_ACT,
)
_EV3_SPACINGS = Sourced(
    what="EV3 spacings", value=(15.0, 4.0), unit="ft", source=_EV_SOURCE, status="from memory"
)
_EV_CAUTION = (
    "emergency vehicles are rated here with the generic legal-load factor (LL factor legal)"
    " and posted by the generic legal-load equation; the MBE's later revisions give"
    " emergency vehicles their own live-load factors and posting approach (NCHRP 20-07/410),"
    " which spanfleet does not have in published text: check the rating against them"
)


def _ev(name: str, description: str, axles: Sourced, spacings: Sourced) -> LoadModel:
    return LoadModel(
        name=name,
        units="US",
        category="legal",
        source=_EV_SOURCE,
        description=description + " The run's dynamic load allowance applies.",
        parts=(part("", axles, spacings),),
        caution=_EV_CAUTION,
    )


EV2 = _ev(
    "EV2",
    "Emergency vehicle, single rear axle: 24 kip steer and 33.5 kip drive axle at 15 ft"
    " (57.5 kip).",
    _EV2_AXLES,
    _EV2_SPACING,
)
EV3 = _ev(
    "EV3",
    "Emergency vehicle, tandem rear axle: 24 kip steer and 2 x 31 kip (62 kip tandem) at"
    " 15 ft, then 4 ft (86 kip).",
    _EV3_AXLES,
    _EV3_SPACINGS,
)

US_MODELS: tuple[LoadModel, ...] = (
    HL93,
    FATIGUE,
    FATIGUE_I_MODEL,
    FATIGUE_II_MODEL,
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


# ---------------------------------------------------------------- LRFD: the deflection loading
# Not a fleet vehicle (it is not rated): the engine moves it over the members whose
# Analysis row asks for deflections (batch/engine/deflection.py).

_DEFLECTION_RULE = Sourced(
    what="live-load deflection: the larger of the design truck alone and 25 % of the design"
    " truck taken together with the design lane load, with the dynamic load allowance",
    source=f"{_LRFD}, Art. 3.6.1.3.2 (with 2.5.2.6.2)",
    status="from memory",
)
_QUARTER_TRUCK = Sourced(
    what="deflection loading: fraction of the design truck taken with the lane load",
    value=(0.25,),
    source=f"{_LRFD}, Art. 3.6.1.3.2",
    status="from memory",
)

DEFLECTION_LOADING = LoadModel(
    name="HL-93 deflection",
    units="US",
    category="design",
    source=f"{_LRFD}, Art. 3.6.1.3.2 (loading for live-load deflection) and 2.5.2.6.2"
    " (criteria); US customary values, converted exactly in SI runs",
    description="The design truck alone (8, 32, 32 kip; 14 ft and 14-30 ft), and 25 % of it"
    " with the 0.64 kip/ft design lane load; the larger governs. The run's dynamic load"
    " allowance applies to the truck, not to the lane load; axles that would lessen the"
    " deflection are left out (as for HL-93).",
    parts=(
        part(
            "design truck",
            _TRUCK,
            _TRUCK_SPACINGS,
            drop_adverse_axles=True,
            rules=(_DEFLECTION_RULE, _DROP_AXLES),
        ),
        part(
            "25 % truck + lane",
            Sourced.derived(
                "0.25 x design truck axle loads",
                tuple(0.25 * p for p in _TRUCK.numbers),
                "kip",
                _TRUCK,
                _QUARTER_TRUCK,
            ),
            _TRUCK_SPACINGS,
            lane_load=_LANE,
            drop_adverse_axles=True,
            rules=(_DEFLECTION_RULE, _NO_IM_ON_LANE, _DROP_AXLES),
        ),
    ),
)
