"""The load models defined in kN, m and kN/m: AASHTO LRFD (SI edition), CSA S6, EN 1991-2.

Every value is a :class:`~batch.loads.sourced.Sourced` with its source and
status, as in :mod:`batch.loads.library.aashto`.
"""

from __future__ import annotations

import itertools

from batch.loads.library.models import LoadModel, Part, part
from batch.loads.sourced import UNBOUNDED, Sourced

__all__ = ["SI_MODELS"]

# ---------------------------------------------------------------- HL-93, SI edition

_LRFD_SI = "AASHTO LRFD Bridge Design Specifications, SI Units, 4th ed. (2007, 2008 interims)"
_SI_PAGE = "a reproduced page of the SI edition's Art. 3.6.1.2.2-3.6.1.2.4"
_TWO_TRUCK_SEEN = (
    "an engineer's restatement of the article in the SEAINT mailing-list archive (2003):"
    " two trucks at least 15 m apart, 90 % of their effect; an HL-93 article of"
    " EngineeringCivil.org"
)
_SI_TRUCK = Sourced(
    what="design truck axle loads",
    value=(35.0, 145.0, 145.0),
    unit="kN",
    source=f"{_LRFD_SI}, Art. 3.6.1.2.2, Fig. 3.6.1.2.2-1",
    status="verified",
    seen=f"{_SI_PAGE} ('35 000 N', '145 000 N')",
)
_SI_TRUCK_SPACINGS = Sourced(
    what="design truck spacings (the rear one varied for the worst effect)",
    value=(4.3, (4.3, 9.0)),
    unit="m",
    source=f"{_LRFD_SI}, Art. 3.6.1.2.2, Fig. 3.6.1.2.2-1",
    status="verified",
    seen=f"{_SI_PAGE} ('4300 mm', '4300 to 9000 mm')",
)
_SI_TANDEM = Sourced(
    what="design tandem axle loads",
    value=(110.0, 110.0),
    unit="kN",
    source=f"{_LRFD_SI}, Art. 3.6.1.2.3",
    status="verified",
    seen=f"{_SI_PAGE} ('a pair of 110 000-N axles spaced 1200 mm apart')",
)
_SI_TANDEM_SPACING = Sourced(
    what="design tandem axle spacing",
    value=(1.2,),
    unit="m",
    source=f"{_LRFD_SI}, Art. 3.6.1.2.3",
    status="verified",
    seen=f"{_SI_PAGE} ('spaced 1200 mm apart')",
)
_SI_LANE = Sourced(
    what="design lane load",
    value=(9.3,),
    unit="kN/m",
    source=f"{_LRFD_SI}, Art. 3.6.1.2.4",
    status="verified",
    seen=f"{_SI_PAGE} ('9.3 N/mm')",
)
_SI_NO_IM_ON_LANE = Sourced(
    what="the dynamic load allowance applies to the truck and tandem, never to the lane load",
    source=f"{_LRFD_SI}, Art. 3.6.1.2.4 and 3.6.2.1",
    status="verified",
    seen=f"{_SI_PAGE} (lane force effects 'shall not be subject to a dynamic load allowance')",
)
_SI_DROP_AXLES = Sourced(
    what="axles that do not contribute to the extreme force effect are neglected",
    source=f"{_LRFD_SI}, Art. 3.6.1.3.1",
    status="from memory",
)
_SI_TWO_TRUCK_FACTOR = Sourced(
    what="two-truck load: fraction of the trucks and lane load",
    value=(0.90,),
    source=f"{_LRFD_SI}, Art. 3.6.1.3.1",
    status="secondary",
    seen=_TWO_TRUCK_SEEN,
)
_SI_HEADWAY = Sourced(
    what="two-truck load: lead axle of one truck to rear axle of the other",
    value=((15.0, UNBOUNDED),),
    unit="m",
    source=f"{_LRFD_SI}, Art. 3.6.1.3.1",
    status="secondary",
    seen=_TWO_TRUCK_SEEN,
)
_SI_TWO_TRUCK_SPACINGS = Sourced(
    what="two-truck load: spacings of each truck (rear spacing fixed)",
    value=(4.3, 4.3),
    unit="m",
    source=f"{_LRFD_SI}, Art. 3.6.1.3.1",
    status="from memory",
)
_SI_TWO_TRUCK_SCOPE = Sourced(
    what="two-truck load only for hogging moment between the points of contraflexure under"
    " a uniform load on all spans, and for reactions at interior piers",
    source=f"{_LRFD_SI}, Art. 3.6.1.3.1",
    status="from memory",
)

HL93_SI = LoadModel(
    name="HL-93 (SI edition)",
    aliases=("HL-93 SI", "HL93 metric"),
    units="SI",
    category="design",
    source=f"{_LRFD_SI}, Art. 3.6.1.2 (design truck, tandem, lane), 3.6.1.3.1 (application,"
    " two-truck rule) and 3.6.2.1 (IM)",
    description="HL-93 with the SI edition's own values, not a conversion of the US"
    " customary ones ('HL-93'): design truck 35, 145, 145 kN at 4.3 m, then 4.3 to 9.0 m;"
    " design tandem 2 x 110 kN at 1.2 m; lane 9.3 kN/m; for hogging moment between the"
    " points of contraflexure and for interior reactions only, 90 % of two design trucks"
    " (4.3 m rear spacings, at least 15 m from the lead axle of one to the rear axle of the"
    " other) with 90 % of the lane load. The run's dynamic load allowance applies to trucks"
    " and tandem, never to the lane load. Axles that would lessen an effect are left out.",
    parts=(
        part(
            "truck + lane",
            _SI_TRUCK,
            _SI_TRUCK_SPACINGS,
            lane_load=_SI_LANE,
            drop_adverse_axles=True,
            rules=(_SI_NO_IM_ON_LANE, _SI_DROP_AXLES),
        ),
        part(
            "tandem + lane",
            _SI_TANDEM,
            _SI_TANDEM_SPACING,
            lane_load=_SI_LANE,
            drop_adverse_axles=True,
            rules=(_SI_NO_IM_ON_LANE, _SI_DROP_AXLES),
        ),
        part(
            "two trucks + lane, 90 %",
            (_SI_TRUCK, _SI_TRUCK),
            (_SI_TWO_TRUCK_SPACINGS, _SI_HEADWAY, _SI_TWO_TRUCK_SPACINGS),
            lane_load=_SI_LANE,
            factor=_SI_TWO_TRUCK_FACTOR,
            scope="interior-hogging",
            drop_adverse_axles=True,
            rules=(_SI_TWO_TRUCK_SCOPE, _SI_NO_IM_ON_LANE, _SI_DROP_AXLES),
        ),
    ),
)

# ---------------------------------------------------------------- CSA S6: CL-625

_S6 = "CSA S6-14 Canadian Highway Bridge Design Code"
_PYCBA = "the documentation of pycba, an open-source beam-analysis library (CL-625 vehicle)"
_CL = Sourced(
    what="CL-W truck axle loads, W = 625 kN (0.08, 0.2, 0.2, 0.28, 0.24 W)",
    value=(50.0, 125.0, 125.0, 175.0, 150.0),
    unit="kN",
    source=f"{_S6}, Cl. 3.8.3.1.2 (Cl. 3.8.3.2 in S6-06)",
    status="secondary",
    seen=_PYCBA,
)
_CL_SPACINGS = Sourced(
    what="CL-W truck spacings",
    value=(3.6, 1.2, 6.6, 6.6),
    unit="m",
    source=f"{_S6}, Cl. 3.8.3.1.2 (Cl. 3.8.3.2 in S6-06)",
    status="secondary",
    seen=_PYCBA,
)
_CL_LANE_FRACTION = Sourced(
    what="CL-W lane load: fraction of each truck axle",
    value=(0.8,),
    source=f"{_S6}, Cl. 3.8.3.1.3 (Cl. 3.8.3.3 in S6-06)",
    status="secondary",
    seen=_PYCBA,
)
_CL_LANE = Sourced(
    what="CL-W lane load: uniform load",
    value=(9.0,),
    unit="kN/m",
    source=f"{_S6}, Cl. 3.8.3.1.3 (Cl. 3.8.3.3 in S6-06)",
    status="secondary",
    seen=_PYCBA,
)
_DLA_CLAUSE = f"{_S6}, Cl. 3.8.4.5.3"
_DLA_ONE = Sourced(
    what="dynamic load allowance, only one axle of the CL-W truck",
    value=(0.40,),
    source=_DLA_CLAUSE,
    status="from memory",
)
_DLA_TWO = Sourced(
    what="dynamic load allowance, any two axles of the CL-W truck, or axles 1 to 3",
    value=(0.30,),
    source=_DLA_CLAUSE,
    status="from memory",
)
_DLA_MANY = Sourced(
    what="dynamic load allowance, three axles other than axles 1 to 3, or more than three",
    value=(0.25,),
    source=_DLA_CLAUSE,
    status="from memory",
)
_DLA_JOINTS = Sourced(
    what="dynamic load allowance 0.50 for deck joints only: not a girder effect, not used",
    value=(0.50,),
    source=_DLA_CLAUSE,
    status="from memory",
)
_NO_DLA_ON_LANE = Sourced(
    what="no dynamic load allowance on the CL-W lane load",
    value=(0.0,),
    source=f"{_S6}, Cl. 3.8.4.5.1 and 3.8.4.5.3",
    status="from memory",
)
_CL_DROP = Sourced(
    what="the DLA follows the axles used: axles that would lessen an effect are left off",
    source=_DLA_CLAUSE,
    status="from memory",
)


def _named(axles: tuple[int, ...]) -> str:
    """``axle 4``, ``axles 2 and 4`` or ``axles 1 to 3`` (axles numbered from 1)."""
    if len(axles) == 1:
        return f"axle {axles[0]}"
    if len(axles) == 2:
        return f"axles {axles[0]} and {axles[1]}"
    return f"axles {axles[0]} to {axles[-1]}"  # consecutive axles only


def _cl_part(axles: tuple[int, ...], dla: Sourced) -> Part:
    """Some axles of the CL-W truck, at their own spacings, with their allowance."""
    name = _named(axles)
    offsets = [0.0, *itertools.accumulate(_CL_SPACINGS.numbers)]
    gaps = tuple(round(offsets[b - 1] - offsets[a - 1], 9) for a, b in itertools.pairwise(axles))
    return part(
        name,
        Sourced.derived(
            f"CL-W truck {name}: loads", tuple(_CL.numbers[i - 1] for i in axles), "kN", _CL
        ),
        Sourced.derived(f"CL-W truck {name}: spacings", gaps, "m", _CL_SPACINGS),
        impact=dla,
        drop_adverse_axles=True,
        rules=(_CL_DROP, _DLA_JOINTS),
    )


_HEAVIEST = 1 + _CL.numbers.index(max(_CL.numbers))  # one axle: the heaviest governs
_CL_LANE_AXLES = Sourced.derived(
    "CL-W lane load: 80 % of each truck axle",
    tuple(round(0.8 * p, 9) for p in _CL.numbers),
    "kN",
    _CL,
    _CL_LANE_FRACTION,
)

CL625 = LoadModel(
    name="CL-625",
    units="SI",
    category="design",
    source=f"{_S6}, Cl. 3.8.3.1.2 (CL-W truck), 3.8.3.1.3 (CL-W lane load) and 3.8.4.5.3"
    " (dynamic load allowance)",
    description="CL-W truck with W = 625 kN: 50, 125, 125, 175, 150 kN at 3.6, 1.2, 6.6,"
    " 6.6 m; and the CL-W lane load: 80 % of each truck axle with 9 kN/m, no dynamic load"
    " allowance. S6 sets the truck's dynamic load allowance by the axles that produce the"
    " effect: 0.40 for one axle, 0.30 for any two axles or axles 1 to 3, 0.25 for three"
    " other axles or more (from memory: the clause's text was not found). spanfleet"
    " envelopes the whole truck (0.25), axles 1 to 3 and every pair of axles (0.30) and the"
    " heaviest axle alone (0.40), each with the axles that would lessen an effect left off."
    " The deck-joint value 0.50 is not used (girder effects only). The run's dynamic load"
    " allowance is not used.",
    parts=(
        part(
            "truck",
            _CL,
            _CL_SPACINGS,
            impact=_DLA_MANY,
            drop_adverse_axles=True,
            rules=(_CL_DROP, _DLA_JOINTS),
        ),
        _cl_part((1, 2, 3), _DLA_TWO),
        *(_cl_part(pair, _DLA_TWO) for pair in itertools.combinations(range(1, 6), 2)),
        _cl_part((_HEAVIEST,), _DLA_ONE),
        part("lane", _CL_LANE_AXLES, _CL_SPACINGS, lane_load=_CL_LANE, impact=_NO_DLA_ON_LANE),
    ),
)

# ---------------------------------------------------------------- EN 1991-2: LM1

_EN = "EN 1991-2:2003"
_EN_TEXTBOOK = (
    "the textbook Finite Element Analysis and Design of Steel and Steel-Concrete Composite"
    " Bridges (2014), Fig. 3.6 'Application of Load Model 1'"
)
_LM1_AXLES = Sourced(
    what="tandem system, notional lane 1: axle loads (alpha_Q1 = 1)",
    value=(300.0, 300.0),
    unit="kN",
    source=f"{_EN}, 4.3.2, Table 4.2",
    status="secondary",
    seen=_EN_TEXTBOOK,
)
_LM1_SPACING = Sourced(
    what="tandem system: axle spacing",
    value=(1.2,),
    unit="m",
    source=f"{_EN}, 4.3.2, Fig. 4.2a",
    status="secondary",
    seen="the documentation of pycba, an open-source beam-analysis library (LM1 vehicle)",
)
_LM1_UDL = Sourced(
    what="uniform load on notional lane 1, 9 kN/m2 over the 3 m lane (alpha_q1 = 1)",
    value=(27.0,),
    unit="kN/m",
    source=f"{_EN}, 4.2.3 (Table 4.1) and 4.3.2 (Table 4.2)",
    status="secondary",
    seen=f"{_EN_TEXTBOOK} (9 kN/m2, w_l = 3.00 m)",
)
_LM1_DYNAMIC = Sourced(
    what="dynamic amplification is included in the characteristic values: none added",
    value=(0.0,),
    source=f"{_EN}, 4.3.2",
    status="from memory",
)

LM1 = LoadModel(
    name="LM1",
    aliases=("EN LM1", "EN 1991-2 LM1", "Eurocode LM1", "Load Model 1"),
    units="SI",
    category="design",
    source=f"{_EN}, 4.3.2 and Table 4.2 (Load Model 1, notional lane 1, adjustment factors 1.0)",
    description="Load Model 1 for one 3 m notional lane: tandem of two 300 kN axles 1.2 m"
    " apart with 9 kN/m2 x 3 m = 27 kN/m on the adverse parts. Dynamic amplification is"
    " included, so no dynamic load allowance is added. National Annex adjustment factors are"
    " taken as 1.0: put others in the row's Load multiplier only if alpha_Q1 = alpha_q1.",
    parts=(part("", _LM1_AXLES, _LM1_SPACING, lane_load=_LM1_UDL, impact=_LM1_DYNAMIC),),
)

SI_MODELS: tuple[LoadModel, ...] = (HL93_SI, CL625, LM1)
