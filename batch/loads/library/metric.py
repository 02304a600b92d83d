"""The CSA S6 and EN 1991-2 load models, defined in kN, m and kN/m.

Where a value was seen in a published source it says so; where it could not
be checked against the standard's text it is marked "from memory", here and in
the model's ``source`` text.
"""

from __future__ import annotations

from batch.loads.library.models import LoadModel, part

__all__ = ["SI_MODELS"]

# CL-W truck with W = 625 kN: axles 0.08W, 0.2W, 0.2W, 0.28W, 0.24W at 3.6, 1.2,
# 6.6, 6.6 m (from memory; the 0.2W and 0.28W axles agree with the 160 and 224 kN
# axles published for the CL-800 variant, seen in a precast-pipe publication by
# Lafarge that quotes the Canadian Highway Bridge Design Code).
_CL = (50.0, 125.0, 125.0, 175.0, 150.0)  # 0.08W, 0.2W, 0.2W, 0.28W, 0.24W kN
_CL_SPACINGS = (3.6, 1.2, 6.6, 6.6)
# Dynamic load allowance by the number of axles used (from memory): one axle 0.50;
# any two axles, or axles 1 to 3, 0.40; more than three axles 0.25.
_DLA_ONE, _DLA_TWO, _DLA_MANY = 0.50, 0.40, 0.25
_HEAVIEST = max(_CL)


def _axles(first: int, last: int) -> tuple[tuple[float, ...], tuple[float, ...]]:
    """Loads and spacings of truck axles ``first`` to ``last`` (numbered from 1)."""
    return _CL[first - 1 : last], _CL_SPACINGS[first - 1 : last - 1]


CL625 = LoadModel(
    name="CL-625",
    units="SI",
    category="design",
    source="CSA S6 Canadian Highway Bridge Design Code, Cl. 3.8.3.2 (CL-W truck),"
    " 3.8.3.3 (CL-W lane load) and 3.8.4.5.3 (dynamic load allowance); axle fractions,"
    " spacings, lane load and DLA from memory",
    description="CL-W truck with W = 625 kN: 50, 125, 125, 175, 150 kN at 3.6, 1.2, 6.6,"
    " 6.6 m; and the CL-W lane load: 80 % of each truck axle with 9 kN/m, no dynamic load"
    " allowance. CSA S6 sets the truck's DLA by how many axles produce the effect, which differs"
    " from effect to effect; spanfleet envelopes the whole truck (DLA 0.25) with its"
    " subsets: axles 1 to 3 and each pair of neighbouring axles (0.40) and the heaviest"
    " axle alone (0.50), each subset with the other axles left off the member. Pairs of"
    " axles that are not neighbours are not tried. The run's dynamic load allowance is not"
    " used.",
    parts=(
        part("truck", _CL, _CL_SPACINGS, impact=_DLA_MANY),
        part("axles 1-3", *_axles(1, 3), impact=_DLA_TWO),
        part("axles 1-2", *_axles(1, 2), impact=_DLA_TWO),
        part("axles 2-3", *_axles(2, 3), impact=_DLA_TWO),
        part("axles 3-4", *_axles(3, 4), impact=_DLA_TWO),
        part("axles 4-5", *_axles(4, 5), impact=_DLA_TWO),
        part("axle 4", (_HEAVIEST,), impact=_DLA_ONE),
        # 80 % of each truck axle: 40, 100, 100, 140, 120 kN.
        part("lane", (40.0, 100.0, 100.0, 140.0, 120.0), _CL_SPACINGS, lane_load=9.0, impact=0.0),
    ),
)

# Load Model 1, notional lane 1: tandem of two 300 kN axles (alpha_Q1 = 1) and
# 9 kN/m2 (alpha_q1 = 1) over the 3 m lane = 27 kN/m; dynamic amplification is
# included. The 300 kN axles, 9 kN/m2 and 3 m lanes were seen in published
# summaries (a summary of EN 1991-2 at eurocode.us gives the 600 alpha_Q1 kN
# single-axle simplification); the 1.2 m axle spacing is from memory.
LM1 = LoadModel(
    name="LM1",
    aliases=("EN LM1", "EN 1991-2 LM1", "Eurocode LM1", "Load Model 1"),
    units="SI",
    category="design",
    source="EN 1991-2:2003, 4.3.2 and Table 4.2 (Load Model 1, notional lane 1, adjustment"
    " factors 1.0); axle loads and UDL seen in published summaries, axle spacing from memory",
    description="Load Model 1 for one 3 m notional lane: tandem of two 300 kN axles 1.2 m"
    " apart with 9 kN/m2 x 3 m = 27 kN/m on the adverse parts. Dynamic amplification is"
    " included, so no dynamic load allowance is added. National Annex adjustment factors are"
    " taken as 1.0: put others in the row's Factor only if alpha_Q1 = alpha_q1.",
    parts=(part("", (300.0, 300.0), (1.2,), lane_load=27.0, impact=0.0),),
)

SI_MODELS: tuple[LoadModel, ...] = (CL625, LM1)
