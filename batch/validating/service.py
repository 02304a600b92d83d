"""Checks of the Service sheet (LRFR service limit states) that a JSON Schema cannot express.

Its member and station are checked as a Capacities row's
(:func:`batch.validating.capacities.capacity_problems`); here, each row against its
member and its material:

* the member is rated by LRFR, and all its Service rows give one Material;
* steel and reinforced concrete give Fy or their own Allowable stress, not both;
* prestressed concrete gives its Allowable stress (the allowable tension) and its
  Prestress stress, is checked in M+ (tension at the bottom fibre under sagging) and
  takes no Fy;
* Rh belongs to steel, Prestress stress and Prestress losses to prestressed concrete.

The schema has already judged each value on its own; a field it rejected is skipped.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import Any

from batch.reading.problems import DocPath, Locator, Severity
from batch.validating.fields import label

__all__ = ["service_problems"]

Found = tuple[DocPath, str, str, Severity]


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
    """Every cross-field problem of the Service rows (``ok(path)``: not yet reported)."""
    members = _members(document)
    rows = document.get("service")
    materials: dict[str, tuple[str, DocPath]] = {}
    for i, row in enumerate(rows if isinstance(rows, list) else []):
        at: DocPath = ("service", i)
        name, material = (
            row.get(k) if isinstance(row, dict) else None for k in ("member", "material")
        )
        if not isinstance(name, str) or not ok((*at, "member")) or not ok((*at, "material")):
            continue
        found = members.get(name.strip().casefold())
        if found is None or not isinstance(material, str):
            continue
        index, member = found
        ident = name.strip()
        method = member.get("rating_method", "LRFR")
        if method != "LRFR" and ok(("members", index, "rating_method")):
            where = " ".join(x for x in locator.where(("members", index, "id")) if x)
            yield (
                (*at, "member"),
                "service-not-lrfr",
                f"member {ident!r} is rated by {method}, and the service limit states are "
                "those of LRFR (MBE Section 6A); delete its Service rows, or set its Rating "
                f"method to LRFR ({where})",
                "error",
            )
            continue
        first = materials.setdefault(ident.casefold(), (material, at))
        if first[0] != material:
            where = " ".join(x for x in locator.where((*first[1], "material")) if x)
            yield (
                (*at, "material"),
                "service-two-materials",
                f"member {ident!r} is {first[0]} in {where}, and this row says {material}; a "
                "member is of one material: give the same Material on all its Service rows",
                "error",
            )
            continue
        usable = {key: value for key, value in row.items() if ok((*at, key))}
        yield from _material_problems(row, usable, at, ident, material)


def _material_problems(
    row: dict[str, Any], usable: dict[str, Any], at: DocPath, ident: str, material: str
) -> Iterator[Found]:
    """The inputs one row's material needs (given at all), and those it does not take.

    ``usable`` holds the row's values not yet reported, so a value the schema refused is
    not reported again as one too many.
    """
    if material == "prestressed concrete":
        yield from _prestressed(row, usable, at, ident)
    else:
        yield from _yield_limited(row, usable, at, ident, material)
    if "rh" in usable and material != "steel":
        yield _not_for(at, "rh", ident, material, "steel (the hybrid factor)")
    for key in ("prestress_stress", "prestress_losses"):
        if key in usable and material != "prestressed concrete" and usable[key] != "approximate":
            yield _not_for(at, key, ident, material, "prestressed concrete")


def _not_for(at: DocPath, key: str, ident: str, material: str, owner: str) -> Found:
    return (
        (*at, key),
        "service-input-not-for-material",
        f"{label((*at, key))} is for {owner}, and member {ident!r} is {material}; leave it "
        "blank, or correct the row's Material",
        "error",
    )


def _prestressed(
    row: dict[str, Any], usable: dict[str, Any], at: DocPath, ident: str
) -> Iterator[Found]:
    """Prestressed concrete: the allowable tension and the prestress; M+ only; no Fy."""
    if "allowable_stress" not in row:
        yield (
            (*at, "allowable_stress"),
            "service-no-allowable",
            f"member {ident!r} is prestressed concrete, whose Service III check needs the "
            "allowable tension at the checked fibre; give Allowable stress as a positive "
            "magnitude, e.g. 0.19 sqrt(f'c) ksi (AASHTO LRFD Table 5.9.2.3.2b-1; the engineer "
            "chooses the limit for the exposure)",
            "error",
        )
    if "prestress_stress" not in row:
        yield (
            (*at, "prestress_stress"),
            "service-no-prestress",
            f"member {ident!r} is prestressed concrete; give Prestress stress, the compression "
            "the effective prestress (after losses) gives at the checked fibre, a positive "
            "magnitude (0 for none)",
            "error",
        )
    if usable.get("service_effect") == "M-":
        yield (
            (*at, "service_effect"),
            "service-prestressed-hogging",
            f"member {ident!r} is prestressed concrete, checked at Service III for tension at "
            "the bottom fibre under sagging moment; set Service effect to M+ (or leave it "
            "blank)",
            "error",
        )
    if "fy" in usable:
        yield _not_for(at, "fy", ident, "prestressed concrete", "steel and reinforced concrete")


def _yield_limited(
    row: dict[str, Any], usable: dict[str, Any], at: DocPath, ident: str, material: str
) -> Iterator[Found]:
    """Steel and reinforced concrete: Fy or the engineer's Allowable stress, one of them."""
    if "fy" not in row and "allowable_stress" not in row:
        limit = "0.95 or 0.80 Rh Fy" if material == "steel" else "0.9 fy"
        yield (
            (*at, "fy"),
            "service-no-limit",
            f"member {ident!r} is {material}, and its service check needs a stress limit; "
            f"give Fy (spanfleet uses {limit}), or your own Allowable stress",
            "error",
        )
    elif "fy" in usable and "allowable_stress" in usable:
        yield (
            (*at, "allowable_stress"),
            "service-two-limits",
            "both Fy and Allowable stress are given, and the service check uses one stress "
            "limit; leave Allowable stress blank to use the limit computed from Fy, or Fy "
            "blank to use your own",
            "error",
        )
