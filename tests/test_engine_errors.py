"""The engine refuses mechanisms and malformed members and trains, saying what is wrong.

Sources:

* Stability of a girder line with hinges (statics; common practice): the parts
  between hinges are rigid bodies, each support fixes one deflection and each
  hinge joins two parts. A line of n spans (n + 1 supports, one of them also
  holding the member lengthwise) with e_c hinges is unstable when
  r < 3 + e_c, i.e. when it has more than n - 1 hinges; with fewer it can still
  be a mechanism when the hinges crowd into one place (geometric instability:
  three hinges or pins in a row on one straight line).
* Input domains: docs/workbook.md, this repository's specification of the
  workbook (Settings "Stations per span" a whole number >= 1, "Directions" both,
  left-to-right or right-to-left; Vehicles "Axle spacings" one per pair of
  consecutive axles, entries that may be ranges low-high; at least one vehicle)
  and the engine's own docstrings (hinges strictly inside the member, one relative
  EI per span, at most ``MAX_RANGES`` ranged spacings).
  That a length, a stiffness or a load must be a finite number, and a length or
  stiffness greater than zero, is common practice.

Every check asserts the exception type and the words of the message that say
what is wrong. Where the engine does not yet refuse an input, or refuses it with
an unclear message, the test is a strict xfail with the reason (none is left).
"""

from __future__ import annotations

import math
import re

import numpy as np
import pytest
from tolerances import REL_TOL_EXACT

from batch.engine.envelope import member_envelope
from batch.engine.influence import UnstableMemberError, influence_lines
from batch.engine.moving import axle_extremes, fleet_extremes_of
from batch.loads.cases import LoadCase
from batch.model import AxleTrain, Member
from batch.model.case import MAX_RANGES

NAN = math.nan
INF = math.inf

SPANS_MESSAGE = "span lengths must be one or more finite numbers greater than zero"
EI_MESSAGE = "give one relative EI greater than zero for each span"
STATIONS_MESSAGE = "stations per span must be a whole number of at least 1"
HINGE_ENDS_MESSAGE = "hinges must lie strictly inside the member"
HINGE_FINITE_MESSAGE = "hinge positions must be finite numbers"
HINGE_TWICE_MESSAGE = "two hinges are at the same place; give each hinge once"
LOADS_MESSAGE = "axle loads must be finite numbers"
COUNT_MESSAGE = "give one or more axle loads and one spacing per gap between axles"
SPACING_MESSAGE = "axle spacings must be finite numbers, zero or more"
RANGE_MESSAGE = "a spacing range must not end below its start"
DIRECTIONS_MESSAGE = "directions must be one or both of +1 (left to right) and -1"


def _exactly(message: str) -> str:
    """A ``pytest.raises(match=...)`` pattern for the whole message, taken literally."""
    return "^" + re.escape(message) + "$"


def _names_part(message: str, start: float, end: float) -> bool:
    """Whether ``message`` names the part from ``start`` to ``end`` (not inside a longer number)."""
    pattern = rf"(?<![\d.]){start:g} to {end:g}(?![\d.])"
    return re.search(pattern, message) is not None


# --- mechanisms ------------------------------------------------------------------------------

# (spans, hinges, parts that move, parts that stay put): statics, see the module docstring.
MECHANISMS = {
    # 1 span, 1 hinge: r = 3 < 3 + 1. Both halves fold about the hinge.
    "hinge in a simple span": ([30.0], [12.0], [(0, 12), (12, 30)], []),
    # 2 spans, 2 hinges: r = 4 < 5. The part 20-70 rests on B and C; the two links
    # 0-10 and 10-20 hang between the pin at A and the hinge at 20.
    "two hinges in one span of a two-span member": (
        [30.0, 40.0],
        [10.0, 20.0],
        [(0, 10), (10, 20)],
        [(20, 70)],
    ),
    # 2 spans, a hinge in each: r = 4 < 5; no part rests on two supports.
    "a hinge in each span of a two-span member": (
        [30.0, 40.0],
        [10.0, 50.0],
        [(0, 10), (10, 50), (50, 70)],
        [],
    ),
    # A hinge on the pier makes span 1 a simple span; the hinge at 50 then sits
    # between two single-support parts: pin B, hinge 50 and pin C in a row.
    "a hinge on the pier and one in the next span": (
        [30.0, 40.0],
        [30.0, 50.0],
        [(30, 50), (50, 70)],
        [(0, 30)],
    ),
    # 3 spans, 3 hinges: r = 5 < 6; every part has one support only.
    "three hinges in a three-span member": (
        [30.0, 40.0, 30.0],
        [20.0, 50.0, 80.0],
        [(0, 20), (20, 50), (50, 80), (80, 100)],
        [],
    ),
    # 3 spans, 3 hinges all in the middle span: the ends stand on two supports each,
    # the two links between them fold (hinges at 35, 40 and 60 in a row).
    "three hinges in the middle span of a three-span member": (
        [30.0, 40.0, 30.0],
        [35.0, 40.0, 60.0],
        [(35, 40), (40, 60)],
        [(0, 35), (60, 100)],
    ),
    # 3 spans, 2 hinges: the count says determinate (r = 5 = 3 + 2), but both hinges
    # are in span 1: pin A, hinge 10 and hinge 20 (held by the part 20-100) in a row.
    "two hinges crowded into an end span (the count alone would pass)": (
        [30.0, 40.0, 30.0],
        [10.0, 20.0],
        [(0, 10), (10, 20)],
        [(20, 100)],
    ),
}


@pytest.mark.parametrize("name", list(MECHANISMS))
def test_mechanism_is_refused_naming_the_parts_that_move(name: str) -> None:
    spans, hinges, moving, still = MECHANISMS[name]
    with pytest.raises(UnstableMemberError) as caught:
        influence_lines(spans, hinges=hinges)
    message = str(caught.value)
    assert "mechanism" in message
    assert "can move without resistance" in message
    assert "remove a hinge or move it" in message  # and says how to fix it
    for a, b in moving:
        assert _names_part(message, a, b), (a, b, message)
    for a, b in still:
        assert not _names_part(message, a, b), (a, b, message)
    # Callers that catch ValueError for any bad member catch this too (engine docstring).
    assert isinstance(caught.value, ValueError)


def test_mechanism_is_refused_through_the_member_envelope() -> None:
    # Same statics as "three hinges in a three-span member", reached from a model member.
    member = Member(id="KV-41 G2", spans=(30.0, 40.0, 30.0), hinges=(20.0, 50.0, 80.0))
    case = LoadCase(label="KV-T3", train=AxleTrain.of((10.0, 30.0, 30.0), (14.0, 16.0)))
    with pytest.raises(UnstableMemberError, match="mechanism"):
        member_envelope(member, [case])


def test_hinge_on_the_pier_is_stable_and_makes_two_simple_spans() -> None:
    # Statics (common practice): a hinge over the interior support of two spans
    # leaves two simply supported spans, so R_A(x) = 1 - x / 30 on span 1 and 0 on span 2.
    il = influence_lines([30.0, 40.0], hinges=[30.0], stations_per_span=4)
    x = np.array([0.0, 7.5, 15.0, 29.0, 31.0, 50.0, 69.0])
    r_a = il.evaluate(x)[il.reaction_rows][0]
    expected = np.where(x <= 30.0, 1.0 - x / 30.0, 0.0)
    np.testing.assert_allclose(r_a, expected, rtol=0, atol=REL_TOL_EXACT)


@pytest.mark.parametrize(
    ("spans", "hinges"),
    [
        # Cantilever and suspended span: 3 spans, 2 hinges in the middle span (r = 3 + 2).
        ([50.0, 120.0, 50.0], [80.0, 140.0]),
        ([30.0, 40.0, 30.0], [35.0, 65.0]),
        # Hinges over both piers: three simple spans.
        ([30.0, 40.0, 30.0], [30.0, 70.0]),
        # Twelve spans with the most hinges they can take, one in each of spans 2-12.
        ([20.0] * 12, [25.0 + 20.0 * k for k in range(11)]),
    ],
)
def test_stable_layouts_with_hinges_are_accepted(spans: list[float], hinges: list[float]) -> None:
    # Statics (see the module docstring): no more than n - 1 hinges, and every part
    # between hinges rests on two supports or on one support and a held neighbour.
    il = influence_lines(spans, hinges=hinges, stations_per_span=2)
    assert il.length == pytest.approx(sum(spans))


# --- member geometry ------------------------------------------------------------------------


@pytest.mark.parametrize(
    "spans",
    [[30.0, 0.0], [-5.0], [30.0, -40.0], [NAN], [30.0, INF], [], [[30.0, 40.0]]],
    ids=["zero", "negative", "negative second", "NaN", "infinite", "none", "nested list"],
)
def test_bad_spans_are_refused(spans: list) -> None:
    # A span has a finite length greater than zero (common practice).
    with pytest.raises(ValueError, match=_exactly(SPANS_MESSAGE)) as caught:
        influence_lines(spans)
    assert caught.type is ValueError  # not reported as a mechanism


@pytest.mark.parametrize(
    "span_ei",
    [[1.0], [1.0, 1.0, 1.0], [1.0, 0.0], [-1.0, 1.0], [1.0, NAN], [INF, 1.0]],
    ids=["too few", "too many", "zero", "negative", "NaN", "infinite"],
)
def test_bad_span_ei_is_refused(span_ei: list[float]) -> None:
    # One relative EI per span (engine docstring; docs/workbook.md: Members "Span EI"), each
    # finite and greater than zero (common practice: a beam with EI <= 0 has no stiffness).
    with pytest.raises(ValueError, match=_exactly(EI_MESSAGE)):
        influence_lines([30.0, 40.0], span_ei)


@pytest.mark.parametrize("n", [0, -2, 2.5, 0.5], ids=["zero", "negative", "2.5", "0.5"])
def test_bad_stations_per_span_are_refused(n: float) -> None:
    # docs/workbook.md, Settings: Stations per span is a whole number n >= 1.
    with pytest.raises(ValueError, match=_exactly(STATIONS_MESSAGE)):
        influence_lines([30.0], stations_per_span=n)  # type: ignore[arg-type]


@pytest.mark.parametrize("n", [2.0, np.int64(3)], ids=["float 2.0", "numpy int 3"])
def test_whole_stations_per_span_of_any_number_type_are_accepted(n: float) -> None:
    # docs/workbook.md, Settings: stations at 0, 1/n, ..., 1 of every span: n + 1 per span.
    il = influence_lines([30.0, 40.0], stations_per_span=n)  # type: ignore[arg-type]
    assert il.n_stations == 2 * (int(n) + 1)


@pytest.mark.parametrize("n", [NAN, INF], ids=["NaN", "infinite"])
def test_non_finite_stations_per_span_are_refused_clearly(n: float) -> None:
    # docs/workbook.md, Settings: Stations per span is a whole number n >= 1.
    with pytest.raises(ValueError, match=_exactly(STATIONS_MESSAGE)):
        influence_lines([30.0], stations_per_span=n)  # type: ignore[arg-type]


@pytest.mark.parametrize(
    "hinge",
    [0.0, 70.0, -5.0, 80.0, 1e-12 * 70.0, 70.0 * (1 - 1e-12)],
    ids=[
        "left end",
        "right end",
        "before the member",
        "beyond the member",
        "a hair in",
        "a hair in at the right",
    ],
)
def test_hinges_at_or_outside_the_ends_are_refused(hinge: float) -> None:
    # Engine docstring: hinges lie strictly inside the member. A moment release at a
    # pinned end releases nothing (common practice); within round-off of an end
    # (POSITION_TOL of the length) a hinge is at the end.
    with pytest.raises(ValueError, match=_exactly(HINGE_ENDS_MESSAGE)):
        influence_lines([30.0, 40.0], hinges=[hinge])


@pytest.mark.parametrize("hinge", [NAN, INF, -INF], ids=["NaN", "infinite", "minus infinite"])
def test_non_finite_hinges_are_refused(hinge: float) -> None:
    # A position is a finite number (common practice).
    with pytest.raises(ValueError, match=_exactly(HINGE_FINITE_MESSAGE)):
        influence_lines([50.0, 120.0, 50.0], hinges=[80.0, hinge])


@pytest.mark.parametrize(
    "hinges",
    [[80.0, 80.0], [140.0, 80.0, 80.0], [80.0, 80.0 + 1e-12 * 220.0]],
    ids=["twice", "twice, out of order", "within round-off"],
)
def test_duplicate_hinges_are_refused(hinges: list[float]) -> None:
    # One hinge is one moment release; the same place twice is a typing slip (common practice).
    with pytest.raises(ValueError, match=_exactly(HINGE_TWICE_MESSAGE)):
        influence_lines([50.0, 120.0, 50.0], hinges=hinges)


def _refused_plainly_or_in_equilibrium(spans: list[float], hinges: list[float]) -> None:
    """The layout (geometrically stable) is refused with a hinge message, or its lines
    obey statics: reaction ordinates sum to 1 and their moment about the left end is x."""
    try:
        il = influence_lines(spans, hinges=hinges, stations_per_span=4)
    except ValueError as refused:
        # Not a mechanism: every part rests on two supports or is held at both ends.
        assert type(refused) is ValueError, str(refused)
        assert "hinge" in str(refused), str(refused)
        return
    x = np.linspace(0.0, il.length, 601)
    r = il.evaluate(x)[il.reaction_rows]
    np.testing.assert_allclose(r.sum(axis=0), 1.0, rtol=0, atol=REL_TOL_EXACT)
    np.testing.assert_allclose(il.support_x @ r, x, rtol=0, atol=REL_TOL_EXACT * il.length)


@pytest.mark.parametrize("gap", [0.1, 0.01, 0.001, 1e-6])
def test_hinges_a_hair_apart_are_refused_or_kept_in_equilibrium(gap: float) -> None:
    # Statics (common practice): the link between the hinges is held at both ends by
    # parts on two supports each (r = 5 = 3 + 2, no three hinges in a row), so the
    # layout is stable and any unit load is carried by reactions summing to 1.
    _refused_plainly_or_in_equilibrium([100.0, 100.0, 100.0], [120.0 - gap, 120.0])


@pytest.mark.parametrize("gap", [1e-5, 1e-6])
def test_hinge_a_hair_from_a_support_is_refused_or_kept_in_equilibrium(gap: float) -> None:
    # Statics (common practice): span 1 stands on two supports, the rest hangs from it
    # and support C, so the layout is stable and the reactions sum to 1.
    _refused_plainly_or_in_equilibrium([100.0, 100.0], [100.0 + gap])


# --- axle trains ----------------------------------------------------------------------------


@pytest.fixture
def lines():
    """Influence lines of a two-span KVHA girder line, 30 and 40 ft."""
    return influence_lines([30.0, 40.0], stations_per_span=4)


@pytest.mark.parametrize(
    "loads", [[8.0, NAN], [INF, 32.0], [8.0, 32.0, -INF]], ids=["NaN", "infinite", "minus infinite"]
)
def test_non_finite_axle_loads_are_refused(lines, loads: list[float]) -> None:
    # An axle load is a finite force (common practice).
    spacing = [14.0] * (len(loads) - 1)
    with pytest.raises(ValueError, match=_exactly(LOADS_MESSAGE)):
        axle_extremes(lines, AxleTrain.of(loads, spacing))
    with pytest.raises(ValueError, match=_exactly(LOADS_MESSAGE)):
        fleet_extremes_of(
            lines, [LoadCase(label="", train=AxleTrain.of(tuple(loads), tuple(spacing)))]
        )


@pytest.mark.parametrize(
    ("loads", "low", "high"),
    [
        ([], [], None),
        ([8.0, 32.0], [], None),
        ([8.0, 32.0], [14.0, 14.0], None),
    ],
    ids=["no axles", "a gap without a spacing", "a spacing too many"],
)
def test_axle_and_spacing_counts_must_agree(lines, loads, low, high) -> None:
    # docs/workbook.md, Vehicles: one spacing per pair of consecutive axles.
    with pytest.raises(ValueError, match=_exactly(COUNT_MESSAGE)):
        axle_extremes(lines, AxleTrain.of(loads, low, high))


def test_a_train_cannot_hold_range_ends_short_of_its_gaps() -> None:
    # One Spacing (low, high) per gap: a train whose range ends miss gaps cannot be built.
    with pytest.raises(ValueError):
        AxleTrain.of([8.0, 32.0, 32.0], [14.0, 14.0], [30.0])


@pytest.mark.parametrize(
    ("low", "high"),
    [([NAN], None), ([-1.0], None), ([14.0], [NAN]), ([INF], None), ([-14.0], [14.0])],
    ids=["NaN", "negative", "NaN range end", "infinite", "range from below zero"],
)
def test_bad_spacings_are_refused(lines, low: list[float], high: list[float] | None) -> None:
    # A spacing is a finite distance, zero or more (zero: coincident axles; common practice).
    with pytest.raises(ValueError, match=_exactly(SPACING_MESSAGE)):
        axle_extremes(lines, AxleTrain.of([8.0, 32.0], low, high))


def test_inverted_spacing_ranges_are_refused_on_every_path(lines) -> None:
    # docs/workbook.md, Reading rules: a range 14-30 runs from low to high; 30-14 is
    # upside down.
    with pytest.raises(ValueError, match=_exactly(RANGE_MESSAGE)):
        axle_extremes(lines, AxleTrain.of([8.0, 32.0, 32.0], [14.0, 30.0], [14.0, 14.0]))
    train = LoadCase(label="", train=AxleTrain.of((8.0, 32.0, 32.0), (14.0, 30.0), (14.0, 14.0)))
    with pytest.raises(ValueError, match=_exactly(RANGE_MESSAGE)):
        fleet_extremes_of(lines, [train])
    case = LoadCase(label="KV-T3", train=train.train)
    with pytest.raises(ValueError, match=_exactly(RANGE_MESSAGE)):
        member_envelope(Member(id="KV-12 G1", spans=(30.0, 40.0)), [case])


@pytest.mark.parametrize(
    "directions",
    [(), (0,), (2,), (1, 0), ("both",)],
    ids=["none", "zero", "two", "one good one bad", "a word"],
)
def test_unknown_or_empty_directions_are_refused(lines, directions: tuple) -> None:
    # Engine docstring: +1 left to right, -1 right to left; a run needs at least one.
    with pytest.raises(ValueError, match=_exactly(DIRECTIONS_MESSAGE)):
        axle_extremes(lines, AxleTrain.of([8.0, 32.0], [14.0]), directions=directions)
    with pytest.raises(ValueError, match=_exactly(DIRECTIONS_MESSAGE)):
        fleet_extremes_of(
            lines, [LoadCase(label="", train=AxleTrain.of((8.0,)))], directions=directions
        )


@pytest.mark.parametrize("word", ["up", ""], ids=["unknown", "empty"])
def test_unknown_direction_words_are_refused_clearly(word: str) -> None:
    # docs/workbook.md, Settings: Directions is both, left-to-right or right-to-left.
    case = LoadCase(label="KV-T3", train=AxleTrain.of((10.0, 30.0), (14.0,)))
    with pytest.raises(ValueError, match="directions"):
        member_envelope(Member(id="KV-12 G1", spans=(30.0, 40.0)), [case], directions=word)


def test_more_than_max_ranges_ranged_spacings_are_refused(lines) -> None:
    # Engine docstring (moving.py): at most MAX_RANGES ranged spacings per vehicle,
    # as 3**n ways of fixing them are swept.
    loads = [10.0] * (MAX_RANGES + 2)
    low = [4.0] * (MAX_RANGES + 1)
    high = [6.0] * (MAX_RANGES + 1)
    message = _exactly(f"at most {MAX_RANGES} spacings of one vehicle may be ranges")
    with pytest.raises(ValueError, match=message):
        axle_extremes(lines, AxleTrain.of(loads, low, high))
    train = LoadCase(label="", train=AxleTrain.of(tuple(loads), tuple(low), tuple(high)))
    with pytest.raises(ValueError, match=message):
        fleet_extremes_of(lines, [train])
    # Exactly MAX_RANGES ranges are accepted.
    done = axle_extremes(lines, AxleTrain.of(loads[:-1], low[:-1], high[:-1]))
    assert np.all(done.max_value >= 0.0)


def test_unknown_load_case_scope_is_refused() -> None:
    # batch.loads.cases.SCOPES names every scope; anything else is refused.
    case = LoadCase(label="KV-T3", train=AxleTrain.of((10.0,)), scope="sagging")
    with pytest.raises(ValueError, match=_exactly("unknown load-case scope 'sagging'")):
        member_envelope(Member(id="KV-12 G1", spans=(30.0, 40.0)), [case])


@pytest.mark.parametrize("field", ["lane_load", "impact", "factor"])
@pytest.mark.parametrize("value", [NAN, INF], ids=["NaN", "infinite"])
def test_non_finite_lane_load_impact_or_factor_is_refused(field: str, value: float) -> None:
    # case_effects docstring: "Raises ValueError for a malformed member or case"; a
    # load, an allowance and a multiplier are finite numbers (common practice).
    case = LoadCase(label="KV-T3", train=AxleTrain.of((10.0, 30.0), (14.0,)), **{field: value})
    with pytest.raises(ValueError, match=field.replace("_", " ")):
        member_envelope(Member(id="KV-12 G1", spans=(30.0, 40.0)), [case], stations_per_span=2)


@pytest.mark.parametrize("field", ["df_moment", "df_shear"])
def test_non_finite_distribution_factor_is_refused(field: str) -> None:
    # case_effects docstring: "Raises ValueError for a malformed member"; docs/workbook.md,
    # Members: DF moment and DF shear multiply the effects (finite; common practice).
    member = Member(id="KV-12 G1", spans=(30.0, 40.0), **{field: NAN})
    case = LoadCase(label="KV-T3", train=AxleTrain.of((10.0, 30.0), (14.0,)))
    with pytest.raises(ValueError, match="distribution factor"):
        member_envelope(member, [case], stations_per_span=2)


def test_an_empty_list_of_load_cases_is_refused_clearly() -> None:
    # docs/workbook.md, Input sheets: a run needs at least one vehicle (the JSON Schema in
    # schemas/: minItems 1).
    with pytest.raises(ValueError, match="load case"):
        member_envelope(Member(id="KV-12 G1", spans=(30.0, 40.0)), [])
