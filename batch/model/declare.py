"""How an input column is declared: once, as a field of the model's dataclass.

Every column of an input sheet (and every row of the Settings sheet) is one
field of a dataclass of :mod:`batch.model.case`, declared with :func:`column`.
The declaration carries everything the other stages need: the header and its
unit, the kind of value the reader expects, the rules the JSON Schema enforces,
the meaning and the example the template shows. The sheets
(:mod:`batch.model.sheets`), the JSON Schema (:mod:`batch.model.schema`), the
reader, the template and the docs' tables are all generated from these
declarations, so a column is added in one place.

Header matching is forgiving (case, surrounding spaces and a trailing part in
parentheses are ignored), see :func:`header_key`.
"""

from __future__ import annotations

import dataclasses
import re
from dataclasses import dataclass
from typing import Any, Literal

from batch.model.units import Quantity

__all__ = ["InputColumn", "InputSheet", "ValueKind", "column", "columns_of", "header_key"]

#: Kind of value in a column, as the reader reads it:
#: ``text`` free text; ``id`` text that must not be blank; ``number`` one number;
#: ``list`` numbers separated by commas, semicolons or spaces; ``spacing-list`` a
#: list whose entries may be ranges ``14-30``; ``choice`` one of ``choices``.
ValueKind = Literal["text", "id", "number", "list", "spacing-list", "choice"]


@dataclass(frozen=True, kw_only=True)
class InputColumn:
    """One column of an input sheet, or one row of the Settings sheet.

    ``key`` is the field's name (and the key in the normalised JSON document);
    ``header`` the column's header, or the setting's name in the Settings
    sheet. ``quantity`` gives the unit the header shows. For numbers (and the
    entries of lists) ``minimum``/``maximum`` bound the value inclusively and
    ``above``/``below`` exclusively; ``whole`` asks for a whole number;
    ``min_items`` is the least number of entries of a list. ``default`` is
    the value of a setting that is not given (``None`` for table columns:
    their defaults are the dataclass's). ``schema_note`` adds to the schema's
    description what a workbook user learns from the template instead.
    ``former`` lists headers the column had before, still accepted when read.
    """

    key: str
    header: str
    kind: ValueKind
    required: bool = False
    quantity: Quantity = ""
    choices: tuple[str, ...] = ()
    minimum: float | None = None
    maximum: float | None = None
    above: float | None = None
    below: float | None = None
    whole: bool = False
    min_items: int = 0
    meaning: str = ""
    example: str | float | None = None
    default: str | float | int | None = None
    former: tuple[str, ...] = ()

    @property
    def headers(self) -> tuple[str, ...]:
        """Every header the column is read under: its own, then its former ones."""
        return (self.header, *self.former)


def column(
    header: str,
    kind: ValueKind,
    *,
    default: Any = dataclasses.MISSING,
    required: bool = False,
    quantity: Quantity = "",
    choices: tuple[str, ...] = (),
    minimum: float | None = None,
    maximum: float | None = None,
    above: float | None = None,
    below: float | None = None,
    whole: bool = False,
    min_items: int = 0,
    meaning: str = "",
    example: str | float | None = None,
    former: tuple[str, ...] = (),
) -> Any:
    """A dataclass field that is also an input column (see :class:`InputColumn`).

    Use it as the field's default: ``spans: tuple[float, ...] = column("Spans",
    "list", ...)``. A field without ``default`` must be given (``required``).
    The key is the field's name, filled in by :func:`columns_of`.
    """
    declared = InputColumn(
        key="",
        header=header,
        kind=kind,
        required=required,
        quantity=quantity,
        choices=choices,
        minimum=minimum,
        maximum=maximum,
        above=above,
        below=below,
        whole=whole,
        min_items=min_items,
        meaning=meaning,
        example=example,
        default=None if default is dataclasses.MISSING else default,
        former=former,
    )
    return dataclasses.field(default=default, metadata={"column": declared})


def columns_of(model: type) -> tuple[InputColumn, ...]:
    """The declared input columns of a dataclass, in field order, keys filled in."""
    return tuple(
        dataclasses.replace(f.metadata["column"], key=f.name)
        for f in dataclasses.fields(model)
        if "column" in f.metadata
    )


@dataclass(frozen=True, kw_only=True)
class InputSheet:
    """One input sheet: its name, its key in the JSON document, its columns and purpose.

    ``required`` sheets must be in every input and hold at least one row.
    """

    name: str
    key: str
    columns: tuple[InputColumn, ...]
    purpose: str
    required: bool = False

    def column(self, key: str) -> InputColumn:
        """The column whose key is ``key``."""
        for col in self.columns:
            if col.key == key:
                return col
        raise KeyError(f"{self.name} has no column {key!r}")


def header_key(text: object) -> str:
    """Normalise a header for matching: lower case, no trailing ``(...)``, no outer spaces."""
    s = str(text if text is not None else "").strip()
    s = re.sub(r"\s*\([^()]*\)\s*$", "", s)
    return re.sub(r"\s+", " ", s).strip().lower()
