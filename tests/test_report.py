"""The rating report of the KVHA sample, opened as a PDF and checked against the workbook.

``spanfleet run`` writes the results workbook (and its checkpoint store); ``spanfleet
report`` writes the PDF from that store. pdfplumber, an independent PDF reader, then
reads the report's pages: its page numbering, the review and seal block, one section
per member with its two envelope plots (each plotted line has one point per station
of the member, as the Envelopes sheet has rows), the governing values and rating
factors as the workbook's Governing and Ratings sheets show them (their number
formats: 0.0 and 0.00), the postings, and the cautions. The workbook is read back by
pandas. Sources: the workbook contract (docs/workbook.md) and the cautions text
(batch/writing/cautions.py); the posting load is the Ratings sheet's (MBE 6A.8.3).
"""

from __future__ import annotations

import contextlib
import io
import re
import shutil
from pathlib import Path

import pandas as pd
import pdfplumber
import pytest

from batch.command.cli import EXIT_OK, EXIT_PROBLEMS, main
from batch.demo.kvha import KVHA_INVENTORY
from batch.engine.envelope import member_influence
from batch.rating.assess import AssessmentPlan
from batch.reporting.report import REPORT_TITLE, REVIEW_FIELDS
from batch.writing.cautions import CAUTIONS

SAMPLE = Path(__file__).resolve().parent.parent / "sample_workbooks" / "kvha-inventory.xlsx"
PAGE = re.compile(r"Page (\d+) of (\d+)")
#: Words closer than this (points) do not overlap: glyph boxes of neighbours may touch.
OVERLAP_TOL_PT = 0.5


def _command(*argv: str) -> tuple[int, str]:
    out = io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(out):
        status = main(list(argv))
    return status, out.getvalue()


@pytest.fixture(scope="module")
def report(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, list[dict]]:
    """The workbook of the sample's run and the report's pages (text, words, curves)."""
    folder = tmp_path_factory.mktemp("report")
    book = folder / "kvha-inventory.xlsx"
    shutil.copyfile(SAMPLE, book)
    results = folder / "kvha-results.xlsx"
    status, said = _command("run", str(book), "--out", str(results), "--jobs", "1")
    assert status == EXIT_OK, said
    pdf = folder / "kvha-report.pdf"
    store = folder / "kvha-results.spanfleet.sqlite"
    status, said = _command("report", str(book), "--out", str(pdf), "--store", str(store))
    assert status == EXIT_OK, said
    pages = []
    with pdfplumber.open(pdf) as doc:
        for page in doc.pages:
            words = page.extract_words()
            pages.append(
                {
                    "text": page.extract_text(),
                    "words": [w for w in words if w["upright"]],
                    "curves": [len(c["pts"]) for c in page.curves],
                }
            )
    return results, pages


def _sections(pages: list[dict]) -> dict[str, str]:
    """Each member's pages' text, from its heading to the next member's."""
    out: dict[str, str] = {}
    current = None
    for page in pages:
        heading = re.search(r"^Member (\S+ \S+)$", page["text"], re.M)
        if heading:
            current = heading[1]
        if current is not None:
            out[current] = out.get(current, "") + "\n" + page["text"]
    return out


def test_pages_are_numbered_and_the_cover_has_the_review_and_seal_block(report) -> None:
    _, pages = report
    total = len(pages)
    for k, page in enumerate(pages, start=1):
        found = PAGE.search(page["text"])
        assert found and (int(found[1]), int(found[2])) == (k, total)
    cover = pages[0]["text"]
    assert REPORT_TITLE in cover and "kvha-inventory.xlsx" in cover
    for field in (*REVIEW_FIELDS, "Seal"):
        assert field in cover


def test_each_member_has_its_envelope_plots(report) -> None:
    _, pages = report
    members = {m.id for m in KVHA_INVENTORY.members}
    # Each member's stations: its grid (its own Stations per span, else the setting's) and
    # any rated section off the grid.
    plan = AssessmentPlan.of(KVHA_INVENTORY)
    assert plan is not None
    stations = {
        m.id: member_influence(
            m, KVHA_INVENTORY.settings.stations_per_span, plan.sections(m)
        ).n_stations
        for m in KVHA_INVENTORY.members
    }
    plotted = set()
    for page in pages:
        heading = re.search(r"^Member (\S+ \S+)$", page["text"], re.M)
        if not heading:
            continue
        member = heading[1]
        plotted.add(member)
        assert "Live-load moment envelope" in page["text"]
        assert "Live-load shear envelope" in page["text"]
        # M max, M min, V max and V min: one point per station row of the member
        assert page["curves"].count(stations[member]) >= 4, (member, page["curves"])
    assert plotted == members


def test_governing_values_are_the_workbooks(report) -> None:
    results, pages = report
    governing = pd.read_excel(results, sheet_name="Governing")
    sections = _sections(pages)
    for _, row in governing.iterrows():
        text = sections[row["Member"]]
        for title in ("M max (kip-ft)", "M min (kip-ft)", "V max (kip)", "R max (kip)"):
            assert f"{row[title]:.1f}" in text, (row["Member"], title)
        if isinstance(row["M max vehicle"], str):
            assert row["M max vehicle"] in text


def test_ratings_and_postings_are_the_workbooks(report) -> None:
    results, pages = report
    ratings = pd.read_excel(results, sheet_name="Ratings")
    sections = _sections(pages)
    assert len(ratings) > 0
    for _, row in ratings.iterrows():
        text = sections[row["Member"]]
        line = next(ln for ln in text.splitlines() if ln.startswith(f"{row['Vehicle']} "))
        assert f"{row['RF']:.2f}" in line, (row["Member"], row["Vehicle"], line)
        if pd.notna(row["Posting load (tons)"]):
            assert (
                f"{row['Vehicle']} (RF {row['RF']:.2f}): {row['Posting load (tons)']:.1f} tons"
                in (" ".join(text.split()))
            )


def test_the_cautions_close_the_report(report) -> None:
    _, pages = report
    last = " ".join(pages[-1]["text"].split())
    for text in CAUTIONS:
        assert " ".join(text.split()[:8]) in last


def test_no_two_words_overlap(report) -> None:
    _, pages = report
    for k, page in enumerate(pages, start=1):
        ordered = sorted(page["words"], key=lambda w: w["top"])
        for i, a in enumerate(ordered):
            for b in ordered[i + 1 :]:
                if b["top"] >= a["bottom"] - OVERLAP_TOL_PT:
                    break
                apart = b["x0"] >= a["x1"] - OVERLAP_TOL_PT or a["x0"] >= b["x1"] - OVERLAP_TOL_PT
                assert apart, f"page {k}: {a['text']!r} overlaps {b['text']!r}"


def test_one_bridge_and_an_unknown_bridge(tmp_path: Path) -> None:
    book = tmp_path / "kvha-inventory.xlsx"
    shutil.copyfile(SAMPLE, book)
    status, said = _command("report", str(book), "--bridge", "KV-0412", "-q")
    assert status == EXIT_OK, said
    with pdfplumber.open(tmp_path / "kvha-inventory-report.pdf") as doc:
        text = "\n".join(p.extract_text() for p in doc.pages)
    assert "Bridge KV-0412" in text and "Member KV-0412 G1" in text
    assert "Member KV-0101 S1" not in text
    status, said = _command("report", str(book), "--bridge", "XX-9999")
    assert status == EXIT_PROBLEMS and "no member id" in said and "Traceback" not in said
    status, said = _command("report", str(book), "--out", str(tmp_path / "r.xlsx"))
    assert status != EXIT_OK and "pdf" in said
