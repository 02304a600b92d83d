"""Distribution factors from the Girder Layout sheet reach the members and the Members DF prevails.

Source of the expected factors: FHWA, Comprehensive Design Example for Prestressed
Concrete (PSC) Girder Superstructure Bridge (US units), Design Step 5.1 "Live Load
Distribution Factors": S = 9'-8", L = 110 ft, ts = 8 in, Kg = 2,984,704 in4, skew 20
degrees; interior moment 0.796 (two or more lanes) and 0.542 (one lane), interior
shear with the skew correction 0.973 and 0.782 (the numbers as reproduced in a
public secondary text quoting the example; the example's page was seen, its
numbers not). The workbook contract: docs/workbook.md, Girder Layout.
"""

from __future__ import annotations

import pytest
from tolerances import DF_3DP, DF_3DP_PRODUCT

from batch.interface import read, run
from batch.validating import read_input

LAYOUT = [
    "Member",
    "Cross-section",
    "Girder",
    "Girders",
    "Spacing (ft)",
    "Deck thickness (in)",
    "Kg (in4)",
    "Skew (deg)",
]
PSC = ["KV-0110 G2", "k", "interior", 6, 9 + 8 / 12, 8, 2_984_704, 20]


def _read(make_workbook, tmp_path, members, rows):
    book = make_workbook(tmp_path, members=members, extra={"Girder Layout": [LAYOUT, *rows]})
    return read_input(book)


def test_layout_factors_reach_the_member(make_workbook, tmp_path) -> None:
    report = _read(
        make_workbook, tmp_path, [{"Member": "KV-0110 G2", "Spans (ft)": "110, 110"}], [PSC]
    )
    assert report.case is not None, [p.render() for p in report.problems]
    (member,) = report.case.members
    assert member.layout is not None and member.layout.member == "KV-0110 G2"
    assert member.df_moment == pytest.approx(0.796, abs=DF_3DP)
    assert member.df_moment_single == pytest.approx(0.542, abs=DF_3DP)
    assert member.df_shear == pytest.approx(0.973, abs=DF_3DP_PRODUCT)
    assert member.df_shear_single == pytest.approx(0.782, abs=DF_3DP_PRODUCT)
    assert not report.warnings, [p.render() for p in report.warnings]


def test_a_df_typed_on_members_prevails(make_workbook, tmp_path) -> None:
    member = {"Member": "KV-0110 G2", "Spans (ft)": "110, 110", "DF moment": 0.7}
    report = _read(make_workbook, tmp_path, [member], [PSC])
    assert report.case is not None, [p.render() for p in report.problems]
    (got,) = report.case.members
    assert got.df_moment == 0.7
    assert got.df_shear == pytest.approx(0.973, abs=DF_3DP_PRODUCT)
    assert [(p.sheet, p.code) for p in report.warnings] == [("Members", "df-prevails")]


def test_the_distribution_factors_sheet(make_workbook, tmp_path) -> None:
    # The sheet shows each factor with its table, the range notes and which factor the run
    # takes; a DF typed on Members is named as prevailing (docs/workbook.md).
    members = [
        {"Member": "KV-0110 G2", "Spans (ft)": "110, 110", "DF shear": 0.9},
        {"Member": "KV-0111 G1", "Spans (ft)": "60"},
    ]
    thick = ["KV-0111 G1", "a", "interior", 5, 8, 13, 1_000_000, 0]
    book = make_workbook(tmp_path, members=members, extra={"Girder Layout": [LAYOUT, PSC, thick]})
    frame = run(read(book), jobs=1).frames()["Distribution Factors"]
    psc = frame[frame["Member"] == "KV-0110 G2"]
    # Two spans: 2 positive moments, 1 negative moment, 2 shears, each one lane and several.
    assert len(psc) == 10
    moment = psc[(psc["Effect"] == "positive moment") & (psc["Lanes"] == "two or more")]
    assert moment["Factor"].iloc[0] == pytest.approx(0.796, abs=DF_3DP)
    assert moment["Source"].iloc[0].endswith("Table 4.6.2.2.2b-1")
    assert moment["Run uses"].iloc[0] == "DF moment"
    shear = psc[(psc["Effect"] == "shear") & (psc["Lanes"] == "two or more")]
    assert shear["Run uses"].iloc[0] == "DF shear: 0.900 typed on Members prevails"
    assert set(psc["Range"]) == {"within"}
    other = frame[frame["Member"] == "KV-0111 G1"]
    assert all("ts = 13 is outside 4.5 <= ts <= 12 in" in r for r in other["Range"])
