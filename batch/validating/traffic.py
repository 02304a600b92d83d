"""Checks of the per-bridge traffic and per-vehicle crossings that a schema cannot express.

* Bridges: ids unique (ignoring case and outer spaces); a bridge's own load factors
  away from the published values warn, as the Settings' do; a blank ADTT warns
  that the MBE tables' conservative values are used, where the fleet has legal
  loads or typed permits.
* Members: a Bridge must name a row of the Bridges sheet.
* Vehicles: a Permit type only on a permit; Crawl speed only on a single-trip
  escorted permit (MBE 6A.4.5.5).
* A rated member without single-lane distribution factors, in a fleet with special
  permits, warns that those permits take its multi-lane factors.
* Rating methods: a Capacities row of an ASR member gives the operating allowable
  beside every inventory one it gives (Operating M+, M-, V); the operating columns
  belong to ASR members only.

The schema has already judged each value on its own; a field it rejected is skipped.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import Any

from batch.loads import library
from batch.loads.factors import (
    LEGAL_LIVE_LOAD,
    PERMIT_LIVE_LOAD,
    PUBLISHED_FACTORS,
)
from batch.reading.problems import DocPath, Locator, Severity
from batch.validating.fields import label, shown
from batch.validating.layout import with_layout

__all__ = ["traffic_problems"]

Found = tuple[DocPath, str, str, Severity]


def _rows(document: dict[str, Any], key: str) -> list[tuple[int, dict[str, Any]]]:
    rows = document.get(key)
    return [
        (i, r) for i, r in enumerate(rows if isinstance(rows, list) else []) if isinstance(r, dict)
    ]


def _category(vehicle: dict[str, Any]) -> object:
    """The vehicle's category as the run will take it (a library row's blank: the model's)."""
    if "category" in vehicle:
        return vehicle["category"]
    name = vehicle.get("library")
    try:
        return library.model(name).category if isinstance(name, str) else "design"
    except KeyError:
        return None


def _ident(row: dict[str, Any]) -> str | None:
    ident = row.get("id")
    return ident.strip() if isinstance(ident, str) and ident.strip() else None


def traffic_problems(
    document: dict[str, Any], locator: Locator, ok: Callable[[DocPath], bool]
) -> Iterator[Found]:
    """Every cross-field problem of the Bridges sheet, Bridge column, permits (both severities)."""
    vehicles = _rows(document, "vehicles")
    yield from _vehicle_problems(vehicles, ok)
    bridges = _rows(document, "bridges")
    yield from _bridge_rows(bridges, vehicles, locator, ok)
    known = {ident.casefold() for _, b in bridges if (ident := _ident(b)) is not None}
    members = _rows(document, "members")
    for i, member in members:
        at = ("members", i, "bridge")
        name = member.get("bridge")
        if isinstance(name, str) and ok(at) and name.strip().casefold() not in known:
            listed = (
                "the Bridges sheet has no rows" if not known else "it is not on the Bridges sheet"
            )
            yield (
                at,
                "unknown-bridge",
                f"Bridge {name.strip()!r}: {listed}; add the bridge there (Bridge, ADTT, "
                "Riding surface), or leave this cell blank to rate with the Settings' factors",
                "error",
            )
    yield from _single_lane_warnings(document, members, vehicles, ok)
    yield from _method_problems(document, members, ok)


def _vehicle_problems(
    vehicles: list[tuple[int, dict[str, Any]]], ok: Callable[[DocPath], bool]
) -> Iterator[Found]:
    for i, v in vehicles:
        kind = v.get("permit_type")
        at = ("vehicles", i, "permit_type")
        category = _category(v)
        if kind is not None and ok(at) and category is not None and category != "permit":
            yield (
                at,
                "permit-type-not-permit",
                f"Permit type {shown(kind)} is given for a {category} load; give a Permit type "
                "only for vehicles of Category permit, or set Category to permit",
                "error",
            )
        crawl = ("vehicles", i, "crawl")
        if v.get("crawl") == "yes" and ok(crawl) and kind != "single-trip escorted" and ok(at):
            yield (
                crawl,
                "crawl-not-escorted",
                "Crawl speed yes: the MBE (6A.4.5.5) allows no dynamic load allowance only for "
                "an escorted permit at crawl speed; set Permit type to single-trip escorted, or "
                "Crawl speed to no",
                "error",
            )


def _needs_adtt(vehicles: list[tuple[int, dict[str, Any]]]) -> bool:
    """Whether any vehicle's factor comes from an ADTT table (legal loads, most permits)."""
    for _, v in vehicles:
        kind = v.get("permit_type")
        if _category(v) == "legal" or (kind in PERMIT_LIVE_LOAD and kind != "single-trip escorted"):
            return True
    return False


def _bridge_rows(
    bridges: list[tuple[int, dict[str, Any]]],
    vehicles: list[tuple[int, dict[str, Any]]],
    locator: Locator,
    ok: Callable[[DocPath], bool],
) -> Iterator[Found]:
    """Problems of the Bridges rows: duplicate ids, no ADTT, unpublished own factors."""
    first: dict[str, DocPath] = {}
    needs_adtt = _needs_adtt(vehicles)
    for i, row in bridges:
        ident = _ident(row)
        at: DocPath = ("bridges", i)
        if ident is not None and ok((*at, "id")):
            if ident.casefold() in first:
                _, cell = locator.where(first[ident.casefold()])
                yield (
                    (*at, "id"),
                    "duplicate-id",
                    f"Bridge {ident!r} is used twice (also in {cell or 'Bridges'}; ids are "
                    "compared ignoring case and outer spaces); give every bridge its own id",
                    "error",
                )
            else:
                first[ident.casefold()] = (*at, "id")
        if needs_adtt and "adtt" not in row and ok((*at, "adtt")):
            yield (
                (*at, "adtt"),
                "no-adtt",
                f"Bridge {ident or ''!r} has no ADTT, so its legal loads take the MBE table's "
                f"conservative live-load factor {LEGAL_LIVE_LOAD.unknown:.2f} and its permits "
                "the ADTT > 5000 values; give the ADTT (trucks a day, one direction) if known",
                "warning",
            )
        for key, (low, high) in PUBLISHED_FACTORS.items():
            value = row.get(key)
            path = (*at, key)
            if not isinstance(value, int | float) or not ok(path):
                continue
            if low - 1e-9 <= value <= high + 1e-9:
                continue
            published = shown(low) if low == high else f"{shown(low)} to {shown(high)}"
            yield (
                path,
                "unpublished-factor",
                f"{label(path)}: {shown(value)} is not the published value ({published}); it is "
                "used for this bridge as given: check it against the owner's rules",
                "warning",
            )


def _single_lane_warnings(
    document: dict[str, Any],
    members: list[tuple[int, dict[str, Any]]],
    vehicles: list[tuple[int, dict[str, Any]]],
    ok: Callable[[DocPath], bool],
) -> Iterator[Found]:
    """Once per rated member without one-lane DFs, when the fleet has special permits."""
    special = any(
        kind in PERMIT_LIVE_LOAD and PERMIT_LIVE_LOAD[kind].one_lane
        for kind in (v.get("permit_type") for _, v in vehicles)
    )
    if not special:
        return
    rated = {
        c["member"].strip().casefold()
        for _, c in _rows(document, "capacities")
        if isinstance(c.get("member"), str)
    }
    laid_out = with_layout(document)
    for i, member in members:
        ident = _ident(member)
        if ident is None or ident.casefold() not in rated or ident.casefold() in laid_out:
            continue
        if member.get("rating_method", "LRFR") != "LRFR":  # LFR and ASR: multi-lane DFs
            continue
        missing = [k for k in ("df_moment_single", "df_shear_single") if k not in member]
        at = ("members", i, missing[0] if missing else "df_moment_single")
        if missing and ok(at):
            yield (
                at,
                "no-single-lane-df",
                f"member {ident!r} has no {label(at)}, so its special permits (single-trip and "
                "multiple-trip) are rated with the multi-lane DF instead of the one-lane DF the "
                "MBE asks for (6A.4.5.4.2); give the one-lane DFs as AASHTO LRFD gives them",
                "warning",
            )


_OPERATING = (
    ("resistance_m_pos", "operating_m_pos"),
    ("resistance_m_neg", "operating_m_neg"),
    ("resistance_v", "operating_v"),
)


def _method_problems(
    document: dict[str, Any],
    members: list[tuple[int, dict[str, Any]]],
    ok: Callable[[DocPath], bool],
) -> Iterator[Found]:
    """ASR rows give an operating capacity beside each inventory one; others give none."""
    methods = {
        ident.casefold(): m.get("rating_method", "LRFR")
        for _, m in members
        if (ident := _ident(m)) is not None
    }
    for i, row in _rows(document, "capacities"):
        name = row.get("member")
        if not isinstance(name, str) or name.strip().casefold() not in methods:
            continue
        asr = methods[name.strip().casefold()] == "ASR"
        for inventory, operating in _OPERATING:
            at: DocPath = ("capacities", i, operating)
            if not ok(at) or not ok(("capacities", i, inventory)):
                continue
            if asr and inventory in row and operating not in row:
                yield (
                    at,
                    "no-operating-capacity",
                    f"member {name.strip()!r} is rated by ASR, and its operating level needs its "
                    f"own allowable; give {label(at)} beside {label(('capacities', i, inventory))}"
                    " (the inventory allowable), or rate the member by LRFR or LFR",
                    "error",
                )
            elif not asr and operating in row:
                yield (
                    at,
                    "operating-not-asr",
                    f"{label(at)} is for members rated by ASR, and member {name.strip()!r} is "
                    "not; leave it blank, or set the member's Rating method to ASR",
                    "error",
                )
