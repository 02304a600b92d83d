"""Rated sections anywhere: a station off the grid, given by fraction or by x.

The reference is the engine itself on a grid that already holds the point: a
station added off the grid must give exactly what the same member gives on a grid
of stations that includes that point (the influence line of a section does not
depend on which other sections are computed; statics, common practice). And a
rating at such a section must rate what the envelope there holds.

Tolerance: 1e-9 of each effect's natural size.
"""

from __future__ import annotations

import numpy as np
import pytest

from batch.engine.envelope import case_effects, envelope_of, member_influence
from batch.loads.fleet import fleet_cases
from batch.model import Analysis, Capacity, Case, Member, Settings, Spacing, Vehicle
from batch.running.executor import run_case

REL_TOL_EXACT = 1e-9

MEMBER = Member(id="KV-0706 G3", spans=(55.0, 72.0), span_ei=(1.0, 1.3), df_moment=0.6)
TRUCK = Vehicle(
    id="KV-T3",
    axle_loads=(8.0, 32.0, 32.0),
    spacings=(Spacing(low=14.0, high=14.0), Spacing(low=14.0, high=30.0)),
    lane_load=0.64,
)
SETTINGS = Settings(stations_per_span=10, impact=0.33)


def _cases() -> list:
    return list(fleet_cases((TRUCK,), SETTINGS))


@pytest.mark.parametrize(
    ("section", "grid", "row_on_grid"),
    [
        # 1/7 of span 2 (x = 55 + 72/7): on a grid of 7 stations per span it is row 9.
        ((2, 55.0 + 72.0 / 7.0), 7, 9),
        # 3/8 of span 1 (x = 20.625): row 3 of a grid of 8.
        ((1, 20.625), 8, 3),
    ],
)
def test_an_off_grid_station_equals_a_grid_that_holds_it(section, grid, row_on_grid) -> None:
    cases = _cases()
    added = member_influence(MEMBER, 10, [section])
    on_grid = member_influence(MEMBER, grid)
    row = added.station_index(section)
    assert row is not None
    assert added.station_x[row] == pytest.approx(section[1], abs=1e-12)
    assert on_grid.station_x[row_on_grid] == pytest.approx(section[1], rel=1e-15)
    a = envelope_of(MEMBER.id, case_effects(MEMBER, cases, il=added), ("T",))
    b = envelope_of(MEMBER.id, case_effects(MEMBER, cases, il=on_grid), ("T",))
    size = {"m_max": added.length, "m_min": added.length, "v_max": 1.0, "v_min": 1.0}
    for name, scale in size.items():
        got, want = getattr(a, name), getattr(b, name)
        weight = 72.0 * scale  # a natural size of the effect: axle weight times its scale
        assert got.value[row] == pytest.approx(want.value[row_on_grid], abs=REL_TOL_EXACT * weight)
    # The other stations are those of the plain 10-per-span grid, unchanged.
    plain = member_influence(MEMBER, 10)
    keep = np.arange(added.n_stations) != row
    np.testing.assert_array_equal(added.station_x[keep], plain.station_x)


def test_a_member_may_have_its_own_stations_per_span() -> None:
    own = Member(
        id="KV-0706 G3",
        spans=(55.0, 72.0),
        analysis=Analysis(member="KV-0706 G3", stations_per_span=4),
    )
    assert member_influence(own, 10).n_stations == 2 * 5
    assert member_influence(Member(id="x", spans=(55.0, 72.0)), 10).n_stations == 2 * 11


def test_a_capacity_by_x_is_rated_where_it_is() -> None:
    # A cover-plate end at x = 23.3 ft: the run adds the station, the envelope gives it a
    # row, and the rating's governing station is that row.
    member = Member(id=MEMBER.id, spans=MEMBER.spans, span_ei=MEMBER.span_ei, dc_load=1.0)
    case = Case(
        settings=SETTINGS,
        members=(member,),
        vehicles=(TRUCK,),
        capacities=(Capacity(member=member.id, x=23.3, resistance_m_pos=900.0),),
    )
    result = run_case(case)
    env = result.envelopes[0]
    row = int(np.flatnonzero(np.isclose(env.station_x, 23.3, rtol=0, atol=1e-12))[0])
    assert env.station_span[row] == 1
    assert env.station_fraction[row] == pytest.approx(23.3 / 55.0)
    rating = result.assessments[0].rating
    assert rating is not None and rating.station[0] == row
    # RF by hand from the envelope: (C - 1.25 DC) / (1.75 LL), DC from statics of the
    # two-span member under 1 kip/ft (the engine's own dead-load line, checked elsewhere).
    il = member_influence(member, 10, [(1, 23.3)])
    positive, negative = il.areas()
    dc = (positive + negative)[il.moment_rows][row]
    expected = (900.0 - 1.25 * dc) / (1.75 * env.m_max.value[row])
    assert rating.rf[0] == pytest.approx(expected, rel=1e-12)
