"""The fatigue loads: single-lane distribution factor without the multiple presence factor,
Fatigue I and II load factors, and the moment range, checked by hand.

Sources:
* the fatigue load is one design truck, 8, 32, 32 kip, with a constant 30 ft between the
  32 kip axles, the dynamic load allowance applied (AASHTO LRFD 7th ed. 2014, Art.
  3.6.1.4.1; verified on a reproduced page of the article), IM 15 % (Table 3.6.2.1-1,
  secondary);
* no multiple presence factor at the fatigue limit state: the single-lane distribution
  factor, tabulated with the one-lane factor 1.2, is divided by 1.2 (LRFD 3.6.1.1.2 and
  3.6.1.4.3b, from memory; the value 1.2 secondary: TRB's summary of NCHRP 20-07/285);
* Fatigue I 1.75, Fatigue II 0.80 (LRFD Table 3.4.1-1, 8th ed. 2017 on; from memory);
* the midspan moment influence line of a simple span L: x/2 left of midspan,
  (L - x)/2 right of it, and the maximum under a set of loads with an axle at the peak
  (AISC Steel Construction Manual, "Beam Diagrams and Formulas"; common practice).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from tolerances import REL_TOL_EXACT

from batch.engine.envelope import case_effects
from batch.engine.fatigue import fatigue_ranges
from batch.loads.fleet import fleet_cases
from batch.model import Case, Member, Settings, Vehicle
from batch.running.executor import RunOptions, run_case
from batch.writing.package.save import atomic_save
from batch.writing.package.splice import SourcePackage, empty_package
from batch.writing.results import result_package
from batch.writing.runlog import InputInfo

SPAN = 100.0  # ft
DF_SINGLE = 0.6  # as tabulated, with the one-lane multiple presence factor 1.2
FATIGUE_IM = 0.15

# Midspan moment of the fatigue truck on a 100 ft simple span, by hand. Axles 8, 32, 32 kip
# at 0, 14, 44 ft from the front. Influence ordinate at midspan: x/2 (x <= 50), (100-x)/2.
#  * middle axle at midspan: front at 64 ft (ordinate 18), rear at 20 ft (10):
#    8 x 18 + 32 x 25 + 32 x 10 = 1264  <- the largest;
#  * rear axle at midspan: middle at 80 ft (10), front at 94 ft (3):
#    8 x 3 + 32 x 10 + 32 x 25 = 1144;
#  * front axle at midspan: middle at 36 ft (18), rear at 6 ft (3): 8 x 25 + 32 x 18 +
#    32 x 3 = 872.
# The line is linear between axle positions, so the maximum has an axle at the peak.
HAND_MIDSPAN = 8 * 18 + 32 * 25 + 32 * 10
assert HAND_MIDSPAN == 1264


def _member(df_moment: float = 0.8) -> Member:
    """A simple span; ``df_moment`` (multi-lane) is never used by a fatigue load."""
    return Member(
        id="KV-0601 G2",
        spans=(SPAN,),
        df_moment=df_moment,
        df_moment_single=DF_SINGLE,
        df_shear_single=0.7,
    )


@pytest.mark.parametrize(
    ("name", "factor"), [("Fatigue truck", 1.0), ("Fatigue I", 1.75), ("Fatigue II", 0.80)]
)
def test_fatigue_range_on_a_simple_span_by_hand(name: str, factor: float) -> None:
    cases = fleet_cases((Vehicle(id="KV-FAT", library=name),), Settings(impact=0.33))
    effects = case_effects(_member(), cases, stations_per_span=2)
    ranges = fatigue_ranges(effects, cases)
    assert ranges is not None
    expected = factor * (DF_SINGLE / 1.2) * (1 + FATIGUE_IM) * HAND_MIDSPAN
    assert math.isclose(ranges.m_max[0, 1], expected, rel_tol=REL_TOL_EXACT)
    assert (ranges.m_min == 0.0).all()  # a simple span has no hogging
    assert math.isclose(ranges.m_range[0, 1], expected, rel_tol=REL_TOL_EXACT)


def test_the_multi_lane_factor_and_the_runs_allowance_are_not_used() -> None:
    cases = fleet_cases((Vehicle(id="KV-FAT", library="Fatigue I"),), Settings(impact=0.5))
    base = case_effects(_member(), cases, stations_per_span=2).max_value
    other = case_effects(_member(df_moment=0.3), cases, stations_per_span=2).max_value
    assert np.array_equal(base, other)


def test_range_on_two_spans_is_largest_minus_smallest_moment() -> None:
    """On two spans the fatigue truck sags and hogs each station: the range is the sum."""
    member = Member(id="KV-0602 G1", spans=(80.0, 80.0), df_moment_single=1.2, df_shear_single=1.2)
    cases = fleet_cases(
        (Vehicle(id="KV-T", axle_loads=(20.0,)), Vehicle(id="KV-FAT", library="Fatigue II")),
        Settings(),
    )
    effects = case_effects(member, cases, stations_per_span=4)
    ranges = fatigue_ranges(effects, cases)
    assert ranges is not None and list(ranges.cases) == [1]
    moments = effects.lines.moment_rows
    assert np.array_equal(ranges.m_max[0], effects.max_value[1, moments])
    assert np.array_equal(ranges.m_min[0], effects.min_value[1, moments])
    assert (ranges.m_min[0][1:4] < 0).all() and (ranges.m_max[0][1:4] > 0).all()
    assert np.allclose(ranges.m_range, ranges.m_max - ranges.m_min, rtol=0, atol=0)


def test_no_fatigue_load_no_ranges() -> None:
    cases = fleet_cases((Vehicle(id="KV-T", axle_loads=(20.0,)),), Settings())
    assert fatigue_ranges(case_effects(_member(), cases, 2), cases) is None


def test_a_fatigue_load_without_single_lane_factors_is_refused_by_the_engine() -> None:
    cases = fleet_cases((Vehicle(id="KV-FAT", library="Fatigue I"),), Settings())
    with pytest.raises(ValueError, match="single-lane distribution factors"):
        case_effects(Member(id="KV-X", spans=(SPAN,)), cases, 2)


def _case() -> Case:
    return Case(
        settings=Settings(stations_per_span=2),
        members=(
            _member(),
            Member(id="KV-0603 G1", spans=(60.0, 60.0), df_moment_single=0.6, df_shear_single=0.7),
        ),
        vehicles=(Vehicle(id="KV-HL", library="HL-93"), Vehicle(id="KV-FAT1", library="Fatigue I")),
    )


def test_run_keeps_the_ranges_in_memory_and_in_the_store(tmp_path: Path) -> None:
    plain = run_case(_case())
    stored = run_case(_case(), options=RunOptions(store=tmp_path / "kvha.spanfleet.sqlite"))
    assert len(plain.fatigue) == len(stored.fatigue) == 2
    for a, b in zip(plain.fatigue, stored.fatigue, strict=True):
        assert a is not None and b is not None
        assert np.array_equal(a.cases, b.cases)
        assert np.array_equal(a.m_range, b.m_range)
    first = plain.fatigue[0]
    assert first is not None
    expected = 1.75 * (DF_SINGLE / 1.2) * (1 + FATIGUE_IM) * HAND_MIDSPAN
    assert math.isclose(first.m_range[0, 1], expected, rel_tol=REL_TOL_EXACT)


def test_fatigue_sheet_carries_the_ranges(tmp_path: Path) -> None:
    result = run_case(_case())
    info = InputInfo(name="case.json", digest="0" * 64, source="json", output="out.xlsx")
    path = tmp_path / "out.xlsx"
    atomic_save(result_package(SourcePackage(empty_package(), "out.xlsx"), result, info), path)
    sheet = pd.read_excel(path, sheet_name="Fatigue")
    assert list(sheet.columns) == [
        "Member", "Fatigue load", "Span", "Station", "x (ft)",
        "M max (kip-ft)", "M min (kip-ft)", "M range (kip-ft)",
    ]  # fmt: skip
    assert len(sheet) == result.n_stations  # one fatigue load
    mid = sheet[(sheet["Member"] == "KV-0601 G2") & (sheet["Station"] == 0.5)].iloc[0]
    assert mid["Fatigue load"] == "KV-FAT1: Fatigue I"
    expected = 1.75 * (DF_SINGLE / 1.2) * (1 + FATIGUE_IM) * HAND_MIDSPAN
    assert math.isclose(mid["M range (kip-ft)"], expected, rel_tol=REL_TOL_EXACT)
    ranges = sheet["M range (kip-ft)"].to_numpy()
    spread = (sheet["M max (kip-ft)"] - sheet["M min (kip-ft)"]).to_numpy()
    assert np.allclose(ranges, spread, rtol=REL_TOL_EXACT, atol=0)


def test_no_fatigue_load_no_fatigue_sheet(tmp_path: Path) -> None:
    case = Case(
        settings=Settings(stations_per_span=2),
        members=(Member(id="KV-0101 G1", spans=(40.0,)),),
        vehicles=(Vehicle(id="KV-HL", library="HL-93"),),
    )
    result = run_case(case)
    assert result.fatigue == ()
    info = InputInfo(name="case.json", digest="0" * 64, source="json", output="out.xlsx")
    path = tmp_path / "out.xlsx"
    atomic_save(result_package(SourcePackage(empty_package(), "out.xlsx"), result, info), path)
    with pd.ExcelFile(path) as book:
        assert "Fatigue" not in book.sheet_names
