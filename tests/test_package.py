"""The spliced package is a valid workbook package, whatever the input looked like.

Rules checked, from ECMA-376 Part 2 (Open Packaging Conventions): every part
has a content type (§10.1.2.2: an Override by part name or a Default by
extension), part names compare case-insensitively (§9.1.1.2), every internal
relationship names an existing part (§9.3); and from ECMA-376 Part 1: sheet
names are unique ignoring case and sheetIds unique (§18.2.19-20), a sheet-level
defined name's localSheetId is the index of its sheet in ``<sheets>`` (§18.2.5),
``activeTab`` is an index into ``<sheets>`` (§18.2.30). Workbooks are read back
with openpyxl, an independent reader.
"""

from __future__ import annotations

import io
import posixpath
import re
import zipfile
from pathlib import Path
from urllib.parse import unquote

import pytest
from defusedxml import ElementTree
from openpyxl import load_workbook as _load
from openpyxl.chart import LineChart, Reference
from openpyxl.workbook.defined_name import DefinedName

from batch.model import Case, Member, Settings, Vehicle
from batch.running.executor import run_case
from batch.writing.columns import is_result_sheet_name
from batch.writing.package.save import atomic_save
from batch.writing.package.splice import OWNER_MARK, BookProblem, SourcePackage, empty_package
from batch.writing.results import result_package
from batch.writing.runlog import InputInfo

CASE = Case(
    settings=Settings(stations_per_span=2, chart_members=2),
    members=(Member(id="KV-0404 G3", spans=(35.0, 35.0)),),
    vehicles=(Vehicle(id="KVHA single 12", axle_loads=(12.0,)),),
)
INFO = InputInfo(name="book.xlsx", digest="0" * 64, source="workbook", output="book.xlsx")

MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
REL = "{http://schemas.openxmlformats.org/package/2006/relationships}"
CT = "{http://schemas.openxmlformats.org/package/2006/content-types}"
R_ID = "{http://schemas.openxmlformats.org/officeDocument/2006/relationships}id"


def load_workbook(path: Path, **kwargs):
    return _load(io.BytesIO(path.read_bytes()), **kwargs)


def _run(path: Path, *, keep_vba: bool = True, out: Path | None = None) -> Path:
    source = SourcePackage(path.read_bytes(), path.name, keep_vba=keep_vba)
    target = out or path
    atomic_save(result_package(source, run_case(CASE), INFO), target)
    return target


def _rels_of(part: str) -> str:
    folder, name = posixpath.split(part)
    return posixpath.join(folder, "_rels", f"{name}.rels")


def assert_valid_package(path: Path) -> None:
    """The package rules of the module docstring, on the whole file."""
    with zipfile.ZipFile(path) as zf:
        names = zf.namelist()
        parts = {n: zf.read(n) for n in names}
    assert len(names) == len({n.lower() for n in names}), "duplicate part names"
    lower = {n.lower() for n in names}
    types = ElementTree.fromstring(parts["[Content_Types].xml"])
    overrides = {
        unquote(o.get("PartName")).lstrip("/").lower() for o in types.iter(f"{CT}Override")
    }
    defaults = {d.get("Extension").lower() for d in types.iter(f"{CT}Default")}
    for name in names:
        if name == "[Content_Types].xml":
            continue
        ext = name.rpartition(".")[2].lower()
        assert name.lower() in overrides or ext in defaults, f"{name} has no content type"
    assert overrides <= lower, f"overrides without parts: {overrides - lower}"
    for name in names:
        if "/_rels/" not in f"/{name}" or not name.endswith(".rels"):
            continue
        source = name.replace("_rels/", "").removesuffix(".rels")
        for rel in ElementTree.fromstring(parts[name]).iter(f"{REL}Relationship"):
            if rel.get("TargetMode") == "External":
                continue
            target = unquote(rel.get("Target"))
            full = (
                target.lstrip("/")
                if target.startswith("/")
                else posixpath.normpath(posixpath.join(posixpath.dirname(source), target))
            )
            assert full.lower() in lower, f"{name}: {rel.get('Id')} points to missing {full}"
    book = ElementTree.fromstring(parts["xl/workbook.xml"])
    sheets = book.findall(f"{{{MAIN}}}sheets/{{{MAIN}}}sheet")
    titles = [s.get("name") for s in sheets]
    assert len({t.lower() for t in titles}) == len(titles)
    assert len({s.get("sheetId") for s in sheets}) == len(sheets)
    rels = {
        r.get("Id"): r
        for r in ElementTree.fromstring(parts["xl/_rels/workbook.xml.rels"]).iter(
            f"{REL}Relationship"
        )
    }
    for s in sheets:
        assert s.get(R_ID) in rels, s.get("name")
    marks = []
    for name in book.iter(f"{{{MAIN}}}definedName"):
        local = name.get("localSheetId")
        if local is not None:
            assert int(local) < len(sheets), name.get("name")
        if name.get("name") == OWNER_MARK:
            marks.append(titles[int(local)])
            assert name.text.startswith(f"'{titles[int(local)]}'!")
    assert sorted(marks) == sorted(t for t in titles if is_result_sheet_name(t))
    view = book.find(f"{{{MAIN}}}bookViews/{{{MAIN}}}workbookView")
    assert int(view.get("activeTab", "0")) < len(sheets)


@pytest.fixture
def engineer_book(tmp_path: Path, make_workbook) -> Path:
    return make_workbook(
        tmp_path,
        extra={"Inspection notes": [["Inspector", "Span"], ["R. Okafor", 35]]},
    )


def test_a_results_only_package_is_valid(tmp_path: Path) -> None:
    base = tmp_path / "results.xlsx"
    base.write_bytes(empty_package())
    assert_valid_package(_run(base))
    wb = load_workbook(base)
    assert wb.sheetnames[0] == "Envelopes" and wb.active.title == "Governing"


def test_runs_on_runs_stay_valid_and_do_not_grow(engineer_book: Path) -> None:
    sizes = []
    for _ in range(3):
        _run(engineer_book)
        assert_valid_package(engineer_book)
        with zipfile.ZipFile(engineer_book) as zf:
            sizes.append(sorted(zf.namelist()))
    assert sizes[0] == sizes[1] == sizes[2]


def test_sheet_names_of_other_sheets_keep_pointing_at_their_sheet(engineer_book: Path) -> None:
    # The engineer adds a sheet after the results, with a print area (a sheet-level name).
    _run(engineer_book)
    wb = load_workbook(engineer_book)
    ws = wb.create_sheet("Load posting")
    ws["A1"] = "posting notes"
    ws.print_area = "A1:B4"
    wb.defined_names["Posted"] = DefinedName("Posted", attr_text="'Load posting'!$A$1")
    wb.active = wb.sheetnames.index("Load posting")
    wb.save(engineer_book)
    _run(engineer_book)
    assert_valid_package(engineer_book)
    after = load_workbook(engineer_book)
    names = after.sheetnames
    # Kept sheets keep their order; the new results follow them.
    assert names[:4] == ["Settings", "Members", "Vehicles", "Inspection notes"]
    assert names[4] == "Load posting"
    assert after["Load posting"].print_area == "'Load posting'!$A$1:$B$4"
    assert after.defined_names["Posted"].attr_text == "'Load posting'!$A$1"
    assert after.active.title == "Load posting"  # the engineer's active sheet stays active


def test_governing_becomes_active_when_the_active_sheet_was_a_result(
    engineer_book: Path,
) -> None:
    _run(engineer_book)
    wb = load_workbook(engineer_book)
    wb.active = wb.sheetnames.index("Run Log")
    for ws in wb.worksheets:
        ws.sheet_view.tabSelected = ws.title == "Run Log"
    wb.save(engineer_book)
    _run(engineer_book)
    after = load_workbook(engineer_book)
    assert after.active.title == "Governing"
    assert [ws.title for ws in after.worksheets if ws.sheet_view.tabSelected] == ["Governing"]


def test_the_first_visible_tab_stays_a_valid_index(engineer_book: Path) -> None:
    # workbookView firstSheet: index of the first sheet tab shown (ECMA-376 §18.2.30).
    _run(engineer_book)
    wb = load_workbook(engineer_book)
    last = len(wb.sheetnames) - 1
    wb.active = last  # Run Log
    wb.views[0].firstSheet = last
    wb.save(engineer_book)
    _run(engineer_book)
    view = load_workbook(engineer_book).views[0]
    assert view.activeTab == 6  # four kept sheets, then Governing third of the results
    assert view.firstSheet is None or view.firstSheet <= view.activeTab


def _prefixed(path: Path) -> Path:
    """The workbook with its workbook and style parts written with an ``x:`` prefix.

    Some producers write SpreadsheetML this way; it is the same XML (Namespaces in XML 1.0).
    """
    out = io.BytesIO()
    with zipfile.ZipFile(path) as zin, zipfile.ZipFile(out, "w") as zout:
        for info in zin.infolist():
            data = zin.read(info)
            if info.filename in ("xl/workbook.xml", "xl/styles.xml"):
                text = data.decode()
                text = re.sub(r"<(/?)([A-Za-z]+)(?=[\s/>])", r"<\1x:\2", text)
                text = text.replace(f'xmlns="{MAIN}"', f'xmlns:x="{MAIN}"')
                data = text.encode()
            zout.writestr(info, data)
    path.write_bytes(out.getvalue())
    return path


def test_a_workbook_written_with_namespace_prefixes_is_spliced(engineer_book: Path) -> None:
    _prefixed(engineer_book)
    for _ in range(2):
        _run(engineer_book)
        assert_valid_package(engineer_book)
    with zipfile.ZipFile(engineer_book) as zf:
        book = zf.read("xl/workbook.xml").decode()
    assert '<x:sheet name="Envelopes"' in book and "<sheet " not in book
    wb = load_workbook(engineer_book)
    assert "Governing" in wb.sheetnames
    assert wb["Envelopes"]["A1"].font.b


def test_an_engineers_chart_sheet_is_kept(engineer_book: Path) -> None:
    wb = load_workbook(engineer_book)
    chart = LineChart()
    chart.add_data(Reference(wb["Inspection notes"], min_col=2, min_row=1, max_row=2))
    wb.create_chartsheet("Span chart").add_chart(chart)
    wb.save(engineer_book)
    with zipfile.ZipFile(engineer_book) as zf:
        before = {n: zf.read(n) for n in zf.namelist() if "chart" in n}
    _run(engineer_book)
    _run(engineer_book)
    assert_valid_package(engineer_book)
    with zipfile.ZipFile(engineer_book) as zf:
        assert {n: zf.read(n) for n in before} == before
    assert [c.title for c in load_workbook(engineer_book).chartsheets] == ["Span chart"]


def test_a_macro_workbook_copied_to_xlsx_loses_only_its_macro_project(
    engineer_book: Path, tmp_path: Path
) -> None:
    # Part, relationship and content type of a VBA project: [MS-OFFMACRO] / ECMA-376, as in
    # tests/test_cli.py.
    out = io.BytesIO()
    with zipfile.ZipFile(engineer_book) as zin, zipfile.ZipFile(out, "w") as zout:
        for info in zin.infolist():
            data = zin.read(info).decode()
            if info.filename == "[Content_Types].xml":
                data = data.replace(
                    "spreadsheetml.sheet.main+xml", "ms-excel.sheet.macroEnabled.main+xml"
                ).replace("vnd.openxmlformats-officedocument.ms-excel", "vnd.ms-excel")
                data = data.replace(
                    "</Types>",
                    '<Default Extension="bin" ContentType="application/vnd.ms-office.vbaProject"'
                    "/></Types>",
                )
            if info.filename == "xl/_rels/workbook.xml.rels":
                data = data.replace(
                    "</Relationships>",
                    '<Relationship Id="rIdVba" Type="http://schemas.microsoft.com/office/2006/'
                    'relationships/vbaProject" Target="vbaProject.bin"/></Relationships>',
                )
            zout.writestr(info, data)
        zout.writestr("xl/vbaProject.bin", b"\xd0\xcf\x11\xe0 stand-in")
    xlsm = engineer_book.with_suffix(".xlsm")
    xlsm.write_bytes(out.getvalue())
    source = SourcePackage(xlsm.read_bytes(), xlsm.name, keep_vba=False)
    assert source.lacks == ("macros (VBA)",)
    copy = tmp_path / "copy.xlsx"
    atomic_save(result_package(source, run_case(CASE), INFO), copy)
    assert_valid_package(copy)
    with zipfile.ZipFile(copy) as zf:
        assert "xl/vbaProject.bin" not in zf.namelist()
        types = zf.read("[Content_Types].xml").decode()
        assert (
            "macroEnabled" not in types
            and "vbaProject.bin" not in zf.read("xl/_rels/workbook.xml.rels").decode()
        )
    assert "Inspection notes" in load_workbook(copy).sheetnames


def test_a_package_holding_a_part_twice_is_refused(engineer_book: Path) -> None:
    # Part names are unique, compared without case (ECMA-376 Part 2, §9.1.1.2); zip itself
    # allows a name twice, and readers then disagree on which copy counts.
    buffer = io.BytesIO(engineer_book.read_bytes())
    with zipfile.ZipFile(buffer, "a") as zf:
        zf.writestr("XL/Styles.xml", b"<other/>")
    with pytest.raises(BookProblem, match=r"holds the part xl/styles\.xml twice"):
        SourcePackage(buffer.getvalue(), engineer_book.name)
