"""The built-in load models: definitions, name lookup, listing and unit conversion.

Every definition below is checked against its published description; the note
beside each says where the value comes from: "seen in" a named published text
(docs/validation.md lists them with their addresses), or "from memory", not
checked against the standard's text. Tolerances are named.
"""

from __future__ import annotations

import itertools
import math
from fractions import Fraction

import pytest
from tolerances import REL_TOL_EXACT, REL_TOL_FLOAT

from batch.engine.envelope import member_envelope
from batch.loads import library
from batch.loads.fleet import fleet_cases
from batch.loads.library.models import part
from batch.model import Member, Settings, Vehicle
from batch.model.units import KN_PER_KIP, M_PER_FT, conversion

# name: (axle loads front first, spacings as (low, high), total weight, where from)
US_DEFINITIONS = {
    # AASHTO Standard Specifications 17th ed., Art. 3.7; seen in a structural engineers'
    # mailing-list post (SEAINT archive, 2000) and an HS20-44 explainer (knowledgewow.com).
    "HS20": ((8, 32, 32), ((14, 14), (14, 30)), 72.0),
    "H20": ((8, 32), ((14, 14),), 40.0),  # seen: SEAINT post; AASHO 1941 loadings
    "HS15": ((6, 24, 24), ((14, 14), (14, 30)), 54.0),  # 75 % of HS20, seen: AASHO 1941 loadings
    "H15": ((6, 24), ((14, 14),), 30.0),  # 75 % of H20, seen: AASHO 1941 loadings
    "Alternate military": ((24, 24), ((4, 4),), 48.0),  # seen: SEAINT post (2000)
    # AASHTO LRFD 3.6.1.4.1: design truck, fixed 30 ft rear spacing (seen in an excerpt
    # of LRFD 2014 Art. 3.6.1.4.1).
    "Fatigue truck": ((8, 32, 32), ((14, 14), (30, 30)), 72.0),
    # MBE 6A.4.4.2.1, Appendix D6A, AASHTO legal loads: 25 t, 36 t, 40 t (from memory).
    "Type 3": ((16, 17, 17), ((15, 15), (4, 4)), 50.0),
    "Type 3S2": ((10, 15.5, 15.5, 15.5, 15.5), ((11, 11), (4, 4), (22, 22), (4, 4)), 72.0),
    "Type 3-3": ((12, 12, 12, 16, 14, 14), ((15, 15), (4, 4), (15, 15), (16, 16), (4, 4)), 80.0),
    # Specialized hauling vehicles, NCHRP Report 575 (names seen in the FHWA memorandum on
    # specialized hauling vehicles); loads and spacings from memory (MBE Appendix D6A).
    "SU4": ((12, 8, 17, 17), ((10, 10), (4, 4), (4, 4)), 54.0),
    "SU5": ((12, 8, 8, 17, 17), ((10, 10), (4, 4), (4, 4), (4, 4)), 62.0),
    "SU6": ((11.5, 8, 8, 17, 17, 8), ((10, 10), *[(4, 4)] * 4), 69.5),
    "SU7": ((11.5, 8, 8, 17, 17, 8, 8), ((10, 10), *[(4, 4)] * 5), 77.5),
    # Notional rating load, 80 kip; first spacing taken as a fixed 6 ft (from memory,
    # MBE Appendix D6A).
    "NRL": ((6, 8, 8, 17, 17, 8, 8, 8), ((6, 6), *[(4, 4)] * 6), 80.0),
    # FAST Act emergency vehicles: 24 kip steer, 33.5 kip single drive axle, 62 kip
    # tandem, 86 kip gross (seen in FHWA's FAST Act emergency-vehicle Q&A and its truck
    # size and weight fact sheet); spacings from memory (MBE 6A.4.4.2.1, 2019 interim).
    "EV2": ((24, 33.5), ((15, 15),), 57.5),
    "EV3": ((24, 31, 31), ((15, 15), (4, 4)), 86.0),
}

SI_DEFINITIONS = {
    # CSA S6 CL-W truck, W = 625 kN: 0.08W, 0.2W, 0.2W, 0.28W, 0.24W at 3.6, 1.2, 6.6,
    # 6.6 m (from memory, CSA S6 Cl. 3.8.3.2); the 0.2W and 0.28W axles match the CL-800
    # axles of 160 and 224 kN (seen in a Lafarge precast-pipe publication quoting the code).
    "CL-625": ((50, 125, 125, 175, 150), ((3.6, 3.6), (1.2, 1.2), (6.6, 6.6), (6.6, 6.6)), 625.0),
    # EN 1991-2 LM1, lane 1: tandem 2 x 300 kN (seen in a summary of EN 1991-2 at
    # eurocode.us) at 1.2 m (from memory, EN 1991-2 Table 4.2).
    "LM1": ((300, 300), ((1.2, 1.2),), 600.0),
}


def _principal(name: str):
    return library.model(name).parts[0]


@pytest.mark.parametrize("name", sorted(US_DEFINITIONS))
def test_us_model_axles_spacings_and_weight(name):
    loads, spacings, weight = US_DEFINITIONS[name]
    part = _principal(name)
    assert part.train.loads == tuple(float(p) for p in loads)
    assert tuple(zip(part.train.low, part.train.high, strict=True)) == spacings
    assert math.isclose(part.weight, weight, rel_tol=REL_TOL_FLOAT)
    assert library.model(name).units == "US"


@pytest.mark.parametrize("name", sorted(SI_DEFINITIONS))
def test_si_model_axles_spacings_and_weight(name):
    loads, spacings, weight = SI_DEFINITIONS[name]
    part = _principal(name)
    assert part.train.loads == tuple(float(p) for p in loads)
    assert tuple(zip(part.train.low, part.train.high, strict=True)) == spacings
    assert math.isclose(part.weight, weight, rel_tol=REL_TOL_FLOAT)
    assert library.model(name).units == "SI"


def test_cl625_axles_are_the_published_fractions_of_w():
    # CSA S6 CL-W truck: axle loads 0.08W, 0.2W, 0.2W, 0.28W, 0.24W (from memory,
    # Cl. 3.8.3.2).
    fractions = (0.08, 0.20, 0.20, 0.28, 0.24)
    for load, f in zip(_principal("CL-625").train.loads, fractions, strict=True):
        assert math.isclose(load, f * 625.0, rel_tol=REL_TOL_FLOAT)


def test_hl93_parts_follow_lrfd_3_6_1():
    # AASHTO LRFD 3.6.1.2.2-3.6.1.2.4 and 3.6.1.3.1 (seen in an HL-93 article from
    # engineeringcivil.org, an HL-93 page at aboutcivil.org and an engineers' forum thread
    # at engineerboards.com; the 90 % two-truck rule from memory): truck 8, 32, 32 kip at
    # 14 ft and 14-30 ft; tandem 2 x 25 kip at 4 ft; lane 0.64 klf with no IM; 90 % of two
    # trucks with 14 ft rear spacings and >= 50 ft lead-to-rear axle, with 90 % of the lane,
    # for hogging between points of contraflexure and interior reactions only.
    truck, tandem, two = library.model("HL-93").parts
    assert (truck.train.loads, truck.train.low, truck.train.high) == (
        (8.0, 32.0, 32.0),
        (14.0, 14.0),
        (14.0, 30.0),
    )
    assert (tandem.train.loads, tandem.train.low) == ((25.0, 25.0), (4.0,))
    assert two.train.loads == (8.0, 32.0, 32.0, 8.0, 32.0, 32.0)
    assert two.train.low == (14.0, 14.0, 50.0, 14.0, 14.0)
    assert two.train.high[:2] == two.train.high[3:] == (14.0, 14.0)
    assert two.train.high[2] >= 1000.0  # open-ended: no published maximum headway
    assert (two.factor, two.scope) == (0.90, "interior-hogging")
    for p in (truck, tandem, two):
        assert p.lane_load == 0.64
        assert p.impact is None  # the run's IM, on the axles only (engine)
        assert p.drop_adverse_axles  # LRFD 3.6.1.3.1 (from memory)
    assert (truck.scope, tandem.scope) == ("all", "all")


def test_legal_lane_model_is_75_percent_type_3_3_with_0_2_klf():
    # MBE 6A.4.4.2.1 lane-type legal load (from memory): 0.75 x Type 3-3 + 0.2 klf; two of them,
    # 30 ft clear, for negative moment and interior reactions.
    single, double = library.model("Legal lane").parts
    type_33 = _principal("Type 3-3")
    assert single.train.loads == tuple(0.75 * p for p in type_33.train.loads)
    assert single.train.low == type_33.train.low
    assert (single.lane_load, single.factor, single.scope) == (0.2, 1.0, "all")
    assert double.train.loads == single.train.loads * 2
    assert double.train.low == (*type_33.train.low, 30.0, *type_33.train.low)
    assert double.train.high == double.train.low
    assert (double.lane_load, double.scope) == (0.2, "interior-hogging")


def test_cl625_parts_and_dynamic_load_allowance():
    # CSA S6 DLA (from memory, Cl. 3.8.4.5.3): one axle 0.50; two axles or axles 1-3 0.40;
    # more than three 0.25. Lane load: 80 % of each axle with 9 kN/m, no DLA (from memory,
    # Cl. 3.8.3.3).
    parts = {p.label: p for p in library.model("CL-625").parts}
    truck = parts["truck"]
    assert truck.impact == 0.25
    assert parts["axles 1-3"].train.loads == truck.train.loads[:3]
    assert parts["axles 1-3"].impact == 0.40
    for i in range(1, 5):
        pair = parts[f"axles {i}-{i + 1}"]
        assert pair.train.loads == truck.train.loads[i - 1 : i + 1]
        assert pair.train.low == truck.train.low[i - 1 : i]
        assert pair.impact == 0.40
    assert (parts["axle 4"].train.loads, parts["axle 4"].impact) == ((175.0,), 0.50)
    lane = parts["lane"]
    for a, b in zip(lane.train.loads, truck.train.loads, strict=True):
        assert math.isclose(a, 0.8 * b, rel_tol=REL_TOL_FLOAT)
    assert (lane.lane_load, lane.impact) == (9.0, 0.0)


def test_lm1_lane_load_is_9_kn_per_m2_over_a_3_m_lane_with_no_added_dynamic_allowance():
    # EN 1991-2 Table 4.2: q1k = 9 kN/m2, notional lane 3 m; dynamic amplification
    # included in the characteristic values (LM1/LM2 wording and 9 kN/m2 seen in a summary
    # of EN 1991-2 at eurocode.us).
    lm1 = _principal("LM1")
    assert math.isclose(lm1.lane_load, 9.0 * 3.0, rel_tol=REL_TOL_FLOAT)
    assert lm1.impact == 0.0


def test_fixed_and_run_dynamic_load_allowance():
    # LRFD Table 3.6.2.1-1: fatigue IM 15 % (seen quoted in an engineers' forum thread at
    # engineerboards.com); other US models take the run's value.
    assert {c.impact for c in library.model_cases("Fatigue truck", "US", 0.33)} == {0.15}
    assert {c.impact for c in library.model_cases("HL-93", "US", 0.2)} == {0.2}
    assert {c.impact for c in library.model_cases("Type 3S2", "US", 0.1)} == {0.1}
    assert {c.impact for c in library.model_cases("LM1", "SI", 0.33)} == {0.0}


@pytest.mark.parametrize(
    ("typed", "name"),
    [
        ("hl-93", "HL-93"),
        ("HL93", "HL-93"),
        (" hl 93 ", "HL-93"),
        ("hs20-44", "HS20"),
        ("type 3s2", "Type 3S2"),
        ("TYPE 3-3", "Type 3-3"),
        ("type 3", "Type 3"),
        ("cl625", "CL-625"),
        ("Eurocode LM1", "LM1"),
        ("su 7", "SU7"),
        ("ev3", "EV3"),
    ],
)
def test_lookup_forgives_case_spaces_and_punctuation(typed, name):
    assert library.model(typed).name == name
    assert library.model_cases(typed, "US", 0.33)[0].label.startswith(name)


def test_unknown_name_is_a_key_error_listing_the_known_names():
    with pytest.raises(KeyError, match="HL-93"):
        library.model_cases("HL-94", "US", 0.33)


def test_names_are_unique_and_every_name_and_alias_finds_its_model():
    names = library.names()
    assert len(set(names)) == len(names)
    for name in names:
        m = library.model(name)
        assert m.name == name
        assert all(library.model(alias) is m for alias in m.aliases)


def test_labels_name_the_governing_part():
    labels = [c.label for c in library.model_cases("HL-93", "US", 0.33)]
    assert labels == [
        "HL-93 (truck + lane)",
        "HL-93 (tandem + lane)",
        "HL-93 (two trucks + lane, 90 %)",
    ]
    assert [c.label for c in library.model_cases("Type 3", "US", 0.33)] == ["Type 3"]


def test_fleet_cases_prefix_the_vehicle_id():
    vehicle = Vehicle(id="KV-DESIGN", library="hl93", factor=1.1)
    cases = fleet_cases((vehicle,), Settings())
    assert cases[1].label == "KV-DESIGN: HL-93 (tandem + lane)"
    assert math.isclose(cases[2].factor, 0.9 * 1.1, rel_tol=REL_TOL_FLOAT)


def test_fleet_cases_keep_the_drop_adverse_axles_rule():
    vehicle = Vehicle(id="KV-DESIGN", library="HL-93")
    assert all(c.drop_adverse_axles for c in fleet_cases((vehicle,), Settings()))


def test_describe_lists_every_model_with_weight_in_the_asked_units():
    rows = library.describe()
    assert [r.name for r in rows] == list(library.names())
    by_name = {r.name: r for r in rows}
    assert (by_name["HL-93"].axles, by_name["HL-93"].weight) == (3, 72.0)
    assert (by_name["LM1"].axles, by_name["LM1"].weight) == (2, 600.0 / KN_PER_KIP)
    si = {r.name: r for r in library.describe("SI")}
    assert math.isclose(si["HS20"].weight, 72.0 * KN_PER_KIP, rel_tol=REL_TOL_FLOAT)
    assert all(r.source for r in rows)


def test_conversion_factors_are_the_exact_definitions():
    # 1 ft = 0.3048 m and 1 lbf = 4.4482216152605 N exactly (NIST SP 811, App. B; from
    # memory).
    assert (KN_PER_KIP, M_PER_FT) == (4.4482216152605, 0.3048)
    there = conversion("US", "SI")
    back = conversion("SI", "US")
    assert math.isclose(there.line_load, 4.4482216152605 / 0.3048, rel_tol=REL_TOL_FLOAT)
    assert math.isclose(there.force * back.force, 1.0, rel_tol=REL_TOL_FLOAT)
    assert math.isclose(there.length * back.length, 1.0, rel_tol=REL_TOL_FLOAT)


def test_hl93_converted_to_si_is_exact():
    (truck, *_) = library.model_cases("HL-93", "SI", 0.33)
    assert math.isclose(truck.train.loads[1], 32 * 4.4482216152605, rel_tol=REL_TOL_FLOAT)
    assert math.isclose(truck.train.high[1], 30 * 0.3048, rel_tol=REL_TOL_FLOAT)
    assert math.isclose(truck.lane_load, 0.64 * 4.4482216152605 / 0.3048, rel_tol=REL_TOL_FLOAT)


@pytest.mark.parametrize("name", ["HL-93", "Legal lane", "CL-625", "LM1"])
def test_si_and_us_runs_give_the_same_effects(name):
    """The same member and model, run in US and in SI units, agree after conversion."""
    spans_ft = (52.0, 70.0, 52.0)
    us = member_envelope(
        Member(id="KV-7 G2", spans=spans_ft), library.model_cases(name, "US", 0.33), 4
    )
    si = member_envelope(
        Member(id="KV-7 G2", spans=tuple(s * M_PER_FT for s in spans_ft)),
        library.model_cases(name, "SI", 0.33),
        4,
    )
    c = conversion("US", "SI")
    for family, factor in (
        ("m_max", c.moment),
        ("m_min", c.moment),
        ("v_max", c.force),
        ("v_min", c.force),
        ("r_max", c.force),
        ("r_min", c.force),
    ):
        a, b = getattr(us, family), getattr(si, family)
        scale = max(abs(a.value).max(), 1.0)
        # Values only: where two parts tie (e.g. CL-625 axles 1-2 and 1-3 with axle 3
        # off the member) round-off may name either.
        assert abs(a.value * factor - b.value).max() <= REL_TOL_EXACT * scale * factor


@pytest.mark.parametrize("name", library.names())
def test_every_part_gives_the_statics_end_shear_on_a_long_simple_span(name):
    """End shear of each part by statics, through the engine in the model's own units.

    With the whole train on a span L and one end axle at the support, the end shear
    is sum P (1 - d / L) (d = distance from that axle), the larger of the two ends,
    plus w L / 2 for the lane load; then (1 + IM) on axles and the part's factor
    (common practice). Closest spacings pack the train tightest.
    """
    m = library.model(name)
    span = 200.0 if m.units == "US" else 60.0
    for item, case in zip(m.parts, m.cases(m.units, 0.33), strict=True):
        if item.scope != "all":
            continue
        offsets = [0.0, *itertools.accumulate(item.train.low)]
        axles = max(
            sum(p * (1 - d / span) for p, d in zip(item.train.loads, offsets, strict=True)),
            sum(
                p * (1 - (offsets[-1] - d) / span)
                for p, d in zip(item.train.loads, offsets, strict=True)
            ),
        )
        expected = case.factor * ((1 + case.impact) * axles + case.lane_load * span / 2)
        env = member_envelope(Member(id="KV-S9", spans=(span,)), [case], 1)
        assert math.isclose(env.v_max.value[0], expected, rel_tol=REL_TOL_FLOAT)


@pytest.fixture(scope="module")
def nrl_and_shvs_on_simple_spans():
    out = {}
    for span in (10.0, 20.0, 30.0, 40.0, 60.0, 100.0):
        member = Member(id="KV-NRL", spans=(span,))
        out[span] = {
            name: member_envelope(member, library.model_cases(name, "US", 0.0), 20)
            for name in ("NRL", "SU4", "SU5", "SU6", "SU7")
        }
    return out


def test_nrl_envelopes_su4_to_su7_on_simple_spans(nrl_and_shvs_on_simple_spans):
    # MBE / FHWA (seen in the FHWA memorandum on specialized hauling vehicles,
    # fhwa.dot.gov/bridge/loadrating/131115.cfm): RF >= 1 for the NRL means SU4-SU7 need
    # not be rated, so on a simple span the NRL (axles that lessen an effect left out) is
    # never below them.
    # (On some short continuous spans the SU7 exceeds it slightly in hogging.)
    for envs in nrl_and_shvs_on_simple_spans.values():
        nrl = envs["NRL"]
        for su in ("SU4", "SU5", "SU6", "SU7"):
            for family in ("m_max", "v_max", "r_max"):
                scale = getattr(nrl, family).value.max()
                gap = getattr(envs[su], family).value - getattr(nrl, family).value
                assert gap.max() <= REL_TOL_EXACT * scale


@pytest.mark.parametrize(
    ("name", "x", "moment"),
    [
        # Resultant 1296/80 = 16.2 ft behind the front axle; the 17 kip axle at 18 ft and
        # the resultant straddle midspan (absolute-maximum rule: Hicks, Civil Engineering
        # Formulas, moving loads; the worked note "Max M in simple span due to moving
        # loads" on Scribd): x = 20 - (18 - 16.2) / 2.
        ("NRL", Fraction(20) - (18 - Fraction(1296, 80)) / 2, 537.6),
        # Resultant 1320/77.5 = 528/31 ft behind the front axle; same rule at the 17 kip
        # axle 18 ft back.
        ("SU7", Fraction(20) - (18 - Fraction(528, 31)) / 2, 510.0),
    ],
)
def test_nrl_and_su7_absolute_maximum_moment_at_40_ft(name, x, moment):
    # Computed by hand (statics, the rule above): on a 40 ft span the NRL (6 ft first
    # spacing) gives 537.6 kip-ft against 510.0 for the SU7 (absolute maxima, no impact).
    where = x / 40
    env = member_envelope(
        Member(id="KV-NRL", spans=(40.0,)), library.model_cases(name, "US", 0.0), where.denominator
    )
    assert abs(env.m_max.value[where.numerator] - moment) <= 0.05  # printed to one decimal
    assert env.m_max.value.max() <= env.m_max.value[where.numerator] * (1 + REL_TOL_EXACT)


@pytest.mark.parametrize(
    ("loads", "spacings", "scope"),
    [
        ((), (), "all"),  # no axles
        ((8, 32), (), "all"),  # a gap without a spacing
        ((8, 32), ((30, 14),), "all"),  # range upside down
        ((8, 32), (14,), "sagging"),  # a scope the engine does not know
    ],
)
def test_malformed_parts_are_refused_when_the_library_is_built(loads, spacings, scope):
    with pytest.raises(ValueError, match="part 'KV test'"):
        part("KV test", loads, spacings, scope=scope)


def test_unknown_unit_system_is_refused():
    with pytest.raises(ValueError, match="unknown unit system"):
        conversion("US", "CGS")  # type: ignore[arg-type]
