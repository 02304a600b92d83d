"""Rows and columns a worksheet hides, found in its XML.

A spreadsheet program hides a row (by hand, or because a filter leaves it out) with
the attribute ``hidden="1"`` on its ``<row>`` element, and a column with
``hidden="1"`` on a ``<col>`` element spanning it (ECMA-376 Part 1, §18.3.1.73
``row`` and §18.3.1.13 ``col``). spanfleet reads hidden rows and columns like any
other; the reader only needs to know which they are, to say so. openpyxl's
read-only worksheets do not keep these attributes, so the part is scanned here,
in chunks (a sheet of a large inventory is tens of megabytes).
"""

from __future__ import annotations

import re
import zipfile
import zlib
from dataclasses import dataclass

__all__ = ["Hidden", "hidden_in_part"]

#: A row or col start tag, with or without a namespace prefix, and its attributes.
_TAG = re.compile(rb"<(?:\w+:)?(row|col)\b([^>]*)>")
_ATTR = re.compile(rb'\b(r|min|max|hidden)="([^"]*)"')
#: A filter set on a column of the sheet's autofilter.
_FILTER = re.compile(rb"<(?:\w+:)?filterColumn\b")
_CHUNK = 1 << 20


@dataclass(frozen=True)
class Hidden:
    """Row numbers and (1-based) column numbers that a sheet hides; whether it filters.

    ``filtered``: the sheet's autofilter has a filter set on a column (a
    ``filterColumn``, §18.3.2.7), which hides the rows it leaves out.
    """

    rows: frozenset[int] = frozenset()
    columns: frozenset[int] = frozenset()
    filtered: bool = False


def _whole(text: bytes) -> int | None:
    return int(text) if text.isdigit() and len(text) < 8 else None


def hidden_in_part(archive: zipfile.ZipFile, part: str, max_column: int) -> Hidden:
    """The hidden rows and columns (up to ``max_column``) of the worksheet ``part``.

    One pass over the part, a chunk at a time: a sheet of a million rows is never held
    in memory whole.

    Never raises for a damaged part: what cannot be read counts as not hidden
    (reading the sheet's values reports the damage).
    """
    rows: set[int] = set()
    columns: set[int] = set()
    filtered = False
    try:
        with archive.open(part) as fh:
            tail = b""
            while chunk := fh.read(_CHUNK):
                text = tail + chunk
                cut = text.rfind(b">") + 1
                text, tail = text[:cut], text[cut:]
                filtered = filtered or _FILTER.search(text) is not None
                if b"hidden" not in text:  # most chunks: nothing hidden, no tag to look at
                    continue
                for kind, attrs in _TAG.findall(text):
                    found = dict(_ATTR.findall(attrs))
                    if found.get(b"hidden") not in (b"1", b"true"):
                        continue
                    if kind == b"row":
                        number = _whole(found.get(b"r", b""))
                        if number is not None:
                            rows.add(number)
                        continue
                    low = _whole(found.get(b"min", b"")) or 1
                    high = min(_whole(found.get(b"max", b"")) or low, max_column)
                    columns.update(range(low, high + 1))
    except (KeyError, OSError, zipfile.BadZipFile, zlib.error, EOFError, ValueError):
        return Hidden()
    return Hidden(rows=frozenset(rows), columns=frozenset(columns), filtered=filtered)
