"""The cell reader against the quirks of cells typed by people and stored by spreadsheets.

Sources: the list, range and placeholder syntax is that of docs/workbook.md
(this repository's specification of the workbook, "Reading rules"); how spreadsheets store
cells (integers stored as floats, booleans, dates as serial numbers shown with
a date format, the error values #DIV/0!, #N/A, #REF! ...) is ECMA-376 Part 1,
§18.3.1.4 (c, cell) and §18.17.2 (error values), from memory; "-" and "N/A" as
"nothing here" is common practice in engineering tables.
"""

from __future__ import annotations

import datetime as dt

import pytest

from batch.reading.cells import Note, read_cell

RANGE = {"low": 14, "high": 30}

# (kind, raw cell value, number format, expected value or the Note code)
QUIRKS = [
    # numbers
    ("number", 60, "General", 60),
    ("number", 60.0, "General", 60.0),  # an integer stored as a float
    ("number", 0.33, "0%", 0.33),  # a percentage-formatted cell holds the fraction
    ("number", "  12.5 ", "General", 12.5),  # padded text
    ("number", "1e3", "General", 1000.0),
    ("number", "+7", "General", 7),
    ("number", None, "General", None),
    ("number", "   ", "General", None),
    ("number", "-", "General", None),
    ("number", "–", "General", None),
    ("number", "N/A", "General", None),
    ("number", "n/a", "General", None),
    ("number", True, "General", "boolean-in-number-cell"),
    ("number", False, "General", "boolean-in-number-cell"),
    ("number", "1,5", "General", "ambiguous-decimal-comma"),
    ("number", "1,500", "General", "ambiguous-decimal-comma"),
    ("number", float("nan"), "General", "not-finite"),
    ("number", float("inf"), "General", "not-finite"),
    ("number", "1e999", "General", "not-finite"),
    ("number", "nan", "General", "not-a-number"),
    ("number", dt.datetime(2024, 3, 1), "yyyy-mm-dd", "date-in-number-cell"),
    ("number", dt.time(12, 30), "h:mm", "date-in-number-cell"),
    ("number", "=1+1", "General", "formula-as-text"),
    ("number", "#DIV/0!", "General", "formula-error"),
    ("number", "#N/A", "General", "formula-error"),
    ("number", "#REF!", "General", "formula-error"),
    ("number", "60 ft", "General", "not-a-number"),
    ("number", "33%", "General", "not-a-number"),
    ("number", "60, 80", "General", "not-a-number"),
    ("number", "abc", "General", "not-a-number"),
    # lists (docs/workbook.md: commas, semicolons or spaces; one number may be a numeric cell)
    ("list", "60, 80, 60", "General", [60, 80, 60]),
    ("list", "60;80;60", "General", [60, 80, 60]),
    ("list", "60 80  60", "General", [60, 80, 60]),
    ("list", " 60, 80 , 60, ", "General", [60, 80, 60]),
    ("list", "60,,80", "General", [60, 80]),
    # the number rule (batch/reading/cells.py): a comma between two digits is never guessed at
    ("list", "1,5", "General", "ambiguous-decimal-comma"),
    ("list", "12,5, 14", "General", "ambiguous-decimal-comma"),
    ("list", "60,80,60", "General", "ambiguous-decimal-comma"),
    ("list", "1 250, 1 250", "General", "mixed-separators"),  # a space between thousands
    ("list", "60, 80 60", "General", "mixed-separators"),
    ("list", "1\u00a0250", "General", "thousands-separator"),
    ("number", "1\u202f250", "General", "thousands-separator"),
    ("number", "1,250,000", "General", "ambiguous-decimal-comma"),
    ("list", "42.5", "General", [42.5]),
    ("list", 75, "General", [75]),
    ("list", 75.0, "General", [75.0]),
    ("list", 120100, "#,##0", "list-stored-as-number"),  # "120,100" typed, stored as one number
    ("list", 1200, "0", [1200]),
    ("list", None, "General", None),
    ("list", "-", "General", None),
    ("list", True, "General", "boolean-in-number-cell"),
    ("list", dt.date(2024, 1, 5), "d/m/yyyy", "date-in-number-cell"),
    ("list", "60, x, 60", "General", "not-a-number"),
    ("list", "14-30", "General", "not-a-number"),  # ranges only in Axle spacings
    ("list", "60, inf", "General", "not-a-number"),
    ("list", "=A1+A2", "General", "formula-as-text"),
    # spacing lists (docs/workbook.md: an entry may be a range 14-30)
    ("spacing-list", "14, 14-30", "General", [14, RANGE]),
    ("spacing-list", "14, 14 - 30", "General", [14, RANGE]),
    ("spacing-list", "14 14 - 30", "General", [14, RANGE]),
    ("spacing-list", "14; 14–30", "General", [14, RANGE]),  # en dash
    ("spacing-list", "14, 14 to 30", "General", [14, RANGE]),
    ("spacing-list", "14, 14 TO 30", "General", [14, RANGE]),
    ("spacing-list", "4, 12-20, 4", "General", [4, {"low": 12, "high": 20}, 4]),
    ("spacing-list", "14-14", "General", [14]),
    ("spacing-list", "4.5-6.25", "General", [{"low": 4.5, "high": 6.25}]),
    ("spacing-list", 14, "General", [14]),
    ("spacing-list", "30-14", "General", "inverted-range"),
    ("spacing-list", "14, 30 - 14", "General", "inverted-range"),
    ("spacing-list", "14-30-40", "General", "bad-range"),
    ("spacing-list", "14-x", "General", "not-a-number"),
    ("spacing-list", "14, 14,5-30", "General", "ambiguous-decimal-comma"),
    # choices: case, spaces and hyphens ignored; unknown text passed on for the schema
    ("choice", "si", "General", "SI"),
    ("choice", " Left to Right ", "General", "left-to-right"),
    ("choice", "RIGHT_TO_LEFT", "General", "right-to-left"),
    ("choice", "sideways", "General", "sideways"),
    ("choice", "-", "General", None),
    ("choice", 3, "General", "3"),
    # text
    ("text", "  KV-0412 G1 ", "General", "KV-0412 G1"),
    ("text", 101, "General", "101"),
    ("text", 101.0, "General", "101"),  # an id typed as a number, stored as a float
    ("text", "=cmd|' /C calc'!A0", "General", "=cmd|' /C calc'!A0"),  # kept as text, never run
    ("text", "   ", "General", None),
]

CHOICES = ("US", "SI", "both", "left-to-right", "right-to-left")


@pytest.mark.parametrize(("kind", "raw", "number_format", "expected"), QUIRKS)
def test_cell_quirks(kind, raw, number_format, expected):
    got = read_cell(kind, raw, number_format, CHOICES)
    if isinstance(got, Note):
        assert got.code == expected, got.message
        assert "; " in got.message, "a note says what is wrong, then how to fix it"
    else:
        assert got == expected
        assert type(got) is type(expected)


def test_notes_name_the_fix():
    inverted = read_cell("spacing-list", "30-14")
    assert isinstance(inverted, Note)
    assert "14-30" in inverted.message
    comma = read_cell("number", "1,5")
    assert isinstance(comma, Note)
    assert "1.5" in comma.message


@pytest.mark.parametrize("kind", ["number", "list", "spacing-list", "choice", "text"])
@pytest.mark.parametrize(
    "raw", [object(), b"bytes", ["a"], {"x": 1}, dt.timedelta(days=1), "\x00", "–" * 1000]
)
def test_reader_never_raises(kind, raw):
    got = read_cell(kind, raw, "General", CHOICES)
    assert got is None or isinstance(got, Note | str | list | int | float)
