"""Live-load distribution factors by AASHTO LRFD 4.6.2.2 (batch.loads.distribution).

Sources, beside each check:
* [FHWA-PSC] FHWA, "Comprehensive Design Example for Prestressed Concrete (PSC) Girder
  Superstructure Bridge" (US units, AASHTO LRFD 2nd ed. with interims), Design Step 5.1,
  "Live Load Distribution Factors (S4.6.2.2)": cross-section k, S = 9'-8", L = 110 ft,
  ts = 8 in, Kg = 2,984,704 in4, skew 20 degrees. Its text (cross-section "K", the
  multiple presence factors in the formulas, the lever rule beyond the spacing range)
  was seen; its numbers were seen only as reproduced in a public secondary text.
* [TxDOT] TxDOT Bridge Division, "LRFD Live Load Distribution Factors" calculation
  sheets for I-beam superstructures, p. 1 (AASHTO LRFD 8th ed. 2017, rev. 10/18; and 4th
  ed. 2007, rev. 8/08), seen in public copies: inputs and interior factors as printed.
* [Ext-Ex] An anonymous worked example of exterior-beam factors, "Aashto Lrfd Fd Vigas
  Externas" (Scribd document 54749447), Tables S4.6.2.2.2d-1 and S4.6.2.2.3b-1: S =
  9.84 ft, de = 2.95 ft; e = 1.09 (moment) and 0.90 (shear); lever rule 0.79 lanes,
  times 1.2 = 0.950.
* Hand computations: statics of the lever rule (the deck hinged over the first interior
  girder); the formulas with tan 45 degrees = 1.
* From memory: the three-girder rows, the skew tables' 30 and 60 degree rules, L for
  negative moment (C4.6.2.2.1); see docs/distribution.md for every status.
"""

from __future__ import annotations

import dataclasses

import pytest
from tolerances import DF_3DP, DF_3DP_PRODUCT, REL_TOL_EXACT

from batch.loads.distribution import (
    Girder,
    layout_factors,
    lever_rule_exterior,
    lever_rule_interior,
    member_factors,
    multiple_presence,
    skew_moment,
    stiffness_parameter,
)
from batch.model import GirderLayout

PSC = Girder(
    cross_section="k",
    position="interior",
    girders=6,
    spacing=9 + 8 / 12,
    deck=8.0,
    stiffness=2_984_704.0,
    skew=20.0,
)


def _factor(factors, effect, lanes, where="span 1"):
    (found,) = [
        f for f in factors.factors if (f.effect, f.lanes, f.where) == (effect, lanes, where)
    ]
    return found


def test_fhwa_psc_interior_girder() -> None:
    # [FHWA-PSC] Design Step 5.1: 0.796 and 0.542 (moment), 0.973 and 0.782 (shear with the
    # 20-degree correction, the product of factors printed to three decimals).
    got = member_factors(PSC, [110.0, 110.0])
    assert _factor(got, "positive moment", 2).value == pytest.approx(0.796, abs=DF_3DP)
    assert _factor(got, "positive moment", 1).value == pytest.approx(0.542, abs=DF_3DP)
    assert _factor(got, "positive moment", 2).skew == 1.0  # 20 degrees < 30: no reduction
    assert _factor(got, "shear", 2).value == pytest.approx(0.973, abs=DF_3DP_PRODUCT)
    assert _factor(got, "shear", 1).value == pytest.approx(0.782, abs=DF_3DP_PRODUCT)
    assert (got.moment, got.shear) == (
        _factor(got, "positive moment", 2).value,
        _factor(got, "shear", 2).value,
    )
    assert all(not f.notes for f in got.factors)


def test_fhwa_psc_exterior_girder() -> None:
    # [FHWA-PSC]: e = 0.971 for moment; the lever rule gives 0.672 before the factor m = 1.2.
    # de = 1.83 ft is 0.77 + de/9.1 = 0.971 solved for de (3.5 ft overhang less a 1.67 ft
    # barrier base, from memory).
    exterior = dataclasses.replace(PSC, position="exterior", overhang=1.83)
    got = member_factors(exterior, [110.0])
    interior = member_factors(PSC, [110.0])
    e = _factor(got, "positive moment", 2).value / _factor(interior, "positive moment", 2).value
    assert e == pytest.approx(0.971, abs=DF_3DP)
    one_lane = _factor(got, "positive moment", 1)
    assert one_lane.value / multiple_presence(1) == pytest.approx(0.672, abs=DF_3DP)
    assert one_lane.method.startswith("lever rule")


@pytest.mark.parametrize(
    ("girders", "span", "spacing", "skew", "moment", "shear"),
    [
        (5, 65.62, 6.56, 0.0, 0.635, 0.712),  # [TxDOT] 8th ed. sheet, Kg 1,132,028 in4
        (6, 88.58, 7.00, 15.0, 0.614, 0.775),  # [TxDOT] 8th ed. sheet, skew 15 degrees
    ],
)
def test_txdot_interior_factors(girders, span, spacing, skew, moment, shear) -> None:
    g = Girder(
        cross_section="k",
        position="interior",
        girders=girders,
        spacing=spacing,
        deck=8.0,
        stiffness=stiffness_parameter(1.0, 260_403.0, 788.4, 33.25),  # n = 1 as printed
        skew=skew,
    )
    got = member_factors(g, [span])
    assert g.stiffness == pytest.approx(1_132_028, abs=0.5)  # printed Kg, in4
    assert got.moment == pytest.approx(moment, abs=DF_3DP)
    assert got.shear == pytest.approx(shear, abs=DF_3DP)


def test_txdot_4th_edition_shear() -> None:
    # [TxDOT] 4th ed. sheet: Nb 4, L 131.23 ft, S 6.23 ft, Kg 1,261,802 in4: shear 0.687.
    g = Girder(
        cross_section="k",
        position="interior",
        girders=4,
        spacing=6.23,
        deck=8.0,
        stiffness=1_261_802.0,
    )
    assert member_factors(g, [131.23]).shear == pytest.approx(0.687, abs=DF_3DP)


def test_exterior_example_e_and_lever_rule() -> None:
    # [Ext-Ex]: S = 9.84 ft, de = 2.95 ft: e = 1.09 (moment), 0.90 (shear), printed to two
    # decimals; lever rule 0.79 lanes, x 1.2 = 0.950.
    interior = Girder(
        cross_section="a",
        position="interior",
        girders=5,
        spacing=9.84,
        deck=8.0,
        stiffness=1_500_000.0,
    )
    exterior = dataclasses.replace(interior, position="exterior", overhang=2.95)
    i, x = member_factors(interior, [100.0]), member_factors(exterior, [100.0])
    e_moment = _factor(x, "positive moment", 2).value / _factor(i, "positive moment", 2).value
    e_shear = _factor(x, "shear", 2).value / _factor(i, "shear", 2).value
    assert round(e_moment, 2) == 1.09
    assert round(e_shear, 2) == 0.90
    assert lever_rule_exterior(9.84, 2.95, 1) == pytest.approx(0.950, abs=DF_3DP)
    assert _factor(x, "shear", 1).value == pytest.approx(0.950, abs=DF_3DP)


def test_lever_rule_by_hand() -> None:
    # Computed by hand (statics, deck hinged over the first interior girder), S = 16 ft:
    # exterior, de = 6 ft: wheels 2 ft from the barrier, at 20 and 14 ft from the hinge:
    # R = 0.5 (20 + 14) / 16 = 1.0625 lanes, x 1.2 = 1.275; two lanes, wheels every 6 ft
    # (20, 14, 8, 2): R = 0.5 x 44 / 16 = 1.375, m = 1.0.
    assert lever_rule_exterior(16.0, 6.0, 1) == pytest.approx(1.275, rel=REL_TOL_EXACT)
    assert lever_rule_exterior(16.0, 6.0, 2) == pytest.approx(1.375, rel=REL_TOL_EXACT)
    # A wheel beyond the hinge carries nothing: S = 8, de = 0: wheels at 6 and 0 ft.
    assert lever_rule_exterior(8.0, 0.0, 1) == pytest.approx(1.2 * 0.5 * 6 / 8, rel=REL_TOL_EXACT)
    # Interior, one lane: a wheel over the girder, the other 6 ft away: 0.5 + 0.5 (1 - 6/16)
    # = 0.8125, x 1.2 = 0.975; two trucks 4 ft apart (wheels -8, -2, 2, 8 ft):
    # 0.5 (0.5 + 0.875 + 0.875 + 0.5) = 1.375, m = 1.0.
    assert lever_rule_interior(16.0, 1) == pytest.approx(0.975, rel=REL_TOL_EXACT)
    assert lever_rule_interior(16.0, 2) == pytest.approx(1.375, rel=REL_TOL_EXACT)
    # S = 5 ft < 6 ft: only one wheel of a truck on the girder's panels: 0.5 x 1.2.
    assert lever_rule_interior(5.0, 1) == pytest.approx(0.6, rel=REL_TOL_EXACT)


def test_skew_correction_of_moment_by_hand() -> None:
    # Table 4.6.2.2.2e-1 (formula from memory): at 45 degrees tan = 1, so the factor is
    # 1 - c1, c1 = 0.25 (Kg / (12 L ts^3))^0.25 (S/L)^0.5, computed by hand for the FHWA PSC
    # girder: Kg / (12 x 110 x 512) = 2,984,704 / 675,840 = 4.41629; ^0.25 = 1.44965;
    # (9.6667/110)^0.5 = 0.29644; c1 = 0.25 x 1.44965 x 0.29644 = 0.10744.
    at_45 = dataclasses.replace(PSC, skew=45.0)
    factor, notes = skew_moment(at_45, 110.0)
    assert factor == pytest.approx(1 - 0.10744, abs=1e-5)
    assert notes == ()
    # Below 30 degrees no reduction; above 60 degrees theta = 60 (the table's rules).
    assert skew_moment(dataclasses.replace(PSC, skew=29.9), 110.0)[0] == 1.0
    at_60 = skew_moment(dataclasses.replace(PSC, skew=60.0), 110.0)[0]
    assert skew_moment(dataclasses.replace(PSC, skew=70.0), 110.0)[0] == at_60
    got = member_factors(at_45, [110.0])
    reduced = _factor(got, "positive moment", 2)
    assert reduced.value == pytest.approx(reduced.base * (1 - 0.10744), abs=1e-5)


def test_outside_the_range_is_computed_and_named() -> None:
    # Table 4.6.2.2.2b-1's range 4.5 <= ts <= 12.0 in: a 13 in deck is outside; the factor is
    # still the formula's (no clamping), and the note names the limit and the table.
    thick = dataclasses.replace(PSC, deck=13.0, skew=0.0)
    got = member_factors(thick, [110.0])
    moment = _factor(got, "positive moment", 2)
    by_hand = (
        0.075
        + (9.6667 / 9.5) ** 0.6 * (9.6667 / 110) ** 0.2 * (2_984_704 / (12 * 110 * 13**3)) ** 0.1
    )
    assert moment.value == pytest.approx(by_hand, abs=1e-4)
    (note,) = moment.notes
    assert (note.symbol, note.value, note.table) == ("ts", 13.0, "Table 4.6.2.2.2b-1")
    assert "4.5 <= ts <= 12 in" in note.text and "refined analysis" in note.text
    assert {n.table for f in got.factors for n in f.notes} == {
        "Table 4.6.2.2.2b-1",
        "Table 4.6.2.2.3a-1",
    }


def test_wide_spacing_takes_the_lever_rule() -> None:
    # Art. 4.6.2.2.1: beyond S = 16 ft the lever rule; S = 18 ft, one lane:
    # (0.5 + 0.5 (1 - 6/18)) x 1.2 = 1.0 (hand).
    wide = dataclasses.replace(PSC, spacing=18.0, skew=0.0)
    got = member_factors(wide, [110.0])
    assert _factor(got, "positive moment", 1).value == pytest.approx(1.0, rel=REL_TOL_EXACT)
    assert _factor(got, "shear", 1).value == pytest.approx(1.0, rel=REL_TOL_EXACT)
    assert all("lever rule" in f.method and not f.notes for f in got.factors)


def test_three_girders() -> None:
    # Tables 4.6.2.2.2b-1 and 4.6.2.2.3a-1, Nb = 3 (from memory): moment the lesser of the
    # formula and the lever rule; shear the lever rule. S = 8 ft: lever rule one lane
    # (0.5 + 0.5 (1 - 6/8)) x 1.2 = 0.75 (hand).
    three = dataclasses.replace(PSC, girders=3, spacing=8.0, skew=0.0)
    four = dataclasses.replace(three, girders=4)
    got, formula = member_factors(three, [60.0]), member_factors(four, [60.0])
    for lanes in (1, 2):
        lever = (
            lever_rule_interior(8.0, lanes)
            if lanes == 1
            else max(lever_rule_interior(8.0, n) for n in (2, 3, 4))
        )
        expected = min(_factor(formula, "positive moment", lanes).value, lever)
        assert _factor(got, "positive moment", lanes).value == expected
    assert _factor(got, "shear", 1).value == pytest.approx(0.75, rel=REL_TOL_EXACT)


def test_negative_moment_takes_the_average_of_adjacent_spans() -> None:
    # C4.6.2.2.1 (from memory): L for negative moment over an interior support is the average
    # of the two adjacent spans: spans 100 and 140 ft give the factor of L = 120 ft.
    square = dataclasses.replace(PSC, skew=0.0)
    got = member_factors(square, [100.0, 140.0])
    support = _factor(got, "negative moment", 2, "support 2")
    assert support.length == 120.0
    alone = _factor(member_factors(square, [120.0]), "positive moment", 2)
    assert support.value == alone.value
    # The member takes the largest: the shorter span's positive moment factor.
    assert got.moment == _factor(got, "positive moment", 2, "span 1").value


def test_si_layout_is_the_us_layout_converted_exactly() -> None:
    # 1 ft = 0.3048 m and 1 in = 25.4 mm exactly (NIST SP 811, Appendix B).
    us = GirderLayout(
        member="M",
        cross_section="k",
        position="exterior",
        girders=6,
        spacing=9 + 8 / 12,
        deck=8.0,
        stiffness=2_984_704.0,
        overhang=1.83,
        skew=35.0,
    )
    si = dataclasses.replace(
        us,
        spacing=us.spacing * 0.3048,
        deck=8.0 * 25.4,
        stiffness=2_984_704.0 * 25.4**4,
        overhang=1.83 * 0.3048,
    )
    a = layout_factors(us, [110.0, 95.0], "US")
    b = layout_factors(si, [110.0 * 0.3048, 95.0 * 0.3048], "SI")
    for x, y in zip(a.factors, b.factors, strict=True):
        assert y.value == pytest.approx(x.value, rel=REL_TOL_EXACT)


def test_kg_from_the_girder_section() -> None:
    # Eq. 4.6.2.2.1-1: Kg = n (I + A eg^2); [TxDOT] 8th ed. sheet: n = 1.000 (as printed),
    # I = 260,403 in4, A = 788.4 in2, eg = 33.25 in: Kg = 1,132,028 in4; Nb 5, L 65.62 ft,
    # S 6.56 ft, ts 8 in: moment 0.635, shear 0.712.
    layout = GirderLayout(
        member="M",
        cross_section="k",
        position="interior",
        girders=5,
        spacing=6.56,
        deck=8.0,
        modular_ratio=1.0,
        inertia=260_403.0,
        area=788.4,
        eccentricity=33.25,
    )
    got = layout_factors(layout, [65.62], "US")
    assert (got.moment, got.shear) == pytest.approx((0.635, 0.712), abs=DF_3DP)
