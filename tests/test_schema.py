"""The input JSON Schema: valid against its metaschema and in step with the declarations.

Sources: JSON Schema Draft 2020-12 (json-schema.org, Core and Validation), via
the independent ``jsonschema`` library's metaschema check; the workbook
contract (/work/shared/contract/workbook.md) for the columns and choices, which
batch/inputs.py declares once.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from jsonschema import Draft202012Validator

from batch.model import CATEGORIES, DIRECTIONS, UNIT_SYSTEMS, Settings
from batch.model.columns import MEMBERS, SETTING_ROWS, VEHICLES
from batch.validating.schema import input_schema

REPO_SCHEMA = Path(__file__).resolve().parents[1] / "schemas" / "spanfleet-input.schema.json"


def test_schema_is_valid_draft_2020_12():
    schema = input_schema()
    Draft202012Validator.check_schema(schema)
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"


def test_packaged_schema_is_the_repository_file():
    assert input_schema() == json.loads(REPO_SCHEMA.read_text("utf-8"))


@pytest.mark.parametrize(("sheet", "definition"), [(MEMBERS, "member"), (VEHICLES, "vehicle")])
def test_schema_keys_are_the_declared_columns(sheet, definition):
    schema = input_schema()["$defs"][definition]
    assert set(schema["properties"]) == {c.key for c in sheet.columns}
    assert set(schema["required"]) == {"id", *(c.key for c in sheet.columns if c.required)}


def test_schema_settings_are_the_declared_rows():
    properties = input_schema()["$defs"]["settings"]["properties"]
    assert set(properties) == {r.key for r in SETTING_ROWS}
    for row in SETTING_ROWS:
        if row.choices:
            assert properties[row.key]["enum"] == list(row.choices)


def test_schema_choices_are_the_model_choices():
    defs = input_schema()["$defs"]
    assert defs["settings"]["properties"]["units"]["enum"] == list(UNIT_SYSTEMS)
    assert defs["settings"]["properties"]["directions"]["enum"] == list(DIRECTIONS)
    assert defs["vehicle"]["properties"]["category"]["enum"] == list(CATEGORIES)


def test_declared_defaults_are_the_model_defaults():
    # The template shows SETTING_ROWS defaults; a blank setting takes the model's.
    defaults = Settings()
    for row in SETTING_ROWS:
        assert getattr(defaults, row.key) == row.default, row.name


def _errors(document: object) -> list[str]:
    validator = Draft202012Validator(input_schema())
    return sorted(e.validator for e in validator.iter_errors(document))


def test_a_minimal_document_is_valid():
    doc = {"members": [{"id": "KV-0101 G1", "spans": [60]}], "vehicles": [{"id": "KV-T2"}]}
    assert _errors(doc) == []


@pytest.mark.parametrize(
    ("member", "keyword"),
    [
        ({"id": "M", "spans": []}, "minItems"),
        ({"id": "M", "spans": [0]}, "exclusiveMinimum"),
        ({"id": "M", "spans": ["60"]}, "type"),
        ({"id": "M", "spans": [True]}, "type"),  # JSON true is not a number
        ({"id": "  ", "spans": [60]}, "pattern"),
        ({"spans": [60]}, "required"),
        ({"id": "M", "spans": [60], "dc_load": -1}, "minimum"),
        ({"id": "M", "spans": [60], "condition_factor": 1.2}, "maximum"),
        ({"id": "M", "spans": [60], "Spans": [60]}, "additionalProperties"),
    ],
)
def test_schema_rejects(member, keyword):
    doc = {"members": [member], "vehicles": [{"id": "V", "axle_loads": [10]}]}
    assert _errors(doc) == [keyword]


def test_spacing_is_a_number_or_a_range():
    def doc(spacing: object) -> dict:
        vehicle = {"id": "V", "axle_loads": [8, 32], "spacings": [spacing]}
        return {"members": [{"id": "M", "spans": [60]}], "vehicles": [vehicle]}

    assert _errors(doc(14)) == []
    assert _errors(doc({"low": 14, "high": 30})) == []
    assert _errors(doc({"low": 14})) == ["oneOf"]
    assert _errors(doc(-14)) == ["oneOf"]


def test_inlined_references_check_the_same_rules():
    # The validator inlines $ref for speed; it must find exactly what the schema as
    # written finds (checked here with the jsonschema library on the original).
    from batch.validating.schema import _validator

    as_written = Draft202012Validator(input_schema())
    documents = [
        {"members": [], "vehicles": [{}]},
        {"members": [{"id": "M", "spans": [0, "x"], "hinges": [-1], "span_ei": []}]},
        {
            "settings": {"units": "metric", "stations_per_span": 0.5, "impact": 2, "x": 1},
            "members": [{"id": " ", "spans": [60], "condition_factor": 0, "dc_load": -1}],
            "vehicles": [{"id": "V", "spacings": [0, {"low": 1}, {"low": 1, "high": "2"}]}],
        },
        {"members": [{"id": "M", "spans": [60]}], "vehicles": [{"id": "V", "library": ""}]},
        [],
    ]
    for doc in documents:
        expected = sorted((list(e.absolute_path), e.message) for e in as_written.iter_errors(doc))
        got = sorted((list(e.absolute_path), e.message) for e in _validator().iter_errors(doc))
        assert got == expected
