"""A published value with its source and whether it was checked in published text.

Every number of a built-in load model, and every published factor the loads
stage keeps, is a :class:`Sourced`: what it is, the value (in the unit system
of the model that uses it), the standard it comes from (standard, edition,
article, table or figure) and its status:

* ``verified``: seen in the standard's own text (a reproduced page of it);
* ``secondary``: seen in a published secondary text that states it (a
  textbook, a federal or state document, a research report, a magazine
  article, an independent library's documentation), named in ``seen``;
* ``from memory``: not found in published text; it must be checked against
  the standard before anyone relies on it.

A statement with no number (a rule, such as "no dynamic load allowance on the
lane load") is a :class:`Sourced` with an empty ``value``.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal, get_args

__all__ = ["STATUSES", "STATUS_MEANINGS", "UNBOUNDED", "Number", "Sourced", "Status", "weakest"]

Status = Literal["verified", "secondary", "from memory"]

#: The statuses, strongest first.
STATUSES: tuple[Status, ...] = get_args(Status)

#: What each status means, for listings and docs.
STATUS_MEANINGS: dict[Status, str] = {
    "verified": "seen in the standard's own text (a reproduced page of it)",
    "secondary": "seen in a published secondary text that states it (named)",
    "from memory": "not found in published text: check it against the standard",
}

#: Upper end of a length the standard leaves open ("at least 50 ft"), in any length
#: unit. The engine caps a spacing range at the member length, so any value longer
#: than every member gives the same result.
UNBOUNDED = 10_000.0

#: One entry of a value: a number, or a range (low, high) where the worst is used.
Number = float | tuple[float, float]


def _text(x: float) -> str:
    return f"{x:g}"


def _entry(n: Number) -> str:
    if isinstance(n, tuple):
        low, high = n
        return f"at least {_text(low)}" if high >= UNBOUNDED else f"{_text(low)}–{_text(high)}"
    return _text(n)


def weakest(*statuses: Status) -> Status:
    """The weakest of some statuses (``from memory`` beats ``secondary`` beats ``verified``)."""
    return max(statuses, key=STATUSES.index)


@dataclass(frozen=True, kw_only=True)
class Sourced:
    """One published value (or rule), where it comes from and whether it was checked.

    ``value`` holds the numbers (a range as ``(low, high)``), empty for a rule;
    ``unit`` their unit label (``""`` for a fraction or factor); ``source`` the
    standard, edition and article, table or figure; ``status`` one of
    :data:`STATUSES`; ``seen`` where it was seen in published text (required
    unless the status is ``from memory``).
    """

    what: str
    value: tuple[Number, ...] = ()
    unit: str = ""
    source: str
    status: Status
    seen: str = ""
    basis: tuple[Sourced, ...] = ()

    def __post_init__(self) -> None:
        if self.status not in STATUSES:
            raise ValueError(f"{self.what!r}: status must be one of {STATUSES}")
        if self.status != "from memory" and not (self.seen or self.basis):
            raise ValueError(f"{self.what!r}: say where a {self.status} value was seen")
        if not self.source:
            raise ValueError(f"{self.what!r}: name the standard it comes from")

    @classmethod
    def derived(cls, what: str, value: tuple[Number, ...], unit: str, *basis: Sourced) -> Sourced:
        """A value computed from published ones (e.g. 75 % of a truck's axle loads).

        Its status is the weakest of its ``basis``; listings show the basis, not
        the computed value, so nothing is counted as published twice.
        """
        return cls(
            what=what,
            value=value,
            unit=unit,
            source="computed from: " + "; ".join(b.what for b in basis),
            status=weakest(*(b.status for b in basis)),
            basis=basis,
        )

    @property
    def published(self) -> tuple[Sourced, ...]:
        """The published values this one rests on: itself, or its basis (recursively)."""
        if not self.basis:
            return (self,)
        return tuple(dict.fromkeys(p for b in self.basis for p in b.published))

    @property
    def number(self) -> float:
        """The value of a single fixed number."""
        if len(self.value) != 1 or isinstance(self.value[0], tuple):
            raise ValueError(f"{self.what!r} is not a single number")
        return float(self.value[0])

    @property
    def numbers(self) -> tuple[float, ...]:
        """The values of a list of fixed numbers (e.g. axle loads)."""
        if any(isinstance(n, tuple) for n in self.value):
            raise ValueError(f"{self.what!r} holds a range")
        return tuple(float(n) for n in self.value)  # type: ignore[arg-type]

    @property
    def shown(self) -> str:
        """The value as text with its unit, e.g. ``8, 32, 32 kip`` or ``14, 14–30 ft``."""
        if not self.value:
            return "(rule)"
        text = ", ".join(_entry(n) for n in self.value)
        return f"{text} {self.unit}" if self.unit else text
