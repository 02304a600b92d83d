"""Members as built, from a workbook: the Segments and Analysis sheets reach the model,
the engine and the result sheets.

Reference: the workbook format as documented in docs/workbook.md (Segments, Analysis,
Deflections, Deflection Check); the engine's own exactness is shown in
tests/test_engine_segments.py and tests/test_engine_deflection.py.
"""

from __future__ import annotations

import subprocess
import sys

import numpy as np
import pandas as pd

from batch.engine.deflection import member_deflection
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


def _run(*args: str) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "batch", *args],
        capture_output=True,
        text=True,
        timeout=300,
        check=False,
    )


def test_deflection_sheets_through_the_command(make_workbook, tmp_path) -> None:
    # The sheets hold the engine's deflections of the same member (read back from the
    # checkpoint store), and the run without a store writes the same numbers.
    book = make_workbook(
        tmp_path,
        members=[
            {"Member": "KV-0705 G2", "Spans (ft)": "70, 70", "DF moment": 0.6},
            {"Member": "KV-0101 G1", "Spans (ft)": "60"},
        ],
        vehicles=[{"Vehicle": "HL-93", "Library": "HL-93"}],
        extra={
            "Analysis": [
                ["Member", "EI scale (kip-in2)", "Deflection limit", "DF deflection"],
                ["KV-0705 G2", 1.2e9, 1000, 0.45],
            ]
        },
    )
    with_store, without = tmp_path / "a.xlsx", tmp_path / "b.xlsx"
    assert _run("run", str(book), "--out", str(with_store)).returncode == 0
    assert _run("run", str(book), "--out", str(without), "--no-store").returncode == 0
    case = read_input(book).case
    assert case is not None
    expected = member_deflection(case.members[0], case.settings)
    assert expected is not None
    for out in (with_store, without):
        sheets = pd.read_excel(out, sheet_name=["Deflections", "Deflection Check"])
        rows, check = sheets["Deflections"], sheets["Deflection Check"]
        assert set(rows["Member"]) == {"KV-0705 G2"}  # the other member gives no EI scale
        np.testing.assert_allclose(rows["Deflection down (in)"], expected.down.value, rtol=1e-12)
        np.testing.assert_allclose(rows["Deflection up (in)"], expected.up.value, rtol=1e-12)
        assert list(check["Limit"]) == [1000, 1000]
        np.testing.assert_allclose(check["Span/deflection"], expected.span_ratio, rtol=1e-12)
        assert list(check["DF from"]) == ["DF deflection"] * 2
