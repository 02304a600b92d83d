"""Rating inputs: the Capacities sheet, the rating settings and vehicle categories, read.

Sources: docs/workbook.md, this repository's specification of the workbook
("Capacities", the "Settings" load factors, the Vehicles ``Category`` column); the
published load factors of the MBE (Table 6A.4.2.2-1 and the legal and permit
tables, from memory) as the defaults; the library models' own categories
(batch/loads/library, "legal" for the AASHTO legal trucks, MBE 6A.4.4.2.1, from memory).
Every problem message is checked in tests/test_validation_messages.py.
"""

from __future__ import annotations

import json

import pytest

from batch.model import Capacity, Settings
from batch.model.sheets import SETTING_ROWS
from batch.validating import read_input
from batch.writing.template import case_workbook

MEMBER = {"Member": "KV-0215 G1", "Spans": "48", "DC load": 1.02, "DW load": 0.16}
CAPACITY_HEADERS = [
    "Member",
    "Span",
    "Station",
    "Resistance M+ (kip-ft)",
    "Resistance M- (kip-ft)",
    "Resistance V (kip)",
    "DC M (kip-ft)",
    "DW M",
    "DC V",
    "DW V",
]


def test_capacities_rows_become_the_model(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        members=[MEMBER],
        extra={
            "Capacities": [
                CAPACITY_HEADERS,
                ["  kv-0215 g1 ", 1, 0.5, 2900, None, "-", None, None, None, None],
                ["KV-0215 G1", 1, 0, None, None, 310, None, None, 24.5, 3.8],
            ]
        },
    )
    report = read_input(path)
    assert [p.render() for p in report.problems + report.warnings] == []
    assert report.case is not None
    assert report.case.capacities == (
        Capacity(member="KV-0215 G1", span=1, station=0.5, resistance_m_pos=2900.0),
        Capacity(member="KV-0215 G1", span=1, station=0.0, resistance_v=310.0, dc_v=24.5, dw_v=3.8),
    )


def test_capacities_from_json(tmp_path):
    document = {
        "members": [{"id": "KV-0215 G1", "spans": [48], "dc_load": 1.02}],
        "vehicles": [{"id": "KV-L3", "axle_loads": [14, 18, 18], "spacings": [15, 4.5]}],
        "capacities": [
            {"member": "kv-0215 g1", "span": 1, "station": 0.5, "resistance_m_pos": 2900}
        ],
    }
    path = tmp_path / "case.json"
    path.write_text(json.dumps(document), "utf-8")
    report = read_input(path)
    assert report.case is not None, [p.render() for p in report.problems]
    assert report.case.capacities[0].member == "KV-0215 G1"


def test_rating_settings_default_to_the_published_values(make_workbook, tmp_path):
    report = read_input(make_workbook(tmp_path))
    assert report.case is not None
    settings = report.case.settings
    # MBE Table 6A.4.2.2-1 (from memory): DC 1.25, DW 1.50, design 1.75 / 1.35.
    assert (settings.dc_factor, settings.dw_factor) == (1.25, 1.5)
    assert (settings.ll_factor_design, settings.ll_factor_operating) == (1.75, 1.35)
    # Legal, routine traffic, ADTT >= 5000: 1.45; routine permit, ADTT > 5000: 1.30
    # (MBE, from memory). LRFD Table 3.4.1-2 minimums 0.90 and 0.65 (from memory).
    assert (settings.ll_factor_legal, settings.ll_factor_permit) == (1.45, 1.3)
    assert (settings.dc_factor_relieving, settings.dw_factor_relieving) == (0.9, 0.65)
    assert settings.reference_vehicle == ""


def test_rating_settings_are_read(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        settings={"LL factor legal": 1.3, "Reference vehicle": " HL-93 ", "Screening floor": 0},
    )
    report = read_input(path)
    assert report.case is not None
    assert report.case.settings.ll_factor_legal == 1.3
    assert report.case.settings.reference_vehicle == "HL-93"
    assert report.case.settings.screening_floor == 0


@pytest.mark.parametrize(
    ("row", "category"),
    [
        ({"Library": "Type 3S2"}, "legal"),  # the library model's own category
        ({"Library": "HL-93"}, "design"),
        ({"Library": "Type 3S2", "Category": "permit"}, "permit"),  # typed wins
        ({"Axle loads": "10, 30", "Axle spacings": 14}, "design"),  # the default (docs/workbook.md)
    ],
)
def test_blank_category_follows_the_library_model(make_workbook, tmp_path, row, category):
    path = make_workbook(tmp_path, vehicles=[{"Vehicle": "KV-X"} | row])
    report = read_input(path)
    assert report.case is not None, [p.render() for p in report.problems]
    assert report.case.vehicles[0].category == category


def test_a_case_with_capacities_round_trips_through_a_workbook(make_workbook, tmp_path):
    source = make_workbook(
        tmp_path,
        settings={"Reference vehicle": "KV-T3", "LL factor permit": 1.2},
        members=[MEMBER],
        extra={"Capacities": [CAPACITY_HEADERS[:4], ["KV-0215 G1", 1, 0.5, 2900]]},
    )
    report = read_input(source)
    assert report.case is not None
    book = tmp_path / "again.xlsx"
    case_workbook(report.case).save(book)
    again = read_input(book)
    assert [p.render() for p in again.problems + again.warnings] == []
    assert again.case == report.case


def test_every_rating_setting_is_declared_once():
    keys = [row.key for row in SETTING_ROWS]
    assert len(keys) == len(set(keys))
    for key in ("dc_factor", "dw_factor", "ll_factor_design", "ll_factor_operating"):
        assert key in keys
    assert {"ll_factor_legal", "ll_factor_permit", "reference_vehicle"} <= set(keys)
    assert Settings().screening_floor == 0.1


def test_capacity_messages_name_the_cell_and_the_fix(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        settings={"Reference vehicle": "KV-T9"},
        members=[MEMBER | {"Condition factor": 0.7}],
        extra={
            "Capacities": [
                CAPACITY_HEADERS[:4],
                ["KV-0999 G9", 1, 0.5, 2900],
                ["KV-0215 G1", 3, 0.5, 2900],
                ["KV-0215 G1", 1, None, 2900],
                ["KV-0215 G1", 1, 0.5, None],
            ],
        },
    )
    rendered = [p.render() for p in read_input(path).problems]
    assert rendered == [
        "Settings!B2: Reference vehicle: 'KV-T9' is neither a vehicle of the Vehicles sheet nor "
        "a built-in load model; give a Vehicle id or a library name such as HL-93, or leave it "
        "blank for no screening",
        "Members!E2: Condition factor: 0.7 is below 0.85, the lowest the MBE gives (Table "
        "6A.4.2.3-1, from memory: 1.00 good or satisfactory, 0.95 fair, 0.85 poor); give a "
        "value from 0.85 to 1",
        "Capacities!A2: Member 'KV-0999 G9' is not on the Members sheet; give the id of a "
        "member listed there (ids are compared ignoring case and outer spaces)",
        "Capacities!B3: Span 3: member 'KV-0215 G1' has 1 span; give span 1",
        "Capacities!C4: Station is blank, so the row names no section; give Span and Station "
        "(the fraction of the span), or x (the distance from the member's left end)",
        "Capacities!D5: Resistance M+, Resistance M- and Resistance V are all blank, so "
        "nothing is rated at this station; give at least one factored resistance, or delete "
        "the row",
    ]
