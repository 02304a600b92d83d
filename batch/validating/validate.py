"""Validation of the normalised input document: JSON Schema, then cross-field checks.

:func:`validate` takes what a reader found (:class:`~batch.reading.problems.Reading`)
and returns the errors, the warnings and, when there is no error, the model.
Every problem is reported once: a value the reader could not read is not
reported again by the schema, and a value the schema rejects is not judged
again by the checks.
"""

from __future__ import annotations

import re

from batch.model import Case
from batch.model.sheets import INPUT_SHEETS
from batch.reading.problems import JSON_SHEET, PathSet, Problem, Reading
from batch.validating.characters import character_problems
from batch.validating.checks import check_document
from batch.validating.friendly import one_unit_question
from batch.validating.schema import schema_problems
from batch.validating.to_model import to_case

__all__ = ["validate"]

# Problems are listed file first, then sheet by sheet in workbook order.
_SHEET_ORDER = {"": 0, JSON_SHEET: 1} | {s.name: i for i, s in enumerate(INPUT_SHEETS, 1)}
_SECTION_ORDER = {s.key: i for i, s in enumerate(INPUT_SHEETS, 1)}

_Key = tuple[int, int | str]


def _position(problem: Problem) -> tuple[int, tuple[_Key, ...]]:
    """Sort key: file first, then sheets in workbook order, then row and column (or pointer)."""
    rank = _SHEET_ORDER.get(problem.sheet, len(_SHEET_ORDER))
    cell = re.fullmatch(r"([A-Z]+)(\d+)", problem.cell)
    if cell:
        column = 0
        for letter in cell.group(1):
            column = column * 26 + ord(letter) - 64
        return rank, ((0, int(cell.group(2))), (0, column))
    key: list[_Key] = []
    for i, part in enumerate(p for p in problem.cell.split("/") if p):
        if part.isdigit():
            key.append((0, int(part)))
        elif i == 0:
            key.append((0, _SECTION_ORDER.get(part, 9)))
        else:
            key.append((1, part))
    return rank, tuple(key)


def validate(reading: Reading) -> tuple[tuple[Problem, ...], tuple[Problem, ...], Case | None]:
    """(errors, warnings, case) for what a reader found; ``case`` is ``None`` on any error."""
    found = list(reading.problems)
    document = reading.document
    if document is not None:
        blocked = PathSet(reading.blocked)
        structural = [
            (path, p)
            for path, p in schema_problems(document, reading.locator)
            if not blocked.touches(path)
        ]
        found += [p for _, p in structural]
        bad = PathSet(reading.blocked | {path for path, _ in structural})
        found += [p for _, p in check_document(document, reading.locator, bad)]
        found += [p for _, p in character_problems(document, reading.locator, bad)]
        found = one_unit_question(found)
    errors = tuple(sorted((p for p in found if p.severity == "error"), key=_position))
    warnings = tuple(sorted((p for p in found if p.severity == "warning"), key=_position))
    case = to_case(document) if document is not None and not errors else None
    return errors, warnings, case
