"""The streaming sheet writer, the style sheet and the XML text editor, read back by others.

Every sheet written here is read back with openpyxl and, where numbers matter,
with pandas, two independent SpreadsheetML readers. References:

* ECMA-376 Part 1 (SpreadsheetML): §18.3.1.4 cells (``t="inlineStr"``, ``t="b"``),
  §18.3.1.73 rows, §18.8.30 built-in number formats (ids 0-163, "0" = 1,
  "@" = 49), §18.8.21 the two reserved fills;
* XML 1.0 §2.2: the characters a document may hold;
* Python's float repr is the shortest string that reads back to the same double
  ("What's New in Python 3.1", repr of floats) — so numbers round-trip bit for bit;
* the spreadsheet limits 1,048,576 rows, 16,384 columns (last column XFD) and
  32,767 characters per cell: Microsoft's "Excel specifications and limits",
  from memory.
"""

from __future__ import annotations

import io
import math
import zipfile
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from openpyxl import load_workbook

from batch.writing.package.docprops import update_sheet_list
from batch.writing.package.splice import ResultBook, ResultPackage, SourcePackage, empty_package
from batch.writing.package.stream import MAX_TEXT, SheetStream, column_letter
from batch.writing.package.styles import HIGHLIGHT_RGB, CellFormat, StyleSheet, highlighted
from batch.writing.package.xmltext import Splice, XmlPartError, parse

NUMBERS = [0.1, 1 / 3, -0.0, 5e-324, 1e-300, 1.7976931348623157e308, -2.5, 2**53 + 1, 0, -7]
# Where the exponent form begins differs between writers (0.000025 or 2.5e-05, 1e+16).
NUMBERS += [2.5e-5, 1e-7, 1e16, 1e22, 123456789012345678.0, 0.30000000000000004]


def _save(write, tmp_path: Path, name: str = "out.xlsx") -> Path:
    """A results-only workbook holding what ``write(book)`` writes."""
    path = tmp_path / name
    package = ResultPackage(SourcePackage(empty_package(), name), write)
    with path.open("wb") as fh:
        package.save(fh)
    return path


def test_numbers_read_back_bit_for_bit_in_openpyxl_and_pandas(tmp_path: Path) -> None:
    floats = [float(v) for v in NUMBERS]

    def write(book: ResultBook) -> None:
        ws = book.new_sheet("Numbers")
        ws.header(["block", "row", "numpy"], [10, 10, 10])
        styles = [book.styles.xf(CellFormat("0.0"))] * 3
        for v in NUMBERS:
            ws.row([None, v, np.float64(v)], styles)
        ws.block([NUMBERS, [None] * len(NUMBERS), [None] * len(NUMBERS)], styles)

    path = _save(write, tmp_path)
    rows = list(load_workbook(path)["Numbers"].iter_rows(min_row=2, values_only=True))
    read = [r[1] for r in rows[: len(NUMBERS)]] + [r[0] for r in rows[len(NUMBERS) :]]
    assert [float(v).hex() for v in read] == [v.hex() for v in floats] * 2
    assert [float(r[2]).hex() for r in rows[: len(NUMBERS)]] == [v.hex() for v in floats]
    # pandas turns whole floats into integers (so -0.0 reads as 0); compare its numbers by value.
    frame = pd.read_excel(path, sheet_name="Numbers")
    assert frame["block"].iloc[len(NUMBERS) :].tolist() == floats  # float64 column
    assert math.copysign(1.0, read[2]) == -1.0  # -0.0 keeps its sign


def test_text_is_always_text_and_safe_xml(tmp_path: Path) -> None:
    texts = [
        "=cmd|' /C calc'!A0",
        '=HYPERLINK("http://x")',
        "<b>&amp; \"quoted\" 'single'",
        "  padded  ",
        "tab\there\nnew line",
        "bell\x07 nul\x00 esc\x1b gone",
        "Ω ∑ 漢字 🚚",
        "x" * (MAX_TEXT + 10),
    ]

    def write(book: ResultBook) -> None:
        ws = book.new_sheet("Texts")
        for t in texts:
            ws.row([t])
        ws.block([texts], [0])

    path = _save(write, tmp_path)
    ws = load_workbook(path)["Texts"]
    expected = [*texts[:5], "bell nul esc gone", texts[6], "x" * MAX_TEXT]
    got = [c.value for c in ws["A"]]
    assert got == expected * 2
    assert all(c.data_type == "s" for c in ws["A"])
    with zipfile.ZipFile(path) as zf:
        sheet = zf.read("xl/worksheets/sheet1.xml")
    assert b"<f>" not in sheet and b"<f " not in sheet


def test_empty_values_leave_no_cell_unless_marked(tmp_path: Path) -> None:
    def write(book: ResultBook) -> None:
        ws = book.new_sheet("Gaps")
        mark = book.styles.xf(highlighted(CellFormat("0.0")))
        ws.block([[1.0, None], ["", "b"]], [0, 0], {(1, 0): mark})
        ws.row([True, False])

    path = _save(write, tmp_path)
    ws = load_workbook(path)["Gaps"]
    assert [[c.value for c in r] for r in ws.iter_rows()] == [
        [1.0, None],
        [None, "b"],
        [True, False],
    ]
    assert ws["A2"].fill.fgColor.rgb.endswith(HIGHLIGHT_RGB) and ws["A2"].font.b
    assert ws["B1"].fill.fgColor.rgb == "00000000"  # the empty string is simply no cell


@pytest.mark.parametrize("bad", [math.nan, math.inf, -math.inf])
def test_a_number_a_cell_cannot_hold_is_refused(bad: float) -> None:
    ws = SheetStream(io.BytesIO(), "Bad", StyleSheet(None))
    with pytest.raises(ValueError, match="not a number"):
        ws.row([1.0, bad])
    with pytest.raises(ValueError, match="not a number"):
        ws.block([[1.0, None, bad]], [0])


def test_rows_go_top_to_bottom_and_layout_comes_first() -> None:
    ws = SheetStream(io.BytesIO(), "Order", StyleSheet(None))
    assert ws.row(["a", "b"]) == 1
    assert ws.block([[1, 2]], [0]) == 2
    assert ws.row(["c"]) == 4
    with pytest.raises(ValueError, match="before the first row"):
        ws.columns([10])
    with pytest.raises(ValueError, match="before the first row"):
        ws.freeze(1)
    with pytest.raises(ValueError, match="differ in length"):
        ws.block([[1, 2], [3]], [0, 0])
    ws.close()
    with pytest.raises(ValueError, match="closed"):
        ws.row(["after"])


def test_layout_freeze_widths_filter_and_formats(tmp_path: Path) -> None:
    def write(book: ResultBook) -> None:
        ws = book.new_sheet("Matrix")
        ws.columns([20, 8, 8])
        ws.freeze(1, 1)
        ws.autofilter = True
        ws.row(["Member", "V1", "V2"], ws.header_style)
        red = book.styles.xf(CellFormat("0.00", fill="F4C7C3"))
        marked = book.styles.xf(highlighted(CellFormat("0.00")))
        ws.row(["KV-0101 G1", 0.87, 1.31], [0, red, marked])

    ws = load_workbook(_save(write, tmp_path))["Matrix"]
    assert ws.freeze_panes == "B2"
    assert ws.auto_filter.ref == "A1:C2"
    assert ws.column_dimensions["A"].width == 20
    assert ws["A1"].font.b and ws["B2"].number_format == "0.00"
    assert ws["B2"].fill.fgColor.rgb.endswith("F4C7C3") and not ws["B2"].font.b
    assert ws["C2"].fill.fgColor.rgb.endswith(HIGHLIGHT_RGB) and ws["C2"].font.b


@pytest.mark.parametrize(
    ("j", "letters"), [(1, "A"), (26, "Z"), (27, "AA"), (702, "ZZ"), (703, "AAA"), (16384, "XFD")]
)
def test_column_letters(j: int, letters: str) -> None:
    assert column_letter(j) == letters


def test_column_letters_stop_at_the_sheet_edge() -> None:
    with pytest.raises(ValueError, match="outside a sheet"):
        column_letter(16385)


# ---------------------------------------------------------------- the style sheet

STYLES = b"""<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<x:styleSheet xmlns:x="http://schemas.openxmlformats.org/spreadsheetml/2006/main"
  xmlns:mc="http://schemas.openxmlformats.org/markup-compatibility/2006"
  xmlns:x14ac="http://schemas.microsoft.com/office/spreadsheetml/2009/9/ac"
  mc:Ignorable="x14ac"><!-- an engineer's own styles -->
<x:numFmts count="1"><x:numFmt numFmtId="170" formatCode="0.0"/></x:numFmts>
<x:fonts count="1" x14ac:knownFonts="1"><x:font><x:sz val="10"/><x:name val="Arial"/></x:font>
</x:fonts><x:fills count="2"><x:fill><x:patternFill patternType="none"/></x:fill>
<x:fill><x:patternFill patternType="gray125"/></x:fill></x:fills>
<x:borders count="1"><x:border/></x:borders>
<x:cellStyleXfs count="1"><x:xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></x:cellStyleXfs>
<x:cellXfs count="2"><x:xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/>
<x:xf numFmtId="170" fontId="0" fillId="0" borderId="0" xfId="0" applyNumberFormat="1"/>
</x:cellXfs></x:styleSheet>"""


def test_our_formats_are_appended_to_an_engineers_prefixed_style_sheet() -> None:
    sheet = StyleSheet(STYLES)
    plain = sheet.xf(CellFormat("0.0"))
    text = sheet.xf(CellFormat("@"))
    custom = sheet.xf(CellFormat("0.000", bold=True, fill="D3E1E8", wrap=True, vertical="top"))
    assert (plain, text, custom) == (2, 3, 4)  # after the engineer's two records
    assert sheet.xf(CellFormat("0.0")) == plain
    out = sheet.xml()
    assert out.startswith(STYLES.split(b"<x:numFmts")[0])  # declarations and mc:Ignorable kept
    _, root = parse(out, "styles")
    formats = {n.get("formatCode"): n.get("numFmtId") for n in root.find("numFmts").children}
    assert formats == {"0.0": "170", "0.000": "171"}  # reused, then a fresh id >= 164
    xfs = root.find("cellXfs").children
    assert root.find("cellXfs").get("count") == "5" == str(len(xfs))
    assert [x.get("numFmtId") for x in xfs[2:]] == ["170", "49", "171"]
    fonts = root.find("fonts").children
    assert root.find("fonts").get("count") == str(len(fonts)) == "2"
    assert [c.qname for c in fonts[1].children] == ["x:b", "x:sz", "x:name"]  # Arial, bold
    fills = root.find("fills").children
    assert fills[2].children[0].children[0].get("rgb") == "FFD3E1E8"
    assert xfs[4].find("alignment").attrs == {"wrapText": "1", "vertical": "top"}


def test_a_missing_list_is_created_in_schema_order() -> None:
    bare = STYLES.replace(
        b'<x:numFmts count="1"><x:numFmt numFmtId="170" formatCode="0.0"/></x:numFmts>', b""
    )
    sheet = StyleSheet(bare)
    sheet.xf(CellFormat("0.0"))
    _, root = parse(sheet.xml(), "styles")
    assert [c.local for c in root.children][:2] == ["numFmts", "fonts"]
    assert root.find("numFmts").children[0].get("numFmtId") == "164"


def test_a_workbook_without_styles_gets_a_minimal_valid_sheet() -> None:
    sheet = StyleSheet(None)
    assert sheet.xf(CellFormat(bold=True, fill=HIGHLIGHT_RGB)) == 1
    _, root = parse(sheet.xml(), "styles")
    assert len(root.find("fills").children) == 3  # none, gray125 (reserved), ours
    assert root.find("fills").children[1].children[0].get("patternType") == "gray125"


# ---------------------------------------------------------------- XML text editing


def test_parse_finds_elements_not_lookalikes_and_splice_keeps_every_other_byte() -> None:
    data = (
        b'<?xml version="1.0"?>\n<w:book xmlns:w="urn:w" xmlns:r="urn:r"><!-- <w:sheet/> -->'
        b'<w:sheets><w:sheet name="a&gt;b" r:id="1" note=\'x>y\'/><w:sheet name="c"></w:sheet>'
        b"</w:sheets><![CDATA[<w:sheet/>]]><w:names/></w:book>"
    )
    data, root = parse(data, "book")
    sheets = root.find("sheets")
    assert [s.get("name") for s in sheets.findall("sheet")] == ["a>b", "c"]
    assert [s.get("id") for s in sheets.findall("sheet")] == ["1", None]
    splice = Splice(data)
    splice.delete(sheets.children[0])
    splice.set_attrs(sheets.children[1], {"name": 'c "2"'})
    splice.append(root.find("names"), "<w:name/>")
    assert splice.apply() == data.replace(
        b'<w:sheet name="a&gt;b" r:id="1" note=\'x>y\'/><w:sheet name="c">',
        b'<w:sheet name="c &quot;2&quot;">',
    ).replace(b"<w:names/>", b"<w:names><w:name/></w:names>")


def test_entity_declarations_are_refused() -> None:
    bomb = b'<?xml version="1.0"?><!DOCTYPE x [<!ENTITY a "aaaa">]><x>&a;</x>'
    with pytest.raises(XmlPartError, match=r"part\.xml"):
        parse(bomb, "part.xml")


# ---------------------------------------------------------------- docProps/app.xml

APP = """<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Properties xmlns="http://schemas.openxmlformats.org/officeDocument/2006/extended-properties"
 xmlns:vt="http://schemas.openxmlformats.org/officeDocument/2006/docPropsVTypes">
<Application>Microsoft Excel</Application><HeadingPairs><vt:vector size="4" baseType="variant">
<vt:variant><vt:lpstr>Arbeitsblätter</vt:lpstr></vt:variant><vt:variant><vt:i4>4</vt:i4></vt:variant>
<vt:variant><vt:lpstr>Benannte Bereiche</vt:lpstr></vt:variant><vt:variant><vt:i4>1</vt:i4>
</vt:variant></vt:vector></HeadingPairs><TitlesOfParts><vt:vector size="5" baseType="lpstr">
<vt:lpstr>Members</vt:lpstr><vt:lpstr>Envelopes</vt:lpstr><vt:lpstr>Run Log</vt:lpstr>
<vt:lpstr>Notes</vt:lpstr><vt:lpstr>Envelopes</vt:lpstr></vt:vector></TitlesOfParts></Properties>
""".encode()


def test_the_sheet_list_of_the_document_properties_follows_the_sheets() -> None:
    out = update_sheet_list(
        APP,
        worksheets=["Members", "Notes"],
        gone=["Envelopes", "Run Log"],
        new=["Envelopes", "Governing", "Run Log"],
        sheets={"Members", "Envelopes", "Run Log", "Notes"},
    )
    _, root = parse(out, "app")
    titles = root.find("TitlesOfParts").find("vector")
    # The (localised) worksheet group loses the old sheets and gains the new ones; the named
    # range that happens to be called "Envelopes" stays.
    assert [t.text for t in titles.children] == [
        "Members",
        "Notes",
        "Envelopes",
        "Governing",
        "Run Log",
        "Envelopes",
    ]
    assert titles.get("size") == "6"
    counts = [v.children[0].text for v in root.find("HeadingPairs").find("vector").children[1::2]]
    assert counts == ["5", "1"]


def test_an_unfamiliar_sheet_list_is_dropped_not_guessed() -> None:
    broken = APP.replace(b"<vt:i4>1</vt:i4>", b"<vt:i4>7</vt:i4>")
    out = update_sheet_list(broken, ["Members"], ["Envelopes"], ["Envelopes"], {"Members"})
    _, root = parse(out, "app")
    assert root.find("HeadingPairs") is None and root.find("TitlesOfParts") is None
    assert root.find("Application").text == "Microsoft Excel"


@pytest.mark.parametrize("name", ["", "   ", "a" * 32, "Load/posting", "x[1]", "why?", "'quoted"])
def test_a_sheet_name_no_spreadsheet_allows_is_refused(name: str) -> None:
    # Sheet names: 1-31 characters, none of [ ] : * ? / \, not starting with an apostrophe
    # (common practice: the spreadsheet programs' own rules).
    book = ResultBook(
        SourcePackage(empty_package(), "x.xlsx"), zipfile.ZipFile(io.BytesIO(), "w"), None
    )
    with pytest.raises(ValueError, match="not a valid sheet name"):
        book.new_sheet(name)


def test_only_a_sheet_that_might_pass_2_gib_gets_zip64_headers(tmp_path: Path) -> None:
    # zipfile must decide on zip64 when a streamed entry opens (Python docs, ZipFile.open
    # force_zip64); small sheets must not carry the extension. Local file header layout and
    # the zip64 extra field (header id 0x0001): PKWARE APPNOTE.TXT §4.3.7 and §4.5.3.
    def write(book: ResultBook) -> None:
        book.new_sheet("Small", rows=10, columns=20).row([1.0])
        book.new_sheet("Huge", rows=1_048_576, columns=200).row([1.0])

    path = _save(write, tmp_path)
    data = path.read_bytes()
    with zipfile.ZipFile(path) as zf:
        offsets = {i.filename: i.header_offset for i in zf.infolist()}
    for part, zip64 in (("xl/worksheets/sheet1.xml", False), ("xl/worksheets/sheet2.xml", True)):
        at = offsets[part]
        name_len = int.from_bytes(data[at + 26 : at + 28], "little")
        extra_len = int.from_bytes(data[at + 28 : at + 30], "little")
        extra = data[at + 30 + name_len : at + 30 + name_len + extra_len]
        assert (extra[:2] == b"\x01\x00") is zip64, part


def test_a_sheet_of_known_size_declares_it_and_may_not_differ(tmp_path: Path) -> None:
    """The dimension (ECMA-376 Part 1, §18.3.1.35) is the used range; readers trust it.

    openpyxl's read-only mode (pandas' engine) takes a sheet's size from it; a wrong
    one would cut rows off silently, so a stream that wrote otherwise refuses to close.
    """

    def write(book: ResultBook) -> None:
        ws = book.new_sheet("Sized", rows=3, columns=2, exact=True)
        ws.header(["a", "b"], [10, 10])
        ws.block([[1.0, 2.0], [None, "x"]], [0, 0])

    path = _save(write, tmp_path)
    with zipfile.ZipFile(path) as zf:
        part = next(n for n in zf.namelist() if n.startswith("xl/worksheets/"))
        assert b'<dimension ref="A1:B3"/>' in zf.read(part)
    ws = load_workbook(path, read_only=True)["Sized"]
    assert (ws.max_row, ws.max_column) == (3, 2)

    def short(book: ResultBook) -> None:
        ws = book.new_sheet("Sized", rows=4, columns=2, exact=True)
        ws.header(["a", "b"], [10, 10])
        ws.row([1.0, 2.0])

    with pytest.raises(ValueError, match="2 rows and 2 columns written, not the 4 and 2"):
        _save(short, tmp_path, "short.xlsx")


def test_a_failed_write_reaches_the_writer_of_the_sheet() -> None:
    """Chunks are written on a thread of their own; a failure there is raised here, in order."""

    class Full(io.BytesIO):
        def write(self, data) -> int:  # type: ignore[no-untyped-def, override]
            if self.tell() > 100_000:
                raise OSError(28, "No space left on device")
            return super().write(data)

    ws = SheetStream(Full(), "Full", StyleSheet(None))
    ws.header(["a"], [10])
    with pytest.raises(OSError, match="No space left"):
        for _ in range(100):
            ws.block([[float(k) for k in range(1000)]], [0])
    with pytest.raises(OSError, match="No space left"):
        ws.close()  # the sheet was never whole: closing says so again, and lets go of it
    ws.close()  # closed already: nothing more to raise or to wait for


def test_numbers_past_64_bits_are_written_too() -> None:
    """The fast numeral writer knows 64-bit integers only; a larger one is still exact."""
    ws = SheetStream(io.BytesIO(), "Big", StyleSheet(None))
    ws.header(["n"], [10])
    ws.block([[2**70, 1.5]], [0])
    ws.close()
    xml = ws.fh.getvalue().decode()  # type: ignore[attr-defined]
    assert f"<v>{2**70}</v>" in xml and "<v>1.5</v>" in xml
