"""Reading a valid input workbook into the model, as docs/workbook.md describes it.

Source: docs/workbook.md, this repository's specification of the workbook
("Reading rules", "Input sheets"): sheet and header names, forgiving header
matching ("Spans (ft)" matches "Spans"), blank rows skipped, list cells, settings
and their defaults. How a formula's saved
result is stored (``<f>`` with a cached ``<v>``, ``t="str"`` for text) is
ECMA-376 Part 1, §18.3.1.4 and §18.3.1.40 (from memory). The digest is checked
with Python's hashlib, independently of the reader.
"""

from __future__ import annotations

import hashlib
import json
import re
import zipfile
from pathlib import Path

from batch.model import Case, Member, Settings, Spacing, Vehicle
from batch.validating import read_input

KVHA_MEMBERS = [
    {
        "Member": "KV-0412 G1",
        "Spans (ft)": "60, 80, 60",
        "Span EI": "1, 1.5, 1",
        "DF moment": 0.62,
        "DF shear": 0.7,
        "DC load (kip/ft)": 1.15,
        "DW load (kip/ft)": 0.18,
        "Description": "Harlow Creek overpass, girder 1",
    },
    {"Member": "KV-0415 G3", "Spans (ft)": "50, 120, 50", "Hinges (ft)": "80; 140"},
    {"Member": "KV-0101 G2", "Spans (ft)": 42, "Condition factor": 0.95, "System factor": 1},
]
KVHA_VEHICLES = [
    {
        "Vehicle": "KV-P3",
        "Axle loads (kip)": "12, 34, 34",
        "Axle spacings (ft)": "14, 14-30",
        "Category": "Permit",
        "Description": "KVHA 3-axle permit truck",
    },
    {"Vehicle": "KV-L2", "Axle loads (kip)": "20 25", "Axle spacings (ft)": 4, "Factor": 1.1},
    {"Vehicle": "KV-HL93", "Library": "HL-93"},
    {"Vehicle": "KV-LANE", "Axle loads (kip)": 18, "Lane load (kip/ft)": 0.64, "Category": "legal"},
]
KVHA_SETTINGS = {"Units": "us", "Directions": "Left to right", "Stations per span": 20}

# The same inventory written out by hand from the rows above.
EXPECTED = Case(
    settings=Settings(units="US", directions="left-to-right", stations_per_span=20),
    members=(
        Member(
            id="KV-0412 G1",
            spans=(60.0, 80.0, 60.0),
            span_ei=(1.0, 1.5, 1.0),
            df_moment=0.62,
            df_shear=0.7,
            dc_load=1.15,
            dw_load=0.18,
            description="Harlow Creek overpass, girder 1",
        ),
        Member(id="KV-0415 G3", spans=(50.0, 120.0, 50.0), hinges=(80.0, 140.0)),
        Member(id="KV-0101 G2", spans=(42.0,), condition_factor=0.95, system_factor=1.0),
    ),
    vehicles=(
        Vehicle(
            id="KV-P3",
            axle_loads=(12.0, 34.0, 34.0),
            spacings=(Spacing(low=14.0, high=14.0), Spacing(low=14.0, high=30.0)),
            category="permit",
            description="KVHA 3-axle permit truck",
        ),
        Vehicle(
            id="KV-L2",
            axle_loads=(20.0, 25.0),
            spacings=(Spacing(low=4.0, high=4.0),),
            factor=1.1,
        ),
        Vehicle(id="KV-HL93", library="HL-93"),
        Vehicle(id="KV-LANE", axle_loads=(18.0,), lane_load=0.64, category="legal"),
    ),
)


def _kvha(make_workbook, tmp_path: Path, **kw) -> Path:
    args = {"settings": KVHA_SETTINGS, "members": KVHA_MEMBERS, "vehicles": KVHA_VEHICLES}
    return make_workbook(tmp_path, **(args | kw))


def test_valid_workbook_gives_the_case(make_workbook, tmp_path):
    report = read_input(_kvha(make_workbook, tmp_path))
    assert [p.render() for p in report.problems] == []
    assert report.warnings == ()
    assert report.ok
    assert report.source == "workbook"
    assert report.case == EXPECTED


def test_digest_is_sha256_of_the_bytes_and_the_file_is_untouched(make_workbook, tmp_path):
    path = _kvha(make_workbook, tmp_path)
    before = path.read_bytes()
    mtime = path.stat().st_mtime_ns
    report = read_input(path)
    assert report.digest == hashlib.sha256(before).hexdigest()
    assert path.read_bytes() == before
    assert path.stat().st_mtime_ns == mtime


def test_workbook_and_equivalent_json_give_the_same_case(make_workbook, tmp_path):
    from_book = read_input(_kvha(make_workbook, tmp_path))
    doc_path = tmp_path / "kvha.json"
    doc_path.write_text(json.dumps(from_book.document), "utf-8")
    from_json = read_input(doc_path)
    assert from_json.ok, [p.render() for p in from_json.problems]
    assert from_json.source == "json"
    assert from_json.case == from_book.case == EXPECTED


def test_json_written_by_hand_gives_the_same_case(tmp_path):
    doc = {
        "settings": {"units": "US", "directions": "left-to-right", "stations_per_span": 20},
        "members": [
            {
                "id": "KV-0412 G1",
                "spans": [60, 80, 60],
                "span_ei": [1, 1.5, 1],
                "df_moment": 0.62,
                "df_shear": 0.7,
                "dc_load": 1.15,
                "dw_load": 0.18,
                "description": "Harlow Creek overpass, girder 1",
            },
            {"id": "KV-0415 G3", "spans": [50, 120, 50], "hinges": [80, 140]},
            {"id": "KV-0101 G2", "spans": [42], "condition_factor": 0.95, "system_factor": 1},
        ],
        "vehicles": [
            {
                "id": "KV-P3",
                "axle_loads": [12, 34, 34],
                "spacings": [14, {"low": 14, "high": 30}],
                "category": "permit",
                "description": "KVHA 3-axle permit truck",
            },
            {"id": "KV-L2", "axle_loads": [20, 25], "spacings": [4], "factor": 1.1},
            {"id": "KV-HL93", "library": "HL-93"},
            {"id": "KV-LANE", "axle_loads": [18], "lane_load": 0.64, "category": "legal"},
        ],
    }
    path = tmp_path / "kvha.json"
    path.write_text(json.dumps(doc), "utf-8")
    assert read_input(path).case == EXPECTED


def test_headers_match_forgivingly_and_blank_rows_are_skipped(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        members=[
            {"  MEMBER ": "KV-0101 G2", "spans (FT) ": 42},
            {},  # a blank row
            {"  MEMBER ": "   "},  # only spaces: blank too
            {"  MEMBER ": "KV-0102 G1", "spans (FT) ": "30, 30"},
        ],
        vehicles=[{"vehicle (id)": "KV-L2", "AXLE LOADS": "20, 25", "Axle Spacings": 4}],
    )
    report = read_input(path)
    assert report.ok, [p.render() for p in report.problems]
    assert report.case is not None
    assert [m.id for m in report.case.members] == ["KV-0101 G2", "KV-0102 G1"]
    assert report.case.members[1].spans == (30.0, 30.0)


def test_cells_are_located_after_blank_rows(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        members=[{"Member": "A", "Spans": 40}, {}, {}, {"Member": "B", "Spans": "40, zero"}],
    )
    report = read_input(path)
    assert [(p.sheet, p.cell, p.code) for p in report.problems] == [
        ("Members", "B5", "not-a-number")
    ]


def test_settings_default_when_blank_or_missing(make_workbook, tmp_path):
    path = make_workbook(tmp_path, settings={"Units": None, "Stations per span (n)": "  "})
    report = read_input(path)
    assert report.ok
    assert report.case is not None
    assert report.case.settings == Settings()


def test_settings_names_match_forgivingly(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        settings={"  dynamic LOAD allowance (IM) ": 0.15, "STATIONS PER SPAN": 4, "units": "SI"},
        members=[{"Member": "KV-9001 G1", "Spans (m)": "18.5, 24"}],
        vehicles=[{"Vehicle": "KV-M2", "Axle loads (kN)": "110, 110", "Axle spacings (m)": 1.2}],
    )
    report = read_input(path)
    assert report.ok, [p.render() for p in report.problems]
    assert report.case is not None
    assert report.case.settings == Settings(units="SI", impact=0.15, stations_per_span=4)


def test_settings_meaning_column_and_sheet_names_in_any_case(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        omit=("Settings",),
        extra={
            "settings": [["Setting", "Value", "Meaning"], ["Units", "US", "kip and ft"]],
        },
    )
    report = read_input(path)
    assert report.ok
    assert report.warnings == ()


def _set_cached_values(path: Path, cached: dict[str, tuple[str, str]]) -> None:
    """Give formulas the saved results a calculating spreadsheet program would store.

    ``cached`` maps the formula text (without "=") to (value, cell type), the
    type being "n" for a number and "str" for text.
    """
    with zipfile.ZipFile(path) as z:
        parts = {n: z.read(n) for n in z.namelist()}
    for name, xml in parts.items():
        if not name.startswith("xl/worksheets/"):
            continue
        text = xml.decode("utf-8")
        for formula, (value, kind) in cached.items():
            pattern = re.compile(r'<c r="([A-Z]+\d+)"><f>' + re.escape(formula) + r"</f><v ?/>")
            type_attr = "" if kind == "n" else f' t="{kind}"'
            text = pattern.sub(
                lambda m, v=value, f=formula, t=type_attr: (
                    f'<c r="{m.group(1)}"{t}><f>{f}</f><v>{v}</v>'
                ),
                text,
            )
        parts[name] = text.encode("utf-8")
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as z:
        for name, data in parts.items():
            z.writestr(name, data)


def test_formula_cells_give_their_saved_results(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        members=[
            {"Member": "KV-0412 G1", "Spans": '=TEXTJOIN(", ",TRUE,60,80)', "DF moment": "=0.5+0.1"}
        ],
    )
    _set_cached_values(
        path, {'TEXTJOIN(", ",TRUE,60,80)': ("60, 80", "str"), "0.5+0.1": ("0.6", "n")}
    )
    report = read_input(path)
    assert report.ok, [p.render() for p in report.problems]
    assert report.case is not None
    assert report.case.members[0].spans == (60.0, 80.0)
    assert report.case.members[0].df_moment == 0.6


def test_unknown_columns_are_ignored_with_a_warning(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path, members=[{"Member": "KV-0101 G2", "Spans": 42, "Hinge": 20, "Inspector": "JB"}]
    )
    report = read_input(path)
    assert report.ok
    assert [(p.cell, p.code) for p in report.warnings] == [
        ("C1", "unknown-column"),
        ("D1", "unknown-column"),
    ]
    assert "did you mean Hinges?" in report.warnings[0].message
    assert report.case is not None
    assert report.case.members[0].hinges == ()


def test_a_capacities_sheet_with_headers_only_rates_nothing(make_workbook, tmp_path):
    path = make_workbook(tmp_path, extra={"Capacities": [["Member", "Span", "Station"]]})
    report = read_input(path)
    assert report.ok
    assert report.warnings == ()
    assert report.case is not None and report.case.capacities == ()


def test_xlsm_reads_like_xlsx(make_workbook, tmp_path):
    path = make_workbook(tmp_path, name="kvha.xlsm")
    assert read_input(path).ok
