"""The rating report: what a run found, for the bridge file, as a printable PDF.

For the members chosen (one bridge's girder lines, or the whole inventory) the report
holds, in order:

1. a cover: the run (input file and its SHA-256, program, date, units), an empty
   block for the engineer's review and seal, and a summary of every member (governing
   effects, the lowest rating factor, postings);
2. the inputs that matter: the settings (factors and allowances), the vehicles, the
   members (geometry, distribution factors, dead loads, condition and system factors)
   and their Capacities rows;
3. for each member: its moment and shear envelope plots, its governing values, its
   rating table with every term the Ratings sheet gives, and its postings;
4. the sign conventions and the cautions.

Every number comes from the interface's DataFrames (:mod:`batch.interface.frames`),
which are the workbook's sheets cell for cell, and is printed with the sheet's own
number format, so the report and the workbook agree to the digit. Nothing is
computed here. Signs as in the workbook: sagging moment positive; V the sum of the
upward forces left of the section; reactions upward positive.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import pandas as pd
from matplotlib.axes import Axes

import batch
from batch.engine.effects import EFFECTS, Effect
from batch.interface.session import Results
from batch.model.sheets import INPUT_SHEETS, SETTING_ROWS
from batch.reporting.layout import BODY_PT, TITLE_PT, Column, Document
from batch.writing.cautions import CAUTIONS, SIGN_CONVENTIONS
from batch.writing.charts import CHART_COLOURS, CHART_SHEETS, ChartSheet
from batch.writing.columns import ENVELOPES, GOVERNING, RATINGS, RATINGS_SUMMARY
from batch.writing.declare import (
    FORMAT_FRACTION,
    FORMAT_RATIO,
    FORMAT_VALUE,
    FORMAT_WHOLE,
    ResultColumn,
)
from batch.writing.printing import PAPERS
from batch.writing.template import CellValue, case_rows, header_text

__all__ = ["REPORT_TITLE", "REVIEW_FIELDS", "Report", "cell_text", "write_report"]

REPORT_TITLE = "Live-load rating report"
#: The lines of the review and seal block, left blank for the engineer.
REVIEW_FIELDS = (
    "Prepared by",
    "Checked by",
    "Reviewed and approved by",
    "Licence number",
    "Date",
)
#: Python's format of each number format the sheets use.
_PY_FORMATS = {
    FORMAT_VALUE: ".1f",
    FORMAT_FRACTION: ".3f",
    FORMAT_WHOLE: ".0f",
    FORMAT_RATIO: ".2f",
}
_PLOT_HEIGHT_IN = 2.9


@dataclass(frozen=True)
class Report:
    """A written report: where, how many pages, which members."""

    path: Path
    pages: int
    members: tuple[str, ...]


def cell_text(value: object, number_format: str = "") -> str:
    """A cell as the workbook shows it: numbers in the column's format, empty for none."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return ""
    if isinstance(value, int | float) and not isinstance(value, bool):
        fmt = _PY_FORMATS.get(number_format)
        return format(value, fmt) if fmt else f"{value:g}"
    return str(value)


def _of(frame: pd.DataFrame, member: str) -> pd.DataFrame:
    rows: pd.DataFrame = frame.loc[frame["Member"] == member]
    return rows


def write_report(
    results: Results, path: str | Path, members: Sequence[str] | None = None, scope: str = ""
) -> Report:
    """Write the report of ``members`` (default: every member) to the PDF ``path``.

    ``scope`` names what the report covers on every page (default: the inventory or
    the one member). Raises ``ValueError`` for a member id the run does not have.
    """
    case = results.case
    known = [m.id for m in case.members]
    chosen = list(known if members is None else members)
    unknown = [m for m in chosen if m not in known]
    if unknown or not chosen:
        raise ValueError(f"no such member in {results.input.name}: {', '.join(unknown) or '-'}")
    scope = scope or (
        f"Inventory, {len(chosen)} members" if len(chosen) > 1 else f"Member {chosen[0]}"
    )
    started = results.result.started
    doc = Document(
        PAPERS[case.settings.units],
        REPORT_TITLE,
        scope,
        f"spanfleet {batch.__version__}, from {results.input.name}",
        f"Run {started:%Y-%m-%d %H:%M} UTC",
    )
    _cover(doc, results, chosen, scope)
    _inputs(doc, results, chosen)
    for member in chosen:
        _member(doc, results, member)
    _cautions(doc)
    target = Path(path)
    pages = doc.save(target)
    return Report(path=target, pages=pages, members=tuple(chosen))


# ---------------------------------------------------------------- cover


def _cover(doc: Document, results: Results, chosen: list[str], scope: str) -> None:
    inp, result = results.input, results.result
    doc.heading(REPORT_TITLE, TITLE_PT)
    doc.paragraph(scope, 11.0)
    doc.paragraph(
        f"Results of spanfleet {batch.__version__} (exact influence lines and moving-load "
        f"extremes of each girder line) for {inp.name}, run "
        f"{result.started:%Y-%m-%d %H:%M} UTC. Units: "
        + ", ".join(f"{q.replace('_', ' ')} {u}" for q, u in results.units.items())
        + ". The numbers are those of the results workbook of the same input, in its "
        "formats; the sign conventions and the cautions are at the end."
    )
    if inp.report.digest:
        doc.paragraph(f"Input SHA-256: {inp.report.digest}", 7.5)
    doc.heading("Review and seal")
    doc.paragraph(
        "These results support the engineer's judgement; they do not replace it. The "
        "governing code, the owner's policies and a licensed professional engineer prevail."
    )
    doc.box(REVIEW_FIELDS, 2.4)
    doc.heading("Summary")
    doc.table(*_summary(results, chosen))


def _summary(results: Results, chosen: list[str]) -> tuple[list[Column], list[list[str]]]:
    """One row per member: spans, governing M and V, the lowest RF and the postings."""
    labels = results.units
    gov = results.governing
    spans_title = header_text(_input_column("Members", "spans"), results.case.settings.units)
    columns = [Column("Member", 1.4), Column(spans_title, 1.2)]
    effects = [e for e in EFFECTS if e.rows == "station"]
    columns += [Column(_value(e).title(labels), 1.0, "right") for e in effects]
    rated = "Ratings" in {t.sheet for t in results.tables()}
    if rated:
        columns += [Column("Lowest RF (vehicle)", 1.6), Column("Posting loads", 1.6)]
    spans = {row["id"]: row["spans"] for row in _rows("Members", results)}
    rows = []
    for member in chosen:
        g = _of(gov, member).iloc[0]
        row = [member, cell_text(spans[member])]
        row += [cell_text(g[_value(e).title(labels)], FORMAT_VALUE) for e in effects]
        if rated:
            row += _lowest(results, member)
        rows.append(row)
    return columns, rows


def _lowest(results: Results, member: str) -> list[str]:
    ratings = _of(results.ratings, member)
    if ratings.empty:
        return ["not rated", ""]
    valid = ratings.loc[ratings["RF"].notna()]
    low = valid.loc[valid["RF"].idxmin()] if not valid.empty else None
    lowest = "" if low is None else f"{cell_text(low['RF'], FORMAT_RATIO)} ({low['Vehicle']})"
    posting = _posting_title(results)
    posts = _of(results.postings, member)
    text = "; ".join(
        f"{r['Vehicle']}: {cell_text(r[posting], FORMAT_VALUE)}" for _, r in posts.iterrows()
    )
    return [lowest, text or "none"]


def _posting_title(results: Results) -> str:
    return RATINGS.column("Posting load").title(results.units)


# ---------------------------------------------------------------- inputs


def _input_column(sheet: str, key: str) -> Any:
    return next(c for s in INPUT_SHEETS if s.name == sheet for c in s.columns if c.key == key)


def _rows(sheet: str, results: Results) -> list[dict[str, CellValue]]:
    return list(case_rows(results.case).get(sheet, []))


def _inputs(doc: Document, results: Results, chosen: list[str]) -> None:
    case = results.case
    units = case.settings.units
    doc.new_page()
    doc.heading("Inputs")
    doc.paragraph(
        "As read from the input and used by the run (blank cells took their defaults, "
        "shown). Values include no factor that is not listed here."
    )
    doc.heading("Settings", 10.0)
    doc.table(
        [Column("Setting", 1.2), Column("Value", 0.8), Column("Meaning", 3.0)],
        [[s.header, cell_text(getattr(case.settings, s.key)), s.meaning] for s in SETTING_ROWS],
    )
    for sheet, keep in (
        ("Vehicles", None),
        ("Members", lambda r: r["id"] in chosen),
        ("Segments", lambda r: r["member"] in chosen),
        ("Capacities", lambda r: r["member"] in chosen),
    ):
        rows = [r for r in _rows(sheet, results) if keep is None or keep(r)]
        if not rows:
            continue
        declared = next(s for s in INPUT_SHEETS if s.name == sheet).columns
        titles = [header_text(c, units) for c in declared]
        cells = [[cell_text(r.get(c.key)) for c in declared] for r in rows]
        # each column's share of the width follows its longest text, within bounds
        shares = [
            min(max(len(t) / 2, *(len(row[j]) for row in cells), 4), 30)
            for j, t in enumerate(titles)
        ]
        doc.heading(sheet, 10.0)
        doc.table([Column(t, w) for t, w in zip(titles, shares, strict=True)], cells)


# ---------------------------------------------------------------- each member


def _value(effect: Effect) -> ResultColumn[Any]:
    return GOVERNING.column(effect.name)


def _member(doc: Document, results: Results, member: str) -> None:
    labels = results.units
    info = next(m for m in results.case.members if m.id == member)
    doc.new_page()
    doc.heading(f"Member {member}")
    if info.description:
        doc.paragraph(info.description)
    env = _of(results.envelopes, member)
    doc.plots([_plot(env, kind, labels) for kind in CHART_SHEETS], _PLOT_HEIGHT_IN)
    doc.heading("Governing values", 10.0)
    doc.table(*_governing(results, member))
    if "Ratings" in {t.sheet for t in results.tables()}:
        _ratings(doc, results, member)


def _plot(env: pd.DataFrame, kind: ChartSheet, labels: Mapping[str, str]) -> Callable[[Axes], None]:
    """A function drawing one envelope (the chart sheet ``kind``'s two effects) on axes."""
    x_title = ENVELOPES.column("x").title(labels)
    titles = [ENVELOPES.column(name).title(labels) for name in kind.effects]

    def draw(ax: Axes) -> None:
        x = env[x_title].to_numpy(dtype=float)
        for k, title in enumerate(titles):
            y = env[title].to_numpy(dtype=float)
            ax.plot(x, y, color=f"#{CHART_COLOURS[k]}", lw=1.2, label=kind.effects[k])
            ax.fill_between(x, 0.0, y, color=f"#{CHART_COLOURS[k]}", alpha=0.08, lw=0)
        ax.axhline(0.0, color="black", lw=0.5)
        ax.set_title(f"Live-load {kind.title} envelope", fontsize=BODY_PT)
        ax.set_xlabel(x_title, fontsize=7.5)
        ax.set_ylabel(kind.axis.format(unit=labels[kind.quantity]), fontsize=7.5)
        ax.tick_params(labelsize=7)
        ax.grid(True, lw=0.3, color="#CCCCCC")
        ax.legend(fontsize=7, frameon=False, loc="best")

    return draw


def _governing(results: Results, member: str) -> tuple[list[Column], list[list[str]]]:
    """One row per effect: its value, where, and the vehicle, position and direction."""
    labels = results.units
    g = _of(results.governing, member).iloc[0]
    length = labels["length"]
    columns = [
        Column("Effect", 0.7),
        Column("Value", 0.9, "right"),
        Column("Unit", 0.6),
        Column("Span", 0.5, "right"),
        Column("Station", 0.7, "right"),
        Column("Support", 0.7, "right"),
        Column(f"x ({length})", 0.7, "right"),
        Column("Vehicle", 1.5),
        Column(f"Front axle at ({length})", 1.0, "right"),
        Column("Direction", 1.4),
    ]

    def at(effect: Effect, header: str) -> str:
        """The member's cell of ``effect``'s column ``header`` (empty: no such column)."""
        try:
            col = GOVERNING.column(f"{effect.name} {header}")
        except KeyError:
            return ""
        return cell_text(g[col.title(labels)], col.number_format)

    where = ("span", "station", "support", "x", "vehicle", "at", "direction")
    rows = [
        [
            effect.name,
            cell_text(g[_value(effect).title(labels)], FORMAT_VALUE),
            labels[effect.quantity],
            *(at(effect, h) for h in where),
        ]
        for effect in EFFECTS
    ]
    return columns, rows


def _ratings(doc: Document, results: Results, member: str) -> None:
    labels = results.units
    rows = _of(results.ratings, member)
    doc.heading("Load rating", 10.0)
    if rows.empty:
        doc.paragraph("Not rated: the Capacities sheet has no rows for this member.")
        return
    doc.paragraph(
        "LRFR rating factors (MBE 6A.4.2.1) at the rated stations; for each vehicle the "
        "governing (smallest) factor over the stations and effects, design loads at the "
        "inventory level with the operating level beside it, and for legal loads below 1 "
        "the posting load (MBE 6A.8.3). Every term of each rating factor is on the Ratings and "
        "Rating Detail sheets."
    )
    shown = [c for c in RATINGS.columns if c.header in RATINGS_SUMMARY and c.header != "Member"]
    shares = {"Vehicle": 1.4, "Flag": 2.4, "Category": 0.9, "Posting load": 0.9}
    doc.table(
        [
            Column(c.title(labels), shares.get(c.header, 0.7), "left" if c.text else "right")
            for c in shown
        ],
        [
            [cell_text(r[c.title(labels)], c.number_format) for c in shown]
            for _, r in rows.iterrows()
        ],
    )
    posts = _of(results.postings, member)
    posting = _posting_title(results)
    if posts.empty:
        doc.paragraph("Postings: no legal load rates below 1 on this member.")
    else:
        doc.paragraph(
            "Postings: "
            + "; ".join(
                f"{r['Vehicle']} (RF {cell_text(r['RF'], FORMAT_RATIO)}): "
                f"{cell_text(r[posting], FORMAT_VALUE)} {labels['weight']}"
                for _, r in posts.iterrows()
            )
            + "."
        )


# ---------------------------------------------------------------- the end


def _cautions(doc: Document) -> None:
    doc.new_page()
    doc.heading("Sign conventions")
    for text in SIGN_CONVENTIONS:
        doc.paragraph(text)
    doc.heading("Cautions")
    for k, text in enumerate(CAUTIONS, start=1):
        doc.paragraph(f"{k}. {text}")
