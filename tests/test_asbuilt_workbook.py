"""Members as built, from a workbook: the Segments sheet reaches the model and the engine.

Reference: the workbook contract as documented in docs/workbook.md (the Segments
sheet: Member, From, To, EI, EI at To, Haunch, Pieces); the engine's own exactness
is shown in tests/test_engine_segments.py.
"""

from __future__ import annotations

import numpy as np

from batch.engine.envelope import member_influence
from batch.engine.influence import influence_lines
from batch.validating import read_input


def test_segments_rows_reach_their_member(make_workbook, tmp_path) -> None:
    book = make_workbook(
        tmp_path,
        members=[
            {"Member": "KV-0705 G2", "Spans (ft)": "70, 70"},
            {"Member": "KV-0101 G1", "Spans (ft)": "60"},
        ],
        extra={
            "Segments": [
                ["Member", "From (ft)", "To (ft)", "EI", "EI at To", "Haunch", "Pieces"],
                [" kv-0705 g2", 56, 70, 1, 3.375, "parabolic", 4],
                ["KV-0705 G2", 70, 84, 1.5, None, None, None],
            ]
        },
    )
    report = read_input(book)
    assert report.case is not None, [p.render() for p in report.problems]
    member, other = report.case.members
    assert other.segments == ()
    haunch, plate = member.segments
    assert haunch.member == plate.member == "KV-0705 G2"  # spelled as on Members
    assert (haunch.haunch, haunch.pieces, haunch.ei_end) == ("parabolic", 4, 3.375)
    assert plate.haunch == "none"
    assert len(member.stiffness_pieces) == 5
    # The run's lines are those of the engine given the same prismatic pieces.
    il = member_influence(member, 4)
    same = influence_lines((70.0, 70.0), (1.0, 1.0), (), 4, pieces=member.stiffness_pieces)
    x = np.linspace(0.0, 140.0, 281)
    np.testing.assert_array_equal(il.evaluate(x), same.evaluate(x))


def test_an_analysis_row_reaches_its_member(make_workbook, tmp_path) -> None:
    book = make_workbook(
        tmp_path,
        members=[{"Member": "KV-0705 G2", "Spans (ft)": "70, 70"}],
        extra={
            "Analysis": [
                ["Member", "Stations per span", "EI scale (kip-in2)", "DF deflection"],
                ["kv-0705 g2", 16, 2.9e9, 0.55],
            ]
        },
    )
    report = read_input(book)
    assert report.case is not None, [p.render() for p in report.problems]
    (member,) = report.case.members
    assert member.analysis is not None and member.analysis.member == "KV-0705 G2"
    assert member.stations_per_span == 16
    assert (member.analysis.ei_scale, member.analysis.df_deflection) == (2.9e9, 0.55)
    assert member_influence(member, 10).n_stations == 2 * 17
