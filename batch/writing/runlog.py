"""The Run Log sheet: what was run, on what, how, and how to read and use the results.

Two columns, Item and Value, in sections: the run (program version, UTC time,
run time), the input (file name, SHA-256 digest), the settings used, counts, the
load cases, the result sheets written, every warning, a short legend (sign
conventions and what the highlight means), the published rating values used (with
their tables, editions and status) and the bridges' traffic, and the cautions that come with any
line-girder live-load analysis (the texts of :mod:`batch.writing.cautions`, shared with the
template).
"""

from __future__ import annotations

import platform
from collections.abc import Iterator, Sequence
from dataclasses import dataclass

import numpy as np
import openpyxl

import batch
from batch.loads.factors import PUBLISHED_TABLES
from batch.model.sheets import SETTING_ROWS
from batch.running.executor import RunResult
from batch.writing.cautions import CAUTIONS, SIGN_CONVENTIONS
from batch.writing.columns import RUN_LOG_SHEET
from batch.writing.package.splice import ResultBook
from batch.writing.package.stream import header_widths
from batch.writing.package.styles import HEADER_RGB, HIGHLIGHT_RGB, CellFormat
from batch.writing.printing import page_setup, wrapped_height

__all__ = ["INPUT_FILE_ITEM", "OUTPUT_FILE_ITEM", "InputInfo", "write_run_log"]

#: The Run Log items naming the input file and the workbook the results went to: equal
#: after a run in place, different in a copy written with --out.
INPUT_FILE_ITEM = "Input file"
OUTPUT_FILE_ITEM = "Results written to"


@dataclass(frozen=True, kw_only=True)
class InputInfo:
    """Where the run's input came from and where the results went.

    ``digest`` is the SHA-256 (hex) of the input file's bytes; ``warnings`` the
    input warnings, rendered (``Sheet!Cell: message``).
    """

    name: str
    digest: str
    source: str
    output: str
    warnings: tuple[str, ...] = ()


#: How to read the result sheets, beyond the sign conventions.
_LEGEND: tuple[tuple[str, str], ...] = (
    (
        "Stations",
        "Fractions 0 to 1 of each span; x is measured from the member's left end, so an "
        "interior support appears twice (end of one span, start of the next).",
    ),
    ("Supports", "Support 1 is the member's left end; R min below 0 is uplift."),
    (
        "Values",
        "Include the distribution factor, the vehicle row's Load multiplier and the dynamic load "
        "allowance on axle loads (never on lane loads).",
    ),
    (
        "vehicle / at / direction",
        "The load case that governs, the position of its front axle (x from the member's left "
        "end) and its direction of travel. An empty vehicle cell: no vehicle gives a value of "
        "that sign there, and the value is 0. A vehicle with an empty 'at': its lane load "
        "alone governs.",
    ),
)


_SECTION = "section"
_PLAIN = "plain"
_MARKED = "marked"

_HIGHLIGHT_TEXT = (
    "A cell like this one (amber fill, bold) holds the member's governing (extreme) value of "
    "that effect in Envelopes (M max, M min, V max, V min) or Reactions (R max, R min); its "
    "vehicle, at and direction cells are marked too. The same values are listed in Governing. "
    "Where equal extremes occur, the leftmost is marked."
)


def _rows(
    result: RunResult, info: InputInfo, sheets: Sequence[str], notes: Sequence[str]
) -> Iterator[tuple[str, object, str]]:
    """The Run Log's rows as (item, value, style)."""
    settings = result.case.settings
    yield "Run", None, _SECTION
    yield "Program", f"spanfleet {batch.__version__}", _PLAIN
    yield "Started (UTC)", result.started.isoformat(timespec="seconds"), _PLAIN
    yield "Run time (s)", round(result.seconds, 3), _PLAIN
    versions = (
        f"Python {platform.python_version()}, numpy {np.__version__}, "
        f"openpyxl {openpyxl.__version__} (reads the input)"
    )
    yield "Environment", versions, _PLAIN
    yield "Input", None, _SECTION
    yield INPUT_FILE_ITEM, info.name, _PLAIN
    yield "Input type", info.source, _PLAIN
    yield "Input SHA-256", info.digest, _PLAIN
    yield OUTPUT_FILE_ITEM, info.output, _PLAIN
    yield "Settings used", None, _SECTION
    for row in SETTING_ROWS:
        yield row.header, getattr(settings, row.key), _PLAIN
    units = ", ".join(f"{q}: {u}" for q, u in settings.unit_labels.items())
    yield "Units of results", units, _PLAIN
    yield "Counts", None, _SECTION
    yield "Members", result.n_members, _PLAIN
    yield "Vehicles", result.n_vehicles, _PLAIN
    yield "Load cases", result.n_load_cases, _PLAIN
    yield "Stations (Envelopes rows)", result.n_stations, _PLAIN
    yield "Supports (Reactions rows)", result.n_supports, _PLAIN
    yield "Worker processes", result.workers, _PLAIN
    if result.store is not None:
        yield "Checkpoint store", result.store.name, _PLAIN
        yield "Members resumed from it", result.resumed, _PLAIN
    yield "Load cases run", None, _SECTION
    for lc in result.load_cases:
        vehicle = result.case.vehicles[lc.vehicle].id
        axles = ", ".join(f"{p:g}" for p in lc.train.loads)
        allowance = (
            f"{lc.impact:g}"
            if lc.impact_formula is None
            else lc.impact_formula.text(settings.unit_labels["length"])
        )
        text = (
            f"vehicle row {vehicle}; axles {axles}; lane load {lc.lane_load:g}; "
            f"dynamic allowance {allowance}; factor {lc.factor:g}"
        )
        yield lc.label, text + ("" if lc.scope == "all" else f"; scope {lc.scope}"), _PLAIN
    if result.case.rates:
        yield "Rating: published values", None, _SECTION
        for what, text in PUBLISHED_TABLES:
            yield what, text, _PLAIN
        for b in result.case.bridges:
            adtt = "not known" if b.adtt is None else f"{b.adtt:g}"
            surface = b.riding_surface or "not given (Settings' dynamic load allowance)"
            yield f"Bridge {b.id}", f"ADTT {adtt}; riding surface {surface}", _PLAIN
    yield "Result sheets", None, _SECTION
    yield "Written", ", ".join(sheets), _PLAIN
    for note in notes:
        yield "Note", note, _PLAIN
    warnings = (*info.warnings, *result.warnings)
    yield f"Warnings ({len(warnings)})", None, _SECTION
    for text in warnings:
        yield "warning", text, _PLAIN
    if not warnings:
        yield "", "none", _PLAIN
    yield "How to read", None, _SECTION
    for text in SIGN_CONVENTIONS:
        yield "Signs", text, _PLAIN
    for item, text in _LEGEND:
        yield item, text, _PLAIN
    yield "Highlight", _HIGHLIGHT_TEXT, _MARKED
    yield "Cautions", None, _SECTION
    for k, text in enumerate(CAUTIONS, start=1):
        yield str(k), text, _PLAIN


#: How each kind of row looks: (item cell, value cell); wrapped, aligned to the top.
_LOOKS = {
    _PLAIN: (CellFormat(wrap=True, vertical="top"),) * 2,
    _SECTION: (CellFormat(bold=True, fill=HEADER_RGB, wrap=True, vertical="top"),) * 2,
    _MARKED: (
        CellFormat(wrap=True, vertical="top"),
        CellFormat(bold=True, fill=HIGHLIGHT_RGB, wrap=True, vertical="top"),
    ),
}


def write_run_log(
    book: ResultBook,
    result: RunResult,
    info: InputInfo,
    sheets: Sequence[str],
    notes: Sequence[str] = (),
) -> None:
    """Add the Run Log sheet; ``sheets`` are the result sheets written, ``notes`` about them."""
    rows = list(_rows(result, info, sheets, notes))
    ws = book.new_sheet(RUN_LOG_SHEET, rows=len(rows) + 1, columns=2, exact=True)
    titles, widths = ("Item", "Value"), (30.0, 100.0)
    ws.page = page_setup(header_widths(titles, widths), 1, result.case.settings.units)
    ws.header(titles, widths)  # the titles fit on one line
    looks = {kind: [book.styles.xf(f) for f in pair] for kind, pair in _LOOKS.items()}
    for item, value, style in rows:
        height = wrapped_height([(str(item), widths[0]), (str(value or ""), widths[1])])
        ws.row((item, value), looks[style], height)
