"""A seeded synthetic inventory and fleet, for the benchmark and the large-run tests.

Members have 1-4 spans of 20-160 ft with unequal spans and relative EI, some
with internal hinges (cantilever-and-suspended main spans, Gerber two-span
layouts); vehicles have 2-13 axles of 4-40 kip at 4-30 ft, some with a ranged
spacing and some with a lane load. US units. Invented data, no real structure.

:func:`rated` turns such a case into one the run rates: bridges of four members
with their own ADTT and riding surface, dead loads and one-lane DFs on every
member, resistances at three stations of each (M+ and V at 0.4 of span 1, M- and
V at its end, M+ at the middle of the last span), and a fleet of legal loads and
permits of every kind.
"""

from __future__ import annotations

import dataclasses

import numpy as np

from batch.model import (
    PERMIT_TYPES,
    RIDING_SURFACES,
    Bridge,
    Capacity,
    Case,
    Member,
    Settings,
    Spacing,
    Vehicle,
)
from batch.model.layout import mechanism_parts

__all__ = ["rated", "synthetic_case"]


def synthetic_case(
    n_members: int, n_vehicles: int, seed: int, settings: Settings | None = None
) -> Case:
    """A seeded inventory of 1-4 span members (unequal spans and EI, some hinges) and fleet."""
    rng = np.random.default_rng(seed)
    members: list[Member] = []
    while len(members) < n_members:
        n_spans = int(rng.integers(1, 5))
        spans = tuple(float(round(v, 1)) for v in rng.uniform(20.0, 160.0, n_spans))
        ei = tuple(float(round(v, 2)) for v in rng.uniform(0.6, 1.8, n_spans))
        hinges: tuple[float, ...] = ()
        if n_spans == 3 and rng.random() < 0.2:  # cantilever-and-suspended main span
            start = spans[0]
            hinges = (round(start + 0.22 * spans[1], 2), round(start + 0.78 * spans[1], 2))
        elif n_spans == 2 and rng.random() < 0.15:
            hinges = (round(spans[0] + 0.2 * spans[1], 2),)
        if hinges and mechanism_parts(spans, hinges):
            continue
        members.append(
            Member(
                id=f"SYN-{len(members) + 1:05d}",
                spans=spans,
                hinges=hinges,
                span_ei=ei,
                df_moment=float(round(rng.uniform(0.5, 0.8), 3)),
                df_shear=float(round(rng.uniform(0.6, 0.9), 3)),
            )
        )
    vehicles = []
    for v in range(n_vehicles):
        n_axles = int(rng.integers(2, 14))
        loads = tuple(float(round(x, 1)) for x in rng.uniform(4.0, 40.0, n_axles))
        gaps = [float(round(x, 1)) for x in rng.uniform(4.0, 30.0, n_axles - 1)]
        spacings = [Spacing(low=g, high=g) for g in gaps]
        if rng.random() < 0.2:
            g = int(rng.integers(0, n_axles - 1))
            spacings[g] = Spacing(low=gaps[g], high=round(gaps[g] + 12.0, 1))
        lane = float(round(rng.uniform(0.2, 0.64), 2)) if rng.random() < 0.25 else 0.0
        vehicles.append(
            Vehicle(
                id=f"TRK-{v + 1:04d}",
                axle_loads=loads,
                spacings=tuple(spacings),
                lane_load=lane,
                category="permit",
            )
        )
    return Case(settings=settings or Settings(), members=tuple(members), vehicles=tuple(vehicles))


def rated(case: Case, seed: int) -> Case:
    """``case`` with bridges, dead loads, one-lane DFs, Capacities and a legal/permit fleet."""
    rng = np.random.default_rng(seed)
    surfaces = (*RIDING_SURFACES, None)
    bridges = tuple(
        Bridge(
            id=f"SYN-B{b + 1:04d}",
            adtt=float(round(rng.uniform(50.0, 8000.0))),
            riding_surface=surfaces[b % len(surfaces)],
        )
        for b in range((len(case.members) + 3) // 4)
    )
    members = tuple(
        dataclasses.replace(
            m,
            bridge=bridges[i // 4].id,
            dc_load=float(round(0.6 + 0.008 * max(m.spans), 3)),
            dw_load=0.15,
            df_moment_single=round(m.df_moment * 0.85, 3),
            df_shear_single=round(m.df_shear * 0.9, 3),
        )
        for i, m in enumerate(case.members)
    )
    capacities = tuple(
        Capacity(
            member=m.id,
            span=span,
            station=station,
            resistance_m_pos=None if station == 1.0 else round(4.0 * max(m.spans) ** 2),
            resistance_m_neg=round(4.0 * max(m.spans) ** 2) if station == 1.0 else None,
            resistance_v=None if span > 1 else 12.0 * max(m.spans),
        )
        for m in members
        for span, station in dict.fromkeys(((1, 0.4), (1, 1.0), (len(m.spans), 0.5)))
        if not (station == 1.0 and len(m.spans) == 1)
    )
    kinds = (None, *PERMIT_TYPES)
    vehicles = tuple(
        dataclasses.replace(v, category="legal")
        if j % 2 == 0
        else dataclasses.replace(v, permit_type=kinds[(j // 2) % len(kinds)])
        for j, v in enumerate(case.vehicles)
    )
    return dataclasses.replace(
        case, members=members, vehicles=vehicles, capacities=capacities, bridges=bridges
    )
