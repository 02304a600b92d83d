"""Published factors of the rating codes, as data, in one place.

The rating stage (:mod:`batch.rating.lrfr`) computes with these values and validation
(:mod:`batch.validating`) words its messages and warnings with them, so each
value is written once, beside its source.
"""

from __future__ import annotations

from batch.loads.cases import ImpactFormula

__all__ = [
    "KIP_PER_TON",
    "KN_PER_TONNE",
    "MIN_CAPACITY_FACTOR",
    "POSTING_DIVISOR",
    "POSTING_FLOOR",
    "PUBLISHED_FACTORS",
    "STANDARD_SPECIFICATIONS_IMPACT",
]

#: MBE Eq. 6A.4.2.1-3 (from memory): phi_c * phi_s is not taken below 0.85.
MIN_CAPACITY_FACTOR = 0.85

#: MBE 6A.8.3 (from memory): posting load (W/0.7)(RF - 0.3); below RF 0.3 consider closing.
POSTING_DIVISOR = 0.7
POSTING_FLOOR = 0.3

#: AASHTO Standard Specifications for Highway Bridges, 17th ed. (2002), Art. 3.8.2: impact
#: I = 50 / (L + 125) <= 0.30, L the loaded length in ft (formula and 30 % cap seen in a
#: published secondary source: the documentation of civilpy, an open-source structural
#: library, HS20Load.impact_factor; the article's wording from memory). Lengths in ft:
#: ImpactFormula.scaled converts them exactly (0.3048 m per ft).
STANDARD_SPECIFICATIONS_IMPACT = ImpactFormula(numerator=50.0, added=125.0, cap=0.30)

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
