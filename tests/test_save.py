"""Writing results back: nothing of the workbook is lost; a failed save changes nothing.

What must survive is docs/workbook.md's list ("every other sheet is kept byte for byte")
and issue 7's: values, formulas (with their cached values), number formats,
styles, comments, merged cells, data validation, defined names, column widths,
row heights, hidden state and any sheet the engineer added — and, since results
are spliced into the input's own package, also what openpyxl cannot model
(charts, pictures, connections ...). The strongest check is used where it
applies: the input's parts are byte-identical after a run. Package structure
(parts, relationships, content types) is that of ECMA-376 Part 2 (Open Packaging
Conventions); workbook elements are those of ECMA-376 Part 1, §18.2. Atomic
replacement by rename within one folder is common practice (POSIX rename(2) is
atomic; so is os.replace on one file system).
"""

from __future__ import annotations

import errno
import io
import os
import re
import stat
import zipfile
from pathlib import Path

import pytest
from defusedxml import ElementTree
from openpyxl import Workbook
from openpyxl import load_workbook as _load_path
from openpyxl.chart import BarChart, Reference
from openpyxl.comments import Comment
from openpyxl.styles import Font, PatternFill
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation

from batch.model import Case, Member, Settings, Vehicle
from batch.running.executor import run_case
from batch.writing.package.save import TEMP_PREFIX, SaveError, atomic_save, open_elsewhere
from batch.writing.package.splice import BookProblem, SourcePackage
from batch.writing.results import result_package
from batch.writing.runlog import InputInfo

CASE = Case(
    settings=Settings(stations_per_span=4),
    members=(Member(id="KV-0101 G1", spans=(40.0,)), Member(id="KV-0207 G2", spans=(30.0, 30.0))),
    vehicles=(Vehicle(id="KVHA single 20", axle_loads=(20.0,)),),
)


def load_workbook(path: Path, **kwargs):
    """Load from bytes, so no file handle is left open."""
    return _load_path(io.BytesIO(Path(path).read_bytes()), **kwargs)


INFO = InputInfo(name="book.xlsx", digest="0" * 64, source="workbook", output="book.xlsx")


def _engineer_workbook(path: Path) -> Path:
    """A workbook with everything an engineer might have put in it (no results yet)."""
    wb = Workbook()
    ws = wb.active
    ws.title = "Members"
    ws.append(["Member", "Spans (ft)", "DF moment"])
    ws.append(["KV-0101 G1", 40, "=0.5+0.1"])
    ws["A1"].font = Font(bold=True, color="FF123456")
    ws["A1"].fill = PatternFill("solid", fgColor="FFCCE5FF")
    ws["B2"].number_format = "0.00"
    ws["A2"].comment = Comment("girder line from the 2019 inspection", "KVHA")
    ws["D2"] = "=cmd|' /C calc'!A0"  # text that looks like a formula...
    ws["D2"].data_type = "s"  # ...typed as text
    ws.merge_cells("E1:F2")
    ws["E1"] = "merged note"
    ws.column_dimensions["A"].width = 31.5
    ws.column_dimensions["C"].hidden = True
    ws.row_dimensions[2].height = 27
    dv = DataValidation(type="list", formula1='"design,legal,permit"', allow_blank=True)
    dv.add("G2:G20")
    ws.add_data_validation(dv)
    ws.freeze_panes = "A2"
    notes = wb.create_sheet("Engineer notes")
    notes["A1"] = "Checked by"
    notes["B1"] = "=Members!B2*2"
    notes["B2"] = '=Members!A2&" ok"'
    notes["B3"] = "=MAX(Envelopes!E:E)"  # refers to a result sheet
    hidden = wb.create_sheet("Lookup")
    hidden.sheet_state = "hidden"
    hidden["A1"] = 1.25
    wb.defined_names["SpanList"] = DefinedName("SpanList", attr_text="Members!$B$2:$B$20")
    wb.save(path)
    return _with_cached_values(path)


def _with_cached_values(path: Path) -> Path:
    """Add the cached values a spreadsheet program stores beside each formula."""
    cached = {
        "C2": ("", "0.6"),
        "B1": ("", "80"),
        "B2": ("str", "KV-0101 G1 ok"),
        "B3": ("", "160"),
    }
    buffer = io.BytesIO()
    with zipfile.ZipFile(path) as zin, zipfile.ZipFile(buffer, "w") as zout:
        for info in zin.infolist():
            data = zin.read(info.filename)
            if info.filename.startswith("xl/worksheets/sheet"):
                xml = data.decode()
                for ref, (kind, value) in cached.items():
                    t = f' t="{kind}"' if kind else ""
                    xml = re.sub(
                        f'<c r="{ref}"([^>]*)>(<f>[^<]*</f>)<v />',
                        lambda m, ref=ref, t=t, value=value: (
                            f'<c r="{ref}"{m[1]}{t}>{m[2]}<v>{value}</v>'
                        ),
                        xml,
                    )
                data = xml.encode()
            zout.writestr(info, data)
    path.write_bytes(buffer.getvalue())
    return path


MAIN = "{http://schemas.openxmlformats.org/spreadsheetml/2006/main}"
REL = "{http://schemas.openxmlformats.org/package/2006/relationships}"


def _package(path: Path) -> SourcePackage:
    return SourcePackage(path.read_bytes(), path.name)


def _run_into(src: Path, target: Path) -> None:
    atomic_save(result_package(_package(src), run_case(CASE), INFO), target)


def _parts(path: Path) -> dict[str, bytes]:
    with zipfile.ZipFile(path) as zf:
        return {name: zf.read(name) for name in zf.namelist()}


def _sheet_parts(path: Path) -> dict[str, str]:
    """Sheet name -> part name, from the workbook part and its relationships."""
    parts = _parts(path)
    rels = ElementTree.fromstring(parts["xl/_rels/workbook.xml.rels"])
    target = {r.get("Id"): r.get("Target") for r in rels.iter(f"{REL}Relationship")}
    book = ElementTree.fromstring(parts["xl/workbook.xml"])
    rid = "{http://schemas.openxmlformats.org/officeDocument/2006/relationships}id"
    return {
        s.get("name"): "xl/" + target[s.get(rid)].lstrip("/").removeprefix("xl/")
        for s in book.iter(f"{MAIN}sheet")
    }


def cached_values(path: Path, sheet: str) -> dict[str, tuple[str, str]]:
    """(type, cached value) of each formula cell of ``sheet`` (ECMA-376 §18.3.1.4: <f> + <v>)."""
    xml = ElementTree.fromstring(_parts(path)[_sheet_parts(path)[sheet]])
    return {
        c.get("r"): (c.get("t") or "", c.find(f"{MAIN}v").text)
        for c in xml.iter(f"{MAIN}c")
        if c.find(f"{MAIN}f") is not None and c.find(f"{MAIN}v") is not None
    }


def _cells(ws) -> dict[str, tuple]:
    return {
        c.coordinate: (
            c.value,
            c.data_type,
            c.number_format,
            c.font.b,
            c.font.color.rgb if c.font.color else None,
            c.fill.fgColor.rgb,
            c.comment.text if c.comment else None,
        )
        for row in ws.iter_rows()
        for c in row
    }


def test_every_input_part_is_kept_byte_for_byte(tmp_path: Path) -> None:
    src = _engineer_workbook(tmp_path / "book.xlsx")
    before = _parts(src)
    _run_into(src, src)
    after = _parts(src)
    # Only the parts that list sheets, styles and content types are edited.
    edited = {
        "xl/workbook.xml",
        "xl/_rels/workbook.xml.rels",
        "[Content_Types].xml",
        "xl/styles.xml",
        "docProps/app.xml",
    }
    for name, data in before.items():
        if name not in edited:
            assert after[name] == data, name
    # The style sheet only grows: the input's own records are untouched and come first.
    styles = after["xl/styles.xml"].decode()
    for tag in ("fonts", "fills", "cellXfs"):
        old = re.search(rf"<{tag}[^>]*>(.*?)</{tag}>", before["xl/styles.xml"].decode())[1]
        assert re.search(rf"<{tag}[^>]*>(.*?)</{tag}>", styles)[1].startswith(old), tag


def test_every_input_cell_and_sheet_survives_a_run(tmp_path: Path) -> None:
    src = _engineer_workbook(tmp_path / "book.xlsx")
    before = load_workbook(src)
    _run_into(src, src)
    after = load_workbook(src)
    assert after.sheetnames[:3] == ["Members", "Engineer notes", "Lookup"]
    assert {"Envelopes", "Reactions", "Governing", "Run Log"} <= set(after.sheetnames)
    for name in ("Members", "Engineer notes", "Lookup"):
        assert _cells(after[name]) == _cells(before[name]), name
        assert after[name].sheet_state == before[name].sheet_state
    m0, m1 = before["Members"], after["Members"]
    assert m1.merged_cells.ranges == m0.merged_cells.ranges
    assert m1.column_dimensions["A"].width == m0.column_dimensions["A"].width
    assert m1.column_dimensions["C"].hidden
    assert m1.row_dimensions[2].height == m0.row_dimensions[2].height
    assert m1.freeze_panes == "A2"
    dv = m1.data_validations.dataValidation
    assert [(d.formula1, str(d.sqref)) for d in dv] == [('"design,legal,permit"', "G2:G20")]
    assert after.defined_names["SpanList"].attr_text == "Members!$B$2:$B$20"
    assert m1["D2"].data_type == "s" and m1["D2"].value == "=cmd|' /C calc'!A0"
    assert after.active.title == "Members"


def test_cached_formula_values_survive_and_a_rerun_asks_for_recalculation(
    tmp_path: Path,
) -> None:
    src = _engineer_workbook(tmp_path / "book.xlsx")
    _run_into(src, src)
    assert cached_values(src, "Members")["C2"] == ("", "0.6")
    notes = cached_values(src, "Engineer notes")
    assert notes["B1"] == ("", "80")
    assert notes["B2"] == ("str", "KV-0101 G1 ok")
    assert notes["B3"] == ("", "160")  # =MAX(Envelopes!E:E): kept as the input had it
    data_only = load_workbook(src, data_only=True)
    assert data_only["Members"]["C2"].value == pytest.approx(0.6)
    # A second run replaces the results that B3 reads, so the workbook asks the spreadsheet
    # program for a full recalculation on opening (ECMA-376 §18.2.2 calcPr fullCalcOnLoad).
    _run_into(src, src)
    calc = ElementTree.fromstring(_parts(src)["xl/workbook.xml"]).find(f"{MAIN}calcPr")
    assert calc is not None and calc.get("fullCalcOnLoad") == "1"
    assert cached_values(src, "Engineer notes")["B3"] == ("", "160")


def test_a_second_run_replaces_the_result_sheets(tmp_path: Path) -> None:
    src = _engineer_workbook(tmp_path / "book.xlsx")
    _run_into(src, src)
    first = load_workbook(src).sheetnames
    first_parts = set(_parts(src))
    assert _package(src).ours == (
        "Envelopes",
        "Reactions",
        "Governing",
        "Concurrent Forces",
        "Vehicle Summary",
        "Moment Charts",
        "Shear Charts",
        "Result Guide",
        "Run Log",
    )
    _run_into(src, src)
    assert load_workbook(src).sheetnames == first
    # The earlier sheets went with their drawing and charts: nothing is left over or doubled.
    assert set(_parts(src)) == first_parts


def test_out_leaves_the_input_bytes_unchanged(tmp_path: Path) -> None:
    src = _engineer_workbook(tmp_path / "book.xlsx")
    before = src.read_bytes()
    out = tmp_path / "copy" / "results.xlsx"
    out.parent.mkdir()
    _run_into(src, out)
    assert src.read_bytes() == before
    assert "Envelopes" in load_workbook(out).sheetnames


class _Boom(Exception):
    pass


class _FailingBook:
    def __init__(self, exc: BaseException) -> None:
        self.exc = exc

    def save(self, filename) -> None:
        filename.write(b"partial zip bytes")
        raise self.exc


@pytest.mark.parametrize("exc", [_Boom("disk went away"), KeyboardInterrupt()])
def test_a_failed_save_leaves_the_target_unchanged_and_no_temp_file(
    tmp_path: Path, exc: BaseException
) -> None:
    target = tmp_path / "book.xlsx"
    target.write_bytes(b"original bytes")
    with pytest.raises(type(exc)):
        atomic_save(_FailingBook(exc), target)
    assert target.read_bytes() == b"original bytes"
    assert [p.name for p in tmp_path.iterdir()] == ["book.xlsx"]


def test_a_full_disk_gives_a_clear_message(tmp_path: Path, monkeypatch) -> None:
    target = _engineer_workbook(tmp_path / "book.xlsx")
    before = target.read_bytes()

    def full(*_args, **_kw):
        raise OSError(errno.ENOSPC, "No space left on device")

    monkeypatch.setattr(os, "replace", full)
    with pytest.raises(SaveError, match=r"disk is full.*free some space.*was not changed"):
        atomic_save(result_package(_package(target), run_case(CASE), INFO), target)
    assert target.read_bytes() == before
    assert not [p for p in tmp_path.iterdir() if p.name.startswith(TEMP_PREFIX)]


def test_a_workbook_changed_during_the_run_is_not_overwritten(tmp_path: Path) -> None:
    target = tmp_path / "book.xlsx"
    target.write_bytes(b"saved by the engineer meanwhile")
    wb = Workbook()
    with pytest.raises(SaveError, match="changed by another program"):
        atomic_save(wb, target, expect_sha256="0" * 64)
    assert target.read_bytes() == b"saved by the engineer meanwhile"


@pytest.mark.skipif(os.name != "posix", reason="POSIX permission bits")
def test_the_replaced_file_keeps_its_permissions(tmp_path: Path) -> None:
    target = _engineer_workbook(tmp_path / "book.xlsx")
    target.chmod(0o640)
    atomic_save(load_workbook(target), target)
    assert stat.S_IMODE(target.stat().st_mode) == 0o640


def _with_user_chart_and_picture(src: Path) -> None:
    wb = load_workbook(src)
    chart = BarChart()
    chart.add_data(Reference(wb["Lookup"], min_col=1, min_row=1, max_row=1))
    wb["Engineer notes"].add_chart(chart, "D2")
    wb.save(src)
    buffer = io.BytesIO(src.read_bytes())
    with zipfile.ZipFile(buffer, "a") as zf:
        zf.writestr("xl/media/image1.png", b"\x89PNG not really")
    src.write_bytes(buffer.getvalue())


def test_charts_and_pictures_of_the_engineer_are_kept_by_an_in_place_run(tmp_path: Path) -> None:
    src = _engineer_workbook(tmp_path / "book.xlsx")
    _with_user_chart_and_picture(src)
    before = _parts(src)
    own = [n for n in before if n.startswith(("xl/charts/", "xl/drawings/", "xl/media/"))]
    assert len(own) >= 3
    for _ in range(2):  # the second run removes the first run's charts, never the engineer's
        _run_into(src, src)
        after = _parts(src)
        assert {n: after[n] for n in own} == {n: before[n] for n in own}
    notes = _sheet_parts(src)["Engineer notes"]
    assert after[notes] == before[notes]
    assert len(load_workbook(src)["Engineer notes"]._charts) == 1


@pytest.mark.parametrize(
    "part",
    [
        # Part names from ECMA-376 Part 1 (connections, query tables) and Excel's own
        # extensions (data model, rich values), from memory; openpyxl writes none of them.
        "xl/connections.xml",
        "xl/queryTables/queryTable1.xml",
        "xl/model/item.data",
        "xl/richData/rdrichvalue.xml",
    ],
)
def test_external_data_and_rich_values_are_kept(tmp_path: Path, part: str) -> None:
    src = _engineer_workbook(tmp_path / "book.xlsx")
    buffer = io.BytesIO(src.read_bytes())
    with zipfile.ZipFile(buffer, "a") as zf:
        zf.writestr(part, b"<kept-by-the-engineer/>")
    src.write_bytes(buffer.getvalue())
    _run_into(src, src)
    assert _parts(src)[part] == b"<kept-by-the-engineer/>"


def test_a_foreign_sheet_with_a_result_name_is_never_removed(tmp_path: Path) -> None:
    wb = Workbook()
    wb.active.title = "Members"
    wb.create_sheet("governing")["A1"] = "my own governing-load notes"
    path = tmp_path / "book.xlsx"
    wb.save(path)
    with pytest.raises(BookProblem, match="governing: this sheet has the name of a spanfleet"):
        _package(path)


def test_lock_files_of_spreadsheet_programs_are_found(tmp_path: Path) -> None:
    book = tmp_path / "inventory.xlsx"
    book.write_bytes(b"x")
    assert open_elsewhere(book) is None
    (tmp_path / ".~lock.inventory.xlsx#").write_text("user,host")
    assert open_elsewhere(book) == tmp_path / ".~lock.inventory.xlsx#"
