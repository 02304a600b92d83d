"""Published factors of the rating codes, as data, in one place.

The rating stage (:mod:`batch.rating.lrfr`) computes with these values and validation
(:mod:`batch.validating`) words its messages and warnings with them, so each
value is written once, beside its source.
"""

from __future__ import annotations

from batch.loads.cases import ImpactFormula
from batch.loads.sourced import Sourced

__all__ = [
    "FATIGUE_I",
    "FATIGUE_II",
    "FATIGUE_NO_MULTIPLE_PRESENCE",
    "KIP_PER_TON",
    "KN_PER_TONNE",
    "MIN_CAPACITY_FACTOR",
    "POSTING_DIVISOR",
    "POSTING_FLOOR",
    "PUBLISHED_FACTORS",
    "SINGLE_LANE_PRESENCE",
    "STANDARD_IMPACT_RULES",
    "STANDARD_SPECIFICATIONS_IMPACT",
]

_LRFD = "AASHTO LRFD Bridge Design Specifications"

#: MBE Eq. 6A.4.2.1-3 (from memory): phi_c * phi_s is not taken below 0.85.
MIN_CAPACITY_FACTOR = 0.85

#: MBE 6A.8.3 (from memory): posting load (W/0.7)(RF - 0.3); below RF 0.3 consider closing.
POSTING_DIVISOR = 0.7
POSTING_FLOOR = 0.3

_STD = "AASHTO Standard Specifications for Highway Bridges, 17th ed. (2002)"

#: The Standard Specifications' impact: I = 50 / (L + 125) <= 0.30, L the loaded length in
#: ft. Its values (50 ft, 125 ft, the cap 0.30) and the rules that go with it.
STANDARD_IMPACT = Sourced(
    what="impact I = 50 / (L + 125) <= 0.30, L the loaded length in ft: 50 ft, 125 ft and the cap",
    value=(50.0, 125.0, 0.30),
    source=f"{_STD}, Art. 3.8.2.1",
    status="secondary",
    seen="the formula and its 30 % cap in the documentation of civilpy, an open-source"
    " structural library (HS20Load.impact_factor)",
)
STANDARD_IMPACT_LENGTHS = Sourced(
    what="impact loaded length L: the span for positive moment; the average of the two"
    " adjacent loaded spans for negative moment of continuous spans; for shear, the loaded"
    " portion of the span from the section to the far reaction (spanfleet's reading of each"
    " effect: batch/engine/impact.py)",
    source=f"{_STD}, Art. 3.8.2.2",
    status="from memory",
)
STANDARD_IMPACT_REACTIONS = Sourced(
    what="impact loaded length of a reaction: the span beside an end support, the average of"
    " the two spans beside an interior support (the specification names none; spanfleet's"
    " choice, the shorter of the two lengths in use and so the larger impact)",
    source=f"{_STD}, Art. 3.8.2.2",
    status="from memory",
)
STANDARD_IMPACT_ON_LANE = Sourced(
    what="the impact allowance applies to the truck and the lane loading alike",
    source=f"{_STD}, Art. 3.8.1 and 3.8.2",
    status="from memory",
)
#: The impact formula of :data:`STANDARD_IMPACT` (lengths in ft;
#: :meth:`~batch.loads.cases.ImpactFormula.scaled` converts them exactly, 0.3048 m per ft).
STANDARD_SPECIFICATIONS_IMPACT = ImpactFormula(
    numerator=STANDARD_IMPACT.numbers[0],
    added=STANDARD_IMPACT.numbers[1],
    cap=STANDARD_IMPACT.numbers[2],
)
#: Every published value and rule of the Standard Specifications' impact, for the parts
#: and rows that use it.
STANDARD_IMPACT_RULES = (
    STANDARD_IMPACT,
    STANDARD_IMPACT_LENGTHS,
    STANDARD_IMPACT_REACTIONS,
    STANDARD_IMPACT_ON_LANE,
)

#: A US (short) ton is 2 kip; a tonne is 1000 kg, 9.80665 kN under standard gravity.
KIP_PER_TON = 2.0
KN_PER_TONNE = 9.80665

#: Published values of each rating setting as (lowest, highest); outside them validation
#: warns. From memory: MBE Table 6A.4.2.2-1 (DC 1.25; DW 1.50, or 1.25 with a
#: field-measured overlay; design 1.75 inventory, 1.35 operating); legal loads 1.30 to
#: 1.45 (MBE 2nd ed. on) and up to 1.80 (1st ed., 2008); permits 1.10 to 1.85 (routine
#: to multiple-trip); relieving dead loads LRFD Table 3.4.1-2 minimums.
PUBLISHED_FACTORS: dict[str, tuple[float, float]] = {
    "dc_factor": (1.25, 1.25),
    "dw_factor": (1.25, 1.5),
    "dc_factor_relieving": (0.9, 0.9),
    "dw_factor_relieving": (0.65, 0.65),
    "ll_factor_design": (1.75, 1.75),
    "ll_factor_operating": (1.35, 1.35),
    "ll_factor_legal": (1.3, 1.8),
    "ll_factor_permit": (1.1, 1.85),
}

#: The multiple presence factor of one loaded lane. The approximate single-lane
#: distribution factors of LRFD 4.6.2.2 and 4.6.2.3 include it; where a standard asks for
#: the single-lane factor without it (the fatigue limit state; single-trip permits), the
#: tabulated factor is divided by this value.
SINGLE_LANE_PRESENCE = Sourced(
    what="multiple presence factor, one loaded lane",
    value=(1.2,),
    source=f"{_LRFD}, Table 3.6.1.1.2-1",
    status="secondary",
    seen="TRB's project summary of NCHRP 20-07/Task 285 (the one-lane distribution factor"
    " is used with its multiple presence factor, 'such as a value of 1.2', divided out)",
)

#: The fatigue rule on lanes: one design truck, and no multiple presence factor.
FATIGUE_NO_MULTIPLE_PRESENCE = Sourced(
    what="fatigue: one truck, the single-lane distribution factor with the one-lane"
    " multiple presence factor divided out",
    source=f"{_LRFD}, Art. 3.6.1.1.2 and 3.6.1.4.3b",
    status="from memory",
)

#: Load factors on LL + IM of the fatigue load combinations (Fatigue I: infinite life;
#: Fatigue II: finite life). Before the recalibration of the 2010s they were 1.50 and
#: 0.75 (seen in Mertz, "AASHTO LRFD", ASPIRE, Summer 2011, p. 60); the values used are
#: those of the current editions, from memory.
FATIGUE_I = Sourced(
    what="load factor on LL + IM, Fatigue I",
    value=(1.75,),
    source=f"{_LRFD}, 8th ed. (2017) and later, Table 3.4.1-1",
    status="from memory",
)
FATIGUE_II = Sourced(
    what="load factor on LL + IM, Fatigue II",
    value=(0.80,),
    source=f"{_LRFD}, 8th ed. (2017) and later, Table 3.4.1-1",
    status="from memory",
)
