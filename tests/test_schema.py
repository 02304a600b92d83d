"""The input JSON Schema: valid against its metaschema and generated from the declarations.

Sources: JSON Schema Draft 2020-12 (json-schema.org, Core and Validation), via
the independent ``jsonschema`` library's metaschema check; the workbook format
(docs/workbook.md) for the columns and choices, which batch/model/case.py
declares once.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from jsonschema import Draft202012Validator

from batch.model import CATEGORIES, DIRECTIONS, UNIT_SYSTEMS, Settings
from batch.model.schema import input_schema
from batch.model.sheets import CAPACITIES, MEMBERS, SETTING_ROWS, VEHICLES

REPO_SCHEMA = Path(__file__).resolve().parents[1] / "schemas" / "spanfleet-input.schema.json"


def test_schema_is_valid_draft_2020_12():
    schema = input_schema()
    Draft202012Validator.check_schema(schema)
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"


def test_committed_schema_is_current():
    # The committed copy is for people and other programs; it must be what the code checks.
    from generate import schema_text

    committed = REPO_SCHEMA.read_text("utf-8")
    assert committed == schema_text(), "run `python scripts/generate.py` and commit"


@pytest.mark.parametrize("sheet", [MEMBERS, VEHICLES, CAPACITIES])
def test_schema_keys_are_the_declared_columns(sheet):
    schema = input_schema()["properties"][sheet.key]["items"]
    assert list(schema["properties"]) == [c.key for c in sheet.columns]
    assert schema["required"] == [c.key for c in sheet.columns if c.required]


def test_schema_settings_are_the_declared_rows():
    properties = input_schema()["properties"]["settings"]["properties"]
    assert list(properties) == [r.key for r in SETTING_ROWS]
    for row in SETTING_ROWS:
        if row.choices:
            assert properties[row.key]["enum"] == list(row.choices)


def test_schema_choices_are_the_model_choices():
    props = input_schema()["properties"]
    assert props["settings"]["properties"]["units"]["enum"] == list(UNIT_SYSTEMS)
    assert props["settings"]["properties"]["directions"]["enum"] == list(DIRECTIONS)
    assert props["vehicles"]["items"]["properties"]["category"]["enum"] == list(CATEGORIES)


def test_declared_defaults_are_the_model_defaults():
    # The template shows SETTING_ROWS defaults; a blank setting takes the model's.
    defaults = Settings()
    for row in SETTING_ROWS:
        assert getattr(defaults, row.key) == row.default, row.header


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
