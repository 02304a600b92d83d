"""Checks of the LRFR service-limit-state inputs that a JSON Schema cannot express.

A Capacities row turns its member's service check on by giving ``S nc``
(:mod:`batch.rating.lrfr`); then:

* the member is rated by LRFR and has a Material whose service limit state the MBE
  names (steel, prestressed concrete, reinforced concrete);
* steel and reinforced concrete give Fy or their own Allowable stress, not both;
* prestressed concrete gives its Allowable stress (the allowable tension) and its
  Prestress stress, is checked in M+ (tension at the bottom fibre under sagging) and
  takes no Fy;
* Rh belongs to steel, Prestress stress to prestressed concrete.

A row that gives any other service input without ``S nc`` is told to give it. The
schema has already judged each value on its own; a field it rejected is skipped.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import Any

from batch.reading.problems import DocPath, Locator, Severity
from batch.validating.fields import label

__all__ = ["service_problems"]

Found = tuple[DocPath, str, str, Severity]

#: The Capacities columns of a service check besides S nc.
_INPUTS = ("service_effect", "s_lt", "s_st", "fy", "rh", "allowable_stress", "prestress_stress")
_GIVE_MATERIAL = "steel, prestressed concrete or reinforced concrete"


def _members(document: dict[str, Any]) -> dict[str, tuple[int, dict[str, Any]]]:
    rows = document.get("members")
    found: dict[str, tuple[int, dict[str, Any]]] = {}
    for i, m in enumerate(rows if isinstance(rows, list) else []):
        ident = m.get("id") if isinstance(m, dict) else None
        if isinstance(ident, str) and ident.strip():
            found.setdefault(ident.strip().casefold(), (i, m))
    return found


def service_problems(
    document: dict[str, Any], locator: Locator, ok: Callable[[DocPath], bool]
) -> Iterator[Found]:
    """Every cross-field problem of the service inputs (``ok(path)``: not yet reported)."""
    members = _members(document)
    rows = document.get("capacities")
    for i, row in enumerate(rows if isinstance(rows, list) else []):
        if not isinstance(row, dict):
            continue
        at: DocPath = ("capacities", i)
        if "s_nc" not in row:
            for key in _INPUTS:
                if key in row and ok((*at, key)) and ok((*at, "s_nc")):
                    yield (
                        (*at, key),
                        "service-without-s-nc",
                        f"{label((*at, key))} belongs to a service check, which S nc turns "
                        "on; give S nc (the non-composite section modulus at the checked "
                        f"fibre), or leave {label((*at, key))} blank",
                        "error",
                    )
            continue
        name = row.get("member")
        if not ok((*at, "s_nc")) or not isinstance(name, str):
            continue
        found = members.get(name.strip().casefold())
        if found is not None:
            yield from _row_problems(row, at, name.strip(), *found, locator, ok)


def _row_problems(
    row: dict[str, Any],
    at: DocPath,
    ident: str,
    index: int,
    member: dict[str, Any],
    locator: Locator,
    ok: Callable[[DocPath], bool],
) -> Iterator[Found]:
    """The problems of one Capacities row that gives S nc, against its member."""
    method = member.get("rating_method", "LRFR")
    material = member.get("material", "other")
    where = " ".join(x for x in locator.where(("members", index, "id")) if x)
    if method != "LRFR" and ok(("members", index, "rating_method")):
        yield (
            (*at, "s_nc"),
            "service-not-lrfr",
            f"S nc asks for a service check, and member {ident!r} is rated by {method}; the "
            "service limit states are those of LRFR (MBE Section 6A): leave S nc blank, or set "
            f"the member's Rating method to LRFR ({where})",
            "error",
        )
        return
    if material == "other" and ok(("members", index, "material")):
        yield (
            (*at, "s_nc"),
            "service-no-material",
            f"S nc asks for a service check, and member {ident!r} has Material other, for "
            f"which the MBE names no service limit state; set its Material ({where}) to "
            f"{_GIVE_MATERIAL}, or leave S nc blank",
            "error",
        )
        return
    if not ok(("members", index, "material")):
        return
    given = {key for key in _INPUTS if key in row}
    if material == "prestressed concrete":
        yield from _prestressed(given, row, at, ident)
    else:
        yield from _yield_limited(given, at, ident, material)
    if "rh" in given and material != "steel":
        yield _not_for(at, "rh", ident, material, "steel (the hybrid factor)")
    if "prestress_stress" in given and material != "prestressed concrete":
        yield _not_for(at, "prestress_stress", ident, material, "prestressed concrete")


def _not_for(at: DocPath, key: str, ident: str, material: str, owner: str) -> Found:
    return (
        (*at, key),
        "service-input-not-for-material",
        f"{label((*at, key))} is for {owner}, and member {ident!r} is {material}; leave it "
        "blank, or correct the member's Material",
        "error",
    )


def _prestressed(given: set[str], row: dict[str, Any], at: DocPath, ident: str) -> Iterator[Found]:
    """Prestressed concrete: the allowable tension and the prestress; M+ only; no Fy."""
    if "allowable_stress" not in given:
        yield (
            (*at, "allowable_stress"),
            "service-no-allowable",
            f"member {ident!r} is prestressed concrete, whose Service III check needs the "
            "allowable tension at the checked fibre; give Allowable stress as a positive "
            "magnitude, e.g. 0.19 sqrt(f'c) ksi (AASHTO LRFD Table 5.9.2.3.2b-1; the engineer "
            "chooses the limit for the exposure)",
            "error",
        )
    if "prestress_stress" not in given:
        yield (
            (*at, "prestress_stress"),
            "service-no-prestress",
            f"member {ident!r} is prestressed concrete; give Prestress stress, the compression "
            "the effective prestress (after losses) gives at the checked fibre, a positive "
            "magnitude (0 for none)",
            "error",
        )
    if row.get("service_effect") == "M-":
        yield (
            (*at, "service_effect"),
            "service-prestressed-hogging",
            f"member {ident!r} is prestressed concrete, checked at Service III for tension at "
            "the bottom fibre under sagging moment; set Service effect to M+ (or leave it "
            "blank)",
            "error",
        )
    if "fy" in given:
        yield _not_for(at, "fy", ident, "prestressed concrete", "steel and reinforced concrete")


def _yield_limited(given: set[str], at: DocPath, ident: str, material: str) -> Iterator[Found]:
    """Steel and reinforced concrete: Fy or the engineer's Allowable stress, one of them."""
    if "fy" not in given and "allowable_stress" not in given:
        limit = "0.95 or 0.80 Rh Fy" if material == "steel" else "0.9 fy"
        yield (
            (*at, "fy"),
            "service-no-limit",
            f"member {ident!r} is {material}, and its service check needs a stress limit; "
            f"give Fy (spanfleet uses {limit}), or your own Allowable stress",
            "error",
        )
    elif "fy" in given and "allowable_stress" in given:
        yield (
            (*at, "allowable_stress"),
            "service-two-limits",
            "both Fy and Allowable stress are given, and the service check uses one stress "
            "limit; leave Allowable stress blank to use the limit computed from Fy, or Fy "
            "blank to use your own",
            "error",
        )
