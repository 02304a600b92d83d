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

from batch.validating import read_input
from tests.tolerances import DF_3DP, DF_3DP_PRODUCT

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
