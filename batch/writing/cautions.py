"""What every spanfleet workbook says about the limits of its numbers, written once.

The template's first sheet shows these texts; the Run Log of a run can show the
same ones, so the wording lives in one place.
"""

from __future__ import annotations

__all__ = ["CAUTIONS", "SIGN_CONVENTIONS"]

#: How to read the signs of every effect, one sentence each.
SIGN_CONVENTIONS: tuple[str, ...] = (
    "Loads act downward. Positions x are measured from the member's left end.",
    "Moment: sagging (tension at the bottom) is positive, hogging negative.",
    "Shear V: the sum of the upward forces on the part of the member left of the section "
    "(so V = dM/dx); the section is just right of the station, except at the last station "
    "of a span, where it is just left.",
    "Reactions: upward positive; a negative reaction is uplift.",
)

#: The limits of the method and whose judgement prevails.
CAUTIONS: tuple[str, ...] = (
    "Each member is idealised as one straight line girder on point supports. Sharing of load "
    "between girders, skew, curvature, torsion and deck or cross-frame action enter only "
    "through the distribution factors you give.",
    "The analysis is static and linear elastic with point axle loads. Dynamic effects enter "
    "only through the dynamic load allowance; supports, hinges and relative stiffness are "
    "taken exactly as entered.",
    "Envelopes are exact at the stations only: an effect between two stations can be larger. "
    "Use more stations per span where that matters.",
    "Vehicles, factors and allowances are used as entered. Check them against the governing "
    "code edition and the owner's rules; state legal and permit vehicles differ.",
    "A rating factor is only as good as the resistances, dead loads and condition and system "
    "factors supplied with it.",
    "Check the units and the sign conventions before using any number.",
    "These results support an engineer's judgement; they do not replace it. They must be "
    "reviewed, and the governing code (AASHTO LRFD, the MBE or the local equivalent) and a "
    "licensed professional engineer prevail. Posting, closure and permit decisions belong to "
    "the bridge owner.",
)
