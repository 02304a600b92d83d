"""The load-rating and screening sheets: Ratings, Rating Matrix, Screening, Screening Detail.

Written when the run rated members (a Capacities sheet) or screened them (a
Reference vehicle); the numbers come from :mod:`batch.rating.lrfr` through each
member's :class:`~batch.rating.assess.MemberAssessment`. Rows go out strictly top to
bottom, each cell once, styled as it is written.

* **Ratings**: one row per rated member and vehicle: the governing RF (inventory
  for design loads), where it governs, the posting load of a legal load with
  0.3 <= RF < 1, the operating RF of a design load, and a flag.
* **Rating Matrix**: members down, vehicles across, the governing RF in each
  cell, coloured by :data:`RF_BANDS`: RF below 1 a muted red, 1 to 1.2 a pale
  wheat, 1.2 or more a pale sage. A legend row sits above the header; the header
  rows and the member column stay in view.
* **Screening** and **Screening Detail**: the largest ratio of each vehicle's
  effect to the reference's (a matrix, ratios above 1 in the muted red; and one
  row per member and vehicle saying which effect and where).

A sheet with more rows or columns than a sheet holds is left out with a remark
for the Run Log (every number is in the checkpoint store).
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from batch.engine.effects import MemberEnvelope
from batch.model import Case
from batch.rating.lrfr import (
    RATED_EFFECTS,
    RatingFactors,
    gross_weight,
    posting_load,
    rating_flag,
    weight_in_tons,
)
from batch.rating.screening import SCREEN_EFFECTS
from batch.running.executor import RunResult
from batch.writing.columns import (
    FORMAT_FRACTION,
    FORMAT_TEXT,
    FORMAT_VALUE,
    FORMAT_WHOLE,
    RATING_MATRIX_SHEET,
    RATINGS_SHEET,
    SCREENING_DETAIL_SHEET,
    SCREENING_SHEET,
)
from batch.writing.package.splice import ResultBook
from batch.writing.package.stream import MAX_COLUMNS, MAX_ROWS, SheetStream
from batch.writing.package.styles import HEADER, CellFormat

__all__ = ["FORMAT_RATIO", "RF_BANDS", "SCREEN_EXCEEDED_RGB", "write_assessments"]

FORMAT_RATIO = "0.00"  # rating factors and screening ratios

#: Fills of a rating factor, by band: (lowest RF of the band, fill RGB, legend text).
#: spanfleet's own palette: failures stand out, a thin margin is marked, the rest is calm.
RF_BANDS: tuple[tuple[float, str, str], ...] = (
    (-np.inf, "E3A9A2", "RF below 1"),  # muted red
    (1.0, "F2E2B6", "RF 1 to 1.2"),  # pale wheat
    (1.2, "D5E6CF", "RF 1.2 or more"),  # pale sage
)
#: Fill of a screening ratio above 1 (the vehicle's effect exceeds the reference's).
SCREEN_EXCEEDED_RGB = RF_BANDS[0][1]

_TON = {"US": "tons", "SI": "tonnes"}
_MATRIX_HEADER_ROWS = 3  # legend, vehicle ids, categories


def _band(rf: float) -> str:
    return next(rgb for low, rgb, _ in reversed(RF_BANDS) if rf >= low)


class _Styles:
    """Style indices of the cells these sheets use, made once per workbook."""

    def __init__(self, book: ResultBook) -> None:
        xf = book.styles.xf
        self.text = xf(CellFormat(number_format=FORMAT_TEXT))
        self.bold_text = xf(CellFormat(number_format=FORMAT_TEXT, bold=True))
        self.value = xf(CellFormat(number_format=FORMAT_VALUE))
        self.whole = xf(CellFormat(number_format=FORMAT_WHOLE))
        self.fraction = xf(CellFormat(number_format=FORMAT_FRACTION))
        self.ratio = xf(CellFormat(number_format=FORMAT_RATIO))
        self.header = xf(HEADER)
        self.band = {
            rgb: xf(CellFormat(number_format=FORMAT_RATIO, fill=rgb)) for _, rgb, _ in RF_BANDS
        }
        self.band_text = {
            rgb: xf(CellFormat(number_format=FORMAT_TEXT, fill=rgb)) for _, rgb, _ in RF_BANDS
        }

    def rf(self, rf: float) -> int:
        return self.band[_band(rf)]


def _place(env: MemberEnvelope, row: int) -> list[object]:
    """Span, station and x of a station row."""
    return [int(env.station_span[row]), float(env.station_fraction[row]), float(env.station_x[row])]


def _number(value: float) -> float | None:
    return float(value) if np.isfinite(value) else None


# ---------------------------------------------------------------- Ratings


#: Columns of the Ratings sheet: (header, unit, width); the unit is a quantity of the
#: run's unit system, "weight" (tons or tonnes) or "" (none).
_RATINGS_COLUMNS: tuple[tuple[str, str, float], ...] = (
    ("Member", "", 16),
    ("Vehicle", "", 18),
    ("Category", "", 9),
    ("RF", "", 8),
    ("Effect", "", 7),
    ("Span", "", 6),
    ("Station", "", 8),
    ("x", "length", 9),
    ("Posting load", "weight", 12),
    ("RF operating", "", 10),
    ("LL factor", "", 8),
    ("Flag", "", 44),
)
#: Columns of the Screening Detail sheet, as :data:`_RATINGS_COLUMNS`.
_DETAIL_COLUMNS: tuple[tuple[str, str, float], ...] = (
    ("Member", "", 16),
    ("Vehicle", "", 18),
    ("Category", "", 9),
    ("Ratio", "", 8),
    ("Effect", "", 7),
    ("Span", "", 6),
    ("Station", "", 8),
    ("Support", "", 8),
    ("x", "length", 9),
)


def _new_table(
    book: ResultBook, name: str, columns: Sequence[tuple[str, str, float]], case: Case
) -> SheetStream:
    """A long-form sheet: its header row with units, frozen, with an autofilter."""
    units = case.settings.unit_labels | {"weight": _TON[case.settings.units]}
    titles = [f"{h} ({units[q]})" if q else h for h, q, _ in columns]
    # At most one row per member and vehicle (twice that is a safe bound).
    bound = 2 * len(case.members) * len(case.vehicles) + 1
    ws = book.new_sheet(name, rows=bound, columns=len(columns))
    ws.header(titles, [w for _, _, w in columns])
    ws.autofilter = True
    return ws


def _write_ratings(book: ResultBook, result: RunResult, styles: _Styles) -> None:
    case = result.case
    ws = _new_table(book, RATINGS_SHEET, _RATINGS_COLUMNS, case)
    weights = [weight_in_tons(gross_weight(v, case.settings.units), case.settings.units)
               for v in case.vehicles]  # fmt: skip
    factors = RatingFactors.of(case.settings)
    for env, assessment in zip(result.envelopes, result.assessments, strict=True):
        rating = assessment.rating
        if rating is None:
            continue
        for v, vehicle in enumerate(case.vehicles):
            rf, op = float(rating.rf[v]), float(rating.rf_operating[v])
            found = rating.effect[v] >= 0
            place = _place(env, int(rating.station[v])) if found else [None] * 3
            posting = posting_load(rf, weights[v]) if vehicle.category == "legal" else None
            flag = (
                rating_flag(vehicle.category, rf, op)
                if found
                else "loads none of the rated effects at the rated stations"
            )
            ws.row(
                [
                    env.member,
                    vehicle.id,
                    vehicle.category,
                    _number(rf),
                    RATED_EFFECTS[rating.effect[v]][0] if found else None,
                    *place,
                    posting,
                    _number(op),
                    factors.live(vehicle.category),
                    flag,
                ],
                [
                    styles.text,
                    styles.text,
                    styles.text,
                    styles.rf(rf) if found else styles.ratio,
                    styles.text,
                    styles.whole,
                    styles.fraction,
                    styles.value,
                    styles.value,
                    styles.rf(op) if np.isfinite(op) else styles.ratio,
                    styles.ratio,
                    styles.text,
                ],
            )


# ---------------------------------------------------------------- matrices


def _matrix_sheet(
    book: ResultBook,
    name: str,
    case: Case,
    legend: Sequence[tuple[str, int]],
    styles: _Styles,
) -> SheetStream:
    """A matrix sheet with its three header rows: legend, vehicle ids, categories."""
    n = len(case.vehicles)
    ws = book.new_sheet(name, rows=len(case.members) + _MATRIX_HEADER_ROWS, columns=n + 1)
    ws.columns([18.0] + [max(9.0, min(24.0, len(v.id) * 0.9 + 2)) for v in case.vehicles])
    ws.freeze(_MATRIX_HEADER_ROWS, 1)
    texts = [text for text, _ in legend]
    ws.row(texts, [style for _, style in legend])
    ws.row(["Member", *(v.id for v in case.vehicles)], styles.header)
    ws.row(["Category", *(v.category for v in case.vehicles)], styles.bold_text)
    return ws


def _write_rating_matrix(book: ResultBook, result: RunResult, styles: _Styles) -> None:
    legend = [("Governing RF (design loads: inventory)", styles.bold_text)]
    legend += [(text, styles.band_text[rgb]) for _, rgb, text in RF_BANDS]
    legend += [("blank: not loaded at the rated stations", styles.text)]
    ws = _matrix_sheet(book, RATING_MATRIX_SHEET, result.case, legend, styles)
    for env, assessment in zip(result.envelopes, result.assessments, strict=True):
        if assessment.rating is None:
            continue
        rfs = [float(rf) for rf in assessment.rating.rf]
        ws.row(
            [env.member, *(_number(rf) for rf in rfs)],
            [styles.text, *(styles.rf(rf) if np.isfinite(rf) else styles.ratio for rf in rfs)],
        )


def _write_screening_matrix(book: ResultBook, result: RunResult, styles: _Styles) -> None:
    reference = result.case.settings.reference_vehicle
    exceeded = styles.band[SCREEN_EXCEEDED_RGB]
    legend = [
        (f"Largest ratio of each vehicle's effect to {reference}'s", styles.bold_text),
        ("above 1: exceeds the reference", styles.band_text[SCREEN_EXCEEDED_RGB]),
        ("blank: nothing to compare", styles.text),
    ]
    ws = _matrix_sheet(book, SCREENING_SHEET, result.case, legend, styles)
    for env, assessment in zip(result.envelopes, result.assessments, strict=True):
        assert assessment.screening is not None
        ratios = [float(r) for r in assessment.screening.ratio]
        ws.row(
            [env.member, *(_number(r) for r in ratios)],
            [styles.text, *(exceeded if r > 1.0 else styles.ratio for r in ratios)],
        )


# ---------------------------------------------------------------- Screening Detail


def _write_screening_detail(book: ResultBook, result: RunResult, styles: _Styles) -> None:
    case = result.case
    ws = _new_table(book, SCREENING_DETAIL_SHEET, _DETAIL_COLUMNS, case)
    exceeded = styles.band[SCREEN_EXCEEDED_RGB]
    for env, assessment in zip(result.envelopes, result.assessments, strict=True):
        screening = assessment.screening
        assert screening is not None
        for v, vehicle in enumerate(case.vehicles):
            k, row, ratio = int(screening.effect[v]), int(screening.row[v]), screening.ratio[v]
            where: list[object] = [None] * 4
            if k >= 0 and SCREEN_EFFECTS[k][1] == "reaction":
                where = [None, None, row + 1, float(env.support_x[row])]
            elif k >= 0:
                span, station, x = _place(env, row)
                where = [span, station, None, x]
            ws.row(
                [env.member, vehicle.id, vehicle.category, _number(ratio),
                 SCREEN_EFFECTS[k][0] if k >= 0 else None, *where],
                [styles.text, styles.text, styles.text,
                 exceeded if ratio > 1.0 else styles.ratio, styles.text, styles.whole,
                 styles.fraction, styles.whole, styles.value],
            )  # fmt: skip


# ---------------------------------------------------------------- all of them


def _fits(rows: int, columns: int, max_rows: int) -> bool:
    return rows <= max_rows and columns <= MAX_COLUMNS


def write_assessments(
    book: ResultBook, result: RunResult, max_rows: int = MAX_ROWS - 1
) -> list[str]:
    """Write the rating and screening sheets the run calls for; returns remarks for the Run Log.

    ``max_rows`` is the data-row limit of one sheet below its header (smaller
    only in tests).
    """
    if not result.assessments:
        return []
    styles = _Styles(book)
    members, vehicles = result.n_members, result.n_vehicles
    rated = sum(a.rating is not None for a in result.assessments)
    screened = result.assessments[0].screening is not None
    sheets = (
        (RATINGS_SHEET, rated > 0, rated * vehicles, len(_RATINGS_COLUMNS), _write_ratings),
        (RATING_MATRIX_SHEET, rated > 0, rated + 2, vehicles + 1, _write_rating_matrix),
        (SCREENING_SHEET, screened, members + 2, vehicles + 1, _write_screening_matrix),
        (
            SCREENING_DETAIL_SHEET,
            screened,
            members * vehicles,
            len(_DETAIL_COLUMNS),
            _write_screening_detail,
        ),
    )
    remarks = []
    for name, wanted, rows, columns, write in sheets:
        if not wanted:
            continue
        if _fits(rows, columns, max_rows):
            write(book, result, styles)
        else:
            remarks.append(
                f"{name} is not written: {rows} rows of {columns} columns are more than a "
                "sheet holds; every rating and screening result is in the checkpoint store "
                "(table assessments)"
            )
    if 0 < rated < members:
        remarks.append(
            f"{members - rated} of {members} members have no Capacities rows and are not rated."
        )
    return remarks
