"""Fuzz the command with mutated workbooks: never a traceback, every problem placed, input kept.

A small valid workbook of the (fictional) Kestrel Valley Highway Authority is
mutated in many ways: cells retyped (numbers, text, booleans, dates, formulas
with and without a saved result, error values, text that looks like a formula),
rows, columns and headers deleted or inserted, ids blanked or duplicated, sheets
renamed, swapped, moved, hidden or deleted, and the file's bytes damaged
(garbage appended or inserted, the file truncated, a byte flipped, zip members
removed, garbled or cut short, XML entity declarations added). Issue 13 adds the
inputs that once gave a silently wrong result: decimal commas and mixed separators
in number and list cells, numbers too small or too large to honour, header units
spanfleet does not know, two sheets with one name, data under no header or below
the last row read, and hidden rows. Each mutated workbook goes through ``check``,
an in-place ``run`` and ``run --out``; a JSON document fuzz adds what only JSON can
carry (NaN, infinities, overflowing numbers, control characters, lone surrogates).

What must hold for every case, from docs/workbook.md (this repository's
specification of the workbook: "The command", "Problem messages") and issue 7:

* the exit status is 0 or 1: never 3 (internal error), never a traceback;
* every printed problem names where it is: ``Sheet!A1: ...``, ``Sheet: ...``
  (a whole sheet) or ``file: ...`` / ``BOOK.xlsx: ...`` (the whole file); A1
  references are column letters then a row number (ECMA-376 Part 1, §18.3.1.4,
  the ``r`` attribute of a cell);
* ``check`` and ``run --out`` never change the input's bytes, nor does an
  in-place ``run`` that fails; a successful in-place run leaves a workbook that
  opens and still holds every sheet it had; no temporary file is left behind;
* no silent change of count (issue 13): after a successful run, the members,
  spans and axles the Run Log says were analysed are those the workbook holds,
  counted here from the cells themselves.

Zip damage follows the archive layout of PKWARE's APPNOTE.TXT (local headers,
central directory, end record); the rest is common practice for fuzzing a file
reader. The hypothesis run is derandomized (a fixed seed, no example database)
so every run tries the same cases, and it counts them: at least
:data:`MIN_DISTINCT_CASES` distinct mutation programs per run.
"""

from __future__ import annotations

import contextlib
import datetime as dt
import io
import json
import re
import subprocess
import sys
import warnings
import zipfile
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import openpyxl
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from batch.command.cli import EXIT_OK, EXIT_PROBLEMS, main
from batch.model.sheets import INPUT_SHEETS
from batch.reading import workbook
from batch.writing.package.save import TEMP_PREFIX

#: Distinct mutation programs the fuzz run must try (issue 7: "at least 500 ways per run").
MIN_DISTINCT_CASES = 500
#: Examples hypothesis draws; a few more than the minimum, as two draws may coincide.
FUZZ_EXAMPLES = 530

INPUT_NAMES = ("Settings", "Members", "Vehicles")
EXTRA_SHEET = "Inspection notes"
SHEETS = (*INPUT_NAMES, EXTRA_SHEET)
#: A1 reference of one cell: column letters, then a row number from 1.
A1 = r"[A-Z]{1,3}[1-9][0-9]*"


# ---------------------------------------------------------------- the valid workbook


def _base_workbook(folder: Path, make: Callable[..., Path]) -> bytes:
    """A tiny valid KVHA workbook: two members, two vehicles, one station interval per span."""
    path = make(
        folder,
        settings={"Units": "US", "Stations per span": 1, "Directions": "both", "Chart members": 0},
        members=[
            {
                "Member": "KV-0101 G1",
                "Spans (ft)": 60,
                "Hinges (ft)": None,
                "DF moment": 0.6,
                "Description": "Alder Brook culvert deck",
            },
            {"Member": "KV-0207 G2", "Spans (ft)": "30, 40", "Description": "Heron Creek"},
        ],
        vehicles=[
            {
                "Vehicle": "KV-T3",
                "Axle loads (kip)": "10, 30, 30",
                "Axle spacings (ft)": "14, 14-30",
                "Lane load (kip/ft)": 0.64,
                "Factor": 1,
                "Library": None,
                "Description": "KVHA gravel truck",
            },
            {"Vehicle": "KV-HL", "Library": "HL-93"},
        ],
        extra={EXTRA_SHEET: [["Inspector", "Date"], ["R. Okafor", dt.date(2024, 5, 2)]]},
        name="base.xlsx",
    )
    data = path.read_bytes()
    path.unlink()
    return data


@pytest.fixture
def base_bytes(tmp_path: Path, make_workbook: Callable[..., Path]) -> bytes:
    return _base_workbook(tmp_path, make_workbook)


# ---------------------------------------------------------------- mutations of the workbook


@dataclass(frozen=True)
class SetCell:
    """Give one cell a value of some type (``how``: how the value is stored)."""

    sheet: str
    ref: str
    how: str  # number, text, bool, date, formula, error, blank
    value: Any

    def apply(self, wb: Any) -> None:
        if self.sheet not in wb.sheetnames:
            return
        cell = wb[self.sheet][self.ref]
        cell.value = self.value
        if self.how in ("text", "comma", "header") and isinstance(self.value, str):
            cell.data_type = "s"  # text that looks like a formula stays text


@dataclass(frozen=True)
class CachedFormula:
    """A formula saved with a result, as a spreadsheet program writes it (``t``: result type)."""

    sheet: str
    ref: str
    formula: str
    t: str  # "" number, "str" text, "b" boolean, "e" error
    cached: str

    def apply(self, wb: Any) -> None:
        if self.sheet in wb.sheetnames:
            wb[self.sheet][self.ref] = self.formula

    def patch(self, data: bytes, order: list[str]) -> bytes:
        """Add the saved result to the formula cell in the written package."""
        if self.sheet not in order:
            return data
        part = f"xl/worksheets/sheet{order.index(self.sheet) + 1}.xml"
        t = f' t="{self.t}"' if self.t else ""
        pattern = re.compile(
            rf'<c r="{self.ref}"([^>]*)><f>{re.escape(self.formula[1:])}</f><v\s*/>'.encode()
        )
        new = rf'<c r="{self.ref}"\1{t}><f>{self.formula[1:]}</f><v>{self.cached}</v>'.encode()
        return _map_member(data, part, lambda xml: pattern.sub(new, xml))


@dataclass(frozen=True)
class CopyCell:
    """Copy one cell's value onto another: a duplicated id or header."""

    sheet: str
    source: str
    target: str

    def apply(self, wb: Any) -> None:
        if self.sheet in wb.sheetnames:
            ws = wb[self.sheet]
            ws[self.target] = ws[self.source].value


@dataclass(frozen=True)
class Lines:
    """Delete or insert rows or columns (row 1, the header row, included)."""

    sheet: str
    action: str  # delete_rows, insert_rows, delete_cols, insert_cols
    index: int
    amount: int

    def apply(self, wb: Any) -> None:
        if self.sheet in wb.sheetnames:
            getattr(wb[self.sheet], self.action)(self.index, self.amount)


@dataclass(frozen=True)
class Merge:
    """Merge a range of cells (only the top-left cell keeps its value)."""

    sheet: str
    cells: str

    def apply(self, wb: Any) -> None:
        if self.sheet in wb.sheetnames:
            wb[self.sheet].merge_cells(self.cells)


@dataclass(frozen=True)
class HideRows:
    """Hide rows of a sheet, by hand or as a filter leaves them (``action``: hide-rows)."""

    sheet: str
    rows: tuple[int, ...]
    action: str = "hide-rows"

    def apply(self, wb: Any) -> None:
        if self.sheet in wb.sheetnames:
            for row in self.rows:
                wb[self.sheet].row_dimensions[row].hidden = True


@dataclass(frozen=True)
class SheetOp:
    """Rename, delete, move, hide or clear a sheet, swap two, or add a new one."""

    action: str  # rename, swap, delete, move, hide, clear, add, twin
    sheet: str
    arg: Any = None

    def apply(self, wb: Any) -> None:
        if self.action == "add":
            wb.create_sheet(self.sheet)["A1"] = self.arg
            return
        if self.action == "twin":  # a copy whose name differs only in case and spaces
            if self.sheet in wb.sheetnames:
                wb.copy_worksheet(wb[self.sheet]).title = self.arg
            return
        if self.sheet not in wb.sheetnames:
            return
        ws = wb[self.sheet]
        if self.action == "rename":
            ws.title = self.arg
        elif self.action == "swap" and self.arg in wb.sheetnames and self.arg != self.sheet:
            other = wb[self.arg]
            ws.title, other.title = "~swap~", self.sheet
            ws.title = self.arg
        elif self.action == "delete" and len(wb.sheetnames) > 1:
            wb.remove(ws)
        elif self.action == "move":
            wb.move_sheet(ws, self.arg)
        elif self.action == "hide" and sum(s.sheet_state == "visible" for s in wb) > 1:
            ws.sheet_state = "hidden"
        elif self.action == "clear":
            ws.delete_rows(1, ws.max_row)


# ---------------------------------------------------------------- mutations of the bytes


def _map_member(data: bytes, name: str, change: Callable[[bytes], bytes]) -> bytes:
    """The zip ``data`` with member ``name`` replaced by ``change(old)`` (None: removed)."""
    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as zin, zipfile.ZipFile(out, "w") as zout:
        for info in zin.infolist():
            if info.filename != name:
                zout.writestr(info, zin.read(info))
                continue
            new = change(zin.read(info))
            if new is not None:
                zout.writestr(info, new)
    return out.getvalue()


def _member(data: bytes, index: int) -> str:
    with zipfile.ZipFile(io.BytesIO(data)) as z:
        names = sorted(z.namelist())
    return names[index % len(names)]


@dataclass(frozen=True)
class Damage:
    """Damage the file's bytes: whole-file edits, or edits to one zip member (by index)."""

    action: str  # append, insert, truncate, flip, remove, garble, cut, entities
    at: float = 0.0  # where, as a fraction of the file or member
    blob: bytes = b""
    index: int = 0

    def apply(self, data: bytes) -> bytes:
        pos = int(self.at * len(data))
        if self.action == "append":
            return data + self.blob
        if self.action == "insert":
            return data[:pos] + self.blob + data[pos:]
        if self.action == "truncate":
            return data[:pos]
        if self.action == "flip":
            return data[:pos] + bytes([data[pos] ^ (self.blob[0] or 1)]) + data[pos + 1 :]
        name = _member(data, self.index)
        if self.action == "remove":
            return _map_member(data, name, lambda old: None)
        if self.action == "garble":
            return _map_member(data, name, lambda old: self.blob)
        if self.action == "cut":
            return _map_member(data, name, lambda old: old[: int(self.at * len(old))])
        # entities: a DOCTYPE with an internal entity, the start of an expansion attack
        doctype = b'<!DOCTYPE x [<!ENTITY e "kvha">]>'
        after_declaration = re.compile(rb"^(<\?xml[^>]*\?>)?")
        return _map_member(
            data, name, lambda old: after_declaration.sub(rb"\1" + doctype, old, count=1)
        )


# ---------------------------------------------------------------- strategies

_SHEET = st.sampled_from(SHEETS)
_INPUT = st.sampled_from(INPUT_NAMES)
_ROW = st.integers(1, 4)
_COL = st.sampled_from("ABCDEFGH")
_REF = st.builds(lambda c, r: f"{c}{r}", _COL, _ROW)
# No control characters: openpyxl refuses them in cells (XML 1.0 cannot hold most of them).
_TEXT = st.text(
    st.characters(blacklist_categories=("Cc", "Cs"), max_codepoint=0x2FFF)
    | st.sampled_from(list("0123456789,;- .=+@#!()'\"%/eE")),
    max_size=14,
)
_TEXT_VALUES = (
    _TEXT
    | st.sampled_from(["60, 80, 60", "14-30", "30-14", "1e400", "-0", "NaN", "inf", "N/A", "—"])
    | st.sampled_from(["=cmd|' /C calc'!A0", "=1+1", "+60", "@SUM(1)", "-40", "HL-93", "hl93"])
    | st.just("x" * 5000)
)
_NUMBERS = (
    st.integers(-(10**15), 10**15)
    | st.floats(allow_nan=True, allow_infinity=True)
    | st.sampled_from([0, -1, 1e-300, 1e300, 0.5, 30, 2**53 + 1])
)
#: Texts that once became silently wrong numbers (issue 13): decimal commas, list entries
#: typed without spaces, thousands separators, numbers too small or large to honour.
_COMMA_VALUES = st.sampled_from(
    [
        "12,5, 14",
        "60,80,60",
        "0,62",
        "1,250",
        "14,5-30",
        "1 250, 30, 30",
        "60, 80 60",
        "1\u00a0250",
        "60, 0.001, 60",
        "0.5",
        "1e308, 1e308",
        "1e-300",
        "60, 1e999",
        "1e300",
    ]
)
#: Header cells with units, known and unknown.
_HEADERS = st.sampled_from(
    [
        "Spans (chains)",
        "Spans (m)",
        "Spans (left to right)",
        "Axle loads (t)",
        "Axle loads (kN)",
        "Axle spacings (yd)",
        "Lane load (kN/m)",
        "Hinges (ft)",
        "DF moment (%)",
        "Remarks",
    ]
)
#: Below the last row read: the fuzz test lowers the cap to this many rows.
FUZZ_ROW_CAP = 40
_FAR_REF = st.builds(lambda c, r: f"{c}{r}", _COL, st.integers(FUZZ_ROW_CAP + 2, 5000))
_FORMULAS = st.sampled_from(
    ["=1/0", "=A1", "=SUM(B2:B3)", "=30+30", "=NA()", '="60, 40"', "=Members!B2", "=B2*2"]
)
_SET_CELL = st.one_of(
    st.builds(SetCell, _SHEET, _REF, st.just("number"), _NUMBERS),
    st.builds(SetCell, _SHEET, _REF, st.just("text"), _TEXT_VALUES),
    st.builds(SetCell, _SHEET, _REF, st.just("bool"), st.booleans()),
    st.builds(
        SetCell,
        _SHEET,
        _REF,
        st.just("date"),
        st.dates(dt.date(1900, 3, 1)) | st.datetimes(dt.datetime(1900, 3, 1)) | st.times(),
    ),
    st.builds(SetCell, _SHEET, _REF, st.just("formula"), _FORMULAS),
    st.builds(
        SetCell, _SHEET, _REF, st.just("error"), st.sampled_from(["#DIV/0!", "#N/A", "#REF!"])
    ),
    st.builds(SetCell, _SHEET, _REF, st.just("blank"), st.none()),
    st.builds(SetCell, _INPUT, _REF, st.just("comma"), _COMMA_VALUES),
    st.builds(
        SetCell,
        _INPUT,
        st.builds(lambda c: f"{c}1", _COL),
        st.just("header"),
        _HEADERS,
    ),
    st.builds(SetCell, _INPUT, _FAR_REF, st.just("far"), _COMMA_VALUES | st.just("KV-9999")),
)
_CACHED = st.builds(
    CachedFormula,
    _INPUT,
    st.builds(lambda c, r: f"{c}{r}", _COL, st.integers(2, 4)),
    _FORMULAS.filter(lambda f: "<" not in f and "&" not in f),
    st.sampled_from(["", "str", "b", "e"]),
    st.sampled_from(["60", "1e999", "-5", "0", "60, 40", "#DIV/0!", "1", "KV-0101 G1", ""]),
)
_STRUCTURE = st.one_of(
    st.builds(
        Lines,
        _SHEET,
        st.sampled_from(["delete_rows", "insert_rows", "delete_cols", "insert_cols"]),
        st.integers(1, 4),
        st.integers(1, 2),
    ),
    st.builds(CopyCell, st.sampled_from(("Members", "Vehicles")), _REF, _REF),
    st.builds(Merge, _INPUT, st.sampled_from(["A1:B1", "A2:A3", "B2:C3", "A1:A2"])),
    st.builds(
        SheetOp,
        st.just("rename"),
        _SHEET,
        st.sampled_from(["members", " VEHICLES ", "Member", "Vehicles", "Envelopes", "Run Log"])
        | st.text(st.characters(whitelist_categories=("L", "N", "Zs")), min_size=1, max_size=20),
    ),
    st.builds(SheetOp, st.just("swap"), _SHEET, _SHEET),
    st.builds(SheetOp, st.sampled_from(["delete", "hide", "clear"]), _SHEET),
    st.builds(SheetOp, st.just("move"), _SHEET, st.integers(-3, 3)),
    st.builds(
        SheetOp,
        st.just("twin"),
        _INPUT,
        st.sampled_from([" members ", "VEHICLES", "settings ", "Members", "Vehicles "]),
    ),
    st.builds(HideRows, _INPUT, st.lists(st.integers(2, 4), min_size=1, max_size=2).map(tuple)),
    st.builds(
        SheetOp,
        st.just("add"),
        st.sampled_from(["Capacities", "Governing", "KVHA notes", "settings"]),
        st.sampled_from(["Member", "note", None]),
    ),
)
_BLOB = st.binary(min_size=1, max_size=48)
_DAMAGE = st.one_of(
    st.builds(Damage, st.just("append"), blob=_BLOB),
    st.builds(Damage, st.just("insert"), st.floats(0, 1, exclude_max=True), _BLOB),
    st.builds(Damage, st.just("truncate"), st.floats(0, 1, exclude_max=True)),
    st.builds(Damage, st.just("flip"), st.floats(0, 1, exclude_max=True), _BLOB),
    st.builds(Damage, st.sampled_from(["remove", "entities"]), index=st.integers(0, 30)),
    st.builds(Damage, st.just("garble"), blob=_BLOB, index=st.integers(0, 30)),
    st.builds(Damage, st.just("cut"), st.floats(0, 1, exclude_max=True), index=st.integers(0, 30)),
)


@dataclass(frozen=True)
class Case:
    """One mutation program: workbook edits, then optionally damage to the saved bytes."""

    edits: tuple[Any, ...]
    damage: Damage | None

    def kinds(self) -> set[str]:
        """The kinds of mutation in the program (for counting coverage)."""
        found = {
            getattr(e, "how", None) or getattr(e, "action", None) or type(e).__name__
            for e in self.edits
        }
        if self.damage is not None:
            found.add(f"bytes-{self.damage.action}")
        return found


CASES = st.builds(
    Case,
    st.lists(_SET_CELL | _CACHED | _STRUCTURE, max_size=3).map(tuple),
    st.none() | _DAMAGE,
).filter(lambda case: case.edits or case.damage is not None)

#: Every mutation kind the strategy can draw; the run must try each of them.
ALL_KINDS = {
    *("number", "text", "bool", "date", "formula", "error", "blank"),
    *("CachedFormula", "CopyCell", "Merge"),
    *("delete_rows", "insert_rows", "delete_cols", "insert_cols"),
    *("rename", "swap", "delete", "move", "hide", "clear", "add"),
    *("comma", "header", "far", "twin", "hide-rows"),
    *(f"bytes-{a}" for a in ("append", "insert", "truncate", "flip", "remove", "garble")),
    *("bytes-cut", "bytes-entities"),
}


def build(base: bytes, case: Case) -> tuple[bytes, set[str]]:
    """The mutated file's bytes, and the sheet names it should have (for placing problems)."""
    if not case.edits and case.damage is not None:
        return case.damage.apply(base), set(SHEETS)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        wb = openpyxl.load_workbook(io.BytesIO(base))
    for edit in case.edits:
        edit.apply(wb)
    order = list(wb.sheetnames)
    buffer = io.BytesIO()
    wb.save(buffer)
    data = buffer.getvalue()
    for edit in case.edits:
        if isinstance(edit, CachedFormula):
            data = edit.patch(data, order)
    if case.damage is not None:
        data = case.damage.apply(data)
    return data, set(order)


# ---------------------------------------------------------------- running the command


@dataclass(frozen=True)
class Outcome:
    status: int
    out: list[str]
    err: list[str]


def call(*argv: str) -> Outcome:
    """``spanfleet ARGV`` in this process, with its output captured."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        status = main(list(argv))
    return Outcome(status, out.getvalue().splitlines(), err.getvalue().splitlines())


def placed(line: str, sheets: set[str], files: tuple[str, ...]) -> bool:
    """Whether a printed line starts by naming a cell, a sheet or the file."""
    line = line.removeprefix("warning: ")
    if line.startswith(tuple(f"{name}: " for name in ("file", *files))):
        return True
    if line.startswith(tuple(f"{name} " for name in files)):  # "BOOK.xlsx was not changed."
        return True
    return any(
        line.startswith(f"{s}: ") or re.match(rf"{re.escape(s)}!{A1}: ", line) for s in sheets
    )


def assert_clean_exit(result: Outcome, sheets: set[str], files: tuple[str, ...]) -> None:
    text = "\n".join(result.out + result.err)
    assert result.status in (EXIT_OK, EXIT_PROBLEMS), text
    assert "Traceback" not in text
    assert "internal error" not in text
    unplaced = [line for line in result.err if line.strip() and not placed(line, sheets, files)]
    assert not unplaced, text


# ---------------------------------------------------------------- what the workbook holds

_NUMBER_TEXT = re.compile(r"[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?")


def _key(text: object) -> str:
    """A header or sheet name as matched: lower case, no outer spaces, no trailing (...)."""
    return re.sub(r"\s*\([^()]*\)\s*$", "", str(text or "").strip()).strip().lower()


def _entries(value: object) -> int:
    """How many numbers a list cell holds, counted from its text."""
    if isinstance(value, int | float) and not isinstance(value, bool):
        return 1
    return len(_NUMBER_TEXT.findall(str(value or "")))


def _table(wb: Any, name: str) -> list[dict[str, object]]:
    """The non-blank rows of an input sheet as {header key: value}."""
    ws = next(wb[t] for t in wb.sheetnames if _key(t) == name)
    rows = [list(r) for r in ws.iter_rows(values_only=True)]
    if not rows:
        return []
    keys = [_key(h) for h in rows[0]]
    return [
        dict(zip(keys, row, strict=False))
        for row in rows[1:]
        if any(v is not None and str(v).strip() for v in row)
    ]


def assert_counts(source: bytes, written: bytes) -> None:
    """Members, spans and own axles the workbook holds are those its Run Log says were run."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        held = openpyxl.load_workbook(io.BytesIO(source), read_only=True, data_only=True)
        out = openpyxl.load_workbook(io.BytesIO(written), read_only=True, data_only=True)
    members, vehicles = _table(held, "members"), _table(held, "vehicles")
    log_rows = [tuple(r[:2]) for r in out["Run Log"].iter_rows(values_only=True)]
    held.close()
    out.close()
    log = dict(log_rows)
    assert log["Members"] == len(members), "every member row is analysed, no more"
    assert log["Vehicles"] == len(vehicles)
    spans = sum(_entries(m.get("spans")) for m in members)
    assert log["Supports (Reactions rows)"] - log["Members"] == spans, "no span gained or lost"
    cases = [str(v) for _, v in log_rows if str(v).startswith("vehicle row ")]
    for v in vehicles:
        if v.get("library") not in (None, "") or v.get("axle loads") is None:
            continue
        ident = v["vehicle"]
        if isinstance(ident, float) and ident.is_integer():
            ident = int(ident)  # an id typed as a number, as the reader shows it
        lead = f"vehicle row {str(ident).strip()}; axles "
        axles = {len(c[len(lead) :].split(";")[0].split(",")) for c in cases if c.startswith(lead)}
        assert axles == {_entries(v["axle loads"])}, f"axles of {v['vehicle']!r}"


def check_one(folder: Path, data: bytes, sheets: set[str]) -> None:
    """Every assertion of the module docstring, for one mutated file."""
    book, out = folder / "book.xlsx", folder / "results.xlsx"
    known = sheets | {s.name for s in INPUT_SHEETS}
    files = (book.name, out.name)
    book.write_bytes(data)

    checked = call("check", str(book))
    assert_clean_exit(checked, known, files)
    assert book.read_bytes() == data
    *lines, summary = checked.out
    assert summary.startswith(f"{book.name}: "), checked.out
    errors = [line for line in lines if not line.startswith("warning: ")]
    unplaced = [line for line in lines if not placed(line, known, files)]
    assert not unplaced, checked.out
    assert (checked.status == EXIT_PROBLEMS) == bool(errors), checked.out

    in_place = call("run", str(book), "-q")
    assert_clean_exit(in_place, known, files)
    assert set(errors) <= set(in_place.err), "run reports what check reports"
    if checked.status == EXIT_PROBLEMS:
        assert in_place.status == EXIT_PROBLEMS
    if in_place.status == EXIT_OK:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            written = openpyxl.load_workbook(io.BytesIO(book.read_bytes()), read_only=True)
        names = set(written.sheetnames)
        written.close()
        assert sheets <= names, "every sheet of the input is kept"
        assert "Envelopes" in names
        assert_counts(data, book.read_bytes())
        book.write_bytes(data)
    else:
        assert book.read_bytes() == data, "a failed run must leave the input as it was"

    copied = call("run", str(book), "--out", str(out), "-q")
    assert_clean_exit(copied, known, files)
    assert book.read_bytes() == data, "run --out must never change the input"
    assert copied.status == EXIT_PROBLEMS or checked.status == EXIT_OK
    assert out.exists() == (copied.status == EXIT_OK)
    out.unlink(missing_ok=True)
    assert not list(folder.glob(f"{TEMP_PREFIX}*")), "no temporary file may be left behind"


# ---------------------------------------------------------------- the tests


def test_the_base_workbook_is_valid_and_runs(base_bytes: bytes, tmp_path: Path) -> None:
    # Without this, every mutation could fail for the same dull reason.
    book = tmp_path / "book.xlsx"
    book.write_bytes(base_bytes)
    assert call("check", str(book)).status == EXIT_OK
    assert call("run", str(book), "-q").status == EXIT_OK


def test_fuzzed_workbooks(
    base_bytes: bytes, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # A low row cap, so that data "below the last row read" is a few rows away.
    monkeypatch.setattr(workbook, "MAX_INPUT_ROWS", FUZZ_ROW_CAP)
    seen: set[str] = set()
    kinds: set[str] = set()

    @settings(
        max_examples=FUZZ_EXAMPLES,
        deadline=None,
        derandomize=True,
        database=None,
        suppress_health_check=[HealthCheck.too_slow],
    )
    @given(CASES)
    def one(case: Case) -> None:
        seen.add(repr(case))
        kinds.update(case.kinds())
        data, sheets = build(base_bytes, case)
        check_one(tmp_path, data, sheets)

    one()
    print(f"fuzz: {len(seen)} distinct cases, {len(kinds)} kinds")
    assert len(seen) >= MIN_DISTINCT_CASES
    assert kinds >= ALL_KINDS, sorted(ALL_KINDS - kinds)


#: A few cases through a real ``python -m batch`` process (fresh interpreter, real streams),
#: with the exit status each must give. Bytes after a zip archive's end record are ignored
#: by readers that find the record by searching back from the end (APPNOTE.TXT 4.3.16).
SUBPROCESS_CASES = {
    "text-in-spans": (Case((SetCell("Members", "B2", "text", "sixty"),), None), EXIT_PROBLEMS),
    "truncated-file": (Case((), Damage("truncate", 0.6)), EXIT_PROBLEMS),
    "garbage-appended": (Case((), Damage("append", blob=b"\x00KVHA" * 8)), EXIT_OK),
}


@pytest.mark.parametrize("name", SUBPROCESS_CASES)
def test_fuzzed_workbooks_in_a_real_process(base_bytes: bytes, tmp_path: Path, name: str) -> None:
    case, status = SUBPROCESS_CASES[name]
    data, sheets = build(base_bytes, case)
    book = tmp_path / "book.xlsx"
    book.write_bytes(data)
    known = sheets | {s.name for s in INPUT_SHEETS}
    for argv in (["check", str(book)], ["run", str(book), "--out", str(tmp_path / "out.xlsx")]):
        done = subprocess.run(
            [sys.executable, "-m", "batch", *argv],
            capture_output=True,
            text=True,
            timeout=60,
            check=False,
        )
        result = Outcome(done.returncode, done.stdout.splitlines(), done.stderr.splitlines())
        assert_clean_exit(result, known, (book.name, "out.xlsx"))
        assert result.status == status, done.stderr
        assert book.read_bytes() == data


# ---------------------------------------------------------------- JSON documents

#: Raw JSON tokens a document may carry where a value belongs: what a workbook cannot
#: (RFC 8259 leaves NaN and Infinity out, Python's parser lets them in; control
#: characters and lone surrogates come in as \u escapes, W3C XML 1.0 §2.2 keeps them
#: out of a cell), and what looks like a number but is not one spanfleet can honour.
_RAW = [
    "NaN",
    "Infinity",
    "-Infinity",
    "1e999",
    "-1e999",
    "1e308",
    "1e-320",
    "123456789012345678901234567890",
    "-1",
    "0",
    '"\\u0007KV"',
    '"\\ud800"',
    '"KV\\udfff\\ud800"',
    '"\\uffff"',
    '"' + "x" * 33_000 + '"',
    '"60,5"',
    '"12,5, 14"',
    "null",
    "true",
    "[]",
    "{}",
    "[1e999]",
    '["\\u0000"]',
    "30",
    "0.5",
    '"KV-0999 G1"',
]
#: Distinct JSON cases the run must try.
JSON_EXAMPLES = 120
_PLACEHOLDER = "\u0001raw\u0001"


def _leaves(value: Any, path: tuple[Any, ...] = ()) -> list[tuple[Any, ...]]:
    if isinstance(value, dict):
        return [path] + [p for k, v in value.items() for p in _leaves(v, (*path, k))]
    if isinstance(value, list):
        return [path] + [p for k, v in enumerate(value) for p in _leaves(v, (*path, k))]
    return [path]


def _json_text(document: dict[str, Any], path: tuple[Any, ...], raw: str, new_key: bool) -> str:
    """The document with ``raw`` at ``path`` (or under a new key named by ``raw`` there)."""
    doc = json.loads(json.dumps(document))
    parent = doc
    for step in path[:-1]:
        parent = parent[step]
    if new_key and isinstance(parent, dict):
        parent[_PLACEHOLDER + "key"] = 1
        text = json.dumps(doc)
        key = raw if raw.startswith('"') else f'"{raw}"'
        return text.replace(json.dumps(_PLACEHOLDER + "key"), key)
    if path:
        parent[path[-1]] = _PLACEHOLDER
    else:
        doc = _PLACEHOLDER
    return json.dumps(doc).replace(json.dumps(_PLACEHOLDER), raw)


def test_fuzzed_json_documents(base_bytes: bytes, tmp_path: Path) -> None:
    from batch.validating import read_input

    book = tmp_path / "base.xlsx"
    book.write_bytes(base_bytes)
    document = read_input(book).document
    assert document is not None
    paths = [p for p in _leaves(document) if p]
    seen: set[str] = set()

    @settings(max_examples=JSON_EXAMPLES, deadline=None, derandomize=True, database=None)
    @given(st.sampled_from(paths), st.sampled_from(_RAW), st.booleans())
    def one(path: tuple[Any, ...], raw: str, new_key: bool) -> None:
        text = _json_text(document, path, raw, new_key)
        seen.add(text)
        doc, out = tmp_path / "case.json", tmp_path / "results.xlsx"
        doc.write_text(text, "utf-8")
        before = doc.read_bytes()
        checked = call("check", str(doc))
        ran = call("run", str(doc), "--out", str(out), "-q")
        for result in (checked, ran):
            body = "\n".join(result.out + result.err)
            assert result.status in (EXIT_OK, EXIT_PROBLEMS), body
            assert "internal error" not in body and "Traceback" not in body, body
        assert (checked.status == EXIT_OK) == (ran.status == EXIT_OK), "check says what run says"
        for line in ran.err:
            line = line.removeprefix("warning: ")
            assert line.startswith(("JSON /", "JSON: ", "file: ", "case.json", "results.xlsx"))
        assert doc.read_bytes() == before
        if ran.status == EXIT_OK:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                wb = openpyxl.load_workbook(out, read_only=True)
            log = {r[0]: r[1] for r in wb["Run Log"].iter_rows(max_col=2, values_only=True)}
            wb.close()
            parsed = read_input(doc).document
            assert parsed is not None
            assert log["Members"] == len(parsed["members"])
            out.unlink()

    one()
    assert len(seen) >= JSON_EXAMPLES * 0.9
