"""Read a JSON input document (the normalised document, written by hand or by a script).

The document has the shape that :mod:`batch.reading.workbook` builds from a
workbook, so both are validated alike; problems are placed by JSON pointer
(``JSON /members/3/spans``). Beyond strict JSON syntax this refuses what
Python's parser lets through: ``NaN``, ``Infinity`` and numbers too large for a
float (reported at their pointer), and a key given twice in one object (the
later one would silently win).
"""

from __future__ import annotations

import json
import math
from typing import Any

from batch.reading.problems import DocPath, JsonLocator, Problem, Reading, file_problem

__all__ = ["read_json"]

# More digits than this and an integer may not fit a float exactly; parse it as a float.
_INT_DIGITS = 15


class _NonFinite:
    """Stands in for NaN, Infinity or an overflowing number until it is reported."""

    def __init__(self, text: str):
        self.text = text


class _Object(dict[str, object]):
    """A parsed JSON object that remembers the keys it was given twice."""

    duplicates: tuple[str, ...] = ()


def _object(pairs: list[tuple[str, Any]]) -> _Object:
    out = _Object(pairs)
    if len(out) < len(pairs):
        seen: set[str] = set()
        twice = []
        for key, _ in pairs:
            if key in seen:
                twice.append(key)
            seen.add(key)
        out.duplicates = tuple(twice)
    return out


def _float(text: str) -> float | _NonFinite:
    value = float(text)
    return value if math.isfinite(value) else _NonFinite(text)


def _int(text: str) -> int | float | _NonFinite:
    return int(text) if len(text.lstrip("-")) <= _INT_DIGITS else _float(text)


def _problem(path: DocPath, code: str, message: str, value: str | None = None) -> Problem:
    sheet, cell = JsonLocator().where(path)
    return Problem(code=code, sheet=sheet, cell=cell, message=message, value=value)


def _clean(value: Any, path: DocPath, problems: list[Problem], blocked: set[DocPath]) -> Any:
    """Plain dicts and lists again, with each stand-in reported and replaced by null."""
    if isinstance(value, _NonFinite):
        blocked.add(path)
        problems.append(
            _problem(
                path,
                "not-finite",
                f"{value.text} is not a finite number; give an ordinary number",
                value.text,
            )
        )
        return None
    if isinstance(value, dict):
        for key in getattr(value, "duplicates", ()):
            problems.append(
                _problem(
                    (*path, key),
                    "duplicate-key",
                    f"the key {key!r} is given twice in one object, and only the last would "
                    "count; keep one",
                    key,
                )
            )
        return {k: _clean(v, (*path, k), problems, blocked) for k, v in value.items()}
    if isinstance(value, list):
        return [_clean(v, (*path, i), problems, blocked) for i, v in enumerate(value)]
    return value


def read_json(data: bytes) -> Reading:
    """Read a JSON document's bytes into the normalised document; never raises for bad input."""
    locator = JsonLocator()
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        return Reading(
            document=None,
            locator=locator,
            problems=(
                file_problem(
                    "json-not-utf8",
                    f"the JSON file is not UTF-8 text (byte {exc.start}); save it as UTF-8",
                ),
            ),
        )
    problems: list[Problem] = []
    blocked: set[DocPath] = set()
    try:
        parsed = json.loads(
            text,
            object_pairs_hook=_object,
            parse_float=_float,
            parse_int=_int,
            parse_constant=_NonFinite,
        )
        document = _clean(parsed, (), problems, blocked)
    except json.JSONDecodeError as exc:
        message = (
            f"the JSON is not valid at line {exc.lineno}, column {exc.colno} ({exc.msg}); "
            "correct the syntax there"
        )
        return Reading(
            document=None, locator=locator, problems=(file_problem("invalid-json", message),)
        )
    except (RecursionError, ValueError) as exc:
        message = f"the JSON cannot be read ({exc}); simplify the document"
        return Reading(
            document=None, locator=locator, problems=(file_problem("invalid-json", message),)
        )
    if not isinstance(document, dict):
        return Reading(
            document=None,
            locator=locator,
            problems=(
                _problem(
                    (),
                    "json-not-object",
                    "the document must be a JSON object with the keys settings, members "
                    "and vehicles",
                ),
            ),
        )
    return Reading(
        document=document, locator=locator, problems=tuple(problems), blocked=frozenset(blocked)
    )
