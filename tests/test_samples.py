"""The KVHA demo data and the sample workbooks written from it."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import openpyxl
import pytest
from generated_workbooks import assert_same_workbook, read_input_or_skip
from tolerances import REL_TOL_EXACT

from batch.demo.kvha import KVHA_INVENTORY, KVHA_SI_DEMO, SAMPLE_WORKBOOKS
from batch.engine.envelope import member_envelope
from batch.engine.influence import influence_lines
from batch.loads.fleet import fleet_cases
from batch.model import Case, Member, Settings
from batch.model.layout import mechanism_parts
from batch.model.sheets import MEMBERS, VEHICLES
from batch.writing.template import write_case_workbook

SAMPLES_DIR = Path(__file__).resolve().parent.parent / "sample_workbooks"
# Plausible typed live-load distribution factors per girder (common practice: 0.5 to 0.8
# lanes). A member with a girder layout takes the AASHTO LRFD 4.6.2.2 factors instead, whose
# shear factors pass 0.8 at ordinary spacings (0.973 in the FHWA PSC design example, Design
# Step 5.1); tests/test_distribution.py checks those.
DF_RANGE = (0.5, 0.8)


@pytest.mark.parametrize("name", sorted(SAMPLE_WORKBOOKS))
def test_regenerated_sample_equals_the_committed_file(name: str, tmp_path: Path) -> None:
    fresh = tmp_path / name
    write_case_workbook(SAMPLE_WORKBOOKS[name], fresh)
    assert_same_workbook(fresh, SAMPLES_DIR / name)


def test_only_the_declared_samples_are_committed() -> None:
    assert sorted(p.name for p in SAMPLES_DIR.glob("*.xlsx")) == sorted(SAMPLE_WORKBOOKS)


@pytest.mark.parametrize("name", sorted(SAMPLE_WORKBOOKS))
def test_sample_headers_show_the_sample_units(name: str) -> None:
    case = SAMPLE_WORKBOOKS[name]
    wb = openpyxl.load_workbook(SAMPLES_DIR / name)
    spans = next(c for c in MEMBERS.columns if c.key == "spans")
    loads = next(c for c in VEHICLES.columns if c.key == "axle_loads")
    unit = {"US": ("ft", "kip"), "SI": ("m", "kN")}[case.settings.units]
    assert f"{spans.header} ({unit[0]})" in [c.value for c in wb["Members"][1]]
    assert f"{loads.header} ({unit[1]})" in [c.value for c in wb["Vehicles"][1]]
    assert wb["Settings"]["B2"].value == case.settings.units


def _all_members() -> list[Member]:
    return [m for case in SAMPLE_WORKBOOKS.values() for m in case.members]


@pytest.mark.parametrize("member", _all_members(), ids=lambda m: m.id)
def test_every_sample_layout_is_stable(member: Member) -> None:
    # Counting rule (common practice): a stable girder line needs at least as many support
    # reactions as the two equations of statics plus one per internal hinge.
    assert len(member.spans) + 1 >= 2 + len(member.hinges)
    assert mechanism_parts(member.spans, member.hinges) == []
    influence_lines(member.spans, member.stiffness, member.hinges, stations_per_span=4)


def test_no_moment_at_a_sample_hinge_that_is_a_station() -> None:
    # Statics (common practice): an internal hinge transmits no moment, whatever the load.
    checked = 0
    for member in _all_members():
        il = influence_lines(member.spans, member.stiffness, member.hinges, stations_per_span=10)
        ordinates = il.evaluate(np.linspace(0.0, member.length, 801))[il.moment_rows]
        for hinge in member.hinges:
            for row in np.flatnonzero(np.isclose(il.station_x, hinge, rtol=0, atol=1e-9)):
                assert np.abs(ordinates[row]).max() <= REL_TOL_EXACT * member.length, member.id
                checked += 1
    assert checked > 0  # KV-1010 G2 has its hinges on stations 0.8 and 0.2 of spans 2 and 3


def test_inventory_has_every_kind_of_layout() -> None:
    members = KVHA_INVENTORY.members
    assert len(members) >= 20
    simple = [m for m in members if len(m.spans) == 1]
    assert len({m.spans for m in simple}) >= 5  # simple spans of various lengths
    for n_spans in (2, 3, 4):
        unequal = [m for m in members if len(m.spans) == n_spans and len(set(m.spans)) > 1]
        assert unequal, f"no {n_spans}-span member with unequal spans"
    assert any(len(set(m.span_ei)) > 1 for m in members)
    # Cantilever and suspended span: two hinges inside one span carry a suspended piece.
    assert any(_hinges_per_span(m).count(2) for m in members)


def _hinges_per_span(member: Member) -> list[int]:
    ends = [sum(member.spans[: i + 1]) for i in range(len(member.spans))]
    starts = [0.0, *ends[:-1]]
    return [sum(a < h < b for h in member.hinges) for a, b in zip(starts, ends, strict=True)]


def test_inventory_fleet_covers_axle_counts_ranges_lanes_and_categories() -> None:
    own = [v for v in KVHA_INVENTORY.vehicles if v.library is None]
    named = [v for v in KVHA_INVENTORY.vehicles if v.library is not None]
    vehicles = own
    assert len(own) >= 10
    axle_counts = {len(v.axle_loads) for v in vehicles}
    assert min(axle_counts) == 2 and max(axle_counts) == 9
    assert sum(any(s.is_range for s in v.spacings) for v in vehicles) >= 2
    assert sum(v.lane_load > 0 for v in vehicles) >= 2
    assert {v.category for v in vehicles} == {"design", "legal", "permit"}
    # Standard load models are named in the Library column, with the axle columns empty.
    assert {v.library for v in named} >= {"HL-93"}
    assert all(not v.axle_loads and not v.spacings and v.lane_load == 0 for v in named)
    assert all(len(v.spacings) == len(v.axle_loads) - 1 for v in vehicles)


@pytest.mark.parametrize("case", [KVHA_INVENTORY, KVHA_SI_DEMO], ids=["US", "SI"])
def test_sample_values_are_plausible_and_ids_unique(case: Case) -> None:
    for m in case.members:
        if m.layout is None:
            assert DF_RANGE[0] <= m.df_moment <= DF_RANGE[1], m.id
            assert DF_RANGE[0] <= m.df_shear <= DF_RANGE[1], m.id
        assert m.dc_load > 0 and m.dw_load > 0, m.id
        assert not m.span_ei or len(m.span_ei) == len(m.spans), m.id
    for ids in ([m.id for m in case.members], [v.id for v in case.vehicles]):
        assert len({i.strip().lower() for i in ids}) == len(ids)


def test_si_demo_is_small_and_metric() -> None:
    assert KVHA_SI_DEMO.settings.units == "SI"
    assert 3 <= len(KVHA_SI_DEMO.members) <= 5
    assert KVHA_INVENTORY.settings.units == "US"


def test_design_truck_and_lane_on_the_100_ft_span_gives_the_published_midspan_moment() -> None:
    # Per lane at midspan of a 100 ft simple span, the 8-32-32 kip truck with 14 ft spacings
    # and a 0.64 kip/ft lane (closed forms derived here: 18L - 280 for L >= 28 ft and 0.08L^2).
    # By hand: the midspan influence ordinate at d from midspan is (L/2 - d)/2, i.e. 25 under
    # the middle axle and 18 at 14 ft either side: 32 x 25 + 32 x 18 + 8 x 18 = 1520;
    # lane wL^2/8 = 800 kip-ft;
    # LL + IM = 1.33 x 1520 + 800 = 2821.6 kip-ft. The sample multiplies by its DF moment.
    member = next(m for m in KVHA_INVENTORY.members if m.spans == (100.0,))
    truck = next(v for v in KVHA_INVENTORY.vehicles if v.id == "KVHA-D1")
    cases = fleet_cases((truck,), Settings(impact=0.33))
    env = member_envelope(member, cases, stations_per_span=10)
    mid = list(env.station_fraction).index(0.5)
    expected = member.df_moment * (1.33 * (18 * 100 - 280) + 0.08 * 100**2)
    assert env.m_max.value[mid] == pytest.approx(expected, rel=REL_TOL_EXACT)


@pytest.mark.parametrize("case", [KVHA_INVENTORY, KVHA_SI_DEMO], ids=["US", "SI"])
def test_every_sample_member_runs_through_the_engine(case: Case) -> None:
    cases = fleet_cases(case.vehicles, case.settings)
    for member in case.members:
        env = member_envelope(member, cases, case.settings.stations_per_span)
        assert env.m_max.value.max() > 0, member.id
        assert env.r_max.value.min() > 0, member.id  # every support carries some load


@pytest.mark.parametrize("name", sorted(SAMPLE_WORKBOOKS))
def test_sample_reads_back_as_the_case_it_was_written_from(name: str) -> None:
    report = read_input_or_skip()(SAMPLES_DIR / name)
    assert [p.render() for p in report.problems] == []
    assert [p.render() for p in report.warnings] == []
    assert report.case == SAMPLE_WORKBOOKS[name]
