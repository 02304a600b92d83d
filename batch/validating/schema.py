"""Check the normalised document against the JSON Schema and word each error.

The schema (``schemas/spanfleet-input.schema.json``, shipped inside this
package) is the single source of the structural rules: types, required fields,
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
import json
from importlib import resources
from typing import Any

from jsonschema import Draft202012Validator
from jsonschema.exceptions import ValidationError, best_match

from batch.reading.problems import DocPath, Locator, Problem
from batch.validating.fields import declaration, entry, label, shown

__all__ = ["SCHEMA_FILE", "input_schema", "schema_problems"]

SCHEMA_FILE = "spanfleet-input.schema.json"

_TYPE_WORDS = {
    "number": "a number",
    "integer": "a whole number",
    "string": "text",
    "array": "a list",
    "object": "an object",
}


@functools.cache
def input_schema() -> dict[str, Any]:
    """The input document's JSON Schema (draft 2020-12)."""
    text = resources.files("batch.validating").joinpath(SCHEMA_FILE).read_text("utf-8")
    schema: dict[str, Any] = json.loads(text)
    return schema


@functools.cache
def _validator() -> Draft202012Validator:
    schema = input_schema()
    return Draft202012Validator(_inlined(schema, schema.get("$defs", {})))


def _inlined(node: Any, defs: dict[str, Any]) -> Any:
    """``node`` with every local ``$ref`` replaced by the definition it names.

    The same rules, checked faster: resolving a reference costs more than the
    check it leads to, and an inventory has thousands of rows. The schema has no
    recursive definitions, so the result is finite.
    """
    if isinstance(node, list):
        return [_inlined(n, defs) for n in node]
    if not isinstance(node, dict):
        return node
    out = {k: _inlined(v, defs) for k, v in node.items() if k not in ("$ref", "$defs")}
    ref = node.get("$ref")
    if isinstance(ref, str) and ref.startswith("#/$defs/"):
        target = _inlined(defs[ref.removeprefix("#/$defs/")], defs)
        if set(target) & set(out) - {"description", "title"}:
            return {"allOf": [target], **out}  # both constrain: keep both
        return target | out
    return out


def _example(path: DocPath) -> str:
    found = declaration(path)
    example = getattr(found, "example", None)
    return f", e.g. {example}" if example not in (None, "") else ""


def _relevant(error: ValidationError) -> ValidationError:
    """For oneOf/anyOf: the branch error that explains the failure best."""
    fitting = [c for c in error.context or () if not (c.validator == "type" and not c.path)]
    return best_match(fitting) if fitting else error


def _worded(error: ValidationError) -> list[tuple[DocPath, str, str]]:
    """(path, code, message) for one schema error (several for several unknown keys)."""
    path: DocPath = tuple(error.absolute_path)
    what, value, rule = entry(path), error.instance, error.validator_value
    kind = error.validator
    if kind in ("oneOf", "anyOf"):
        best = _relevant(error)
        if best is not error:
            return _worded(best)
        types = sorted({_TYPE_WORDS.get(str(c.validator_value), "") for c in error.context or ()})
        words = " or ".join(types)
        return [(path, "wrong-type", f"{what}: {shown(value)} is not {words}; give {words}")]
    if kind == "required":
        out = []
        for name in rule:
            if name in value:
                continue
            field = (*path, name)
            if declaration(field) is not None and len(field) <= 3:
                message = f"{label(field)} is required; fill it in{_example(field)}"
            else:
                message = f"{what} needs {name!r}; add it"
                if {"low", "high"} & set(rule):
                    message += ', writing a range as {"low": 14, "high": 30}'
            out.append((field, "missing-value", message))
        return out
    if kind == "type":
        expected = rule if isinstance(rule, list) else [rule]
        words = " or ".join(_TYPE_WORDS.get(t, t) for t in expected)
        code = (
            "not-a-whole-number"
            if expected == ["integer"] and _is_number(value)
            else ("not-a-number" if {"number", "integer"} & set(expected) else "wrong-type")
        )
        if not path:
            return [
                (
                    path,
                    code,
                    "the document must be a JSON object with settings, members and vehicles",
                )
            ]
        return [(path, code, f"{what}: {shown(value)} is not {words}; give {words}")]
    if kind == "exclusiveMinimum":
        message = f"{what}: {shown(value)} is not greater than {shown(rule)}; "
        message += "give a value greater than zero" if rule == 0 else f"give more than {rule}"
        return [(path, "too-small", message)]
    if kind == "minimum":
        return [
            (
                path,
                "too-small",
                f"{what}: {shown(value)} is less than {shown(rule)}; give {shown(rule)} or more",
            )
        ]
    if kind in ("maximum", "exclusiveMaximum"):
        limit = "at most" if kind == "maximum" else "less than"
        return [
            (path, "too-large", f"{what}: {shown(value)} is too large; give {limit} {shown(rule)}")
        ]
    if kind == "enum":
        choices = ", ".join(str(c) for c in rule)
        return [
            (
                path,
                "not-a-choice",
                f"{what}: {shown(value)} is not one of the choices; choose one of: {choices}",
            )
        ]
    if kind == "minItems":
        if len(path) == 1:
            noun = "member (one row per girder line)" if path == ("members",) else "vehicle"
            return [(path, "no-rows", f"there are no rows; add at least one {noun}")]
        return [(path, "empty-list", f"{what} is empty; give at least one value")]
    if kind == "pattern":
        return [(path, "blank-text", f"{what} is blank; give it a name")]
    if kind == "additionalProperties":
        known = sorted(error.schema.get("properties", {}))
        out = []
        for name in sorted(set(value) - set(known)):
            close = difflib.get_close_matches(str(name), known, n=1)
            hint = f"did you mean {close[0]!r}?" if close else f"the keys are: {', '.join(known)}"
            out.append(
                (
                    (*path, name),
                    "unknown-key",
                    f"{name!r} is not a key spanfleet reads here; remove it or correct it ({hint})",
                )
            )
        return out
    return [(path, "invalid-value", f"{what}: {error.message}")]


def _is_number(value: object) -> bool:
    return isinstance(value, int | float) and not isinstance(value, bool)


def schema_problems(document: object, locator: Locator) -> list[tuple[DocPath, Problem]]:
    """Every schema error of ``document`` as (document path, problem)."""
    found = []
    for error in _validator().iter_errors(document):
        for path, code, message in _worded(error):
            sheet, cell = locator.where(path)
            value = (
                None
                if error.validator in ("required", "additionalProperties")
                else (shown(error.instance))
            )
            found.append(
                (path, Problem(code=code, sheet=sheet, cell=cell, message=message, value=value))
            )
    return found
