"""Printing, checked with a real spreadsheet program: LibreOffice renders the sample to PDF.

The KVHA sample inventory is run, and LibreOffice (headless, its own throw-away
profile) converts the results workbook to PDF, every sheet, the way it would print
it. The PDF's text positions (pdfplumber, an independent PDF reader) then show:

* no two words overlap anywhere, on any page (wrapped text in rows too short for it
  overlaps the next row: the fault this guards against);
* every page names the workbook, its sheet and "Page k of N" (the header);
* every page of a result table starts with its header row (repeated header rows),
  and every column title of the table is printed (fit to the page width: nothing is
  cut off at the right);
* every word lies inside the paper (nothing runs off the page).

Sources: the conversion command line is LibreOffice's documented ``--convert-to``
(LibreOffice help, "Starting LibreOffice Software With Parameters"); the header codes
&F, &A, &P, &N are ECMA-376 Part 1, §18.3.1.36; US Letter is 612 x 792 points
(ANSI/ASME Y14.1, 8.5 x 11 in; common practice).
"""

from __future__ import annotations

import contextlib
import io
import re
import shutil
import subprocess
from collections import defaultdict
from pathlib import Path

import openpyxl
import pdfplumber
import pytest

from batch.command.cli import EXIT_OK, main
from batch.demo.kvha import KVHA_INVENTORY
from batch.writing.columns import RESULT_GUIDE, RESULT_TABLES
from batch.writing.declare import WEIGHT_LABELS

SOFFICE = shutil.which("soffice") or shutil.which("libreoffice")

pytestmark = [
    pytest.mark.slow,
    pytest.mark.skipif(
        SOFFICE is None,
        reason="LibreOffice (soffice) is not installed; .ci/run installs it from Debian's "
        "libreoffice-calc-nogui package",
    ),
]

SAMPLE = Path(__file__).resolve().parent.parent / "sample_workbooks" / "kvha-inventory.xlsx"
SOFFICE_TIMEOUT_S = 180
#: Two words closer than this (points) in both directions are not overlapping: glyph
#: boxes of neighbouring words may touch.
OVERLAP_TOL_PT = 0.5
#: Words whose tops are this close (points) are on one line.
LINE_TOL_PT = 3.0
LETTER_PT = (612.0, 792.0)
PAGE_HEADER = re.compile(r"Page (\d+) of (\d+)")


def _words(page: object) -> list[dict]:
    """The upright words of a page (chart axis titles printed sideways are left out)."""
    return [w for w in page.extract_words(keep_blank_chars=False) if w["upright"]]  # type: ignore[attr-defined]


def _split_header(words: list[dict]) -> tuple[str, list[dict]]:
    """A page's header line (its topmost line of words, left to right) and the rest."""
    top = min(w["top"] for w in words)
    header = [w for w in words if w["top"] < top + LINE_TOL_PT]
    rest = [w for w in words if w["top"] >= top + LINE_TOL_PT]
    return " ".join(w["text"] for w in sorted(header, key=lambda w: w["x0"])), rest


#: Height of a result sheet's header row, titles wrapped on up to three lines (points).
HEADER_BAND_PT = 45.0


@pytest.fixture(scope="module")
def run_printed(
    tmp_path_factory: pytest.TempPathFactory,
) -> tuple[list[tuple[str, list[dict], tuple]], list[str]]:
    """The printed sample: its pages (header line, other words, paper size) and its sheets."""
    root = tmp_path_factory.mktemp("print")
    book = root / "kvha-results.xlsx"
    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(io.StringIO()):
        assert main(["run", str(SAMPLE), "--out", str(book), "--no-store"]) == EXIT_OK
    done = subprocess.run(
        [
            str(SOFFICE),
            f"-env:UserInstallation={(root / 'profile').as_uri()}",
            "--headless",
            "--norestore",
            "--convert-to",
            "pdf",
            "--outdir",
            str(root),
            str(book),
        ],
        capture_output=True,
        text=True,
        timeout=SOFFICE_TIMEOUT_S,
        check=False,
    )
    assert done.returncode == 0, done.stdout + done.stderr
    sheets = openpyxl.load_workbook(book, read_only=True).sheetnames
    pages = []
    with pdfplumber.open(root / "kvha-results.pdf") as pdf:
        for page in pdf.pages:
            line, body = _split_header(_words(page))
            pages.append((line, body, (float(page.width), float(page.height))))
    return pages, sheets


@pytest.fixture(scope="module")
def printed(run_printed) -> list[tuple[str, list[dict], tuple]]:
    """Each page of the printed results: (its header line, its other words, paper size)."""
    return run_printed[0]


def _sheet_of(header: str, sheets: list[str]) -> str | None:
    """The sheet a page header names (the longest sheet name it holds)."""
    named = [s for s in sheets if f" {s} " in f" {header} "]
    return max(named, key=len) if named else None


def test_every_page_has_the_workbook_sheet_and_page_in_its_header(printed) -> None:
    total = len(printed)
    for k, (header, _, _) in enumerate(printed, start=1):
        assert "kvha-results.xlsx" in header, header
        page = PAGE_HEADER.search(header)
        assert page is not None and (int(page[1]), int(page[2])) == (k, total), header


def test_no_two_words_overlap_on_any_page(printed) -> None:
    for k, (header, words, _) in enumerate(printed, start=1):
        ordered = sorted(words, key=lambda w: w["top"])
        for i, a in enumerate(ordered):
            for b in ordered[i + 1 :]:
                if b["top"] >= a["bottom"] - OVERLAP_TOL_PT:
                    break
                apart_x = b["x0"] >= a["x1"] - OVERLAP_TOL_PT or a["x0"] >= b["x1"] - OVERLAP_TOL_PT
                assert apart_x, f"page {k} ({header}): {a['text']!r} overlaps {b['text']!r}"


def test_nothing_runs_off_the_paper(printed) -> None:
    for k, (header, words, paper) in enumerate(printed, start=1):
        assert sorted(paper) == pytest.approx(LETTER_PT, abs=1.0)  # US units: Letter
        width = paper[0]
        for w in words:
            assert 0 <= w["x0"] and w["x1"] <= width, f"page {k} ({header}): {w['text']!r}"


def test_header_rows_repeat_and_every_column_is_printed(printed, run_printed) -> None:
    case = KVHA_INVENTORY
    labels = {**case.settings.unit_labels, "weight": WEIGHT_LABELS[case.settings.units]}
    # every table the run wrote (the sample has, e.g., no fatigue load, so no Fatigue sheet)
    tables = {t.sheet: t for t in (*RESULT_TABLES, RESULT_GUIDE) if t.sheet in run_printed[1]}
    assert len(tables) >= 10
    pages: dict[str, list[list[dict]]] = defaultdict(list)
    for header, words, _ in printed:
        sheet = _sheet_of(header, list(tables))
        if sheet is not None:
            pages[sheet].append(words)
    assert set(pages) == set(tables)  # the sample is rated and screened: every table prints
    for sheet, table in tables.items():
        first = table.all_columns(case)[0].title(labels)
        printed_text = ""
        for words in pages[sheet]:
            body = sorted(words, key=lambda w: (w["top"], w["x0"]))
            # the table's header row comes first below the page header, on every page: its
            # leftmost word is the first column's (titles wrap and are centred vertically,
            # so the header row is a band of lines, not one)
            assert body, sheet
            band = [w for w in body if w["top"] <= body[0]["top"] + HEADER_BAND_PT]
            leftmost = min(band, key=lambda w: w["x0"])
            assert leftmost["text"] == first.split()[0], (sheet, band[:3])
            printed_text += " " + " ".join(w["text"] for w in body)
        for col in table.all_columns(case):
            title = col.title(labels)
            # a title may wrap within its cell: each of its words is printed
            assert all(part in printed_text for part in title.split()), (sheet, title)
