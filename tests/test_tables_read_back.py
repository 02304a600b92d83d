"""Result sheets read back as tables: pandas with default arguments, positions as typed.

Every result sheet is one header row followed by records, so that
``pandas.read_excel(book, sheet_name=...)`` with no other argument gives the
declared columns (titles with their units) and typed values: an independent
reader (pandas over openpyxl) is the check. Station positions are the decimal an
engineer would type: a station a tenth of the way along a 24 ft span is at 2.4,
i.e. the double nearest the exact position, which the standard library's exact
rational arithmetic (``fractions.Fraction``) gives independently.
"""

from __future__ import annotations

import contextlib
import io
import itertools
from fractions import Fraction
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from batch.command.cli import EXIT_OK, main
from batch.demo.kvha import KVHA_INVENTORY
from batch.model.layout import station_positions, support_positions
from batch.writing.columns import FATIGUE, RESULT_GUIDE, RESULT_TABLES, RUN_LOG_SHEET
from batch.writing.declare import WEIGHT_LABELS

SAMPLE = Path(__file__).resolve().parent.parent / "sample_workbooks" / "kvha-inventory.xlsx"


@pytest.fixture(scope="module")
def sample_results(tmp_path_factory: pytest.TempPathFactory) -> Path:
    out = tmp_path_factory.mktemp("read-back") / "kvha-results.xlsx"
    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(io.StringIO()):
        assert main(["run", str(SAMPLE), "--out", str(out), "--no-store"]) == EXIT_OK
    return out


def _numeric(col: object) -> bool:
    return bool(getattr(col, "number_format", "")) and not getattr(col, "text", False)


def test_every_result_table_reads_with_default_arguments(sample_results: Path) -> None:
    case = KVHA_INVENTORY
    labels = {**case.settings.unit_labels, "weight": WEIGHT_LABELS[case.settings.units]}
    with pd.ExcelFile(sample_results) as book:
        names = book.sheet_names
    tables = [t for t in (*RESULT_TABLES, RESULT_GUIDE) if t.sheet in names]
    # the sample is rated and screened, and its older bridge is rated with HS20 under the
    # Standard Specifications' impact, so every declared table is written but the Fatigue
    # sheet: the sample has no fatigue load (tests/test_library_fatigue.py reads that sheet
    # back with pandas' defaults)
    declared = {t.sheet for t in (*RESULT_TABLES, RESULT_GUIDE) if t is not FATIGUE}
    assert {t.sheet for t in tables} == declared
    for table in tables:
        frame = pd.read_excel(sample_results, sheet_name=table.sheet)
        columns = table.all_columns(case)
        assert list(frame.columns) == [c.title(labels) for c in columns], table.sheet
        assert len(frame) > 0, table.sheet
        for col in columns:
            values = frame[col.title(labels)]
            if _numeric(col) and values.notna().any():
                assert values.dtype.kind in "fi", (table.sheet, col.header, values.dtype)
            if col.text:
                assert all(isinstance(v, str) for v in values.dropna()), (table.sheet, col.header)


def test_the_run_log_reads_as_items_and_values(sample_results: Path) -> None:
    log = pd.read_excel(sample_results, sheet_name=RUN_LOG_SHEET)
    assert list(log.columns) == ["Item", "Value"]
    assert log.set_index("Item").loc["Members", "Value"] == len(KVHA_INVENTORY.members)


def test_station_positions_are_the_decimals_an_engineer_types(sample_results: Path) -> None:
    frame = pd.read_excel(sample_results, sheet_name="Envelopes")
    x = frame["x (ft)"].to_numpy(dtype=float)
    # the sample's spans are whole or tenths of a foot and its stations tenths of a span:
    # every station is a decimal of at most three places, written as exactly that
    assert all(repr(v) == repr(round(v, 3)) for v in x)
    assert 2.4 in x and 2.4000000000000004 not in x  # a tenth of the 24 ft span


def test_governing_positions_carry_no_round_off_tails(sample_results: Path) -> None:
    # A front-axle position at an axle-on-station event is a station less an axle's offset
    # (14.0 - 13.2 is 0.8000000000000007 in doubles); the sheets show twelve significant
    # digits, so it reads 0.8. Stationary points (irrational in general) keep twelve.
    for sheet in ("Envelopes", "Reactions", "Governing", "Deflections", "Ratings", "Rating Detail"):
        frame = pd.read_excel(sample_results, sheet_name=sheet)
        at = [c for c in frame.columns if " at (" in c or c.startswith("at (")]
        assert at, sheet
        for column in at:
            values = frame[column].dropna().to_numpy(dtype=float)
            assert all(v == float(f"{v:.12g}") for v in values), (sheet, column)


@pytest.mark.parametrize(
    ("spans", "n"),
    [
        ((24.0,), 10),
        ((60.1, 80.2, 60.1), 10),
        ((33.3, 41.7), 7),
        ((0.3,) * 5, 3),
        ((10.1, 20.2), 3),
    ],
)
def test_positions_are_the_doubles_nearest_the_exact_ones(spans: tuple[float, ...], n: int) -> None:
    exact = [Fraction(0)]
    for span in spans:
        exact.append(exact[-1] + Fraction(str(span)))  # the decimal as typed
    assert support_positions(spans).tolist() == [float(x) for x in exact]
    span_no, fraction, x = station_positions(spans, n)
    steps = [Fraction(k, n) for k in range(n + 1)]
    expected = [float(a + f * (b - a)) for a, b in itertools.pairwise(exact) for f in steps]
    assert x.tolist() == expected
    assert fraction.tolist() == [k / n for k in range(n + 1)] * len(spans)
    assert np.array_equal(span_no, np.repeat(np.arange(1, len(spans) + 1), n + 1))


def test_summed_supports_are_the_typed_decimals() -> None:
    # adding the doubles gives 30.299999999999997 (common practice: binary floating point)
    assert 10.1 + 20.2 != 30.3
    assert support_positions((10.1, 20.2)).tolist() == [0.0, 10.1, 30.3]
    assert station_positions((10.1, 20.2), 2)[2].tolist() == [0.0, 5.05, 10.1, 10.1, 20.2, 30.3]
