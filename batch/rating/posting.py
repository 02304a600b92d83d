"""Postings per bridge: each legal load's posting over the bridge's rated members.

For every bridge (and, apart, the rated members with no bridge) and every legal
vehicle: the smallest rating factor over the bridge's rated members and the
member that governs; the posting load there (MBE 6A.8.3: (W/0.7)(RF - 0.3) for
0.3 <= RF < 1, computed per member by :mod:`batch.rating.lrfr`), the value the
owner's rounding rule gives (rounded down to a multiple of the Settings' ``Posting
rounded down to``), and a note: where the MBE recommends considering closing the
bridge (RF below 0.3), and the exemptions that published federal guidance allows:

* specialized hauling vehicles SU4 to SU7 where the notional rating load (NRL)
  rates at 1 or more on every rated member of the bridge (FHWA memorandum, Load
  Rating of Specialized Hauling Vehicles, 15 Nov 2013, and its Questions and
  Answers, March 2014, Q13; the answer is from memory);
* emergency vehicles EV2 and EV3 where the HL-93 design load rates at 0.9 or
  more at the inventory level on every rated member (FHWA memorandum on the FAST
  Act's emergency vehicles, 3 Nov 2016; verified as quoted in the TxDOT FAST
  Act's Emergency Vehicles Load Rating Guide, rev. 1.0, April 2020).

The notes say what the guidance allows; the numbers are given all the same.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Iterator
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from batch.loads import library
from batch.loads.factors import EV_SCREEN, POSTING_FLOOR, SHV_SCREEN
from batch.model import Case, Member
from batch.rating.lrfr import FloatArray, MemberRating

if TYPE_CHECKING:  # the compiled engine is not needed to read postings
    from batch.rating.assess import MemberAssessment

__all__ = [
    "NO_BRIDGE",
    "BridgePosting",
    "RatingSummary",
    "bridge_postings",
    "rounded_down",
    "summarise",
]

#: The row of the rated members that name no bridge.
NO_BRIDGE = ""

_SHVS = {"SU4", "SU5", "SU6", "SU7"}
_EVS = {"EV2", "EV3"}


@dataclass(frozen=True, kw_only=True)
class BridgePosting:
    """One bridge's postings, one entry per legal vehicle (``vehicles``: their indices).

    ``rf`` is the smallest rating factor over the bridge's rated members (inf:
    not loaded), ``member`` the member that governs (None: none); ``posting``
    the posting load there in US tons or tonnes (NaN: none; RF >= 1 or below
    0.3), ``rounded`` the same rounded down by the owner's rule; ``note`` the
    flag and any exemption, with its source.
    """

    bridge: str
    members: int
    vehicles: tuple[int, ...]
    rf: tuple[float, ...]
    member: tuple[str | None, ...]
    posting: tuple[float, ...]
    rounded: tuple[float, ...]
    note: tuple[str, ...]


def rounded_down(load: float, step: float) -> float:
    """``load`` rounded down to a multiple of ``step`` (unchanged for step 0 or no load)."""
    if step <= 0 or not math.isfinite(load):
        return load
    return math.floor(load / step + 1e-9) * step


def _library_name(case: Case, v: int) -> str:
    name = case.vehicles[v].library
    return library.model(name).name if name else ""


def _screens(case: Case, smallest: dict[int, float]) -> dict[str, bool]:
    """Whether each federal screen passes on a bridge, from its smallest RF per vehicle."""
    passed = {"shv": False, "ev": False}
    for v, rf in smallest.items():
        name = _library_name(case, v)
        if name == "NRL" and rf >= SHV_SCREEN.number:
            passed["shv"] = True
        if name == "HL-93" and case.vehicles[v].category == "design" and rf >= EV_SCREEN.number:
            passed["ev"] = True
    return passed


def _note(case: Case, v: int, rf: float, posting: float, screens: dict[str, bool]) -> str:
    words = []
    if math.isfinite(rf) and rf < POSTING_FLOOR:
        words.append(
            f"RF below {POSTING_FLOOR:g}: the MBE (6A.8.3) recommends considering closing the "
            "bridge to this load"
        )
    elif math.isfinite(posting):
        words.append("post at the posting load (MBE 6A.8.3)")
    name = _library_name(case, v)
    if name in _SHVS and screens["shv"]:
        words.append(
            f"the NRL rates at {SHV_SCREEN.number:g} or more on every member, so this SHV need "
            f"not be rated or posted ({SHV_SCREEN.source}; {SHV_SCREEN.status})"
        )
    if name in _EVS and screens["ev"]:
        words.append(
            f"HL-93 inventory RF {EV_SCREEN.number:g} or more on every member: no immediate EV "
            f"rating is needed ({EV_SCREEN.source}; {EV_SCREEN.status}: {EV_SCREEN.seen})"
        )
    return "; ".join(words)


@dataclass(frozen=True, kw_only=True)
class RatingSummary:
    """What a run rated, over all its members: counts and the postings per bridge.

    ``members`` counts the rated members, ``checks`` their (vehicle, check) pairs
    (the rows of the Rating Detail sheet); ``postings`` as :func:`bridge_postings`.
    """

    members: int = 0
    checks: int = 0
    postings: tuple[BridgePosting, ...] = ()


def summarise(case: Case, assessments: Iterable[MemberAssessment]) -> RatingSummary:
    """Counts and postings of a run, in one pass over its members' assessments."""
    counted = [0, 0]

    def rated() -> Iterator[tuple[Member, MemberRating]]:
        for member, a in zip(case.members, assessments, strict=True):
            if a.rating is not None:
                counted[0] += 1
                counted[1] += a.rating.p_rf.size
                yield member, a.rating

    postings = bridge_postings(case, rated())
    return RatingSummary(members=counted[0], checks=counted[1], postings=postings)


def bridge_postings(
    case: Case, rated: Iterable[tuple[Member, MemberRating]]
) -> tuple[BridgePosting, ...]:
    """One :class:`BridgePosting` per bridge with rated members, in Bridges-sheet order.

    ``rated`` gives each rated member with its rating. Members with no bridge come
    last, as one row named :data:`NO_BRIDGE`. Empty when the fleet has no legal load
    (``rated`` is read to its end all the same).
    """
    legal = tuple(i for i, v in enumerate(case.vehicles) if v.category == "legal")
    n = len(case.vehicles)
    best: dict[str, tuple[FloatArray, list[str | None], FloatArray, list[int]]] = {}
    for member, rating in rated:
        key = member.bridge or NO_BRIDGE
        rf, who, posting, count = best.setdefault(
            key, (np.full(n, np.inf), [None] * n, np.full(n, np.nan), [0])
        )
        count[0] += 1
        lower = rating.rf < rf
        for v in np.flatnonzero(lower):
            who[v] = member.id
        posting[lower] = rating.posting[lower]
        rf[lower] = rating.rf[lower]
    if not legal:
        return ()
    order = [b.id for b in case.bridges] + [NO_BRIDGE]
    step = case.settings.posting_step
    out = []
    for key in (k for k in order if k in best):
        rf, who, posting, count = best[key]
        screens = _screens(case, {v: float(rf[v]) for v in range(n)})
        out.append(
            BridgePosting(
                bridge=key,
                members=count[0],
                vehicles=legal,
                rf=tuple(float(rf[v]) for v in legal),
                member=tuple(who[v] for v in legal),
                posting=tuple(float(posting[v]) for v in legal),
                rounded=tuple(rounded_down(float(posting[v]), step) for v in legal),
                note=tuple(_note(case, v, float(rf[v]), float(posting[v]), screens) for v in legal),
            )
        )
    return tuple(out)
