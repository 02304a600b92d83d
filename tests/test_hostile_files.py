"""Hostile, damaged and mislabelled files: a clear problem each, never a traceback or a hang.

Sources (file formats, from memory unless noted):
* zip archives: PKWARE APPNOTE.TXT (local header "PK\\x03\\x04"; the central
  directory records each member's uncompressed size at offset 24);
* .xlsx: ECMA-376 Part 2 (Open Packaging Conventions: "[Content_Types].xml");
  .xlsb keeps its workbook in "xl/workbook.bin" ([MS-XLSB]);
* OLE2 compound files: [MS-CFB] §2.2, header signature D0 CF 11 E0 A1 B1 1A E1;
  an encrypted OOXML file is such a compound file with an "EncryptedPackage"
  stream ([MS-OFFCRYPTO] §2.3.4.4); the old .xls is a compound file too;
* OpenDocument: OASIS ODF 1.2 Part 3, §3.3: a "mimetype" member holding
  "application/vnd.oasis.opendocument.spreadsheet";
* the "billion laughs" entity expansion attack (CVE-2003-1564), which
  defusedxml refuses (defusedxml documentation, "EntitiesForbidden").
"""

from __future__ import annotations

import io
import struct
import zipfile
from pathlib import Path

import openpyxl
import openpyxl.xml
import pytest

from batch.reading import safety, workbook
from batch.validating import read_input

OLE2_SIGNATURE = bytes.fromhex("D0CF11E0A1B11AE1")

BILLION_LAUGHS = (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
    '<!DOCTYPE lolz [<!ENTITY lol "lol">'
    + "".join(
        f'<!ENTITY lol{i} "{("&lol" + (str(i - 1) if i > 1 else "") + ";") * 10}">'
        for i in range(1, 10)
    )
    + "]>\n"
    '<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" count="1" '
    'uniqueCount="1"><si><t>&lol9;</t></si></sst>'
)


def _zip(members: dict[str, bytes | str]) -> bytes:
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w", zipfile.ZIP_DEFLATED) as z:
        for name, data in members.items():
            z.writestr(name, data)
    return buffer.getvalue()


def _members(path: Path) -> dict[str, bytes]:
    with zipfile.ZipFile(path) as z:
        return {n: z.read(n) for n in z.namelist()}


def _with_shared_strings(path: Path, shared_strings: str) -> bytes:
    """The workbook at ``path`` with a shared-strings part that cell Members!A2 uses."""
    parts = _members(path)
    types = parts["[Content_Types].xml"].decode()
    parts["[Content_Types].xml"] = types.replace(
        "</Types>",
        '<Override PartName="/xl/sharedStrings.xml" ContentType="application/'
        'vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/></Types>',
    ).encode()
    rels = parts["xl/_rels/workbook.xml.rels"].decode()
    parts["xl/_rels/workbook.xml.rels"] = rels.replace(
        "</Relationships>",
        '<Relationship Id="rIdSST" Type="http://schemas.openxmlformats.org/officeDocument/'
        '2006/relationships/sharedStrings" Target="sharedStrings.xml"/></Relationships>',
    ).encode()
    parts["xl/sharedStrings.xml"] = shared_strings.encode()
    return _zip(parts)


def _one_file_problem(path: Path) -> str:
    before = path.read_bytes()
    report = read_input(path)
    assert path.read_bytes() == before, "the input file must never change"
    assert report.case is None
    assert len(report.problems) == 1, [p.render() for p in report.problems]
    problem = report.problems[0]
    assert problem.render().startswith("file: ")
    assert "; " in problem.message, "the message says what to do"
    return problem.code


def test_openpyxl_parses_xml_through_defusedxml():
    assert openpyxl.xml.DEFUSEDXML


@pytest.mark.parametrize(
    ("name", "data", "code"),
    [
        pytest.param("book.xlsx", b"Member,Spans\nKV-1,60\n", "not-a-workbook", id="csv-as-xlsx"),
        pytest.param("book.csv", b"Member,Spans\nKV-1,60\n", "unsupported-file-type", id="csv"),
        pytest.param("book", b"\x00\x01binary", "unsupported-file-type", id="no-ending"),
        pytest.param("book.xlsx", b"", "file-empty", id="empty"),
        pytest.param("book.xlsx", _zip({"readme.txt": "hello"}), "not-a-workbook", id="plain-zip"),
        pytest.param(
            "book.xlsx",
            _zip({"[Content_Types].xml": "<Types/>", "word/document.xml": "<w/>"}),
            "not-a-workbook",
            id="word-document",
        ),
        pytest.param(
            "book.xlsx",
            OLE2_SIGNATURE + bytes(504) + "EncryptedPackage".encode("utf-16-le") + bytes(64),
            "encrypted-workbook",
            id="encrypted",
        ),
        pytest.param("book.xlsx", OLE2_SIGNATURE + bytes(1024), "xls-format", id="xls-named-xlsx"),
        pytest.param("book.xls", OLE2_SIGNATURE + bytes(1024), "xls-format", id="xls"),
        pytest.param(
            "book.ods",
            _zip(
                {
                    "mimetype": "application/vnd.oasis.opendocument.spreadsheet",
                    "content.xml": "<office:document-content/>",
                }
            ),
            "ods-format",
            id="ods",
        ),
        pytest.param(
            "book.xlsx",
            _zip({"[Content_Types].xml": "<Types/>", "xl/workbook.bin": b"\x83\x01"}),
            "xlsb-format",
            id="xlsb",
        ),
        pytest.param("book.xlsx", b"PK\x03\x04" + bytes(200), "damaged-zip", id="truncated-zip"),
    ],
)
def test_files_that_are_not_workbooks(tmp_path, name, data, code):
    path = tmp_path / name
    path.write_bytes(data)
    assert _one_file_problem(path) == code


def test_truncated_workbook(make_workbook, tmp_path):
    path = make_workbook(tmp_path)
    path.write_bytes(path.read_bytes()[:-100])  # the central directory is cut off
    assert _one_file_problem(path) == "damaged-zip"


def test_workbook_with_a_wrong_ending(make_workbook, tmp_path):
    path = make_workbook(tmp_path, name="book.xls")
    assert _one_file_problem(path) == "wrong-file-ending"


def test_workbook_with_garbage_sheet_xml(make_workbook, tmp_path):
    path = make_workbook(tmp_path)
    parts = _members(path)
    sheet = next(n for n in parts if n.startswith("xl/worksheets/"))
    parts[sheet] = b"<worksheet><sheetData><row r='1'><c r='A1' t='s'><v>7"
    path.write_bytes(_zip(parts))
    assert _one_file_problem(path) == "workbook-unreadable"


def test_declared_size_over_the_cap_is_refused_before_unpacking(make_workbook, tmp_path):
    # A zip-bomb-like declaration: the central directory claims ~2 GB for one member.
    data = bytearray(make_workbook(tmp_path).read_bytes())
    at = data.find(b"PK\x01\x02")
    struct.pack_into("<I", data, at + 24, 0x7FFF_FFFF)
    path = tmp_path / "bomb.xlsx"
    path.write_bytes(bytes(data))
    assert _one_file_problem(path) == "zip-too-large"


def test_total_size_and_member_count_caps(make_workbook, tmp_path, monkeypatch):
    path = make_workbook(tmp_path)
    monkeypatch.setattr(safety, "MAX_UNCOMPRESSED_BYTES", 1000)
    assert _one_file_problem(path) == "zip-too-large"
    monkeypatch.setattr(safety, "MAX_UNCOMPRESSED_BYTES", 10**9)
    monkeypatch.setattr(safety, "MAX_ZIP_MEMBERS", 3)
    assert _one_file_problem(path) == "zip-too-large"


def test_file_size_cap(make_workbook, tmp_path, monkeypatch):
    monkeypatch.setattr(safety, "MAX_FILE_BYTES", 100)
    assert _one_file_problem(make_workbook(tmp_path)) == "file-too-large"


def test_billion_laughs_in_shared_strings(make_workbook, tmp_path):
    path = make_workbook(tmp_path)
    hostile = tmp_path / "laughs.xlsx"
    hostile.write_bytes(_with_shared_strings(path, BILLION_LAUGHS))
    assert _one_file_problem(hostile) == "xml-entities"


def test_billion_laughs_reaching_the_parser_is_refused_by_defusedxml(
    make_workbook, tmp_path, monkeypatch
):
    # Without the first look at the zip, openpyxl parses the part through defusedxml.
    monkeypatch.setattr(safety, "_entity_declarations", lambda archive, infos: None)
    path = make_workbook(tmp_path)
    hostile = tmp_path / "laughs.xlsx"
    hostile.write_bytes(_with_shared_strings(path, BILLION_LAUGHS))
    assert _one_file_problem(hostile) == "xml-entities"


def test_shared_strings_without_entities_read_normally(make_workbook, tmp_path):
    # The same construction with an ordinary shared string: proves the part is really read.
    plain = BILLION_LAUGHS.split("<!DOCTYPE")[0] + BILLION_LAUGHS.split("]>\n")[1]
    plain = plain.replace("&lol9;", "KV-0777 G4")
    path = make_workbook(tmp_path)
    parts = _members(path)
    sheet = next(n for n in parts if n.startswith("xl/worksheets/") and b"KV-0101" in parts[n])
    text = parts[sheet].decode()
    start = text.index('<c r="A2"')
    end = text.index("</c>", start) + len("</c>")
    text = text[:start] + '<c r="A2" t="s"><v>0</v></c>' + text[end:]
    rebuilt = tmp_path / "shared.xlsx"
    parts[sheet] = text.encode()
    rebuilt.write_bytes(_zip(parts))
    rebuilt.write_bytes(_with_shared_strings(rebuilt, plain))
    report = read_input(rebuilt)
    assert report.ok, [p.render() for p in report.problems]
    assert report.case is not None
    assert report.case.members[0].id == "KV-0777 G4"


def test_row_and_column_caps(make_workbook, tmp_path, monkeypatch):
    monkeypatch.setattr(workbook, "MAX_INPUT_ROWS", 3)
    monkeypatch.setattr(workbook, "MAX_INPUT_COLUMNS", 4)
    members = [{"Member": f"KV-{i:04d} G1", "Spans": 40} for i in range(5)]
    members[0] |= {"Hinges": None, "Span EI": None, "DF moment": None}
    path = make_workbook(tmp_path, members=members)
    report = read_input(path)
    assert sorted((p.sheet, p.cell, p.code) for p in report.problems) == [
        ("Members", "", "too-many-columns"),
        ("Members", "A5", "too-many-rows"),  # the first row past the cap, named by its cell
    ]
    assert all("; " in p.message for p in report.problems)


def test_data_far_below_the_cap_is_refused_by_its_cell(make_workbook, tmp_path, monkeypatch):
    # Rows past the cap are never dropped in silence, however far below the last row read
    # (issue 13: "whatever the size of a sheet").
    monkeypatch.setattr(workbook, "MAX_INPUT_ROWS", 3)
    path = make_workbook(tmp_path, members=[{"Member": "KV-0001 G1", "Spans": 40}])
    wb = openpyxl.load_workbook(path)
    wb["Members"]["B9000"] = 55
    wb.save(path)
    report = read_input(path)
    assert [(p.sheet, p.cell, p.code) for p in report.problems] == [
        ("Members", "B9000", "too-many-rows")
    ]


def test_rows_within_the_cap_are_read(make_workbook, tmp_path, monkeypatch):
    monkeypatch.setattr(workbook, "MAX_INPUT_ROWS", 5)
    members = [{"Member": f"KV-{i:04d} G1", "Spans": 40} for i in range(5)]
    report = read_input(make_workbook(tmp_path, members=members))
    assert report.ok
    assert report.case is not None
    assert len(report.case.members) == 5


def test_damaged_compressed_data(make_workbook, tmp_path):
    # A member marked deflated (method 8, APPNOTE 4.4.5) whose bytes are not a deflate stream:
    # zlib itself raises while the part is read, before any CRC check.
    parts = _members(make_workbook(tmp_path))
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w", zipfile.ZIP_STORED) as z:
        for name, data in parts.items():
            z.writestr(name, b"\xff" * 64 if name == "xl/workbook.xml" else data)
    data = bytearray(buffer.getvalue())
    name = b"xl/workbook.xml"
    # Local file header: method at offset 8, name at 30; central directory header: 10 and 46.
    for signature, method_at, name_at in ((b"PK\x03\x04", 8, 30), (b"PK\x01\x02", 10, 46)):
        at = data.find(signature)
        while at >= 0:
            if data[at + name_at : at + name_at + len(name)] == name:
                struct.pack_into("<H", data, at + method_at, 8)
            at = data.find(signature, at + 4)
    path = tmp_path / "inflate.xlsx"
    path.write_bytes(bytes(data))
    assert _one_file_problem(path) == "damaged-zip"


def test_a_part_that_unpacks_hundreds_of_times_its_size_is_refused(tmp_path):
    # Spreadsheet XML compresses about 5-20 times; a zip bomb hundreds of times or more
    # (common practice for zip-bomb screening). 64 MB of zeros deflate to about 64 kB.
    parts = {"[Content_Types].xml": b"<Types/>", "xl/worksheets/sheet1.xml": bytes(64 * 2**20)}
    path = tmp_path / "deflated-zeros.xlsx"
    path.write_bytes(_zip(parts))
    assert _one_file_problem(path) == "zip-too-large"
