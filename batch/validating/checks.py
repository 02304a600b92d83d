"""Checks of the input document that a JSON Schema cannot express.

The schema has already judged each value on its own (types, signs, choices);
here values are judged together: list lengths that must agree (one spacing per
gap between axles, one Span EI per span), hinges strictly inside the member
and not forming a mechanism, unique ids, library names and their exclusions,
the engine's limit on ranged spacings, and magnitudes against the one table of
limits, :data:`LIMITS` (past ``warn`` a warning, past ``refuse`` an error).
For rating: condition and system factors against the MBE's values, load
factors against the published ones, the screening reference, every
Capacities row against its member's spans and stations (:mod:`.capacities`),
the Bridges sheet, the members' bridges and the permits' kinds
(:mod:`.traffic`), and the inputs of the LRFR service checks (:mod:`.service`).

A field the reader could not read, or that failed the schema, is skipped here,
so one mistake gives one problem.
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from typing import Any

from batch.loads import library
from batch.loads.factors import (
    CAPACITY_FACTOR_VALUES,
    CONDITION_FACTORS,
    MIN_CAPACITY_FACTOR,
    PUBLISHED_FACTORS,
    SYSTEM_FACTORS,
)
from batch.model import UNIT_LABELS, UNIT_SYSTEMS, Settings
from batch.model.case import MAX_RANGES
from batch.model.layout import POSITION_TOL, mechanism_parts
from batch.reading.problems import DocPath, Locator, PathSet, Problem, Severity
from batch.validating.analysis import analysis_problems
from batch.validating.capacities import capacity_problems
from batch.validating.fields import finite_number, label, shown
from batch.validating.friendly import missing_axle_column, nearest_models, unit_mixups
from batch.validating.layout import layout_problems, with_layout
from batch.validating.segments import segment_problems
from batch.validating.service import service_problems
from batch.validating.traffic import traffic_problems

__all__ = ["LIMITS", "Limit", "check_document"]


@dataclass(frozen=True, kw_only=True)
class Limit:
    """Bounds on one kind of value: ``(US, SI)`` pairs, in the run's units.

    Past ``warn`` a value is implausible (a warning asks to check it); past
    ``refuse`` it is surely a mistake (an error). ``quantity`` names the unit.
    """

    what: str = ""
    quantity: str = ""
    warn: tuple[float, float] | None = None
    refuse: tuple[float, float] | None = None


#: Every magnitude limit, in one table. The plausible bounds are common practice:
#: the longest girder spans built are about 300 m, the heaviest permit axles a few
#: hundred kip; 75 % is the largest dynamic load allowance of AASHTO LRFD Table
#: 3.6.2.1-1 (deck joints). The refusals of distribution factors, vehicle factors and
#: dead loads keep a value typed in the wrong place (a weight in a factor's cell, 1e300)
#: from giving results that are finite but meaningless (common practice).
LIMITS: dict[str, Limit] = {
    "span": Limit(what="span length", quantity="length", warn=(1000, 300), refuse=(10000, 3000)),
    "spans": Limit(what="number of spans", refuse=(30, 30)),
    "hinges": Limit(what="number of hinges", refuse=(60, 60)),
    "axle": Limit(what="axle load", quantity="force", warn=(500, 2200), refuse=(5000, 22000)),
    "axles": Limit(what="number of axles", refuse=(80, 80)),
    "spacing": Limit(
        what="axle spacing", quantity="length", warn=(1000, 300), refuse=(10000, 3000)
    ),
    "lane_load": Limit(what="lane load", quantity="line_load", warn=(10, 150), refuse=(100, 1500)),
    "dead_load": Limit(what="dead load", quantity="line_load", warn=(30, 450), refuse=(300, 4500)),
    "df": Limit(what="distribution factor", warn=(2, 2), refuse=(100, 100)),
    "factor": Limit(what="vehicle factor", warn=(10, 10), refuse=(1000, 1000)),
    "impact": Limit(warn=(0.75, 0.75)),
}

#: The shortest span accepted, (US ft, SI m): a girder span shorter than a foot is a
#: typing or unit mistake (common practice).
MIN_SPAN = (1.0, 0.3)
#: The shortest span accepted as a fraction of the member's longest. Shorter spans make
#: the stiffness model lose precision: the engine's reactions to a unit load sum to 1
#: within 2e-14 at 1/100, 2e-13 at 1/1000, 2e-11 at 1/100,000 and not at all at 1e-12
#: (measured on 60-x-60 ft members), so below 1/1000 a result could lose more digits
#: than a rating reports; no real girder line has such spans (common practice).
MIN_SPAN_RATIO = 1e-3

#: The lowest condition factor (poor) and system factor (the least redundant members) of the
#: MBE's tables (batch/loads/factors.py), with the manual's values for the message.
LOWEST_CAPACITY_FACTORS = {
    "condition_factor": (
        min(v for _, v in CONDITION_FACTORS),
        CAPACITY_FACTOR_VALUES["condition_factor"],
    ),
    "system_factor": (min(v for _, v in SYSTEM_FACTORS), CAPACITY_FACTOR_VALUES["system_factor"]),
}

_Found = tuple[DocPath, str, str, Severity]


def _numbers(value: object) -> list[float] | None:
    if not isinstance(value, list):
        return None
    out = [finite_number(v) for v in value]
    return None if any(v is None for v in out) else [v for v in out if v is not None]


def _spacing(value: object) -> tuple[float, float] | None:
    if isinstance(value, dict):
        low, high = finite_number(value.get("low")), finite_number(value.get("high"))
        return None if low is None or high is None else (low, high)
    single = finite_number(value)
    return None if single is None else (single, single)


class _Context:
    """The document's unit system and which paths are already known to be wrong."""

    def __init__(self, units: str, bad: PathSet):
        self.units = units
        self.bad = bad

    def ok(self, path: DocPath) -> bool:
        return not self.bad.touches(path)

    def unit(self, limit: Limit) -> str:
        return f" {UNIT_LABELS[self.units][limit.quantity]}" if limit.quantity else ""

    def bound(self, pair: tuple[float, float] | None) -> float | None:
        return None if pair is None else pair[UNIT_SYSTEMS.index(self.units)]

    def magnitude(self, path: DocPath, key: str, value: float) -> Iterator[_Found]:
        """A problem when ``value`` is past the limits of ``LIMITS[key]``."""
        limit = LIMITS[key]
        refuse, warn = self.bound(limit.refuse), self.bound(limit.warn)
        unit = self.unit(limit)
        what = f"{limit.what} " if limit.what else ""
        fix = "check the value and the Units setting" if limit.quantity else "check the value"
        if refuse is not None and value > refuse:
            yield (
                path,
                "limit-exceeded",
                f"{label(path)}: {what}{shown(value)}{unit} is more than "
                f"{shown(refuse)}{unit}, the most spanfleet accepts; {fix}",
                "error",
            )
        elif warn is not None and value > warn:
            yield (
                path,
                "implausible-value",
                f"{label(path)}: {what}{shown(value)}{unit} is more than "
                f"{shown(warn)}{unit}; {fix}",
                "warning",
            )


_Check = Callable[[dict[str, Any], DocPath, _Context], Iterator[_Found]]


def _member(m: dict[str, Any], at: DocPath, cx: _Context) -> Iterator[_Found]:
    spans = _numbers(m.get("spans")) if cx.ok((*at, "spans")) else None
    hinges = _numbers(m.get("hinges", [])) if cx.ok((*at, "hinges")) else None
    for key in ("df_moment", "df_shear", "df_moment_single", "df_shear_single"):
        value = finite_number(m.get(key))
        if value is not None and cx.ok((*at, key)):
            yield from cx.magnitude((*at, key), "df", value)
    for key in ("dc_load", "dw_load"):
        value = finite_number(m.get(key))
        if value is not None and cx.ok((*at, key)):
            yield from cx.magnitude((*at, key), "dead_load", value)
    yield from _capacity_factors(m, at, cx)
    if spans is None:
        return
    sp = (*at, "spans")
    found = [*cx.magnitude(sp, "spans", len(spans))]
    found += [f for s in sorted(spans, reverse=True)[:1] for f in cx.magnitude(sp, "span", s)]
    yield from found
    if any(f[3] == "error" for f in found):
        return
    ei = _numbers(m.get("span_ei")) if cx.ok((*at, "span_ei")) else None
    if ei is not None and len(ei) != len(spans):
        yield (
            (*at, "span_ei"),
            "count-mismatch",
            f"Span EI has {len(ei)} value{'s' if len(ei) != 1 else ''} but the member has "
            f"{len(spans)} span{'s' if len(spans) != 1 else ''}; give one "
            "relative EI per span, or leave it empty for all 1",
            "error",
        )
    short = [*_short_spans(spans, sp, cx)]
    yield from short
    if hinges and not short:
        yield from _hinges(spans, hinges, (*at, "hinges"), cx)


def _short_spans(spans: list[float], at: DocPath, cx: _Context) -> Iterator[_Found]:
    """A span shorter than :data:`MIN_SPAN`, or than :data:`MIN_SPAN_RATIO` of the longest."""
    unit = UNIT_LABELS[cx.units]["length"]
    least = cx.bound(MIN_SPAN)
    shortest, longest = min(spans), max(spans)
    if least is not None and shortest < least:
        yield (
            at,
            "span-too-short",
            f"Spans: a span of {shown(shortest)} {unit} is shorter than {shown(least)} {unit}, "
            "the least spanfleet accepts; check the value, the Units setting and the "
            "separators (a decimal point, and a comma and a space between spans)",
            "error",
        )
    elif shortest < MIN_SPAN_RATIO * longest:
        yield (
            at,
            "span-too-short",
            f"Spans: a span of {shown(shortest)} {unit} is less than {shown(MIN_SPAN_RATIO)} "
            f"of the longest ({shown(longest)} {unit}), too short for the stiffness model "
            "to keep its precision; check the value (two supports that close act as one: "
            "leave the short span out)",
            "error",
        )


def _capacity_factors(m: dict[str, Any], at: DocPath, cx: _Context) -> Iterator[_Found]:
    """Condition and system factors: each within the MBE's values, their product floored."""
    values = {}
    for key, (lowest, published) in LOWEST_CAPACITY_FACTORS.items():
        value = finite_number(m.get(key, 1.0))
        if value is None or not cx.ok((*at, key)):
            return
        if value < lowest:
            yield (
                (*at, key),
                "factor-below-published",
                f"{label((*at, key))}: {shown(value)} is below {shown(lowest)}, the lowest the "
                f"MBE gives ({published}); give a value from {shown(lowest)} to 1",
                "error",
            )
            return
        values[key] = value
    product = values["condition_factor"] * values["system_factor"]
    if product < MIN_CAPACITY_FACTOR:
        yield (
            (*at, "condition_factor"),
            "low-capacity-factors",
            f"Condition factor × System factor = {product:.4g}, below the {MIN_CAPACITY_FACTOR} "
            f"floor of the MBE (6A.4.2.1); the rating uses {MIN_CAPACITY_FACTOR} for flexure "
            "(shear uses the condition factor alone); check both factors",
            "warning",
        )


def _settings(settings: dict[str, Any], vehicles: list[Any], cx: _Context) -> Iterator[_Found]:
    """The dynamic load allowance, rating load factors and the screening reference."""
    impact = finite_number(settings.get("impact"))
    if impact is not None and cx.ok(("settings", "impact")):
        yield from cx.magnitude(("settings", "impact"), "impact", impact)
    for key, (low, high) in PUBLISHED_FACTORS.items():
        path = ("settings", key)
        value = finite_number(settings.get(key))
        if value is None or not cx.ok(path) or low - 1e-9 <= value <= high + 1e-9:
            continue
        published = shown(low) if low == high else f"{shown(low)} to {shown(high)}"
        yield (
            path,
            "unpublished-factor",
            f"{label(path)}: {shown(value)} is not the published value ({published}); it is "
            "used as given: check it against the MBE edition you rate to and the owner's rules",
            "warning",
        )
    name = settings.get("reference_vehicle")
    path = ("settings", "reference_vehicle")
    if not isinstance(name, str) or not name.strip() or not cx.ok(path):
        return
    ids = {str(v.get("id", "")).strip().casefold() for v in vehicles if isinstance(v, dict)}
    if name.strip().casefold() not in ids and not _library_known(name):
        yield (
            path,
            "unknown-reference",
            f"Reference vehicle: {name.strip()!r} is neither a vehicle of the Vehicles sheet "
            "nor a built-in load model; give a Vehicle id or a library name such as HL-93, "
            "or leave it blank for no screening",
            "error",
        )


def _hinges(spans: list[float], hinges: list[float], at: DocPath, cx: _Context) -> Iterator[_Found]:
    count = [*cx.magnitude(at, "hinges", len(hinges))]
    if count:
        yield from count
        return
    length = math.fsum(spans)
    tol = POSITION_TOL * length
    unit = UNIT_LABELS[cx.units]["length"]
    outside = [h for h in hinges if h <= tol or h >= length - tol]
    if outside:
        yield (
            at,
            "hinge-outside-member",
            f"Hinges: {shown(outside[0])} is not strictly inside the member (0 to "
            f"{shown(length)} {unit}); a hinge at or beyond an end does nothing: remove it, "
            "or measure hinges from the member's left end",
            "error",
        )
        return
    ordered = sorted(hinges)
    twice = [b for a, b in itertools.pairwise(ordered) if b - a <= tol]
    if twice:
        yield (
            at,
            "duplicate-hinge",
            f"Hinges: {shown(twice[0])} is listed twice; list each hinge once",
            "error",
        )
        return
    moving = mechanism_parts(spans, hinges)
    if moving:
        where = " and ".join(f"the part from {shown(a)} to {shown(b)} {unit}" for a, b in moving)
        yield (
            at,
            "mechanism",
            f"the hinges make the member a mechanism: {where} can move without resistance; "
            "remove a hinge or move it so that every part between hinges rests on two "
            "supports, or on one support and a neighbouring part",
            "error",
        )


def _library_known(name: str) -> bool:
    try:
        library.model(name)
    except KeyError:
        return False
    return True


def _vehicle(v: dict[str, Any], at: DocPath, cx: _Context) -> Iterator[_Found]:
    name = v.get("library")
    has = {
        k: k in v or not cx.ok((*at, k))
        for k in ("axle_loads", "spacings", "lane_load", "impact_rule")
    }
    # A lane load of 0 says "no lane load of my own", which a library row may say too.
    has["lane_load"] = has["lane_load"] and finite_number(v.get("lane_load")) != 0
    if isinstance(name, str) and cx.ok((*at, "library")):
        yield from _library(name, has, at)
        return
    if not has["axle_loads"]:
        yield (
            (*at, "axle_loads"),
            "no-axle-loads",
            "the vehicle has no axle loads and no Library name; give its axle loads, front "
            "axle first, or the name of a built-in load model in Library (a lane load alone "
            "is not a vehicle: give its concentrated load as an axle)",
            "error",
        )
    axles = _numbers(v.get("axle_loads")) if cx.ok((*at, "axle_loads")) else None
    if axles is not None:
        ap = (*at, "axle_loads")
        found = [*cx.magnitude(ap, "axles", len(axles))]
        found += [f for a in sorted(axles, reverse=True)[:1] for f in cx.magnitude(ap, "axle", a)]
        yield from found
    if cx.ok((*at, "spacings")):
        yield from _spacings(v.get("spacings", []), axles, (*at, "spacings"), cx)
    for key, limit in (("lane_load", "lane_load"), ("factor", "factor")):
        value = finite_number(v.get(key))
        if value is not None and cx.ok((*at, key)):
            yield from cx.magnitude((*at, key), limit, value)


def _library(name: str, has: dict[str, bool], at: DocPath) -> Iterator[_Found]:
    if has["axle_loads"] or has["spacings"]:
        key = "axle_loads" if has["axle_loads"] else "spacings"
        yield (
            (*at, key),
            "library-with-axles",
            f"the row names the library model {name!r} and also gives {label((*at, key))}; "
            "clear Axle loads and Axle spacings to use the library model, or clear Library "
            "to use your own axles",
            "error",
        )
    if has["lane_load"]:
        yield (
            (*at, "lane_load"),
            "library-with-lane-load",
            f"the library model {name!r} sets its own lane loading (if it has one), so this "
            "Lane load would be ignored; clear it, or give your own axles instead of a "
            "Library name",
            "error",
        )
    if has["impact_rule"]:
        yield (
            (*at, "impact_rule"),
            "library-with-impact",
            f"the library model {name!r} sets its own impact, so this Impact would be "
            "ignored; clear it, or give your own axles instead of a Library name",
            "error",
        )
    if not _library_known(name):
        names = library.names()
        listed = (
            f"the built-in models are: {', '.join(names)}"
            if names
            else "the built-in library is empty in this version: give the axle loads and "
            "spacings instead"
        )
        near = nearest_models(name)
        hint = f"did you mean {' or '.join(near)}? " if near else ""
        yield (
            (*at, "library"),
            "unknown-library",
            f"{name!r} is not a built-in load model; {hint}{listed}",
            "error",
        )


def _library_rows(document: dict[str, Any], cx: _Context) -> Iterator[tuple[DocPath, str]]:
    """(path, model name) of every readable Vehicles row that names a built-in model."""
    vehicles = document.get("vehicles")
    for i, v in enumerate(vehicles if isinstance(vehicles, list) else []):
        at: DocPath = ("vehicles", i, "library")
        name = v.get("library") if isinstance(v, dict) else None
        if isinstance(name, str) and cx.ok(at) and _library_known(name):
            yield at, name


def _library_needs(
    document: dict[str, Any], settings: dict[str, Any], rated: bool, cx: _Context
) -> Iterator[_Found]:
    """What the fleet's library models need of the rest of the input, and their cautions.

    A fatigue load needs every member's single-lane distribution factors (one
    error at the first member without them); a model with a caution gets it as
    a warning on its row when the run rates (there are Capacities or Service rows).
    """
    rows = list(_library_rows(document, cx))
    reference = settings.get("reference_vehicle")
    vehicles = document.get("vehicles")
    ids = {
        str(v.get("id", "")).strip().casefold()
        for v in (vehicles if isinstance(vehicles, list) else [])
        if isinstance(v, dict)
    }
    if isinstance(reference, str) and reference.strip() and _library_known(reference):
        if reference.strip().casefold() not in ids and cx.ok(("settings", "reference_vehicle")):
            rows.append((("settings", "reference_vehicle"), reference))
    fatigue = next((name for _, name in rows if library.model(name).fatigue), None)
    members = document.get("members")
    if fatigue is not None and isinstance(members, list):
        keys = ("df_moment_single", "df_shear_single")
        laid_out = with_layout(document)
        lacking = [
            (i, key)
            for i, m in enumerate(members)
            if isinstance(m, dict) and str(m.get("id", "")).strip().casefold() not in laid_out
            for key in keys
            if key not in m and cx.ok(("members", i, key))
        ]
        if lacking:
            i, key = lacking[0]
            count = len({i for i, _ in lacking})
            others = f" ({count - 1} more members lack them too)" if count > 1 else ""
            yield (
                ("members", i, key),
                "fatigue-needs-single-lane-df",
                f"the fatigue load {fatigue!r} uses each member's single-lane distribution "
                f"factors, and this member has no {label(('members', i, key))}{others}; give "
                "DF moment single lane and DF shear single lane as tabulated (with the "
                "one-lane multiple presence factor 1.2, which spanfleet divides out), or take "
                "the fatigue load out of the fleet",
                "error",
            )
    if rated:
        for at, name in rows:
            caution = library.model(name).caution
            if caution and at[0] == "vehicles":
                yield (at, "library-caution", f"{library.model(name).name}: {caution}", "warning")


def _spacings(
    value: object, axles: list[float] | None, at: DocPath, cx: _Context
) -> Iterator[_Found]:
    items = value if isinstance(value, list) else []
    gaps = [_spacing(s) for s in items]
    if any(g is None for g in gaps):
        return
    pairs = [g for g in gaps if g is not None]
    if axles is not None and len(pairs) != len(axles) - 1:
        need = len(axles) - 1
        yield (
            at,
            "count-mismatch",
            f"{len(axles)} axles need {need} spacing{'s' if need != 1 else ''}, but Axle "
            f"spacings has {len(pairs)}; give one distance per gap between consecutive axles",
            "error",
        )
    for j, (low, high) in enumerate(pairs):
        if low > high:
            yield (
                (*at, j),
                "inverted-range",
                f"entry {j + 1} of Axle spacings runs backwards ({shown(low)} to "
                f"{shown(high)}); give the smaller spacing as low",
                "error",
            )
    ranged = sum(1 for low, high in pairs if high > low)
    if ranged > MAX_RANGES:
        yield (
            at,
            "too-many-ranges",
            f"{ranged} spacings are ranges, but at most {MAX_RANGES} of one vehicle may be; "
            "fix the others at one value",
            "error",
        )
    if pairs:
        yield from cx.magnitude(at, "spacing", max(high for _, high in pairs))


def _duplicates(rows: list[Any], key: str, locator: Locator) -> Iterator[_Found]:
    first: dict[str, DocPath] = {}
    for i, row in enumerate(rows):
        ident = row.get("id") if isinstance(row, dict) else None
        if not isinstance(ident, str) or not ident.strip():
            continue
        folded = ident.strip().casefold()
        if folded in first:
            sheet, cell = locator.where(first[folded])
            noun = "member" if key == "members" else "vehicle"
            yield (
                (key, i, "id"),
                "duplicate-id",
                f"{label((key, i, 'id'))} {ident.strip()!r} is used twice (also in "
                f"{cell or sheet}; ids are compared ignoring case and outer spaces); give "
                f"every {noun} its own id",
                "error",
            )
        else:
            first[folded] = (key, i, "id")


def _friendly(document: dict[str, Any], found: list[_Found], cx: _Context) -> list[_Found]:
    """``found`` with what was probably meant (:mod:`batch.validating.friendly`)."""
    warn_above = {
        key: cx.bound(LIMITS[limit].warn) or math.inf
        for key, limit in (("axle_loads", "axle"), ("lane_load", "lane_load"), ("spans", "span"))
    }
    vehicles = document.get("vehicles")
    rows = vehicles if isinstance(vehicles, list) else []
    found = missing_axle_column(rows, found, UNIT_LABELS[cx.units]["force"])
    return [*found, *unit_mixups(document, cx.units, cx.ok, warn_above)]


def check_document(
    document: object, locator: Locator, bad: PathSet | None = None
) -> list[tuple[DocPath, Problem]]:
    """Every cross-field problem of ``document`` as (document path, problem), both severities.

    ``bad`` holds the paths already reported (unreadable or failing the
    schema); fields at, under or above them are skipped.
    """
    if not isinstance(document, dict):
        return []
    settings = document.get("settings")
    settings = settings if isinstance(settings, dict) else {}
    units = settings.get("units", Settings().units)
    cx = _Context(units if units in UNIT_SYSTEMS else Settings().units, bad or PathSet())
    found: list[_Found] = []
    vehicles = document.get("vehicles")
    found += _settings(settings, vehicles if isinstance(vehicles, list) else [], cx)
    sections: tuple[tuple[str, _Check], ...] = (("members", _member), ("vehicles", _vehicle))
    for key, check in sections:
        rows = document.get(key)
        if not isinstance(rows, list):
            continue
        found += _duplicates(rows, key, locator)
        for i, row in enumerate(rows):
            if isinstance(row, dict):
                found += check(row, (key, i), cx)
    found = _friendly(document, found, cx)
    capacities = document.get("capacities")
    if isinstance(capacities, list):
        found += capacity_problems(capacities, document, locator, cx.ok)
    service = document.get("service")
    if isinstance(service, list):
        found += capacity_problems(service, document, locator, cx.ok, "service")
    # Members as built: stiffness along a member (Segments), a member's own analysis.
    segments = document.get("segments")
    if isinstance(segments, list):
        found += segment_problems(segments, document, cx.ok, UNIT_LABELS[cx.units]["length"])
    analysis = document.get("analysis")
    if isinstance(analysis, list):
        found += analysis_problems(analysis, document, locator, cx.ok)
    layout = document.get("layout")
    if isinstance(layout, list):
        found += layout_problems(
            layout, document, locator, cx.ok, "SI" if cx.units == "SI" else "US"
        )
    found += _library_needs(document, settings, bool(capacities or service), cx)
    found += traffic_problems(document, locator, cx.ok)
    found += service_problems(document, locator, cx.ok)
    out = []
    for path, code, message, severity in found:
        sheet, cell = locator.where(path)
        problem = Problem(code=code, sheet=sheet, cell=cell, message=message, severity=severity)
        out.append((path, problem))
    return out
