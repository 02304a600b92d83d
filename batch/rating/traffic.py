"""The factors a vehicle is rated with on a bridge: by its traffic and the kind of crossing.

For each bridge of the Bridges sheet (and for members with no bridge) and each
vehicle, the LRFR terms that depend on the bridge's traffic and the vehicle's
kind (AASHTO Manual for Bridge Evaluation, MBE, Section 6A; the tables are in
:mod:`batch.loads.factors` with their sources and status):

* **live-load factor** gamma_L, and where it came from:

  - design loads: ``LL factor design`` (inventory) and ``LL factor design
    operating`` of the bridge, else of the Settings;
  - legal loads: the bridge's own ``LL factor legal``; else the MBE table by the
    bridge's ADTT (Table 6A.4.4.2.3a-1, linear between its entries), its
    conservative value where the bridge's ADTT is blank; members with no bridge
    take the Settings' ``LL factor legal`` (as before bridges existed);
  - permits: the bridge's own ``LL factor permit``; else, for a vehicle with a
    Permit type, the MBE permit table's row (Table 6A.4.5.4.2a-1) by the
    bridge's ADTT (its > 5000 value where the ADTT is not known, or the member
    has no bridge); a permit with no Permit type takes the Settings' ``LL factor
    permit``.

* **dynamic load allowance**: legal loads on a bridge with a Riding surface take
  the MBE's value for it (C6A.4.4.3: 10 %, 20 %, 33 %); a single-trip escorted
  permit at crawl speed takes none (6A.4.5.5); every other case keeps its own
  (the Settings' or the one a library model fixes).

* **distribution factor**: special permits (single-trip and multiple-trip) use the
  member's one-lane factors divided by the multiple presence factor 1.2 (MBE
  6A.4.5.4.2), the multi-lane ones where none are given; every other vehicle uses
  the multi-lane factors.

* **limit state**: Strength I for design and legal loads, Strength II for permits
  (MBE Table 6A.4.2.2-1); the service limit state of a member's material, with its own
  live-load factors, is added per check by :func:`batch.rating.lrfr.rate_member`.

The bridge's own ``DC factor`` and ``DW factor`` are taken by
:meth:`batch.rating.lrfr.RatingFactors.of`.

Pure Python and numpy; no engine.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from batch.loads.factors import (
    ASR_FACTOR,
    CRAWL_IMPACT,
    LEGAL_IMPACT,
    LEGAL_LIVE_LOAD,
    LFR_A2_INVENTORY,
    LFR_A2_OPERATING,
    PERMIT_LIVE_LOAD,
    SERVICE_CHECKS,
    SINGLE_LANE_PRESENCE,
    STRENGTH_LIMIT_STATE,
)
from batch.model import RIDING_SURFACES, Bridge, Member, RatingMethod, Settings, Vehicle

__all__ = [
    "DF_SOURCES",
    "GAMMA_SOURCES",
    "IMPACT_SOURCES",
    "LIMIT_STATES",
    "VehicleTerms",
    "member_df",
    "standard_terms",
    "vehicle_terms",
]

FloatArray = NDArray[np.float64]
Codes = NDArray[np.int8]

#: Where a live-load factor came from, by code (``VehicleTerms.gamma_source``). The tables'
#: values are in batch/loads/factors.py with their status (from memory).
GAMMA_SOURCES: tuple[str, ...] = (
    "Settings",
    "the bridge's own factor",
    "MBE Table 6A.4.4.2.3a-1 at the bridge's ADTT",
    "MBE Table 6A.4.4.2.3a-1, ADTT not known: its conservative value",
    "MBE Table 6A.4.5.4.2a-1 at the bridge's ADTT",
    "MBE Table 6A.4.5.4.2a-1, ADTT not known: its ADTT > 5000 value",
    "MBE Table 6A.4.5.4.2a-1, single-trip escorted (any ADTT)",
    "LFR, inventory level: A2 (MBE 6B.4.3)",
    "LFR, operating level: A2 (MBE 6B.4.3)",
    "ASR: A2 = 1 (MBE 6B.4.2)",
    "MBE Table 6A.4.2.2-1, service limit state",
    "MBE Table 6A.4.2.2-2 (3rd ed. errata): approximate losses",
    "MBE Table 6A.4.2.2-2 (3rd ed. errata): refined losses with elastic gains",
)
#: Where a dynamic load allowance came from, by code (``VehicleTerms.impact_source``): the
#: load case's own (the Settings', or one a library model fixes), a riding surface, or crawl.
IMPACT_SOURCES: tuple[str, ...] = (
    "the load case's own",
    *(f"riding surface: {surface} (MBE C6A.4.4.3)" for surface in RIDING_SURFACES),
    "escorted at crawl speed (MBE 6A.4.5.5)",
    "Standard Specifications, 50/(L + 125) <= 0.30 at the effect's loaded length (Art. 3.8.2),"
    " on axles and lane",
)
#: Which distribution factor a vehicle uses, by code (see :func:`member_df`).
DF_SOURCES: tuple[str, ...] = (
    "multi-lane",
    f"one lane / {SINGLE_LANE_PRESENCE.number:g}",
    f"one lane / {SINGLE_LANE_PRESENCE.number:g}; multi-lane where no one-lane DF is given",
)
#: The limit states a rating row may name, by code.
LIMIT_STATES: tuple[str, ...] = (
    *dict.fromkeys(STRENGTH_LIMIT_STATE.values()),
    "Load factor (LFR)",
    "Allowable stress (ASR)",
    *(check.limit_state for check in SERVICE_CHECKS.values()),
)


@dataclass(frozen=True, kw_only=True)
class VehicleTerms:
    """Per vehicle (arrays of n_vehicles), the terms set by one bridge's traffic.

    ``gamma`` is the live-load factor (design loads: inventory), ``gamma_operating``
    the operating one of design loads (NaN for other kinds); ``gamma_source``
    says where ``gamma`` came from (code of :data:`GAMMA_SOURCES`). ``impact`` is
    the dynamic load allowance that replaces each load case's own (NaN: keep the
    case's), ``impact_source`` its origin (:data:`IMPACT_SOURCES`). ``one_lane``
    marks the vehicles rated with the one-lane distribution factor;
    ``limit_state`` the strength limit state (:data:`LIMIT_STATES`).
    """

    gamma: FloatArray
    gamma_operating: FloatArray
    gamma_source: Codes
    impact: FloatArray
    impact_source: Codes
    one_lane: NDArray[np.bool_]
    limit_state: Codes
    operating: NDArray[np.bool_]


def _design(bridge: Bridge | None, settings: Settings) -> tuple[float, float, int]:
    """Inventory and operating factors of design loads, and where the inventory one came from."""
    inventory, why = settings.ll_factor_design, 0
    if bridge is not None and bridge.ll_factor_design is not None:
        inventory, why = bridge.ll_factor_design, 1
    operating = settings.ll_factor_operating
    if bridge is not None and bridge.ll_factor_operating is not None:
        operating = bridge.ll_factor_operating
    return inventory, operating, why


def _legal(bridge: Bridge | None, settings: Settings) -> tuple[float, int]:
    if bridge is None:
        return settings.ll_factor_legal, 0
    if bridge.ll_factor_legal is not None:
        return bridge.ll_factor_legal, 1
    if bridge.adtt is None:
        return LEGAL_LIVE_LOAD.unknown, 3
    return LEGAL_LIVE_LOAD.at(bridge.adtt), 2


def _permit(vehicle: Vehicle, bridge: Bridge | None, settings: Settings) -> tuple[float, int]:
    if bridge is not None and bridge.ll_factor_permit is not None:
        return bridge.ll_factor_permit, 1
    if vehicle.permit_type is None:
        return settings.ll_factor_permit, 0
    row = PERMIT_LIVE_LOAD[vehicle.permit_type]
    if len(row.factors.points) == 1:
        return row.factors.points[0][1], 6
    if bridge is None or bridge.adtt is None:
        return row.factors.unknown, 5
    return row.factors.at(bridge.adtt), 4


def _impact(vehicle: Vehicle, bridge: Bridge | None) -> tuple[float, int]:
    """The dynamic load allowance that replaces the cases' own (NaN: keep theirs)."""
    if vehicle.category == "legal" and bridge is not None and bridge.riding_surface is not None:
        code = 1 + RIDING_SURFACES.index(bridge.riding_surface)
        return LEGAL_IMPACT[bridge.riding_surface].number, code
    if vehicle.category == "permit" and vehicle.crawl == "yes":
        return CRAWL_IMPACT.number, len(IMPACT_SOURCES) - 1
    return np.nan, 0


def vehicle_terms(
    vehicles: Sequence[Vehicle], bridge: Bridge | None, settings: Settings
) -> VehicleTerms:
    """The terms of every vehicle on ``bridge`` (None: a member with no bridge)."""
    gamma, operating, source, impact, impact_source, one_lane, limit = [], [], [], [], [], [], []
    for v in vehicles:
        op = np.nan
        if v.category == "design":
            g, op, why = _design(bridge, settings)
        elif v.category == "legal":
            g, why = _legal(bridge, settings)
        else:
            g, why = _permit(v, bridge, settings)
        im, im_why = _impact(v, bridge)
        gamma.append(g)
        operating.append(op)
        source.append(why)
        impact.append(im)
        impact_source.append(im_why)
        one_lane.append(v.permit_type is not None and PERMIT_LIVE_LOAD[v.permit_type].one_lane)
        limit.append(LIMIT_STATES.index(STRENGTH_LIMIT_STATE[v.category]))
    return VehicleTerms(
        gamma=np.array(gamma, dtype=float),
        gamma_operating=np.array(operating, dtype=float),
        gamma_source=np.array(source, dtype=np.int8),
        impact=np.array(impact, dtype=float),
        impact_source=np.array(impact_source, dtype=np.int8),
        one_lane=np.array(one_lane, dtype=bool),
        limit_state=np.array(limit, dtype=np.int8),
        operating=np.zeros(len(gamma), dtype=bool),
    )


def standard_terms(categories: Sequence[str], method: RatingMethod) -> VehicleTerms:
    """The terms of an LFR or ASR member (MBE Section 6B), whatever its bridge's traffic.

    Design loads are rated at the inventory level with the operating level beside
    it; legal loads and permits at the operating level. LFR: A2 = 2.17 (inventory)
    and 1.3 (operating); ASR: A2 = 1 (the capacities are allowable values for each
    level). Every load case takes the Standard Specifications' impact at the
    effect's loaded length, on its axles and lane (code of :data:`IMPACT_SOURCES`);
    distribution factors are the multi-lane ones.
    """
    design = np.array([c == "design" for c in categories], dtype=bool)
    if method == "LFR":
        inventory, operating = LFR_A2_INVENTORY.number, LFR_A2_OPERATING.number
        sources = (
            GAMMA_SOURCES.index("LFR, inventory level: A2 (MBE 6B.4.3)"),
            GAMMA_SOURCES.index("LFR, operating level: A2 (MBE 6B.4.3)"),
        )
    else:
        inventory = operating = ASR_FACTOR.number
        sources = (GAMMA_SOURCES.index("ASR: A2 = 1 (MBE 6B.4.2)"),) * 2
    limit = LIMIT_STATES.index("Load factor (LFR)" if method == "LFR" else "Allowable stress (ASR)")
    n = design.size
    return VehicleTerms(
        gamma=np.where(design, inventory, operating),
        gamma_operating=np.where(design, operating, np.nan),
        gamma_source=np.where(design, sources[0], sources[1]).astype(np.int8),
        impact=np.full(n, np.nan),
        impact_source=np.full(n, len(IMPACT_SOURCES) - 1, dtype=np.int8),
        one_lane=np.zeros(n, dtype=bool),
        limit_state=np.full(n, limit, dtype=np.int8),
        operating=~design,
    )


def member_df(member: Member, one_lane: bool) -> tuple[float, float, int]:
    """The (moment, shear) distribution factors a vehicle uses on ``member``, and which.

    ``one_lane``: each one-lane factor of the member divided by the multiple
    presence factor 1.2 (MBE 6A.4.5.4.2), or the multi-lane factor where the
    member has no one-lane one (validation warns). The code is that of
    :data:`DF_SOURCES`.
    """
    if not one_lane:
        return member.df_moment, member.df_shear, 0
    m = SINGLE_LANE_PRESENCE.number
    moment, shear = member.df_moment_single, member.df_shear_single
    return (
        member.df_moment if moment is None else moment / m,
        member.df_shear if shear is None else shear / m,
        2 if moment is None or shear is None else 1,
    )
