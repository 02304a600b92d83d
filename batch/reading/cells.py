"""Read one spreadsheet cell into a document value, or a note saying why not.

The readers here never raise: each returns the value for the normalised
document, ``None`` for a blank cell, or a :class:`Note` (a stable code and a
message saying what is wrong and how to fix it). They know the quirks of cells
typed by people and stored by spreadsheet programs: integers stored as floats,
padded text, placeholders such as ``-`` and ``N/A`` for "nothing here",
booleans and dates in number columns, a decimal comma, text that looks like a
formula, formula error values, and a list typed into a cell formatted with a
thousands separator (which the spreadsheet silently turned into one number).

**Separators and decimal marks.** One rule for every number and list cell, in both
unit systems (:data:`NUMBER_RULE`, which the template and docs/workbook.md state too):
a point is the decimal mark; list entries are separated by commas or semicolons
(spaces around them allowed) or by spaces alone, not by a mix of both in one cell; a
comma with a digit on each side and no space (``12,5``, ``1,250``, ``60,80``) is never
read, nor a no-break space between digits (a thousands separator). Each of these may
be a decimal comma, a thousands separator or list entries typed without a space, and
a guess would be silently wrong one way or the other, so such a cell is refused with
the fix.

Value kinds are those of :data:`batch.model.declare.ValueKind`:

* ``number``: one finite number;
* ``list``: numbers separated by commas, semicolons or spaces (``"60, 80, 60"``),
  or one number in a numeric cell;
* ``spacing-list``: like ``list``, but an entry may be a range ``14-30`` (also
  ``14 - 30``, ``14–30`` with an en dash, ``14 to 30``), which becomes
  ``{"low": 14, "high": 30}`` in the document;
* ``choice``: text matched to the allowed spellings, ignoring case, spaces and
  hyphens (``"Left to right"`` gives ``"left-to-right"``); an unknown choice is
  passed on as typed, for the schema to report with the list of choices;
* ``text``: the text with outer spaces removed; numbers become text (``101``).
"""

from __future__ import annotations

import datetime as dt
import math
import re
from dataclasses import dataclass

__all__ = ["NUMBER_RULE", "PLACEHOLDERS", "CellValue", "Note", "read_cell"]

#: Typed into a number, list or choice cell, these mean "nothing here" (blank).
PLACEHOLDERS = frozenset({"-", "–", "—", "n/a", "na"})

_NUMBER = re.compile(r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?")
# A comma with a digit on each side and no space: the ambiguity the number rule refuses.
_COMMA_BETWEEN_DIGITS = re.compile(r"(\d+),(\d+)")
# A no-break or narrow no-break space between digits: a thousands separator.
_GROUPED_DIGITS = re.compile(r"\d[\u00a0\u202f\u2009]\d")
# Between list entries: a comma or semicolon with any spaces around it (repeats collapse).
_LIST_COMMA = re.compile(r"\s*[,;][,;\s]*")
_WITH_UNIT = re.compile(r"([+-]?(?:\d+(?:\.\d*)?|\.\d+))\s*([a-zA-Z][a-zA-Z/\-·.]*)")
_SEPARATORS = re.compile(r"[,;\s]+")
# A range separator between two numbers: "-", en or em dash, or the word "to".
_RANGE = re.compile(r"(?<=[\d.])\s*(?:-|–|—|\bto\b)\s*(?=[+\d.])", re.IGNORECASE)
_FORMULA_ERROR = re.compile(r"#(?:N/A|[A-Z0-9/_]+[!?]?)")
_THOUSANDS_FORMAT = re.compile(r"[#0],[#0]")
_DATES = (dt.datetime, dt.date, dt.time, dt.timedelta)

#: The rule for separators and decimal marks, in the words the template and the docs use.
NUMBER_RULE = (
    "A point is the decimal mark (12.5); give no thousands separators. Separate list "
    "entries with commas or semicolons (60, 80, 60), or with spaces alone (60 80 60), not "
    "a mix of both. A comma between two digits with no space (12,5 or 60,80) is refused in "
    "every number and list cell, whatever the Units: it may be a decimal comma, a "
    "thousands separator or entries typed without a space, and spanfleet does not guess."
)

#: What a cell reader gives: a document value, ``None`` (blank) or a :class:`Note`.
CellValue = object


@dataclass(frozen=True)
class Note:
    """Why a cell could not be read: stable ``code`` and ``message`` (what is wrong; the fix)."""

    code: str
    message: str


def _shown(value: object) -> str:
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value)


def _not_finite(value: float) -> Note:
    return Note(
        "not-finite",
        f"{value} is not a finite number; type an ordinary number "
        "(a formula may have divided by zero)",
    )


def _common(value: object) -> CellValue:
    """Notes and blanks shared by every non-text kind; ``...`` when the value needs more work."""
    if value is None:
        return None
    if isinstance(value, bool):
        return Note(
            "boolean-in-number-cell",
            f"{str(value).upper()} is a true/false value, not a number; type the number",
        )
    if isinstance(value, _DATES):
        return Note(
            "date-in-number-cell",
            f"the cell holds a date or time ({value}), not a number; "
            "format the cell as Number or Text and type the value again",
        )
    if isinstance(value, float) and not math.isfinite(value):
        return _not_finite(value)
    if isinstance(value, str):
        s = value.strip()
        if not s or s.lower() in PLACEHOLDERS:
            return None
        if s.startswith("="):
            return Note(
                "formula-as-text",
                f"'{s}' is a formula stored as text, so it was never calculated; "
                "type the value, or enter the formula in a cell formatted as General "
                "so the spreadsheet calculates it",
            )
        if _FORMULA_ERROR.fullmatch(s):
            return Note(
                "formula-error",
                f"the cell shows the error {s}; correct the formula or type the value",
            )
    return ...


def _number_token(token: str, whole: str) -> float | int | Note:
    if not _NUMBER.fullmatch(token):
        hint = ""
        if "-" in token.lstrip("+-") or "–" in token:
            hint = " (a range such as 14-30 is allowed only in Axle spacings)"
        return Note(
            "not-a-number",
            f"'{token}' in '{whole}' is not a number{hint}; "
            "give numbers separated by commas, e.g. 60, 80, 60",
        )
    number = float(token)
    if not math.isfinite(number):
        return _not_finite(number)
    return int(token) if token.lstrip("+-").isdigit() else number


def _ambiguous(text: str, single: bool) -> Note | None:
    """The note of the number rule (module docstring) when ``text`` breaks it, else None."""
    grouped = _GROUPED_DIGITS.search(text)
    if grouped is not None:
        return Note(
            "thousands-separator",
            f"'{text}' has a no-break space between two digits, which is a thousands "
            "separator; type the numbers without thousands separators",
        )
    found = _COMMA_BETWEEN_DIGITS.search(text)
    if found is None:
        return None
    whole, frac = found.groups()
    readings = [f"the decimal {whole}.{frac}"]
    if len(frac) == 3 and whole.lstrip("0"):
        readings.append(f"the number {whole}{frac}")
    if not single:
        readings.append(f"the two entries {whole} and {frac}")
    fix = (
        "type it with a decimal point and no thousands separator"
        if single
        else f"write a decimal with a point ({whole}.{frac}) and separate entries with a "
        f"comma and a space ({whole}, {frac}) or a semicolon"
    )
    return Note(
        "ambiguous-decimal-comma",
        f"'{text}' is not read, as {found.group(0)} may be {' or '.join(readings)} "
        f"(spanfleet never guesses at a comma between two digits); {fix}",
    )


def _entries(text: str, whole: str) -> list[str] | Note:
    """The entries of list text (ranges joined by ``~``) of the cell ``whole``, or the note."""
    text = text.strip(" ,;")
    if not _LIST_COMMA.search(text):
        return text.split()
    tokens = _LIST_COMMA.split(text)
    mixed = next((t for t in tokens if len(t.split()) > 1), None)
    if mixed is not None:
        shown = mixed.replace("~", "-")
        return Note(
            "mixed-separators",
            f"'{whole}' separates its entries with commas or semicolons but has a space "
            f"inside '{shown}', so it is not clear where one entry ends (a space may also "
            "be a thousands separator); separate every entry the same way, e.g. 60, 80, 60",
        )
    return tokens


def _cell_number(value: object) -> CellValue:
    common = _common(value)
    if common is not ...:
        return common
    if isinstance(value, int | float):
        return value
    s = str(value).strip()
    if _NUMBER.fullmatch(s):
        number = float(s)
        if not math.isfinite(number):
            return _not_finite(number)
        return int(s) if s.lstrip("+-").isdigit() else number
    comma = _ambiguous(s, single=True)
    if comma is not None:
        return comma
    if s.endswith("%"):
        return Note(
            "not-a-number",
            f"'{s}' is a percentage typed as text; give a fraction (0.33 for 33 %)",
        )
    unit = _WITH_UNIT.fullmatch(s)
    if unit:
        return Note(
            "not-a-number",
            f"'{s}' has a unit in the cell; type the number only ({unit.group(1)}): "
            "units come from the Units setting and the header",
        )
    if len(_SEPARATORS.split(s)) > 1:
        return Note(
            "not-a-number",
            f"'{s}' is more than one value; this column takes one number",
        )
    return Note("not-a-number", f"'{s}' is not a number; type a number")


def _thousands_trap(value: float | int, number_format: str) -> Note | None:
    if abs(value) >= 1000 and _THOUSANDS_FORMAT.search(number_format or ""):
        return Note(
            "list-stored-as-number",
            f"the cell holds the single number {_shown(value)}, shown with a thousands "
            "separator: a list typed as 120,100 is stored this way; if you meant a list, "
            "format the cell as Text and type it again; if you meant one number, "
            "remove the thousands separator from the cell's number format",
        )
    return None


def _list(value: object, number_format: str, ranges: bool) -> CellValue:
    common = _common(value)
    if common is not ...:
        return common
    if isinstance(value, int | float):
        return _thousands_trap(value, number_format) or [value]
    whole = str(value).strip()
    comma = _ambiguous(whole, single=False)
    if comma is not None:
        return comma
    text = _RANGE.sub("~", whole) if ranges else whole
    tokens = _entries(text, whole)
    if isinstance(tokens, Note):
        return tokens
    out: list[object] = []
    for token in tokens:
        if "~" not in token:
            number = _number_token(token, whole)
            if isinstance(number, Note):
                return number
            out.append(number)
            continue
        ends = token.split("~")
        low = _number_token(ends[0], whole) if len(ends) == 2 and ends[0] else None
        high = _number_token(ends[1], whole) if len(ends) == 2 and ends[1] else None
        if isinstance(low, Note):
            return low
        if isinstance(high, Note):
            return high
        if low is None or high is None:
            return Note(
                "bad-range",
                f"'{whole}' has a range that is not of the form low-high; "
                "write each range as two numbers, e.g. 14-30",
            )
        if low > high:
            return Note(
                "inverted-range",
                f"the range {_shown(low)}-{_shown(high)} in '{whole}' runs backwards; "
                f"write the smaller spacing first: {_shown(high)}-{_shown(low)}",
            )
        out.append(low if low == high else {"low": low, "high": high})
    return out


def _canonical(text: str) -> str:
    return re.sub(r"[\s_-]+", "-", text.strip().lower())


def _choice(value: object, choices: tuple[str, ...]) -> CellValue:
    common = _common(value)
    if common is not ... or not isinstance(value, str):
        return common if common is not ... else _shown(value)
    wanted = _canonical(value)
    for choice in choices:
        if _canonical(choice) == wanted:
            return choice
    return value.strip()


def _text(value: object) -> CellValue:
    if value is None:
        return None
    s = _shown(value).strip()
    return s or None


def read_cell(
    kind: str, value: object, number_format: str = "General", choices: tuple[str, ...] = ()
) -> CellValue:
    """Read a cell ``value`` of the given kind (see the module docstring); never raises.

    ``number_format`` is the cell's format code (used to spot a list stored as
    one number); ``choices`` the allowed spellings of a ``choice`` cell.
    """
    if kind == "number":
        return _cell_number(value)
    if kind in ("list", "spacing-list"):
        return _list(value, number_format, ranges=kind == "spacing-list")
    if kind == "choice":
        return _choice(value, choices)
    return _text(value)
