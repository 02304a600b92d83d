"""Published factors of the rating codes, as data, in one place.

The rating stage (:mod:`batch.rating`) computes with these values and validation
(:mod:`batch.validating`) words its messages and warnings with them, so each
value is written once, beside its source and its status (:class:`Sourced`:
verified, secondary with where it was seen, or from memory). The Run Log lists
every rating table value a run may use with its source and status
(:data:`PUBLISHED_TABLES`).
"""

from __future__ import annotations

from dataclasses import dataclass

from batch.loads.cases import ImpactFormula
from batch.loads.sourced import Sourced, Status
from batch.model.case import Material, PermitType, RidingSurface

__all__ = [
    "ASR_FACTOR",
    "CAPACITY_FACTOR_VALUES",
    "CONDITION_FACTORS",
    "CRAWL_IMPACT",
    "EV_SCREEN",
    "FATIGUE_I",
    "FATIGUE_II",
    "FATIGUE_NO_MULTIPLE_PRESENCE",
    "KIP_PER_TON",
    "KN_PER_TONNE",
    "LEGAL_IMPACT",
    "LEGAL_LIVE_LOAD",
    "LFR_A1",
    "LFR_A2_INVENTORY",
    "LFR_A2_OPERATING",
    "LFR_POSTING",
    "MIN_CAPACITY_FACTOR",
    "PERMIT_LIVE_LOAD",
    "POSTING_DIVISOR",
    "POSTING_FLOOR",
    "PUBLISHED_FACTORS",
    "PUBLISHED_TABLES",
    "SERVICE_CHECKS",
    "SERVICE_DEAD_LOAD",
    "SERVICE_LEVELS",
    "SERVICE_POSTING",
    "SHV_SCREEN",
    "SINGLE_LANE_PRESENCE",
    "STANDARD_IMPACT_RULES",
    "STANDARD_SPECIFICATIONS_IMPACT",
    "STRENGTH_LIMIT_STATE",
    "SYSTEM_FACTORS",
    "AdttTable",
    "PermitRow",
    "ServiceCheck",
    "cited",
]

_LRFD = "AASHTO LRFD Bridge Design Specifications"

#: MBE 1st to 3rd editions as this module cites them.
MBE = "AASHTO Manual for Bridge Evaluation (MBE), 2nd ed. 2011 and 3rd ed. 2018"

#: MBE Eq. 6A.4.2.1-3: phi_c * phi_s is not taken below 0.85 (seen in M. A. Khan, Bridge and
#: Highway Structure Rehabilitation and Repair, McGraw-Hill 2010, p. 187, quoting the MBE).
MIN_CAPACITY_FACTOR = 0.85

#: MBE 6A.8.3, Eq. 6A.8.3-1: posting load (W/0.7)(RF - 0.3) for 0.3 <= RF < 1 (seen in Khan
#: 2010, p. 187); below RF 0.3 the MBE recommends considering closing the bridge (from memory).
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


def cited(value: Sourced) -> str:
    """``"0.9 (source; secondary: where seen)"``, for messages and the Run Log."""
    where = f"{value.status}: {value.seen}" if value.seen else value.status
    return f"{value.shown} ({value.source}; {where})"


@dataclass(frozen=True, kw_only=True)
class AdttTable:
    """A live-load factor that depends on the ADTT (trucks a day, one direction).

    ``points`` are (ADTT, factor) in increasing ADTT; between two points the
    factor is interpolated linearly, below the first and above the last it is the
    end value. ``unknown`` is the value the table gives where the ADTT is not
    known (the conservative end).
    """

    points: tuple[tuple[float, float], ...]
    unknown: float
    source: str
    status: Status

    def words(self, adtt: float) -> str:
        """``"ADTT 2500, interpolated"`` between the table's points, else ``"ADTT 6200"``."""
        inside = self.points[0][0] < adtt < self.points[-1][0]
        return f"ADTT {adtt:g}" + (", interpolated" if inside else "")

    def at(self, adtt: float) -> float:
        """The factor at ``adtt``, interpolated linearly between the table's points."""
        adtts = [a for a, _ in self.points]
        factors = [f for _, f in self.points]
        if adtt <= adtts[0]:
            return factors[0]
        for (a0, f0), (a1, f1) in zip(self.points, self.points[1:], strict=False):
            if adtt <= a1:
                return f0 + (f1 - f0) * (adtt - a0) / (a1 - a0)
        return factors[-1]


@dataclass(frozen=True, kw_only=True)
class PermitRow:
    """One row of the MBE permit live-load factor table, in the manual's words.

    ``frequency`` and ``loading`` are the table's words; ``one_lane`` says
    whether the row is rated with the one-lane distribution factor (with the
    multiple presence factor divided out) instead of the multi-lane one;
    ``factors`` gives the factor by ADTT.
    """

    frequency: str
    loading: str
    one_lane: bool
    factors: AdttTable


#: MBE Table 6A.4.2.3-1, condition factor phi_c by the member's structural condition; from
#: memory.
CONDITION_FACTORS: tuple[tuple[str, float], ...] = (
    ("good or satisfactory", 1.00),
    ("fair", 0.95),
    ("poor", 0.85),
)
#: MBE Table 6A.4.2.4-1, system factor phi_s for flexural and axial effects by the kind of
#: superstructure; from memory.
SYSTEM_FACTORS: tuple[tuple[str, float], ...] = (
    ("welded members in two-girder, truss or arch bridges", 0.85),
    ("riveted members in two-girder, truss or arch bridges", 0.90),
    ("multiple eyebar members in truss bridges", 0.90),
    ("three-girder bridges, girder spacing 6 ft or less", 0.85),
    ("four-girder bridges, girder spacing 4 ft or less", 0.95),
    ("all other girder and slab bridges", 1.00),
    ("floorbeams spaced more than 12 ft, non-continuous stringers", 0.85),
    ("redundant stringer subsystems between floorbeams", 1.00),
)
#: The manual's values of each capacity factor, as validation messages quote them.
CAPACITY_FACTOR_VALUES: dict[str, str] = {
    "condition_factor": "Table 6A.4.2.3-1, from memory: "
    + ", ".join(f"{v:.2f} {what}" for what, v in CONDITION_FACTORS),
    "system_factor": "Table 6A.4.2.4-1, from memory: from "
    + f"{min(v for _, v in SYSTEM_FACTORS):.2f} ({SYSTEM_FACTORS[0][0]}) to "
    + f"{max(v for _, v in SYSTEM_FACTORS):.2f} ({SYSTEM_FACTORS[5][0]})",
}

# ---------------------------------------------------------------- live-load factors by traffic

#: Legal loads (routine commercial traffic), LRFR Strength I: gamma_L by the ADTT in one
#: direction, 1.30 at ADTT <= 1000 and 1.45 at ADTT >= 5000, linear between; 1.45 where the
#: ADTT is unknown. From memory (the 1st edition's table, 2008, was higher: 1.40 to 1.80).
LEGAL_LIVE_LOAD = AdttTable(
    points=((1000.0, 1.30), (5000.0, 1.45)),
    unknown=1.45,
    source=f"{MBE}, Table 6A.4.4.2.3a-1 (live load factors for legal loads)",
    status="from memory",
)

_PERMIT_TABLE = f"{MBE}, Table 6A.4.5.4.2a-1 (permit load factors)"


def _permit(points: tuple[tuple[float, float], ...]) -> AdttTable:
    return AdttTable(
        points=points, unknown=points[-1][1], source=_PERMIT_TABLE, status="from memory"
    )


#: Permits, LRFR Strength II: gamma_L by permit type and ADTT (one direction), the rows of
#: the table as recalibrated for the 2nd edition (NCHRP 20-07/Task 285, whose summary states
#: the 1.10 floor kept for every permit: verified in the TRB project record). The factors
#: themselves are from memory; between the ADTT entries (< 100, 1000, > 5000) they are
#: interpolated linearly, and an unknown ADTT takes the > 5000 value. The single-trip and
#: multiple-trip rows use the one-lane distribution factor with the multiple presence
#: factor divided out (MBE 6A.4.5.4.2; verified in the TRB record of NCHRP 20-07/285).
PERMIT_LIVE_LOAD: dict[PermitType, PermitRow] = {
    "routine": PermitRow(
        frequency="routine or annual: unlimited crossings",
        loading="mixed with traffic (other vehicles may be on the bridge)",
        one_lane=False,
        factors=_permit(((100.0, 1.10), (1000.0, 1.20), (5000.0, 1.30))),
    ),
    "single-trip escorted": PermitRow(
        frequency="special or limited crossing: single trip",
        loading="escorted, with no other vehicles on the bridge",
        one_lane=True,
        factors=_permit(((0.0, 1.10),)),
    ),
    "single-trip": PermitRow(
        frequency="special or limited crossing: single trip",
        loading="mixed with traffic (other vehicles may be on the bridge)",
        one_lane=True,
        factors=_permit(((100.0, 1.10), (1000.0, 1.15), (5000.0, 1.20))),
    ),
    "multiple-trip": PermitRow(
        frequency="special or limited crossing: multiple trips (fewer than 100 crossings)",
        loading="mixed with traffic (other vehicles may be on the bridge)",
        one_lane=True,
        factors=_permit(((100.0, 1.30), (1000.0, 1.35), (5000.0, 1.40))),
    ),
}


# ---------------------------------------------------------------- dynamic load allowance

#: Legal loads: the dynamic load allowance by the riding surface (MBE C6A.4.4.3, Table
#: C6A.4.4.3-1): smooth approaches, deck and joints 10 %; minor surface deviations or
#: depressions 20 %; major deviations take the LRFD value, 33 % (LRFD Table 3.6.2.1-1). The
#: categories and the 10 % and 20 % are from memory; the 33 % of LRFD Table 3.6.2.1-1 was
#: verified (ASPIRE, Fall 2010, D. Mertz; a forum answer quoting the table), its use here for
#: major deviations is from memory.
LEGAL_IMPACT: dict[RidingSurface, Sourced] = {
    "smooth": Sourced(
        what="dynamic load allowance of legal loads, smooth riding surface",
        value=(0.10,),
        source=f"{MBE}, C6A.4.4.3, Table C6A.4.4.3-1",
        status="from memory",
    ),
    "minor deviations": Sourced(
        what="dynamic load allowance of legal loads, minor surface deviations or depressions",
        value=(0.20,),
        source=f"{MBE}, C6A.4.4.3, Table C6A.4.4.3-1",
        status="from memory",
    ),
    "major deviations": Sourced(
        what="dynamic load allowance of legal loads, major surface deviations",
        value=(0.33,),
        source=f"{MBE}, C6A.4.4.3: the LRFD value, AASHTO LRFD Table 3.6.2.1-1",
        status="from memory",
    ),
}

#: A permit escorted at crawl speed (10 mph or less) may be rated with no dynamic load
#: allowance (MBE 6A.4.5.5); from memory.
CRAWL_IMPACT = Sourced(
    what="dynamic load allowance of a permit escorted at crawl speed",
    value=(0.0,),
    source=f"{MBE}, 6A.4.5.5",
    status="from memory",
)

# ---------------------------------------------------------------- limit states

#: The LRFR strength limit state of each vehicle category (MBE Table 6A.4.2.2-1, from
#: memory): Strength I for design and legal loads, Strength II for permits.
STRENGTH_LIMIT_STATE: dict[str, str] = {
    "design": "Strength I",
    "legal": "Strength I",
    "permit": "Strength II",
}

# ---------------------------------------------------------------- LRFR service limit states

#: The levels a service live-load factor is given for (MBE Table 6A.4.2.2-1's columns): design
#: load inventory and operating, legal loads, permits.
SERVICE_LEVELS: tuple[str, ...] = ("inventory", "operating", "legal", "permit")

_SERVICE_TABLE = f"{MBE}, Table 6A.4.2.2-1 (load factors for load rating)"


def _service_factor(what: str, value: float, source: str = _SERVICE_TABLE) -> Sourced:
    return Sourced(what=what, value=(value,), source=source, status="from memory")


@dataclass(frozen=True, kw_only=True)
class ServiceCheck:
    """The LRFR service limit state one material is checked at, and how.

    ``limit_state`` as the MBE names it; ``stress`` the stress checked;
    ``factors`` the live-load factor gamma_L by level of :data:`SERVICE_LEVELS`
    (a level missing: the manual does not check it); ``limit`` the allowable
    stress rule (:class:`Sourced`, its numbers the multipliers spanfleet applies).
    Dead-load factors are :data:`SERVICE_DEAD_LOAD`.
    """

    limit_state: str
    stress: str
    factors: dict[str, Sourced]
    limit: Sourced


#: Prestressed concrete, Service III at the design-load inventory level: MBE Table 6A.4.2.2-2,
#: which the 3rd edition's errata (October 2018) put in place of Table 6A.4.2.2-1's 0.80: 1.0
#: where the losses are refined (time-dependent, AASHTO LRFD 5.9.3.4) with the elastic gains
#: taken, 0.8 for all other prestressed members. Verified in the errata sheet itself (a
#: reproduced copy).
_ERRATA_SEEN = (
    "AASHTO, Errata for the MBE 3rd ed., October 2018: the Service III inventory cell of "
    "Table 6A.4.2.2-1 replaced by new Table 6A.4.2.2-2 (1.0 refined losses with elastic gains, "
    "0.8 otherwise)"
)
SERVICE_III_INVENTORY: dict[str, Sourced] = {
    "approximate": Sourced(
        what="Service III live-load factor, design-load inventory, prestressed members other "
        "than those with refined losses and elastic gains",
        value=(0.8,),
        source=f"{MBE}, Table 6A.4.2.2-2 (3rd ed. errata)",
        status="verified",
        seen=_ERRATA_SEEN,
    ),
    "refined with elastic gains": Sourced(
        what="Service III live-load factor, design-load inventory, prestressed members with "
        "refined time-dependent losses and elastic gains",
        value=(1.0,),
        source=f"{MBE}, Table 6A.4.2.2-2 (3rd ed. errata)",
        status="verified",
        seen=_ERRATA_SEEN,
    ),
}

#: The service check of each material (MBE Table 6A.4.2.2-1, from memory but for the Service
#: III inventory factor, :data:`SERVICE_III_INVENTORY`): steel at Service II (flange stress;
#: LRFD 6.10.4.2.2 through MBE 6A.6.4.2.1), prestressed concrete at Service III (tension at the
#: precompressed fibre against the LRFD allowable, MBE 6A.5.4.1), reinforced concrete at
#: Service I under permits only (reinforcement stress, MBE 6A.5.4.2.2). The prestressed
#: inventory entry here is the "approximate" one; a member's Prestress losses picks its own.
SERVICE_CHECKS: dict[Material, ServiceCheck] = {
    "steel": ServiceCheck(
        limit_state="Service II",
        stress="flange stress",
        factors={
            "inventory": _service_factor("Service II live-load factor, inventory", 1.30),
            "operating": _service_factor("Service II live-load factor, operating", 1.00),
            "legal": _service_factor("Service II live-load factor, legal loads", 1.30),
            "permit": _service_factor("Service II live-load factor, permits", 1.00),
        },
        limit=Sourced(
            what="Service II flange stress limit: 0.95 Rh Fyf (composite section), 0.80 Rh "
            "Fyf (non-composite section); flange lateral bending not included",
            value=(0.95, 0.80),
            source=f"{_LRFD}, Art. 6.10.4.2.2; {MBE}, 6A.6.4.2.1",
            status="from memory",
        ),
    ),
    "prestressed concrete": ServiceCheck(
        limit_state="Service III",
        stress="tension at the precompressed fibre",
        factors={
            "inventory": SERVICE_III_INVENTORY["approximate"],
            "legal": _service_factor("Service III live-load factor, legal loads", 1.00),
        },
        limit=Sourced(
            what="Service III allowable tension: the LRFD limit for the exposure (e.g. 0.19 "
            "sqrt(f'c) ksi), given by the engineer, plus the effective prestress compression",
            source=f"{_LRFD}, Table 5.9.2.3.2b-1; {MBE}, 6A.5.4.1",
            status="from memory",
        ),
    ),
    "reinforced concrete": ServiceCheck(
        limit_state="Service I",
        stress="reinforcement stress",
        factors={"permit": _service_factor("Service I live-load factor, permits", 1.00)},
        limit=Sourced(
            what="Service I reinforcement stress limit under permits: 0.9 fy",
            value=(0.9,),
            source=f"{MBE}, 6A.5.4.2.2",
            status="from memory",
        ),
    ),
}

#: The dead-load factors (DC and DW) of the service limit states.
SERVICE_DEAD_LOAD = _service_factor("dead-load factor of the service limit states", 1.0)

#: Posting on a service rating: a legal load's governing RF is the lowest over the strength
#: check and the service check of the member's material where the engineer gave its section
#: (MBE 6A.8.1 and Table 6A.4.2.2-1; the commentary calls the legal-load service checks
#: optional, so giving S nc is the engineer's choice to apply them). From memory.
SERVICE_POSTING = Sourced(
    what="legal loads: posted on the lowest RF over the strength and the given service checks",
    source=f"{MBE}, 6A.8.1 and Table 6A.4.2.2-1",
    status="from memory",
)

# ---------------------------------------------------------------- posting exemptions

#: FHWA memorandum "Load Rating of Specialized Hauling Vehicles" (15 Nov 2013) and its
#: Questions and Answers (March 2014, Q13): where the notional rating load (NRL) rates at 1 or
#: more, the single-unit SHVs SU4 to SU7 need not be rated or posted for. The memo is
#: verified (fhwa.dot.gov/bridge/loadrating/131115.cfm); the answer to Q13 is from memory.
SHV_SCREEN = Sourced(
    what="NRL rating factor above which SU4 to SU7 need not be rated or posted",
    value=(1.0,),
    source="FHWA memorandum, Load Rating of Specialized Hauling Vehicles, 15 Nov 2013; "
    "FHWA Questions and Answers, March 2014, Q13",
    status="from memory",
)

#: FHWA memorandum on the FAST Act's emergency vehicles (3 Nov 2016): a bridge whose HL-93
#: inventory rating factor (LRFR) is 0.9 or more needs no immediate rating for EV2 and EV3
#: (HS20 inventory 1.0 or more by LFR or ASR). Verified as quoted in the TxDOT guide.
EV_SCREEN = Sourced(
    what="HL-93 inventory rating factor above which EV2 and EV3 need no immediate rating",
    value=(0.9,),
    source="FHWA memorandum, Load Rating for the FAST Act's Emergency Vehicles, 3 Nov 2016",
    status="secondary",
    seen="TxDOT FAST Act's Emergency Vehicles Load Rating Guide, rev. 1.0, April 2020",
)

# ---------------------------------------------------------------- LFR and ASR (MBE Section 6B)

#: Load factor rating, RF = (C - A1 D) / (A2 L (1 + I)): A2 = 2.17 at the inventory level and
#: 1.3 at the operating level (secondary: NCHRP Synthesis 359, Bridge Rating Practices and
#: Policies for Overweight Vehicles, 2006, p. 7, quoting the 2000 Manual for Condition
#: Evaluation); A1 = 1.3 (from memory; the Standard Specifications' load factor design group
#: 1.3 D + 2.17 (L + I) is its design analogue, secondary in Nowak and Iatsko, PCI Journal,
#: May-June 2017).
LFR_A1 = Sourced(
    what="LFR dead-load factor A1",
    value=(1.3,),
    source=f"{MBE}, 6B.4.3",
    status="from memory",
)
LFR_A2_INVENTORY = Sourced(
    what="LFR live-load factor A2, inventory level",
    value=(2.17,),
    source=f"{MBE}, 6B.4.3",
    status="secondary",
    seen="NCHRP Synthesis 359 (2006), p. 7, quoting the Manual for Condition Evaluation (2000)",
)
LFR_A2_OPERATING = Sourced(
    what="LFR live-load factor A2, operating level",
    value=(1.3,),
    source=f"{MBE}, 6B.4.3",
    status="secondary",
    seen="NCHRP Synthesis 359 (2006), p. 7, quoting the Manual for Condition Evaluation (2000)",
)
#: Allowable stress rating: A1 = A2 = 1, the capacities being allowable (inventory and
#: operating) values; from memory.
ASR_FACTOR = Sourced(
    what="ASR dead-load and live-load factors A1 = A2",
    value=(1.0,),
    source=f"{MBE}, 6B.4.2",
    status="from memory",
)
#: LFR and ASR: legal loads are rated, and posted, at the operating level; a bridge is posted
#: at RF x W, the operating rating in tons, where that is below the legal load (MBE 6B.7; from
#: memory).
LFR_POSTING = Sourced(
    what="LFR and ASR posting: the operating rating RF x W of a legal load rating below 1",
    source=f"{MBE}, 6B.7",
    status="from memory",
)

#: Every table value a run may use, for the Run Log: (what, value and source).
PUBLISHED_TABLES: tuple[tuple[str, str], ...] = (
    (
        "Legal loads, LL factor by ADTT",
        ", ".join(f"ADTT {a:g}: {f:.2f}" for a, f in LEGAL_LIVE_LOAD.points)
        + f", linear between; unknown ADTT {LEGAL_LIVE_LOAD.unknown:.2f} "
        f"({LEGAL_LIVE_LOAD.source}; {LEGAL_LIVE_LOAD.status})",
    ),
    *(
        (
            f"Permits, {kind}, LL factor by ADTT",
            ", ".join(f"ADTT {a:g}: {f:.2f}" for a, f in row.factors.points)
            + f"; {'one lane, 1.2 divided out' if row.one_lane else 'two or more lanes'} "
            f"({row.factors.source}; {row.factors.status})",
        )
        for kind, row in PERMIT_LIVE_LOAD.items()
    ),
    *(
        (f"Legal loads, dynamic allowance, {surface}", cited(value))
        for surface, value in LEGAL_IMPACT.items()
    ),
    ("Permits escorted at crawl speed, dynamic allowance", cited(CRAWL_IMPACT)),
    ("One-lane multiple presence factor divided out", cited(SINGLE_LANE_PRESENCE)),
    (
        "LFR: A1; A2 inventory; A2 operating",
        "; ".join(cited(x) for x in (LFR_A1, LFR_A2_INVENTORY, LFR_A2_OPERATING)),
    ),
    ("ASR: A1 = A2", cited(ASR_FACTOR)),
    ("LFR and ASR posting", f"{LFR_POSTING.what} ({LFR_POSTING.source}; {LFR_POSTING.status})"),
    ("Standard Specifications impact (LFR and ASR)", cited(STANDARD_IMPACT)),
    *(
        (
            f"{check.limit_state} ({material}), LL factor {level}",
            cited(factor),
        )
        for material, check in SERVICE_CHECKS.items()
        for level, factor in check.factors.items()
    ),
    (
        "Service III (prestressed concrete), LL factor inventory, refined losses",
        cited(SERVICE_III_INVENTORY["refined with elastic gains"]),
    ),
    *(
        (f"{check.limit_state} ({material}), stress limit", cited(check.limit))
        for material, check in SERVICE_CHECKS.items()
    ),
    ("Service limit states, dead-load factors", cited(SERVICE_DEAD_LOAD)),
    (
        "Posting on a service rating",
        f"{SERVICE_POSTING.what} ({SERVICE_POSTING.source}; {SERVICE_POSTING.status})",
    ),
    ("SHV exemption: NRL rating factor at least", cited(SHV_SCREEN)),
    ("EV exemption: HL-93 inventory rating factor at least", cited(EV_SCREEN)),
    (
        "Capacity factor floor phi_c phi_s",
        f"{MIN_CAPACITY_FACTOR:g} (MBE Eq. 6A.4.2.1-3; secondary: M. A. Khan 2010, p. 187)",
    ),
    (
        "Posting load",
        f"(W/{POSTING_DIVISOR:g})(RF - {POSTING_FLOOR:g}) for {POSTING_FLOOR:g} <= RF < 1 "
        "(MBE 6A.8.3; secondary: M. A. Khan 2010, p. 187)",
    ),
)
