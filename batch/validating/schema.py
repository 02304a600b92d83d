"""Check the normalised document against the JSON Schema and word each error.

The schema (:func:`batch.model.schema.input_schema`, generated from the column
declarations) is the single source of the structural rules: types, required fields,
minimums, maximums and choices. Every error is found at once
(``Draft202012Validator.iter_errors``); each keeps its document path until it
is turned into a :class:`~batch.reading.problems.Problem` by the locator, so
a workbook user reads ``Members!B7`` and a JSON user ``JSON /members/5/spans``.
A ``oneOf`` failure is explained by its most relevant branch: the one whose
type fits the value.
"""

from __future__ import annotations

import difflib
import functools
from typing import Any

from jsonschema import Draft202012Validator
from jsonschema.exceptions import ValidationError, best_match

from batch.loads.factors import CAPACITY_FACTOR_VALUES
from batch.model.schema import input_schema
from batch.reading.problems import DocPath, Locator, Problem
from batch.validating.fields import declaration, entry, label, shown

__all__ = ["schema_problems"]

_TYPE_WORDS = {
    "number": "a number",
    "integer": "a whole number",
    "string": "text",
    "array": "a list",
    "object": "an object",
}


@functools.cache
def _validator() -> Draft202012Validator:
    return Draft202012Validator(input_schema())


def _example(path: DocPath) -> str:
    found = declaration(path)
    example = getattr(found, "example", None)
    return f", e.g. {example}" if example not in (None, "") else ""


def _relevant(error: ValidationError) -> ValidationError:
    """For oneOf/anyOf: the branch error that explains the failure best."""
    fitting = [c for c in error.context or () if not (c.validator == "type" and not c.path)]
    return best_match(fitting) if fitting else error


def _rule(error: ValidationError) -> Any:
    """The value of the schema keyword that failed (a bound, a list of keys, ...)."""
    return error.validator_value


def _seen(error: ValidationError) -> Any:
    """The document's value that failed."""
    return error.instance


def _properties(error: ValidationError) -> dict[str, Any]:
    """The properties the failing object's schema declares."""
    schema = error.schema
    return dict(schema.get("properties", {})) if isinstance(schema, dict) else {}


#: (path, code, message) of one problem found in the document.
Worded = tuple[DocPath, str, str]


def _one_of(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    best = _relevant(error)
    if best is not error:
        return _worded(best)
    types = sorted({_TYPE_WORDS.get(str(c.validator_value), "") for c in error.context or ()})
    words = " or ".join(types)
    return [(path, "wrong-type", f"{what}: {shown(_seen(error))} is not {words}; give {words}")]


def _required(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    out = []
    for name in _rule(error):
        if name in _seen(error):
            continue
        field = (*path, name)
        if declaration(field) is not None and len(field) <= 3:
            message = f"{label(field)} is required; fill it in{_example(field)}"
        else:
            message = f"{what} needs {name!r}; add it"
            if {"low", "high"} & set(_rule(error)):
                message += ', writing a range as {"low": 14, "high": 30}'
        out.append((field, "missing-value", message))
    return out


def _type(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    rule, value = _rule(error), _seen(error)
    expected = rule if isinstance(rule, list) else [rule]
    words = " or ".join(_TYPE_WORDS.get(str(t), str(t)) for t in expected)
    code = (
        "not-a-whole-number"
        if expected == ["integer"] and _is_number(value)
        else ("not-a-number" if {"number", "integer"} & set(expected) else "wrong-type")
    )
    if not path:
        message = "the document must be a JSON object with settings, members and vehicles"
        return [(path, code, message)]
    return [(path, code, f"{what}: {shown(value)} is not {words}; give {words}")]


def _above(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    rule = _rule(error)
    message = f"{what}: {shown(_seen(error))} is not greater than {shown(rule)}; "
    message += "give a value greater than zero" if rule == 0 else f"give more than {rule}"
    return [(path, "too-small", message)]


def _minimum(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    rule = shown(_rule(error))
    message = f"{what}: {shown(_seen(error))} is less than {rule}; give {rule} or more"
    return [(path, "too-small", message)]


def _maximum(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    limit = "at most" if error.validator == "maximum" else "less than"
    message = f"{what}: {shown(_seen(error))} is too large; give {limit} "
    published = CAPACITY_FACTOR_VALUES.get(str(path[-1])) if path else None
    hint = f" (the MBE's values, {published})" if published else ""
    return [(path, "too-large", message + shown(_rule(error)) + hint)]


def _enum(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    choices = ", ".join(str(c) for c in _rule(error))
    message = f"{what}: {shown(_seen(error))} is not one of the choices; choose one of: {choices}"
    return [(path, "not-a-choice", message)]


def _min_items(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    if len(path) == 1:
        noun = "member (one row per girder line)" if path == ("members",) else "vehicle"
        return [(path, "no-rows", f"there are no rows; add at least one {noun}")]
    return [(path, "empty-list", f"{what} is empty; give at least one value")]


def _pattern(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    return [(path, "blank-text", f"{what} is blank; give it a name")]


def _unknown_keys(error: ValidationError, path: DocPath, what: str) -> list[Worded]:
    known = sorted(_properties(error))
    out = []
    for name in sorted(set(_seen(error)) - set(known)):
        close = difflib.get_close_matches(str(name), known, n=1)
        hint = f"did you mean {close[0]!r}?" if close else f"the keys are: {', '.join(known)}"
        message = f"{name!r} is not a key spanfleet reads here; remove it or correct it ({hint})"
        out.append(((*path, name), "unknown-key", message))
    return out


#: How each kind of schema error is worded, by the JSON Schema keyword that failed.
_WORDING = {
    "oneOf": _one_of,
    "anyOf": _one_of,
    "required": _required,
    "type": _type,
    "exclusiveMinimum": _above,
    "minimum": _minimum,
    "maximum": _maximum,
    "exclusiveMaximum": _maximum,
    "enum": _enum,
    "minItems": _min_items,
    "pattern": _pattern,
    "additionalProperties": _unknown_keys,
}


def _worded(error: ValidationError) -> list[Worded]:
    """(path, code, message) for one schema error (several for several unknown keys)."""
    path: DocPath = tuple(error.absolute_path)
    what = entry(path)
    wording = _WORDING.get(str(error.validator))
    if wording is None:
        return [(path, "invalid-value", f"{what}: {error.message}")]
    return wording(error, path, what)


def _is_number(value: object) -> bool:
    return isinstance(value, int | float) and not isinstance(value, bool)


def schema_problems(document: object, locator: Locator) -> list[tuple[DocPath, Problem]]:
    """Every schema error of ``document`` as (document path, problem)."""
    found = []
    said: set[tuple[DocPath, str]] = set()
    for error in _validator().iter_errors(document):
        for path, code, message in _worded(error):
            # A row missing two required values fails "required" once per value, and each
            # failure names them all: say each once.
            if (path, code) in said:
                continue
            said.add((path, code))
            sheet, cell = locator.where(path)
            value = (
                None
                if error.validator in ("required", "additionalProperties")
                else (shown(_seen(error)))
            )
            found.append(
                (path, Problem(code=code, sheet=sheet, cell=cell, message=message, value=value))
            )
    return found
