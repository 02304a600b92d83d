"""Keep the cached values of formula cells when a workbook is written back.

openpyxl writes a formula without its last computed value, so after a run every
formula cell of the engineer's sheets would read as empty to any program that
does not recalculate (pandas, another spanfleet run) until the workbook is
opened and saved in a spreadsheet program. This module copies each formula
cell's cached value from the original package into the newly written one.

A cached value is *not* restored where the formula refers to a result sheet
(by name, or through a defined name that points into one): those results have
just been replaced, so the old value would be stale; the spreadsheet program
recalculates it on opening (openpyxl asks it to).
"""

from __future__ import annotations

import io
import re
import zipfile
from collections.abc import Iterable
from typing import BinaryIO
from xml.sax.saxutils import escape

from defusedxml import ElementTree
from openpyxl.workbook.workbook import Workbook

from batch.results import CHARTS_SHEET, RESULT_TABLES, RUN_LOG_SHEET, is_result_sheet_name
from batch.writers.preserve import sheet_parts

__all__ = ["CachedValue", "KeepCachedValues", "cached_values", "restore_cached_values"]

_MAIN_NS = "{http://schemas.openxmlformats.org/spreadsheetml/2006/main}"
#: A formula cell as openpyxl writes it: ``<c r="B2" s="1"><f>A1*2</f><v /></c>``.
_FORMULA_CELL = re.compile(
    r'<c r="(?P<ref>[A-Z]+[0-9]+)"(?P<attrs>[^>]*)>'
    r"(?P<f><f[^>]*/>|<f[^>]*>(?P<text>[^<]*)</f>)<v\s*/></c>"
)
#: Cell types a cached value may have (absent: a number).
_CACHED_TYPES = {"str", "b", "e", "n"}

#: (type attribute or "", value text) of one formula cell.
CachedValue = tuple[str, str]


def cached_values(data: bytes, sheets: Iterable[str]) -> dict[str, dict[str, CachedValue]]:
    """Cached values of the formula cells of the named sheets, by sheet and cell reference."""
    out: dict[str, dict[str, CachedValue]] = {}
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        parts = sheet_parts(zf)
        for name in sheets:
            part = parts.get(name)
            if not part or part not in zf.namelist():
                continue
            cells: dict[str, CachedValue] = {}
            for c in ElementTree.fromstring(zf.read(part)).iter(f"{_MAIN_NS}c"):
                v = c.find(f"{_MAIN_NS}v")
                kind = c.get("t") or ""
                if c.find(f"{_MAIN_NS}f") is None or v is None or v.text is None:
                    continue
                if kind and kind not in _CACHED_TYPES:
                    continue
                cells[c.get("r") or ""] = (kind, v.text)
            out[name] = cells
    return out


#: Text in a formula that points into result sheets (``Envelopes`` also covers ``Envelopes 2``).
RESULT_NAMES = (*(t.sheet for t in RESULT_TABLES), CHARTS_SHEET, RUN_LOG_SHEET)


def _refers_to(formula: str, names: Iterable[str]) -> bool:
    text = formula.lower()
    return any(name.lower() in text for name in names)


def _patch(xml: str, cells: dict[str, CachedValue], avoid: tuple[str, ...]) -> str:
    def fill(m: re.Match[str]) -> str:
        cached = cells.get(m["ref"])
        formula = m["text"] or ""
        if cached is None or _refers_to(formula, avoid):
            return m[0]
        kind, value = cached
        t = f' t="{kind}"' if kind and kind != "n" else ""
        return f'<c r="{m["ref"]}"{m["attrs"]}{t}>{m["f"]}<v>{escape(value)}</v></c>'

    return _FORMULA_CELL.sub(fill, xml)


def restore_cached_values(
    written: bytes, original: bytes, result_refs: Iterable[str] = ()
) -> bytes:
    """``written`` with the formula cells of non-result sheets given ``original``'s cached values.

    ``result_refs`` are extra names (defined names pointing into result
    sheets) whose presence in a formula makes its cached value stale. The
    result is a new package; ``written`` itself is not changed.
    """
    src = io.BytesIO(written)
    out = io.BytesIO()
    with zipfile.ZipFile(src) as zin:
        parts = sheet_parts(zin)
        keep = [n for n in parts if not is_result_sheet_name(n)]
        values = cached_values(original, keep)
        avoid = (*RESULT_NAMES, *result_refs)
        by_part = {parts[n]: values[n] for n in keep if values.get(n)}
        with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout:
            for info in zin.infolist():
                data = zin.read(info.filename)
                if info.filename in by_part:
                    xml = _patch(data.decode("utf-8"), by_part[info.filename], avoid)
                    data = xml.encode("utf-8")
                zout.writestr(info, data)
    return out.getvalue()


class KeepCachedValues:
    """A workbook to save whose formula cells keep the cached values of ``original``.

    ``original`` is the package the workbook was loaded from. Pass this to
    :func:`batch.writers.save.atomic_save` in place of the workbook.
    """

    def __init__(self, workbook: Workbook, original: bytes) -> None:
        self.workbook = workbook
        self.original = original

    def _result_refs(self) -> tuple[str, ...]:
        """Defined names whose destination lies in a result sheet."""
        return tuple(
            name
            for name, dn in self.workbook.defined_names.items()
            if _refers_to(str(dn.attr_text or ""), RESULT_NAMES)
        )

    def save(self, filename: BinaryIO) -> None:
        """Write the workbook to ``filename`` with the cached values restored."""
        buffer = io.BytesIO()
        self.workbook.save(buffer)
        filename.write(restore_cached_values(buffer.getvalue(), self.original, self._result_refs()))
