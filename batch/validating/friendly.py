"""Checks that say what was probably meant: unit mix-ups, near library names, a missing column.

* **Unit mix-ups.** A workbook typed in one unit system with Units set to the other
  is the likeliest silent mistake: every number is read, and every result is wrong
  by a constant factor. Values that no vehicle of the Units setting has, but that
  are ordinary in the other system, are warned about with their cell and the fix
  (:data:`MIXUP_HINTS`). Past the plausibility limits of
  :data:`batch.validating.checks.LIMITS` the general warning speaks instead.
* **Library names.** An unknown model name gets the nearest known names.
* **A missing column.** When no Vehicles row has axle loads or a Library name, the
  column is missing or misnamed: one problem for the sheet, not one per row.

The thresholds are common practice (the published design loads they are measured
against are named beside each): they flag a value only where it is implausible in the
Units setting's system and ordinary in the other.
"""

from __future__ import annotations

import difflib
import re
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from typing import Any

from batch.loads import library
from batch.model import UNIT_LABELS
from batch.reading.problems import DocPath, Problem, Severity
from batch.validating.fields import finite_number, label, shown

__all__ = [
    "MIXUP_HINTS",
    "MixupHint",
    "missing_axle_column",
    "nearest_models",
    "one_unit_question",
    "unit_mixups",
]

_Found = tuple[DocPath, str, str, Severity]


@dataclass(frozen=True, kw_only=True)
class MixupHint:
    """Values of one kind that suggest the other unit system.

    In Units ``units``, a value of the ``sheet``'s column ``key`` (its largest, for a
    list; ``what`` names it in the message) above ``above`` or below ``below`` is
    implausible there; ``usual`` says what is usual, to show the engineer why.
    ``other`` is the system whose values they look like; ``quantity`` gives the unit.
    """

    units: str
    what: str
    sheet: str
    key: str
    quantity: str
    above: float | None = None
    below: float | None = None
    usual: str
    other: str


#: Values that look typed in the other system (common practice; design values from
#: AASHTO LRFD 3.6.1.2: axles 8, 32, 32 kip = 35, 145, 145 kN; lane 0.64 kip/ft = 9.3 kN/m).
MIXUP_HINTS: tuple[MixupHint, ...] = (
    MixupHint(
        units="SI",
        what="longest span",
        sheet="members",
        key="spans",
        quantity="length",
        above=150.0,
        usual="girder spans above 150 m are rare; 150 ft is 46 m",
        other="US",
    ),
    MixupHint(
        units="US",
        what="axle load",
        sheet="vehicles",
        key="axle_loads",
        quantity="force",
        above=100.0,
        usual="road axles, even a permit load's, are rarely above 60 kip; the HL-93 truck's are "
        "32 kip (145 kN)",
        other="SI",
    ),
    MixupHint(
        units="US",
        what="",
        sheet="vehicles",
        key="lane_load",
        quantity="line_load",
        above=3.0,
        usual="the HL-93 lane load is 0.64 kip/ft (9.3 kN/m)",
        other="SI",
    ),
    MixupHint(
        units="SI",
        what="largest axle load",
        sheet="vehicles",
        key="axle_loads",
        quantity="force",
        below=40.0,
        usual="a rated truck's axles are rarely below 50 kN; the HL-93 truck's are 145 kN (32 kip)",
        other="US",
    ),
    MixupHint(
        units="SI",
        what="",
        sheet="vehicles",
        key="lane_load",
        quantity="line_load",
        below=2.0,
        usual="the HL-93 lane load is 9.3 kN/m (0.64 kip/ft)",
        other="US",
    ),
)


def _largest(value: object) -> float | None:
    """The largest number of a list (or the number itself); None if any is unreadable."""
    values = value if isinstance(value, list) else [value]
    numbers = [finite_number(v) for v in values]
    if not numbers or any(n is None for n in numbers):
        return None
    return max(n for n in numbers if n is not None)


def unit_mixups(
    document: dict[str, Any],
    units: str,
    ok: Callable[[DocPath], bool],
    warn_above: dict[str, float],
) -> Iterator[_Found]:
    """A warning for each value that looks typed in the other unit system.

    ``warn_above`` gives, by column key, the value past which the general
    plausibility warning already speaks (so one cell gets one warning). A lane load
    of 0 is no lane load, never a mix-up.
    """
    for hint in (h for h in MIXUP_HINTS if h.units == units):
        rows = document.get(hint.sheet)
        for i, row in enumerate(rows if isinstance(rows, list) else []):
            path: DocPath = (hint.sheet, i, hint.key)
            if not isinstance(row, dict) or hint.key not in row or not ok(path):
                continue
            value = _largest(row.get(hint.key))
            if value is None or value == 0 or value > warn_above.get(hint.key, float("inf")):
                continue
            if (hint.above is not None and value > hint.above) or (
                hint.below is not None and value < hint.below
            ):
                unit, other = UNIT_LABELS[units][hint.quantity], UNIT_LABELS[hint.other]
                yield (
                    path,
                    "unit-mixup",
                    f"{label(path)}: {hint.what + ' ' if hint.what else ''}{shown(value)} "
                    f"{unit} is unusual in {unit} ({hint.usual}); if the values are in "
                    f"{other[hint.quantity]}, set Units to {hint.other} on the Settings sheet, "
                    f"or convert them to {unit}",
                    "warning",
                )


def _key(name: str) -> str:
    return re.sub(r"[^0-9a-z]", "", name.lower())


def nearest_models(name: str, count: int = 3) -> list[str]:
    """The built-in model names nearest ``name`` (case, spaces and punctuation ignored)."""
    keys: dict[str, str] = {}
    for m in library.MODELS:
        for known in (m.name, *m.aliases):
            keys.setdefault(_key(known), m.name)
    close = difflib.get_close_matches(_key(name), list(keys), n=count * 2, cutoff=0.6)
    return list(dict.fromkeys(keys[k] for k in close))[:count]


def missing_axle_column(vehicles: list[Any], found: list[_Found], force_unit: str) -> list[_Found]:
    """``found`` with one problem for the sheet when no row has axle loads or a Library name.

    When two or more rows lack both, the Axle loads column is missing or misnamed (or
    empty): the rows' own ``no-axle-loads`` problems are replaced by one for the sheet.
    """
    lacking = [f for f in found if f[1] == "no-axle-loads"]
    rows = [v for v in vehicles if isinstance(v, dict)]
    if len(lacking) < 2 or any("axle_loads" in v or "library" in v for v in rows):
        return found
    sheet_wide: _Found = (
        ("vehicles",),
        "no-axle-loads-column",
        f"no row has axle loads or a Library name: the Axle loads column is missing, "
        f"misnamed or empty; add a column headed 'Axle loads ({force_unit})' with each "
        "vehicle's axle loads, front axle first (and 'Axle spacings'), or a column headed "
        "'Library' naming built-in load models",
        "error",
    )
    return [sheet_wide, *(f for f in found if f[1] != "no-axle-loads")]


def one_unit_question(problems: list[Problem]) -> list[Problem]:
    """``problems`` without the unit mix-up warnings when a header's unit is already wrong.

    A header whose unit disagrees with Units (or is no unit) is the same question,
    asked where it was answered wrongly: the values' warnings would only repeat it.
    """
    if any(p.code.startswith("header-unit") for p in problems):
        return [p for p in problems if p.code != "unit-mixup"]
    return problems
