"""Result sheets: columns, units, values, highlights, charts, Run Log and sheet splitting.

Values are checked two ways: cell for cell against the engine's own envelope of the
same case (the sheets must carry the engine's numbers unchanged), and against
closed-form handbook results for a single axle:

* simple span, one load P: midspan moment P*L/4, shear and reaction P at the end
  (AISC Steel Construction Manual, "Beam Diagrams and Formulas", simple beam,
  concentrated load at centre / at any point);
* two equal spans, one load P: the interior-support moment influence line
  M_B(a) = -a(L^2 - a^2)/(4L^2) for a load at a in span 1 (the AISC two-span
  formula M_B = -P a b (L + a)/(4 L^2), as reproduced at piping-designer.com, with
  b = L - a), least at a = L/sqrt(3): M_B = -P L/(6 sqrt 3) (computed by hand,
  dM_B/da = 0).
"""

from __future__ import annotations

import math
import zipfile
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from defusedxml import ElementTree
from openpyxl import load_workbook
from tolerances import REL_TOL_EXACT

from batch.engine.effects import EFFECTS, governing_row
from batch.engine.envelope import member_envelope
from batch.loads.fleet import fleet_cases
from batch.model import Case, Member, Settings, Spacing, Vehicle
from batch.running.executor import run_case
from batch.writing.cautions import CAUTIONS
from batch.writing.columns import (
    ENVELOPES,
    GOVERNING,
    REACTIONS,
    is_result_sheet_name,
    spacing_text,
)
from batch.writing.package.save import atomic_save
from batch.writing.package.splice import SourcePackage, empty_package
from batch.writing.results import result_package
from batch.writing.runlog import InputInfo
from batch.writing.tables import HIGHLIGHT_RGB, OWNER_MARK

P_AXLE = 20.0  # kip, one-axle test vehicle
CHART_NS = "http://schemas.openxmlformats.org/drawingml/2006/chart"
MAIN_NS = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
REL_NS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"


_EFFECT = {e.name: e for e in EFFECTS}


def _single_axle(ident: str = "KVHA single 20") -> Vehicle:
    return Vehicle(id=ident, axle_loads=(P_AXLE,))


def _truck() -> Vehicle:
    return Vehicle(
        id="KVHA haul 3-axle",
        axle_loads=(8.0, 32.0, 32.0),
        spacings=(Spacing(low=14.0, high=14.0), Spacing(low=14.0, high=30.0)),
        lane_load=0.64,
    )


def _case(units: str = "US", **settings: object) -> Case:
    members = (
        Member(id="KV-0101 G1", spans=(40.0,)),
        Member(id="KV-0207 G2", spans=(30.0, 30.0), df_moment=0.6, df_shear=0.7),
        Member(id="KV-0315 G1", spans=(50.0, 120.0, 50.0), hinges=(80.0, 140.0)),
    )
    return Case(
        settings=Settings(units=units, stations_per_span=6, impact=0.0, **settings),
        members=members,
        vehicles=(_single_axle(), _truck()),
    )


def _write(tmp_path: Path, case: Case, max_rows: int | None = None) -> Path:
    result = run_case(case)
    info = InputInfo(name="case.json", digest="0" * 64, source="json", output="out.xlsx")
    kwargs = {} if max_rows is None else {"max_rows": max_rows}
    source = SourcePackage(empty_package(), "out.xlsx")
    path = tmp_path / "out.xlsx"
    atomic_save(result_package(source, result, info, **kwargs), path)
    return path


def _rows(ws) -> list[dict[str, object]]:
    values = list(ws.iter_rows(values_only=True))
    header = values[0]
    return [dict(zip(header, row, strict=True)) for row in values[1:]]


@pytest.fixture
def written(tmp_path: Path) -> tuple[Case, Path]:
    case = _case()
    return case, _write(tmp_path, case)


def test_sheets_and_headers_follow_the_contract(written: tuple[Case, Path]) -> None:
    _, path = written
    wb = load_workbook(path)
    assert wb.sheetnames == [
        "Envelopes",
        "Reactions",
        "Governing",
        "Concurrent Forces",
        "Vehicle Summary",
        "Moment Charts",
        "Shear Charts",
        "Result Guide",
        "Run Log",
    ]
    env_header = [c.value for c in wb["Envelopes"][1]]
    # The Envelopes columns (docs/workbook.md, "Result sheets"), US units in parentheses.
    expected = ["Member", "Span", "Station", "x (ft)"]
    for name, unit in (
        ("M max", "kip-ft"),
        ("M min", "kip-ft"),
        ("V max", "kip"),
        ("V min", "kip"),
    ):
        expected += [
            f"{name} ({unit})",
            f"{name} vehicle",
            f"{name} at (ft)",
            f"{name} direction",
            f"{name} spacing",
        ]
    assert env_header == expected
    react_header = [c.value for c in wb["Reactions"][1]]
    assert react_header[:3] == ["Member", "Support", "x (ft)"]
    assert "R max (kip)" in react_header and "R min direction" in react_header
    # One header row; the columns that say which member and where stay in view.
    frozen = {"Envelopes": "E2", "Reactions": "D2", "Governing": "B2", "Run Log": "A2"}
    for name, cell in frozen.items():
        assert wb[name].freeze_panes == cell
        assert OWNER_MARK in wb[name].defined_names


def test_si_headers_show_si_units(tmp_path: Path) -> None:
    wb = load_workbook(_write(tmp_path, _case(units="SI")))
    header = [c.value for c in wb["Envelopes"][1]]
    assert "M max (kN-m)" in header and "V min (kN)" in header and "x (m)" in header
    assert "R max (kN)" in [c.value for c in wb["Reactions"][1]]


def test_envelopes_equal_the_engine_cell_for_cell(written: tuple[Case, Path]) -> None:
    case, path = written
    rows = _rows(load_workbook(path)["Envelopes"])
    cases = fleet_cases(case.vehicles, case.settings)
    k = spaced = 0
    for member in case.members:
        env = member_envelope(member, cases, case.settings.stations_per_span, "both")
        for i in range(env.station_x.size):
            row = rows[k]
            k += 1
            assert row["Member"] == member.id
            assert row["Span"] == env.station_span[i]
            assert row["Station"] == pytest.approx(env.station_fraction[i], rel=REL_TOL_EXACT)
            for eff in (e for e in EFFECTS if e.rows == "station"):
                unit = "kip-ft" if eff.quantity == "moment" else "kip"
                ext = eff.extremes(env)
                assert row[f"{eff.name} ({unit})"] == pytest.approx(
                    ext.value[i], rel=REL_TOL_EXACT, abs=0.0
                )
                spacing = row[f"{eff.name} spacing"]
                if ext.case[i] < 0:
                    assert row[f"{eff.name} vehicle"] is None
                    assert row[f"{eff.name} at (ft)"] is None
                    assert row[f"{eff.name} direction"] is None
                    assert spacing is None
                else:
                    assert row[f"{eff.name} vehicle"] == env.labels[ext.case[i]]
                    assert row[f"{eff.name} direction"] in ("left-to-right", "right-to-left")
                    # The truck's one ranged gap (14 to 30 ft) says its spacing, the single
                    # axle none; in the engine's numbers, with the unit in the cell.
                    if env.labels[ext.case[i]] == "KVHA haul 3-axle":
                        assert spacing == f"{spacing_text(ext.spacing[i])} ft"
                        assert 14.0 <= float(spacing.removesuffix(" ft")) <= 30.0
                        spaced += 1
                    else:
                        assert spacing is None
    assert k == len(rows)
    assert spaced > 0


def test_concurrent_forces_are_the_engines_cell_for_cell(written: tuple[Case, Path]) -> None:
    # Each governing shear with the moment acting with it, and each governing moment with
    # its shear: the engine's numbers unchanged (tests/test_concurrent.py checks them
    # against a brute-force search), beside the same vehicle, position and direction.
    case, path = written
    rows = _rows(load_workbook(path)["Concurrent Forces"])
    cases = fleet_cases(case.vehicles, case.settings)
    header = list(rows[0])
    assert header[:10] == [
        "Member",
        "Span",
        "Station",
        "x (ft)",
        "V max (kip)",
        "M with V max (kip-ft)",
        "V max vehicle",
        "V max at (ft)",
        "V max direction",
        "V max spacing",
    ]
    assert "V with M min (kip)" in header and len(header) == 4 + 4 * 6
    k = 0
    for member in case.members:
        env = member_envelope(member, cases, case.settings.stations_per_span, "both")
        for i in range(env.station_x.size):
            row = rows[k]
            k += 1
            for name, other, unit in (
                ("V max", "M", "kip-ft"),
                ("V min", "M", "kip-ft"),
                ("M max", "V", "kip"),
                ("M min", "V", "kip"),
            ):
                ext = _EFFECT[name].extremes(env)
                cell = row[f"{other} with {name} ({unit})"]
                if np.isnan(ext.concurrent[i]):
                    assert cell is None
                else:
                    assert cell == ext.concurrent[i]
                assert row[f"{name} vehicle"] == (
                    env.labels[ext.case[i]] if ext.case[i] >= 0 else None
                )
    assert k == len(rows)


def test_pandas_reads_the_engines_numbers_bit_for_bit(written: tuple[Case, Path]) -> None:
    # A second, independent reader (pandas over openpyxl): numbers are written in Python's
    # shortest round-trip form, so every float64 reads back exactly.
    case, path = written
    frame = pd.read_excel(path, sheet_name="Envelopes")
    cases = fleet_cases(case.vehicles, case.settings)
    envs = [
        member_envelope(m, cases, case.settings.stations_per_span, "both") for m in case.members
    ]
    for eff in (e for e in EFFECTS if e.rows == "station"):
        unit = "kip-ft" if eff.quantity == "moment" else "kip"
        expected = np.concatenate([eff.extremes(env).value for env in envs])
        assert np.array_equal(frame[f"{eff.name} ({unit})"].to_numpy(dtype=float), expected)
    assert np.array_equal(
        frame["x (ft)"].to_numpy(dtype=float), np.concatenate([e.station_x for e in envs])
    )


def test_single_axle_closed_forms_reach_the_sheets(tmp_path: Path) -> None:
    length = 30.0
    case = Case(
        settings=Settings(stations_per_span=6, impact=0.0),
        members=(Member(id="S", spans=(40.0,)), Member(id="C2", spans=(length, length))),
        vehicles=(_single_axle(),),
    )
    wb = load_workbook(_write(tmp_path, case))
    gov = {row["Member"]: row for row in _rows(wb["Governing"])}
    # AISC beam diagrams, simple beam, concentrated load at centre: M = P L / 4.
    assert gov["S"]["M max (kip-ft)"] == pytest.approx(P_AXLE * 40.0 / 4, rel=REL_TOL_EXACT)
    assert gov["S"]["M max station"] == pytest.approx(0.5)
    assert gov["S"]["M max at (ft)"] == pytest.approx(20.0)
    # Same source, load at the support: V = R = P.
    assert gov["S"]["V max (kip)"] == pytest.approx(P_AXLE, rel=REL_TOL_EXACT)
    assert gov["S"]["R max (kip)"] == pytest.approx(P_AXLE, rel=REL_TOL_EXACT)
    # No hogging on a simple span: value 0, vehicle and position empty (docs/workbook.md,
    # "Result sheets").
    assert gov["S"]["M min (kip-ft)"] == 0
    assert gov["S"]["M min vehicle"] is None and gov["S"]["M min at (ft)"] is None
    # Two equal spans: least M_B = -P L / (6 sqrt 3), load at L / sqrt 3 (computed by hand
    # from the AISC two-span formula above).
    m_b = -P_AXLE * length / (6 * math.sqrt(3))
    assert gov["C2"]["M min (kip-ft)"] == pytest.approx(m_b, rel=REL_TOL_EXACT)
    assert gov["C2"]["M min x (ft)"] == pytest.approx(length)
    at = gov["C2"]["M min at (ft)"]
    assert min(at, 2 * length - at) == pytest.approx(length / math.sqrt(3), rel=REL_TOL_EXACT)


def test_governing_equals_the_highlighted_cells(written: tuple[Case, Path]) -> None:
    case, path = written
    wb = load_workbook(path)
    gov = {row["Member"]: row for row in _rows(wb["Governing"])}
    for table in (ENVELOPES, REACTIONS):
        ws = wb[table.sheet]
        header = [c.value for c in ws[1]]
        for name in table.highlights:
            eff = _EFFECT[name]
            unit = "kip-ft" if eff.quantity == "moment" else "kip"
            col = header.index(f"{name} ({unit})") + 1
            marked = [
                ws.cell(row=r, column=col)
                for r in range(2, ws.max_row + 1)
                if ws.cell(row=r, column=col).fill.fgColor.rgb.endswith(HIGHLIGHT_RGB)
            ]
            by_member = {ws.cell(row=c.row, column=1).value: c for c in marked}
            assert len(by_member) == len(marked)  # at most one per member and effect
            for member in case.members:
                g = gov[member.id][f"{name} ({unit})"]
                if g == 0:
                    assert member.id not in by_member
                    continue
                cell = by_member[member.id]
                assert cell.value == pytest.approx(g, rel=REL_TOL_EXACT)
                assert cell.font.b
                vehicle = ws.cell(row=cell.row, column=header.index(f"{name} vehicle") + 1)
                assert vehicle.value == gov[member.id][f"{name} vehicle"]
                assert vehicle.fill.fgColor.rgb.endswith(HIGHLIGHT_RGB)


def test_governing_row_is_the_extreme_and_ties_go_left() -> None:
    # Symmetric simple span: the moment envelope is symmetric; the left peak is chosen.
    member = Member(id="SYM", spans=(40.0,))
    env = member_envelope(member, fleet_cases((_truck(),), Settings()), 8, "both")
    i = governing_row(_EFFECT["M max"], env)
    assert i is not None
    values = env.m_max.value
    assert values[i] == pytest.approx(values.max(), rel=REL_TOL_EXACT)
    assert np.all(values[:i] < values.max() * (1 - 1e-9))
    assert governing_row(_EFFECT["M min"], env) is None


def test_number_formats_filter_and_widths(written: tuple[Case, Path]) -> None:
    _, path = written
    ws = load_workbook(path)["Envelopes"]
    header = [c.value for c in ws[1]]
    assert ws.cell(row=2, column=header.index("Station") + 1).number_format == "0.000"
    assert ws.cell(row=3, column=header.index("M max (kip-ft)") + 1).number_format == "0.0"
    assert ws.cell(row=3, column=header.index("x (ft)") + 1).number_format == "0.0"
    assert ws.auto_filter.ref == f"A1:X{ws.max_row}"
    assert ws.column_dimensions["E"].width >= len("M max (kip-ft)")
    assert ws["A1"].font.b


def test_text_that_looks_like_a_formula_stays_text(tmp_path: Path) -> None:
    hostile = "=cmd|' /C calc'!A0"
    case = Case(
        settings=Settings(stations_per_span=2),
        members=(Member(id=hostile, spans=(40.0,)),),
        vehicles=(_single_axle('=HYPERLINK("x")'),),
    )
    path = _write(tmp_path, case)
    wb = load_workbook(path)
    for name in ("Envelopes", "Reactions", "Governing", "Moment Charts"):
        cell = wb[name]["A2"]
        assert cell.value == hostile and cell.data_type == "s"
    with zipfile.ZipFile(path) as zf:
        sheets = [n for n in zf.namelist() if n.startswith("xl/worksheets/sheet")]
        assert all(b"<f>" not in zf.read(n) for n in sheets)


def test_envelopes_continue_on_numbered_sheets_past_the_row_limit(tmp_path: Path) -> None:
    case = _case()
    per_member = [7, 14, 21]  # 6 stations per span: 7 rows per span
    wb = load_workbook(_write(tmp_path, case, max_rows=21))
    assert [n for n in wb.sheetnames if n.startswith("Envelopes")] == [
        "Envelopes",
        "Envelopes 2",
    ]
    # Members 1 and 2 fill 21 rows; member 3 (21 rows) moves whole to the next sheet.
    assert wb["Envelopes"].max_row - 1 == per_member[0] + per_member[1]
    assert wb["Envelopes 2"].max_row - 1 == per_member[2]
    assert {r["Member"] for r in _rows(wb["Envelopes 2"])} == {"KV-0315 G1"}
    log = [r["Value"] for r in _rows(wb["Run Log"])]
    assert any(isinstance(v, str) and "continue on Envelopes 2" in v for v in log)


def test_every_result_sheet_declares_its_size(tmp_path: Path) -> None:
    """Each sheet's dimension (ECMA-376 Part 1, §18.3.1.35) is the range it uses.

    So openpyxl's read-only mode, which pandas uses, opens the workbook without
    reading every row of every sheet; checked against the rows and columns openpyxl
    finds by reading them all, continued sheets included.
    """
    path = _write(tmp_path, _case(), max_rows=21)
    full = load_workbook(path)
    declared = load_workbook(path, read_only=True)
    assert "Envelopes 2" in full.sheetnames
    for ws in full.worksheets:
        sized = declared[ws.title]
        assert (sized.max_row, sized.max_column) == (ws.max_row, ws.max_column), ws.title
    with zipfile.ZipFile(path) as zf:
        parts = [n for n in zf.namelist() if n.startswith("xl/worksheets/sheet")]
        assert all(b"<dimension " in zf.read(n) for n in parts)


@pytest.mark.parametrize(
    ("sheet", "effects"),
    [
        ("Moment Charts", ("M max (kip-ft)", "M min (kip-ft)")),
        ("Shear Charts", ("V max (kip)", "V min (kip)")),
    ],
)
def test_chart_sheets_hold_one_chart_per_member_and_their_own_data(
    tmp_path: Path, sheet: str, effects: tuple[str, str]
) -> None:
    case = _case(chart_members=2)
    path = _write(tmp_path, case)
    wb = load_workbook(path)
    chart_rows = _rows(wb[sheet])
    env_rows = _rows(wb["Envelopes"])
    charted = [m.id for m in case.members[:2]]
    assert [r["Member"] for r in chart_rows] == [
        r["Member"] for r in env_rows if r["Member"] in charted
    ]
    for c, e in zip(chart_rows, env_rows, strict=False):
        assert [c[name] for name in effects] == [e[name] for name in effects]
    with zipfile.ZipFile(path) as zf:
        workbook = ElementTree.fromstring(zf.read("xl/workbook.xml"))
        rels = ElementTree.fromstring(zf.read("xl/_rels/workbook.xml.rels"))
        rid = next(
            s.get(f"{{{REL_NS}}}id")
            for s in workbook.iter(f"{{{MAIN_NS}}}sheet")
            if s.get("name") == sheet
        )
        part = "xl/" + next(r.get("Target") for r in rels if r.get("Id") == rid)
        drawing_rels = ElementTree.fromstring(zf.read(_rels(part)))
        drawing = "xl/drawings/" + drawing_rels[0].get("Target").split("/")[-1]
        chart_rels = ElementTree.fromstring(zf.read(_rels(drawing)))
        charts = ["xl/charts/" + r.get("Target").split("/")[-1] for r in chart_rels]
        assert len(charts) == 2
        chart = ElementTree.fromstring(zf.read(charts[0]))
    # DrawingML chart part (ECMA-376 Part 1, §21.2.2.161 scatterChart): two series, y against
    # x, whose ranges are member 1's rows of the chart sheet.
    series = chart.findall(f".//{{{CHART_NS}}}scatterChart/{{{CHART_NS}}}ser")
    refs = [[f.text for f in ser.iter(f"{{{CHART_NS}}}f")] for ser in series]
    rows = sum(1 for r in chart_rows if r["Member"] == charted[0]) + 1
    assert refs == [
        [f"'{sheet}'!$B$2:$B${rows}", f"'{sheet}'!${col}$2:${col}${rows}"] for col in ("C", "D")
    ]
    log = [r["Value"] for r in _rows(wb["Run Log"])]
    assert any(isinstance(v, str) and f"{sheet} shows 2 of 3 members" in v for v in log)


def _rels(part: str) -> str:
    folder, name = part.rsplit("/", 1)
    return f"{folder}/_rels/{name}.rels"


def test_no_chart_sheet_when_chart_members_is_zero(tmp_path: Path) -> None:
    wb = load_workbook(_write(tmp_path, _case(chart_members=0)))
    assert "Moment Charts" not in wb.sheetnames and "Shear Charts" not in wb.sheetnames


def test_run_log_records_the_run_and_the_cautions(written: tuple[Case, Path]) -> None:
    _, path = written
    rows = _rows(load_workbook(path)["Run Log"])
    items = {r["Item"]: r["Value"] for r in rows}
    assert items["Program"].startswith("spanfleet ")
    assert items["Input SHA-256"] == "0" * 64
    assert items["Stations per span"] == 6
    assert items["Members"] == 3 and items["Vehicles"] == 2 and items["Load cases"] == 2
    assert items["Stations (Envelopes rows)"] == 7 + 14 + 21
    values = [r["Value"] for r in rows]
    for text in CAUTIONS:
        assert text in values


@pytest.mark.parametrize(
    ("name", "ours"),
    [
        ("Envelopes", True),
        ("envelopes", True),
        ("Envelopes 2", True),
        ("Envelopes 12", True),
        ("Run Log", True),
        ("Moment Charts", True),
        ("Vehicle Summary", True),
        ("Governing", True),
        ("Reactions", True),
        ("Envelopes old", False),
        ("Members", False),
        ("Settings", False),
        ("My notes", False),
    ],
)
def test_result_sheet_names(name: str, ours: bool) -> None:
    assert is_result_sheet_name(name) is ours


def test_every_governing_column_has_one_value_per_member(written: tuple[Case, Path]) -> None:
    case, path = written
    rows = _rows(load_workbook(path)["Governing"])
    assert [r["Member"] for r in rows] == [m.id for m in case.members]
    assert len(rows[0]) == len(GOVERNING.columns)
